package solver

import (
	"slices"
	"testing"
)

// checkProblem is settleKeyProblem (a small freezing column under an
// annual wave and the geothermal flux) stepping 6 h through whole years,
// sampled with probes, with options for a coarse phase of 1-day steps
// (the ground runs' shape, small).
func checkProblem() (Problem, SettleOptions) {
	p, o := settleKeyProblem()
	p.Step, p.Duration, p.OutputStep = 6*3600, 2*o.Period, 6*3600
	p.Probes = []float64{0.3, 1}
	o.MaxCycles, o.Tolerance, o.CoarseStep = 10, 0.02, 86400
	return p, o
}

// TestDeferredCheckIsTheSecondCycle: a spin-up that leaves its confirming
// cycle to the simulation (SettleOptions.DeferCheck) judges, in the
// simulation's first period, exactly the cycle Settle would have run
// second. The verdict, the change, the fronts and the state at the cycle's
// end equal those of the spin-up run to the end bit for bit, whatever the
// simulation samples (here every step, with probes). [derived: the first
// period of the simulation repeats Settle's second cycle step for step]
func TestDeferredCheckIsTheSecondCycle(t *testing.T) {
	for _, c := range []struct{ observe, freeze bool }{{false, true}, {true, true}, {true, false}} {
		observe := c.observe
		p, o := checkProblem()
		if !c.freeze {
			l := p.Column.Layers[0]
			l.Freeze = nil
			p.Column.Layers = []Layer{l}
		}
		full, err := Settle(p, o)
		if err != nil {
			t.Fatal(err)
		}
		if !full.Converged || full.Cycles != 2 || full.CoarseCycles < 2 {
			t.Fatalf("the reference spin-up should settle in 2 cycles after a coarse phase: %v (coarse %d)", full, full.CoarseCycles)
		}
		o.DeferCheck = true
		pend, err := Settle(p, o)
		if err != nil {
			t.Fatal(err)
		}
		if !pend.Pending || pend.Converged || pend.Cycles != 1 {
			t.Fatalf("deferred spin-up: pending %v, converged %v, %d cycles; want pending after 1 cycle", pend.Pending, pend.Converged, pend.Cycles)
		}
		q := p
		q.InitialEnthalpy, q.InitialFunc, q.CheckCycle = pend.Enthalpy, nil, pend
		if observe {
			q.Observe = func(*Sample) {}
		}
		res, err := Simulate(q)
		if err != nil {
			t.Fatal(err)
		}
		got := res.Settled
		if got == nil || got.Pending || !got.Converged || got.Cycles != 2 {
			t.Fatalf("judged spin-up %+v; want 2 cycles, converged", got)
		}
		if got.Change != full.Change || got.FrontChange != full.FrontChange ||
			!slices.Equal(got.MaxFrost, full.MaxFrost) || !slices.Equal(got.MaxThaw, full.MaxThaw) ||
			!slices.Equal(got.Enthalpy, full.Enthalpy) {
			t.Errorf("observe %v, freeze %v: the simulated first period differs from Settle's second cycle:\n change %v vs %v, front change %v vs %v, fronts %v vs %v",
				observe, c.freeze, got.Change, full.Change, got.FrontChange, full.FrontChange, got.MaxFrost, full.MaxFrost)
		}
		if res.Steps != 2*1460 {
			t.Errorf("a settled check should let the run go on: %d steps, want %d", res.Steps, 2*1460)
		}
		if pend.Enthalpy[0] == got.Enthalpy[0] && slices.Equal(pend.Enthalpy, got.Enthalpy) {
			t.Error("the judged state should be the cycle's end, not its start")
		}
	}
}

// TestDeferredCheckThatFails: when the simulation's first period does not
// settle (here the pending spin-up's tolerance is made unreachable after
// it stopped), Simulate stops at the period's end with the verdict, and
// the state there is the one Settle reaches after its second cycle.
// [derived]
func TestDeferredCheckThatFails(t *testing.T) {
	p, o := checkProblem()
	full, err := Settle(p, o)
	if err != nil {
		t.Fatal(err)
	}
	o.DeferCheck = true
	pend, err := Settle(p, o)
	if err != nil {
		t.Fatal(err)
	}
	if !pend.Pending {
		t.Fatalf("not pending: %v", pend)
	}
	strict := pend.clone()
	c := *pend.check
	c.tol = 1e-12
	strict.check = &c
	q := p
	q.InitialEnthalpy, q.InitialFunc, q.CheckCycle = pend.Enthalpy, nil, strict
	res, err := Simulate(q)
	if err != nil {
		t.Fatal(err)
	}
	got := res.Settled
	if got.Converged || got.Cycles != 2 || got.Change != full.Change || !slices.Equal(got.Enthalpy, full.Enthalpy) {
		t.Errorf("judged %v, want not settled at Settle's second cycle %v and its state", got, full)
	}
	if res.Steps != 1460 {
		t.Errorf("an unsettled check should stop the run at the period's end: %d steps, want 1460", res.Steps)
	}
	if strict.Cycles != 1 || len(strict.MaxFrost) != 1 || !strict.Pending {
		t.Errorf("judging must not change the pending spin-up: %v", strict)
	}
}

// TestDeferCheckNeedsSettledCoarsePhase: without a coarse phase, or with
// a single cycle allowed, DeferCheck changes nothing.
func TestDeferCheckNeedsSettledCoarsePhase(t *testing.T) {
	for name, f := range map[string]func(*SettleOptions){
		"no coarse phase": func(o *SettleOptions) { o.CoarseStep = 0 },
		"one cycle":       func(o *SettleOptions) { o.MaxCycles = 1 },
		"coarse unsettled": func(o *SettleOptions) {
			o.Tolerance = 1e-9
			o.MaxCycles = 2
		},
	} {
		p, o := checkProblem()
		f(&o)
		a, err := Settle(p, o)
		if err != nil {
			t.Fatal(err)
		}
		o.DeferCheck = true
		b, err := Settle(p, o)
		if err != nil {
			t.Fatal(err)
		}
		if b.Pending || a.Cycles != b.Cycles || a.Converged != b.Converged || !slices.Equal(a.Enthalpy, b.Enthalpy) {
			t.Errorf("%s: DeferCheck changed the spin-up: %v against %v", name, b, a)
		}
	}
}

// TestCheckCycleRefusesAnotherRun: a run that does not continue the
// pending spin-up exactly is refused, not judged.
func TestCheckCycleRefusesAnotherRun(t *testing.T) {
	p, o := checkProblem()
	o.DeferCheck = true
	pend, err := Settle(p, o)
	if err != nil {
		t.Fatal(err)
	}
	for name, f := range map[string]func(*Problem){
		"not pending":     func(q *Problem) { c := *pend; c.Pending = false; q.CheckCycle = &c },
		"other state":     func(q *Problem) { q.InitialEnthalpy = append([]float64{1}, pend.Enthalpy[1:]...) },
		"other step":      func(q *Problem) { q.Step = 3 * 3600; q.OutputStep = 0 },
		"other start":     func(q *Problem) { q.Start = 86400 },
		"shorter than it": func(q *Problem) { q.Duration = 100 * 86400 },
	} {
		q := p
		q.InitialEnthalpy, q.InitialFunc, q.CheckCycle = pend.Enthalpy, nil, pend
		f(&q)
		if _, err := Simulate(q); err == nil {
			t.Errorf("%s: accepted", name)
		}
	}
}
