package solver

import (
	"errors"
	"fmt"
	"math"
)

// RoomProblem is a transient simulation of a room: the finite volumes of
// every element and the air node advanced together.
//
// Times are in seconds, temperatures in degC, heat flows in W.
type RoomProblem struct {
	Room Room
	// Meshes of the elements (RoomMeshes); nil: RoomMeshes(Room, MeshOptions{}).
	Meshes []*Mesh

	Outdoor func(t float64) float64 // outdoor air temperature, degC
	// Back[k] is the environment temperature behind element k (its
	// sol-air temperature where the sun falls), degC; a nil slice or
	// entry means Outdoor. Not used for adiabatic backs.
	Back []func(t float64) float64
	// Gains is the heat delivered to the air node, W (internal gains and
	// transmitted sun); nil: none.
	Gains func(t float64) float64
	// Surface[k] is the heat released at the inside surface of element k
	// (the wall side of its Rsi), W, positive into the room (window sun
	// absorbed there); a nil slice or entry means none. It splits between
	// the air (through Rsi) and the element as the surface node's
	// conductances say: see RoomSimulate.
	Surface []func(t float64) float64
	// Conductance is the heat transfer coefficient between the outdoor
	// air and the room air, W/K (ventilation that changes from day to
	// night, plus the windows' U A); nil: Room.Conductance. It is held
	// over each time step at its value at the step's midpoint: exact for
	// a switch that falls on a step boundary, second order for a smooth
	// change.
	Conductance func(t float64) float64

	InitialAir float64     // degC
	Initial    [][]float64 // degC per cell of each element (nil entry: massless element); nil: every cell at InitialAir

	Start, Duration, Step float64 // s; the last step is shortened to end at Start+Duration
	OutputStep            float64 // s, a whole multiple of Step; 0: every step. The end is always sampled.

	Scheme TimeScheme // TRBDF2 (default) or BackwardEuler
}

// RoomEnergy is the heat budget of a room simulation, J.
//
// Stored is the change of the heat content of the elements and the air;
// the inflows are integrated with the quadrature weights of the time
// scheme, so that Stored = Outdoor + Back + Gains + Surface up to
// round-off. RelativeError is |Stored - Outdoor - Back - Gains - Surface|
// / Exchanged, where Exchanged integrates the absolute values of the
// four inflows.
type RoomEnergy struct {
	Stored        float64 // J
	Outdoor       float64 // J from the outdoor air through the conductance (ventilation, windows)
	Back          float64 // J through the back faces of the elements
	Gains         float64 // J of gains
	Surface       float64 // J of the sources at the elements' inside surfaces
	Exchanged     float64 // J
	RelativeError float64
}

// Residual is Stored - Outdoor - Back - Gains - Surface, J: the heat the
// scheme created.
func (e RoomEnergy) Residual() float64 { return e.Stored - e.Outdoor - e.Back - e.Gains - e.Surface }

// RoomResult is the outcome of RoomSimulate. Series are sampled at Times;
// index 0 is the initial state.
type RoomResult struct {
	Times   []float64   // s
	Air     []float64   // degC
	Surface [][]float64 // degC, inside surface temperature of element k (wall side of Rsi), Surface[k][j]
	Flow    [][]float64 // W, heat from element k into the air at the sample instant

	// MeanFlow[k][j], MeanOutdoor[j], MeanGains[j] are the heats (W)
	// delivered to the air by element k, by the outdoor air through the
	// conductance, and by the gains, averaged over the interval ending at
	// sample j with the scheme's quadrature (index 0: instantaneous).
	MeanFlow    [][]float64
	MeanOutdoor []float64
	MeanGains   []float64

	Energy RoomEnergy

	FinalAir float64     // degC
	Final    [][]float64 // degC per cell of each element
	Steps    int
}

// roomEl is one element of a room run.
type roomEl struct {
	a       float64 // m2
	n       int     // cells (0: massless)
	capc    []float64
	gg      []float64 // conductances between cell centres, W/(m2 K)
	gOut    float64   // back environment to cell 0, W/(m2 K); 0 for adiabatic
	gIn     float64   // last cell to air, W/(m2 K); for a massless element U (0 adiabatic)
	rsi     float64
	back    func(float64) float64
	src     func(float64) float64 // W at the inside surface; nil: none
	fIn     float64               // part of the surface source that goes into the element: gIn Rsi
	fac     fvSymTridiag
	s       []float64 // D^-1 e_last for the current factorisation
	t, tn   []float64 // state and state at the start of the step
	ts      []float64 // stage-1 state
	rhs, di []float64
	e       []float64
}

// roomRun is a room simulation under way.
type roomRun struct {
	p     *RoomProblem
	els   []roomEl
	ca    float64
	ta    float64 // air temperature
	th    float64 // theta dt of the factorisations (NaN: none)
	cond  func(float64) float64
	gains func(float64) float64
}

// RoomSimulate integrates the room p in time.
//
// Each element is the finite-volume column of Simulate (cells of width h,
// conductances G between centres, h/(2k) half cells, massless layers on
// faces), per unit area, its back face joined to the back environment
// through the column's OutsideResistance (or adiabatic) and its last cell
// to the air node through InsideResistance (Rsi). The air node is
//
//	C_a dT_a/dt = Phi(t) + H(t) (T_o(t) - T_a) + sum_k A_k g_k (T_k,last - T_a)
//	              + sum_m A_m U_m (T_b,m(t) - T_a)     (massless elements)
//
// with g_k = 1/(Rsi + R_face + h/(2k)) of the last cell. A source Q_k (W,
// RoomProblem.Surface) at the inside surface node of element k, which
// has no heat capacity, adds (1 - g_k Rsi) Q_k to the air node and
// g_k Rsi Q_k / A_k (W/m2) to the last cell (the node balance, see flows;
// for a massless element g_k = U_k, or 0 with an adiabatic back, and the
// second part leaves through its back). Time integration
// is TR-BDF2 (as Simulate; Bank et al. 1985, Hosea and Shampine 1996:
// L-stable, second order) or backward Euler. In each implicit stage
// every element's tridiagonal system is eliminated to an affine relation
// of its last cell to the air temperature (T_k = x_k + theta dt g_k T_a
// D_k^-1 e_last, the Schur complement on the one air unknown), the scalar
// air equation is solved, and the elements are back-substituted: the
// coupled system is solved exactly, in O(cells) per stage. C_a may be 0
// (the air then satisfies its balance at the end of every step: the BDF2
// stage enforces the algebraic equation). The energy balance sums every
// inflow with the scheme's quadrature weights and closes to round-off.
func RoomSimulate(p RoomProblem) (*RoomResult, error) {
	rr, err := newRoomRun(&p)
	if err != nil {
		return nil, err
	}
	return rr.run()
}

func newRoomRun(p *RoomProblem) (*roomRun, error) {
	r := p.Room
	if err := checkRoomProblem(p); err != nil {
		return nil, err
	}
	meshes := p.Meshes
	if meshes == nil {
		var err error
		if meshes, err = RoomMeshes(r, MeshOptions{}); err != nil {
			return nil, err
		}
	}
	if len(meshes) != len(r.Elements) {
		return nil, fmt.Errorf("solver: %d meshes for %d elements", len(meshes), len(r.Elements))
	}
	if p.Initial != nil && len(p.Initial) != len(r.Elements) {
		return nil, fmt.Errorf("solver: initial states for %d elements, the room has %d", len(p.Initial), len(r.Elements))
	}
	rr := &roomRun{p: p, ca: r.AirCapacity, ta: p.InitialAir, th: math.NaN(), cond: p.Conductance, gains: p.Gains}
	if rr.cond == nil {
		h := r.Conductance
		rr.cond = func(float64) float64 { return h }
	}
	if rr.gains == nil {
		rr.gains = func(float64) float64 { return 0 }
	}
	rr.els = make([]roomEl, len(r.Elements))
	for k, e := range r.Elements {
		el := &rr.els[k]
		el.a, el.rsi = e.Area, e.Column.InsideResistance
		el.back = p.Outdoor
		if p.Back != nil && p.Back[k] != nil {
			el.back = p.Back[k]
		}
		if p.Surface != nil {
			el.src = p.Surface[k]
		}
		if err := el.setUp(k, e, meshes[k]); err != nil {
			return nil, err
		}
		el.fIn = el.gIn * el.rsi
		if el.n == 0 {
			continue
		}
		var init []float64
		if p.Initial != nil {
			init = p.Initial[k]
		}
		if err := el.setInitial(k, e, init, p.InitialAir); err != nil {
			return nil, err
		}
	}
	return rr, nil
}

// checkRoomProblem checks what p asks of a room run apart from the meshes
// and the initial state of the elements.
func checkRoomProblem(p *RoomProblem) error {
	r := p.Room
	if err := r.Validate(); err != nil {
		return err
	}
	if p.Outdoor == nil {
		return errors.New("solver: room problem has no outdoor temperature")
	}
	if p.Back != nil && len(p.Back) != len(r.Elements) {
		return fmt.Errorf("solver: %d back temperatures for %d elements", len(p.Back), len(r.Elements))
	}
	if p.Surface != nil && len(p.Surface) != len(r.Elements) {
		return fmt.Errorf("solver: %d surface sources for %d elements", len(p.Surface), len(r.Elements))
	}
	if !finite(p.Start) || !finite(p.Duration) || !finite(p.Step) || !(p.Duration > 0) || !(p.Step > 0) {
		return errors.New("solver: start, duration and step must be finite, duration and step positive")
	}
	if p.Duration/p.Step > 1e8 {
		return fmt.Errorf("solver: %g time steps are too many", math.Ceil(p.Duration/p.Step))
	}
	if p.Scheme != TRBDF2 && p.Scheme != BackwardEuler {
		return fmt.Errorf("solver: room simulation supports TR-BDF2 and backward Euler, not scheme %d", p.Scheme)
	}
	if !finite(p.InitialAir) {
		return errors.New("solver: initial air temperature is not finite")
	}
	return nil
}

// setUp sets the cells and conductances of element k, e, on the mesh m
// (nil for a massless element, which keeps n = 0 and, with the outdoor
// air behind it, gIn = U).
func (el *roomEl) setUp(k int, e RoomElement, m *Mesh) error {
	if e.massless() {
		if m != nil {
			return fmt.Errorf("solver: element %d (%s) is massless but has a mesh", k+1, e.Name)
		}
		if e.Back == BackOutside {
			el.gIn = e.U()
		}
		return nil
	}
	if m == nil {
		return fmt.Errorf("solver: element %d (%s) has no mesh", k+1, e.Name)
	}
	if err := fvCheckMesh(e.Column, m); err != nil {
		return fmt.Errorf("element %d (%s): %w", k+1, e.Name, err)
	}
	n := m.Cells()
	el.n = n
	alloc := func() []float64 { return make([]float64, n) }
	el.capc, el.s, el.t, el.tn, el.ts, el.rhs, el.di, el.e = alloc(), alloc(), alloc(), alloc(), alloc(), alloc(), alloc(), alloc()
	el.gg = make([]float64, n-1)
	half := make([]float64, n)
	for i := 0; i < n; i++ {
		l := e.Column.Layers[m.Layer[i]]
		h := m.Width(i)
		el.capc[i] = h * l.HeatCapacity
		half[i] = h / (2 * l.Conductivity)
	}
	for i := range el.gg {
		el.gg[i] = 1 / (half[i] + m.FaceResistance[i+1] + half[i+1])
	}
	if e.Back == BackOutside {
		el.gOut = 1 / (e.Column.OutsideResistance + m.FaceResistance[0] + half[0])
	}
	el.gIn = 1 / (e.Column.InsideResistance + m.FaceResistance[n] + half[n-1])
	return nil
}

// setInitial sets the cell temperatures of massive element k, e, from
// init (degC per cell; nil: every cell at air, degC).
func (el *roomEl) setInitial(k int, e RoomElement, init []float64, air float64) error {
	switch {
	case init == nil:
		for i := range el.t {
			el.t[i] = air
		}
	case len(init) != el.n:
		return fmt.Errorf("solver: element %d (%s): %d initial temperatures for %d cells", k+1, e.Name, len(init), el.n)
	default:
		for i, v := range init {
			if !finite(v) {
				return fmt.Errorf("solver: element %d (%s): initial temperature of cell %d is not finite", k+1, e.Name, i)
			}
			el.t[i] = v
		}
	}
	return nil
}

// factor factorises D = M + th K of every massive element and computes
// s = D^-1 e_last.
func (rr *roomRun) factor(th float64) error {
	if th == rr.th {
		return nil
	}
	for k := range rr.els {
		el := &rr.els[k]
		n := el.n
		if n == 0 {
			continue
		}
		for i := 0; i < n; i++ {
			g := 0.0
			if i > 0 {
				g += el.gg[i-1]
			}
			if i < n-1 {
				g += el.gg[i]
				el.e[i] = -th * el.gg[i]
			}
			el.di[i] = el.capc[i] + th*g
		}
		el.di[0] += th * el.gOut
		el.di[n-1] += th * el.gIn
		if err := el.fac.factor(el.di, el.e[:n-1]); err != nil {
			return err
		}
		for i := range el.s {
			el.s[i] = 0
		}
		el.s[n-1] = 1
		el.fac.solve(el.s)
	}
	rr.th = th
	return nil
}

// roomSources are the boundary values at one time.
type roomSources struct {
	to, phi float64
	tb      []float64
	qs      []float64 // W at each element's inside surface
}

func (rr *roomRun) sources(t float64, s *roomSources) error {
	s.to, s.phi = rr.p.Outdoor(t), rr.gains(t)
	if !finite(s.to) || !finite(s.phi) {
		return fmt.Errorf("solver: outdoor temperature or gains not finite at t = %g s", t)
	}
	for k := range rr.els {
		el := &rr.els[k]
		if el.src != nil {
			s.qs[k] = el.src(t)
			if !finite(s.qs[k]) {
				return fmt.Errorf("solver: surface source of element %d not finite at t = %g s", k+1, t)
			}
		}
		if el.gOut == 0 && !(el.n == 0 && el.gIn > 0) {
			s.tb[k] = 0
			continue
		}
		s.tb[k] = el.back(t)
		if !finite(s.tb[k]) {
			return fmt.Errorf("solver: back temperature of element %d not finite at t = %g s", k+1, t)
		}
	}
	return nil
}

// roomFlows are the heat flows of one state, W.
type roomFlows struct {
	outdoor, back, gains float64
	surface              float64   // released at the elements' inside surfaces
	el                   []float64 // element k into the air (through Rsi)
	air                  float64   // net into the air
}

// flows evaluates the flows of the current state (el.t or el.ts by
// stage) and air temperature ta for sources s and conductance h.
//
// A surface source Q (W) of an element splits at its massless surface
// node between Rsi to the air and r_w to the element's last cell (the
// face resistance and the half cell; for a massless element the rest of
// its resistance to the back): the node balance Q/A + (T_w - T_s)/r_w =
// (T_s - T_a)/Rsi, T_w the room-side cell (the back environment for a
// massless element), gives the heat to the air A gIn (T_w - T_a) + (1 - gIn
// Rsi) Q, gIn = 1/(Rsi + r_w), and the rest, gIn Rsi Q, to the element
// [derived]. A massless element passes that rest on to its back.
func (rr *roomRun) flows(ta, h float64, s *roomSources, stage bool, f *roomFlows) {
	f.outdoor = h * (s.to - ta)
	f.gains = s.phi
	f.back = 0
	f.surface = 0
	f.air = f.outdoor + f.gains
	for k := range rr.els {
		el := &rr.els[k]
		if el.n == 0 {
			q := el.a * el.gIn * (s.tb[k] - ta)
			back := q
			if el.src != nil {
				// gIn Rsi Q leaves through the element to its back.
				q += (1 - el.fIn) * s.qs[k]
				back -= el.fIn * s.qs[k]
				f.surface += s.qs[k]
			}
			f.el[k] = q
			f.back += back
			f.air += q
			continue
		}
		t := el.t
		if stage {
			t = el.ts
		}
		q := el.a * el.gIn * (t[el.n-1] - ta)
		if el.src != nil {
			q += (1 - el.fIn) * s.qs[k]
			f.surface += s.qs[k]
		}
		f.el[k] = q
		f.air += q
		f.back += el.a * el.gOut * (s.tb[k] - t[0])
	}
}

// solveStage solves (M + th K) y = rhs with the element right-hand sides
// in el.rhs and the air right-hand side ra, the air diagonal da; the
// element solution overwrites el.rhs, the air temperature is returned.
func (rr *roomRun) solveStage(th, ra, da float64) float64 {
	num, den := ra, da
	for k := range rr.els {
		el := &rr.els[k]
		if el.n == 0 {
			continue
		}
		el.fac.solve(el.rhs)
		num += th * el.a * el.gIn * el.rhs[el.n-1]
		den -= th * th * el.a * el.gIn * el.gIn * el.s[el.n-1]
	}
	ta := num / den
	for k := range rr.els {
		el := &rr.els[k]
		c := th * el.gIn * ta
		for i := 0; i < el.n; i++ {
			el.rhs[i] += c * el.s[i]
		}
	}
	return ta
}

// explicitRHS sets the right-hand side of the trapezoidal stage of a
// massive element, per unit area (J/m2):
//
//	rhs = capc T^n + th f(T^n) + th gOut tb1 e_0
//
// with f the net inflow of each cell at the start of the step (conduction,
// the back environment at tb0, the air at ta0) and tb1 the back
// environment at the end of the stage (its implicit part).
func (el *roomEl) explicitRHS(th, ta0, tb0, tb1 float64) {
	n, t := el.n, el.t
	fl := el.gOut * (tb0 - t[0])
	for i := 0; i < n-1; i++ {
		fr := el.gg[i] * (t[i] - t[i+1])
		el.rhs[i] = el.capc[i]*t[i] + th*(fl-fr)
		fl = fr
	}
	el.rhs[n-1] = el.capc[n-1]*t[n-1] + th*(fl+el.gIn*(ta0-t[n-1]))
	el.rhs[0] += th * el.gOut * tb1
}

// roomSteps returns the number of steps of p and the steps between
// samples.
func roomSteps(p *RoomProblem) (steps, every int, err error) {
	steps = max(int(math.Ceil(p.Duration/p.Step-1e-9)), 1)
	every = 1
	if p.OutputStep != 0 {
		k := math.Round(p.OutputStep / p.Step)
		if !finite(p.OutputStep) || k < 1 || math.Abs(k*p.Step-p.OutputStep) > 1e-6*p.Step {
			return 0, 0, fmt.Errorf("solver: sample spacing %g s is not a whole multiple of the step %g s", p.OutputStep, p.Step)
		}
		every = int(math.Min(k, 1e9))
	}
	return steps, every, nil
}

// roomRecorder keeps the energy balance of a room run and the series it
// samples.
type roomRecorder struct {
	res                *RoomResult
	eOut, eBack, eGain fvKahan   // J, inflows since the start
	eSurf              fvKahan   // J, surface sources since the start
	eAbs               fvKahan   // J, absolute inflows since the start
	accEl              []fvKahan // J, heat from each element into the air since the last sample
	accOut, accGain    fvKahan   // J, heat from the outdoor air and the gains since the last sample
	lastT              float64   // s, time of the last sample
}

// newRoomRecorder returns a recorder for ne elements, steps steps and a
// sample every every steps, from the start time t0 (s).
func newRoomRecorder(ne, steps, every int, t0 float64) roomRecorder {
	nSamples := (steps+every-1)/every + 1
	if steps%every == 0 {
		nSamples = steps/every + 1
	}
	res := &RoomResult{
		Times: make([]float64, 0, nSamples), Air: make([]float64, 0, nSamples),
		Surface: make([][]float64, ne), Flow: make([][]float64, ne), MeanFlow: make([][]float64, ne),
		MeanOutdoor: make([]float64, 0, nSamples), MeanGains: make([]float64, 0, nSamples),
	}
	return roomRecorder{res: res, accEl: make([]fvKahan, ne), lastT: t0}
}

// sample records the state of rr at time t (s) with the conductance h
// (W/K) and the sources s; f receives its flows. The first sample holds
// the instantaneous flows in the mean series.
func (rec *roomRecorder) sample(rr *roomRun, t, h float64, s *roomSources, f *roomFlows, first bool) {
	res := rec.res
	rr.flows(rr.ta, h, s, false, f)
	res.Times = append(res.Times, t)
	res.Air = append(res.Air, rr.ta)
	dt := t - rec.lastT
	for k := range rr.els {
		el := &rr.els[k]
		// heat into the element through Rsi, per m2
		qin := -f.el[k] / el.a
		res.Surface[k] = append(res.Surface[k], rr.ta-el.rsi*qin)
		res.Flow[k] = append(res.Flow[k], f.el[k])
		if first {
			res.MeanFlow[k] = append(res.MeanFlow[k], f.el[k])
		} else {
			res.MeanFlow[k] = append(res.MeanFlow[k], rec.accEl[k].value()/dt)
		}
		rec.accEl[k] = fvKahan{}
	}
	if first {
		res.MeanOutdoor = append(res.MeanOutdoor, f.outdoor)
		res.MeanGains = append(res.MeanGains, f.gains)
	} else {
		res.MeanOutdoor = append(res.MeanOutdoor, rec.accOut.value()/dt)
		res.MeanGains = append(res.MeanGains, rec.accGain.value()/dt)
	}
	rec.accOut, rec.accGain = fvKahan{}, fvKahan{}
	rec.lastT = t
}

// account adds the flows f (W) with the quadrature weight w (s) to the
// energy balance and the sums since the last sample.
func (rec *roomRecorder) account(w float64, f *roomFlows) {
	if w == 0 {
		return
	}
	rec.eOut.add(w * f.outdoor)
	rec.eBack.add(w * f.back)
	rec.eGain.add(w * f.gains)
	rec.eSurf.add(w * f.surface)
	rec.eAbs.add(w * (math.Abs(f.outdoor) + math.Abs(f.back) + math.Abs(f.gains) + math.Abs(f.surface)))
	rec.accOut.add(w * f.outdoor)
	rec.accGain.add(w * f.gains)
	for k := range rec.accEl {
		rec.accEl[k].add(w * f.el[k])
	}
}

// airSrc is the part of the air right-hand side from the sources s at
// the end of a stage with the conductance h: Phi + H To + sum_m A U Tb +
// sum_k (1 - gIn Rsi) Q_k.
func (rr *roomRun) airSrc(h float64, s *roomSources) float64 {
	v := s.phi + h*s.to
	for k := range rr.els {
		el := &rr.els[k]
		if el.n == 0 {
			v += el.a * el.gIn * s.tb[k]
		}
		if el.src != nil {
			v += (1 - el.fIn) * s.qs[k]
		}
	}
	return v
}

// surfaceRHS adds the surface source's part into element k's last cell,
// th gIn Rsi q/A (J/m2), q the source (W) to take implicitly.
func (el *roomEl) surfaceRHS(th, q float64) {
	if el.src != nil && el.n > 0 {
		el.rhs[el.n-1] += th * el.fIn * q / el.a
	}
}

// airDiag is the air node's diagonal C_a + th (H + sum_k A_k g_k).
func (rr *roomRun) airDiag(th, h float64) float64 {
	d := rr.ca + th*h
	for k := range rr.els {
		d += th * rr.els[k].a * rr.els[k].gIn
	}
	return d
}

// roomStepWork are the sources and flows at the start (0), the stage
// point (m) and the end (1) of a step, reused from step to step.
type roomStepWork struct {
	s0, sm, s1 roomSources
	f0, fm, f1 roomFlows
}

func newRoomStepWork(ne int) roomStepWork {
	newSrc := func() roomSources { return roomSources{tb: make([]float64, ne), qs: make([]float64, ne)} }
	newFlows := func() roomFlows { return roomFlows{el: make([]float64, ne)} }
	return roomStepWork{s0: newSrc(), sm: newSrc(), s1: newSrc(), f0: newFlows(), fm: newFlows(), f1: newFlows()}
}

func (rr *roomRun) run() (*RoomResult, error) {
	p := rr.p
	ne := len(rr.els)
	steps, every, err := roomSteps(p)
	if err != nil {
		return nil, err
	}
	recV, wV := newRoomRecorder(ne, steps, every, p.Start), newRoomStepWork(ne)
	rec, w := &recV, &wV

	// State at the start, for the heat stored.
	ta0 := rr.ta
	t0 := make([][]float64, ne)
	for k := range rr.els {
		t0[k] = append([]float64(nil), rr.els[k].t...)
	}
	if err := rr.sources(p.Start, &w.s0); err != nil {
		return nil, err
	}
	h0 := rr.cond(p.Start)
	if !(h0 >= 0) || math.IsInf(h0, 0) {
		return nil, fmt.Errorf("solver: outdoor conductance %g W/K at t = %g s is not finite and non-negative", h0, p.Start)
	}
	rec.sample(rr, p.Start, h0, &w.s0, &w.f0, true)

	t := p.Start
	for step := 1; step <= steps; step++ {
		t1 := p.Start + float64(step)*p.Step
		if step == steps {
			t1 = p.Start + p.Duration
		}
		h, err := rr.step(t, t1, w, rec)
		if err != nil {
			return nil, err
		}
		t = t1
		if step%every == 0 || step == steps {
			rec.sample(rr, t, h, &w.s1, &w.f1, false)
		}
	}
	return rr.finish(rec, ta0, t0, steps), nil
}

// step advances the room from t to t1 (s) and returns the conductance
// (W/K) it held over the step. w.s1 and w.f1 hold the sources and flows
// at t1.
func (rr *roomRun) step(t, t1 float64, w *roomStepWork, rec *roomRecorder) (float64, error) {
	dt := t1 - t
	h := rr.cond(t + dt/2)
	if !(h >= 0) || math.IsInf(h, 0) {
		return 0, fmt.Errorf("solver: outdoor conductance %g W/K at t = %g s is not finite and non-negative", h, t+dt/2)
	}
	if err := rr.sources(t, &w.s0); err != nil {
		return 0, err
	}
	if err := rr.sources(t1, &w.s1); err != nil {
		return 0, err
	}
	for k := range rr.els {
		copy(rr.els[k].tn, rr.els[k].t)
	}
	var err error
	switch rr.p.Scheme {
	case TRBDF2:
		err = rr.stepTRBDF2(t, dt, h, w, rec)
	case BackwardEuler:
		err = rr.stepEuler(dt, h, w, rec)
	}
	if err != nil {
		return 0, err
	}
	if !finite(rr.ta) {
		return 0, fmt.Errorf("solver: room air temperature not finite at t = %g s", t1)
	}
	return h, nil
}

// stepTRBDF2 is step with TR-BDF2: the trapezoidal stage over gamma dt
// from the state at t, then the BDF2 stage to t + dt.
func (rr *roomRun) stepTRBDF2(t, dt, h float64, w *roomStepWork, rec *roomRecorder) error {
	s0, sm, s1 := &w.s0, &w.sm, &w.s1
	tan := rr.ta
	th := fvTheta * dt
	if err := rr.factor(th); err != nil {
		return err
	}
	if err := rr.sources(t+fvGamma*dt, sm); err != nil {
		return err
	}
	rr.flows(tan, h, s0, false, &w.f0)
	// stage 1: trapezoidal over gamma dt
	for k := range rr.els {
		el := &rr.els[k]
		if el.n > 0 {
			el.explicitRHS(th, tan, s0.tb[k], sm.tb[k])
			el.surfaceRHS(th, s0.qs[k]+sm.qs[k])
		}
	}
	tam := rr.solveStage(th, rr.ca*tan+th*w.f0.air+th*rr.airSrc(h, sm), rr.airDiag(th, h))
	for k := range rr.els {
		el := &rr.els[k]
		copy(el.ts, el.rhs)
	}
	rr.flows(tam, h, sm, true, &w.fm)
	// stage 2: BDF2
	for k := range rr.els {
		el := &rr.els[k]
		for i := 0; i < el.n; i++ {
			el.rhs[i] = el.capc[i] * (fvC1*el.ts[i] - fvC2*el.tn[i])
		}
		if el.n > 0 {
			el.rhs[0] += th * el.gOut * s1.tb[k]
			el.surfaceRHS(th, s1.qs[k])
		}
	}
	rr.ta = rr.solveStage(th, rr.ca*(fvC1*tam-fvC2*tan)+th*rr.airSrc(h, s1), rr.airDiag(th, h))
	for k := range rr.els {
		copy(rr.els[k].t, rr.els[k].rhs)
	}
	rr.flows(rr.ta, h, s1, false, &w.f1)
	rec.account(fvW0*dt, &w.f0)
	rec.account(fvW0*dt, &w.fm)
	rec.account(fvW1*dt, &w.f1)
	return nil
}

// stepEuler is step with backward Euler.
func (rr *roomRun) stepEuler(dt, h float64, w *roomStepWork, rec *roomRecorder) error {
	s1 := &w.s1
	tan := rr.ta
	if err := rr.factor(dt); err != nil {
		return err
	}
	for k := range rr.els {
		el := &rr.els[k]
		for i := 0; i < el.n; i++ {
			el.rhs[i] = el.capc[i] * el.tn[i]
		}
		if el.n > 0 {
			el.rhs[0] += dt * el.gOut * s1.tb[k]
			el.surfaceRHS(dt, s1.qs[k])
		}
	}
	rr.ta = rr.solveStage(dt, rr.ca*tan+dt*rr.airSrc(h, s1), rr.airDiag(dt, h))
	for k := range rr.els {
		copy(rr.els[k].t, rr.els[k].rhs)
	}
	rr.flows(rr.ta, h, s1, false, &w.f1)
	rec.account(dt, &w.f1)
	return nil
}

// finish closes the energy balance against the start state (air ta0,
// cells t0) and completes the result of a run of steps steps.
func (rr *roomRun) finish(rec *roomRecorder, ta0 float64, t0 [][]float64, steps int) *RoomResult {
	var stored fvKahan
	stored.add(rr.ca * (rr.ta - ta0))
	for k := range rr.els {
		el := &rr.els[k]
		for i := 0; i < el.n; i++ {
			stored.add(el.a * el.capc[i] * (el.t[i] - t0[k][i]))
		}
	}
	en := RoomEnergy{Stored: stored.value(), Outdoor: rec.eOut.value(), Back: rec.eBack.value(), Gains: rec.eGain.value(), Surface: rec.eSurf.value(), Exchanged: rec.eAbs.value()}
	if en.Exchanged > 0 {
		en.RelativeError = math.Abs(en.Residual()) / en.Exchanged
	}
	res := rec.res
	res.Energy = en
	res.FinalAir = rr.ta
	res.Final = make([][]float64, len(rr.els))
	for k := range rr.els {
		if rr.els[k].n > 0 {
			res.Final[k] = append([]float64(nil), rr.els[k].t...)
		}
	}
	res.Steps = steps
	return res
}
