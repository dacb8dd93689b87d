package solver

import "errors"

// checkRun judges, inside Simulate, the cycle a pending spin-up left to
// the simulation (Problem.CheckCycle, SettleOptions.DeferCheck): the first
// period of the run, read as Settle reads a cycle. The fronts are taken
// at the spin-up's own sample times (the start, every check.every steps
// and the cycle's end), whatever the run's output spacing, and the change
// of every cell from the run's start to the cycle's end is measured with
// the capacities of Settle, so the verdict is the one Settle would reach
// after the same cycle.
type checkRun struct {
	base         *Settled
	c            *cycleCheck
	prevT, prevH []float64 // the state at the start of the cycle
	ceq          []float64 // Settle's capacities per cell (settleCapacities)
	fronts       cycleFronts
	out          *Settled // the judged spin-up, set at the cycle's end
}

// newCheckRun sets up the judging of the pending spin-up s by the run r,
// and checks that r starts where the spin-up stopped and steps as its
// cycles did.
func newCheckRun(r *fvRun, s *Settled) (*checkRun, error) {
	c := s.check
	p := r.p
	if !s.Pending || c == nil {
		return nil, errors.New("solver: CheckCycle is not a spin-up left pending (SettleOptions.DeferCheck)")
	}
	if p.Start != c.start || p.Step != c.step || float64(c.steps)*c.step != c.period || p.Duration < c.period {
		return nil, errors.New("solver: a run that checks a spin-up must start at its start, step by its step through whole periods, and last at least one period")
	}
	if len(p.InitialEnthalpy) != r.n || len(s.Enthalpy) != r.n {
		return nil, errors.New("solver: a run that checks a spin-up must start from its state (InitialEnthalpy)")
	}
	for i, h := range p.InitialEnthalpy {
		if h != s.Enthalpy[i] {
			return nil, errors.New("solver: a run that checks a spin-up must start from its state (InitialEnthalpy)")
		}
	}
	return &checkRun{base: s, c: c, ceq: r.settleCapacities()}, nil
}

// begin takes the start of the cycle.
func (k *checkRun) begin(r *fvRun) {
	k.prevT = append(k.prevT[:0], r.T...)
	k.prevH = append(k.prevH[:0], r.H...)
	k.fronts = newCycleFronts()
	k.sample(r)
}

// sample adds the fronts of the present state.
func (k *checkRun) sample(r *fvRun) {
	_, _, tso, _ := r.surfaces()
	k.fronts.add(r.frost(tso))
}

// after takes the state at the end of step and reports whether the run
// goes on: false when step ends the cycle and the cycle did not settle.
func (k *checkRun) after(r *fvRun, step int) bool {
	if k.out != nil || step > k.c.steps {
		return true
	}
	if step%k.c.every == 0 || step == k.c.steps {
		k.sample(r)
	}
	if step < k.c.steps {
		return true
	}
	// The cycle's end: Settle's change, with H = C T for a linear column
	// as run leaves it.
	H := r.H
	if !r.nonlinear {
		H = make([]float64, r.n)
		for i := range H {
			H[i] = r.cvol[i] * r.T[i]
		}
	}
	change := r.cycleChange(k.prevT, k.prevH, H, k.ceq)
	out := k.base.clone()
	out.Pending, out.check = false, nil
	out.addCycle(k.base.Cycles+1, change, k.fronts)
	out.Converged = out.settles(k.c.tol, k.c.ftol)
	out.Enthalpy = append([]float64(nil), H...)
	k.out = out
	return out.Converged
}

// clone returns a copy of s that shares no slice with it.
func (s *Settled) clone() *Settled {
	c := *s
	c.Enthalpy = append([]float64(nil), s.Enthalpy...)
	c.MaxFrost = append([]float64(nil), s.MaxFrost...)
	c.MaxThaw = append([]float64(nil), s.MaxThaw...)
	c.FrozenAllCycle = append([]bool(nil), s.FrozenAllCycle...)
	return &c
}
