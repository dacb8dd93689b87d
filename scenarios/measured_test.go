package scenarios

import (
	"context"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"tempstack/climate"
	"tempstack/scenarios/results"
)

// TestMeasuredSeriesMatchesHarmonic writes a harmonic climate as an hourly
// CSV record (synthetic data) and runs the same ground column once from the
// record and once from the harmonics: the frost depth of each complete
// winter must agree within 1 % (the record is the harmonic itself, so the
// two runs differ only by the linear interpolation of hourly values).
func TestMeasuredSeriesMatchesHarmonic(t *testing.T) {
	dir := t.TempDir()
	air := climate.Periodic{Mean: 1, Harmonics: []climate.Harmonic{
		{Period: climate.Year, Amplitude: 14, Peak: 199.5 * climate.Day},
		{Period: climate.Day, Amplitude: 3, Peak: 15 * 3600},
	}}
	// 1 July 2017 to 1 July 2019: no leap day, so the record's axis (s
	// since 1 January 2017) and the 365-day years of the harmonics agree.
	origin := time.Date(2017, 1, 1, 0, 0, 0, 0, time.UTC)
	var b strings.Builder
	b.WriteString("# synthetic record: the harmonics of TestMeasuredSeriesMatchesHarmonic\ntime,air_C\n")
	start := 181 * climate.Day
	end := start + 2*climate.Year
	for ts := start; ts <= end; ts += 3600 {
		stamp := origin.Add(time.Duration(ts) * time.Second)
		fmt.Fprintf(&b, "%s,%.6f\n", stamp.Format("2006-01-02T15:04"), air.At(ts))
	}
	if err := os.WriteFile(filepath.Join(dir, "air.csv"), []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	column := `
layers:
  - soil: {texture: silt-clay, dry_density: 1600, water_content: 0.20}
    thickness: 12 m
bottom:
  heat_flux: 0.065
`
	measured := `title: from the record
kind: ground` + column + `
surface:
  temperature: {file: air.csv, column: air_C}
analysis:
  simulate: {step: 1h}
`
	harmonic := fmt.Sprintf(`title: from the harmonics
kind: ground`+column+`
surface:
  temperature:
    mean: 1
    annual: {amplitude: 14, peak_day: 200}
    daily: {amplitude: 3, peak_hour: 15}
analysis:
  simulate: {start: 181d, duration: %gh, step: 1h}
`, 2*climate.Year/3600)
	file := filepath.Join(dir, "m.yaml")
	os.WriteFile(file, []byte(measured), 0o644)
	sm, err := Load(file)
	if err != nil {
		t.Fatal(err)
	}
	rm, err := Run(context.Background(), sm, Options{})
	if err != nil {
		t.Fatal(err)
	}
	rh := mustRun(t, harmonic)
	wm, wh := completeWinters(rm), completeWinters(rh)
	if len(wm) != 2 || len(wh) != 2 {
		t.Fatalf("complete winters: record %d, harmonics %d", len(wm), len(wh))
	}
	for i := range wm {
		a, h := wm[i].MaxFrostDepth_m, wh[i].MaxFrostDepth_m
		t.Logf("winter %d: record %.4f m, harmonics %.4f m (%.3f %%); air index %.1f and %.1f degC day",
			i+1, a, h, 100*(a/h-1), wm[i].AirFreezingIndex_Cd, wh[i].AirFreezingIndex_Cd)
		if h <= 0 || math.Abs(a/h-1) > 0.01 {
			t.Errorf("winter %d: frost depth from the record %.4f m, from the harmonics %.4f m", i+1, a, h)
		}
		if math.Abs(wm[i].AirFreezingIndex_Cd/wh[i].AirFreezingIndex_Cd-1) > 0.01 {
			t.Errorf("winter %d: air freezing index %.1f vs %.1f", i+1, wm[i].AirFreezingIndex_Cd, wh[i].AirFreezingIndex_Cd)
		}
	}
}

func completeWinters(r *results.Results) []results.FrostWinter {
	var out []results.FrostWinter
	for _, w := range r.Frost.Winters {
		if w.Complete {
			out = append(out, w)
		}
	}
	return out
}

// TestSolAirShiftsTheMean: a constant irradiance I on a surface of
// absorptance a behind Rse raises the environment by a I Rse (sol-air
// temperature T_sa = T_air + a I / h_e, h_e = 1/Rse; CIBSE Guide A /
// ASHRAE Fundamentals [memory], as implemented by climate.SolAir). A wall
// in the sun must then match the same wall in air warmer by that much.
func TestSolAirShiftsTheMean(t *testing.T) {
	wall := `
kind: wall
layers:
  - {material: concrete, thickness: 150 mm}
inside:
  temperature: {mean: 20}
analysis:
  simulate: {duration: 2d, step: 30min}
  probes: [0.075]
`
	sunny := mustRun(t, "title: sun"+wall+`
outside:
  resistance: 0.04
  temperature: {mean: 10, daily: {amplitude: 5, peak_hour: 15}}
  solar: {absorptance: 0.5, irradiance: {mean: 300}, sky_correction: 0}
`)
	warm := mustRun(t, "title: warm"+wall+`
outside:
  resistance: 0.04
  temperature: {mean: 16, daily: {amplitude: 5, peak_hour: 15}}
`)
	a, b := sunny.Simulation.Probes[0], warm.Simulation.Probes[0]
	if math.Abs(a.Mean_C-b.Mean_C) > 1e-6 || math.Abs(a.Max_C-b.Max_C) > 1e-6 || math.Abs(a.Min_C-b.Min_C) > 1e-6 {
		t.Errorf("sunny probe %+v, warm probe %+v", a, b)
	}
}

// TestWallFromRecordListsBridgedGaps: a wall driven by a short hourly
// record with a hole of three hours runs over the record's span, and the
// results list the bridged hole (synthetic data).
func TestWallFromRecordListsBridgedGaps(t *testing.T) {
	dir := t.TempDir()
	var b strings.Builder
	b.WriteString("time;air\n")
	origin := time.Date(2023, 6, 1, 0, 0, 0, 0, time.UTC)
	for h := 0; h <= 10*24; h++ {
		if h >= 50 && h < 53 {
			continue // a three-hour hole, bridged (the limit is 6 h)
		}
		v := 18 + 7*math.Cos(2*math.Pi*float64(h-15)/24)
		fmt.Fprintf(&b, "%s;%s\n", origin.Add(time.Duration(h)*time.Hour).Format("2006-01-02 15:04"), strings.Replace(fmt.Sprintf("%.2f", v), ".", ",", 1))
	}
	os.WriteFile(filepath.Join(dir, "air.csv"), []byte(b.String()), 0o644)
	os.WriteFile(filepath.Join(dir, "w.yaml"), []byte(`title: wall from a record
kind: wall
layers:
  - {material: concrete, thickness: 200 mm}
outside:
  temperature: {file: air.csv, column: air, decimal: ",", separator: ";"}
analysis:
  simulate: {step: 30min}
  probes: [0.1]
`), 0o644)
	s, err := Load(filepath.Join(dir, "w.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	r, err := Run(context.Background(), s, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if got := r.Simulation.Duration_h; math.Abs(got-240) > 1e-9 {
		t.Errorf("simulated %g h, the record spans 240 h", got)
	}
	if len(r.Records) != 1 || len(r.Records[0].Bridged) != 1 || r.Records[0].Rows != 238 {
		t.Fatalf("records: %+v", r.Records)
	}
	// The fitted daily harmonic of the record is the one that made it.
	if rec := r.Records[0]; math.Abs(rec.FitDailyAmp-7) > 0.01 || math.Abs(rec.FitMean-18) > 0.01 {
		t.Errorf("fit: mean %.3f, daily amplitude %.3f", rec.FitMean, rec.FitDailyAmp)
	}
	if r.Simulation.PeriodicCheck != nil {
		t.Errorf("a measured forcing must not claim a periodic check")
	}
}
