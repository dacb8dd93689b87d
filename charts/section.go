package charts

import (
	"fmt"
	"html"
	"html/template"
	"math"
	"sort"
	"strings"

	"tempstack/layers"
	"tempstack/scenarios/results"
)

// The cross-section is an inline SVG drawn here, not a chart: the layers
// of the construction or soil column to scale, each tinted and hatched by
// its material family, named with its thickness. A wall is drawn
// horizontally (outside on the left), a roof, a floor and a ground column
// vertically (ground: surface on top, depth pointing down, with the probes
// and the simulated maximum frost depth marked).
//
// Every string from the results is escaped with html.EscapeString before
// it enters the SVG (text content and attribute values alike); numbers
// are formatted here. Pattern ids carry the prefix "ts-" and the page
// holds one cross-section, so they are unique.

// Drawing sizes in SVG user units (CSS pixels at full width).
const (
	svgWidth = 880
	// minLayerPx is the smallest drawn thickness of a layer: thinner
	// layers are drawn this thick, wider than to scale, and marked.
	minLayerPx = 8.0
	// charPx estimates the width of one character of 12 px text.
	charPx = 6.4
	// maxNameRunes is the longest layer name drawn in full; longer names
	// are shortened with an ellipsis (the full name is in the tooltip and
	// the layer table).
	maxNameRunes = 44
)

// figure is a drawn (non-chart) figure of the report.
type figure struct {
	SVG     template.HTML
	Caption string
	Notes   []string
}

// familyStyle is how one material family is drawn: a light tint, the ink
// of its hatching and the hatching itself (SVG markup inside an 8 × 8
// pattern tile; empty for a plain tint).
type familyStyle struct {
	label, fill, ink, hatch string
}

// familyStyles: light tints from the report palette (Okabe–Ito hues,
// lightened) so the text on them stays readable, each family also told
// apart by its hatching, so colour is never the only cue.
var familyStyles = map[string]familyStyle{
	layers.FamilyConcrete:   {"concrete", "#DADADA", "#555555", `<circle cx="2" cy="2" r="0.9"/><circle cx="6" cy="5.5" r="0.7"/><path d="M4.5 1.5l1.2 2h-2.4z"/>`},
	layers.FamilyMasonry:    {"masonry", "#F3CDB3", "#A34700", `<path d="M-1 1l2-2M0 8l8-8M7 9l2-2" stroke-width="0.9" fill="none"/>`},
	layers.FamilyStone:      {"stone", "#D5DDE6", "#46576B", `<path d="M0 8l8-8M0 0l8 8" stroke-width="0.6" fill="none"/>`},
	layers.FamilyPlaster:    {"plaster and render", "#F7F0CC", "#7A6A00", `<circle cx="2" cy="3" r="0.6"/><circle cx="6" cy="7" r="0.6"/>`},
	layers.FamilyBoard:      {"board", "#F2DDB5", "#8A5A00", `<path d="M0 2h8M0 6h8" stroke-width="0.6" fill="none"/>`},
	layers.FamilyTimber:     {"timber", "#E8C99E", "#7A4A12", `<path d="M0 4q2-2 4 0t4 0" stroke-width="0.8" fill="none"/>`},
	layers.FamilyInsulation: {"insulation", "#D6EBF8", "#0072B2", `<path d="M0 8l2-8 2 8 2-8 2 8" stroke-width="0.8" fill="none"/>`},
	layers.FamilyMetal:      {"metal", "#A9B2BC", "#3D4650", ""},
	layers.FamilyGlass:      {"glass", "#EAF6FC", "#56B4E9", `<path d="M0 8l8-8" stroke-width="0.5" fill="none"/>`},
	layers.FamilyLiquid:     {"liquid", "#BCDDF2", "#0072B2", `<path d="M0 4q2-1.5 4 0t4 0" stroke-width="0.6" fill="none"/>`},
	layers.FamilyAir:        {"air layer", "#FFFFFF", "#7C929E", ""},
	"soil":                  {"soil and rock", "#E7DCBC", "#6B5A2E", `<circle cx="1.5" cy="2" r="0.8"/><circle cx="5.5" cy="6" r="0.6"/><path d="M4 2.5h2.5M0.5 6.5h2" stroke-width="0.6" fill="none"/>`},
	layers.FamilyOther:      {"other", "#E5E9EC", "#506D7D", `<path d="M0 4h1.5M4 0v1.5" stroke-width="0.6" fill="none"/>`},
	"":                      {"family not known", "#EAEDEF", "#7C929E", ""},
}

// familyOrderDrawn is the order of the legend.
var familyOrderDrawn = []string{
	layers.FamilyConcrete, layers.FamilyMasonry, layers.FamilyStone, layers.FamilyPlaster, layers.FamilyBoard,
	layers.FamilyTimber, layers.FamilyInsulation, layers.FamilyMetal, layers.FamilyGlass, layers.FamilyLiquid,
	layers.FamilyAir, "soil", layers.FamilyOther, "",
}

// family returns the material family of a layer: the family the run
// reports (a library material's, a custom layer's family key, a mixed
// layer's largest part's), else the library family of its material key,
// "soil" for a ground layer that is not a library material (soil blocks
// and ground presets), "" when not known (a building layer given by
// inline properties without a family).
func family(kind results.Kind, l results.Layer) string {
	if _, ok := familyStyles[l.Family]; ok && l.Family != "" {
		return l.Family
	}
	if m, ok := layers.Lookup(l.Material); ok && l.Material != "" {
		return m.Family
	}
	if kind == results.Ground {
		return "soil"
	}
	return ""
}

// esc escapes s for SVG text content and attribute values.
func esc(s string) string { return html.EscapeString(s) }

// shorten cuts a name longer than n runes, ending it with an ellipsis.
func shorten(s string, n int) string {
	r := []rune(s)
	if len(r) <= n {
		return s
	}
	return strings.TrimSpace(string(r[:n-1])) + "…"
}

// svgNum formats a coordinate with at most one decimal.
func svgNum(v float64) string { return trimZeros(strings.Replace(fixed(v, 1), "−", "-", 1)) }

// thicknessText formats a thickness for the drawing: millimetres for a
// building layer, metres for a ground layer.
func thicknessText(kind results.Kind, m float64) string {
	if !(m > 0) || !finite(m) {
		return "thickness not given"
	}
	if kind == results.Ground {
		return trimZeros(sig(m, 3)) + " m"
	}
	return trimZeros(sig(m*1000, 3)) + " mm"
}

// span is one layer as drawn: its offset and drawn size along the stack.
type span struct {
	at, size  float64
	widened   bool // drawn at minLayerPx, wider than to scale
	broken    bool // shortened with a break mark (deep last ground layer)
	halfSpace bool // no thickness: a half-space below the column
}

// layout places the layers along a stack of length total px. Every layer
// is drawn at least minLayerPx thick; the rest keep one common scale. A
// last layer without thickness (a half-space) gets a fifth of the length.
func layout(ls []results.Layer, total float64) []span {
	n := len(ls)
	sp := make([]span, n)
	if n == 0 {
		return sp
	}
	th := make([]float64, n)
	for i, l := range ls {
		if l.Thickness_m > 0 && finite(l.Thickness_m) {
			th[i] = l.Thickness_m
		}
	}
	avail := total
	fixedPx := make([]float64, n) // drawn sizes not set by the scale
	last := n - 1
	if th[last] == 0 && n > 1 {
		sp[last].halfSpace = true
		fixedPx[last] = total / 5
		avail -= fixedPx[last]
	}
	for i := range th {
		if th[i] == 0 && fixedPx[i] == 0 {
			fixedPx[i] = minLayerPx
			sp[i].widened = true
			avail -= minLayerPx
		}
	}
	// Widen thin layers until the scale of the others settles.
	for iter := 0; iter < n; iter++ {
		rest := 0.0
		for i := range th {
			if fixedPx[i] == 0 {
				rest += th[i]
			}
		}
		if rest <= 0 {
			break
		}
		s := avail / rest
		changed := false
		for i := range th {
			if fixedPx[i] == 0 && th[i]*s < minLayerPx {
				fixedPx[i] = minLayerPx
				sp[i].widened = true
				avail -= minLayerPx
				changed = true
			}
		}
		if !changed {
			for i := range th {
				if fixedPx[i] == 0 {
					sp[i].size = th[i] * s
				}
			}
			break
		}
	}
	at := 0.0
	for i := range sp {
		if fixedPx[i] > 0 {
			sp[i].size = fixedPx[i]
		}
		sp[i].at = at
		at += sp[i].size
	}
	// Rounding and all-thin stacks: stretch to the full length.
	if at > 0 && math.Abs(at-total) > 1e-9 {
		f := total / at
		for i := range sp {
			sp[i].at *= f
			sp[i].size *= f
		}
	}
	return sp
}

// depthScale maps depth below the surface (m) to drawn position (px
// along the stack), piecewise linearly through knots. Above cut the
// drawing is to one scale (thin layers widened); below it, when cut > 0,
// the rest of the column is compressed behind a break mark.
type depthScale struct {
	z, px []float64
	cut   float64
}

// at returns the drawn position of depth z, clamped to the column.
func (d depthScale) at(z float64) float64 {
	n := len(d.z)
	if n == 0 {
		return 0
	}
	if z <= d.z[0] {
		return d.px[0]
	}
	for i := 1; i < n; i++ {
		if z <= d.z[i] {
			f := (z - d.z[i-1]) / (d.z[i] - d.z[i-1])
			return d.px[i-1] + f*(d.px[i]-d.px[i-1])
		}
	}
	return d.px[n-1]
}

// interestDepth is the depth a ground drawing must show to scale: the
// deepest probe, simulated frost depth or closed-form estimate, with a
// margin of 30 %; 0 when there is none.
func interestDepth(r *results.Results) float64 {
	d := 0.0
	for _, z := range probeDepths(r) {
		d = math.Max(d, z)
	}
	if f := r.Frost; f != nil {
		for _, z := range []*float64{f.MaxFrostDepth_m, f.StefanDepth_m, f.ModifiedBerggrenDepth_m} {
			if z != nil && finite(*z) {
				d = math.Max(d, *z)
			}
		}
	}
	return 1.3 * d
}

// groundLayout places the layers of a ground column along length px.
// When the column reaches more than 1.6 times the depth of interest, the
// top down to that depth takes 78 % of the length to one scale and the
// rest is compressed below a break; otherwise the whole column is to one
// scale. Layers thinner than minLayerPx are widened either way. A
// half-space at the bottom is drawn down to 1.5 times the depth of
// interest (at least 1 m below the last boundary).
func groundLayout(ls []results.Layer, length, interest float64) ([]span, depthScale) {
	sp := make([]span, len(ls))
	bounds := groundBounds(ls, sp, interest)
	cut := 0.0
	if end := bounds[len(ls)]; interest > 0 && end > 1.6*interest {
		cut = interest
	}
	knots := depthKnots(bounds, cut)
	px, wide := knotPixels(knots, cut, length)
	scale := depthScale{z: knots, px: px, cut: cut}
	for i := range ls {
		a, b := scale.at(bounds[i]), scale.at(bounds[i+1])
		sp[i].at, sp[i].size = a, b-a
		for k := 1; k < len(knots); k++ {
			if knots[k-1] >= bounds[i] && knots[k] <= bounds[i+1] && wide[k-1] {
				sp[i].widened = true
			}
		}
		if cut > 0 && cut > bounds[i] && cut < bounds[i+1] {
			sp[i].broken = true
		}
	}
	return sp, scale
}

// groundBounds returns the depths in m of the boundaries of the layers
// ls, from 0 at the surface (len(ls)+1 values). A last layer without a
// finite positive thickness below other layers is a half-space: it is
// marked in sp and drawn down to 1.5 times the depth of interest, at
// least 1 m below the boundary above it. Any other such layer is drawn
// with no thickness.
func groundBounds(ls []results.Layer, sp []span, interest float64) []float64 {
	n := len(ls)
	bounds := []float64{0}
	for i, l := range ls {
		t := l.Thickness_m
		if !(t > 0) || !finite(t) {
			if i == n-1 && n > 1 {
				sp[i].halfSpace = true
				last := bounds[len(bounds)-1]
				t = math.Max(1.5*interest, last+1) - last
			} else {
				t = 0
			}
		}
		bounds = append(bounds, bounds[len(bounds)-1]+t)
	}
	return bounds
}

// depthKnots are the depths in m between which the drawing is laid out:
// the layer boundaries bounds, without repeats of a depth below the
// surface, and the cut (when positive) between the boundaries around it.
func depthKnots(bounds []float64, cut float64) []float64 {
	var knots []float64
	for _, z := range bounds {
		if cut > 0 && z > cut && (len(knots) == 0 || knots[len(knots)-1] < cut) {
			knots = append(knots, cut)
		}
		if len(knots) == 0 || z > knots[len(knots)-1] || z == 0 {
			knots = append(knots, z)
		}
	}
	return knots
}

// knotPixels places the knots along length px: the intervals above the
// cut take 78 % of the length and those below it 22 % when there is a
// cut (cut > 0), else the intervals share the whole length; each part is
// laid out by layout. It returns the position of each knot and whether
// each interval was widened.
func knotPixels(knots []float64, cut, length float64) (px []float64, wide []bool) {
	upLen, downLen := length, 0.0
	if cut > 0 {
		upLen, downLen = 0.78*length, 0.22*length
	}
	var up, down []results.Layer
	for i := 1; i < len(knots); i++ {
		iv := results.Layer{Thickness_m: knots[i] - knots[i-1]}
		if cut > 0 && knots[i] > cut {
			down = append(down, iv)
		} else {
			up = append(up, iv)
		}
	}
	px = []float64{0}
	wide = make([]bool, 0, len(knots))
	for _, part := range []struct {
		ivs []results.Layer
		len float64
	}{{up, upLen}, {down, downLen}} {
		if len(part.ivs) == 0 {
			continue
		}
		base := px[len(px)-1]
		for _, s := range layout(part.ivs, part.len) {
			px = append(px, base+s.at+s.size)
			wide = append(wide, s.widened)
		}
	}
	return px, wide
}

// svgWriter collects SVG markup. idp prefixes the ids of its hatching
// patterns, so that two drawings on one page never share an id.
type svgWriter struct {
	strings.Builder
	idp string
}

func (w *svgWriter) f(format string, a ...any) { fmt.Fprintf(&w.Builder, format, a...) }

// text writes one text element; s is escaped here.
func (w *svgWriter) text(x, y float64, anchor, class, s string) {
	w.f(`<text x="%s" y="%s" text-anchor="%s" class="%s">%s</text>`, svgNum(x), svgNum(y), anchor, class, esc(s))
}

// patterns writes the defs for the families in use.
func (w *svgWriter) patterns(fams []string, rotate bool) {
	w.f(`<defs>`)
	for _, f := range fams {
		st := familyStyles[f]
		if st.hatch == "" {
			continue
		}
		tr := ""
		if rotate {
			tr = ` patternTransform="rotate(90)"`
		}
		w.f(`<pattern id="%s%s" width="8" height="8" patternUnits="userSpaceOnUse"%s><rect width="8" height="8" fill="%s"/><g fill="%s" stroke="%s">%s</g></pattern>`,
			w.prefix(), famID(f), tr, st.fill, st.ink, st.ink, st.hatch)
	}
	w.f(`</defs>`)
}

// famID is the id suffix of a family's pattern.
func famID(f string) string {
	if f == "" {
		return "unknown"
	}
	return f
}

// prefix is the id prefix of the writer's patterns.
func (w *svgWriter) prefix() string {
	if w.idp == "" {
		return "ts-fam-"
	}
	return w.idp
}

// fill returns the fill of a family: its pattern, or its plain tint.
func (w *svgWriter) fill(f string) string {
	if familyStyles[f].hatch == "" {
		return familyStyles[f].fill
	}
	return "url(#" + w.prefix() + famID(f) + ")"
}

// usedFamilies lists the families of ls in legend order, and the family
// of each layer.
func usedFamilies(kind results.Kind, ls []results.Layer) (used []string, of []string) {
	seen := map[string]bool{}
	for _, l := range ls {
		f := family(kind, l)
		if _, ok := familyStyles[f]; !ok {
			f = layers.FamilyOther
		}
		of = append(of, f)
		seen[f] = true
	}
	for _, f := range familyOrderDrawn {
		if seen[f] {
			used = append(used, f)
		}
	}
	return used, of
}

// legend draws one swatch per family in use, left to right from x at y;
// it returns the height used.
func (w *svgWriter) legend(used []string, x, y, right float64) float64 {
	cx, cy := x, y
	for _, f := range used {
		st := familyStyles[f]
		wd := 14 + 6 + charPx*float64(len([]rune(st.label))) + 18
		if cx+wd > right && cx > x {
			cx = x
			cy += 20
		}
		dash := ""
		if f == layers.FamilyAir || f == "" {
			dash = ` stroke-dasharray="3 2"`
		}
		w.f(`<rect x="%s" y="%s" width="14" height="14" fill="%s" stroke="#506D7D" stroke-width="0.8"%s/>`, svgNum(cx), svgNum(cy-11), w.fill(f), dash)
		w.text(cx+20, cy, "start", "lg", st.label)
		cx += wd
	}
	return cy - y + 20
}

// crossSection draws the layers of r as an inline SVG figure, or returns
// nil when there are no layers.
func crossSection(r *results.Results) *figure {
	if len(r.Layers) == 0 {
		return nil
	}
	switch {
	case r.Kind == results.Ground:
		return verticalSection(r, "ground")
	case r.Orientation == "roof" || r.Orientation == "floor":
		return verticalSection(r, r.Orientation)
	default:
		return wallSection(r)
	}
}

// layerLabel is the name of a layer as drawn.
func layerLabel(i int, l results.Layer) string {
	name := l.Name
	if strings.TrimSpace(name) == "" {
		name = l.Material
	}
	if strings.TrimSpace(name) == "" {
		name = "layer"
	}
	return fmt.Sprintf("%d  %s", i+1, shorten(name, maxNameRunes))
}

// layerTitle is the tooltip of a layer: full name, material and thickness.
func layerTitle(kind results.Kind, i int, l results.Layer, fam string) string {
	s := fmt.Sprintf("%d %s", i+1, l.Name)
	if l.Material != "" {
		s += " (" + l.Material + ")"
	}
	return s + ", " + thicknessText(kind, l.Thickness_m) + ", " + familyStyles[fam].label
}

// drawLayer draws one layer rectangle with its tooltip.
func (w *svgWriter) drawLayer(x, y, wd, ht float64, fam, title string) {
	dash := ""
	if fam == layers.FamilyAir || fam == "" {
		dash = ` stroke-dasharray="3 2"`
	}
	w.f(`<rect x="%s" y="%s" width="%s" height="%s" fill="%s" stroke="#506D7D" stroke-width="0.8"%s><title>%s</title></rect>`,
		svgNum(x), svgNum(y), svgNum(wd), svgNum(ht), w.fill(fam), dash, esc(title))
}

// sectionNotes returns the notes on what is not to scale.
func sectionNotes(kind results.Kind, sp []span) []string {
	var notes []string
	widened, broken, half := false, false, false
	for _, s := range sp {
		widened = widened || s.widened
		broken = broken || s.broken
		half = half || s.halfSpace
	}
	if widened {
		notes = append(notes, fmt.Sprintf("Layers marked * are thinner than can be drawn to scale and are drawn %g px thick.", minLayerPx))
	}
	if broken {
		notes = append(notes, "Below the break mark (≈) the column is drawn compressed, not to scale; depths are written at each boundary, at the break and at each mark.")
	}
	if half {
		notes = append(notes, "The last layer continues downward without end (half-space).")
	}
	return notes
}

// wallSection draws a wall horizontally: outside on the left, inside on
// the right, each layer named in its own row below with a leader line.
func wallSection(r *results.Results) *figure {
	const (
		left, right = 110.0, 110.0
		top         = 58.0
		slabH       = 150.0
		rowH        = 19.0
	)
	ls := r.Layers
	length := svgWidth - left - right
	sp := layout(ls, length)
	used, of := usedFamilies(r.Kind, ls)
	rowsTop := top + slabH + 26
	legendY := rowsTop + rowH*float64(len(ls)) + 18
	var body svgWriter
	// Total thickness dimension above the slab.
	total := 0.0
	for _, l := range ls {
		if l.Thickness_m > 0 && finite(l.Thickness_m) {
			total += l.Thickness_m
		}
	}
	body.f(`<path d="M%s %sv10M%s %sv10M%s %sH%s" class="dim"/>`, svgNum(left), svgNum(top-26), svgNum(left+length), svgNum(top-26), svgNum(left), svgNum(top-21), svgNum(left+length))
	body.text(left+length/2, top-28, "middle", "dt", "total "+thicknessText("wall", total))
	light := shaded(of)
	for i, l := range ls {
		x := left + sp[i].at
		body.drawLayer(x, top, sp[i].size, slabH, of[i], layerTitle(r.Kind, i, l, of[i]))
		if light[i] {
			body.lighten(x, top, sp[i].size, slabH)
		}
	}
	// Sides.
	out, in := "Outside", "Inside"
	body.text(left/2, top+slabH/2-4, "middle", "side", out)
	body.text(svgWidth-right/2, top+slabH/2-4, "middle", "side", in)
	if v := r.Steady.OutsideSurfaceResistance; v > 0 {
		body.text(left/2, top+slabH/2+14, "middle", "sm", "Rse "+trimZeros(sig(v, 3))+" m²·K/W")
	}
	if v := r.Steady.InsideSurfaceResistance; v > 0 {
		body.text(svgWidth-right/2, top+slabH/2+14, "middle", "sm", "Rsi "+trimZeros(sig(v, 3))+" m²·K/W")
	}
	// Callouts: one row per layer, a leader from the middle of the layer.
	for i, l := range ls {
		cx := left + sp[i].at + sp[i].size/2
		y := rowsTop + rowH*float64(i)
		body.f(`<path d="M%s %sV%s" class="lead"/><circle cx="%s" cy="%s" r="2" class="dot"/>`, svgNum(cx), svgNum(top+slabH-6), svgNum(y-4), svgNum(cx), svgNum(top+slabH-6))
		label := layerLabel(i, l) + " · " + thicknessText(r.Kind, l.Thickness_m)
		if sp[i].widened {
			label += " *"
		}
		wd := charPx * float64(len([]rune(label)))
		if cx+8+wd <= svgWidth-6 {
			body.f(`<path d="M%s %sh5" class="lead"/>`, svgNum(cx), svgNum(y-4))
			body.text(cx+8, y, "start", "nm", label)
		} else {
			body.f(`<path d="M%s %sh-5" class="lead"/>`, svgNum(cx), svgNum(y-4))
			body.text(cx-8, y, "end", "nm", label)
		}
	}
	h := legendY + body.legendHeight(used, left, svgWidth-10)
	var w svgWriter
	w.open(0, svgWidth, h, "Cross-section of the construction, outside on the left", false)
	w.patterns(used, true)
	w.WriteString(body.String())
	w.legend(used, left, legendY, svgWidth-10)
	w.f(`</svg>`)
	cap := "Cross-section, to scale across the construction: outside on the left, inside on the right. Tint and hatching show the material family."
	return &figure{SVG: template.HTML(w.String()), Caption: cap, Notes: sectionNotes(r.Kind, sp)}
}

// legendHeight is the height the legend of used will take between x and
// right.
func (w *svgWriter) legendHeight(used []string, x, right float64) float64 {
	var scratch svgWriter
	return scratch.legend(used, x, 0, right) + 4
}

// open writes the svg start tag with the shared styles for a viewBox
// from x0 to x1 and 0 to h. A vertical stack (class "xsec-v") carries its
// natural width, so that it is drawn at full size rather than stretched
// to the text width; a horizontal one (class "xsec") fills the width.
func (w *svgWriter) open(x0, x1, h float64, label string, vertical bool) {
	if vertical {
		w.f(`<svg class="xsec xsec-v" width="%s" height="%s" viewBox="%s 0 %s %s" role="img" aria-label="%s">`,
			svgNum(x1-x0), svgNum(h), svgNum(x0), svgNum(x1-x0), svgNum(h), esc(label))
	} else {
		w.f(`<svg class="xsec" viewBox="%s 0 %s %s" role="img" aria-label="%s">`, svgNum(x0), svgNum(x1-x0), svgNum(h), esc(label))
	}
	w.f(`<style>.xsec text{font-family:%s;fill:#182126}.xsec .nm{font-size:12px}.xsec .sm{font-size:11px;fill:#506D7D}.xsec .lg{font-size:12px;fill:#506D7D}.xsec .side{font-size:13px;font-weight:600}.xsec .dt{font-size:12px;fill:#506D7D}.xsec .mk{font-size:11px;paint-order:stroke;stroke:#fff;stroke-width:3px;stroke-linejoin:round}.xsec .dim,.xsec .lead{stroke:#506D7D;stroke-width:0.8;fill:none}.xsec .dot{fill:#506D7D}.xsec .frost{fill:#0072B2}</style>`,
		esc(fontStack))
}

// verticalSection draws a roof, a floor or a ground column as a vertical
// stack. Roof: outside on top. Floor: inside on top (the layers, listed
// outside first, are drawn from the bottom up). Ground: surface on top,
// depth axis pointing down with the depth of every boundary, the probes
// and the simulated maximum frost depth.
func verticalSection(r *results.Results, what string) *figure {
	const (
		stackX, stackW = 200.0, 220.0
		top            = 44.0
		labelX         = stackX + stackW + 46
		lineH          = 15.0
	)
	ground := what == "ground"
	length := 300.0
	if ground {
		length = 320
	}
	ls := r.Layers
	n := len(ls)
	order := make([]int, n) // drawing order, top first
	for i := range order {
		order[i] = i
		if what == "floor" {
			order[i] = n - 1 - i
		}
	}
	drawn := make([]results.Layer, n)
	for k, i := range order {
		drawn[k] = ls[i]
	}
	var sp []span
	var scale depthScale
	if ground {
		sp, scale = groundLayout(drawn, length, interestDepth(r))
	} else {
		sp = layout(drawn, length)
	}
	used, ofDrawn := usedFamilies(r.Kind, drawn)
	var body svgWriter
	light := shaded(ofDrawn)
	for k, i := range order {
		s := sp[k]
		body.drawLayer(stackX, top+s.at, stackW, s.size, ofDrawn[k], layerTitle(r.Kind, i, ls[i], ofDrawn[k]))
		if light[k] {
			body.lighten(stackX, top+s.at, stackW, s.size)
		}
		if s.halfSpace {
			// Fade out: no bottom edge.
			y := top + s.at + s.size
			body.f(`<path d="M%s %sh%s" stroke="#fff" stroke-width="2"/>`, svgNum(stackX-1), svgNum(y), svgNum(stackW+2))
			body.text(stackX+stackW/2, y-6, "middle", "mk", "continues downward")
		}
	}
	// Labels on the right, pushed apart so that they never overlap.
	want := make([]float64, n)
	for k := range order {
		want[k] = top + sp[k].at + sp[k].size/2
	}
	got := spread(want, 2*lineH+4, top+8, top+length+30)
	right := labelX + 200.0
	for k, i := range order {
		l := ls[i]
		yl := got[k]
		body.f(`<path d="M%s %sh16L%s %sh8" class="lead"/>`, svgNum(stackX+stackW), svgNum(want[k]), svgNum(labelX-10), svgNum(yl-4))
		name := layerLabel(i, l)
		if sp[k].widened {
			name += " *"
		}
		sub := thicknessText(r.Kind, l.Thickness_m) + " · " + familyStyles[ofDrawn[k]].label
		body.text(labelX, yl, "start", "nm", name)
		body.text(labelX+18, yl+lineH, "start", "sm", sub)
		right = math.Max(right, math.Max(labelX+charPx*float64(len([]rune(name))), labelX+18+0.92*charPx*float64(len([]rune(sub)))))
	}
	// Sides.
	topSide, bottomSide := "Outside", "Inside"
	switch what {
	case "floor":
		topSide, bottomSide = "Inside", "Outside"
	case "ground":
		topSide, bottomSide = "Ground surface", ""
	}
	body.text(stackX+stackW/2, top-12, "middle", "side", topSide)
	if bottomSide != "" {
		body.text(stackX+stackW/2, top+length+20, "middle", "side", bottomSide)
	}
	if ground {
		body.f(`<path d="M%s %sh%s" stroke="#182126" stroke-width="2"/>`, svgNum(stackX-10), svgNum(top), svgNum(stackW+20))
		if scale.cut > 0 {
			y := top + scale.at(scale.cut)
			body.breakMark(stackX, y+math.Min(12, (top+length-y)/3), stackW)
		}
		groundMarks(&body, r, drawn, sp, scale, stackX, stackW, top, length)
	} else {
		// Depth of each boundary from the outside on the left.
		rse, rsi := r.Steady.OutsideSurfaceResistance, r.Steady.InsideSurfaceResistance
		if what == "floor" {
			rse, rsi = rsi, rse
		}
		topR, botR := "Rse", "Rsi"
		if what == "floor" {
			topR, botR = "Rsi", "Rse"
		}
		if rse > 0 {
			body.text(stackX-14, top+12, "end", "sm", topR+" "+trimZeros(sig(rse, 3))+" m²·K/W")
		}
		if rsi > 0 {
			body.text(stackX-14, top+length-4, "end", "sm", botR+" "+trimZeros(sig(rsi, 3))+" m²·K/W")
		}
	}
	legendY := math.Max(top+length+44, got[n-1]+lineH+28)
	const left = 70.0
	right += 12
	h := legendY + body.legendHeight(used, left+40, right)
	var w svgWriter
	label := map[string]string{
		"ground": "Cross-section of the soil column, surface on top, depth pointing down",
		"roof":   "Cross-section of the roof, outside on top",
		"floor":  "Cross-section of the floor, inside on top",
	}[what]
	w.open(left, right, h, label, true)
	w.patterns(used, false)
	w.WriteString(body.String())
	w.legend(used, left+40, legendY, right)
	w.f(`</svg>`)
	cap := map[string]string{
		"ground": "Soil column from the surface down, depth written at each layer boundary; the probes and the simulated maximum frost depth are marked. Tint and hatching show the material family.",
		"roof":   "Cross-section of the roof, to scale: outside on top, inside below. Tint and hatching show the material family.",
		"floor":  "Cross-section of the floor, to scale: inside on top, outside below. Tint and hatching show the material family.",
	}[what]
	return &figure{SVG: template.HTML(w.String()), Caption: cap, Notes: sectionNotes(r.Kind, sp)}
}

// breakMark draws a break across a shortened layer at y: a white strip
// with zigzag edges, the usual drawing sign for "not to scale here".
func (w *svgWriter) breakMark(x, y, wd float64) {
	var top, bot []string
	k := 0
	for px := x - 6; px <= x+wd+6+1e-9; px += 8 {
		d := 3.0
		if k%2 == 1 {
			d = -3
		}
		top = append(top, svgNum(px)+" "+svgNum(y-5+d))
		bot = append([]string{svgNum(px) + " " + svgNum(y+5+d)}, bot...)
		k++
	}
	w.f(`<path d="M%sL%sZ" fill="#fff" stroke="none"/><path d="M%s" class="dim"/><path d="M%s" class="dim"/>`,
		strings.Join(top, "L"), strings.Join(bot, "L"), strings.Join(top, "L"), strings.Join(bot, "L"))
}

// shaded marks the layers to draw lighter: the second of two neighbours
// of the same family, so that their boundary stays visible.
func shaded(of []string) []bool {
	out := make([]bool, len(of))
	for i := 1; i < len(of); i++ {
		out[i] = of[i] == of[i-1] && !out[i-1]
	}
	return out
}

// lighten draws a translucent white veil over a layer.
func (w *svgWriter) lighten(x, y, wd, ht float64) {
	w.f(`<rect x="%s" y="%s" width="%s" height="%s" fill="#fff" fill-opacity="0.45" stroke="none"/>`, svgNum(x), svgNum(y), svgNum(wd), svgNum(ht))
}

// groundMarks draws the depth axis (the depth of every boundary), the
// probes and the simulated maximum frost depth of a ground column.
func groundMarks(w *svgWriter, r *results.Results, ls []results.Layer, sp []span, scale depthScale, x, wd, top, length float64) {
	axisX := x - 40
	w.f(`<path d="M%s %sV%s" class="dim"/><path d="M%s %sl-4 -8h8z" class="dot"/>`,
		svgNum(axisX), svgNum(top), svgNum(top+length+8), svgNum(axisX), svgNum(top+length+14))
	w.text(axisX-8, top+length+14, "end", "sm", "depth")
	// Boundary depths (and the depth where the scale changes), pushed
	// apart.
	var zs, want []float64
	z := 0.0
	zs, want = append(zs, 0), append(want, top)
	for i, l := range ls {
		if !(l.Thickness_m > 0) || !finite(l.Thickness_m) {
			break
		}
		if c := scale.cut; c > z && c < z+l.Thickness_m {
			zs, want = append(zs, c), append(want, top+scale.at(c))
		}
		z += l.Thickness_m
		zs, want = append(zs, z), append(want, top+sp[i].at+sp[i].size)
	}
	got := spread(want, 13, top-4, top+length+4)
	for k := range zs {
		w.f(`<path d="M%s %sh8" class="dim"/>`, svgNum(axisX-4), svgNum(want[k]))
		w.text(axisX-8, got[k]+4, "end", "sm", depthText(zs[k]))
	}
	// Marks across the stack: probes (a green dot on the left) and the
	// simulated maximum frost depth (a blue dashed line); their labels
	// sit in one column inside the stack, pushed apart.
	type mark struct {
		y     float64
		label string
		frost bool
	}
	var marks []mark
	for _, p := range probeDepths(r) {
		marks = append(marks, mark{top + scale.at(p), "probe " + depthText(p), false})
	}
	if f := r.Frost; f != nil && f.MaxFrostDepth_m != nil && *f.MaxFrostDepth_m > 0 && finite(*f.MaxFrostDepth_m) {
		marks = append(marks, mark{top + scale.at(*f.MaxFrostDepth_m), "simulated max frost depth " + depthText(*f.MaxFrostDepth_m), true})
	}
	sort.SliceStable(marks, func(i, j int) bool { return marks[i].y < marks[j].y })
	ys := make([]float64, len(marks))
	for i, m := range marks {
		ys[i] = m.y
	}
	ly := spread(ys, 14, top+6, top+length-4)
	for i, m := range marks {
		if m.frost {
			w.f(`<path d="M%s %sh%s" stroke="#0072B2" stroke-width="2" stroke-dasharray="6 3"/>`, svgNum(x-6), svgNum(m.y), svgNum(wd+12))
			w.f(`<path d="M%s %sL%s %s" class="lead"/>`, svgNum(x+16), svgNum(m.y), svgNum(x+20), svgNum(ly[i]-4))
			w.text(x+22, ly[i], "start", "mk frost", m.label)
			continue
		}
		w.f(`<path d="M%s %sh14" stroke="#009E73" stroke-width="2"/><circle cx="%s" cy="%s" r="3.5" fill="#009E73"/>`,
			svgNum(x), svgNum(m.y), svgNum(x+14), svgNum(m.y))
		w.text(x+22, ly[i]+4, "start", "mk", m.label)
	}
}

// depthText formats a depth in metres with two decimals.
func depthText(z float64) string { return fixed(z, 2) + " m" }

// probeDepths lists the probe depths of r (simulated, else exact).
func probeDepths(r *results.Results) []float64 {
	var z []float64
	if r.Simulation != nil {
		for _, p := range r.Simulation.Probes {
			z = append(z, p.Depth_m)
		}
	}
	if len(z) == 0 && r.Ground != nil && len(r.Ground.Periodic) > 0 {
		for _, p := range r.Ground.Periodic[0].Probes {
			z = append(z, p.Depth_m)
		}
	}
	return z
}

// spread moves label positions (sorted top to bottom) apart so that
// neighbours are at least gap apart, staying within [lo, hi] where it can;
// the result keeps the order.
func spread(want []float64, gap, lo, hi float64) []float64 {
	got := append([]float64(nil), want...)
	for i := range got {
		if i == 0 {
			got[i] = math.Max(got[i], lo)
		} else {
			got[i] = math.Max(got[i], got[i-1]+gap)
		}
	}
	for i := len(got) - 1; i >= 0; i-- {
		if i == len(got)-1 {
			got[i] = math.Min(got[i], hi)
		} else {
			got[i] = math.Min(got[i], got[i+1]-gap)
		}
	}
	return got
}
