package scenarios

import (
	"context"
	"fmt"
	"io/fs"
	"math"
	"math/cmplx"

	"gonum.org/v1/gonum/dsp/fourier"
	"gopkg.in/yaml.v3"

	"tempstack/climate"
	"tempstack/layers"
	"tempstack/scenarios/results"
	"tempstack/solver"
)

// decodeRoomDoc finishes the decoding of a room scenario.
func (d *decoder) decodeRoomDoc(top *object, s *Scenario, root *yaml.Node, fsys fs.FS, cache *seriesCache) (*Scenario, error) {
	d.decodeRoom(top, s)
	d.decodeStudy(top, s)
	if err := d.err(); err != nil {
		return nil, err
	}
	s.root, s.fsys, s.cache = root, fsys, cache
	if _, err := s.roomPlan(); err != nil {
		return nil, err
	}
	if err := checkStudy(s); err != nil {
		return nil, err
	}
	return s, nil
}

// runRoomStudy runs a room scenario and its study, if any.
func runRoomStudy(s *run) (*results.Results, error) {
	if err := planStudy(s.Scenario); err != nil {
		return nil, err
	}
	r, err := runRoom(s.ctx, s.Scenario)
	if err != nil {
		return nil, err
	}
	if s.Study != nil {
		if err := runStudy(s, r); err != nil {
			return nil, err
		}
	}
	return r, nil
}

// roomPlan is what a room run solves: the room with its elements' mass
// and without it, and the forcing as functions of time.
type roomPlan struct {
	room, bare solver.Room
	meshes     []*solver.Mesh
	period     float64 // s, the longest period of the forcing (at least a day)
	samples    int     // samples of a cycle for the Fourier series of the forcing
	outdoor    func(float64) float64
	back       []func(float64) float64 // per element; nil for adiabatic backs
	gains      func(float64) float64   // W to the air: gains and sun through the windows
	cond       func(float64) float64   // W/K: ventilation and windows
	windowsUA  float64                 // W/K
	cells      int
}

// roomPlan checks the room and builds its plan.
func (s *Scenario) roomPlan() (*roomPlan, error) {
	rs := s.Room
	if rs == nil || rs.Outdoor == nil {
		return nil, &Error{File: s.File, Key: "room", Msg: "the room or its outdoor temperature is missing"}
	}
	p := &roomPlan{}
	ca := AirHeatCapacity * rs.Volume
	for _, w := range rs.Windows {
		p.windowsUA += w.U * w.Area
	}
	vent := rs.Ventilation
	vol := rs.Volume
	p.cond = func(t float64) float64 { return AirHeatCapacity*vol*vent.at(t)/3600 + p.windowsUA }
	hMean := AirHeatCapacity*vol*vent.mean()/3600 + p.windowsUA
	p.room = solver.Room{AirCapacity: ca, Conductance: hMean}
	p.bare = p.room
	outdoor := rs.Outdoor
	p.outdoor = outdoor.At
	periods := append([]climate.Harmonic(nil), outdoor.Harmonics...)
	periods = append(periods, rs.Gains.Harmonics...)
	for i, e := range rs.Elements {
		rsi, rse := layers.SurfaceResistances(e.Orientation)
		col := layers.Construction{Layers: e.Layers, Orientation: e.Orientation}.Column(rsi, rse)
		if e.Back == solver.BackAdiabatic {
			col.OutsideResistance = rsi // the neighbour's inside surface; no heat crosses it
		}
		if err := col.Validate(); err != nil {
			return nil, &Error{File: s.File, Line: e.Line, Key: fmt.Sprintf("elements[%d]", i+1), Err: err}
		}
		el := solver.RoomElement{Name: e.Name, Area: e.Area, Column: col, Back: e.Back}
		p.room.Elements = append(p.room.Elements, el)
		bare := el
		bare.Column.Layers = nil
		for _, l := range col.Layers {
			bare.Column.Layers = append(bare.Column.Layers, solver.Layer{Name: l.Name, Resistance: l.ThermalResistance()})
		}
		p.bare.Elements = append(p.bare.Elements, bare)
		var env func(float64) float64
		if e.Back == solver.BackOutside {
			// The back's environment is the wall kind's outside: the
			// outdoor air, or its sol-air temperature in the sun.
			env = Environment{Temperature: outdoor, Resistance: rse, Solar: e.Solar}.env()
			if e.Solar != nil && e.Solar.Irradiance != nil {
				periods = append(periods, e.Solar.Irradiance.Harmonics...)
			}
		}
		p.back = append(p.back, env)
	}
	type sun struct {
		ga  float64
		irr *Forcing
	}
	var suns []sun
	for _, w := range rs.Windows {
		if w.Irradiance != nil && w.G > 0 {
			suns = append(suns, sun{w.G * w.Area, w.Irradiance})
			periods = append(periods, w.Irradiance.Harmonics...)
		}
	}
	gains := rs.Gains
	p.gains = func(t float64) float64 {
		v := gains.At(t)
		for _, sn := range suns {
			v += sn.ga * math.Max(0, sn.irr.At(t))
		}
		return v
	}
	if err := p.room.Validate(); err != nil {
		return nil, &Error{File: s.File, Key: "elements", Err: err}
	}
	hold := hMean
	for _, e := range p.room.Elements {
		if e.Back == solver.BackOutside {
			hold += e.Area * e.U()
		}
	}
	if !(hold > 0) {
		return nil, &Error{File: s.File, Line: rs.Line, Key: "room", Msg: "nothing joins the room to the outdoors, so its mean temperature is not defined: give ventilation, a window or an element backed by the outside"}
	}
	p.period = climate.Day
	for _, h := range periods {
		p.period = math.Max(p.period, h.Period)
	}
	for _, h := range periods {
		if n := p.period / h.Period; math.Abs(n-math.Round(n)) > 1e-6*n {
			return nil, &Error{File: s.File, Key: "outside.temperature", Msg: fmt.Sprintf(
				"a room needs forcing periods that divide the longest one (%s): %s does not", fmtDuration(p.period), fmtDuration(h.Period))}
		}
	}
	if p.period > 2*climate.Year {
		return nil, &Error{File: s.File, Key: "outside.temperature", Msg: "a room's forcing periods must not exceed two years"}
	}
	// Fourier samples of one cycle: every minute for a day or two, every
	// 15 minutes beyond.
	dtf := 60.0
	if p.period > 2*climate.Day {
		dtf = 900
	}
	p.samples = int(math.Round(p.period / dtf))
	if math.Abs(float64(p.samples)*dtf-p.period) > 1e-6*p.period {
		return nil, &Error{File: s.File, Key: "outside.temperature", Msg: "the longest forcing period must be a whole number of minutes"}
	}
	if steps := (rs.WarmUp + p.period) / rs.Step; steps > 2e6 {
		return nil, &Error{File: s.File, Line: rs.Line, Key: "room.step", Msg: fmt.Sprintf("%.0f time steps are too many; lengthen the step or shorten warm_up", steps)}
	}
	var err error
	if p.meshes, err = solver.RoomMeshes(p.room, solver.MeshOptions{}); err != nil {
		return nil, &Error{File: s.File, Key: "elements", Err: err}
	}
	for _, m := range p.meshes {
		if m != nil {
			p.cells += m.Cells()
		}
	}
	return p, nil
}

// roomExact is the exact periodic solution of a room.
type roomExact struct {
	mean      solver.RoomResponse
	meanF     solver.RoomForcing
	harm      []int // harmonic numbers kept
	resp      []solver.RoomResponse
	forcing   []solver.RoomForcing
	air, oper []float64 // over one cycle, samples points
	outdoor   []float64
}

// fourierOf returns the mean and the phasors (exp(+i omega t)) of the
// harmonics 1..n/2-1 of f sampled n times over one period from t = 0.
func fourierOf(fft *fourier.FFT, f func(float64) float64, period float64, n int) (float64, []complex128) {
	x := make([]float64, n)
	for j := range x {
		x[j] = f(period * float64(j) / float64(n))
	}
	c := fft.Coefficients(nil, x)
	ph := make([]complex128, n/2)
	for k := 1; k < n/2; k++ {
		ph[k] = c[k] * complex(2/float64(n), 0)
	}
	return real(c[0]) / float64(n), ph
}

// exact solves room r (the planned room or the bare one) for the Fourier
// series of the forcing over one cycle, and evaluates the air and
// operative temperatures at the samples of the cycle.
//
// Each harmonic k of period P/k is solved exactly (solver.RoomHarmonic,
// ISO 13786 matrices); the mean with the steady conductances. The
// ventilation enters with its daily mean: the exact method is linear.
func (p *roomPlan) exact(r solver.Room) (*roomExact, error) {
	n := p.samples
	fft := fourier.NewFFT(n)
	ne := len(r.Elements)
	mo, po := fourierOf(fft, p.outdoor, p.period, n)
	mg, pg := fourierOf(fft, p.gains, p.period, n)
	mb := make([]float64, ne)
	pb := make([][]complex128, ne)
	for k := range r.Elements {
		if p.back[k] != nil {
			mb[k], pb[k] = fourierOf(fft, p.back[k], p.period, n)
		}
	}
	x := &roomExact{}
	x.meanF = solver.RoomForcing{Outdoor: complex(mo, 0), Gains: complex(mg, 0), Back: make([]complex128, ne)}
	for k := range mb {
		x.meanF.Back[k] = complex(mb[k], 0)
	}
	var err error
	if x.mean, err = solver.RoomHarmonic(r, 0, x.meanF); err != nil {
		return nil, err
	}
	// Keep the harmonics that carry forcing above round-off.
	scale := 1e-9 * (1 + math.Abs(mo) + math.Abs(mg))
	for k := range mb {
		scale += 1e-9 * math.Abs(mb[k])
	}
	area := 0.0
	for _, e := range r.Elements {
		area += e.Area
	}
	cAir := make([]complex128, n/2+1)
	cOp := make([]complex128, n/2+1)
	cAir[0] = complex(real(x.mean.Air)*float64(n), 0)
	cOp[0] = complex(operative(x.mean, r)*float64(n), 0)
	for k := 1; k < n/2; k++ {
		big := cmplx.Abs(po[k]) > scale || cmplx.Abs(pg[k]) > scale
		f := solver.RoomForcing{Outdoor: po[k], Gains: pg[k], Back: make([]complex128, ne)}
		for e := range pb {
			if pb[e] != nil {
				f.Back[e] = pb[e][k]
				big = big || cmplx.Abs(pb[e][k]) > scale
			}
		}
		if !big {
			continue
		}
		res, err := solver.RoomHarmonic(r, p.period/float64(k), f)
		if err != nil {
			return nil, err
		}
		x.harm = append(x.harm, k)
		x.resp = append(x.resp, res)
		x.forcing = append(x.forcing, f)
		half := complex(float64(n)/2, 0)
		cAir[k] = res.Air * half
		op := res.Air / 2
		for e, el := range r.Elements {
			op += res.Surface[e] * complex(el.Area/area/2, 0)
		}
		cOp[k] = op * half
	}
	x.air = fft.Sequence(nil, cAir)
	x.oper = fft.Sequence(nil, cOp)
	x.outdoor = make([]float64, n)
	for j := range x.air {
		x.air[j] /= float64(n)
		x.oper[j] /= float64(n)
		x.outdoor[j] = p.outdoor(p.period * float64(j) / float64(n))
	}
	return x, nil
}

// operative is the mean operative temperature of a mean response: the
// mean of the air and the area-weighted inside surface temperature.
func operative(m solver.RoomResponse, r solver.Room) float64 {
	area, s := 0.0, 0.0
	for e, el := range r.Elements {
		area += el.Area
		s += el.Area * real(m.Surface[e])
	}
	return (real(m.Air) + s/area) / 2
}

// at returns the exact cell temperatures of every element at time t.
func (p *roomPlan) cellsAt(r solver.Room, meshes []*solver.Mesh, x *roomExact, t float64) ([][]float64, float64, error) {
	mc, err := solver.RoomCellAmplitudes(r, meshes, 0, x.meanF, x.mean)
	if err != nil {
		return nil, 0, err
	}
	out := make([][]float64, len(mc))
	for e := range mc {
		for _, v := range mc[e] {
			out[e] = append(out[e], real(v))
		}
	}
	air := real(x.mean.Air)
	for i, k := range x.harm {
		per := p.period / float64(k)
		rot := cmplx.Rect(1, 2*math.Pi*t/per)
		air += real(x.resp[i].Air * rot)
		hc, err := solver.RoomCellAmplitudes(r, meshes, per, x.forcing[i], x.resp[i])
		if err != nil {
			return nil, 0, err
		}
		for e := range hc {
			for j, v := range hc[e] {
				out[e][j] += real(v * rot)
			}
		}
	}
	return out, air, nil
}

// RoomSettleTolerance is the largest change (K) of the air or any cell
// over one cycle at which a room counts as settled (warm_up: auto).
const RoomSettleTolerance = 0.002

// roomSim is a simulation of a room and what is read from its last cycle.
type roomSim struct {
	res       *solver.RoomResult
	operative []float64
	summary   results.RoomSimulation
}

// simulate runs room r from the exact state warm_up before the cycle.
func (p *roomPlan) simulate(ctx context.Context, s *Scenario, r solver.Room, meshes []*solver.Mesh, x *roomExact) (*roomSim, error) {
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	rs := s.Room
	warm := rs.WarmUp
	if rs.WarmUpAuto {
		warm = 0
	}
	start := -warm
	init, air, err := p.cellsAt(r, meshes, x, start)
	if err != nil {
		return nil, err
	}
	prob := solver.RoomProblem{
		Room: r, Meshes: meshes, Outdoor: p.outdoor, Back: p.back, Gains: p.gains, Conductance: p.cond,
		InitialAir: air, Initial: init, Start: start, Duration: warm + p.period, Step: rs.Step, OutputStep: rs.Step,
	}
	cycles, settled, change := 0, !rs.WarmUpAuto, 0.0
	if rs.WarmUpAuto {
		// Settle: repeat the cycle from the exact periodic state until the
		// air and every cell repeat within RoomSettleTolerance. The exact
		// state is the periodic answer of the linear room; night
		// ventilation and the clipped sun move it, by up to tenths of a
		// kelvin in a heavy room, over a week or more.
		maxCycles := int(math.Max(1, math.Min(200, math.Floor(3*climate.Year/p.period))))
		cyc := prob
		cyc.OutputStep = p.period
		for cycles < maxCycles {
			if err := ctx.Err(); err != nil {
				return nil, err
			}
			res, err := solver.RoomSimulate(cyc)
			if err != nil {
				return nil, err
			}
			cycles++
			change = math.Abs(res.FinalAir - cyc.InitialAir)
			for k := range res.Final {
				for i, v := range res.Final[k] {
					change = math.Max(change, math.Abs(v-cyc.Initial[k][i]))
				}
			}
			cyc.Initial, cyc.InitialAir = res.Final, res.FinalAir
			if change < RoomSettleTolerance {
				settled = true
				break
			}
		}
		prob.Initial, prob.InitialAir = cyc.Initial, cyc.InitialAir
		warm = float64(cycles) * p.period
	}
	res, err := solver.RoomSimulate(prob)
	if err != nil {
		return nil, err
	}
	area := 0.0
	for _, e := range r.Elements {
		area += e.Area
	}
	sim := &roomSim{res: res, operative: make([]float64, len(res.Times))}
	for j := range res.Times {
		sv := 0.0
		for e, el := range r.Elements {
			sv += el.Area * res.Surface[e][j]
		}
		sim.operative[j] = (res.Air[j] + sv/area) / 2
	}
	sm := &sim.summary
	sm.AirMax_C, sm.AirMin_C = math.Inf(-1), math.Inf(1)
	sm.OperativeMax_C, sm.OperativeMin_C = math.Inf(-1), math.Inf(1)
	first := -1
	for j, t := range res.Times {
		if t < -1e-6 {
			continue
		}
		if first < 0 {
			first = j
		}
		sm.AirMax_C, sm.AirMin_C = math.Max(sm.AirMax_C, res.Air[j]), math.Min(sm.AirMin_C, res.Air[j])
		sm.OperativeMax_C, sm.OperativeMin_C = math.Max(sm.OperativeMax_C, sim.operative[j]), math.Min(sm.OperativeMin_C, sim.operative[j])
	}
	days := p.period / climate.Day
	for _, th := range rs.Thresholds {
		sm.HoursAbove = append(sm.HoursAbove, results.HoursAbove{Threshold_C: th, Hours: hoursAbove(res.Times[first:], sim.operative[first:], th) / 3600 / days})
	}
	sm.HoursAboveBasis = "operative temperature"
	last := len(res.Times) - 1
	sm.CycleChange_K = math.Abs(res.Air[last] - res.Air[first])
	for e := range r.Elements {
		sm.CycleChange_K = math.Max(sm.CycleChange_K, math.Abs(res.Surface[e][last]-res.Surface[e][first]))
	}
	sm.EnergyBalanceRelativeError = res.Energy.RelativeError
	sm.Step_h, sm.WarmUp_h, sm.Cycle_h = rs.Step/3600, warm/3600, p.period/3600
	sm.SettleCycles, sm.Settled = cycles, settled
	if rs.WarmUpAuto {
		sm.SettleChange_K = &change
	}
	for _, m := range meshes {
		if m != nil {
			sm.Cells += m.Cells()
		}
	}
	// Heat to and from the air over the cycle, per path.
	perDay := 3.6e6 * days
	path := func(name string, mean []float64) results.RoomPath {
		var to, from float64
		for j := first + 1; j < len(res.Times); j++ {
			q := mean[j] * (res.Times[j] - res.Times[j-1])
			if q > 0 {
				to += q
			} else {
				from -= q
			}
		}
		return results.RoomPath{Name: name, ToAir_kWh_day: to / perDay, FromAir_kWh_day: from / perDay}
	}
	sm.Paths = append(sm.Paths, path("ventilation and window conduction", res.MeanOutdoor), path("gains and sun through windows", res.MeanGains))
	for e, el := range r.Elements {
		sm.Paths = append(sm.Paths, path(el.Name, res.MeanFlow[e]))
	}
	return sim, nil
}

// exactCheck returns the largest difference (K) between the simulated air
// temperature over the reported cycle (t in [0, period]) and the exact
// periodic one, interpolated linearly between the exact samples.
func exactCheck(p *roomPlan, x *roomExact, res *solver.RoomResult) float64 {
	n := len(x.air)
	worst := 0.0
	for j, t := range res.Times {
		if t < -1e-6 {
			continue
		}
		u := math.Mod(t/p.period*float64(n), float64(n))
		i := int(u)
		if i >= n {
			i = n - 1
		}
		f := u - float64(i)
		ex := (1-f)*x.air[i] + f*x.air[(i+1)%n]
		worst = math.Max(worst, math.Abs(res.Air[j]-ex))
	}
	return worst
}

// hoursAbove returns the time (s) that the piecewise-linear series v(t)
// spends above th.
func hoursAbove(t, v []float64, th float64) float64 {
	sum := 0.0
	for j := 1; j < len(t); j++ {
		a, b, dt := v[j-1]-th, v[j]-th, t[j]-t[j-1]
		switch {
		case a >= 0 && b >= 0:
			sum += dt
		case a <= 0 && b <= 0:
		default:
			sum += dt * math.Max(a, b) / math.Abs(b-a)
		}
	}
	return sum
}

// runRoom solves a room scenario: the exact periodic solution, the coupled
// simulation, and both again without the elements' mass.
func runRoom(ctx context.Context, sc *Scenario) (*results.Results, error) {
	p, err := sc.roomPlan()
	if err != nil {
		return nil, err
	}
	rs := sc.Room
	wrap := func(err error) error { return &Error{File: sc.File, Key: "room", Err: err} }
	x, err := p.exact(p.room)
	if err != nil {
		return nil, wrap(err)
	}
	xb, err := p.exact(p.bare)
	if err != nil {
		return nil, wrap(err)
	}
	sim, err := p.simulate(ctx, sc, p.room, p.meshes, x)
	if err != nil {
		return nil, wrap(err)
	}
	bareMeshes := make([]*solver.Mesh, len(p.bare.Elements))
	simb, err := p.simulate(ctx, sc, p.bare, bareMeshes, xb)
	if err != nil {
		return nil, wrap(err)
	}
	// The cross-check: the simulation of the linear room (the ventilation
	// at its daily mean, as the exact method takes it) against the exact
	// air temperature over the cycle.
	lin := sim
	if rs.Ventilation.Scheduled {
		lp := *p
		lp.cond = func(float64) float64 { return p.room.Conductance }
		if lin, err = lp.simulate(ctx, sc, p.room, p.meshes, x); err != nil {
			return nil, wrap(err)
		}
	}
	check := exactCheck(p, x, lin.res)
	sim.summary.ExactCheck_K = &check
	r := &results.Results{Title: sc.Title, Kind: sc.Kind, ScenarioFile: sc.File, TitleBlock: sc.TitleBlock}
	rm := &results.RoomResult{
		Volume_m3: rs.Volume, AirHeatCapacity_kJ_K: p.room.AirCapacity / 1000,
		VentilationDay_ach: rs.Ventilation.Day, MeanConductance_W_K: p.room.Conductance,
		OperativeTemperature: "mean of the room air temperature and the area-weighted mean inside surface temperature of the elements (windows left out)",
		Thresholds_C:         rs.Thresholds,
	}
	if v := rs.Ventilation; v.Scheduled {
		rm.VentilationNight_ach, rm.NightFrom_h, rm.NightTo_h = &v.Night, &v.NightFrom, &v.NightTo
		rm.Notes = append(rm.Notes, fmt.Sprintf("The exact periodic solution is linear: it takes the daily mean ventilation (%.2f air changes per hour); the simulation switches between the day and night rates.", v.mean()))
	}
	rm.GainsMean_W = real(x.meanF.Gains)
	rm.Periodic = periodicSummary(p, x)
	rm.Simulation = &sim.summary
	ydaily, err := solver.RoomHarmonic(p.room, climate.Day, solver.RoomForcing{})
	if err != nil {
		return nil, wrap(err)
	}
	var toAll, fromAll float64
	for _, ph := range sim.summary.Paths {
		toAll += ph.ToAir_kWh_day
		fromAll += ph.FromAir_kWh_day
	}
	for e, el := range rs.Elements {
		sel := p.room.Elements[e]
		c := layers.Construction{Layers: el.Layers, Orientation: el.Orientation}
		re := results.RoomElement{
			Name: el.Name, Area_m2: el.Area, Orientation: el.Orientation.String(), Back: el.Back.String(),
			Construction: el.Construction, Sunlit: el.Solar != nil,
			Layers:                   layerResults(el.Layers, climate.Day),
			UValue_W_m2K:             sel.U(),
			ArealHeatCapacity_kJ_m2K: c.ArealHeatCapacity() / 1000,
			InsideAdmittance_W_m2K:   cmplx.Abs(ydaily.Admittance[e]) / el.Area,
		}
		ph := sim.summary.Paths[2+e]
		to, from := ph.ToAir_kWh_day, ph.FromAir_kWh_day
		re.HeatToAir_kWh_day, re.HeatFromAir_kWh_day = &to, &from
		if toAll > 0 {
			v := to / toAll
			re.ShareOfHeatToAir = &v
		}
		if fromAll > 0 {
			v := from / fromAll
			re.ShareOfHeatFromAir = &v
		}
		rm.Elements = append(rm.Elements, re)
	}
	for _, w := range rs.Windows {
		rw := results.RoomWindow{Name: w.Name, Area_m2: w.Area, UValue_W_m2K: w.U, GValue: w.G}
		if w.Irradiance != nil {
			irr := w.Irradiance
			m, _ := fourierOf(fourier.NewFFT(p.samples), func(t float64) float64 { return math.Max(0, irr.At(t)) }, p.period, p.samples)
			rw.SolarMean_W = w.G * w.Area * m
		}
		rm.Windows = append(rm.Windows, rw)
	}
	mr := &results.RoomMassRemoved{Periodic: periodicSummary(p, xb), Simulation: &simb.summary}
	dp := simb.summary.OperativeMax_C - sim.summary.OperativeMax_C
	da := simb.summary.AirMax_C - sim.summary.AirMax_C
	mr.PeakReduction_K, mr.AirPeakReduction_K = &dp, &da
	for i, h := range sim.summary.HoursAbove {
		mr.HoursSaved = append(mr.HoursSaved, results.HoursAbove{Threshold_C: h.Threshold_C, Hours: simb.summary.HoursAbove[i].Hours - h.Hours})
	}
	mr.Statement = massStatement(sim.summary, simb.summary, dp)
	if c := sim.summary.CycleChange_K; c > 0.05 {
		r.Warnings = append(r.Warnings, fmt.Sprintf("the simulated cycle does not yet repeat: the room changes by %.2f K from its start to its end; lengthen room.warm_up (or leave it to auto)", c))
	}
	if !sim.summary.Settled {
		r.Warnings = append(r.Warnings, fmt.Sprintf("the room did not settle within %d cycles (last change %.3f K); the reported cycle may still drift", sim.summary.SettleCycles, *sim.summary.SettleChange_K))
	}
	rm.MassRemoved = mr
	rm.Notes = append(rm.Notes, "Comfort criteria (which temperature, which thresholds, how many hours) are set by local guidance; the thresholds here are inputs, not a verdict.")
	roomSeries(rm, p, x, xb, sim, simb)
	r.Room = rm
	// The outdoor air; each element's sun is in room.elements.
	r.Forcing = &results.ForcingInfo{Outside: results.SideForcing{Kind: "harmonic", Mean_C: rs.Outdoor.Mean, Harmonics: harmonicsInfo(rs.Outdoor.Harmonics)}}
	r.Cautions = append(results.CautionsWith(r, nil),
		"One air node: the room is taken as well mixed; radiant exchange between surfaces is lumped into the inside surface resistances (ISO 6946), and the sun through the windows is delivered to the air.",
		"Comfort criteria are set by local guidance; hours above a threshold here are a comparison between designs, not a compliance check.")
	return r, nil
}

// periodicSummary reads the exact cycle.
func periodicSummary(p *roomPlan, x *roomExact) results.RoomPeriodic {
	out := results.RoomPeriodic{Period_h: p.period / 3600, Harmonics: len(x.harm), AirMean_C: real(x.mean.Air),
		AirMax_C: math.Inf(-1), AirMin_C: math.Inf(1), OperativeMax_C: math.Inf(-1), OperativeMin_C: math.Inf(1)}
	sumOp := 0.0
	for j := range x.air {
		if x.air[j] > out.AirMax_C {
			out.AirMax_C = x.air[j]
			out.AirMaxHour_h = math.Mod(p.period*float64(j)/float64(len(x.air))/3600, 24)
		}
		out.AirMin_C = math.Min(out.AirMin_C, x.air[j])
		out.OperativeMax_C = math.Max(out.OperativeMax_C, x.oper[j])
		out.OperativeMin_C = math.Min(out.OperativeMin_C, x.oper[j])
		sumOp += x.oper[j]
	}
	out.OperativeMean_C = sumOp / float64(len(x.oper))
	return out
}

// massStatement says in one sentence what the mass does to the peak.
func massStatement(with, without results.RoomSimulation, dp float64) string {
	verb := "takes"
	if dp < 0 {
		verb = "adds"
	}
	s := fmt.Sprintf("The mass %s %.1f K %s the peak operative temperature (%.1f degC without it, %.1f degC with it)",
		verb, math.Abs(dp), map[bool]string{true: "off", false: "to"}[dp >= 0], without.OperativeMax_C, with.OperativeMax_C)
	for i, h := range with.HoursAbove {
		if i == 0 || h.Hours > 0 || without.HoursAbove[i].Hours > 0 {
			s += fmt.Sprintf("; above %g degC: %.1f h a day without it, %.1f h with it", h.Threshold_C, without.HoursAbove[i].Hours, h.Hours)
		}
	}
	return s + "."
}

// roomSeries fills the chart and CSV series.
func roomSeries(rm *results.RoomResult, p *roomPlan, x, xb *roomExact, sim, simb *roomSim) {
	s := &rm.Series
	n := len(x.air)
	stride := max(n/1440, 1)
	for j := 0; j < n; j += stride {
		s.CycleTime_h = append(s.CycleTime_h, p.period*float64(j)/float64(n)/3600)
		s.CycleOutdoor_C = append(s.CycleOutdoor_C, x.outdoor[j])
		s.CycleAir_C = append(s.CycleAir_C, x.air[j])
		s.CycleOperative_C = append(s.CycleOperative_C, x.oper[j])
		s.CycleAirNoMass_C = append(s.CycleAirNoMass_C, xb.air[j])
		s.CycleOperativeNoMass_C = append(s.CycleOperativeNoMass_C, xb.oper[j])
	}
	res := sim.res
	for j, t := range res.Times {
		s.Time_h = append(s.Time_h, t/3600)
		s.Outdoor_C = append(s.Outdoor_C, p.outdoor(t))
		s.Air_C = append(s.Air_C, res.Air[j])
		s.Operative_C = append(s.Operative_C, sim.operative[j])
		s.AirNoMass_C = append(s.AirNoMass_C, simb.res.Air[j])
		s.OperativeNoMass_C = append(s.OperativeNoMass_C, simb.operative[j])
	}
	s.Surface_C = res.Surface
	s.Heat_W = res.MeanFlow
	s.CycleStart_h = 0
}
