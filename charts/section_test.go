package charts

import (
	"encoding/xml"
	"io"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"tempstack/layers"
	"tempstack/scenarios/results"
)

// svgOf renders the cross-section of r and checks that it is well-formed
// XML.
func svgOf(t *testing.T, r *results.Results) (string, *figure) {
	t.Helper()
	f := crossSection(r)
	if f == nil {
		t.Fatal("no cross-section")
	}
	svg := string(f.SVG)
	d := xml.NewDecoder(strings.NewReader(svg))
	d.Strict = true
	for {
		_, err := d.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("cross-section is not well-formed: %v\n%.400s", err, svg)
		}
	}
	return svg, f
}

// svgTexts returns the text content of every <text> and <title> element.
func svgTexts(t *testing.T, svg string) []string {
	t.Helper()
	d := xml.NewDecoder(strings.NewReader(svg))
	var out []string
	var cur *strings.Builder
	for {
		tok, err := d.Token()
		if err == io.EOF {
			return out
		}
		if err != nil {
			t.Fatal(err)
		}
		switch e := tok.(type) {
		case xml.StartElement:
			if e.Name.Local == "text" || e.Name.Local == "title" {
				cur = &strings.Builder{}
			}
		case xml.CharData:
			if cur != nil {
				cur.Write(e)
			}
		case xml.EndElement:
			if cur != nil && (e.Name.Local == "text" || e.Name.Local == "title") {
				out = append(out, cur.String())
				cur = nil
			}
		}
	}
}

// A layer name full of markup stays text inside the SVG: escaped in the
// markup, unchanged when read back as XML text.
func TestCrossSectionEscaping(t *testing.T) {
	for _, name := range []string{
		`</text><script>alert(1)</script>`,
		`"><svg onload=alert(1)>`,
		`A & B 'quoted' "double"`,
		`]]><!-- -->`,
	} {
		for _, r := range []*results.Results{wallFixture(), groundFixture(), func() *results.Results {
			w := wallFixture()
			w.Orientation = "roof"
			return w
		}()} {
			r.Layers[0].Name, r.Layers[0].Material = name, name
			svg, _ := svgOf(t, r)
			if strings.Contains(svg, name) && strings.ContainsAny(name, `<>&"'`) {
				t.Errorf("%s: %q appears unescaped in the SVG", r.Kind, name)
			}
			// Only the drawing's own elements, none with an event handler.
			d := xml.NewDecoder(strings.NewReader(svg))
			for {
				tok, err := d.Token()
				if err != nil {
					break
				}
				if e, ok := tok.(xml.StartElement); ok {
					if !allowedTags[e.Name.Local] && e.Name.Local != "style" && e.Name.Local != "title" {
						t.Errorf("%s: element <%s> from %q", r.Kind, e.Name.Local, name)
					}
					for _, a := range e.Attr {
						if strings.HasPrefix(strings.ToLower(a.Name.Local), "on") || strings.Contains(strings.ToLower(a.Name.Local), "href") {
							t.Errorf("%s: attribute %s from %q", r.Kind, a.Name.Local, name)
						}
					}
				}
			}
			found := false
			for _, tx := range svgTexts(t, svg) {
				if strings.Contains(tx, name) {
					found = true
				}
			}
			if !found {
				t.Errorf("%s: layer name %q not drawn as text", r.Kind, name)
			}
		}
	}
	// A long name is shortened with an ellipsis in the label and kept
	// whole in the tooltip.
	r := wallFixture()
	long := strings.Repeat("very long layer name ", 6)
	r.Layers[1].Name = long
	svg, _ := svgOf(t, r)
	texts := strings.Join(svgTexts(t, svg), "\n")
	if !strings.Contains(texts, "…") || !strings.Contains(texts, long) {
		t.Error("a long layer name is not shortened in the label and kept in the tooltip")
	}
}

// layerRects returns the layer rectangles (those with a tooltip) of a
// cross-section in drawing order: x, y, width, height.
func layerRects(t *testing.T, svg string) [][4]float64 {
	t.Helper()
	re := regexp.MustCompile(`<rect x="([-0-9.]+)" y="([-0-9.]+)" width="([0-9.]+)" height="([0-9.]+)"[^>]*><title>`)
	var out [][4]float64
	for _, m := range re.FindAllStringSubmatch(svg, -1) {
		var v [4]float64
		for k := range v {
			x, err := strconv.ParseFloat(m[k+1], 64)
			if err != nil {
				t.Fatal(err)
			}
			v[k] = x
		}
		out = append(out, v)
	}
	return out
}

// The layers are drawn to scale: the drawn widths are proportional to
// the thicknesses (to the 0.1 px the coordinates are written with), and
// they fill the drawing without gaps.
func TestCrossSectionScale(t *testing.T) {
	r := wallFixture() // 105, 100, 100 and 15 mm
	svg, f := svgOf(t, r)
	rects := layerRects(t, svg)
	if len(rects) != len(r.Layers) {
		t.Fatalf("%d layer rectangles, want %d", len(rects), len(r.Layers))
	}
	total := 0.0
	for _, l := range r.Layers {
		total += l.Thickness_m
	}
	length := rects[len(rects)-1][0] + rects[len(rects)-1][2] - rects[0][0]
	for i, l := range r.Layers {
		want := l.Thickness_m / total * length
		if math.Abs(rects[i][2]-want) > 0.15 {
			t.Errorf("layer %d drawn %.1f px wide, want %.1f (to scale)", i, rects[i][2], want)
		}
		if i > 0 && math.Abs(rects[i][0]-(rects[i-1][0]+rects[i-1][2])) > 0.15 {
			t.Errorf("gap or overlap before layer %d", i)
		}
	}
	if len(f.Notes) != 0 {
		t.Errorf("notes on a drawing fully to scale: %v", f.Notes)
	}
	// Roof: vertical, outside (layer 1) on top; floor: outside at the bottom.
	first := regexp.MustCompile(`<rect x="[-0-9.]+" y="([-0-9.]+)"[^>]*><title>1 `)
	for _, o := range []string{"roof", "floor"} {
		r.Orientation = o
		svg, _ := svgOf(t, r)
		rects := layerRects(t, svg)
		m := first.FindStringSubmatch(svg)
		if m == nil {
			t.Fatalf("%s: layer 1 not found", o)
		}
		y1, _ := strconv.ParseFloat(m[1], 64)
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, q := range rects {
			lo, hi = math.Min(lo, q[1]), math.Max(hi, q[1])
		}
		if (o == "roof" && y1 != lo) || (o == "floor" && y1 != hi) {
			t.Errorf("%s: the outside layer is drawn at y %.1f (layers from %.1f to %.1f)", o, y1, lo, hi)
		}
		if !strings.Contains(svg, ">Outside<") || !strings.Contains(svg, ">Inside<") {
			t.Errorf("%s: sides not named", o)
		}
	}
}

// A layer too thin to see is drawn minLayerPx thick and marked; the
// others keep one common scale.
func TestCrossSectionThinLayer(t *testing.T) {
	r := wallFixture()
	foil := results.Layer{Name: "vapour control foil", Thickness_m: 0.0002, Conductivity_W_mK: 0.2, Density_kg_m3: 900, SpecificHeat_J_kgK: 1800}
	r.Layers = append(r.Layers[:3:3], foil, r.Layers[3])
	svg, f := svgOf(t, r)
	rects := layerRects(t, svg)
	if len(rects) != 5 {
		t.Fatalf("%d layer rectangles, want 5", len(rects))
	}
	if math.Abs(rects[3][2]-minLayerPx) > 0.05 {
		t.Errorf("thin layer drawn %.2f px, want the minimum %g px", rects[3][2], minLayerPx)
	}
	// The others share one scale: width per metre equal for all of them.
	s0 := rects[0][2] / r.Layers[0].Thickness_m
	for _, i := range []int{1, 2, 4} {
		if s := rects[i][2] / r.Layers[i].Thickness_m; math.Abs(s-s0)/s0 > 0.01 {
			t.Errorf("layer %d drawn at %.0f px/m, layer 0 at %.0f px/m", i, s, s0)
		}
	}
	if !strings.Contains(svg, "vapour control foil · 0.2 mm *") {
		t.Error("the thin layer is not marked * in its label")
	}
	if len(f.Notes) == 0 || !strings.Contains(f.Notes[0], "drawn 8 px thick") {
		t.Errorf("no note on the widened layer: %v", f.Notes)
	}
}

func TestLayout(t *testing.T) {
	l := func(th ...float64) []results.Layer {
		var out []results.Layer
		for _, x := range th {
			out = append(out, results.Layer{Thickness_m: x})
		}
		return out
	}
	for _, tc := range []struct {
		name    string
		layers  []results.Layer
		want    []float64
		widened []bool
	}{
		{"to scale", l(0.1, 0.3), []float64{100, 300}, []bool{false, false}},
		// 0.001 of 0.401 at 400 px would be 1 px: drawn 8, the rest share 392.
		{"thin", l(0.1, 0.001, 0.3), []float64{98, 8, 294}, []bool{false, true, false}},
		{"thick last layer stays to scale", l(1, 3, 16), []float64{20, 60, 320}, []bool{false, false, false}},
		// A half-space (no thickness) takes a fifth.
		{"half-space", l(0.6, 2.4, 0), []float64{64, 256, 80}, []bool{false, false, false}},
	} {
		sp := layout(tc.layers, 400)
		at := 0.0
		for i, s := range sp {
			if math.Abs(s.size-tc.want[i]) > 1e-9 || s.widened != tc.widened[i] {
				t.Errorf("%s: layer %d size %.3f widened %v, want %.3f %v", tc.name, i, s.size, s.widened, tc.want[i], tc.widened[i])
			}
			if math.Abs(s.at-at) > 1e-9 {
				t.Errorf("%s: layer %d at %.3f, want %.3f", tc.name, i, s.at, at)
			}
			at += s.size
		}
	}
}

// A deep ground column is drawn to scale down to the depth of interest
// (78 % of the length) and compressed below a break; marks map into the
// right layer at the right place.
func TestGroundLayout(t *testing.T) {
	l := func(th ...float64) []results.Layer {
		var out []results.Layer
		for _, x := range th {
			out = append(out, results.Layer{Thickness_m: x})
		}
		return out
	}
	// 0.3 + 2.2 + 17.5 m, interest 6.5 m: 0..6.5 m over 312 px (48 px/m),
	// 6.5..20 m over 88 px.
	sp, sc := groundLayout(l(0.3, 2.2, 17.5), 400, 6.5)
	if sc.cut != 6.5 {
		t.Fatalf("cut at %g m, want 6.5", sc.cut)
	}
	for i, want := range [][2]float64{{0, 14.4}, {14.4, 105.6}, {120, 280}} {
		if math.Abs(sp[i].at-want[0]) > 1e-9 || math.Abs(sp[i].size-want[1]) > 1e-9 {
			t.Errorf("layer %d at %.3f size %.3f, want %.3f %.3f", i, sp[i].at, sp[i].size, want[0], want[1])
		}
	}
	if sp[0].broken || sp[1].broken || !sp[2].broken {
		t.Errorf("break flags %v %v %v, want the last layer broken", sp[0].broken, sp[1].broken, sp[2].broken)
	}
	for _, tc := range []struct{ z, want float64 }{
		{0, 0}, {0.15, 7.2}, {1.4, 67.2}, {5, 240}, {6.5, 312}, {20, 400}, {25, 400},
	} {
		if got := sc.at(tc.z); math.Abs(got-tc.want) > 1e-9 {
			t.Errorf("depth %g m drawn at %.3f px, want %.3f", tc.z, got, tc.want)
		}
	}
	// A shallow column (or no depth of interest) is all to one scale.
	sp, sc = groundLayout(l(0.3, 2.2, 1.5), 400, 4.55)
	if sc.cut != 0 || math.Abs(sp[2].size-150) > 1e-9 {
		t.Errorf("shallow column: cut %g, last layer %.3f px, want no cut and 150 px", sc.cut, sp[2].size)
	}
	// A thin top layer is widened above the cut.
	sp, _ = groundLayout(l(0.01, 2.49, 17.5), 400, 2.6)
	if !sp[0].widened || math.Abs(sp[0].size-minLayerPx) > 1e-9 {
		t.Errorf("thin top layer %.3f px, widened %v; want %g px, widened", sp[0].size, sp[0].widened, minLayerPx)
	}
}

func TestSpread(t *testing.T) {
	got := spread([]float64{10, 12, 13, 100, 395}, 20, 0, 400)
	want := []float64{10, 30, 50, 100, 395}
	for i := range want {
		if math.Abs(got[i]-want[i]) > 1e-9 {
			t.Fatalf("spread = %v, want %v", got, want)
		}
	}
	// Crowded at the bottom: pushed back up, order kept, gaps kept.
	got = spread([]float64{390, 395, 399}, 20, 0, 400)
	want = []float64{360, 380, 400}
	for i := range want {
		if math.Abs(got[i]-want[i]) > 1e-9 {
			t.Fatalf("spread = %v, want %v", got, want)
		}
	}
}

// The ground column marks the probes, the frost depth and the depth of
// every boundary; each layer is tinted by its family.
func TestCrossSectionGround(t *testing.T) {
	r := groundFixture()
	svg, f := svgOf(t, r)
	for _, want := range []string{">Ground surface<", ">probe 0.50 m<", ">probe 2.00 m<", ">simulated max frost depth 0.82 m<",
		">0.00 m<", ">0.60 m<", ">3.00 m<", ">continues downward<", ">soil and rock<"} {
		if !strings.Contains(svg, want) {
			t.Errorf("ground cross-section lacks %q", want)
		}
	}
	if len(f.Notes) == 0 || !strings.Contains(strings.Join(f.Notes, " "), "half-space") {
		t.Errorf("no note on the half-space: %v", f.Notes)
	}
	// The frost line lies in the second layer (0.82 m is below the first
	// layer's 0.6 m bottom).
	rects := layerRects(t, svg)
	m := regexp.MustCompile(`<path d="M[-0-9.]+ ([-0-9.]+)h[0-9.]+" stroke="#0072B2"`).FindStringSubmatch(svg)
	if m == nil {
		t.Fatal("no frost line")
	}
	y, _ := strconv.ParseFloat(m[1], 64)
	if y <= rects[1][1] || y >= rects[1][1]+rects[1][3] {
		t.Errorf("frost line at y %.1f is not inside the second layer (%.1f to %.1f)", y, rects[1][1], rects[1][1]+rects[1][3])
	}
	// Families: library keys give their family, unknown inline layers a
	// neutral tint.
	w := wallFixture()
	_, of := usedFamilies(w.Kind, w.Layers)
	if want := []string{"masonry", "insulation", "", ""}; strings.Join(of, ",") != strings.Join(want, ",") {
		t.Errorf("families %q, want %q", of, want)
	}
}

// TestFamilyOfLayer: the drawing takes the family the run reports (a mixed
// layer's largest part, a custom layer's family key) before the library's,
// and "soil" or "not known" only when the run gives none.
func TestFamilyOfLayer(t *testing.T) {
	tests := []struct {
		kind results.Kind
		l    results.Layer
		want string
	}{
		{results.Wall, results.Layer{Name: "studs and wool", Family: layers.FamilyInsulation}, layers.FamilyInsulation},
		{results.Wall, results.Layer{Material: "clay-brick"}, layers.FamilyMasonry},
		{results.Wall, results.Layer{Material: "clay-brick", Family: layers.FamilyTimber}, layers.FamilyTimber},
		{results.Wall, results.Layer{Name: "custom"}, ""},
		{results.Wall, results.Layer{Name: "odd", Family: "no-such-family"}, ""},
		{results.Ground, results.Layer{Name: "silt"}, "soil"},
	}
	for _, tc := range tests {
		if got := family(tc.kind, tc.l); got != tc.want {
			t.Errorf("family(%v, %+v) = %q, want %q", tc.kind, tc.l, got, tc.want)
		}
	}
}
