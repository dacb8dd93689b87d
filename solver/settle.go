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
	// (Result.FrostDepth) between two successive cycles that counts as
	// settled, m (> 0).
	FrontTolerance float64
	// ConstantInside tells Settle that the inside boundary does not vary
	// in time, which allows the deep reset (see Settle).
	ConstantInside bool
	// Sample is the spacing of the samples from which each cycle's frost
	// depth and temperature range are read, s; 0 means Period/365 (a day
	// of a year), rounded to whole steps.
	Sample float64
	// Progress, when not nil, is called after each cycle with the number
	// of cycles run.
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
	// MaxFrost is the deepest frost of each cycle, m.
	MaxFrost []float64
	// DeepResets counts the cycles after which the quiet deep part of the
	// column was set to its steady profile.
	DeepResets int
}

// Settle runs cycles of p.Period from p's initial state until the state
// is periodic: the largest change of any cell over a cycle (anywhere in
// the column) is below Tolerance and the deepest frost of the cycle
// differs from the last cycle's by less than FrontTolerance.
//
// Deep reset. The deep part of a column, below the reach of the periodic
// wave, relaxes to its periodic state (a steady profile carrying the mean
// flux) on the diffusion time scale of its whole depth, decades for tens
// of metres of ground, while the frost above settles within a few cycles.
// After each unsettled cycle, when the inside boundary is constant in
// time, the cells from the deepest one up to the first whose temperature
// moved by more than deepQuiet over the cycle, or that holds a phase
// boundary, are set to the steady profile below the shallowest of them:
//
//	T_{i+1} = T_i - f / G_i
//
// with G_i the conductance between centres i and i+1 and f the heat flux
// in +x that the inside boundary carries in steady state (minus the
// prescribed inflow; 0 when adiabatic; (T_a - T_env) over the resistance
// to the environment otherwise). In the periodic state that profile is
// exact where the wave has died out (the cycle-mean flux equals the
// inside flux at every depth), so the reset removes the slow mode of the
// cycle-to-cycle map and leaves the fixed point unchanged. The reset is
// skipped when it would move any cell across a phase boundary.
//
// Settle returns an error only for a failed simulation or bad options; a
// state that does not settle within MaxCycles is returned with Converged
// false.
func Settle(p Problem, o SettleOptions) (*Settled, error) {
	if !(o.Period > 0) || math.IsInf(o.Period, 0) || !(o.Tolerance > 0) || !(o.FrontTolerance > 0) || o.MaxCycles < 1 {
		return nil, errors.New("solver: settle needs Period > 0, Tolerance > 0, FrontTolerance > 0 and MaxCycles >= 1")
	}
	p.Duration = o.Period
	p.Probes = nil
	p.Progress = nil
	p.SampleEvery = o.Sample
	if p.SampleEvery <= 0 {
		p.SampleEvery = o.Period / 365
	}
	if p.Step > 0 {
		p.SampleEvery = math.Max(p.Step, math.Round(p.SampleEvery/p.Step)*p.Step)
	}
	r, err := newFvRun(&p, true)
	if err != nil {
		return nil, err
	}
	ceq := make([]float64, r.n)
	for i := range ceq {
		ceq[i] = r.cvol[i]
		if k := r.pidx[i]; k >= 0 {
			ceq[i] = math.Min(r.phases[k].cf, r.phases[k].cu) + r.phases[k].lat
		}
	}
	out := &Settled{FrontChange: math.Inf(1)}
	prevH := make([]float64, r.n)
	prevT := make([]float64, r.n)
	for c := 1; c <= o.MaxCycles; c++ {
		copy(prevH, r.H)
		copy(prevT, r.T)
		res, err := r.run()
		if err != nil {
			return nil, err
		}
		if !r.nonlinear {
			// run leaves H = C T for a linear column; the start was set
			// from T as well.
			for i := range prevH {
				prevH[i] = r.cvol[i] * prevT[i]
			}
		}
		change := 0.0
		for i := 0; i < r.n; i++ {
			change = math.Max(change, math.Max(math.Abs(r.T[i]-prevT[i]), math.Abs(r.H[i]-prevH[i])/ceq[i]))
		}
		front := 0.0
		for _, f := range res.FrostDepth {
			front = math.Max(front, f)
		}
		if c > 1 {
			out.FrontChange = math.Abs(front - out.MaxFrost[len(out.MaxFrost)-1])
		}
		out.MaxFrost = append(out.MaxFrost, front)
		out.Cycles, out.Change = c, change
		if o.Progress != nil {
			o.Progress(c)
		}
		frontOK := out.FrontChange < o.FrontTolerance || (c > 1 && front == 0 && out.MaxFrost[c-2] == 0)
		if change < o.Tolerance && frontOK {
			out.Converged = true
			break
		}
		if o.ConstantInside && c < o.MaxCycles && r.deepReset(res) {
			out.DeepResets++
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

// deepQuiet is the largest temperature range over a cycle, K, of a cell
// that the deep reset of Settle may set to the steady profile.
const deepQuiet = 0.05

// deepReset sets the quiet deep cells of the current state to the steady
// profile below them (see Settle) and reports whether it did. res holds
// the per-cell range of the cycle just run.
func (r *fvRun) deepReset(res *Result) bool {
	n := r.n
	if n < 3 {
		return false
	}
	single := func(i int) bool {
		k := r.pidx[i]
		return k < 0 || r.phases[k].region(r.H[i]) != 1
	}
	ib := n
	for ib > 0 && res.Max[ib-1]-res.Min[ib-1] < deepQuiet && single(ib-1) {
		ib--
	}
	if ib == 0 || ib >= n-1 {
		return false
	}
	// The flux in +x the inside boundary carries in steady state.
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
		f = (r.T[ib] - v) / rr
	default:
		return false
	}
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return false
	}
	newT := make([]float64, n)
	copy(newT, r.T)
	for i := ib; i < n-1; i++ {
		newT[i+1] = newT[i] - f/r.gg[i]
	}
	newH := make([]float64, n)
	for i := ib + 1; i < n; i++ {
		if k := r.pidx[i]; k >= 0 {
			newH[i] = r.phases[k].enthalpy(newT[i])
			if r.phases[k].region(newH[i]) != r.phases[k].region(r.H[i]) || newT[i] == r.phases[k].tp {
				return false
			}
		} else {
			newH[i] = r.cvol[i] * newT[i]
		}
	}
	for i := ib + 1; i < n; i++ {
		r.H[i] = newH[i]
		r.updateCell(i)
	}
	r.updateConductances()
	r.nlTh, r.nlDirty, r.regOK = math.NaN(), n-1, false
	return true
}

// String describes the outcome for a log line.
func (s *Settled) String() string {
	return fmt.Sprintf("%d cycles, converged %v, change %.3g K, front change %.3g m, %d deep resets", s.Cycles, s.Converged, s.Change, s.FrontChange, s.DeepResets)
}
