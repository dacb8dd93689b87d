package charts

import (
	stdhtml "html"
	"regexp"
	"strings"
	"testing"

	"tempstack/scenarios/results"
)

// tableRows returns the rows of the table with the given caption as cell
// texts (HTML entities decoded).
func tableRows(t *testing.T, page, caption string) [][]string {
	t.Helper()
	i := strings.Index(page, "<caption>"+caption)
	if i < 0 {
		t.Fatalf("no table %q", caption)
	}
	end := strings.Index(page[i:], "</table>")
	body := page[i : i+end]
	var rows [][]string
	for _, tr := range regexp.MustCompile(`(?s)<tr>(.*?)</tr>`).FindAllStringSubmatch(body, -1) {
		var cells []string
		for _, td := range regexp.MustCompile(`(?s)<t[dh][^>]*>(.*?)</t[dh]>`).FindAllStringSubmatch(tr[1], -1) {
			cells = append(cells, stdhtml.UnescapeString(td[1]))
		}
		rows = append(rows, cells)
	}
	return rows
}

// row returns the first row whose first cell starts with key.
func rowOf(t *testing.T, rows [][]string, key string) []string {
	t.Helper()
	for _, r := range rows {
		if len(r) > 0 && strings.HasPrefix(r[0], key) {
			return r
		}
	}
	t.Fatalf("no row %q in %q", key, rows)
	return nil
}

func TestGroundSections(t *testing.T) {
	r := groundFixture()
	page := render(t, r, Options{})

	// Three frost depths side by side, each with the index it used.
	three := tableRows(t, page, "Frost depth, three ways")
	if got := rowOf(t, three, "Simulation"); got[1] != "0.82" || !strings.Contains(got[2], "winter 2 (year 2, 10 Feb)") {
		t.Errorf("simulated row %q", got)
	}
	if got := rowOf(t, three, "Stefan"); got[1] != "1.21" || !strings.Contains(got[2], "294 °C·d") || !strings.Contains(got[2], "0.7 × air index") {
		t.Errorf("Stefan row %q", got)
	}
	if got := rowOf(t, three, "Modified Berggren"); got[1] != "1.02" || !strings.Contains(got[2], "λ = 0.840") {
		t.Errorf("Berggren row %q", got)
	}

	// Per winter: partial winters marked, frozen days per probe.
	w := tableRows(t, page, "Simulated frost, winter by winter")
	if h := strings.Join(w[0], "|"); !strings.Contains(h, "Frozen days at 0.50 m|Frozen days at 2.00 m") {
		t.Errorf("winter table head %q", h)
	}
	if got := rowOf(t, w, "Winter 1"); got[0] != "Winter 1 (partial)" || got[4] != "0.71" || got[5] != "year 1, 10 Feb" || got[8] != "41" {
		t.Errorf("winter 1 row %q", got)
	}
	if got := rowOf(t, w, "Winter 2"); got[0] != "Winter 2" || got[2] != "420" || got[3] != "2100" || got[9] != "0" {
		t.Errorf("winter 2 row %q", got)
	}

	// Exact periodic ground temperature: amplitude and lag per probe,
	// the annual lag in days, a dead swing without a lag.
	yr := tableRows(t, page, "Period 1 year: surface swing ±11.0 K, below 0.1 K from 10.40 m down")
	if got := rowOf(t, yr, "2.00"); got[1] != "5.0" || got[2] != "45.8" || got[3] != "1.3 °C" || got[5] != "11.3 °C" {
		t.Errorf("annual row at 2 m %q", got)
	}
	day := tableRows(t, page, "Period 24 h")
	if got := rowOf(t, day, "2.00"); got[1] != "< 0.001" || got[2] != dash {
		t.Errorf("daily row at 2 m %q", got)
	}
	gs := tableRows(t, page, "Ground temperature, exact periodic solution")
	if got := rowOf(t, gs, "Column deep enough"); !strings.HasPrefix(got[1], "NO") {
		t.Errorf("domain row %q", got)
	}
	if !strings.Contains(page, "The 3.0 m column is shallower than the depth the annual swing reaches (10.4 m)") {
		t.Error("summary does not say the column is too shallow")
	}

	// Assumptions and inputs, from the results alone.
	in := tableRows(t, page, "Assumptions and inputs of this run")
	for key, want := range map[string]string{
		"Bottom of the column":           "geothermal heat flux 65 mW/m² upward",
		"n-factors of the surface cover": "0.7 and 1.1",
		"Spin-up before recording":       "3 cycles; the last changed the temperatures by at most 0.0040 K",
		"Time step":                      "1 h",
		"Output interval":                "2 h",
		"Periods of the exact periodic":  "1 year, 24 h",
		"Probe depths below the surface": "0.50 m, 2.00 m",
		"Mean annual air temperature":    "6.0 °C",
		"Ground surface temperature":     "mean 6.2 °C, annual swing ±11.0 K (n-factors applied)",
		"Finite-volume cells":            "120",
		"Simulated duration":             "17520 h (730.0 d)",
		"Surface resistance":             "0.04 m²·K/W",
		"Depth of the column":            "3.00 m",
	} {
		if got := rowOf(t, in, key); got[1] != want {
			t.Errorf("inputs %q = %q, want %q", key, got[1], want)
		}
	}

	// A spin-up whose last cycle is the simulation's own first cycle says
	// so, under a label that does not claim it ran before recording.
	yes, coarse := true, 5
	r.Simulation.SpinUpLastCycleSimulated, r.Simulation.SpinUpCoarseCycles = &yes, &coarse
	in = tableRows(t, render(t, r, Options{}), "Assumptions and inputs of this run")
	if got, want := rowOf(t, in, "Spin-up")[1], "5 coarse cycles, then 3 cycles at the simulation's step, the last of them the simulation's own first cycle, which changed the temperatures by at most 0.0040 K"; !strings.HasPrefix(got, want) {
		t.Errorf("spin-up row %q, want it to start %q", got, want)
	}
	r.Simulation.SpinUpLastCycleSimulated, r.Simulation.SpinUpCoarseCycles = nil, nil

	// A design index: used by the closed forms, shown beside the forcing's.
	// As scenarios fills it: the headline index is the design index, the
	// forcing's own index stays beside it.
	d, forcing := 600.0, *r.Frost.FreezingIndex_Cd
	r.Frost.DesignFreezingIndex_Cd, r.Frost.IndexSource = &d, results.IndexSource{Origin: results.FromDesign}
	r.Frost.FreezingIndex_Cd, r.Frost.SurfaceFreezingIndex_Cd, r.Frost.ForcingFreezingIndex_Cd = ptr(d), ptr(0.7*d), &forcing
	page = render(t, r, Options{})
	fi := tableRows(t, page, "Freezing index and frost climate")
	if got := rowOf(t, fi, "Design air freezing index"); got[1] != "600 °C·d" {
		t.Errorf("design air index %q, want 600 °C·d", got)
	}
	if got := rowOf(t, fi, "Surface freezing index"); got[1] != "420 °C·d" {
		t.Errorf("design surface index %q, want 0.7 × 600 = 420 °C·d", got)
	}
	if got := rowOf(t, fi, "Air freezing index of the forcing"); got[1] != cd(forcing) {
		t.Errorf("forcing's index %q, want %s", got, cd(forcing))
	}
	if got := rowOf(t, fi, "Index used by Stefan"); got[1] != "420 °C·d (from the design air index)" {
		t.Errorf("index used %q", got)
	}
	if got := rowOf(t, tableRows(t, page, "Assumptions and inputs of this run"), "Design air freezing index"); !strings.HasPrefix(got[1], "600 °C·d") {
		t.Errorf("design index input %q", got)
	}
	if !strings.Contains(page, "The closed forms use the design air freezing index of 600 °C·d.") {
		t.Error("summary does not name the design index")
	}
}

func TestWallInputs(t *testing.T) {
	r := wallFixture()
	page := render(t, r, Options{})
	in := tableRows(t, page, "Assumptions and inputs of this run")
	// The fixture's outside air is 12 ± 8 °C sampled at both ends of the
	// cycle: the trapezoidal mean of a whole cosine period is exactly 12.
	for key, want := range map[string]string{
		"Component":                                           "wall",
		"Outside surface resistance Rse":                      "0.04 m²·K/W",
		"Inside surface resistance Rsi":                       "0.13 m²·K/W",
		"Outside environment temperature over the 24 h cycle": "4.0 °C to 20.0 °C (mean 12.0 °C)",
		"Inside environment temperature":                      "constant 20.0 °C",
		"Surface heat uptake after a step":                    "the outside surface temperature steps by 10.0 K, followed for 27.8 h",
		"Spin-up before recording":                            "none",
		"Probe positions from the outside surface":            "50 mm, 200 mm",
		"Periods of the exact periodic analysis":              "24 h, 7 d",
	} {
		if got := rowOf(t, in, key); got[1] != want {
			t.Errorf("inputs %q = %q, want %q", key, got[1], want)
		}
	}
	// Sources are numbered once under the layer table.
	layersT := tableRows(t, page, "Layers, outside first")
	if got := rowOf(t, layersT, "2"); got[9] != "[1]" {
		t.Errorf("second layer source cell %q, want [1] (same source as the first)", got[9])
	}
	if !strings.Contains(page, "[1] invented for tests") {
		t.Error("numbered source not listed")
	}
	// Warnings are counted in the heading of their box, before the summary.
	box := strings.Index(page, "One warning from the run")
	sum := strings.Index(page, `class="summary"`)
	if box < 0 || sum < 0 || box > sum {
		t.Errorf("warning box at %d, summary at %d: want the warning first", box, sum)
	}
	r.Warnings = append(r.Warnings, "second")
	if page := render(t, r, Options{}); !strings.Contains(page, "2 warnings from the run") {
		t.Error("two warnings not counted")
	}
	r.Warnings = nil
	if page := render(t, r, Options{}); strings.Contains(page, "warnings from the run") || strings.Contains(page, "warning from the run") {
		t.Error("warning box without warnings")
	}
}

// With no surface resistance the simulated surface environment equals
// the surface temperature: one line, named for both.
func TestSurfaceEnvironmentMerged(t *testing.T) {
	r := groundFixture()
	r.Series.Simulation.OutsideAir_C = append([]float64(nil), r.Series.Simulation.OutsideSurface_C...)
	charts, _ := chartData(t, render(t, r, Options{}))
	var names []string
	for _, s := range charts[idSimTemp]["series"].([]any) {
		names = append(names, s.(map[string]any)["name"].(string))
	}
	got := strings.Join(names, "|")
	if strings.Contains(got, "Surface environment|") || !strings.Contains(got, "Ground surface (= surface environment)") {
		t.Errorf("series %q: want the surface line alone, named for both", got)
	}
	// Different series stay two lines.
	charts, _ = chartData(t, render(t, groundFixture(), Options{}))
	if n := len(charts[idSimTemp]["series"].([]any)); n != 5 {
		t.Errorf("%d series in the simulated temperatures, want 5", n)
	}
}

func TestFrostSummary(t *testing.T) {
	f := groundFixture().Frost
	for _, tc := range []struct {
		name string
		edit func(f *results.Frost)
		sim  bool
		want []string
	}{
		{"frost", func(*results.Frost) {}, true, []string{"reaches 0.82 m below the surface at its deepest (winter 2, year 2, 10 Feb, of 1 complete and settled winters)",
			"air freezing index of 420 °C·d", "surface freezing index of 294 °C·d (n-factor 0.7 × air index of the forcing)", "Stefan estimate is 1.21 m"}},
		{"no simulation", func(*results.Frost) {}, false, []string{"No transient simulation was run"}},
		{"no frost", func(f *results.Frost) {
			f.MaxFrostDepth_m, f.StefanDepth_m, f.ModifiedBerggrenDepth_m, f.Winters = ptr(0), nil, nil, nil
			f.NotComputed = map[string]string{"stefan_depth_m": "the surface temperature never falls below 0 degC"}
		}, true, []string{"does not freeze", "no Stefan or modified Berggren estimate (not computed: the surface temperature never falls below 0 degC)"}},
		{"unsettled", func(f *results.Frost) {
			f.MaxFrostDepth_m, f.HeadlineWinter = nil, ""
			f.NotComputed = map[string]string{"max_frost_depth_m": "no simulated winter had settled"}
		}, true, []string{"no headline simulated frost depth (not computed: no simulated winter had settled)", "Stefan estimate is 1.21 m"}},
	} {
		g := *f
		tc.edit(&g)
		got := frostSummary(&g, tc.sim)
		for _, w := range tc.want {
			if !strings.Contains(got, w) {
				t.Errorf("%s: summary %q lacks %q", tc.name, got, w)
			}
		}
	}
}
