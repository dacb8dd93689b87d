package scenarios

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"tempstack/climate"
	"tempstack/scenarios/results"
	"tempstack/solver"
)

const studyWall = `
title: study wall
kind: wall
layers:
  - {material: cement-render, thickness: 15 mm}
  - {material: eps, thickness: 100 mm}
  - {material: concrete, thickness: 180 mm}
  - {material: gypsum-plaster, thickness: 13 mm}
outside:
  temperature: {mean: 20, daily: {amplitude: 10, peak_hour: 15}}
analysis:
  simulate: false
`

// TestTargetFedBack: the thickness the target search returns, fed back as
// a plain scenario, meets the goal, and the tolerance-smaller thickness
// does not (the exact ISO 13786 solution decides both).
func TestTargetFedBack(t *testing.T) {
	cases := []struct{ quantity, goal string }{
		{"time_shift_unwrapped_h", "at_least: 10"},
		{"periodic_transmittance_W_m2K", "at_most: 0.03"},
		{"decrement_factor", "at_most: 0.1"},
	}
	for _, c := range cases {
		r := mustRun(t, studyWall+fmt.Sprintf(`
target:
  parameter: layers[3].thickness
  from: 20 mm
  to: 400 mm
  quantity: %s
  %s
  tolerance: 0.5
`, c.quantity, c.goal))
		tg := r.Target
		if tg == nil || !tg.Met {
			t.Fatalf("%s: not met: %+v", c.quantity, tg)
		}
		check := func(mm float64) float64 {
			rr := mustRun(t, strings.Replace(studyWall, "{material: concrete, thickness: 180 mm}",
				fmt.Sprintf("{material: concrete, thickness: %g mm}", mm), 1))
			v, _ := readQuantity(c.quantity, rr)
			return v
		}
		at, below := check(tg.Value), check(tg.Value-0.5)
		t.Logf("%s %s: %.2f mm gives %.5f (at 0.5 mm less: %.5f); %d evaluations", c.quantity, c.goal, tg.Value, at, below, tg.Evaluations)
		meets := func(v float64) bool {
			if tg.AtLeast {
				return v >= tg.Goal
			}
			return v <= tg.Goal
		}
		if !meets(at) || meets(below) {
			t.Errorf("%s: %.3f mm gives %.5f, 0.5 mm less gives %.5f; goal %g", c.quantity, tg.Value, at, below, tg.Goal)
		}
	}
}

func TestTargetNotInRange(t *testing.T) {
	r := mustRun(t, studyWall+`
target:
  parameter: layers[3].thickness
  from: 20 mm
  to: 100 mm
  quantity: time_shift_h
  at_least: 15
`)
	if r.Target.Met || !strings.Contains(r.Target.Message, "no value of layers[3].thickness from 20 mm to 100 mm meets") {
		t.Errorf("%+v", r.Target)
	}
}

// TestTargetNotMetMessage: a target the range cannot meet reports the
// closest scan point rounded to the tolerance's grid (0.2 mm here: 99.87
// mm prints as 99.8 mm) and the quantity with its own digits (one decimal
// for a time shift), while results.json keeps the scan point itself.
func TestTargetNotMetMessage(t *testing.T) {
	r := mustRun(t, studyWall+`
target:
  parameter: layers[3].thickness
  from: 20.37 mm
  to: 99.87 mm
  quantity: time_shift_unwrapped_h
  at_least: 30
  tolerance: 0.2
`)
	tg := r.Target
	if tg == nil || tg.Met {
		t.Fatalf("a whole time shift of 30 h should be out of reach: %+v", tg)
	}
	onScan := false
	for _, p := range tg.Scan {
		onScan = onScan || (p.Value == tg.Value && p.Quantity == tg.Achieved)
	}
	if !onScan {
		t.Errorf("closest value %v (quantity %v) is not a scan point: %+v", tg.Value, tg.Achieved, tg.Scan)
	}
	// Rounded by hand to the 0.2 mm grid, written with one decimal.
	closest := strconv.FormatFloat(math.Round(tg.Value/0.2)*0.2, 'f', 1, 64)
	want := "; the closest is " + closest + " mm: time_shift_unwrapped_h = " + strconv.FormatFloat(tg.Achieved, 'f', 1, 64)
	if !strings.HasSuffix(tg.Message, want) {
		t.Errorf("message %q does not end in %q", tg.Message, want)
	}
	if tg.Value == 99.87 && !strings.Contains(tg.Message, "closest is 99.8 mm") {
		t.Errorf("message %q: want the closest as 99.8 mm", tg.Message)
	}
}

// TestSweepDeterministicAndParallel: the same sweep with 1 and 2 workers
// gives identical results, and each point equals the plain scenario with
// that value.
func TestSweepDeterministicAndParallel(t *testing.T) {
	src := studyWall + `
sweep:
  parameter: layers[2].thickness
  values: [50 mm, 100 mm, 200 mm]
`
	run := func(workers int) *results.Results {
		s, err := Decode("sweep.yaml", []byte(src))
		if err != nil {
			t.Fatal(err)
		}
		r, err := Run(context.Background(), s, Options{Workers: workers})
		if err != nil {
			t.Fatal(err)
		}
		return r
	}
	a, b := run(1), run(2)
	for i := range a.Sweep.Points {
		for k, v := range a.Sweep.Points[i].Quantities {
			if b.Sweep.Points[i].Quantities[k] != v {
				t.Errorf("point %d %s: %v with 1 worker, %v with 2", i, k, v, b.Sweep.Points[i].Quantities[k])
			}
		}
	}
	plain := mustRun(t, strings.Replace(studyWall, "{material: eps, thickness: 100 mm}", "{material: eps, thickness: 200 mm}", 1))
	if got, want := a.Sweep.Points[2].Quantities["u_value_W_m2K"], plain.Steady.UValue_W_m2K; got != want {
		t.Errorf("sweep point 200 mm U = %v, plain run %v", got, want)
	}
}

func TestVariantsAndUncertainty(t *testing.T) {
	r := mustRun(t, studyWall+`
variants:
  - name: thicker insulation
    set:
      layers[2].thickness: 200 mm
  - name: brick inside
    set:
      layers[3].material: clay-brick
      layers[3].thickness: 240 mm
uncertainty:
  samples: 40
  seed: 3
  vary:
    - parameter: layers[3].thickness
      normal: {mean: 180 mm, sd: 10 mm}
`)
	if len(r.Variants) != 3 || r.Variants[0].Name != "base" ||
		r.Variants[1].Quantities["u_value_W_m2K"] >= r.Variants[0].Quantities["u_value_W_m2K"] {
		t.Errorf("variants: %+v", r.Variants)
	}
	if got := r.Variants[2].Layers[2].Material; got != "clay-brick" {
		t.Errorf("variant 2 layer 3 is %q", got)
	}
	u := r.Uncertainty
	if u == nil || u.Rejected != 0 || len(u.Quantities) == 0 {
		t.Fatalf("uncertainty: %+v", u)
	}
	for _, q := range u.Quantities {
		if q.Quantity == "time_shift_h" && !(q.SD > 0 && q.P5 < q.P95) {
			t.Errorf("no spread of the time shift: %+v", q)
		}
	}
}

// TestUncertaintyPercentiles: with a uniform thickness the time shift
// spreads monotonically; the percentiles follow the parameter's (a linear
// map of a sorted sample keeps its order), checked against the run at the
// parameter's own percentiles within the sampling error.
func TestUncertaintyPercentiles(t *testing.T) {
	r := mustRun(t, studyWall+`
uncertainty:
  samples: 60
  seed: 11
  vary:
    - parameter: layers[3].thickness
      uniform: {min: 150 mm, max: 250 mm}
`)
	var ts *results.Spread
	for i := range r.Uncertainty.Quantities {
		if r.Uncertainty.Quantities[i].Quantity == "time_shift_h" {
			ts = &r.Uncertainty.Quantities[i]
		}
	}
	if ts == nil || ts.N != 60 {
		t.Fatalf("no time shift spread: %+v", r.Uncertainty)
	}
	lo := mustRun(t, strings.Replace(studyWall, "180 mm", "150 mm", 1)).Periodic[0].TimeShiftUnwrapped_h
	hi := mustRun(t, strings.Replace(studyWall, "180 mm", "250 mm", 1)).Periodic[0].TimeShiftUnwrapped_h
	if !(ts.Min >= lo-1e-9 && ts.Max <= hi+1e-9 && ts.P5 < ts.P50 && ts.P50 < ts.P95) {
		t.Errorf("spread %+v outside [%g, %g]", ts, lo, hi)
	}
	// Reproducible: the same seed gives the same numbers.
	again := mustRun(t, studyWall+`
uncertainty:
  samples: 60
  seed: 11
  vary:
    - parameter: layers[3].thickness
      uniform: {min: 150 mm, max: 250 mm}
`)
	if again.Uncertainty.Quantities[0] != r.Uncertainty.Quantities[0] {
		t.Errorf("not reproducible: %+v vs %+v", again.Uncertainty.Quantities[0], r.Uncertainty.Quantities[0])
	}
}

// TestFitSyntheticSensors: a synthetic record (exact periodic solution of a
// homogeneous half-space, annual and daily harmonics, seeded noise) at
// three depths is fitted back: the harmonic methods within 2 % and the
// inversion within 1 % of the diffusivity that made it (synthetic data).
func TestFitSyntheticSensors(t *testing.T) {
	if testing.Short() {
		t.Skip("fit inversion takes a few seconds")
	}
	dir := t.TempDir()
	const k, C = 1.4, 3.111e6 // wet clay, Moene and van Dam (2014) Table 2.2 [2nd-hand]
	a := k / C
	col := solver.Column{Layers: []solver.Layer{{Name: "clay", Thickness: 10, Conductivity: k, HeatCapacity: C}}, HalfSpace: true}
	depths := []float64{0.1, 0.5, 1.0}
	surf := climate.Periodic{Mean: 8, Harmonics: []climate.Harmonic{
		{Period: climate.Year, Amplitude: 11, Peak: 200 * climate.Day},
		{Period: climate.Day, Amplitude: 6, Peak: 15 * 3600},
	}}
	var ratios [][]complex128
	for _, h := range surf.Harmonics {
		resp, err := solver.GroundPeriodic(col, h.Period, depths)
		if err != nil {
			t.Fatal(err)
		}
		row := make([]complex128, len(depths))
		for j := range depths {
			row[j] = h.Phasor() * resp.Ratio[j]
		}
		ratios = append(ratios, row)
	}
	rng := rand.New(rand.NewPCG(5, 9))
	origin := time.Date(2021, 1, 1, 0, 0, 0, 0, time.UTC)
	var b strings.Builder
	b.WriteString("# synthetic sensor record (exact half-space solution plus 0.05 K noise)\ntime,t10,t50,t100\n")
	for ts := 0.0; ts <= climate.Year; ts += 3600 {
		b.WriteString(origin.Add(time.Duration(ts) * time.Second).Format("2006-01-02T15:04"))
		for j := range depths {
			v := surf.Mean
			for i, h := range surf.Harmonics {
				w := 2 * math.Pi / h.Period
				v += real(ratios[i][j] * complex(math.Cos(w*ts), math.Sin(w*ts)))
			}
			fmt.Fprintf(&b, ",%.4f", v+0.05*rng.NormFloat64())
		}
		b.WriteString("\n")
	}
	os.WriteFile(filepath.Join(dir, "sensors.csv"), []byte(b.String()), 0o644)
	scen := `title: fit
kind: ground
layers:
  - {name: clay, conductivity: 1.4, density: 1000, specific_heat: 3111, thickness: 10 m}
surface:
  temperature: {mean: 8, annual: {amplitude: 11, peak_day: 200}}
analysis:
  simulate: false
  fit:
    file: sensors.csv
    sensors:
      - {depth: 0.1, column: t10}
      - {depth: 0.5, column: t50}
      - {depth: 1.0, column: t100}
`
	os.WriteFile(filepath.Join(dir, "fit.yaml"), []byte(scen), 0o644)
	s, err := Load(filepath.Join(dir, "fit.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	r, err := Run(context.Background(), s, Options{})
	if err != nil {
		t.Fatal(err)
	}
	f := r.Fit
	t.Logf("true a %.4g; inversion %.4g (%.2f %%), harmonic %.4g (%.2f %%); conductivity %.3f W/(m K)",
		a, f.Diffusivity_m2_s, 100*(f.Diffusivity_m2_s/a-1), f.HarmonicCombined_m2_s, 100*(f.HarmonicCombined_m2_s/a-1), f.Conductivity_W_mK)
	if math.Abs(f.HarmonicCombined_m2_s/a-1) > 0.02 {
		t.Errorf("harmonic estimate off by %.2f %%", 100*(f.HarmonicCombined_m2_s/a-1))
	}
	if math.Abs(f.Diffusivity_m2_s/a-1) > 0.01 {
		t.Errorf("inversion off by %.2f %%", 100*(f.Diffusivity_m2_s/a-1))
	}
	if math.Abs(f.Conductivity_W_mK/k-1) > 0.01 {
		t.Errorf("conductivity %.3f, want %.3f", f.Conductivity_W_mK, k)
	}
}

// BenchmarkSweep runs an 8-point sweep of a simulated wall with 1 and 2
// workers: on 2 free cores the second should take close to half the time.
func BenchmarkSweep(b *testing.B) {
	src := `
title: sweep bench
kind: wall
layers:
  - {material: clay-brick, thickness: 240 mm}
  - {material: mineral-wool, thickness: 100 mm}
  - {material: gypsum-plaster, thickness: 13 mm}
outside:
  temperature: {mean: 20, daily: {amplitude: 10, peak_hour: 15}}
analysis:
  simulate: {duration: 30d, step: 15min}
sweep:
  parameter: layers[1].thickness
  from: 100 mm
  to: 450 mm
  steps: 8
`
	for _, w := range []int{1, 2} {
		b.Run(fmt.Sprintf("workers=%d", w), func(b *testing.B) {
			for i := 0; i < b.N; i++ {
				s, err := Decode("bench.yaml", []byte(src))
				if err != nil {
					b.Fatal(err)
				}
				if _, err := Run(context.Background(), s, Options{Workers: w}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// TestQuantityKinds: every study quantity declares one kind; the names of
// the three kinds split the table, and a frost quantity reads nothing from a
// wall's results (it is absent there, not 0).
func TestQuantityKinds(t *testing.T) {
	wall, grnd, room := quantityNames(Wall), quantityNames(Ground), quantityNames(Room)
	if len(wall)+len(grnd)+len(room) != len(results.Quantities()) || len(wall) == 0 || len(grnd) == 0 || len(room) == 0 {
		t.Fatalf("wall %v, ground %v and room %v do not split the %d quantities", wall, grnd, room, len(results.Quantities()))
	}
	for _, name := range room {
		q, _ := quantityOf(name)
		if v, ok := q.Read(&results.Results{Kind: results.Wall}); ok {
			t.Errorf("%s reads %g from a wall's results", name, v)
		}
	}
	for _, name := range grnd {
		q, ok := quantityOf(name)
		if !ok || q.Kind != Ground {
			t.Errorf("%s: kind %v", name, q.Kind)
		}
		if v, ok := q.Read(&results.Results{Kind: results.Wall}); ok {
			t.Errorf("%s reads %g from a wall's results", name, v)
		}
	}
	if _, ok := quantityOf("u_value"); ok {
		t.Error("a name without its unit is a quantity")
	}
}

// TestTimeShiftOneMeaning: a study's time_shift_h is periodic[].time_shift_h
// (in [0, period)) and its time_shift_unwrapped_h the whole lag, also when
// the lag passes a period: a sweep of a stone wall from 0.3 to 1.2 m, whose
// lag grows past 24 h (about 1.4 h per 0.1 m of stone: d/delta per 0.1 m
// with delta = 0.15 m [derived, ISO 13786 penetration depth]), each point
// against the same wall run on its own.
func TestTimeShiftOneMeaning(t *testing.T) {
	const wall = `
title: stone
kind: wall
layers:
  - {name: stone, conductivity: 2.3, density: 2500, specific_heat: 1000, thickness: THICK}
outside:
  temperature: {mean: 10, daily: {amplitude: 5, peak_hour: 15}}
analysis:
  simulate: false
`
	r := mustRun(t, strings.Replace(wall, "THICK", "0.3 m", 1)+`
sweep:
  parameter: layers[1].thickness
  values: [0.3 m, 0.9 m, 1.2 m]
`)
	if r.Sweep == nil || len(r.Sweep.Points) != 3 {
		t.Fatalf("sweep: %+v", r.Sweep)
	}
	wrapped := false
	for _, pt := range r.Sweep.Points {
		one := mustRun(t, strings.Replace(wall, "THICK", pt.Text, 1)).Periodic[0]
		if got := pt.Quantities["time_shift_h"]; got != one.TimeShift_h || got < 0 || got >= 24 {
			t.Errorf("%s: study time_shift_h %g, periodic[].time_shift_h %g (want equal, in [0, 24))", pt.Text, got, one.TimeShift_h)
		}
		if got := pt.Quantities["time_shift_unwrapped_h"]; got != one.TimeShiftUnwrapped_h {
			t.Errorf("%s: study time_shift_unwrapped_h %g, periodic[] %g", pt.Text, got, one.TimeShiftUnwrapped_h)
		}
		if one.TimeShiftUnwrapped_h > 24 {
			wrapped = true
		}
	}
	if !wrapped {
		t.Error("no sweep point has a lag above 24 h: the check of the wrap did not happen")
	}
}

// TestTargetOnToleranceGrid: the value a target returns is given to its
// tolerance: a multiple of the largest 1-2-5 step not above it (0.3 mm ->
// 0.2 mm; 3 mm -> 2 mm), meeting the goal while the grid point one step
// back does not, for the smallest and the largest value (the wall's
// whole time shift grows with the concrete thickness; ISO 13786 exact
// solution decides).
func TestTargetOnToleranceGrid(t *testing.T) {
	for _, c := range []struct {
		tol, step float64
		prefer    string
		goal      string
	}{
		{0.3, 0.2, "smallest", "at_least: 10"},
		{3, 2, "smallest", "at_least: 10"},
		{0.3, 0.2, "largest", "at_most: 10"},
	} {
		r := mustRun(t, studyWall+fmt.Sprintf(`
target:
  parameter: layers[3].thickness
  from: 20 mm
  to: 400 mm
  quantity: time_shift_unwrapped_h
  %s
  prefer: %s
  tolerance: %g
`, c.goal, c.prefer, c.tol))
		tg := r.Target
		if tg == nil || !tg.Met {
			t.Fatalf("%+v: not met: %+v", c, tg)
		}
		k := tg.Value / c.step
		if math.Abs(k-math.Round(k)) > 1e-9 || tg.Tolerance != c.tol {
			t.Errorf("%+v: value %v is not a multiple of %g (tolerance %g)", c, tg.Value, c.step, tg.Tolerance)
		}
		back := tg.Value - c.step
		if c.prefer == "largest" {
			back = tg.Value + c.step
		}
		q := func(mm float64) float64 {
			rr := mustRun(t, strings.Replace(studyWall, "{material: concrete, thickness: 180 mm}",
				fmt.Sprintf("{material: concrete, thickness: %g mm}", mm), 1))
			return rr.Periodic[0].TimeShiftUnwrapped_h
		}
		meets := func(v float64) bool { return (v >= 10) == tg.AtLeast }
		if at, b := q(tg.Value), q(back); !meets(at) || meets(b) {
			t.Errorf("%+v: %v mm gives %.4f h, one step back (%v mm) %.4f h", c, tg.Value, at, back, b)
		}
		if want := strconv.FormatFloat(tg.Value, 'f', -1, 64) + " mm"; !strings.Contains(tg.Message, want) {
			t.Errorf("%+v: message %q does not give the value as %q", c, tg.Message, want)
		}
		// The quantity with its own digits (one decimal for a time shift).
		if want := "time_shift_unwrapped_h = " + strconv.FormatFloat(tg.Achieved, 'f', 1, 64) + ", margin"; !strings.Contains(tg.Message, want) {
			t.Errorf("%+v: message %q does not give the quantity as %q", c, tg.Message, want)
		}
	}
}

// TestStudyUnits: a study's parameter written as a bare number is in the
// default unit of its key (README, "Scenario file"), and the results say
// which; a quantity's spread carries the unit its key spells.
func TestStudyUnits(t *testing.T) {
	for _, c := range []struct{ path, given, want string }{
		{"layers[2].thickness", "", "m"},
		{"layers[2].thickness", "mm", "mm"},
		{"layers[1].conductivity", "", "W/(m K)"},
		{"layers[1].soil.water_content", "", ""},
		{"outside.temperature.mean", "", "°C"},
		{"outside.temperature.daily.amplitude", "", "K"},
		{"outside.solar.irradiance.mean", "", "W/m2"},
		{"layers[1].density", "", "kg/m3"},
	} {
		if got := parameterUnit(c.path, c.given); got != c.want {
			t.Errorf("parameterUnit(%q, %q) = %q, want %q", c.path, c.given, got, c.want)
		}
	}
	r := mustRun(t, studyWall+`
uncertainty:
  samples: 10
  vary:
    - parameter: layers[3].conductivity
      normal: {mean: 2.0, sd: 0.1}
`)
	p := r.Uncertainty.Parameters[0]
	if p.Unit != "W/(m K)" || !strings.Contains(p.ParameterLabel, "conductivity of layer 3") {
		t.Errorf("uncertain parameter %+v: want unit W/(m K) and a label in words", p)
	}
	for _, q := range r.Uncertainty.Quantities {
		want := map[string]string{"u_value_W_m2K": "W/(m2 K)", "time_shift_h": "h", "decrement_factor": ""}
		if w, ok := want[q.Quantity]; ok && q.Unit != w {
			t.Errorf("spread of %s has unit %q, want %q", q.Quantity, q.Unit, w)
		}
	}
}
