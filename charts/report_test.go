package charts

import (
	"bytes"
	"crypto/sha256"
	"encoding/base64"
	"encoding/json"
	stdhtml "html"
	"math"
	"os"
	"regexp"
	"strings"
	"testing"

	"tempstack/scenarios/results"
)

// render writes the report for r and fails the test on error.
func render(t testing.TB, r *results.Results, o Options) string {
	t.Helper()
	var b bytes.Buffer
	if err := Write(&b, r, o); err != nil {
		t.Fatalf("Write: %v", err)
	}
	return b.String()
}

// scriptSpans returns the byte ranges of the bodies of the page's <script>
// elements, found the way a browser ends them: at the first "</script".
func scriptSpans(html string) [][2]int {
	lower := strings.ToLower(html)
	var out [][2]int
	for i := 0; ; {
		k := strings.Index(lower[i:], "<script")
		if k < 0 {
			return out
		}
		open := i + k
		gt := strings.IndexByte(lower[open:], '>')
		if gt < 0 {
			return out
		}
		start := open + gt + 1
		end := strings.Index(lower[start:], "</script")
		if end < 0 {
			return append(out, [2]int{start, len(html)})
		}
		out = append(out, [2]int{start, start + end})
		i = start + end + len("</script")
	}
}

// scripts returns the bodies of the page's <script> elements.
func scripts(t testing.TB, html string) []string {
	t.Helper()
	var out []string
	for _, sp := range scriptSpans(html) {
		out = append(out, html[sp[0]:sp[1]])
	}
	return out
}

// withoutScripts returns html with every script body removed.
func withoutScripts(html string) string {
	var b strings.Builder
	last := 0
	for _, sp := range scriptSpans(html) {
		b.WriteString(html[last:sp[0]])
		last = sp[1]
	}
	b.WriteString(html[last:])
	return b.String()
}

// splitJS walks JavaScript made of JSON literals and bare identifiers. It
// returns the text as JSON, with each bare identifier path (TSFN.x)
// turned into the string "fn:TSFN.x", and the code outside string
// literals (string contents removed), where anything live would have to be.
func splitJS(t testing.TB, js string) (asJSON, bare string) {
	t.Helper()
	var j, b strings.Builder
	inStr := false
	for i := 0; i < len(js); i++ {
		c := js[i]
		switch {
		case inStr:
			j.WriteByte(c)
			if c == '\\' && i+1 < len(js) {
				i++
				j.WriteByte(js[i])
			} else if c == '"' {
				inStr = false
				b.WriteByte('"')
			}
		case c == '"':
			inStr = true
			j.WriteByte(c)
			b.WriteByte(c)
		case c == '-' || c >= '0' && c <= '9':
			k := i + 1
			for k < len(js) && strings.IndexByte("0123456789.eE+-", js[k]) >= 0 {
				k++
			}
			j.WriteString(js[i:k])
			b.WriteString(js[i:k])
			i = k - 1
		case c == '_' || c == '$' || c >= 'A' && c <= 'Z' || c >= 'a' && c <= 'z':
			k := i
			for k < len(js) && (js[k] == '_' || js[k] == '.' || js[k] == '$' || js[k] >= '0' && js[k] <= '9' || js[k] >= 'A' && js[k] <= 'Z' || js[k] >= 'a' && js[k] <= 'z') {
				k++
			}
			id := js[i:k]
			b.WriteString(id)
			if id == "true" || id == "false" || id == "null" {
				j.WriteString(id)
			} else {
				j.WriteString(`"fn:` + id + `"`)
			}
			i = k - 1
		default:
			j.WriteByte(c)
			b.WriteByte(c)
		}
	}
	if inStr {
		t.Fatalf("unterminated string in chart data")
	}
	return j.String(), b.String()
}

// chartData parses the chart data script of a report into chart id ->
// option.
func chartData(t testing.TB, html string) (map[string]map[string]any, string) {
	t.Helper()
	sc := scripts(t, html)
	if len(sc) != 3 {
		t.Fatalf("want 3 scripts (echarts, page, data), got %d", len(sc))
	}
	data := sc[2]
	if !strings.HasPrefix(data, "tsStart([") || !strings.HasSuffix(data, "]);") {
		t.Fatalf("chart data script has an unexpected shape: %.80q", data)
	}
	asJSON, bare := splitJS(t, strings.TrimSuffix(strings.TrimPrefix(data, "tsStart("), ");"))
	var list []struct {
		ID     string         `json:"id"`
		Option map[string]any `json:"option"`
	}
	if err := json.Unmarshal([]byte(asJSON), &list); err != nil {
		t.Fatalf("chart data is not JSON plus function references: %v", err)
	}
	out := map[string]map[string]any{}
	for _, c := range list {
		out[c.ID] = c.Option
	}
	return out, bare
}

func TestWriteDeterministic(t *testing.T) {
	for _, r := range []*results.Results{wallFixture(), groundFixture()} {
		a := render(t, r, Options{ToolVersion: "0.1.0"})
		b := render(t, r, Options{ToolVersion: "0.1.0"})
		if a != b {
			t.Errorf("%s: two writes of the same results differ", r.Kind)
		}
		if strings.Contains(a, "Generated") {
			t.Errorf("%s: a time stamp appears although GeneratedAt is empty", r.Kind)
		}
		c := render(t, r, Options{GeneratedAt: "2026-12-02 01:15 UTC"})
		if !strings.Contains(c, "2026-12-02 01:15 UTC") {
			t.Errorf("%s: GeneratedAt not printed", r.Kind)
		}
	}
}

func TestWallReport(t *testing.T) {
	r := wallFixture()
	html := render(t, r, Options{})
	charts, _ := chartData(t, html)
	for _, id := range []string{idCycle, idEnvelope, idResponse, idSimTemp, idSimFlux, idStep} {
		if charts[id] == nil {
			t.Errorf("chart %s missing from the chart data", id)
		}
		if !strings.Contains(html, `id="`+id+`"`) {
			t.Errorf("no box for chart %s", id)
		}
	}
	for _, id := range []string{idGroundEnvelope, idFrost} {
		if charts[id] != nil {
			t.Errorf("wall report has ground chart %s", id)
		}
	}
	// (a) the heat flux sits on the second y axis.
	cyc := charts[idCycle]
	if n := len(cyc["yAxis"].([]any)); n != 2 {
		t.Errorf("cycle chart: %d y axes, want 2", n)
	}
	flux := findSeries(t, cyc, "Heat flux into the room")
	if flux["yAxisIndex"] != 1.0 {
		t.Errorf("cycle chart: heat flux on y axis %v, want 1", flux["yAxisIndex"])
	}
	// (b) one markLine per layer boundary, one named area per layer.
	env := charts[idEnvelope]
	mean := findSeries(t, env, "Mean")
	ml := mean["markLine"].(map[string]any)["data"].([]any)
	if len(ml) != len(r.Series.Profile.Interfaces_m) {
		t.Errorf("envelope: %d boundary lines, want %d", len(ml), len(r.Series.Profile.Interfaces_m))
	}
	ma := mean["markArea"].(map[string]any)["data"].([]any)
	if len(ma) != len(r.Layers) {
		t.Errorf("envelope: %d layer areas, want %d", len(ma), len(r.Layers))
	}
	band := findSeries(t, env, "Range (min–max)")
	if band["type"] != "custom" || band["renderItem"] != "fn:TSFN.band" {
		t.Errorf("envelope band: type %v renderItem %v", band["type"], band["renderItem"])
	}
	// One band item per profile point: [x, min, x, max].
	bd := band["data"].([]any)
	if len(bd) != len(r.Series.Profile.Position_m) {
		t.Errorf("band has %d items, want %d", len(bd), len(r.Series.Profile.Position_m))
	}
	v := bd[3].(map[string]any)["value"].([]any)
	mm := num(1000 * r.Series.Profile.Position_m[3])
	want := []any{mm, num(r.Series.Profile.Min_C[3]), mm, num(r.Series.Profile.Max_C[3])}
	if !equalAny(v, want) {
		t.Errorf("band item 3 = %v, want %v", v, want)
	}
	// The step chart has a log time axis and a log flux axis (q > 0 in
	// the fixture), and marks where the half-space form stops holding.
	for _, axis := range []string{"xAxis", "yAxis"} {
		if typ := charts[idStep][axis].([]any)[0].(map[string]any)["type"]; typ != "log" {
			t.Errorf("step chart %s type %v, want log", axis, typ)
		}
	}
	step := findSeries(t, charts[idStep], "Simulated")
	if ml := step["markLine"].(map[string]any)["data"].([]any); len(ml) != 1 {
		t.Errorf("step chart: %d markLines, want 1", len(ml))
	}
	// (c) logarithmic period axis and two y axes.
	resp := charts[idResponse]
	if typ := resp["xAxis"].([]any)[0].(map[string]any)["type"]; typ != "log" {
		t.Errorf("response chart x axis type %v, want log", typ)
	}
	if n := len(resp["yAxis"].([]any)); n != 2 {
		t.Errorf("response chart: %d y axes, want 2", n)
	}
	// Time charts zoom.
	if charts[idSimTemp]["dataZoom"] == nil {
		t.Error("simulated temperatures have no dataZoom")
	}
	for _, want := range []string{
		"Steady state (ISO 6946)", "Periodic properties per period", "facing brick", "mineral-wool",
		"Simulation against the exact periodic solution", "Simulated temperatures at the probes",
		"21 %", "9.4 h", "f = |Y₁₂|/U = 0.214", "Energy balance of the simulation", "Heat that entered through the outside",
		"Output interval", "Step of the outside surface temperature", "Thermal effusivity",
		"one-dimensional heat flow", "homogeneous layers", "ISO 13786", "TR-BDF2", "Carslaw and Jaeger",
	} {
		if !strings.Contains(html, want) {
			t.Errorf("wall report lacks %q", want)
		}
	}
	if strings.Contains(html, "licensed geotechnical engineer") {
		t.Error("wall report carries the frost caution")
	}
}

func equalAny(a, b []any) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

func findSeries(t testing.TB, option map[string]any, name string) map[string]any {
	t.Helper()
	for _, s := range option["series"].([]any) {
		m := s.(map[string]any)
		if m["name"] == name {
			return m
		}
	}
	t.Fatalf("no series %q", name)
	return nil
}

func TestGroundReport(t *testing.T) {
	r := groundFixture()
	html := render(t, r, Options{})
	charts, _ := chartData(t, html)
	for _, id := range []string{idGroundEnvelope, idFrost, idCycle, idSimTemp, idSimFlux} {
		if charts[id] == nil {
			t.Errorf("ground report lacks chart %s", id)
		}
	}
	if charts[idEnvelope] != nil {
		t.Error("ground report has the wall envelope chart")
	}
	for _, id := range []string{idGroundEnvelope, idFrost} {
		y := charts[id]["yAxis"].([]any)[0].(map[string]any)
		if y["inverse"] != true {
			t.Errorf("%s: depth axis not inverse (pointing down): %v", id, y["inverse"])
		}
		if !strings.Contains(y["name"].(string), "Depth") {
			t.Errorf("%s: y axis is %v, want depth", id, y["name"])
		}
	}
	if tip := charts[idGroundEnvelope]["tooltip"].(map[string]any); tip["formatter"] != "fn:TSFN.tipY" {
		t.Errorf("ground envelope tooltip formatter %v", tip["formatter"])
	}
	// The two-year hourly series is thinned for display, keeping peaks.
	frost := findSeries(t, charts[idFrost], "Frost depth (deepest frozen point)")
	if n := len(frost["data"].([]any)); n > maxPoints+2 || n < maxPoints/2 {
		t.Errorf("frost depth series has %d points after thinning", n)
	}
	for _, want := range []string{
		"an estimate for planning only", "set by local codes and a licensed geotechnical engineer",
		"No method here is a safe upper bound", "pipe cover depth", "utility standards", "Measured local frost depths and local records govern",
		"Frost depth", "420", "0.82", "1.21", "1.02", "Freezing layers", "Stefan", "Modified Berggren",
	} {
		if !strings.Contains(html, want) {
			t.Errorf("ground report lacks %q", want)
		}
	}
	// The cautions appear even without frost results.
	r.Frost = nil
	if html := render(t, r, Options{}); !strings.Contains(html, "licensed geotechnical engineer") {
		t.Error("ground cautions missing when Frost is nil")
	}
}

// Sections without data are left out.
func TestSectionsOnlyWithData(t *testing.T) {
	r := wallFixture()
	r.Simulation = nil
	r.Series.Simulation.Time_h = nil
	r.Series.Step.Time_s = nil
	r.StepResponse = nil
	html := render(t, r, Options{})
	charts, _ := chartData(t, html)
	if len(charts) != 3 {
		t.Errorf("periodic-only wall report has %d charts, want 3", len(charts))
	}
	for _, s := range []string{`id="simulation"`, `id="step"`, `id="frost"`} {
		if strings.Contains(html, s) {
			t.Errorf("section %s present without data", s)
		}
	}
	empty := render(t, &results.Results{Kind: "wall"}, Options{})
	if c, _ := chartData(t, empty); len(c) != 0 {
		t.Errorf("empty results gave %d charts", len(c))
	}
	if err := Write(&bytes.Buffer{}, nil, Options{}); err == nil {
		t.Error("Write(nil) gave no error")
	}
}

// hostile strings, each placed in every user-controlled string field.
var hostile = []string{
	`</script><script>alert(1)</script>`,
	`<img src=x onerror=alert(1)>`,
	`__f__function(){alert(1)}__f__`,
	`"}]}});alert(1);//`,
	`</SCRIPT ><svg onload=alert(1)>`,
	"\u2028alert(1)\u2029",
	`__tsfn_band__`,
	`'-alert(1)-'`,
	`{{.Title}}`,
}

// tag is a start tag found by tags: its name and attribute names.
type tag struct {
	name  string
	attrs []string
}

// tags lists the start tags of markup the way an HTML tokenizer reads
// them (quoted and unquoted attribute values, comments skipped), so that
// an attribute hidden in another's quoted value is not mistaken for one.
func tags(markup string) []tag {
	var out []tag
	lower := strings.ToLower(markup)
	for i := 0; i < len(lower); i++ {
		if lower[i] != '<' || i+1 >= len(lower) {
			continue
		}
		if strings.HasPrefix(lower[i:], "<!--") {
			end := strings.Index(lower[i:], "-->")
			if end < 0 {
				break
			}
			i += end + 2
			continue
		}
		c := lower[i+1]
		if c < 'a' || c > 'z' {
			continue
		}
		k := i + 1
		for k < len(lower) && !strings.ContainsRune(" \t\n\r\f/>", rune(lower[k])) {
			k++
		}
		tg := tag{name: lower[i+1 : k]}
		for k < len(lower) && lower[k] != '>' {
			if strings.ContainsRune(" \t\n\r\f/", rune(lower[k])) {
				k++
				continue
			}
			a := k
			for k < len(lower) && !strings.ContainsRune(" \t\n\r\f/>=", rune(lower[k])) {
				k++
			}
			tg.attrs = append(tg.attrs, lower[a:k])
			for k < len(lower) && strings.ContainsRune(" \t\n\r\f", rune(lower[k])) {
				k++
			}
			if k < len(lower) && lower[k] == '=' {
				k++
				for k < len(lower) && strings.ContainsRune(" \t\n\r\f", rune(lower[k])) {
					k++
				}
				if k < len(lower) && (lower[k] == '"' || lower[k] == '\'') {
					q := lower[k]
					end := strings.IndexByte(lower[k+1:], q)
					if end < 0 {
						k = len(lower)
						break
					}
					k += end + 2
				} else {
					for k < len(lower) && !strings.ContainsRune(" \t\n\r\f>", rune(lower[k])) {
						k++
					}
				}
			}
		}
		out = append(out, tg)
		i = k
	}
	return out
}

// The elements and attributes the report template uses.
var (
	allowedTags = map[string]bool{"html": true, "head": true, "meta": true, "title": true, "style": true, "body": true,
		"main": true, "header": true, "p": true, "h1": true, "h2": true, "h3": true, "dl": true, "dt": true, "dd": true,
		"nav": true, "a": true, "section": true, "ul": true, "li": true, "noscript": true, "div": true, "table": true,
		"caption": true, "thead": true, "tbody": true, "tr": true, "th": true, "td": true, "figure": true,
		"figcaption": true, "footer": true, "script": true,
		// The cross-section drawing (inline SVG).
		"svg": true, "defs": true, "pattern": true, "g": true, "path": true, "rect": true, "circle": true, "text": true}
	allowedAttrs = map[string]bool{"lang": true, "charset": true, "name": true, "content": true, "http-equiv": true,
		"class": true, "id": true, "href": true, "aria-label": true, "role": true, "scope": true,
		// SVG geometry and presentation; no href, no event handlers.
		"viewbox": true, "d": true, "x": true, "y": true, "width": true, "height": true, "cx": true, "cy": true, "r": true,
		"fill": true, "fill-opacity": true, "stroke": true, "stroke-width": true, "stroke-dasharray": true,
		"text-anchor": true, "patternunits": true, "patterntransform": true}
)

func hostileResults(s string) *results.Results {
	r := studyFixture()
	r.Variants[1].Name, r.Variants[1].Changes = s, []string{s}
	r.Variants[1].Layers = append([]results.Layer(nil), r.Variants[1].Layers...)
	r.Variants[1].Layers[0].Name = s
	r.Sweep.Parameter, r.Sweep.Unit, r.Sweep.Points[0].Text = s, s, s
	r.Target.Parameter, r.Target.Unit, r.Target.Quantity = s, s, s
	r.Uncertainty.Parameters[0].Parameter, r.Uncertainty.FirstRejection, r.Uncertainty.Quantities[0].Quantity = s, s, s
	r.Fit = &results.FitResult{File: s, Method: s, Diffusivity_m2_s: 6e-7, Pairs: []results.FitPair{{Period_h: 24, Note: s}}}
	r.Records = []results.RecordInfo{{Use: s, File: s, Columns: []string{s}, First: s, Last: s,
		Bridged: []results.BridgedGap{{Column: s, From: s, To: s}}}}
	r.Title, r.ScenarioFile, r.Orientation = s, s, s
	r.Warnings = []string{s, "second " + s}
	r.StepResponse.SurfaceLayer, r.StepResponse.Side = s, s
	for i := range r.Layers {
		r.Layers[i].Name, r.Layers[i].Material, r.Layers[i].Source = s, s, s
	}
	return r
}

func TestEscaping(t *testing.T) {
	pageJS, err := os.ReadFile("assets/page.js")
	if err != nil {
		t.Fatal(err)
	}
	tagRe := regexp.MustCompile(`(?i)<\s*(script|img|svg|iframe)\b`)
	svgRe := regexp.MustCompile(`<svg class="xsec( xsec-v)?" `)
	for _, s := range hostile {
		for _, r := range []*results.Results{hostileResults(s), func() *results.Results {
			g := groundFixture()
			g.Title, g.Warnings = s, []string{s}
			g.Series.Simulation.Time_h = nil // the long series carry no user text; skip them for speed
			for i := range g.Layers {
				g.Layers[i].Name, g.Layers[i].Source = s, s
			}
			return g
		}(), hostileRoom(s)} {
			html := render(t, r, Options{GeneratedAt: s, ToolVersion: s})
			// The markup (script bodies blanked) has only our own three
			// scripts and no other live tag; the first two script bodies
			// are exactly our files.
			markup := withoutScripts(html)
			want := 4 // three scripts, the cross-section
			if len(r.Variants) > 0 {
				want++ // the options drawing
			}
			if n, ours := len(tagRe.FindAllString(markup, -1)), len(svgRe.FindAllString(markup, -1)); n != want || ours != want-3 {
				t.Errorf("%q: %d script/img/svg/iframe tags (%d our drawings), want exactly our 3 scripts and %d drawings", s, n, ours, want-3)
			}
			if sc := scripts(t, html); len(sc) != 3 || sc[0] != echartsJS || sc[1] != string(pageJS) {
				t.Errorf("%q: the echarts and page scripts are not ours", s)
			}
			for _, tag := range tags(markup) {
				if !allowedTags[tag.name] {
					t.Errorf("%q: unexpected tag <%s>", s, tag.name)
				}
				for _, a := range tag.attrs {
					if strings.HasPrefix(a, "on") || !allowedAttrs[a] {
						t.Errorf("%q: unexpected attribute %s on <%s>", s, a, tag.name)
					}
				}
			}
			charts, bare := chartData(t, html)
			if strings.Contains(bare, "alert") || strings.Contains(bare, "function") {
				t.Errorf("%q: code outside JSON strings in the chart data: %.200s", s, bare)
			}
			// The only function references are our trusted ones.
			for _, m := range regexp.MustCompile(`TSFN\.[A-Za-z0-9]+|__tsfn_[A-Za-z0-9]+__`).FindAllString(bare, -1) {
				if !strings.HasPrefix(m, "TSFN.") || !trustedFuncs[strings.TrimPrefix(m, "TSFN.")] {
					t.Errorf("%q: unexpected function reference %s", s, m)
				}
			}
			// Layer names reach the chart as plain text, unchanged.
			if r.Kind == "wall" {
				area := findSeries(t, charts[idEnvelope], "Mean")["markArea"].(map[string]any)["data"].([]any)
				got := area[0].([]any)[0].(map[string]any)["name"]
				if got != s {
					t.Errorf("layer name in the chart is %q, want %q", got, s)
				}
			}
			// The raw string never appears in the markup unless it is
			// harmless there as text.
			if strings.ContainsAny(s, `<>"&'`) && strings.Contains(markup, s) {
				t.Errorf("%q appears unescaped in the page", s)
			}
		}
	}
}

func TestOptionJSOnlyTrustedFunctions(t *testing.T) {
	for _, tc := range []struct {
		option map[string]any
		want   string
		err    bool
	}{
		{map[string]any{"formatter": "__tsfn_tipX__"}, `{"formatter":TSFN.tipX}`, false},
		{map[string]any{"renderItem": "__tsfn_band__"}, `{"renderItem":TSFN.band}`, false},
		{map[string]any{"text": "__tsfn_band__"}, `{"text":"__tsfn_band__"}`, false},
		{map[string]any{"text": `":"__tsfn_band__"`}, `{"text":"\":\"__tsfn_band__\""}`, false},
		{map[string]any{"formatter": "__f__function(){}__f__"}, `{"formatter":"__f__function(){}__f__"}`, false},
		{map[string]any{"formatter": "__tsfn_evil__"}, "", true},
		{map[string]any{"text": "<b>&"}, `{"text":"\u003cb\u003e\u0026"}`, false},
	} {
		got, err := optionJS(tc.option)
		if tc.err {
			if err == nil {
				t.Errorf("%v: no error for an unknown function", tc.option)
			}
			continue
		}
		if err != nil || got != tc.want {
			t.Errorf("optionJS(%v) = %s, %v; want %s", tc.option, got, err, tc.want)
		}
	}
}

// Every trusted function name is defined in the page script.
func TestTrustedFuncsDefined(t *testing.T) {
	js, err := os.ReadFile("assets/page.js")
	if err != nil {
		t.Fatal(err)
	}
	ret := regexp.MustCompile(`return \{([^}]*)\};\s*\}\(\)\);`).FindSubmatch(js)
	if ret == nil {
		t.Fatal("TSFN table not found in page.js")
	}
	for name := range trustedFuncs {
		if !regexp.MustCompile(`\b` + name + `:`).Match(ret[1]) {
			t.Errorf("trusted function %s is not defined in TSFN", name)
		}
	}
}

func TestNaNNeverReachesACharts(t *testing.T) {
	r := wallFixture()
	g := groundFixture()
	bad := []float64{math.NaN(), math.Inf(1), math.Inf(-1)}
	for _, res := range []*results.Results{r, g} {
		s := &res.Series
		for _, v := range []*[]float64{&s.Cycle.OutsideAir_C, &s.Cycle.InsideFlux_W_m2, &s.Profile.Min_C, &s.Profile.Max_C,
			&s.Profile.Position_m, &s.Response.Decrement, &s.Response.Period_h, &s.Simulation.Time_h, &s.Simulation.InsideFlux_W_m2,
			&s.Simulation.FrostDepth_m, &s.SimProfile.Min_C, &s.Step.Flux_W_m2, &s.Profile.Interfaces_m} {
			for i := range bad {
				if i*7 < len(*v) {
					(*v)[i*7] = bad[i]
				}
			}
		}
		if len(s.Simulation.Probes_C) > 0 {
			s.Simulation.Probes_C[0][3] = math.NaN()
		}
		res.Periodic[0].DecrementFactor = math.NaN()
		res.Steady.UValue_W_m2K = math.Inf(1)
		res.Layers[0].Thickness_m = math.NaN()
		if res.Frost != nil {
			res.Frost.StefanDepth_m = ptr(math.NaN())
		}
		html := render(t, res, Options{})
		sc := scripts(t, html)
		if regexp.MustCompile(`NaN|Infinity`).MatchString(sc[2]) {
			t.Errorf("%s: NaN or Infinity in the chart data", res.Kind)
		}
		if !strings.Contains(sc[2], "null") {
			t.Errorf("%s: no null in the chart data", res.Kind)
		}
		text := withoutScripts(html)
		if regexp.MustCompile(`NaN|Inf`).MatchString(text) {
			t.Errorf("%s: NaN or Inf printed in the page", res.Kind)
		}
		if !strings.Contains(text, dash) {
			t.Errorf("%s: missing values not shown as a dash", res.Kind)
		}
		chartData(t, html) // still parses
	}
}

func TestSelfContained(t *testing.T) {
	html := render(t, groundFixture(), Options{})
	sc := scripts(t, html)
	if sc[0] != echartsJS || !strings.Contains(sc[0], `version="5.6.0"`) {
		t.Error("the first script is not the embedded echarts 5.6.0")
	}
	if regexp.MustCompile(`(?i)</script|<!--|<script`).MatchString(echartsJS) {
		t.Error("the embedded echarts text could end or open a script element")
	}
	// Everything except the echarts text (whose licence comments name URLs)
	// is ours: it must name no network address at all.
	own := strings.Replace(html, sc[0], "", 1)
	if strings.Contains(own, "http:") || strings.Contains(own, "https:") || strings.Contains(own, "//cdn") {
		t.Error("the page names a network address")
	}
	// The drawing's fills refer to its own patterns; no other url().
	own = regexp.MustCompile(`url\(#ts-[a-z0-9]+-[a-z]+\)`).ReplaceAllString(own, "")
	for _, re := range []string{`(?i)\b(src|href|action|poster|srcset|xlink:href)\s*=\s*["']?\s*(https?:)?//`, `(?i)@import`, `(?i)url\(`, `\bfetch\(`, `XMLHttpRequest`, `\bimport\(`, `(?i)<link\b`} {
		if regexp.MustCompile(re).MatchString(own) {
			t.Errorf("the page matches %s", re)
		}
	}
	// Only same-page anchors are linked.
	for _, m := range regexp.MustCompile(`href="([^"]*)"`).FindAllStringSubmatch(own, -1) {
		if !strings.HasPrefix(m[1], "#") {
			t.Errorf("link to %s", m[1])
		}
	}
	// The content policy admits exactly our three scripts.
	csp := regexp.MustCompile(`Content-Security-Policy" content="([^"]*)"`).FindStringSubmatch(html)
	if csp != nil {
		csp[1] = stdhtml.UnescapeString(csp[1])
	}
	if csp == nil || !strings.Contains(csp[1], "default-src 'none'") {
		t.Fatal("no content security policy forbidding network loads")
	}
	for i, s := range sc {
		h := sha256.Sum256([]byte(s))
		if !strings.Contains(csp[1], "'sha256-"+base64.StdEncoding.EncodeToString(h[:])+"'") {
			t.Errorf("script %d is not admitted by the content policy", i)
		}
	}
	if size := len(html); size < len(echartsJS) || size > len(echartsJS)+2_000_000 {
		t.Errorf("report size %d bytes out of the expected range", size)
	}
}

func TestThin(t *testing.T) {
	y := make([]float64, 100001)
	for i := range y {
		y[i] = math.Sin(float64(i) / 900)
	}
	y[31337] = 5  // a spike that must survive
	y[77777] = -5 // and a dip
	y[50000] = math.NaN()
	idx := thin(y, 1000)
	if len(idx) > 1002 {
		t.Errorf("thinned to %d points, want at most 1002", len(idx))
	}
	seen := map[int]bool{}
	for k, i := range idx {
		seen[i] = true
		if k > 0 && i <= idx[k-1] {
			t.Fatalf("indices not increasing at %d", k)
		}
	}
	for _, i := range []int{0, 31337, 77777, 100000} {
		if !seen[i] {
			t.Errorf("point %d lost by thinning", i)
		}
	}
	if n := len(thin(y[:10], 1000)); n != 10 {
		t.Errorf("short series thinned to %d points", n)
	}
}

func TestFormat(t *testing.T) {
	for _, tc := range []struct{ got, want string }{
		{fixed(-0.04, 1), "0.0"},
		{fixed(-2.25, 2), "−2.25"},
		{fixed(math.NaN(), 1), dash},
		{sig(0.2138, 3), "0.214"},
		{sig(1234.6, 3), "1235"},
		{sig(3.1e-13, 2), "3.1×10⁻¹³"},
		{sig(0, 3), "0"},
		{degC(-3.14159), "−3.1 °C"},
		{percent(0.214), "21 %"},
		{percent(0.0712), "7.1 %"},
		{hours(9.4), "9.4 h"},
		{hours(1100), "1100 h (45.8 d)"},
		{periodLabel(24), "24 h"},
		{periodLabel(168), "7 d"},
		{periodLabel(1.5), "1.5 h"},
		{periodLabel(8760), "1 year"},
		{periodLabel(12), "12 h"},
	} {
		if tc.got != tc.want {
			t.Errorf("got %q, want %q", tc.got, tc.want)
		}
	}
	if num(math.NaN()) != nil || num(math.Inf(-1)) != nil {
		t.Error("num lets NaN or Inf through")
	}
	if num(1.23456789) != 1.23457 {
		t.Errorf("num(1.23456789) = %v", num(1.23456789))
	}
}

func BenchmarkWrite(b *testing.B) {
	for _, r := range []*results.Results{wallFixture(), groundFixture()} {
		b.Run(string(r.Kind), func(b *testing.B) {
			var size int
			for b.Loop() {
				var buf bytes.Buffer
				if err := Write(&buf, r, Options{}); err != nil {
					b.Fatal(err)
				}
				size = buf.Len()
			}
			b.ReportMetric(float64(size), "bytes/report")
		})
	}
}

// A ground column with closed forms and the exact periodic state only (no
// simulation) still gets its envelope, the frost table and the cautions.
func TestGroundWithoutSimulation(t *testing.T) {
	g := groundFixture()
	g.Simulation = nil
	s := &g.Series
	s.Simulation.Time_h, s.SimProfile.Position_m, s.Simulation.FrostDepth_m, s.Simulation.ThawDepth_m = nil, nil, nil, nil
	html := render(t, g, Options{})
	charts, _ := chartData(t, html)
	env := charts[idGroundEnvelope]
	if env == nil {
		t.Fatal("no ground envelope from the exact periodic profile")
	}
	if n := len(env["series"].([]any)); n != 4 { // band + highest, mean, lowest
		t.Errorf("ground envelope has %d series, want 4", n)
	}
	for _, id := range []string{idFrost, idSimTemp, idSimFlux} {
		if charts[id] != nil {
			t.Errorf("chart %s drawn without simulation data", id)
		}
	}
	for _, want := range []string{"exact periodic solution)", "Modified Berggren (closed form)", "licensed geotechnical engineer"} {
		if !strings.Contains(html, want) {
			t.Errorf("report lacks %q", want)
		}
	}
}

// hostileRoom is a room result with s in every user string.
func hostileRoom(s string) *results.Results {
	r := roomFixture()
	r.Title, r.ScenarioFile, r.Warnings = s, s, []string{s}
	rm := r.Room
	rm.Notes = []string{s}
	rm.OperativeTemperature = s
	rm.MassRemoved.Statement = s
	for i := range rm.Elements {
		e := &rm.Elements[i]
		e.Name, e.Construction, e.Orientation, e.Back = s, s, s, s
	}
	for i := range rm.Windows {
		rm.Windows[i].Name = s
	}
	for i := range rm.Simulation.Paths {
		rm.Simulation.Paths[i].Name = s
	}
	return r
}

// roomFixture is a small room result with its series (invented numbers).
func roomFixture() *results.Results {
	share := 0.25
	to, from := 1.5, 1.2
	red := 3.1
	sim := &results.RoomSimulation{AirMax_C: 27.5, AirMin_C: 23.1, OperativeMax_C: 27.0, OperativeMin_C: 23.6,
		HoursAbove: []results.HoursAbove{{Threshold_C: 25, Hours: 9.5}, {Threshold_C: 26, Hours: 5}}, HoursAboveBasis: "operative temperature",
		EnergyBalanceRelativeError: 3e-14, Step_h: 0.25, Cycle_h: 24, Cells: 60,
		Paths: []results.RoomPath{{Name: "ventilation", ToAir_kWh_day: 0.1, FromAir_kWh_day: 4}, {Name: "wall", ToAir_kWh_day: 1.5, FromAir_kWh_day: 1.2}}}
	bare := *sim
	bare.OperativeMax_C, bare.HoursAbove = 30.1, []results.HoursAbove{{Threshold_C: 25, Hours: 11}, {Threshold_C: 26, Hours: 9}}
	rm := &results.RoomResult{Volume_m3: 50, AirHeatCapacity_kJ_K: 60, VentilationDay_ach: 1, MeanConductance_W_K: 30,
		OperativeTemperature: "mean of air and surfaces", Thresholds_C: []float64{25, 26},
		Elements: []results.RoomElement{
			{Name: "wall", Area_m2: 10, Orientation: "wall", Back: "outside", Sunlit: true, UValue_W_m2K: 0.3, ArealHeatCapacity_kJ_m2K: 400, InsideAdmittance_W_m2K: 4,
				HeatToAir_kWh_day: &to, HeatFromAir_kWh_day: &from, ShareOfHeatToAir: &share},
			{Name: "slab", Area_m2: 20, Orientation: "floor", Back: "adiabatic", Construction: "slab.yaml", UValue_W_m2K: 2, ArealHeatCapacity_kJ_m2K: 300, InsideAdmittance_W_m2K: 5},
		},
		Windows:    []results.RoomWindow{{Name: "window", Area_m2: 2, UValue_W_m2K: 1.2, GValue: 0.5, SolarMean_W: 80}},
		Periodic:   results.RoomPeriodic{Period_h: 24, Harmonics: 3, AirMean_C: 25, AirMax_C: 27.4, AirMin_C: 23.2, OperativeMean_C: 25, OperativeMax_C: 27, OperativeMin_C: 23.5},
		Simulation: sim,
		MassRemoved: &results.RoomMassRemoved{Periodic: results.RoomPeriodic{Period_h: 24, AirMax_C: 30, AirMin_C: 20}, Simulation: &bare,
			PeakReduction_K: &red, AirPeakReduction_K: &red, Statement: "The mass takes 3.1 K off."},
	}
	for j := 0; j <= 24; j++ {
		h := float64(j)
		c := math.Cos(2 * math.Pi * (h - 15) / 24)
		s := &rm.Series
		s.CycleTime_h = append(s.CycleTime_h, h)
		s.CycleOutdoor_C = append(s.CycleOutdoor_C, 21+7*c)
		s.CycleAir_C = append(s.CycleAir_C, 25+2*c)
		s.CycleOperative_C = append(s.CycleOperative_C, 25+1.5*c)
		s.CycleAirNoMass_C = append(s.CycleAirNoMass_C, 25+5*c)
		s.CycleOperativeNoMass_C = append(s.CycleOperativeNoMass_C, 25+5*c)
		s.Time_h = append(s.Time_h, h)
		s.Outdoor_C = append(s.Outdoor_C, 21+7*c)
		s.Air_C = append(s.Air_C, 25+2*c)
		s.Operative_C = append(s.Operative_C, 25+1.5*c)
		s.AirNoMass_C = append(s.AirNoMass_C, 25+5*c)
		s.OperativeNoMass_C = append(s.OperativeNoMass_C, 25+5*c)
	}
	return &results.Results{Title: "room", Kind: results.Room, Room: rm, Cautions: []string{"a caution"}}
}

// TestRoomReport: a room's report has its sections, the elements drawing,
// the day chart and the local-guidance note.
func TestRoomReport(t *testing.T) {
	html := render(t, roomFixture(), Options{})
	for _, want := range []string{`id="room"`, `id="temperature"`, `id="heat"`, idRoomDay, "Elements of the room by area",
		"set by local guidance", "Operative temperature: mean of air and surfaces", "The mass takes 3.1 K off.", "Hours a day above each threshold"} {
		if !strings.Contains(html, want) {
			t.Errorf("room report lacks %q", want)
		}
	}
}
