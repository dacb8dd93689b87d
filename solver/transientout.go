package solver

import "math"

// allocResult prepares the result series of a run (only the per-cell
// range and mean when Problem.Observe takes the samples).
func (r *fvRun) allocResult() {
	ns := r.nSteps/r.every + 1 // the initial state and every sample step
	if r.nSteps%r.every != 0 {
		ns++ // the end of the run
	}
	p := r.p
	res := &Result{
		Mesh:   r.m,
		Probes: append([]float64(nil), p.Probes...),
		Min:    make([]float64, r.n),
		Max:    make([]float64, r.n),
		Mean:   make([]float64, r.n),
	}
	r.smp = Sample{Count: ns, Probe: make([]float64, len(p.Probes))}
	if p.Observe == nil {
		res.Times = make([]float64, ns)
		res.Probe = make([][]float64, len(p.Probes))
		res.SurfaceOutside = make([]float64, ns)
		res.SurfaceInside = make([]float64, ns)
		res.FluxOutside = make([]float64, ns)
		res.FluxInside = make([]float64, ns)
		res.MeanFluxOutside = make([]float64, ns)
		res.MeanFluxInside = make([]float64, ns)
		res.FrostDepth = make([]float64, ns)
		res.ThawDepth = make([]float64, ns)
		for j := range res.Probe {
			res.Probe[j] = make([]float64, ns)
		}
	}
	for i := range res.Min {
		res.Min[i] = math.Inf(1)
		res.Max[i] = math.Inf(-1)
	}
	r.res = res
}

// surfaces returns the surface inflows and the surface temperatures on
// the column side of the surface resistances for the current state.
func (r *fvRun) surfaces() (qo, qi, tso, tsi float64) {
	n := r.n
	T := r.T
	qo, qi = r.out.inflow(r.vo, T[0]), r.in.inflow(r.vi, T[n-1])
	if r.out.kind == Environment && r.out.rb == 0 {
		tso = r.vo
	} else {
		tso = T[0] + qo*(r.rh[0]+r.rf[0])
	}
	if r.in.kind == Environment && r.in.rb == 0 {
		tsi = r.vi
	} else {
		tsi = T[n-1] + qi*(r.rd[n-1]+r.rf[n])
	}
	return qo, qi, tso, tsi
}

// sample records sample k at time t, or hands it to Problem.Observe.
func (r *fvRun) sample(k int, t float64) {
	res := r.res
	n := r.n
	T := r.T
	qo, qi, tso, tsi := r.surfaces()
	s := &r.smp
	s.Index, s.Time = k, t
	s.SurfaceOutside, s.SurfaceInside = tso, tsi
	s.FluxOutside, s.FluxInside = qo, -qi
	// Interval means from the heat the time scheme let in (the same sums as
	// the energy balance); the first sample has no interval and takes the
	// instantaneous value.
	eo, ei := r.eOut.value(), r.eIn.value()
	if k == 0 || t <= r.lastT {
		s.MeanFluxOutside, s.MeanFluxInside = qo, -qi
	} else {
		s.MeanFluxOutside = (eo - r.lastOut) / (t - r.lastT)
		s.MeanFluxInside = -(ei - r.lastIn) / (t - r.lastT)
	}
	r.lastT, r.lastOut, r.lastIn = t, eo, ei
	for j, x := range res.Probes {
		s.Probe[j] = r.probe(x, qo, qi, tso, tsi)
	}
	mn, mx, mean := res.Min[:n], res.Max[:n], res.Mean[:n]
	for i, v := range T[:n] {
		if v < mn[i] {
			mn[i] = v
		}
		if v > mx[i] {
			mx[i] = v
		}
		if k > 0 {
			mean[i] += v
		}
	}
	s.FrostDepth, s.ThawDepth = r.frost(tso)
	if r.p.Observe != nil {
		r.p.Observe(s)
		return
	}
	res.Times[k] = t
	res.SurfaceOutside[k], res.SurfaceInside[k] = tso, tsi
	res.FluxOutside[k], res.FluxInside[k] = s.FluxOutside, s.FluxInside
	res.MeanFluxOutside[k], res.MeanFluxInside[k] = s.MeanFluxOutside, s.MeanFluxInside
	for j := range res.Probe {
		res.Probe[j][k] = s.Probe[j]
	}
	res.FrostDepth[k], res.ThawDepth[k] = s.FrostDepth, s.ThawDepth
}

// probe interpolates the temperature at x by the quadratic through the
// centre of the cell holding x and its two neighbours, where a neighbour
// across a layer interface, a massless layer or a surface is replaced by
// the face temperature on this side (from the flux through the face), and
// clamps it to the range of the three values. The reconstruction is exact
// for the piecewise-linear profiles of steady states and third order where
// the profile is smooth. Surfaces return the surface temperatures.
func (r *fvRun) probe(x, qo, qi, tso, tsi float64) float64 {
	m, T, n := r.m, r.T, r.n
	if x <= 0 {
		return tso
	}
	if x >= m.Faces[n] {
		return tsi
	}
	c := m.CellAt(x)
	if k := r.pidx[c]; k >= 0 && r.phases[k].isoTerm && r.phi[c] > 0 && r.phi[c] < 1 {
		// Partly frozen isothermal cell: linear from each face to the
		// front, which is at the freezing point.
		qa := qo
		if c > 0 {
			qa = r.gg[c-1] * (T[c-1] - T[c])
		}
		qb := -qi
		if c < n-1 {
			qb = r.gg[c] * (T[c] - T[c+1])
		}
		tu, tl := T[c]+qa*r.rh[c], T[c]-qb*r.rd[c]
		f := (1 - r.phi[c]) * r.h[c]
		xf := m.Faces[c] + f
		if !r.sideUp(c) {
			xf = m.Faces[c+1] - f
		}
		if x <= xf {
			if xf == m.Faces[c] {
				return T[c]
			}
			return tu + (T[c]-tu)*(x-m.Faces[c])/(xf-m.Faces[c])
		}
		if xf == m.Faces[c+1] {
			return T[c]
		}
		return T[c] + (tl-T[c])*(x-xf)/(m.Faces[c+1]-xf)
	}
	var x0, t0, x2, t2 float64
	switch {
	case c == 0:
		x0, t0 = m.Faces[0], T[0]+qo*r.rh[0]
	case m.Layer[c-1] != m.Layer[c] || m.FaceResistance[c] != 0:
		x0, t0 = m.Faces[c], T[c]+r.gg[c-1]*(T[c-1]-T[c])*r.rh[c]
	default:
		x0, t0 = m.Centers[c-1], T[c-1]
	}
	switch {
	case c == n-1:
		x2, t2 = m.Faces[n], T[c]+qi*r.rd[c]
	case m.Layer[c+1] != m.Layer[c] || m.FaceResistance[c+1] != 0:
		x2, t2 = m.Faces[c+1], T[c]-r.gg[c]*(T[c]-T[c+1])*r.rd[c]
	default:
		x2, t2 = m.Centers[c+1], T[c+1]
	}
	x1, t1 := m.Centers[c], T[c]
	// Lagrange quadratic through (x0,t0), (x1,t1), (x2,t2).
	v := t0*(x-x1)*(x-x2)/((x0-x1)*(x0-x2)) +
		t1*(x-x0)*(x-x2)/((x1-x0)*(x1-x2)) +
		t2*(x-x0)*(x-x1)/((x2-x0)*(x2-x1))
	lo, hi := math.Min(t0, math.Min(t1, t2)), math.Max(t0, math.Max(t1, t2))
	return math.Min(math.Max(v, lo), hi)
}

// frozen reports whether cell i is at or below its freezing point: some
// ice in a freezing layer (liquid fraction below 1 - 1e-6, so that water
// resting exactly at its freezing point does not count through round-off),
// T <= 0 degC in another layer.
func (r *fvRun) frozen(i int) bool {
	if r.pidx[i] >= 0 {
		return r.phi[i] < 1-1e-6
	}
	return r.T[i] <= r.thr[i]
}

// frost returns the frost depth and the thaw depth (m) of the current
// state; tso is the outside surface temperature. In a cell with isothermal
// freezing, or with a freezing range narrower than the cell (a partly
// frozen cell next to a fully frozen one), the front is placed inside the
// cell by its ice content: the deepest ice reaches the cell's upper face
// plus its frozen fraction of the cell width, and the thawed part of the
// topmost frozen cell is its liquid fraction of the width from its upper
// face (the enthalpy method's front position, Voller and Cross, Int. J.
// Heat Mass Transfer 24 (1981) 545 [memory]). The front so moves
// continuously with the ice: a cell's last ice shrinks towards the frozen
// ground it belongs to, and never stands at the cell's far face (which
// read a thin lens as frost one whole cell deeper). Elsewhere the
// freezing-point isotherm is interpolated linearly between cell centres
// (or the surface).
func (r *fvRun) frost(tso float64) (frost, thaw float64) {
	m, T, n, thr := r.m, r.T, r.n, r.thr
	iso := func(i int) bool { k := r.pidx[i]; return k >= 0 && r.phases[k].isoTerm }
	// thin reports whether cell i holds, in a freezing range, a mushy zone
	// thinner than the cell: partly frozen between a fully frozen (or
	// surface) side and an unfrozen side. Its front is then placed by the
	// frozen fraction, as for isothermal freezing.
	solid := func(j int) bool {
		if r.pidx[j] >= 0 {
			return r.phi[j] <= 1e-6
		}
		return T[j] <= thr[j]
	}
	thin := func(i, frozenSide int) bool {
		if r.pidx[i] < 0 || r.phi[i] <= 1e-6 || r.phi[i] >= 1-1e-6 {
			return false
		}
		return frozenSide < 0 || frozenSide >= n || solid(frozenSide)
	}
	cross := func(x0, t0, x1, t1, th float64) float64 {
		if t1 == t0 {
			return x0
		}
		return x0 + (x1-x0)*math.Min(math.Max((th-t0)/(t1-t0), 0), 1)
	}
	deep := -1
	for i := n - 1; i >= 0; i-- {
		if r.frozen(i) {
			deep = i
			break
		}
	}
	switch {
	case deep < 0:
		if tso < thr[0] {
			frost = cross(0, tso, m.Centers[0], T[0], thr[0])
		}
	case iso(deep) || thin(deep, deep-1):
		frost = m.Faces[deep] + (1-r.phi[deep])*r.h[deep]
	case deep == n-1:
		frost = m.Faces[n]
	case iso(deep + 1):
		frost = m.Faces[deep+1]
	default:
		frost = cross(m.Centers[deep], T[deep], m.Centers[deep+1], T[deep+1], thr[deep])
	}
	if deep < 0 || tso <= thr[0] {
		return frost, 0
	}
	top := 0
	for top < n && !r.frozen(top) {
		top++
	}
	switch {
	case iso(top) || thin(top, top+1):
		thaw = m.Faces[top] + r.phi[top]*r.h[top]
	case top == 0:
		thaw = cross(0, tso, m.Centers[0], T[0], thr[0])
	case iso(top - 1):
		thaw = m.Faces[top]
	default:
		thaw = cross(m.Centers[top-1], T[top-1], m.Centers[top], T[top], thr[top])
	}
	return frost, thaw
}
