package charts

import (
	"strings"
	"testing"

	"tempstack/scenarios/results"
)

// TestGroundReportReadsRight: the exact periodic tables of a freezing
// column say they ignore latent heat and set the simulated range beside
// the exact one; a period the forcing does not drive gets no table (no
// "swing ±0.0 K" section); the methods list no wall-only text.
func TestGroundReportReadsRight(t *testing.T) {
	r := groundFixture()
	page := render(t, r, Options{})
	rows := tableRows(t, page, "Period 1 year: surface swing ±11.0 K")
	if h := strings.Join(rows[0], "|"); !strings.HasSuffix(h, "|Simulated lowest|Simulated highest") {
		t.Errorf("annual table head %q: want the simulated range beside", h)
	}
	if got := rowOf(t, rows, "0.50"); got[6] != "−3.1 °C" && got[6] != "-3.1 °C" {
		t.Errorf("row at 0.5 m %q: want the simulated lowest −3.1 °C", got)
	}
	if !strings.Contains(page, "(exact, without latent heat)") || !strings.Contains(page, "These exact periodic values ignore latent heat") {
		t.Error("a freezing column's exact tables do not say that they ignore latent heat")
	}
	// The daily table has its own swing (3 K); the simulated range goes
	// only beside the longest period.
	daily := tableRows(t, page, "Period 24 h: surface swing ±3.0 K")
	if len(daily[0]) != 6 {
		t.Errorf("daily table head %q", daily[0])
	}

	// No daily forcing: no daily table, one sentence instead.
	r.Ground.Periodic[1].SurfaceAmplitude_K = 0
	page = render(t, r, Options{})
	if strings.Contains(page, "<caption>Period 24 h") {
		t.Error("a table for the 24 h period although the forcing has no daily swing")
	}
	if !strings.Contains(page, "No exact periodic table for the period of 24 h: the surface forcing has no swing at that period.") {
		t.Error("the missing daily table is not explained")
	}
	methods := page[strings.Index(page, `<ul class="methods">`):]
	methods = methods[:strings.Index(methods, "</ul>")]
	for _, wallOnly := range []string{"Decrement factor", "Y₁₂", "admittance", "Surface factor", "Rsi"} {
		if strings.Contains(methods, wallOnly) {
			t.Errorf("the methods of a ground run mention %q", wallOnly)
		}
	}

	// Without freezing layers nothing is said about latent heat.
	for i := range r.Layers {
		r.Layers[i].Freezing = false
	}
	if page := render(t, r, Options{}); strings.Contains(page, "without latent heat") {
		t.Error("a column that does not freeze is said to ignore latent heat")
	}
}

// TestTitleBlock: the optional title-block words appear in the report's
// header, escaped, and nothing is added when they are absent.
func TestTitleBlock(t *testing.T) {
	r := wallFixture()
	plain := render(t, r, Options{})
	if strings.Contains(plain, "<dt>Project</dt>") || strings.Contains(plain, "<dt>Revision</dt>") {
		t.Error("title-block rows without title-block words")
	}
	r.TitleBlock = results.TitleBlock{Project: "Mill Lane <b>2</b>", Client: "A & B", PreparedBy: "J. Engineer", Revision: "C"}
	page := render(t, r, Options{})
	for _, want := range []string{
		"<dt>Project</dt><dd>Mill Lane &lt;b&gt;2&lt;/b&gt;</dd>",
		"<dt>Client</dt><dd>A &amp; B</dd>",
		"<dt>Prepared by</dt><dd>J. Engineer</dd>",
		"<dt>Revision</dt><dd>C</dd>",
	} {
		if !strings.Contains(page, want) {
			t.Errorf("header lacks %q", want)
		}
	}
}

// TestSurfaceFactorTable: a wall report lists the surface factor and its
// lag per period in a table of its own, naming the Rsi used; a ground
// report has none.
func TestSurfaceFactorTable(t *testing.T) {
	r := wallFixture()
	for i := range r.Periodic {
		r.Periodic[i].SurfaceFactor, r.Periodic[i].SurfaceFactorLag_h = 0.48355, 1.611
	}
	page := render(t, r, Options{})
	rows := tableRows(t, page, "Surface factor (admittance method)")
	if got := rowOf(t, rows, "24 h"); got[1] != "0.484" || got[2] != "1.6" {
		t.Errorf("surface factor row %q, want 0.484 and 1.6 h", got)
	}
	if !strings.Contains(page, "Here Rsi = 0.130 m²·K/W of ISO 6946") {
		t.Error("the Rsi used for the surface factor is not named")
	}
	if page := render(t, groundFixture(), Options{}); strings.Contains(page, "Surface factor") {
		t.Error("a ground report shows a surface factor")
	}
}
