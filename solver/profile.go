package solver

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"sort"
)

// This file gives the periodic steady state of a column at any depth: the
// complex amplitudes of temperature and heat flux for one harmonic
// (Harmonic), the mean state (Steady, SteadyWithBottomFlux), and the
// response of a ground column to its surface forcing (GroundPeriodic,
// SurfaceAdmittance, SwingDepth).
//
// Method. The column is cut into elements (surface resistances, massless
// layers, slabs) with a node at every requested position. A solution with
// one environment temperature zero is built from that side: its state
// vector is propagated element by element with the ISO 13786 transfer
// matrices (normalised at every step, so only its direction is kept) and
// the amplitude is fixed at the forced environment. Propagating towards the
// forced side follows the growing solution, and amplitudes are recovered
// by dividing by the growth factors, so thick layers lose no accuracy and
// nothing overflows. Walls superpose the two one-sided solutions; a ground
// column ends in a half-space whose only bounded solution is
// theta = theta0 exp(-k (x - x0)), k = (1+i)/delta = sqrt(i omega / a)
// (the decaying root for exp(+i omega t)), which fixes q/theta = lambda k
// at the top of the last layer (terminating impedance 1/(lambda k)).

// tmInterfaceTol is the distance (relative to the column thickness) within
// which a requested position is taken to lie on a layer interface.
const tmInterfaceTol = 1e-12

// tmChain is a column cut into elements with a node between consecutive
// elements; node 0 is the outside environment.
type tmChain struct {
	period  float64
	els     []tmElement
	mats    []ScaledMatrix
	pos     []float64 // node positions, m from the outside surface
	surface int       // node of the outside surface (after Rse)
	inside  int       // node of the inside surface (before Rsi), or top of the half-space
	half    bool
	insul   bool    // the inside face is adiabatic for the harmonic (no Rsi, q = 0)
	hs      Layer   // the half-space layer
	x0      float64 // top of the half-space, m
}

// tmBuildChain cuts c into elements with extra nodes at the positions in
// cuts (already snapped to interfaces where they lie on one).
func tmBuildChain(c Column, period float64, cuts []float64, insulated bool) *tmChain {
	cuts = append([]float64(nil), cuts...)
	sort.Float64s(cuts)
	ch := &tmChain{period: period, half: c.HalfSpace, insul: insulated && !c.HalfSpace, pos: []float64{0}}
	add := func(e tmElement, x float64) {
		ch.els = append(ch.els, e)
		ch.mats = append(ch.mats, e.matrix(period))
		ch.pos = append(ch.pos, x)
	}
	if c.OutsideResistance > 0 {
		add(tmElement{r: c.OutsideResistance}, 0)
	}
	ch.surface = len(ch.pos) - 1
	ifs := c.Interfaces()
	n := len(c.Layers)
	if c.HalfSpace {
		n--
		ch.hs = c.Layers[n]
		ch.x0 = ifs[n]
	}
	for i := 0; i < n; i++ {
		l := c.Layers[i]
		if l.Massless() {
			add(tmElement{r: l.Resistance}, ifs[i+1])
			continue
		}
		top, bot := ifs[i], ifs[i+1]
		prev := top
		for _, x := range cuts {
			if x > prev && x < bot {
				p := l
				p.Thickness = x - prev
				add(tmElement{layer: p}, x)
				prev = x
			}
		}
		p := l
		p.Thickness = bot - prev
		add(tmElement{layer: p}, bot)
	}
	ch.inside = len(ch.pos) - 1
	if !c.HalfSpace && !ch.insul && c.InsideResistance > 0 {
		add(tmElement{r: c.InsideResistance}, ifs[len(ifs)-1])
	}
	return ch
}

// hsK returns lambda and k = (1+i)/delta of the half-space.
func (ch *tmChain) hsK() (complex128, complex128) {
	delta := LayerPenetrationDepth(ch.hs, ch.period)
	return complex(ch.hs.Conductivity, 0), complex(1, 1) / complex(delta, 0)
}

// tmSide is a solution with one environment temperature zero: at node j
// the state is c_j u[j] with u[j] = (theta, q) normalised, q in the ISO
// (-x) direction.
type tmSide struct {
	u     [][2]complex128
	theta []complex128
	q     []complex128
}

func tmNormalize(v [2]complex128) ([2]complex128, float64) {
	n := math.Max(cmplx.Abs(v[0]), cmplx.Abs(v[1]))
	return [2]complex128{v[0] / complex(n, 0), v[1] / complex(n, 0)}, n
}

func tmApply(m Matrix, v [2]complex128) [2]complex128 {
	return [2]complex128{m[0][0]*v[0] + m[0][1]*v[1], m[1][0]*v[0] + m[1][1]*v[1]}
}

// fromOutside returns the solution for outside environment amplitude
// thetaE with the inside environment at 0 (wall) or bounded at depth
// (half-space). The direction u is propagated from the inside outwards:
// u_j ~ Z_j u_{j+1}; with u_j = Z_j u_{j+1} / n_j / exp(s_j) the amplitudes
// obey c_{j+1} = c_j exp(-s_j) / n_j.
func (ch *tmChain) fromOutside(thetaE complex128) tmSide {
	N := len(ch.els)
	s := tmSide{u: make([][2]complex128, N+1), theta: make([]complex128, N+1), q: make([]complex128, N+1)}
	logGrow := make([]float64, N)
	switch {
	case ch.half:
		lam, k := ch.hsK()
		s.u[N], _ = tmNormalize([2]complex128{1, -lam * k}) // q(-x) = -lambda k theta
	case ch.insul:
		s.u[N] = [2]complex128{1, 0} // no periodic flux through the inside face
	default:
		s.u[N] = [2]complex128{0, 1}
	}
	for j := N - 1; j >= 0; j-- {
		var n float64
		s.u[j], n = tmNormalize(tmApply(ch.mats[j].M, s.u[j+1]))
		logGrow[j] = ch.mats[j].LogScale + math.Log(n)
	}
	c := thetaE / s.u[0][0]
	for j := 0; j <= N; j++ {
		s.theta[j] = c * s.u[j][0]
		s.q[j] = c * s.u[j][1]
		if j < N {
			c *= complex(math.Exp(-logGrow[j]), 0)
		}
	}
	return s
}

// fromInside returns the wall solution for inside environment amplitude
// thetaI with the outside environment at 0, propagated from the outside
// inwards with the inverse matrices.
func (ch *tmChain) fromInside(thetaI complex128) tmSide {
	N := len(ch.els)
	s := tmSide{u: make([][2]complex128, N+1), theta: make([]complex128, N+1), q: make([]complex128, N+1)}
	logGrow := make([]float64, N)
	s.u[0] = [2]complex128{0, 1}
	for j := 0; j < N; j++ {
		var n float64
		s.u[j+1], n = tmNormalize(tmApply(ch.mats[j].M.Inverse(), s.u[j]))
		logGrow[j] = ch.mats[j].LogScale + math.Log(n)
	}
	c := thetaI / s.u[N][0]
	for j := N; j >= 0; j-- {
		s.theta[j] = c * s.u[j][0]
		s.q[j] = c * s.u[j][1]
		if j > 0 {
			c *= complex(math.Exp(-logGrow[j-1]), 0)
		}
	}
	return s
}

// node returns the node holding position x (already snapped): the deepest
// node at x, but never beyond the inside surface node.
func (ch *tmChain) node(x float64) int {
	j := sort.Search(ch.inside+1, func(i int) bool { return ch.pos[i] > x }) - 1
	if j < ch.surface {
		j = ch.surface
	}
	return j
}

// tmPositions validates and snaps requested positions: finite, >= 0, and
// <= the thickness unless the column is a half-space. Positions within
// tmInterfaceTol * thickness of an interface are moved onto it.
func tmPositions(c Column, x []float64) ([]float64, error) {
	ifs := c.Interfaces()
	total := ifs[len(ifs)-1]
	tol := tmInterfaceTol * math.Max(total, 1)
	out := make([]float64, len(x))
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("solver: position %g m is not a finite number", v)
		}
		if v < -tol {
			return nil, fmt.Errorf("solver: position %g m lies outside the column (x is measured from the outside surface, >= 0)", v)
		}
		if !c.HalfSpace && v > total+tol {
			return nil, fmt.Errorf("solver: position %g m lies beyond the inside surface at %g m", v, total)
		}
		k := sort.SearchFloat64s(ifs, v)
		for _, j := range []int{k - 1, k} {
			if j >= 0 && j < len(ifs) && math.Abs(ifs[j]-v) <= tol {
				v = ifs[j]
			}
		}
		out[i] = math.Max(v, 0)
	}
	return out, nil
}

// Harmonic returns the periodic steady state of column c for one harmonic
// of period T (s): the complex amplitudes of the temperature (K) and of the
// heat flux density (W/m2, positive in +x, from the outside towards the
// inside) at the positions x (m from the outside surface), given the
// complex amplitudes of the outside and inside environment temperatures
// (behind the surface resistances), in the convention exp(+i omega t): the
// physical temperature is Re(temp[j] exp(i omega t)).
//
// For a wall x must lie in [0, Thickness]; for a half-space column
// (c.HalfSpace) x may exceed the thickness (the last layer continues
// without end) and inside is ignored. A position on an interface where a
// massless layer sits returns the value on the inside (deeper) face of that
// layer, as Column.LayerAt assigns interfaces to the deeper layer; x = 0
// gives the outside surface temperature (after OutsideResistance) and, for a
// wall, x = Thickness the inside surface temperature (before
// InsideResistance). Positions within 1e-12 times the thickness of an
// interface are taken to lie on it.
//
// Method: ISO 13786 transfer matrices with a one-sided sweep per forced
// side (see the package-level comment in profile.go, the file of this
// function).
func Harmonic(c Column, period float64, outside, inside complex128, x []float64) (temp, flux []complex128, err error) {
	ch, xs, err := tmPrepare(c, period, x, false)
	if err != nil {
		return nil, nil, err
	}
	so := ch.fromOutside(outside)
	var si tmSide
	if !c.HalfSpace {
		si = ch.fromInside(inside)
	}
	temp = make([]complex128, len(xs))
	flux = make([]complex128, len(xs))
	for i, v := range xs {
		if c.HalfSpace && v > ch.x0 {
			// Half-space below x0: theta = theta0 exp(-k (x - x0)), q(+x) = lambda k theta
			// (Carslaw and Jaeger, Conduction of Heat in Solids, 2nd ed.,
			// section 2.6 [memory]).
			lam, k := ch.hsK()
			t := so.theta[ch.inside] * cmplx.Exp(-k*complex(v-ch.x0, 0))
			temp[i], flux[i] = t, lam*k*t
			continue
		}
		j := ch.node(v)
		temp[i] = so.theta[j]
		flux[i] = -so.q[j]
		if !c.HalfSpace {
			temp[i] += si.theta[j]
			flux[i] -= si.q[j]
		}
	}
	return temp, flux, nil
}

// tmPrepare checks the column, period and positions of Harmonic and
// HarmonicInsulated and builds their transfer-matrix chain.
func tmPrepare(c Column, period float64, x []float64, insulated bool) (*tmChain, []float64, error) {
	if err := tmCheckColumn(c); err != nil {
		return nil, nil, err
	}
	if err := tmCheckPeriod(period); err != nil {
		return nil, nil, err
	}
	xs, err := tmPositions(c, x)
	if err != nil {
		return nil, nil, err
	}
	return tmBuildChain(c, period, xs, insulated), xs, nil
}

// HarmonicInsulated is Harmonic for a column whose inside face carries no
// periodic heat flux: an adiabatic face, or a face with a constant
// prescribed heat flux (a geothermal flux at the bottom of a finite ground
// column), whose harmonic part is zero. InsideResistance and c.HalfSpace
// are ignored (the column ends at its last layer); x must lie in
// [0, Thickness]. Returned values follow the conventions of Harmonic. This
// is the periodic state a finite-depth simulation with a flux or adiabatic
// bottom starts from.
func HarmonicInsulated(c Column, period float64, outside complex128, x []float64) (temp, flux []complex128, err error) {
	c.HalfSpace = false
	ch, xs, err := tmPrepare(c, period, x, true)
	if err != nil {
		return nil, nil, err
	}
	so := ch.fromOutside(outside)
	temp = make([]complex128, len(xs))
	flux = make([]complex128, len(xs))
	for i, v := range xs {
		j := ch.node(v)
		temp[i], flux[i] = so.theta[j], -so.q[j]
	}
	return temp, flux, nil
}

// tmResistanceTo returns Rse plus the thermal resistance of the column
// from the outside surface to position x (m2 K/W), including a massless
// layer lying at x (deeper-side convention of Harmonic); beyond the last
// interface the last layer continues.
func tmResistanceTo(c Column, x float64) float64 {
	r := c.OutsideResistance
	top := 0.0
	for i, l := range c.Layers {
		if l.Massless() {
			if top <= x {
				r += l.Resistance
			}
			continue
		}
		d := l.Thickness
		if i == len(c.Layers)-1 {
			d = math.Max(d, x-top) // the last layer continues (half-space)
		}
		if x > top {
			r += math.Min(x-top, d) / l.Conductivity
		}
		top += l.Thickness
	}
	return r
}

// Steady returns the steady (time-mean) state of column c: the
// temperature (degC or K) at positions x (m from the outside surface) and
// the heat flux density (W/m2, positive from the outside to the inside)
// for the environment temperatures outside and inside (behind the surface
// resistances). It is the period -> infinity limit of Harmonic.
//
// Wall: q = (outside - inside) / (Rse + sum R + Rsi) and
// T(x) = outside - q (Rse + R(0..x)) (ISO 6946 steady conduction). A
// half-space column with no heat flux at depth is uniform at the outside
// temperature and q = 0 (inside is ignored); use SteadyWithBottomFlux for
// a geothermal gradient. Positions on a massless layer give the value on
// its deeper face, as in Harmonic.
func Steady(c Column, outside, inside float64, x []float64) (temp []float64, flux float64, err error) {
	if err := tmCheckColumn(c); err != nil {
		return nil, 0, err
	}
	xs, err := tmPositions(c, x)
	if err != nil {
		return nil, 0, err
	}
	if !c.HalfSpace {
		rTot := tmResistanceTo(c, c.Thickness()) + c.InsideResistance
		flux = (outside - inside) / rTot
	}
	temp = make([]float64, len(xs))
	for i, v := range xs {
		temp[i] = outside - flux*tmResistanceTo(c, v)
	}
	return temp, flux, nil
}

// SteadyWithBottomFlux returns the steady temperature (degC or K) at the
// positions x (m from the outside surface) when the outside environment is
// at temperature outside and a heat flux density qUp (W/m2) flows UPWARD
// (towards the outside surface, in -x, as geothermal heat does) through
// the column: in the package convention the flux is -qUp everywhere.
// Temperature then increases with depth:
//
//	T(x) = outside + qUp (Rse + integral_0^x dx'/lambda(x'))
//
// (Fourier's law with constant flux; a continental mean geothermal flux is
// 0.065 W/m2, Pollack, Hurter and Johnson 1993). The inside temperature and
// InsideResistance play no part; for a half-space column x may exceed the
// thickness. Positions on a massless layer give its deeper face.
func SteadyWithBottomFlux(c Column, outside, qUp float64, x []float64) ([]float64, error) {
	if err := tmCheckColumn(c); err != nil {
		return nil, err
	}
	if math.IsNaN(qUp) || math.IsInf(qUp, 0) {
		return nil, errors.New("solver: bottom heat flux must be a finite number")
	}
	xs, err := tmPositions(c, x)
	if err != nil {
		return nil, err
	}
	temp := make([]float64, len(xs))
	for i, v := range xs {
		temp[i] = outside + qUp*tmResistanceTo(c, v)
	}
	return temp, nil
}

// GroundResponse is the periodic response of a half-space (ground) column
// to a harmonic of its surface environment temperature.
type GroundResponse struct {
	Period float64 // s

	// SurfaceAdmittance is the complex amplitude of the heat flux density
	// into the ground (+x) per unit complex amplitude of the surface
	// environment temperature, W/(m2 K), OutsideResistance included; its
	// argument (positive) is the lead of the flux over the temperature.
	SurfaceAdmittance complex128

	Depths []float64 // m from the surface, as requested

	// Ratio is theta(z)/theta_env, the complex amplitude of the temperature
	// at each depth per unit amplitude of the surface environment
	// temperature (exp(+i omega t)).
	Ratio []complex128
	// AmplitudeRatio is |Ratio|: 1 at the surface when OutsideResistance is 0,
	// exp(-z/delta) in a homogeneous half-space.
	AmplitudeRatio []float64
	// Lag is the time by which the temperature at each depth lags the
	// surface environment temperature, s, unwrapped (continuous in depth,
	// growing without bound: z/delta * T/(2 pi) in a homogeneous
	// half-space), so it can exceed the period.
	Lag []float64

	PenetrationDepths []float64 // per layer of the column, m
}

// GroundPeriodic returns the periodic response of the half-space column c
// to a harmonic of period T (s) of the surface environment temperature, at
// the given depths (m from the surface, >= 0, any depth). It returns an
// error for a column that is not a half-space (use Periodic and Harmonic for
// walls), an invalid column or period, or an invalid depth.
//
// The lag is followed continuously down the column: each element divides
// the temperature amplitude by r = cosh z + y sinh z (or 1 + R Y for a
// resistance) whose continuous argument is given in closed form (see
// tmPhaseStep); in the half-space the phase falls by (z - x0)/delta.
func GroundPeriodic(c Column, period float64, depths []float64) (GroundResponse, error) {
	if err := tmCheckColumn(c); err != nil {
		return GroundResponse{}, err
	}
	if err := tmCheckPeriod(period); err != nil {
		return GroundResponse{}, err
	}
	if !c.HalfSpace {
		return GroundResponse{}, errors.New("solver: GroundPeriodic needs a half-space column (Column.HalfSpace); use Periodic or Harmonic for a wall")
	}
	xs, err := tmPositions(c, depths)
	if err != nil {
		return GroundResponse{}, err
	}
	ch := tmBuildChain(c, period, xs, false)
	so := ch.fromOutside(1)
	// Continuous phase of theta at every node, node 0 (environment) = 0.
	phase := make([]float64, len(ch.pos))
	for j := range ch.els {
		w := so.u[j+1][1] / so.u[j+1][0]
		phase[j+1] = phase[j] - tmPhaseStep(ch.els[j], period, w, false)
	}
	g := GroundResponse{
		Period:            period,
		SurfaceAdmittance: -so.q[0],
		Depths:            append([]float64(nil), depths...),
		Ratio:             make([]complex128, len(xs)),
		AmplitudeRatio:    make([]float64, len(xs)),
		Lag:               make([]float64, len(xs)),
		PenetrationDepths: make([]float64, len(c.Layers)),
	}
	for i, l := range c.Layers {
		g.PenetrationDepths[i] = LayerPenetrationDepth(l, period)
	}
	tOver2Pi := period / (2 * math.Pi)
	_, k := ch.hsK()
	for i, v := range xs {
		var r complex128
		var ph float64
		if v > ch.x0 {
			r = so.theta[ch.inside] * cmplx.Exp(-k*complex(v-ch.x0, 0))
			ph = phase[ch.inside] - real(k)*(v-ch.x0)
		} else {
			j := ch.node(v)
			r, ph = so.theta[j], phase[j]
		}
		g.Ratio[i] = r
		g.AmplitudeRatio[i] = cmplx.Abs(r)
		if r != 0 {
			ph = tmSnapPhase(ph, cmplx.Phase(r))
		}
		g.Lag[i] = -tOver2Pi * ph
	}
	return g, nil
}

// SurfaceAdmittance returns the complex amplitude of the heat flux density
// entering column c at its outside environment (+x) per unit complex
// amplitude of the outside environment temperature, W/(m2 K), for the
// period T (s), OutsideResistance included; the inside environment (of a
// wall) is held constant. For a wall this is Y22 of ISO 13786; for a
// homogeneous half-space with no surface resistance it is
// lambda k = sqrt(lambda rho c omega) exp(i pi/4).
func SurfaceAdmittance(c Column, period float64) (complex128, error) {
	if err := tmCheckColumn(c); err != nil {
		return 0, err
	}
	if err := tmCheckPeriod(period); err != nil {
		return 0, err
	}
	ch := tmBuildChain(c, period, nil, false)
	return -ch.fromOutside(1).q[0], nil
}

// SwingDepth returns the depth (m from the surface) below which the
// periodic temperature swing of period T (s) in the half-space column c is
// smaller than threshold (K), when the surface environment temperature
// swings with amplitude surfaceAmplitude (K, half the peak-to-peak range).
// For example the annual wave with threshold 0.1 K. (This is not the
// damping depth d = sqrt(2a/omega) of the textbooks, where the swing of a
// uniform half-space has fallen to 1/e: LayerPenetrationDepth gives that.)
//
// The amplitude falls monotonically with depth inside each massive layer
// (d2|theta|^2/dx2 = 2|theta'|^2 >= 0 since Re(k^2) = 0, so |theta|^2 is
// convex, and it tends to 0 at depth [derived]); the depth is bracketed
// between nodes of the exact solution and found by bisection to 1e-12
// relative, and in the homogeneous half-space below the last interface it
// is x0 + delta ln(A(x0)/threshold) exactly. It returns 0 when the surface
// amplitude is already below threshold, and an error for a wall column or
// non-positive threshold.
func SwingDepth(c Column, period, surfaceAmplitude, threshold float64) (float64, error) {
	if err := tmCheckColumn(c); err != nil {
		return 0, err
	}
	if err := tmCheckPeriod(period); err != nil {
		return 0, err
	}
	if !c.HalfSpace {
		return 0, errors.New("solver: SwingDepth needs a half-space column (Column.HalfSpace)")
	}
	if !(threshold > 0) || math.IsInf(threshold, 0) || !(surfaceAmplitude >= 0) || math.IsInf(surfaceAmplitude, 0) {
		return 0, errors.New("solver: SwingDepth needs a finite amplitude >= 0 and a finite threshold > 0")
	}
	ch := tmBuildChain(c, period, nil, false)
	so := ch.fromOutside(complex(surfaceAmplitude, 0))
	amp := func(j int) float64 { return cmplx.Abs(so.theta[j]) }
	if amp(ch.surface) < threshold {
		return 0, nil
	}
	for j := ch.surface + 1; j <= ch.inside; j++ {
		if amp(j) >= threshold {
			continue
		}
		a, b := ch.pos[j-1], ch.pos[j]
		if a == b || ch.els[j-1].isResistance() {
			return a, nil // the swing drops below threshold across a massless layer
		}
		// Bisection within the slab element j-1 between nodes j-1 and j.
		l := ch.els[j-1].layer
		thetaA, ub := so.theta[j-1], so.u[j]
		for it := 0; it < 200 && b-a > 1e-12*math.Max(b, 1e-3); it++ {
			m := 0.5 * (a + b)
			if cmplx.Abs(tmThetaInSlab(l, period, m-ch.pos[j-1], ch.pos[j]-m, thetaA, ub)) >= threshold {
				a = m
			} else {
				b = m
			}
		}
		return 0.5 * (a + b), nil
	}
	// Homogeneous half-space: A(z) = A(x0) exp(-(z - x0)/delta) (Carslaw and
	// Jaeger, section 2.6 [memory]).
	delta := LayerPenetrationDepth(ch.hs, period)
	return ch.x0 + delta*math.Log(amp(ch.inside)/threshold), nil
}

// tmThetaInSlab returns the temperature amplitude at depth d1 inside a slab
// of material l whose top face has amplitude thetaA, the slab continuing
// d2 further down to a face with state direction ub. The direction at the
// point is u = Z(d2) ub and the top amplitude is theta_A = (Z(d1) u)_theta
// times the point's amplitude scale, so theta = theta_A u_theta / (Z(d1) u)_theta,
// a division by the growth factor (stable for thick slabs).
func tmThetaInSlab(l Layer, period, d1, d2 float64, thetaA complex128, ub [2]complex128) complex128 {
	p2, p1 := l, l
	p2.Thickness, p1.Thickness = d2, d1
	z2 := LayerMatrixScaled(p2, period)
	u, _ := tmNormalize(tmApply(z2.M, ub))
	z1 := LayerMatrixScaled(p1, period)
	top := tmApply(z1.M, u)[0]
	return thetaA * u[0] / top * complex(math.Exp(-z1.LogScale), 0)
}
