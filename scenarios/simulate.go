package scenarios

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"time"

	"gonum.org/v1/gonum/mat"

	"tempstack/climate"
	"tempstack/scenarios/results"
	"tempstack/solver"
)

// Progress, when set by the caller (the command line), receives the
// completed fraction of a long transient run.
type Progress func(stage string, frac float64)

// maxSamples caps the number of recorded samples of a run (charts and CSV).
const maxSamples = 20000

// simDefaults fills the unset simulation settings of s from the forcing
// and the analysis periods. The decoder calls it, once.
func simDefaults(s *Scenario) {
	sim := s.Analysis.Simulate
	P := s.Analysis.Periods[0]
	if m := s.Outside.Temperature.Measured; m != nil {
		t0, t1 := m.Span()
		sim.Start = t0
		if sim.Duration == 0 {
			sim.Duration = t1 - t0
		}
	}
	if s.Kind == Ground && s.Outside.Temperature != nil && s.Outside.Temperature.Measured == nil &&
		s.Outside.Temperature.Step == nil && sim.set["start"] == 0 {
		// A harmonic ground run starts at the warmest time of the year, the
		// start of a winter year, so that every simulated winter is whole.
		if t, ok := warmestTime(s.Outside.Temperature); ok {
			sim.Start = t
		}
	}
	if sim.Duration == 0 {
		switch {
		case s.Outside.Temperature != nil && s.Outside.Temperature.Step != nil:
			sim.Duration = s.Outside.Temperature.Step.At + 7*climate.Day
		case s.Kind == Ground:
			sim.Duration = 3 * climate.Year
		default:
			sim.Duration = math.Max(7*climate.Day, 3*P)
		}
	}
	if sim.Step == 0 {
		sim.Step = math.Min(shortestPeriod(s)/96, 3600)
		if s.Kind == Ground {
			sim.Step = 3600
		}
		sim.Step = math.Min(sim.Step, sim.Duration/10)
	}
	if sim.OutputStep == 0 {
		n := math.Ceil(sim.Duration / sim.Step)
		sim.OutputStep = sim.Step * math.Max(1, math.Ceil(n/maxSamples))
	}
	if sim.Mesh.ResolvePeriod == 0 {
		sim.Mesh.ResolvePeriod = shortestPeriod(s)
	}
	if sim.Mesh.MaxCell == 0 {
		// The wave of the resolved period must be carried through the
		// whole wall (ground: the longest period through the whole
		// column): cells no wider than a twentieth of the smallest periodic
		// penetration depth keep the decrement factor within about 0.1 %
		// (measured: 0.07 % at 1/22, 0.26 % at 1/11, second order).
		p := sim.Mesh.ResolvePeriod
		if s.Kind == Ground {
			p = math.Max(p, longestForcingPeriod(s))
		}
		sim.Mesh.MaxCell = minPenetrationDepth(s, p) / 20
	}
	if sim.MaxSpinUpCycles == 0 {
		// The settled start (spinUp) ends as soon as the whole column and
		// the frost depth repeat; the limit only stops a run that cannot
		// settle.
		sim.MaxSpinUpCycles = 40
	}
}

// shortestPeriod is the shortest time scale the forcing and the analysis
// ask to resolve, s.
func shortestPeriod(s *Scenario) float64 {
	p := s.Analysis.Periods[0]
	for _, q := range s.Analysis.Periods {
		p = math.Min(p, q)
	}
	for _, f := range []*Forcing{s.Outside.Temperature, s.Inside.drive()} {
		if f == nil {
			continue
		}
		for _, h := range f.Harmonics {
			p = math.Min(p, h.Period)
		}
	}
	return p
}

// warmestTime returns the time of year (s after 1 January 00:00) at which
// the slow part of the forcing (components of two days and longer) is
// warmest, to the hour, and whether the forcing has an annual component.
func warmestTime(f *Forcing) (float64, bool) {
	if _, ok := annualHarmonic(f); !ok {
		return 0, false
	}
	slow := climate.Periodic{Mean: f.Mean}
	for _, h := range f.Harmonics {
		if h.Period >= 2*climate.Day {
			slow.Harmonics = append(slow.Harmonics, h)
		}
	}
	best, tb := math.Inf(-1), 0.0
	for t := 0.0; t < climate.Year; t += 3600 {
		if v := slow.At(t); v > best {
			best, tb = v, t
		}
	}
	return tb, true
}

// isLinear reports whether no layer of the column has latent heat.
func isLinear(col solver.Column) bool {
	for _, l := range col.Layers {
		if l.Freeze != nil {
			return false
		}
	}
	return true
}

// solverProbes converts the probe depths (as drawn, air layers counted) to
// solver positions and checks that each lies in the column (every probe
// outside is a problem of its own).
func (s *Scenario) solverProbes(col solver.Column) ([]float64, error) {
	c := s.construction()
	total := c.Thickness()
	var out []float64
	var errs problems
	for i, z := range s.Analysis.Probes {
		if z > total*(1+1e-12) {
			errs.add(s, &Error{File: s.File, Line: s.Analysis.ProbeLines[i], Key: fmt.Sprintf("analysis.probes[%d]", i+1),
				Msg: fmt.Sprintf("probe at %g m lies outside the column, which is %g m thick", z, total)})
			continue
		}
		out = append(out, math.Min(c.SolverDepth(z), col.Thickness()))
	}
	if err := errs.err(); err != nil {
		return nil, err
	}
	return out, nil
}

// initialState returns the periodic solution at the cell centres at t0
// (mean steady state plus every harmonic of both forcings), the start of a
// linear run that needs no spin-up. A flux or adiabatic inside (ground
// bottom) carries no periodic flux; a ground column ends at its meshed
// depth, as the simulation does.
//
// In a freezing layer a cell whose mean temperature lies above its
// freezing point starts unfrozen, at no less than the freezing point: the
// linear solution knows no latent heat, and its winter cold wave at depth
// would otherwise start as ice that takes decades to thaw (relic frost).
// Where the mean is below freezing (permafrost) the cell starts frozen, at
// no more than the freezing point (a summer talik in the linear solution
// would otherwise take decades to refreeze).
func initialState(s *run, col solver.Column, mesh *solver.Mesh, t0 float64) ([]float64, error) {
	xs := mesh.Centers
	c := col
	c.HalfSpace = false
	out := s.surfaceForcing()
	var T []float64
	var err error
	if s.Inside.temperature() != nil {
		T, _, err = solver.Steady(c, forcingMean(out), forcingMean(s.Inside.temperature()), xs)
	} else {
		T, err = solver.SteadyWithBottomFlux(c, forcingMean(out), s.Inside.steadyFlux(), xs)
	}
	if err != nil {
		return nil, err
	}
	meanT := append([]float64(nil), T...)
	hs := forcingHarmonics(out, s.Inside.temperature())
	for i, p := range hs.periods {
		var amp []complex128
		if s.Inside.temperature() != nil {
			amp, _, err = solver.Harmonic(c, p, hs.outside[i], hs.inside[i], xs)
		} else {
			amp, _, err = solver.HarmonicInsulated(c, p, hs.outside[i], xs)
		}
		if err != nil {
			return nil, err
		}
		rot := cmplx.Exp(complex(0, 2*math.Pi*t0/p))
		for j := range T {
			T[j] += real(amp[j] * rot)
		}
	}
	for j := range T {
		fr := col.Layers[mesh.Layer[j]].Freeze
		switch {
		case fr == nil:
		case meanT[j] > fr.Point && T[j] < fr.Point:
			T[j] = fr.Point // unfrozen at the freezing point
		case meanT[j] < fr.Point && T[j] > fr.Point:
			T[j] = math.Nextafter(fr.Point, math.Inf(-1)) // frozen at the freezing point
		}
	}
	return T, nil
}

// forcingMean is the mean of a forcing, or the starting value of a step.
func forcingMean(f *Forcing) float64 {
	if f == nil {
		return 0
	}
	if f.Step != nil {
		return f.Step.From
	}
	return f.Mean
}

// simulate runs the transient solution of s and fills r.Simulation and the
// simulated series.
func simulate(s *run, col solver.Column, r *results.Results, progress Progress) (*solver.Result, error) {
	if err := s.ctx.Err(); err != nil {
		return nil, err
	}
	sim := s.Analysis.Simulate
	mesh, probes, err := planSimulation(s.Scenario, col)
	if err != nil {
		return nil, err
	}
	p := solver.Problem{
		Column:     col,
		Mesh:       mesh,
		Outside:    s.Outside.Boundary(),
		Inside:     s.Inside.Boundary(),
		Start:      sim.Start,
		Duration:   sim.Duration,
		Step:       sim.Step,
		Probes:     probes,
		OutputStep: sim.OutputStep,
	}
	spin := 0
	spinConverged := true
	spinChange := 0.0
	var settled *solver.Settled
	var so solver.SettleOptions
	switch {
	case sim.Initial != nil:
		p.Initial = uniform(mesh.Cells(), *sim.Initial)
	default:
		p.Initial, err = initialState(s, col, mesh, sim.Start)
		if err != nil {
			return nil, &Error{File: s.File, Msg: "initial state", Err: err}
		}
		varies := s.Outside.varies() || s.Inside.varies()
		if (!isLinear(col) || s.surfaceInexact || varies) && s.Outside.Temperature.Step == nil {
			// Latent heat makes the problem non-linear: the linear periodic
			// solution is only a first guess. Repeat the longest forcing
			// period until one cycle repeats the last.
			period := longestForcingPeriod(s.Scenario)
			if period > 0 {
				if progress != nil {
					progress("spin-up", 0)
				}
				so = spinUpOptions(s, p, period, sim.MaxSpinUpCycles, progress)
				settled, err = s.opts.settled.settle(p, so)
				if err != nil {
					return nil, &Error{File: s.File, Msg: "spin-up", Err: err}
				}
				p.Initial, p.InitialEnthalpy = nil, settled.Enthalpy
			}
		}
	}
	if progress != nil {
		p.Progress = func(f float64) { progress("simulation", f) }
	}
	res, rec, settled, lastSimulated, err := simulateSettled(s, p, col, r, settled, so)
	if err != nil {
		return nil, err
	}
	if settled != nil {
		spin, spinChange, spinConverged = settled.Cycles, settled.Change, settled.Converged
		if !spinConverged {
			r.Warnings = append(r.Warnings, fmt.Sprintf(
				"not settled: after %d spin-up cycles the column still changed by %.3f K per cycle (target %g K) and the deepest frost by %s (target 1 mm); the simulated winters carry start-up error and none is used as the headline frost depth; raise analysis.simulate.spin_up_cycles",
				spin, spinChange, spinUpTolerance, fmtMM(settled.FrontChange)))
		}
	}
	probeStats, err := rec.finish(res)
	if err != nil {
		return nil, &Error{File: s.File, Line: sim.Line, Key: "analysis.simulate", Err: err}
	}
	if err := checkFinite(res); err != nil {
		return nil, &Error{File: s.File, Line: sim.Line, Key: "analysis.simulate", Err: err}
	}
	out := &results.Simulation{
		StartDay:                   sim.Start / climate.Day,
		Duration_h:                 sim.Duration / 3600,
		Step_h:                     sim.Step / 3600,
		OutputStep_h:               sim.OutputStep / 3600,
		Cells:                      mesh.Cells(),
		EnergyBalanceRelativeError: res.Energy.RelativeError,
		SpinUpCycles:               spin,
		SpinUpConverged:            spinConverged,
		SpinUpChange_K:             spinChange,
		SpinUpTolerance_K:          spinUpTolerance,
		StoredHeat_J_m2:            res.Energy.Stored,
		HeatInOutside_J_m2:         res.Energy.InflowOutside,
		HeatInInside_J_m2:          res.Energy.InflowInside,
	}
	if settled != nil {
		coarse := settled.CoarseCycles
		out.SpinUpLastCycleSimulated, out.SpinUpCoarseCycles = &lastSimulated, &coarse
	}
	out.Probes = probeStats
	r.Simulation = out

	ser := &r.Series
	if m := s.Outside.Temperature.Measured; m != nil {
		out.Start = m.Series.Start.Add(time.Duration(math.Round(sim.Start)) * time.Second).Format(time.RFC3339)
	}
	ser.SimProfile.Position_m = res.Mesh.Centers
	ser.SimProfile.Min_C, ser.SimProfile.Mean_C, ser.SimProfile.Max_C = res.Min, res.Mean, res.Max
	return res, nil
}

func uniform(n int, v float64) []float64 {
	out := make([]float64, n)
	for i := range out {
		out[i] = v
	}
	return out
}

// coarseStep is the step of the coarse first cycles of a spin-up of the
// given period for a simulation of the given step (see coarseSpinUpStep);
// 0 for none.
func coarseStep(s *Scenario, step, period float64) float64 {
	limit := math.Min(coarseSpinUpStep, period/coarseSpinUpSteps)
	for _, sd := range []Side{s.Outside, s.Inside} {
		f := sd.drive()
		if f == nil || f.Step != nil {
			continue
		}
		if env, ok := sd.(Environment); f.Measured != nil || (ok && env.Solar != nil) {
			limit = math.Min(limit, climate.Day/4)
		}
		for _, h := range f.Harmonics {
			limit = math.Min(limit, h.Period/4)
		}
	}
	if k := math.Floor(limit / step); k >= 2 {
		return k * step
	}
	return 0
}

func longestForcingPeriod(s *Scenario) float64 {
	var p float64
	for _, f := range []*Forcing{s.Outside.Temperature, s.Inside.drive()} {
		if f == nil || f.Step != nil {
			continue
		}
		for _, h := range f.Harmonics {
			p = math.Max(p, h.Period)
		}
	}
	return p
}

// checkFinite reports NaN or Inf in the final state of the column. The
// samples themselves (surfaces, fluxes, probes) are checked by the series
// recorder as they arrive (seriesRecorder.finish).
func checkFinite(res *solver.Result) error {
	for _, x := range res.Final {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return errors.New("the simulation produced a non-finite temperature or flux; check that every property is physically possible")
		}
	}
	return nil
}

// periodicChecks fits, for every analysis period that the outside forcing
// drives and the simulation covers, the decrement factor and time shift of
// the simulated inside heat flux over the last whole cycle, and sets them
// beside the exact values.
//
// The fit is linear least squares on the samples of the last cycle with a
// quadratic trend (absorbing components of longer periods) and a cosine and
// sine of every forcing period that fits in the window. Simulated
// f = |Q| / (U |Te|) and lag = (-arg(Q/Te)/omega) mod P, with Q and Te the
// complex amplitudes of inside flux and outside temperature at period P
// (ISO 13786 definitions, with the inside temperature constant).
func periodicChecks(s *Scenario, r *results.Results, res *solver.Result) {
	if s.Kind != Wall || s.Inside.temperature() == nil || r.Simulation == nil ||
		!s.Outside.isPlainHarmonic() || s.Inside.temperature().Measured != nil {
		return
	}
	hs := forcingHarmonics(s.Outside.Temperature, s.Inside.temperature())
	end := res.Times[len(res.Times)-1]
	for i, P := range s.Analysis.Periods {
		ze := phasorAt(s.Outside.Temperature, P)
		if ze == 0 || phasorAt(s.Inside.temperature(), P) != 0 || P > end-res.Times[0]+1e-9 {
			continue
		}
		var ts, qs []float64
		for k, t := range res.Times {
			if t >= end-P-1e-6 && t < end-1e-6 {
				ts = append(ts, t)
				qs = append(qs, res.FluxInside[k])
			}
		}
		var fitPeriods []float64
		for _, p := range hs.periods {
			if p <= P*(1+1e-9) {
				fitPeriods = append(fitPeriods, p)
			}
		}
		zq, ok := fitPhasor(ts, qs, P, fitPeriods, end-P/2)
		if !ok {
			continue
		}
		w := 2 * math.Pi / P
		lag := math.Mod(-cmplx.Phase(zq/ze)/w, P)
		if lag < 0 {
			lag += P
		}
		exact := r.Periodic[i]
		r.Simulation.PeriodicCheck = append(r.Simulation.PeriodicCheck, results.PeriodicCheck{
			Period_h:             P / 3600,
			DecrementFactor:      cmplx.Abs(zq) / (r.Steady.UValue_W_m2K * cmplx.Abs(ze)),
			TimeShift_h:          lag / 3600,
			ExactDecrementFactor: exact.DecrementFactor,
			ExactTimeShift_h:     exact.TimeShift_h,
		})
	}
}

// fitPhasor fits v(t) = c0 + c1 tau + c2 tau^2 + sum_p [a_p cos(w_p t) +
// b_p sin(w_p t)] by least squares (tau = (t - mid) / P) and returns the
// complex amplitude a - i b of period P, so that the component is
// Re(z exp(i w t)).
func fitPhasor(t, v []float64, P float64, periods []float64, mid float64) (complex128, bool) {
	nb := 3 + 2*len(periods)
	if len(t) < nb+2 {
		return 0, false
	}
	A := mat.NewDense(len(t), nb, nil)
	for k, tk := range t {
		tau := (tk - mid) / P
		A.Set(k, 0, 1)
		A.Set(k, 1, tau)
		A.Set(k, 2, tau*tau)
		for j, p := range periods {
			w := 2 * math.Pi / p
			A.Set(k, 3+2*j, math.Cos(w*tk))
			A.Set(k, 4+2*j, math.Sin(w*tk))
		}
	}
	var x mat.VecDense
	if err := x.SolveVec(A, mat.NewVecDense(len(v), append([]float64(nil), v...))); err != nil {
		return 0, false
	}
	for j, p := range periods {
		if math.Abs(p-P) <= 1e-9*P {
			return complex(x.AtVec(3+2*j), -x.AtVec(4+2*j)), true
		}
	}
	return 0, false
}

// minPenetrationDepth is the smallest periodic penetration depth
// sqrt(lambda P / (pi rho c)) of the massive layers for period p, m.
func minPenetrationDepth(s *Scenario, p float64) float64 {
	d := math.Inf(1)
	for _, l := range s.Layers {
		if l.Massless() {
			continue
		}
		d = math.Min(d, l.PenetrationDepth(p))
	}
	return d
}

// spinUpTolerance is the largest change (K) of any cell of the column
// between the states at the start of two successive cycles that counts as
// periodic.
const spinUpTolerance = 0.02

// The coarse first cycles of a spin-up (solver.SettleOptions.CoarseStep)
// step by the largest whole multiple of the simulation's step that is
// neither above coarseSpinUpStep, nor above the settled period over
// coarseSpinUpSteps, nor above a quarter of the shortest period of the
// forcing (a day for a record or the sun), when that is at least two
// steps: 6 h for an annual cycle with a daily one; a daily cycle has none.
const (
	coarseSpinUpStep  = 6 * 3600.0
	coarseSpinUpSteps = 1460
)

// spinUpFrontTolerance is the largest change (m) of a cycle's deepest
// frost from the cycle before that counts as settled.
const spinUpFrontTolerance = 1e-3

// spinUpOptions returns the options of the spin-up of p: repeat one
// period until the whole column and the deepest frost of a cycle repeat
// the last cycle (solver.Settle: within spinUpTolerance in every cell and
// spinUpFrontTolerance in the frost depth), the quiet deep ground set to
// its steady profile between cycles when the bottom condition is
// constant, after coarse first cycles where the forcing allows them. The
// cycle that confirms the state is left to the simulation (DeferCheck)
// when the simulation covers a whole period in whole steps and, when it
// streams series.csv, that period's samples can wait in memory for the
// verdict (see simulateSettled). The spin-up runs through the run's
// settleCache: a state an earlier simulation of the same run (the base
// scenario or another case of its study) settled to from the same inputs
// is taken as it is.
func spinUpOptions(s *run, p solver.Problem, period float64, max int, progress Progress) solver.SettleOptions {
	f := s.Inside.drive()
	constInside := f == nil || (len(f.Harmonics) == 0 && f.Measured == nil && f.Step == nil)
	o := solver.SettleOptions{
		Period: period, MaxCycles: max, Tolerance: spinUpTolerance, FrontTolerance: spinUpFrontTolerance,
		ConstantInside: constInside,
	}
	o.CoarseStep = coarseStep(s.Scenario, p.Step, period)
	steps := math.Round(period / p.Step)
	samples := period / math.Max(p.OutputStep, p.Step)
	o.DeferCheck = p.Duration >= period && steps*p.Step == period && (s.opts.Series == nil || samples <= chartSamples)
	if progress != nil {
		o.Progress = func(c int) { progress("spin-up", float64(c)/float64(max)) }
	}
	return o
}

// simulateSettled runs p from the spin-up settled (nil when none, with its
// options o), recording the samples for r. When the spin-up left its
// confirming cycle to the simulation (solver.Settled.Pending), the
// simulation's first period is that cycle (solver.Problem.CheckCycle) and
// the rows of series.csv wait in memory until it has settled. When it
// does not, the samples are dropped, the spin-up continues from where
// that cycle ended (with the cycles left of o.MaxCycles, through the
// cache), and the simulation runs again from the new state. It returns
// the result, its recorder, the spin-up as judged, and whether its last
// cycle is the simulation's first period.
func simulateSettled(s *run, p solver.Problem, col solver.Column, r *results.Results, settled *solver.Settled, o solver.SettleOptions) (*solver.Result, *seriesRecorder, *solver.Settled, bool, error) {
	sim := s.Analysis.Simulate
	for {
		p.CheckCycle = nil
		hold := math.Inf(1)
		if settled != nil && settled.Pending {
			p.CheckCycle = settled
			hold = p.Start + o.Period
		}
		rec := newSeriesRecorder(s, col, r, hold)
		p.Observe = rec.observe
		res, err := simulateFn(p)
		if err != nil {
			return nil, nil, nil, false, &Error{File: s.File, Line: sim.Line, Key: "analysis.simulate", Err: err}
		}
		if p.CheckCycle == nil {
			return res, rec, settled, false, nil
		}
		judged := res.Settled
		if judged.Converged {
			return res, rec, judged, true, nil
		}
		// The first period did not settle: go on from its end.
		r.Series.Simulation = results.SimulationSeries{}
		settled = judged
		if left := o.MaxCycles - judged.Cycles; left > 0 {
			q, qo := p, o
			q.InitialEnthalpy, q.Initial, q.InitialFunc, q.Observe, q.CheckCycle = judged.Enthalpy, nil, nil, nil, nil
			qo.MaxCycles, qo.CoarseStep, qo.DeferCheck = left, 0, false
			next, err := s.opts.settled.settle(q, qo)
			if err != nil {
				return nil, nil, nil, false, &Error{File: s.File, Msg: "spin-up", Err: err}
			}
			settled = continued(judged, next)
		}
		p.InitialEnthalpy, p.Initial, p.InitialFunc = settled.Enthalpy, nil, nil
	}
}

// simulateFn is solver.Simulate; a test replaces it to see a spin-up's
// checking cycle fail.
var simulateFn = solver.Simulate

// continued returns the spin-up a, continued by the cycles of b that
// started where a ended.
func continued(a, b *solver.Settled) *solver.Settled {
	c := *b
	c.Cycles = a.Cycles + b.Cycles
	c.CoarseCycles = a.CoarseCycles
	c.DeepResets = a.DeepResets + b.DeepResets
	c.MaxFrost = append(append([]float64(nil), a.MaxFrost...), b.MaxFrost...)
	c.MaxThaw = append(append([]float64(nil), a.MaxThaw...), b.MaxThaw...)
	c.FrozenAllCycle = append(append([]bool(nil), a.FrozenAllCycle...), b.FrozenAllCycle...)
	return &c
}

// fmtMM formats a length in metres as millimetres for a message.
func fmtMM(x float64) string {
	if math.IsInf(x, 0) || math.IsNaN(x) {
		return "an unknown amount"
	}
	return fmt.Sprintf("%.1f mm", x*1000)
}

// maxCells is the largest mesh a run builds: far beyond any sensible
// column (a few hundred cells), small enough to fail fast.
const maxCells = 200000

// meshMessage words a mesh error for a user.
func meshMessage(err error) string {
	if errors.Is(err, solver.ErrTooManyCells) {
		return fmt.Sprintf("the mesh would have more cells than the limit of %d (a layer with a tiny diffusivity, a very thick column or very small cells); check the properties and thicknesses, or give analysis.simulate.mesh larger cells", maxCells)
	}
	return err.Error()
}
