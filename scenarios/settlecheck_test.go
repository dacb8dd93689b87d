package scenarios

import (
	"bytes"
	"context"
	"math"
	"testing"

	"tempstack/scenarios/results"
	"tempstack/solver"
)

// TestSpinUpCheckedByFirstCycle: a ground run whose spin-up settles in its
// coarse phase leaves the confirming cycle to the simulation and reports
// it (spin_up_last_cycle_simulated).
func TestSpinUpCheckedByFirstCycle(t *testing.T) {
	s := exampleScenario(t, "farm-frost")
	r, err := Run(context.Background(), s, Options{})
	if err != nil {
		t.Fatal(err)
	}
	sim := r.Simulation
	if sim.SpinUpLastCycleSimulated == nil || !*sim.SpinUpLastCycleSimulated || !sim.SpinUpConverged || sim.SpinUpCycles != 2 {
		t.Fatalf("spin-up: %d cycles, converged %v, last simulated %v; want 2, settled by the simulation's first cycle",
			sim.SpinUpCycles, sim.SpinUpConverged, sim.SpinUpLastCycleSimulated)
	}
	if !(sim.SpinUpChange_K < spinUpTolerance) {
		t.Errorf("judged change %g K", sim.SpinUpChange_K)
	}
}

// TestSpinUpCheckThatFailsRunsAgain: when the simulation's first cycle
// does not settle the spin-up, the spin-up goes on from that cycle's end
// and the simulation runs again from the new state. The rows of the
// dropped attempt never reach series.csv: the streamed file is byte for
// byte the one built from the kept samples, with one header. The failure
// is staged by a Simulate that stops the checking run at its cycle's end
// with the verdict turned to "not settled", as Simulate does for a cycle
// that does not settle.
func TestSpinUpCheckThatFailsRunsAgain(t *testing.T) {
	calls, checks := 0, 0
	simulateFn = func(p solver.Problem) (*solver.Result, error) {
		calls++
		if p.CheckCycle == nil {
			return solver.Simulate(p)
		}
		checks++
		p.Duration = 365 * 86400
		res, err := solver.Simulate(p)
		if err != nil || res.Settled == nil {
			t.Fatalf("checking run: %v", err)
		}
		judged := *res.Settled
		judged.Converged = false
		res.Settled = &judged
		return res, nil
	}
	defer func() { simulateFn = solver.Simulate }()

	s := exampleScenario(t, "farm-frost")
	mem, str, csv := runBoth(t, s)
	if checks != 2 || calls != 4 {
		t.Fatalf("%d simulations, %d of them checking; want 2 runs of a check and a rerun each", calls, checks)
	}
	for _, r := range []*results.Results{mem, str} {
		sim := r.Simulation
		if sim.SpinUpLastCycleSimulated == nil || *sim.SpinUpLastCycleSimulated || !sim.SpinUpConverged || sim.SpinUpCycles < 4 {
			t.Errorf("spin-up: %d cycles, converged %v, last simulated %v; want at least 4, settled before the rerun",
				sim.SpinUpCycles, sim.SpinUpConverged, *sim.SpinUpLastCycleSimulated)
		}
		if n, want := len(r.Series.Simulation.Time_h), int(sim.Duration_h/sim.OutputStep_h)+1; n != want {
			t.Errorf("%d samples kept, want %d", n, want)
		}
	}
	var want []byte
	for _, f := range results.CSVFiles(mem) {
		if f.Name == "series.csv" {
			want = f.Data
		}
	}
	if len(want) == 0 || !bytes.Equal(csv, want) {
		t.Errorf("streamed series.csv (%d bytes) differs from the one built from the kept samples (%d bytes)", len(csv), len(want))
	}
	if h := bytes.Count(csv, []byte("time_h")); h != 1 {
		t.Errorf("series.csv holds %d header rows", h)
	}

	// The rerun starts from a state settled by cycles run before the
	// simulation; the normal run from the state its own first cycle
	// confirmed. Both are periodic within the spin-up's tolerances, so
	// the probes and the frost depth agree within them. [derived]
	simulateFn = solver.Simulate
	ref, err := Run(context.Background(), exampleScenario(t, "farm-frost"), Options{})
	if err != nil {
		t.Fatal(err)
	}
	for j, p := range ref.Simulation.Probes {
		q := mem.Simulation.Probes[j]
		for _, d := range []float64{p.Min_C - q.Min_C, p.Max_C - q.Max_C, p.Mean_C - q.Mean_C} {
			if math.Abs(d) > spinUpTolerance {
				t.Errorf("probe at %g m: %+v against %+v", p.Depth_m, p, q)
			}
		}
	}
	if d := *ref.Frost.MaxFrostDepth_m - *mem.Frost.MaxFrostDepth_m; math.Abs(d) > spinUpFrontTolerance {
		t.Errorf("frost depth %g m against %g m", *ref.Frost.MaxFrostDepth_m, *mem.Frost.MaxFrostDepth_m)
	}
}

// exampleScenario decodes the embedded example of that name.
func exampleScenario(t *testing.T, name string) *Scenario {
	t.Helper()
	ex, ok := LookupExample(name)
	if !ok {
		t.Fatalf("no example %s", name)
	}
	s, err := ex.Decode()
	if err != nil {
		t.Fatal(err)
	}
	return s
}
