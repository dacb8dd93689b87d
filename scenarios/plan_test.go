package scenarios

import (
	"context"
	"math"
	"path/filepath"
	"strings"
	"testing"
)

// TestCheckRefusesWhatRunRefuses loads the bad-input files whose mistake
// only shows when a run is planned (time steps, mesh, step time, the
// deepest ground layer, a step response without heat capacity, a study
// case) and wants Check and Run to refuse each with the same error, before
// anything is solved.
func TestCheckRefusesWhatRunRefuses(t *testing.T) {
	for _, name := range []string{
		"simulate-too-many-steps.yaml",
		"mesh-too-many-cells.yaml",
		"simulate-step-after-end.yaml",
		"ground-last-layer-resistance.yaml",
		"step-response-resistance-only.yaml",
		"sweep-too-many-steps.yaml",
	} {
		t.Run(name, func(t *testing.T) {
			s, err := Load(filepath.Join("..", "testdata", "bad", name))
			if err != nil {
				t.Fatalf("the file must decode (its mistake is for the plan): %v", err)
			}
			cerr := Check(s)
			if cerr == nil {
				t.Fatal("Check accepts it")
			}
			s, _ = Load(filepath.Join("..", "testdata", "bad", name))
			_, rerr := Run(context.Background(), s, Options{})
			if rerr == nil {
				t.Fatal("Run accepts it")
			}
			if cerr.Error() != rerr.Error() {
				t.Errorf("Check and Run disagree:\ncheck: %v\nrun:   %v", cerr, rerr)
			}
		})
	}
}

// TestResistanceOnlyWallRuns runs a wall of two resistance layers (an air
// layer and a resistance-only layer). Its exact solution: U = 1/(Rse + R1 +
// R2 + Rsi) (ISO 6946, total resistance of plane layers [memory]); a
// massless layer has the
// transfer matrix [[1, -R], [0, 1]] (ISO 13786 section 6.2 with d -> 0,
// [derived]), so Y12 = -U: decrement factor 1 and no time shift. The
// simulation is skipped with a reason and left null, and Check accepts it.
func TestResistanceOnlyWallRuns(t *testing.T) {
	const src = `title: air layers only (invented)
kind: wall
layers:
  - material: air-gap-wall
    thickness: 25 mm
  - name: reflective foil
    resistance: 0.5
outside:
  resistance: 0.04
  temperature: {mean: 5, daily: {amplitude: 6, peak_hour: 15}}
inside:
  resistance: 0.13
  temperature: {mean: 20}
analysis:
  periods: [24h, 8760h]
  simulate: {step: 10min}
`
	s, err := Decode("air.yaml", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	if err := Check(s); err != nil {
		t.Fatalf("Check: %v", err)
	}
	r, err := Run(context.Background(), s, Options{})
	if err != nil {
		t.Fatalf("Run: %v", err)
	}
	wantU := 1 / (0.04 + 0.18 + 0.5 + 0.13) // air-gap-wall: 0.18 m2 K/W, its row in layers/materials.go (cited there)
	if got := r.Steady.UValue_W_m2K; math.Abs(got-wantU) > 1e-12 {
		t.Errorf("U = %v, want %v", got, wantU)
	}
	for _, p := range r.Periodic {
		if math.Abs(p.DecrementFactor-1) > 1e-12 || math.Abs(p.TimeShift_h) > 1e-9 || math.Abs(p.PeriodicTransmittance_W_m2K-wantU) > 1e-12 {
			t.Errorf("period %g h: f = %v, shift %v h, |Y12| %v; want 1, 0, U", p.Period_h, p.DecrementFactor, p.TimeShift_h, p.PeriodicTransmittance_W_m2K)
		}
	}
	if r.Simulation != nil {
		t.Errorf("simulation ran: %+v", r.Simulation)
	}
	if !strings.Contains(r.SimulationSkipped, "only resistance layers") {
		t.Errorf("no reason for the skipped simulation: %q", r.SimulationSkipped)
	}
}
