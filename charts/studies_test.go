package charts

import (
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"tempstack/scenarios/results"
)

// studyFixture is the invented test wall with invented study results:
// two options, a sweep, a target search, an uncertainty run and a fit.
func studyFixture() *results.Results {
	r := wallFixture()
	thin := append([]results.Layer(nil), r.Layers...)
	thin[1].Thickness_m = 0.05 // half the insulation: 50 mm thinner in total
	r.Variants = []results.VariantResult{
		{Name: "base", Layers: r.Layers, Quantities: results.Summary{"u_value_W_m2K": 0.303, "decrement_factor": 0.214, "time_shift_h": 9.4}},
		{Name: "thin insulation", Changes: []string{"layers[2].thickness = 50 mm"}, Layers: thin,
			Quantities: results.Summary{"u_value_W_m2K": 0.52, "decrement_factor": 0.25, "time_shift_h": 8.96, "custom_quantity": 1.5}},
	}
	r.Sweep = &results.SweepResult{Parameter: "layers[2].thickness", ParameterLabel: "thickness of layer 2 (mineral wool)", Unit: "mm", Points: []results.SweepPoint{
		{Value: 50, Text: "50 mm", Quantities: results.Summary{"u_value_W_m2K": 0.52}},
		{Value: 100, Text: "100 mm", Quantities: results.Summary{"u_value_W_m2K": 0.303}},
	}}
	r.Target = &results.TargetResult{Parameter: "layers[3].thickness", ParameterLabel: "thickness of layer 3 (concrete)", Unit: "mm", Tolerance: 0.5,
		Quantity: "time_shift_h", Goal: 10, AtLeast: true,
		From: 100, To: 300, Met: true, Value: 142.5, Achieved: 10.02, Margin: 0.02, Evaluations: 12,
		Scan: []results.TargetPoint{{Value: 100, Quantity: 9.4}, {Value: 200, Quantity: 12.1, Meets: true}}}
	r.Uncertainty = &results.UncertaintyResult{Samples: 200, Seed: 7, Rejected: 1, FirstRejection: "layers[1].conductivity must be positive",
		Parameters: []results.UncertainParameter{{Parameter: "layers[2].conductivity", Distribution: "normal", A: 0.035, B: 0.003, Unit: "W/(m K)"}},
		Quantities: []results.Spread{{Quantity: "u_value_W_m2K", N: 199, Mean: 0.305, SD: 0.021, Min: 0.25, P5: 0.27, P50: 0.304, P95: 0.34, Max: 0.37}}}
	return r
}

func TestStudySections(t *testing.T) {
	r := studyFixture()
	page := render(t, r, Options{})
	opt := tableRows(t, page, "Options compared")
	if h := strings.Join(opt[0], "|"); h != "Option|Layers, outside first|U-value (W/(m²·K))|Decrement factor f|Time shift (h)|custom_quantity" {
		t.Errorf("options head %q", h)
	}
	if got := rowOf(t, opt, "thin insulation"); got[2] != "0.520" || got[4] != "9.0" || got[5] != "1.500" ||
		!strings.HasPrefix(got[1], "105 mm facing brick · 50 mm mineral wool") {
		t.Errorf("option row %q", got)
	}
	if got := rowOf(t, opt, "base"); got[5] != dash {
		t.Errorf("a quantity the base lacks shows %q, want a dash", got[5])
	}
	sw := tableRows(t, page, "Sweep of the thickness of layer 2 (mineral wool)")
	if h := sw[0][0]; h != "Thickness of layer 2 (mineral wool) (mm)" {
		t.Errorf("sweep heading %q: want the parameter in words with its unit", h)
	}
	if got := rowOf(t, sw, "50 mm"); got[1] != "0.520" {
		t.Errorf("sweep row %q", got)
	}
	if !strings.Contains(page, "Target met: Thickness of layer 3 (concrete) at 142.5 mm gives time shift = 10.0 h (goal: at least 10.0 h; margin 0.020 h; found to 0.5 mm). 12 runs.") {
		t.Error("target sentence missing or wrong")
	}
	scan := tableRows(t, page, "Target search: scan of the thickness of layer 3 (concrete)")
	if got := rowOf(t, scan, "200"); got[2] != "yes" {
		t.Errorf("scan row %q", got)
	}
	r.Target.Met = false
	if !strings.Contains(render(t, r, Options{}), "Target not met between 100 mm and 300 mm: the closest, thickness of layer 3 (concrete) at 142.5 mm") {
		t.Error("unmet target not reported")
	}
	// The closest value of an unmet target is printed on the tolerance's
	// grid (99.87 mm on a 0.2 mm grid is 99.8 mm, rounded by hand), the
	// quantity with its own digits (one decimal for a time shift).
	r.Target.Value, r.Target.Tolerance, r.Target.Achieved = 99.87, 0.2, 6.0834
	if want := "the closest, thickness of layer 3 (concrete) at 99.8 mm, gives time shift = 6.1 h (goal: at least 10.0 h)."; !strings.Contains(render(t, r, Options{}), want) {
		t.Errorf("unmet target: report lacks %q", want)
	}
	spread := tableRows(t, page, "Spread of the results")
	if got := rowOf(t, spread, "U-value"); strings.Join(got[1:], "|") != "199|0.305|0.021|0.270|0.304|0.340|0.250|0.370" {
		t.Errorf("spread row %q", got)
	}
	if !strings.Contains(page, "1 samples were rejected as impossible inputs; the first: layers[1].conductivity must be positive") {
		t.Error("rejected samples not reported")
	}
}

// The options are drawn to one common scale: each strip's drawn length
// is proportional to the option's total thickness.
func TestVariantsFigureScale(t *testing.T) {
	r := studyFixture()
	f := variantsFigure(r)
	if f == nil {
		t.Fatal("no options figure")
	}
	svg := string(f.SVG)
	re := regexp.MustCompile(`<rect x="([-0-9.]+)" y="([-0-9.]+)" width="([0-9.]+)" height="[0-9.]+"[^>]*><title>`)
	rows := map[string]float64{} // y -> drawn length
	for _, m := range re.FindAllStringSubmatch(svg, -1) {
		w, _ := strconv.ParseFloat(m[3], 64)
		rows[m[2]] += w
	}
	if len(rows) != 2 {
		t.Fatalf("%d strips, want 2", len(rows))
	}
	var lens []float64
	for _, v := range rows {
		lens = append(lens, v)
	}
	ratio := math.Min(lens[0], lens[1]) / math.Max(lens[0], lens[1])
	if want := 0.27 / 0.32; math.Abs(ratio-want) > 0.003 {
		t.Errorf("strip length ratio %.4f, want %.4f (270 mm against 320 mm)", ratio, want)
	}
	if !strings.Contains(svg, ">U 0.520 · f 0.250 · shift 9.0 h<") {
		t.Error("headline values missing beside the strip")
	}
	// Hostile option names stay text.
	r.Variants[1].Name = `</text><script>alert(1)</script>`
	svg = string(variantsFigure(r).SVG)
	if strings.Contains(svg, "<script") || !strings.Contains(svg, "&lt;/text&gt;&lt;script&gt;") {
		t.Error("option name not escaped in the drawing")
	}
	// Its pattern ids differ from the cross-section's.
	if strings.Contains(svg, `id="ts-fam-`) || !strings.Contains(svg, `id="ts-opt-`) {
		t.Error("options drawing reuses the cross-section's pattern ids")
	}
}

func TestRecordAndReturnPeriod(t *testing.T) {
	r := groundFixture()
	r.Frost.IndexSource = results.IndexSource{Origin: results.FromRecord, Coldest: 3, Winters: 10}
	r.Frost.ReturnPeriod = &results.ReturnPeriodIndex{Winters: 10, Method: "Gumbel, method of moments", Location_Cd: 1190, Scale_Cd: 209, Years: 100, FreezingIndex_Cd: 2151}
	r.Frost.Winters[1].StefanDepth_m, r.Frost.Winters[1].ModifiedBerggrenDepth_m = 1.3, 1.1
	r.Records = []results.RecordInfo{{Use: "surface air temperature", File: "station.csv", Columns: []string{"air"}, Rows: 8761,
		First: "2020-07-01T00:00:00Z", Last: "2021-07-01T00:00:00Z", Step_h: 1, FitMean: 1.52, FitAnnualAmp: 13.4, FitAnnualPeak: 201, FitDailyAmp: 3.5, FitDailyPeak: 15,
		Bridged: []results.BridgedGap{{Column: "air", Line: 120, From: "2020-07-05T23:00:00Z", To: "2020-07-06T02:00:00Z", Filled: 2}}}}
	page := render(t, r, Options{})
	fi := tableRows(t, page, "Freezing index and frost climate")
	if got := rowOf(t, fi, "Air freezing index of the record (mean of the 3 coldest of 10 complete winters)"); got[1] != "420 °C·d" {
		t.Errorf("record index row %q", got)
	}
	if got := rowOf(t, fi, "Air freezing index with a 100-year return period"); !strings.HasPrefix(got[1], "2151 °C·d (Gumbel, method of moments fitted to 10 complete winters") {
		t.Errorf("return period row %q", got)
	}
	w := tableRows(t, page, "Simulated frost, winter by winter")
	if got := rowOf(t, w, "Winter 2"); got[8] != "1.30" || got[9] != "1.10" {
		t.Errorf("per-winter closed forms %q", got)
	}
	if got := rowOf(t, w, "Winter 1"); got[8] != dash {
		t.Errorf("a winter without closed forms shows %q, want a dash", got[8])
	}
	in := tableRows(t, page, "Assumptions and inputs of this run")
	if got := rowOf(t, in, "Measured surface air temperature"); !strings.Contains(got[1], "station.csv (column air): 8761 rows from 2020-07-01T00:00:00Z to 2021-07-01T00:00:00Z, every 1 h; 1 gaps bridged") {
		t.Errorf("record row %q", got)
	}
	gaps := tableRows(t, page, "Gaps bridged in the measured series")
	if got := rowOf(t, gaps, "station.csv"); got[2] != "120" || got[5] != "2" {
		t.Errorf("gap row %q", got)
	}
	three := tableRows(t, page, "Frost depth, three ways")
	if got := rowOf(t, three, "Stefan"); !strings.Contains(got[2], "air index of the record, mean of the 3 coldest of 10 complete winters") {
		t.Errorf("Stefan driver %q", got)
	}
}
