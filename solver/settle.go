package solver

import (
	"errors"
	"fmt"
	"math"
)

// SettleOptions controls Settle.
type SettleOptions struct {
	// Period is the cycle length, s (> 0): the boundary functions must be
	// periodic with it.
	Period float64
	// MaxCycles bounds the number of cycles run (>= 1).
	MaxCycles int
	// Tolerance is the largest change of any cell over one cycle that
	// counts as settled, K (> 0), measured as in SpinUpEnthalpy but over
	// the whole column.
	Tolerance float64
	// FrontTolerance is the largest change of the cycle's deepest frost
	// (Result.FrostDepth; with ground frozen all year, the deepest thaw,
	// Result.ThawDepth) between two successive cycles that counts as
	// settled, m (> 0).
	FrontTolerance float64
	// ConstantInside tells Settle that the inside boundary does not vary
	// in time, which allows the deep reset (see Settle).
	ConstantInside bool
	// OutputStep is the spacing of the samples from which each cycle's frost
	// depth and temperature range are read, s; 0 means Period/365 (a day
	// of a year), rounded to whole steps.
	OutputStep float64
	// CoarseStep, when larger than the problem's Step, is the time step
	// of a first, cheap phase: cycles of the problem with this step,
	// settled by the same rules, whose state starts the cycles with the
	// problem's own step (the fixed point is that of the problem's step;
	// the coarse cycles only bring the slow deep state near it). 0: none.
	CoarseStep float64
	// DeferCheck leaves the cycle that would confirm the settled state to
	// the simulation that follows. When the coarse phase (CoarseStep) has
	// settled and MaxCycles is at least 2, Settle stops after the first
	// cycle at the problem's step, which cannot settle alone (its deepest
	// frost has no earlier cycle of that step to be compared with), applies
	// the deep reset a further cycle would start from, and returns that
	// state with Pending set. Simulate, given it as Problem.CheckCycle, runs
	// the first Period of the simulation as that further cycle and judges
	// it by the same rules (Result.Settled): the simulation then starts from
	// the state the normal course of Settle would run its second cycle from,
	// and when that cycle settles, the simulated first period is itself the
	// cycle shown to repeat within the tolerances. Without a settled coarse
	// phase Settle behaves as if DeferCheck were false.
	DeferCheck bool
	// Progress, when not nil, is called after each cycle with the number
	// of cycles run (counted again from 1 after the coarse phase).
	Progress func(cycle int)
}

// Settled is the outcome of Settle.
type Settled struct {
	// Enthalpy is the state at the start of a cycle, J/m3 per cell (for
	// Problem.InitialEnthalpy).
	Enthalpy []float64
	// Cycles is the number of cycles run.
	Cycles int
	// Converged reports whether the last cycle met both tolerances.
	Converged bool
	// Change is the largest change of a cell over the last cycle, K.
	Change float64
	// FrontChange is the change of the deepest frost between the last two
	// cycles, m (+Inf after a single cycle).
	FrontChange float64
	// MaxFrost is the deepest frost of each cycle, m; MaxThaw the deepest
	// thaw above frozen ground; FrozenAllCycle tells whether some ground
	// stayed frozen through the whole cycle (permafrost), in which case
	// FrontChange measures the thaw front (the active layer).
	MaxFrost, MaxThaw []float64
	FrozenAllCycle    []bool
	// DeepResets counts the cycles after which the quiet deep part of the
	// column was set to its steady profile.
	DeepResets int
	// CoarseCycles is the number of cycles of the coarse phase
	// (SettleOptions.CoarseStep), run before the Cycles above.
	CoarseCycles int
	// Pending reports that the cycle that would judge the state is left
	// to the simulation that starts from it (SettleOptions.DeferCheck):
	// Converged is false until Simulate, given this Settled as
	// Problem.CheckCycle, has run that cycle (Result.Settled).
	Pending bool

	// check holds what Simulate needs to run the pending cycle as Settle
	// would have (set when Pending).
	check *cycleCheck
}

// cycleCheck describes the cycle a pending Settled leaves to Simulate:
// the cycles' start, period and step, their number of steps and sample
// spacing in steps (the samples from which a cycle's fronts are read),
// and the settling rules.
type cycleCheck struct {
	start, period, step float64
	steps, every        int
	tol, ftol           float64
	maxCycles           int
}

// Settle runs cycles of p.Period from p's initial state until the state
// is periodic: the largest change of any cell over a cycle (anywhere in
// the column) is below Tolerance and the deepest frost of the cycle
// differs from the last cycle's by less than FrontTolerance.
//
// Deep reset. The deep part of a column, below the freezing zone,
// relaxes to its periodic state (a steady mean profile carrying the mean
// flux, with the periodic wave on top) on the diffusion time scale of its
// whole depth, decades for tens of metres of ground, while the frost above
// settles within a few cycles. After each unsettled cycle, when the inside
// boundary is constant in time, the cells below the deepest one that
// changed phase during the cycle keep their periodic part and have their
// cycle mean replaced by the steady profile below the shallowest of them,
//
//	T_{i+1} = T_i - f / G_i
//
// with G_i the conductance between centres i and i+1 and f the heat flux
// in +x that the inside boundary carries in steady state (minus the
// prescribed inflow; 0 when adiabatic; the mean temperature difference to
// the environment over the resistance otherwise). In the periodic state
// that is exact (the cycle-mean flux equals the inside flux at every depth
// and, without a phase change, the wave is linear on top of the mean), so
// the reset removes the slow mode of the cycle-to-cycle map and leaves the
// fixed point unchanged. See deepReset for a permafrost base.
//
// Settle returns an error only for a failed simulation or bad options; a
// state that does not settle within MaxCycles is returned with Converged
// false.
func Settle(p Problem, o SettleOptions) (*Settled, error) {
	if !(o.Period > 0) || math.IsInf(o.Period, 0) || !(o.Tolerance > 0) || !(o.FrontTolerance > 0) || o.MaxCycles < 1 {
		return nil, errors.New("solver: settle needs Period > 0, Tolerance > 0, FrontTolerance > 0 and MaxCycles >= 1")
	}
	p, coarse, err := settleProblem(p, o)
	if err != nil {
		return nil, err
	}
	r, err := newFvRun(&p, true)
	if err != nil {
		return nil, err
	}
	ceq := r.settleCapacities()
	out := &Settled{FrontChange: math.Inf(1)}
	if coarse != nil {
		out.CoarseCycles = coarse.Cycles
	}
	deferCheck := o.DeferCheck && coarse != nil && coarse.Converged && o.MaxCycles >= 2
	prevH := make([]float64, r.n)
	prevT := make([]float64, r.n)
	for c := 1; c <= o.MaxCycles; c++ {
		copy(prevH, r.H)
		copy(prevT, r.T)
		res, err := r.run()
		if err != nil {
			return nil, err
		}
		change := r.cycleChange(prevT, prevH, r.H, ceq)
		out.addCycle(c, change, resultFronts(res))
		if o.Progress != nil {
			o.Progress(c)
		}
		if out.settles(o.Tolerance, o.FrontTolerance) {
			out.Converged = true
			break
		}
		if o.ConstantInside && c < o.MaxCycles && r.deepReset(res) {
			out.DeepResets++
		}
		if deferCheck && c == 1 {
			out.Pending = true
			out.check = &cycleCheck{start: p.Start, period: o.Period, step: p.Step, steps: r.nSteps, every: r.every,
				tol: o.Tolerance, ftol: o.FrontTolerance, maxCycles: o.MaxCycles}
			break
		}
	}
	if !r.nonlinear {
		for i := range r.H {
			r.H[i] = r.cvol[i] * r.T[i]
		}
	}
	out.Enthalpy = append([]float64(nil), r.H...)
	return out, nil
}

// settleProblem returns p set up for the cycles of Settle with the
// problem's own step (one period, no probes, progress, observer or
// checking cycle, the sample spacing of o), starting from the state the
// coarse cycles settled to when o asks for them, and the outcome of the
// coarse phase (nil without one).
func settleProblem(p Problem, o SettleOptions) (Problem, *Settled, error) {
	p.Duration = o.Period
	p.Probes = nil
	p.Progress = nil
	p.Observe = nil
	p.CheckCycle = nil
	var coarse *Settled
	if o.CoarseStep > p.Step && p.Step > 0 && !math.IsInf(o.CoarseStep, 0) {
		// Coarse cycles first; the cycles below start from their state
		// and, comparing fronts only between cycles of the fine step,
		// run at least twice.
		q, qo := p, o
		q.Step, qo.CoarseStep, qo.DeferCheck = o.CoarseStep, 0, false
		st, err := Settle(q, qo)
		if err != nil {
			return p, nil, err
		}
		p.InitialEnthalpy, p.Initial, p.InitialFunc = st.Enthalpy, nil, nil
		coarse = st
	}
	p.OutputStep = o.OutputStep
	if p.OutputStep <= 0 {
		p.OutputStep = o.Period / 365
	}
	if p.Step > 0 {
		p.OutputStep = math.Max(p.Step, math.Round(p.OutputStep/p.Step)*p.Step)
	}
	return p, coarse, nil
}

// settleCapacities returns the heat capacity (J/(m3 K)) that turns an
// enthalpy change of each cell into kelvin for Settle's change: the
// sensible one, or for a freezing cell the smaller sensible one plus the
// latent heat.
func (r *fvRun) settleCapacities() []float64 {
	ceq := make([]float64, r.n)
	for i := range ceq {
		ceq[i] = r.cvol[i]
		if k := r.pidx[i]; k >= 0 {
			ceq[i] = math.Min(r.phases[k].cf, r.phases[k].cu) + r.phases[k].lat
		}
	}
	return ceq
}

// cycleChange returns the largest change (K) of a cell over the cycle
// just run from the temperatures prevT and enthalpies prevH to the
// present temperatures and the enthalpies H, the enthalpy change in
// kelvin of ceq. For a linear column prevH is first set from prevT (run
// leaves H = C T; the start was set from T as well).
func (r *fvRun) cycleChange(prevT, prevH, H, ceq []float64) float64 {
	if !r.nonlinear {
		for i := range prevH {
			prevH[i] = r.cvol[i] * prevT[i]
		}
	}
	change := 0.0
	for i := 0; i < r.n; i++ {
		change = math.Max(change, math.Max(math.Abs(r.T[i]-prevT[i]), math.Abs(H[i]-prevH[i])/ceq[i]))
	}
	return change
}

// cycleFronts gathers the fronts of a cycle over its samples: the
// deepest frost and thaw, m, and the least frost depth (above 0 when
// ground stayed frozen through the whole cycle).
type cycleFronts struct{ frost, thaw, least float64 }

func newCycleFronts() cycleFronts { return cycleFronts{least: math.Inf(1)} }

// add takes one sample's frost and thaw depth, m.
func (f *cycleFronts) add(frost, thaw float64) {
	f.frost = math.Max(f.frost, frost)
	f.thaw = math.Max(f.thaw, thaw)
	f.least = math.Min(f.least, frost)
}

// resultFronts returns the fronts of the cycle whose samples res holds.
func resultFronts(res *Result) cycleFronts {
	f := newCycleFronts()
	for k, d := range res.FrostDepth {
		f.add(d, res.ThawDepth[k])
	}
	return f
}

// addCycle records cycle c, with the largest cell change change (K) and
// the fronts f, in out: its deepest frost and thaw, whether ground
// stayed frozen all through it, and the change of the front from the
// cycle before (the thaw front under permafrost in both cycles).
func (out *Settled) addCycle(c int, change float64, f cycleFronts) {
	frozenAll := f.least > 0
	if c > 1 {
		if frozenAll && out.FrozenAllCycle[c-2] {
			// Permafrost: the front that moves with the seasons is
			// the thaw front (the active layer).
			out.FrontChange = math.Abs(f.thaw - out.MaxThaw[c-2])
		} else {
			out.FrontChange = math.Abs(f.frost - out.MaxFrost[c-2])
		}
	}
	out.MaxFrost = append(out.MaxFrost, f.frost)
	out.MaxThaw = append(out.MaxThaw, f.thaw)
	out.FrozenAllCycle = append(out.FrozenAllCycle, frozenAll)
	out.Cycles, out.Change = c, change
}

// settles reports whether the cycle addCycle recorded last meets the
// rules of Settle: every cell changed by less than tol (K) and the
// deepest frost (the thaw under permafrost) by less than ftol (m) from
// the cycle before, or neither that cycle nor the one before froze.
func (out *Settled) settles(tol, ftol float64) bool {
	c := out.Cycles
	frontOK := out.FrontChange < ftol || (c > 1 && out.MaxFrost[c-1] == 0 && out.MaxFrost[c-2] == 0)
	return out.Change < tol && frontOK
}

// deepQuiet is the largest temperature range over a cycle, K, of a
// partly frozen cell that the deep reset of Settle may treat as a
// stationary front (a permafrost base).
const deepQuiet = 0.05

// deepReset corrects the mean of the deep cells that stayed in one phase
// through the cycle just run to the steady profile below them (see
// Settle) and reports whether it did. res holds the per-cell mean and
// range of the cycle.
//
// The zone is the deepest run of cells that stayed frozen or unfrozen
// through the cycle (a lone front at the freezing point under such cells,
// with a temperature range below deepQuiet, as at a permafrost base, may
// lie in it). Its shallowest cell is the anchor. The steady profile is
// marched from the anchor's cycle mean down through each half cell and
// face resistance with dT/dx = -f / k(T), the frozen conductivity below
// the freezing point and the unfrozen one above (blended within a
// freezing range). Each cell keeps its periodic part and gets the steady
// mean: T += steady - mean. Where the profile crosses an isothermal
// freezing point inside a cell, the cell gets the ice of the part of it
// that lies below that point, so a permafrost base lands at its steady
// depth (no latent heat flows at a stationary front).
func (r *fvRun) deepReset(res *Result) bool {
	n := r.n
	if n < 3 {
		return false
	}
	ib := r.deepAnchor(res)
	if ib >= n-1 {
		return false
	}
	f, ok := r.steadyFlux(res, ib)
	if !ok {
		return false
	}
	newH := r.steadyEnthalpies(res, ib, f)
	for j := ib + 1; j < n; j++ {
		if math.IsNaN(newH[j]) || math.IsInf(newH[j], 0) {
			return false
		}
	}
	for j := ib + 1; j < n; j++ {
		r.H[j] = newH[j]
		r.updateCell(j)
	}
	r.updateConductances()
	r.nlTh, r.nlDirty, r.regOK = math.NaN(), n-1, false
	return true
}

// stayedLinear reports whether cell i stayed frozen or unfrozen all
// through the cycle whose per-cell range res holds.
func (r *fvRun) stayedLinear(res *Result, i int) bool {
	k := r.pidx[i]
	if k < 0 {
		return true
	}
	ph := &r.phases[k]
	return res.Min[i] > ph.tp || res.Max[i] < ph.tl
}

// deepAnchor returns the anchor of the deep reset: the shallowest cell of
// the deepest run of cells that stayed in one phase (a lone quiet front
// under such a cell may lie in the run), or n-1 or more when there is
// none to reset below it.
func (r *fvRun) deepAnchor(res *Result) int {
	n := r.n
	ok := func(i int) bool {
		if r.stayedLinear(res, i) {
			return true
		}
		return r.isoMushy(i) && res.Max[i]-res.Min[i] < deepQuiet && i > 0 && r.stayedLinear(res, i-1)
	}
	ib := n
	for ib > 0 && ok(ib-1) {
		ib--
	}
	for ib < n-1 && !r.stayedLinear(res, ib) {
		ib++
	}
	return ib
}

// steadyFlux returns the mean flux in +x (W/m2) the inside boundary
// carries in steady state below the anchor ib, and false when it is not
// known (or not finite).
func (r *fvRun) steadyFlux(res *Result, ib int) (float64, bool) {
	n := r.n
	t0 := r.p.Start
	var f float64
	switch r.in.kind {
	case Adiabatic:
		f = 0
	case PrescribedFlux:
		f = -r.in.fn(t0)
	case Environment:
		v := r.in.fn(t0)
		rr := 1 / r.in.g
		for i := ib; i < n-1; i++ {
			rr += 1 / r.gg[i]
		}
		f = (res.Mean[ib] - v) / rr
	default:
		return 0, false
	}
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return 0, false
	}
	return f, true
}

// steadyEnthalpies marches the steady profile carrying the flux f from
// the cycle mean of the anchor ib down the column and returns the new
// enthalpy (J/m3) of each cell below ib (entries up to ib are unused).
func (r *fvRun) steadyEnthalpies(res *Result, ib int, f float64) []float64 {
	n := r.n
	newH := make([]float64, n)
	T := res.Mean[ib]
	T, _ = r.walk(ib, T, r.h[ib]/2, f)
	for j := ib + 1; j < n; j++ {
		T -= f * r.rf[j]
		steady, frozenUp := r.walk(j, T, r.h[j]/2, f)
		down, frozenDown := r.walk(j, steady, r.h[j]/2, f)
		T = down
		newH[j] = r.steadyEnthalpy(res, j, steady, (frozenUp+frozenDown)/r.h[j])
	}
	return newH
}

// steadyEnthalpy returns the enthalpy (J/m3) of cell j whose centre lies
// at the steady temperature steady (degC), ice the fraction of the cell
// below an isothermal freezing point: the cell keeps its periodic part
// and gets the steady mean.
func (r *fvRun) steadyEnthalpy(res *Result, j int, steady, ice float64) float64 {
	k := r.pidx[j]
	if k < 0 {
		return r.cvol[j] * (r.T[j] + steady - res.Mean[j])
	}
	ph := &r.phases[k]
	switch {
	case ph.isoTerm && ice > 1e-9 && ice < 1-1e-9:
		return (1 - ice) * ph.lat
	case r.stayedLinear(res, j):
		t := r.T[j] + steady - res.Mean[j]
		// Keep the cell on the side of the freezing point the steady
		// profile puts it.
		if steady >= ph.tp {
			t = math.Max(t, ph.tp)
		} else {
			t = math.Min(t, math.Nextafter(ph.tl, math.Inf(-1)))
		}
		return ph.enthalpy(t)
	default:
		return ph.enthalpy(steady)
	}
}

// isoMushy reports whether cell i is partly frozen at an isothermal
// freezing point.
func (r *fvRun) isoMushy(i int) bool {
	k := r.pidx[i]
	return k >= 0 && r.phases[k].isoTerm && r.phases[k].region(r.H[i]) == 1
}

// walk integrates the steady profile dT/dx = -f/k(T) through length (m) of
// the material of cell i from the temperature t0 and returns the
// temperature at the end and the length that lies below the freezing
// point (isothermal phases; 0 otherwise).
func (r *fvRun) walk(i int, t0, length, f float64) (t1, frozen float64) {
	k := r.pidx[i]
	if k < 0 {
		return t0 - f*length/r.kc[i], 0
	}
	ph := &r.phases[k]
	if !ph.isoTerm {
		// Blended conductivity within the range: small steps.
		const steps = 32
		dx := length / steps
		t := t0
		for s := 0; s < steps; s++ {
			mid := t - 0.5*f*dx/ph.cond(t)
			t -= f * dx / ph.cond(mid)
		}
		return t, 0
	}
	// Isothermal: kf below the point, ku above; split at the crossing.
	frozenSide := t0 < ph.tp || (t0 == ph.tp && f > 0)
	kA := ph.ku
	if frozenSide {
		kA = ph.kf
	}
	t1 = t0 - f*length/kA
	crosses := (frozenSide && t1 > ph.tp) || (!frozenSide && t1 < ph.tp)
	if !crosses || f == 0 {
		if frozenSide {
			return t1, length
		}
		return t1, 0
	}
	d1 := (t0 - ph.tp) * kA / f // distance to the freezing point
	kB := ph.kf
	if frozenSide {
		kB = ph.ku
	}
	t1 = ph.tp - f*(length-d1)/kB
	if frozenSide {
		return t1, d1
	}
	return t1, length - d1
}

// String describes the outcome for a log line.
func (s *Settled) String() string {
	return fmt.Sprintf("%d cycles, converged %v, change %.3g K, front change %.3g m, %d deep resets", s.Cycles, s.Converged, s.Change, s.FrontChange, s.DeepResets)
}
