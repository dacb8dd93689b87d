package scenarios

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"tempstack/climate"
	"tempstack/ground"
	"tempstack/scenarios/results"
	"tempstack/solver"
)

// TestGroundNeumannLunardini runs the two-phase Neumann problem of
// Lunardini (1981), Heat Transfer in Cold Climates, with Jumikis (1966)
// soil data [2nd-hand] through a whole ground
// scenario: soil at +2 degC, surface stepped to -10 degC, k_f 2.324,
// k_u 1.860 W/(m K), C_f 1.966e6, C_u 2.862e6 J/(m3 K), L 1.1045e8 J/m3.
// The front reaches X = m sqrt(t), m = 3.5945 cm/h^0.5 [derived]:
// 1.364 m after 60 days. Required: within 1 %.
func TestGroundNeumannLunardini(t *testing.T) {
	r := mustRun(t, `
title: Neumann check
kind: ground
layers:
  - name: Jumikis soil
    conductivity: 1.860
    density: 1000
    specific_heat: 2862
    conductivity_frozen: 2.324
    specific_heat_frozen: 1966
    latent_heat: 1.1045e8
    thickness: 8 m
surface:
  temperature:
    step: {from: 2, to: -10, at: 0}
bottom:
  adiabatic: true
analysis:
  simulate: {duration: 60d, step: 1h, initial_temperature: 2}
`)
	ser := r.Series
	got := ser.Simulation.FrostDepth_m[len(ser.Simulation.FrostDepth_m)-1]
	m := 3.5945e-2 / math.Sqrt(3600) // m/s^0.5
	want := m * math.Sqrt(60*climate.Day)
	t.Logf("frost depth after 60 d: %.4f m, Neumann %.4f m (%.2f %%)", got, want, 100*(got/want-1))
	if math.Abs(got/want-1) > 0.01 {
		t.Errorf("frost depth %.4f m differs from the Neumann solution %.4f m by more than 1 %%", got, want)
	}
	if math.Abs(want-1.364) > 0.001 {
		t.Errorf("test set-up: Neumann depth %.4f m, Lunardini's case gives 1.364 m", want)
	}
	if e := r.Simulation.EnergyBalanceRelativeError; e > 1e-8 {
		t.Errorf("energy balance error %g with freezing", e)
	}
}

// TestGroundPeriodicHalfSpace: a non-freezing rock column driven by an
// annual surface temperature swing; the transient run's amplitude and lag
// at several depths match the half-space solution T = Tm + As exp(-z/d)
// cos(w t - z/d), d = sqrt(a P / pi) (Kusuda and Achenbach 1965 form
// [memory], checked against the heat equation [derived]). Required:
// within 1 %.
func TestGroundPeriodicHalfSpace(t *testing.T) {
	r := mustRun(t, `
title: annual wave in rock
kind: ground
layers:
  - material: rock
    thickness: 40 m
surface:
  temperature:
    mean: 8
    annual: {amplitude: 12, peak_day: 200}
bottom:
  heat_flux: 0
analysis:
  periods: [8760h]
  probes: [0.5, 1, 2, 4, 8]
  simulate: {duration: 2y, step: 6h}
`)
	p, _ := ground.Preset("rock")
	a := p.Conductivity / p.HeatCapacity
	d := math.Sqrt(a * climate.Year / math.Pi)
	ser := r.Series
	n := len(ser.Simulation.Time_h)
	var ts []float64
	for _, h := range ser.Simulation.Time_h {
		ts = append(ts, h*3600)
	}
	for j, z := range ser.Simulation.ProbeDepth_m {
		// Least-squares fit over the last year.
		var tt, vv []float64
		for k := 0; k < n; k++ {
			if ts[k] > ts[n-1]-climate.Year {
				tt = append(tt, ts[k])
				vv = append(vv, ser.Simulation.Probes_C[j][k])
			}
		}
		fit, _, err := climate.FitHarmonics(tt, vv, []float64{climate.Year})
		if err != nil {
			t.Fatal(err)
		}
		h := fit.Harmonics[0]
		wantAmp := 12 * math.Exp(-z/d)
		wantLag := z / d * climate.Year / (2 * math.Pi)
		surfPeak := (200 - 0.5) * climate.Day
		lag := math.Mod(h.Peak-surfPeak+2*climate.Year, climate.Year)
		t.Logf("z = %.1f m: amplitude %.4f K (exact %.4f, %.2f %%), lag %.2f d (exact %.2f d)",
			z, h.Amplitude, wantAmp, 100*(h.Amplitude/wantAmp-1), lag/climate.Day, wantLag/climate.Day)
		if math.Abs(h.Amplitude/wantAmp-1) > 0.01 {
			t.Errorf("z = %.1f m: amplitude off by %.2f %%", z, 100*(h.Amplitude/wantAmp-1))
		}
		if math.Abs(lag-wantLag) > 0.01*wantLag+0.25*climate.Day {
			t.Errorf("z = %.1f m: lag %.2f d, want %.2f d", z, lag/climate.Day, wantLag/climate.Day)
		}
		// The exact transfer-matrix result in results.json agrees too.
		gp := r.Ground.Periodic[0].Probes[j]
		if math.Abs(gp.Amplitude_K/wantAmp-1) > 1e-9 || math.Abs(gp.Lag_d*climate.Day-wantLag) > 1e-6*climate.Day {
			t.Errorf("z = %.1f m: exact periodic %.6f K, %.4f d; closed form %.6f K, %.4f d", z, gp.Amplitude_K, gp.Lag_d, wantAmp, wantLag/climate.Day)
		}
	}
}

// TestFrostBetweenNeumannAndStefan is a property test over random soils:
// under a constant-temperature winter (surface stepped below freezing,
// soil initially at or above freezing) the simulated frost depth lies
// between the two-phase Neumann solution (which also pays for cooling the
// unfrozen soil; Carslaw and Jaeger section 11.2) and Stefan's formula
// (which ignores all sensible heat and so overestimates: closed forms of
// this kind "generally overestimate" freezing depths, UFC 3-130-05,
// chapter 12 [read]). The Neumann bound gets
// a 1 % allowance for discretisation.
func TestFrostBetweenNeumannAndStefan(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	for i := 0; i < 8; i++ {
		tex := []string{"sand", "silt-clay"}[i%2]
		dry := 1500 + 200*rng.Float64()
		w := 0.08 + 0.10*rng.Float64() // below saturation at 1700 kg/m3 (21 %)
		ts := -2 - 13*rng.Float64()
		ti := 0.5 + 4*rng.Float64()
		yaml := fmt.Sprintf(`
title: random soil %d
kind: ground
layers:
  - soil: {texture: %s, dry_density: %.0f, water_content: %.3f}
    thickness: 6 m
surface:
  temperature:
    step: {from: %.3f, to: %.3f, at: 0}
bottom:
  adiabatic: true
analysis:
  simulate: {duration: 40d, step: 2h, initial_temperature: %.3f}
`, i, tex, dry, w, ti, ts, ti)
		s, err := Decode("random.yaml", []byte(yaml))
		if err != nil {
			t.Fatal(err)
		}
		r, err := Run(context.Background(), s, Options{})
		if err != nil {
			t.Fatal(err)
		}
		l := s.Layers[0].Solver()
		dur := 40 * climate.Day
		m, err := solver.NeumannFront(solver.NeumannProblem{
			ConductivityFrozen: l.Freeze.ConductivityFrozen, HeatCapacityFrozen: l.Freeze.HeatCapacityFrozen,
			ConductivityUnfrozen: l.Conductivity, HeatCapacityUnfrozen: l.HeatCapacity,
			LatentHeat: l.Freeze.LatentHeat, Surface: ts, Initial: ti, FreezingPoint: 0,
		})
		if err != nil {
			t.Fatal(err)
		}
		lower := m * math.Sqrt(dur)
		upper, _ := ground.Stefan(l.Freeze.ConductivityFrozen, l.Freeze.LatentHeat, -ts*40)
		got := r.Series.Simulation.FrostDepth_m[len(r.Series.Simulation.FrostDepth_m)-1]
		t.Logf("%s %.0f kg/m3 %.1f %%, Ts %.1f, Ti %.1f: Neumann %.3f <= simulated %.3f <= Stefan %.3f m",
			tex, dry, 100*w, ts, ti, lower, got, upper)
		if got < 0.99*lower || got > upper {
			t.Errorf("draw %d: simulated %.4f m outside [%.4f, %.4f]", i, got, lower, upper)
		}
	}
}

// TestGroundWarnings: a column too shallow for the annual wave and for the
// frost is run but warned about.
func TestGroundWarnings(t *testing.T) {
	r := mustRun(t, `
title: shallow column
kind: ground
layers:
  - soil: {texture: sand, dry_density: 1700, water_content: 8 %}
    thickness: 1.0 m
surface:
  temperature:
    mean: -2
    annual: {amplitude: 15, peak_day: 200}
analysis:
  simulate: {duration: 1y, step: 3h}
`)
	var deep, frost bool
	for _, w := range r.Warnings {
		deep = deep || strings.Contains(w, "annual swing only falls below 0.1 K")
		frost = frost || strings.Contains(w, "too shallow") || strings.Contains(w, "exceeds the column depth")
	}
	if !deep || !frost {
		t.Errorf("warnings %q lack the shallow-domain cautions", r.Warnings)
	}
}

// BenchmarkGroundColumn20m: a 20 m freezing soil column driven for ten
// winters in hourly steps (the farm demo's soils and climate), the whole
// scenario path; reports cell-steps per second of the ten-year run.
func BenchmarkGroundColumn20m(b *testing.B) {
	src := `
title: bench
kind: ground
layers:
  - soil: {texture: silt-clay, dry_density: 1500, water_content: 25 %}
    thickness: 0.3 m
  - soil: {texture: sand, dry_density: 1800, water_content: 10 %}
    thickness: 2.2 m
  - soil: {texture: silt-clay, dry_density: 1650, water_content: 22 %}
    thickness: 17.5 m
surface:
  cover: turf
  temperature:
    mean: 3.5
    annual: {amplitude: 15, peak_day: 200}
    daily: {amplitude: 4, peak_hour: 15}
analysis:
  simulate: {duration: 10y, step: 1h, output_step: 24h, spin_up_cycles: 1}
`
	var cells, steps float64
	for i := 0; i < b.N; i++ {
		s, err := Decode("bench.yaml", []byte(src))
		if err != nil {
			b.Fatal(err)
		}
		r, err := Run(context.Background(), s, Options{})
		if err != nil {
			b.Fatal(err)
		}
		cells = float64(r.Simulation.Cells)
		steps = r.Simulation.Duration_h / r.Simulation.Step_h * 11 / 10 // ten years plus one spin-up year
	}
	b.ReportMetric(cells*steps*float64(b.N)/b.Elapsed().Seconds(), "cell-steps/s")
	b.ReportMetric(cells, "cells")
}

// TestDesignIndexDrivesClosedForms: with a design air freezing index the
// closed forms use n x design; the Stefan depth of a homogeneous soil is
// X = sqrt(2 k_f F 86400 / L) (Stefan's formula as in Handy and Spangler,
// Geotechnical Engineering, 5th ed. 2007, Example 11.7 [read]).
func TestDesignIndexDrivesClosedForms(t *testing.T) {
	s, err := Decode("design.yaml", []byte(`
title: design index
kind: ground
layers:
  - soil: {texture: sand, dry_density: 1800, water_content: 10 %}
    thickness: 20 m
surface:
  cover: concrete
  temperature: {mean: 4, annual: {amplitude: 13, peak_day: 200}}
analysis:
  design_freezing_index: 1500
  design_season_length: 150d
  simulate: false
`))
	if err != nil {
		t.Fatal(err)
	}
	r, err := Run(context.Background(), s, Options{})
	if err != nil {
		t.Fatal(err)
	}
	l := s.Layers[0].Solver()
	F := 0.75 * 1500 // UFC 3-130-04 Table 4-1: concrete, freezing n 0.75 [read]
	want := math.Sqrt(2 * l.Freeze.ConductivityFrozen * F * 86400 / l.Freeze.LatentHeat)
	f := r.Frost
	if math.Abs(*f.StefanDepth_m-want) > 1e-9 || *f.FreezingIndex_Cd != 1500 || math.Abs(*f.SurfaceFreezingIndex_Cd-F) > 1e-9 ||
		f.ForcingFreezingIndex_Cd == nil || f.IndexSource.Origin != results.FromDesign || !(*f.ModifiedBerggrenDepth_m < *f.StefanDepth_m) {
		t.Errorf("frost %+v; Stefan want %.4f m", f, want)
	}
}
