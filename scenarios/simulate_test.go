package scenarios

import (
	"context"
	"fmt"
	"math"
	"tempstack/scenarios/results"
	"testing"
)

func mustRun(t *testing.T, yaml string) *results.Results {
	t.Helper()
	s, err := Decode("test.yaml", []byte(yaml))
	if err != nil {
		t.Fatal(err)
	}
	r, err := Run(context.Background(), s, Options{})
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// TestSimulatedPeriodicMatchesExact drives light and heavy constructions
// through the whole scenario path and compares the decrement factor and
// time shift fitted from the simulated inside heat flux with the exact
// ISO 13786 transfer-matrix values (which solver's tests hold against
// TABULA Wall_01.03 [2nd-hand] and closed-form limits [derived]).
// Required: within 0.5 % and 0.05 h at default settings.
func TestSimulatedPeriodicMatchesExact(t *testing.T) {
	cases := []struct{ name, layers, orientation string }{
		{"heavy solid brick", `
  - {material: cement-render, thickness: 20 mm}
  - {material: clay-brick, thickness: 340 mm}
  - {material: lime-plaster, thickness: 15 mm}`, "wall"},
		{"concrete with outside insulation", `
  - {material: cement-render, thickness: 10 mm}
  - {material: eps, thickness: 160 mm}
  - {material: reinforced-concrete, thickness: 200 mm}`, "wall"},
		{"light timber roof", `
  - {material: plywood, thickness: 18 mm}
  - {material: glass-wool, thickness: 220 mm}
  - {material: osb, thickness: 15 mm}
  - {material: gypsum-board, thickness: 12.5 mm}`, "roof"},
		{"brick cavity wall with air gap", `
  - {material: clay-brick, thickness: 105 mm}
  - {material: air-gap-wall, thickness: 50 mm}
  - {material: concrete-block-medium, thickness: 100 mm}
  - {material: gypsum-plaster, thickness: 13 mm}`, "wall"},
		{"thin steel sheet over PIR (very light)", `
  - {material: steel, thickness: 0.7 mm}
  - {material: pir, thickness: 100 mm}
  - {material: steel, thickness: 0.5 mm}`, "roof"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r := mustRun(t, fmt.Sprintf(`
title: check
kind: wall
orientation: %s
layers: %s
outside:
  temperature:
    mean: 15
    daily: {amplitude: 10, peak_hour: 14}
inside:
  temperature: {mean: 22}
`, c.orientation, c.layers))
			if r.Simulation == nil || len(r.Simulation.PeriodicCheck) != 1 {
				t.Fatalf("no periodic check: %+v", r.Simulation)
			}
			pc := r.Simulation.PeriodicCheck[0]
			rel := pc.DecrementFactor/pc.ExactDecrementFactor - 1
			dlag := pc.TimeShift_h - pc.ExactTimeShift_h
			dlag -= 24 * math.Round(dlag/24)
			t.Logf("%s: f exact %.5f, simulated %.5f (%.3f %%); lag exact %.3f h, simulated %.3f h (%+.4f h); %d cells",
				c.name, pc.ExactDecrementFactor, pc.DecrementFactor, 100*rel, pc.ExactTimeShift_h, pc.TimeShift_h, dlag, r.Simulation.Cells)
			if math.Abs(rel) > 0.005 {
				t.Errorf("decrement factor off by %.3f %%", 100*rel)
			}
			if math.Abs(dlag) > 0.05 {
				t.Errorf("time shift off by %.4f h", dlag)
			}
			if r.Simulation.EnergyBalanceRelativeError > 1e-8 {
				t.Errorf("energy balance error %g", r.Simulation.EnergyBalanceRelativeError)
			}
		})
	}
}

// TestStepForcingMatchesErf runs a thick wall whose outside surface is
// stepped from 20 to -10 degC (zero surface resistance) and compares a
// probe with the semi-infinite solid solution T = Ts + (Ti - Ts)
// erf(x / (2 sqrt(a t))) (Incropera et al., section 5.7, eq. 5.57
// [2nd-hand]), valid while the far face is not yet
// reached.
func TestStepForcingMatchesErf(t *testing.T) {
	r := mustRun(t, `
title: step
kind: wall
layers:
  - {name: thick stone, conductivity: 2.0, density: 2500, specific_heat: 900, thickness: 2 m}
outside:
  resistance: 0
  temperature:
    step: {from: 20, to: -10, at: 0}
inside:
  temperature: {mean: 20}
analysis:
  simulate: {duration: 2d, step: 10min}
  probes: [0.05, 0.10, 0.20]
`)
	a := 2.0 / (2500 * 900)
	ser := r.Series
	for j, z := range ser.Simulation.ProbeDepth_m {
		worst := 0.0
		for k, th := range ser.Simulation.Time_h {
			tt := th * 3600
			if tt < 6*3600 {
				continue
			}
			want := -10 + 30*math.Erf(z/(2*math.Sqrt(a*tt)))
			worst = math.Max(worst, math.Abs(ser.Simulation.Probes_C[j][k]-want))
		}
		t.Logf("probe %.2f m: worst error %.4f K of a 30 K step", z, worst)
		if worst > 0.005*30 {
			t.Errorf("probe %.2f m: error %.4f K exceeds 0.5 %% of the step", z, worst)
		}
	}
}

// stoneFloor is a screed floor under 40 mm of granite whose top surface
// is stepped by 15 K for a minute: the granite acts as a half-space for
// about 110 s.
const stoneFloor = `
title: stone floor, heat uptake after a step
kind: wall
orientation: floor
layers:
  - {material: screed, thickness: 60 mm}
  - {material: granite, thickness: 40 mm}
outside:
  temperature: {mean: 18}
inside:
  temperature: {mean: 20}
analysis:
  simulate: false
  step_response: {side: inside, change: 15 K, duration: 1min}
`

// TestStepResponseMatchesHalfSpace asks for the step response of a floor
// whose top layer is thick enough to act as a half-space over the run, and
// compares the heat taken up with Q = 2 b dT sqrt(t / pi) (Incropera et
// al., section 5.7, eq. 5.58 integrated [derived]).
func TestStepResponseMatchesHalfSpace(t *testing.T) {
	r := mustRun(t, stoneFloor)
	sr := r.StepResponse
	if sr == nil {
		t.Fatal("no step response")
	}
	rel := sr.HeatAbsorbed_J_m2/sr.HeatAbsorbedHalfSpace_J_m2 - 1
	t.Logf("stone floor: Q(60 s) simulated %.1f J/m2, half-space %.1f J/m2 (%.3f %%); valid for %.0f s",
		sr.HeatAbsorbed_J_m2, sr.HeatAbsorbedHalfSpace_J_m2, 100*rel, sr.HalfSpaceValidFor_s)
	if sr.HalfSpaceValidFor_s < 60 {
		t.Fatalf("test set-up: the stone is not a half-space for 60 s")
	}
	if math.Abs(rel) > 0.005 {
		t.Errorf("heat taken up differs from the half-space closed form by %.3f %%", 100*rel)
	}
	if sr.SurfaceLayer == "" {
		t.Errorf("surface layer not named")
	}
}

func TestInitialStateIsPeriodic(t *testing.T) {
	// Starting from the exact periodic solution, the first simulated day
	// already repeats the last one: no spin-up is needed for a linear run.
	r := mustRun(t, `
title: periodic start
kind: wall
layers:
  - {material: concrete, thickness: 200 mm}
outside:
  temperature: {mean: 10, daily: {amplitude: 8, peak_hour: 15}}
analysis:
  simulate: {duration: 3d, step: 15min}
  probes: [0.1]
`)
	ser := r.Series
	perDay := 96
	worst := 0.0
	for k := 0; k <= perDay; k++ {
		worst = math.Max(worst, math.Abs(ser.Simulation.Probes_C[0][k]-ser.Simulation.Probes_C[0][k+2*perDay]))
	}
	t.Logf("day 1 against day 3 at 0.1 m: %.4f K", worst)
	if worst > 0.02 {
		t.Errorf("first day differs from the third by %.4f K: the start is not periodic", worst)
	}
	if r.Simulation.SpinUpCycles != 0 {
		t.Errorf("linear run spun up %d cycles", r.Simulation.SpinUpCycles)
	}
}

// TestStepResponseCurve: the simulated surface heat flux after the step
// (interval means) follows the half-space closed form q = b dT /
// sqrt(pi t) (Incropera et al., section 5.7, eq. 5.58
// [2nd-hand]) within 1 % at every sample from a thousandth of
// the duration until the step reaches the next layer, and has the sign of
// the step from the first sample on.
func TestStepResponseCurve(t *testing.T) {
	r := mustRun(t, stoneFloor)
	ser, sr := r.Series, r.StepResponse
	worst := 0.0
	for k, ts := range ser.Step.Time_s {
		if ser.Step.Flux_W_m2[k] <= 0 {
			t.Fatalf("flux %.1f W/m2 at %.3g s has the wrong sign", ser.Step.Flux_W_m2[k], ts)
		}
		if ts < sr.Duration_s/1000 || ts > sr.HalfSpaceValidFor_s {
			continue
		}
		worst = math.Max(worst, math.Abs(ser.Step.Flux_W_m2[k]/ser.Step.FluxHalfSpace_W_m2[k]-1))
	}
	t.Logf("%d samples from %.2g s; worst relative error %.4f %%; flux at 1 s %.0f W/m2 (closed form %.0f)",
		len(ser.Step.Time_s), ser.Step.Time_s[0], 100*worst, sr.FluxAt1s_W_m2, math.Sqrt(2.8*2600*1000)*15/math.Sqrt(math.Pi))
	if worst > 0.01 {
		t.Errorf("worst relative error %.3f %%", 100*worst)
	}
}
