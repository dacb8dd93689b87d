package solver

import "math"

// fvTolCut is the size of an enthalpy correction, in kelvin of the cell's
// smaller heat capacity, below which it is round-off: a few units in the
// last place of a temperature of 10 degC. The iterations after the first
// stop their elimination and back-substitution where the correction falls
// below it.
const fvTolCut = 1e-14 // K

// implicit solves h_i (H_i - hrhs_i) = th F_i(T(H)) for H, where F_i is
// the net inflow of cell i with the boundary values vo, vi, starting from
// the current state. Each iteration linearises the face fluxes around the
// current enthalpy, with the slope dT/dH of each cell's phase region and
// the derivatives of the resistances that depend on the frozen fraction
// (Newton on the enthalpy), solves the tridiagonal system for the enthalpy
// change delta, and then sets the enthalpy from the conservative update
// H_i = hrhs_i + th/h_i (linearised net inflow of cell i): every face flux
// enters its two cells with opposite signs. A cell whose update crosses a
// kink of T(H) (an end of the freezing range) is stopped on the kink and
// linearised in the region beyond it in the next iteration, which makes
// the iteration converge where plain Newton would cycle across the kink;
// the iteration ends only on an unclipped, conservative update, so the
// energy balance of every accepted stage is exact to round-off. It
// returns the surface inflows of that update.
//
// Work is spent only where something can change:
//
//   - The system is eliminated from the bottom up and its pivots are kept
//     between iterations and steps: only the rows above the deepest cell
//     whose slope or conductivity changed are factorised again (in a
//     ground column the frost stays near the surface, so the deep rows are
//     reused), with the derivatives of the face fluxes (eliminate).
//   - After an update the residual of a cell is round-off unless the cell
//     or a neighbour left the linear path (its T(H) is not linear there,
//     it was stopped on a kink, or its resistances changed): the linearised
//     fluxes were exact everywhere else. So the iterations after the first
//     eliminate only from the deepest of those rows up, stop where the
//     eliminated residual above them falls below round-off (fvTolCut), and
//     below them carry the correction, which decays geometrically there,
//     until it does (tail); the cells outside keep their state.
//   - A freezing cell that stays fully frozen or fully unfrozen is linear:
//     only its temperature is updated; its slope, conductivity and
//     resistances stand (TestEnthalpyCachedStateMatchesFresh checks that
//     they equal a fresh evaluation). Cells that cannot freeze skip the
//     phase bookkeeping altogether.
//
// TestEnthalpyIterationGolden holds the answers to those of the iteration
// that did the whole column every time: within 1e-9 K, or within what
// round-off alone moved that iteration's own answers by.
func (r *fvRun) implicit(th, vo, vi float64, rhs fvRHS) (qo, qi float64) {
	r.beginStage(th, &rhs)
	n := r.n
	a, b := 0, n-1 // rows whose residual is more than round-off
	for it := 0; ; it++ {
		r.iterations++
		if it == fvLagAfter {
			r.holdConductances()
		}
		last := it+1 >= fvMaxIter
		ao, ai := r.surfaceSlopes(vo, vi)
		t, start := r.eliminate(vo, vi, ao, ai, a, b, rhs)
		rhs.kind = fvRHSGiven
		sw := r.substitute(vo, vi, ao, ai, t, start, last, &qo, &qi)
		// Every cell in its freezing range leaves the linear path, so it
		// lies in the rows of the next iteration: the sweep saw them all.
		r.mLo, r.mHi = sw.mlo, sw.mhi
		r.newConductances(th, vo, vi, &sw)
		converged := !sw.clipped && sw.errT <= fvTolT && sw.dk <= fvTolK
		if converged || last {
			if !converged {
				r.unconverged++
			}
			r.endLag()
			return qo, qi
		}
		a, b = max(sw.dlo-1, 0), min(sw.dhi+1, n-1)
	}
}

// fvRHS says how the first sweep of a stage forms hrhs.
type fvRHS struct {
	kind     int8
	qo0, qi0 float64 // surface inflows at the start of the step (fvRHSExplicit)
}

const (
	fvRHSGiven    = iota // hrhs is set
	fvRHSExplicit        // hrhs = H + th/h (net inflow with qo0, qi0), and hn = H (TR-BDF2 stage 1)
	fvRHSBDF2            // hrhs = C1 H - C2 hn (TR-BDF2 stage 2)
)

// beginStage prepares an implicit stage with theta*dt = th: the regions
// of the freezing cells, the side on which partly frozen isothermal cells
// freeze, and the factorisation when th changed.
func (r *fvRun) beginStage(th float64, rhs *fvRHS) {
	n := r.n
	if !r.regOK {
		r.mLo, r.mHi = n, -1
		for _, i := range r.pcells {
			r.reg[i] = r.phases[r.pidx[i]].region(r.H[i])
			if r.reg[i] == 1 {
				r.mLo, r.mHi = min(r.mLo, i), max(r.mHi, i)
			}
		}
		// A stage ends on an unclipped update, which leaves reg as the
		// region of each cell's enthalpy for the next stage, and mLo, mHi
		// around the cells in their freezing range.
		r.regOK = true
	}
	// Only the phase cells are stopped on kinks, and sideUp reads only
	// them and their neighbours.
	lo, hi := r.pwLo, r.pwHi+1
	clear(r.nclip[lo:hi])
	// The side on which an isothermal cell freezes first is decided from
	// the temperatures at the start of the stage (sideUp); a partly
	// frozen cell whose side changed gets new resistances. The other cells
	// take their side when they become partly frozen.
	copy(r.tStart[lo:hi], r.T[lo:hi])
	r.tStartOK = true
	if th != r.nlTh {
		r.nlTh = th
		r.nlDirty = n - 1
		for i, v := range r.invh {
			r.cth[i] = th * v
		}
	}
	for i := max(r.mLo, 0); i <= min(r.mHi, n-1); i++ {
		if r.reg[i] == 1 && r.phases[r.pidx[i]].isoTerm && r.sideUp(i) != r.frozenUp[i] {
			if rhs.kind == fvRHSExplicit {
				// The explicit part sees the conductances before.
				r.explicitRHS(rhs.qo0, rhs.qi0)
				rhs.kind = fvRHSGiven
			}
			r.setHalves(i)
			r.nlDirty = n - 1
			r.updateConductances()
		}
	}
}

// explicitRHS sets hn = H and hrhs = H + th/h (net inflow) for the
// surface inflows qo0, qi0, as the first sweep does for fvRHSExplicit.
func (r *fvRun) explicitRHS(qo0, qi0 float64) {
	n := r.n
	H, T, gg, cth := r.H[:n], r.T[:n], r.gg, r.cth[:n]
	fl := qo0
	for i := range H {
		fr := -qi0
		if i < n-1 {
			fr = gg[i] * (T[i] - T[i+1])
		}
		r.hn[i] = H[i]
		r.hrhs[i] = H[i] + cth[i]*(fl-fr)
		fl = fr
	}
}

// holdConductances keeps the resistances of the current iteration for the
// rest of the stage. The resistances of a partly frozen cell jump where it
// becomes fully frozen or unfrozen (its node moves from the front to the
// centre); a solution sitting on that kink makes them alternate. Held,
// the iteration converges on T(H) alone.
func (r *fvRun) holdConductances() {
	r.lagG = true
	for _, j := range r.pcells {
		if r.dru[j] != 0 || r.drd[j] != 0 {
			r.dru[j], r.drd[j] = 0, 0
			r.nlDirty = max(r.nlDirty, min(j+1, r.n-1))
		}
	}
}

// surfaceSlopes returns the derivatives d(inflow)/dH of the two surface
// cells' inflows.
func (r *fvRun) surfaceSlopes(vo, vi float64) (ao, ai float64) {
	n := r.n
	if r.out.kind == Environment {
		g := r.out.g
		ao = -g*r.slope[0] - (vo-r.T[0])*g*g*r.dru[0]
	}
	if r.in.kind == Environment {
		g := r.in.g
		ai = -g*r.slope[n-1] - (vi-r.T[n-1])*g*g*r.drd[n-1]
	}
	return ao, ai
}

// eliminate factorises the rows of the enthalpy system that need it and
// eliminates the residual from the bottom up, and returns the rows t to
// start that the back-substitution needs: start is the deepest row with
// a residual (b) or a new factorisation, t is 0 or, when the residual is
// round-off above row a, the row above which the eliminated residual is.
//
// Row i, divided by h_i, reads with c_i = th/h_i
//
//	(1 - c_i dN_i) delta_i - c_i a_{i-1} delta_{i-1} + c_i b_i delta_{i+1} = R_i
//	R_i = hrhs_i - H_i + c_i (F_{i-1} - F_i)
//
// where face j between cells j and j+1 carries F_j = G_j (T_j - T_{j+1}),
// a_j = dF_j/dH_j and b_j = dF_j/dH_{j+1} (including dG/dH), and dN_i =
// b_{i-1} - a_i is the derivative of the cell's net inflow. From the
// bottom up: piv_i = 1 - c_i dN_i - up_i w_{i+1}, w_i = lo_i/piv_i,
// u_i = up_i/piv_i, y_i = R_i/piv_i - u_i y_{i+1}. The faces of the rows kept join
// linear cells: their a, b depend on neither T nor H. In the first sweep
// of a stage (which covers the whole column) hrhs is formed as rhs says.
func (r *fvRun) eliminate(vo, vi, ao, ai float64, a, b int, rhs fvRHS) (t, start int) {
	n := r.n
	T, H, hrhs, cth, y := r.T[:n], r.H[:n], r.hrhs[:n], r.cth[:n], r.rhs[:n]
	rows, gg, cut := r.rows[:n], r.gg, r.cutH[:n]
	dirty := r.nlDirty
	start = max(b, dirty)
	var fBelow, wNext float64
	if start == n-1 {
		fBelow = -r.in.inflow(vi, T[n-1])
	} else {
		fBelow = gg[start] * (T[start] - T[start+1])
		wNext = rows[start+1].w
	}
	qo := r.out.inflow(vo, T[0])
	var aL, bL, yNext float64 // derivatives of the face below row i; y_{i+1}
	for i := start; i >= 0; i-- {
		if lo := max(dirty+1, 1); i < n-1 && i >= lo {
			// Interior rows whose factorisation is kept.
			cutAt := -1
			if rhs.kind == fvRHSGiven {
				fBelow, yNext, cutAt = r.elimKept(i, lo, a, fBelow, yNext)
			} else {
				fBelow, yNext = r.elimFirst(i, lo, fBelow, yNext, rhs.kind == fvRHSExplicit)
			}
			if cutAt >= 0 {
				r.nlDirty = min(dirty, cutAt-1)
				return cutAt + 1, start
			}
			wNext, i = rows[lo].w, lo
			continue
		}
		if i < dirty && i > 0 && i < n-1 {
			// Interior rows factorised again, from i down to row 1.
			var cutAt int
			fBelow, yNext, wNext, aL, bL, cutAt = r.elimDirty(i, a, fBelow, yNext, wNext, aL, bL, rhs)
			if cutAt >= 0 {
				r.nlDirty = min(dirty, cutAt-1)
				return cutAt + 1, start
			}
			i = 1
			continue
		}
		fAbove := qo
		if i > 0 {
			fAbove = gg[i-1] * (T[i-1] - T[i])
		}
		rw, c := &rows[i], cth[i]
		if i <= dirty {
			if i == dirty && i < n-1 {
				aL, bL = r.faceSlopes(i)
				rw.fa, rw.fb = aL, bL
			}
			// piv_i = 1 - c_i dN_i - up_i w_{i+1}, dN_i = b_{i-1} - a_i.
			aU, bU, dN, up := 0.0, 0.0, ao, 0.0
			if i > 0 {
				aU, bU = r.faceSlopes(i - 1)
				rows[i-1].fa, rows[i-1].fb = aU, bU
				dN = bU
			}
			if i < n-1 {
				dN -= aL
				up = c * bL
			} else {
				dN += ai
			}
			ip := 1 / (1 - c*dN - up*wNext)
			rw.ip, rw.u, rw.w = ip, up*ip, -c*aU*ip
			aL, bL = aU, bU
		}
		if rhs.kind != fvRHSGiven {
			r.formRHS(i, fAbove, fBelow, rhs)
		}
		// One multiplication and one subtraction on the recurrence.
		yi := (hrhs[i]-H[i]+c*(fAbove-fBelow))*rw.ip - rw.u*yNext
		y[i] = yi
		if i < a && math.Abs(yi) <= cut[i] {
			// Rows i-1 and above keep their old pivots for now.
			r.nlDirty = min(dirty, i-1)
			return i + 1, start
		}
		yNext, wNext, fBelow = yi, rw.w, fAbove
	}
	r.nlDirty = -1
	return 0, start
}

// elimDirty is eliminate over the interior rows hi down to 1 (hi < n-1)
// that are factorised again, from the flux fBelow through the face below
// row hi, y_{hi+1} = yNext, w_{hi+1} = wNext and the derivatives aL, bL
// of that face's flux. It forms hrhs as rhs says. It returns the same
// quantities for row 1 (the face above it, y_1, w_1 and the derivatives
// of the face above row 1), or, if it stopped at a row above a whose
// eliminated residual is round-off, that row's flux, y and index (else
// cut < 0). The arithmetic is that of the general loop of eliminate,
// operation for operation.
func (r *fvRun) elimDirty(hi, a int, fBelow, yNext, wNext, aL, bL float64, rhs fvRHS) (f, y, w, aU, bU float64, cut int) {
	// Row j is index j of the windows (T, slope, dru, drd up to row hi+1).
	T, s := r.T[:hi+2], r.slope[:hi+2]
	dru, drd := r.dru[:hi+2], r.drd[:hi+2]
	gg, rows := r.gg[:hi+1], r.rows[:hi+1]
	H, hrhs, hn, cth := r.H[:hi+1], r.hrhs[:hi+1], r.hn[:hi+1], r.cth[:hi+1]
	ys, cutH := r.rhs[:hi+1], r.cutH[:hi+1]
	kind := rhs.kind
	c1, c2 := fvC1, fvC2
	for i := hi; i >= 1; i-- {
		ti, tu := T[i], T[i-1]
		g := gg[i-1]
		fAbove := g * (tu - ti)
		// faceSlopes(i-1).
		gd := (tu - ti) * g * g
		aU, bU = g*s[i-1]-gd*drd[i-1], -g*s[i]-gd*dru[i]
		rows[i-1].fa, rows[i-1].fb = aU, bU
		c := cth[i]
		// piv_i = 1 - c_i dN_i - up_i w_{i+1}, dN_i = b_{i-1} - a_i.
		dN := bU
		dN -= aL
		up := c * bL
		ip := 1 / (1 - c*dN - up*wNext)
		rw := &rows[i]
		u := up * ip
		wi := -c * aU * ip
		rw.ip, rw.u, rw.w = ip, u, wi
		switch kind {
		case fvRHSExplicit:
			hn[i] = H[i]
			hrhs[i] = H[i] + cth[i]*(fAbove-fBelow)
		case fvRHSBDF2:
			hrhs[i] = c1*H[i] - c2*hn[i]
		}
		yi := (hrhs[i]-H[i]+c*(fAbove-fBelow))*ip - u*yNext
		ys[i] = yi
		if i < a && math.Abs(yi) <= cutH[i] {
			return fAbove, yi, wi, aU, bU, i
		}
		aL, bL = aU, bU
		yNext, wNext, fBelow = yi, wi, fAbove
	}
	return fBelow, yNext, wNext, aL, bL, -1
}

// faceSlopes returns a_j = dF_j/dH_j and b_j = dF_j/dH_{j+1} of the flux
// F_j = G_j (T_j - T_{j+1}) through face j, including dG/dH.
func (r *fvRun) faceSlopes(j int) (a, b float64) {
	g := r.gg[j]
	gd := (r.T[j] - r.T[j+1]) * g * g
	return g*r.slope[j] - gd*r.drd[j], -g*r.slope[j+1] - gd*r.dru[j+1]
}

// formRHS forms hrhs_i in the first sweep of a stage as rhs says, from
// the fluxes through the faces above and below row i.
func (r *fvRun) formRHS(i int, fAbove, fBelow float64, rhs fvRHS) {
	switch rhs.kind {
	case fvRHSExplicit:
		if i == 0 {
			fAbove = rhs.qo0
		}
		if i == r.n-1 {
			fBelow = -rhs.qi0
		}
		r.hn[i] = r.H[i]
		r.hrhs[i] = r.H[i] + r.cth[i]*(fAbove-fBelow)
	case fvRHSBDF2:
		r.hrhs[i] = fvC1*r.H[i] - fvC2*r.hn[i]
	}
}

// elimKept is eliminate over the interior rows hi down to lo (1 <= lo <=
// hi < n-1) whose factorisation is kept, with hrhs set, from the flux
// fBelow through the face below row hi and y_{hi+1} = yNext. It returns the flux through the
// face above row lo and y_lo, or, if it stopped at a row above a whose
// eliminated residual is round-off, that row's flux, y and index (else
// cut < 0).
func (r *fvRun) elimKept(hi, lo, a int, fBelow, yNext float64) (f, y float64, cut int) {
	// Row lo+j is index j of the windows (T: cell lo-1+j; gg: the face
	// above row lo+j); equal lengths let the compiler drop the bounds
	// checks.
	gg := r.gg[lo-1 : hi]
	m := len(gg)
	T := r.T[lo-1 : lo+m]
	H, hrhs, cth := r.H[lo:lo+m], r.hrhs[lo:lo+m], r.cth[lo:lo+m]
	ys, rows, cutH := r.rhs[lo:lo+m], r.rows[lo:lo+m], r.cutH[lo:lo+m]
	tBelow := T[m]
	for j := m - 1; j >= 0; j-- {
		tj := T[j]
		fAbove := gg[j] * (tj - tBelow)
		rw := &rows[j]
		// One multiplication and one subtraction on the recurrence.
		yi := (hrhs[j]-H[j]+cth[j]*(fAbove-fBelow))*rw.ip - rw.u*yNext
		ys[j] = yi
		if lo+j < a && math.Abs(yi) <= cutH[j] {
			return fAbove, yi, lo + j
		}
		yNext, fBelow, tBelow = yi, fAbove, tj
	}
	return fBelow, yNext, -1
}

// elimFirst is elimKept in the first sweep of a TR-BDF2 stage, which
// also forms hrhs: H + th/h (net inflow) and hn = H in stage 1
// (explicit), C1 H - C2 hn in stage 2.
func (r *fvRun) elimFirst(hi, lo int, fBelow, yNext float64, explicit bool) (f, y float64) {
	gg := r.gg[lo-1 : hi]
	m := len(gg)
	T := r.T[lo-1 : lo+m]
	H, hrhs, hn, cth := r.H[lo:lo+m], r.hrhs[lo:lo+m], r.hn[lo:lo+m], r.cth[lo:lo+m]
	ys, rows := r.rhs[lo:lo+m], r.rows[lo:lo+m]
	tBelow := T[m]
	if explicit {
		for j := m - 1; j >= 0; j-- {
			tj := T[j]
			fAbove := gg[j] * (tj - tBelow)
			hj, d := H[j], cth[j]*(fAbove-fBelow)
			hn[j] = hj
			hr := hj + d
			hrhs[j] = hr
			yi := (hr-hj+d)*rows[j].ip - rows[j].u*yNext
			ys[j] = yi
			yNext, fBelow, tBelow = yi, fAbove, tj
		}
		return fBelow, yNext
	}
	for j := m - 1; j >= 0; j-- {
		tj := T[j]
		fAbove := gg[j] * (tj - tBelow)
		hj := H[j]
		hr := fvC1*hj - fvC2*hn[j]
		hrhs[j] = hr
		yi := (hr-hj+cth[j]*(fAbove-fBelow))*rows[j].ip - rows[j].u*yNext
		ys[j] = yi
		yNext, fBelow, tBelow = yi, fAbove, tj
	}
	return fBelow, yNext
}

// fvSweep is what one back-substitution found.
type fvSweep struct {
	t, e     int     // rows updated
	errT     float64 // K, largest difference between a cell's new and linearised temperature
	dk       float64 // largest relative change of a cell's resistances
	clipped  bool    // a cell was stopped on a kink
	klo, khi int     // cells whose resistances changed
	dlo, dhi int     // cells off the linear path
	mlo, mhi int     // cells updated that are in their freezing range
}

// substitute runs the back-substitution from row t down,
// delta_t = y_t (delta_{t-1} = 0 when t > 0), delta_{i+1} = y_{i+1} -
// w_{i+1} delta_i, with the conservative update of each cell down to
// row start once the fluxes through both its faces are known, and the new
// state of the cell. Below start (see tail) the correction only decays.
// qo and qi receive the linearised surface inflows when the surface cells
// are updated.
func (r *fvRun) substitute(vo, vi, ao, ai float64, t, start int, last bool, qo, qi *float64) fvSweep {
	n := r.n
	T, s, H, hrhs, cth, y := r.T[:n], r.slope[:n], r.H[:n], r.hrhs[:n], r.cth[:n], r.rhs[:n]
	rows, gg := r.rows[:n], r.gg
	sw := fvSweep{t: t, e: n - 1, klo: n, khi: -1, dlo: n, dhi: -1, mlo: n, mhi: -1}
	x := y[t]
	var fAbove float64
	if t == 0 {
		*qo = r.out.inflow(vo, T[0]) + ao*x
		fAbove = *qo
	} else {
		fAbove = gg[t-1]*(T[t-1]-T[t]) + rows[t-1].fb*x
	}
	for _, sp := range r.spans {
		if sp.hi <= t {
			continue
		}
		if sp.lo > start {
			break
		}
		i0 := max(sp.lo, t)
		if !sp.phase && i0 < start && i0 < min(sp.hi, start)-1 {
			// Cells that cannot freeze, each with a neighbour below.
			x, fAbove = r.substLinear(i0, min(sp.hi, start)-1, x, fAbove)
			i0 = min(sp.hi, start) - 1
		}
		if sp.phase && i0 < start && i0 < min(sp.hi, start)-1 {
			x, fAbove = r.substPhase(i0, min(sp.hi, start)-1, x, fAbove, last, &sw)
			i0 = min(sp.hi, start) - 1
		}
		for i := i0; i < min(sp.hi, start+1); i++ {
			var fBelow, xn float64
			if i < n-1 {
				if i < start {
					xn = y[i+1]
				}
				xn -= rows[i+1].w * x
				// Linearised face flux F_i + a_i delta_i + b_i delta_{i+1}.
				fBelow = gg[i]*(T[i]-T[i+1]) + rows[i].fa*x + rows[i].fb*xn
			} else {
				*qi = r.in.inflow(vi, T[i]) + ai*x
				fBelow = -*qi
			}
			hi := hrhs[i] + cth[i]*(fAbove-fBelow)
			H[i] = hi
			if sp.phase {
				r.phaseState(i, T[i]+s[i]*x, last, &sw)
			} else {
				// T(H) is linear: T - (T + s delta) is the rounding of
				// the solve, far below fvTolT.
				T[i] = hi * s[i]
			}
			x, fAbove = xn, fBelow
		}
	}
	if start < n-1 {
		r.tail(start+1, x, vi, ai, last, qi, &sw)
	}
	return sw
}

// substLinear is substitute over rows lo to hi-1 (hi <= start), cells
// that cannot freeze, from delta_lo = x and the flux fAbove through the
// face above row lo; it returns delta_hi and the flux through the face
// above row hi. Their T(H) is linear: T - (T + s delta) is the rounding of
// the solve, far below fvTolT, and is not looked at.
func (r *fvRun) substLinear(lo, hi int, x, fAbove float64) (float64, float64) {
	// Row lo+j is index j of the windows; equal lengths let the compiler
	// drop the bounds checks.
	gg := r.gg[lo:hi]
	m := len(gg)
	T, rows := r.T[lo:lo+m+1], r.rows[lo:lo+m+1]
	s, H, hrhs, cth := r.slope[lo:lo+m], r.H[lo:lo+m], r.hrhs[lo:lo+m], r.cth[lo:lo+m]
	y := r.rhs[lo+1 : lo+1+m]
	tj := T[0]
	for j := 0; j < m; j++ {
		xn := y[j] - rows[j+1].w*x
		tn := T[j+1]
		fBelow := gg[j]*(tj-tn) + rows[j].fa*x + rows[j].fb*xn
		hj := hrhs[j] + cth[j]*(fAbove-fBelow)
		H[j] = hj
		T[j] = hj * s[j]
		x, fAbove, tj = xn, fBelow, tn
	}
	return x, fAbove
}

// substPhase is substitute over rows lo to hi-1 (hi <= start), cells
// that can freeze, from delta_lo = x and the flux fAbove through the face
// above row lo; it returns delta_hi and the flux through the face above
// row hi. A cell that stays fully unfrozen or fully frozen is updated
// here (as in phaseState, without looking at the rounding of its linear
// T(H)), the others by phaseCell.
func (r *fvRun) substPhase(lo, hi int, x, fAbove float64, last bool, sw *fvSweep) (float64, float64) {
	gg := r.gg[lo:hi]
	m := len(gg)
	T, rows := r.T[lo:lo+m+1], r.rows[lo:lo+m+1]
	s, H, hrhs, cth := r.slope[lo:lo+m], r.H[lo:lo+m], r.hrhs[lo:lo+m], r.cth[lo:lo+m]
	reg, pidx := r.reg[lo:lo+m], r.pidx[lo:lo+m]
	y := r.rhs[lo+1 : lo+1+m]
	phases := r.phases
	for j := 0; j < m; j++ {
		xn := y[j] - rows[j+1].w*x
		// Linearised face flux F_i + a_i delta_i + b_i delta_{i+1}.
		fBelow := gg[j]*(T[j]-T[j+1]) + rows[j].fa*x + rows[j].fb*xn
		hj := hrhs[j] + cth[j]*(fAbove-fBelow)
		H[j] = hj
		// A cell that stays fully unfrozen or frozen is linear there:
		// T - (T + s delta) is the rounding of the solve, far below
		// fvTolT (a NaN fails both tests and goes to phaseCell).
		switch ph := &phases[pidx[j]]; {
		case reg[j] == 2 && hj >= ph.hp:
			T[j] = ph.tp + (hj-ph.hp)/ph.cu
		case reg[j] == 0 && hj <= 0:
			T[j] = ph.tl + hj/ph.cf
		default:
			r.phaseCell(lo+j, T[j]+s[j]*x, last, sw)
		}
		x, fAbove = xn, fBelow
	}
	return x, fAbove
}

// tail carries the correction below row start, where the residual is
// round-off and the correction decays, delta_i = -w_i delta_{i-1}, from
// row i down to where it falls below round-off, adding it to each cell's
// enthalpy. (The conservative update, which sums the fluxes afresh,
// would add the rounding of the fluxes, amplified by th G/(h C), to cells
// whose residual the iteration does not see: repeated, it grows.)
func (r *fvRun) tail(i int, x, vi, ai float64, last bool, qi *float64, sw *fvSweep) {
	n := r.n
	T, s, H, rows, cut, pidx := r.T[:n], r.slope[:n], r.H[:n], r.rows[:n], r.cutH[:n], r.pidx[:n]
	for ; i < n; i++ {
		if math.Abs(x) <= cut[i] {
			sw.e = i - 1
			return
		}
		if i == n-1 {
			*qi = r.in.inflow(vi, T[i]) + ai*x
		}
		H[i] += x
		if pidx[i] < 0 {
			T[i] = H[i] * s[i]
		} else {
			r.phaseState(i, T[i]+s[i]*x, last, sw)
		}
		if i < n-1 {
			x = -rows[i+1].w * x
		}
	}
}

// phaseState sets the state of freezing cell i from its new enthalpy; tl
// is its linearised temperature. A cell still fully unfrozen or fully
// frozen is linear: its slope, conductivity and resistances are those it
// had (updateCell would set the same values), so only its temperature
// changes, by the formulas of state.
func (r *fvRun) phaseState(i int, tl float64, last bool, sw *fvSweep) {
	ph, hi := &r.phases[r.pidx[i]], r.H[i]
	switch {
	case r.reg[i] == 2 && hi >= ph.hp:
		r.T[i] = ph.tp + (hi-ph.hp)/ph.cu
	case r.reg[i] == 0 && hi <= 0:
		r.T[i] = ph.tl + hi/ph.cf
	default:
		r.phaseCell(i, tl, last, sw)
		return
	}
	if e := math.Abs(r.T[i] - tl); e > sw.errT || e != e {
		sw.errT = e
	}
}

// phaseCell sets the state of freezing cell i, off the linear path, from
// its new enthalpy H_i; tl is its linearised temperature.
func (r *fvRun) phaseCell(i int, tl float64, last bool, sw *fvSweep) {
	n := r.n
	ph := &r.phases[r.pidx[i]]
	reg := r.reg
	sw.dlo, sw.dhi = min(sw.dlo, i), max(sw.dhi, i)
	rn := ph.region(r.H[i])
	sold, ruOld, rdOld := r.slope[i], r.rh[i], r.rd[i]
	druOld, drdOld := r.dru[i], r.drd[i]
	if rn != reg[i] && r.nclip[i] < 4 && !last {
		r.stopOnKink(i, rn)
		sw.clipped = true
	} else {
		r.updateCell(i)
		reg[i] = rn
	}
	if reg[i] == 1 {
		sw.mlo, sw.mhi = min(sw.mlo, i), max(sw.mhi, i)
	}
	if e := math.Abs(r.T[i] - tl); e > sw.errT || e != e {
		sw.errT = e
	}
	if r.rh[i] != ruOld || r.rd[i] != rdOld {
		rs := r.rh[i] + r.rd[i]
		sw.dk = math.Max(sw.dk, math.Max(math.Abs(r.rh[i]-ruOld), math.Abs(r.rd[i]-rdOld))/rs)
		sw.klo, sw.khi = min(sw.klo, i), max(sw.khi, i)
	}
	// The rows next to a cell whose slope, resistances or their
	// derivatives are (or were, in the rows kept) not those of a linear
	// cell are factorised again.
	if r.rh[i] != ruOld || r.rd[i] != rdOld || r.slope[i] != sold || r.dru[i] != 0 || r.drd[i] != 0 || druOld != 0 || drdOld != 0 {
		r.nlDirty = max(r.nlDirty, min(i+1, n-1))
	}
}

// stopOnKink stops freezing cell i, whose update went from its region
// into region rn, on the first kink of T(H) it crossed, and gives it the
// state seen from the region beyond, where the next iteration continues.
func (r *fvRun) stopOnKink(i int, rn int8) {
	ph, reg := &r.phases[r.pidx[i]], r.reg
	next := reg[i] + 1
	if rn < reg[i] {
		next = reg[i] - 1
	}
	atHp := (rn > reg[i] && reg[i] == 1) || (rn < reg[i] && reg[i] == 2)
	r.H[i] = 0
	if atHp {
		r.H[i] = ph.hp
	}
	r.T[i], r.phi[i], r.slope[i], r.kc[i] = ph.kink(atHp, next)
	r.setHalves(i)
	reg[i] = next
	r.nclip[i]++
}

// newConductances brings the conductances next to the cells whose
// resistances changed in line with them. If the iteration has otherwise
// converged, the linearised fluxes were exact except next to those cells:
// when the residual of the conservation equation there, in kelvin of the
// cell's heat capacity, is negligible, the stage has converged too and
// sw.dk is cleared.
func (r *fvRun) newConductances(th, vo, vi float64, sw *fvSweep) {
	if sw.khi < 0 {
		return
	}
	n, gg := r.n, r.gg
	for j := max(sw.klo-1, 0); j <= min(sw.khi, n-2); j++ {
		gg[j] = 1 / (r.rd[j] + r.rf[j+1] + r.rh[j+1])
	}
	if sw.klo == 0 {
		r.out.setG(r.rh[0])
	}
	if sw.khi == n-1 {
		r.in.setG(r.rd[n-1])
	}
	if !(sw.dk > fvTolK && !sw.clipped && sw.errT <= fvTolT) {
		return
	}
	T, H, h, hrhs := r.T, r.H, r.h, r.hrhs
	for j := max(sw.klo-1, 0); j <= min(sw.khi+1, n-1); j++ {
		fa := r.out.inflow(vo, T[0])
		if j > 0 {
			fa = gg[j-1] * (T[j-1] - T[j])
		}
		fb := -r.in.inflow(vi, T[n-1])
		if j < n-1 {
			fb = gg[j] * (T[j] - T[j+1])
		}
		res := math.Abs(h[j]*(hrhs[j]-H[j])+th*(fa-fb)) / (h[j] * r.cmin[j])
		if res > fvTolR {
			sw.dk = math.Inf(1)
			return
		}
	}
	sw.dk = 0
}
