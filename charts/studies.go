package charts

import (
	"fmt"
	"html/template"
	"math"
	"sort"
	"strconv"
	"strings"

	"tempstack/scenarios/results"
)

// Study results: options compared side by side (with a drawing of each
// build-up to one common scale), a one-parameter sweep, a target search,
// an uncertainty propagation and a diffusivity fit to logged
// temperatures.

// quantity is how a study quantity (a key of results.Summary) is shown:
// the label and digits results.Quantities declares with the quantity.
type quantity struct {
	key, label string
	format     func(float64) string
}

// quantities in display order (results.Quantities); keys not listed
// there are shown by key.
var quantities = func() []quantity {
	var out []quantity
	for _, q := range results.Quantities() {
		d := q.Decimals
		f := func(v float64) string { return sig(v, 3) }
		if d >= 0 {
			f = func(v float64) string { return fixed(v, d) }
		}
		out = append(out, quantity{q.Key, q.Label, f})
	}
	return out
}()

// nameUnit splits a label "Name (unit)" into a lower-case name for a
// sentence and " unit" (empty when the label has no unit).
func (q quantity) nameUnit() (string, string) {
	name, unit := q.label, ""
	if i := strings.LastIndex(name, " ("); i > 0 && strings.HasSuffix(name, ")") {
		name, unit = name[:i], " "+name[i+2:len(name)-1]
	}
	if r := []rune(name); len(r) > 1 && !strings.HasPrefix(name, "U-") {
		name = strings.ToLower(string(r[:1])) + string(r[1:])
	}
	return name, unit
}

// quantityOf returns the display of key.
func quantityOf(key string) quantity {
	for _, q := range quantities {
		if q.key == key {
			return q
		}
	}
	return quantity{key, key, func(v float64) string { return sig(v, 4) }}
}

// summaryKeys lists the quantity keys present in any of ss, known keys in
// display order first, then the others sorted.
func summaryKeys(ss ...results.Summary) []string {
	seen := map[string]bool{}
	for _, s := range ss {
		for k := range s {
			seen[k] = true
		}
	}
	var out []string
	for _, q := range quantities {
		if seen[q.key] {
			out = append(out, q.key)
			delete(seen, q.key)
		}
	}
	var rest []string
	for k := range seen {
		rest = append(rest, k)
	}
	sort.Strings(rest)
	return append(out, rest...)
}

// summaryCells formats the quantities of s in the order of keys.
func summaryCells(s results.Summary, keys []string) []string {
	var out []string
	for _, k := range keys {
		v, ok := s[k]
		if !ok {
			out = append(out, dash)
			continue
		}
		out = append(out, quantityOf(k).format(v))
	}
	return out
}

// variantsTable compares the options of a study.
func variantsTable(r *results.Results) *block {
	if len(r.Variants) == 0 {
		return nil
	}
	var ss []results.Summary
	for _, v := range r.Variants {
		ss = append(ss, v.Quantities)
	}
	keys := summaryKeys(ss...)
	head := []string{"Option", "Layers, outside first"}
	align := []string{"text", "text"}
	for _, k := range keys {
		head = append(head, quantityOf(k).label)
	}
	t := newTable("Options compared", head, align...)
	for _, v := range r.Variants {
		var ls []string
		for _, l := range v.Layers {
			ls = append(ls, thicknessText(r.Kind, l.Thickness_m)+" "+layerName(l))
		}
		t.row(append([]string{v.Name, strings.Join(ls, " · ")}, summaryCells(v.Quantities, keys)...)...)
	}
	t.Notes = append(t.Notes, "Every option is solved the same way as the base scenario; only the changes it names differ. Periodic quantities are for the first analysis period.")
	return &block{Table: t}
}

// layerName is the name a layer is listed under.
func layerName(l results.Layer) string {
	if strings.TrimSpace(l.Name) != "" {
		return l.Name
	}
	if l.Material != "" {
		return l.Material
	}
	return "layer"
}

// variantsFigure draws the build-up of every option as a horizontal strip,
// all to one common scale (outside on the left), with the headline
// quantities beside it.
func variantsFigure(r *results.Results) *figure {
	if len(r.Variants) == 0 || r.Kind == results.Ground {
		return nil
	}
	const (
		nameW       = 170.0
		stripX      = 180.0
		stripW      = 400.0
		rowH, barH  = 46.0, 26.0
		top         = 30.0
		minStripPx  = 3.0
		valuesX     = stripX + stripW + 62
		legendGapPx = 26.0
	)
	maxT := 0.0
	var all []results.Layer
	for _, v := range r.Variants {
		t := 0.0
		for _, l := range v.Layers {
			if l.Thickness_m > 0 && finite(l.Thickness_m) {
				t += l.Thickness_m
			}
		}
		maxT = math.Max(maxT, t)
		all = append(all, v.Layers...)
	}
	if !(maxT > 0) {
		return nil
	}
	scale := stripW / maxT
	used, _ := usedFamilies(r.Kind, all)
	body := svgWriter{idp: "ts-opt-"}
	body.text(stripX, top-12, "start", "sm", "outside")
	widened := false
	for i, v := range r.Variants {
		y := top + rowH*float64(i)
		body.text(nameW, y+barH/2+4, "end", "nm", shorten(v.Name, 26))
		x := stripX
		_, of := usedFamilies(r.Kind, v.Layers)
		light := shaded(of)
		for k, l := range v.Layers {
			wd := l.Thickness_m * scale
			if !(wd >= minStripPx) {
				wd = minStripPx
				widened = true
			}
			body.drawLayer(x, y, wd, barH, of[k], layerTitle(r.Kind, k, l, of[k]))
			if light[k] {
				body.lighten(x, y, wd, barH)
			}
			x += wd
		}
		total := 0.0
		for _, l := range v.Layers {
			if l.Thickness_m > 0 {
				total += l.Thickness_m
			}
		}
		body.text(x+6, y+barH/2+4, "start", "sm", thicknessText(r.Kind, total))
		var vals []string
		for _, k := range []string{"u_value_W_m2K", "decrement_factor", "time_shift_h"} {
			if q, ok := v.Quantities[k]; ok {
				name := map[string]string{"u_value_W_m2K": "U", "decrement_factor": "f", "time_shift_h": "shift"}[k]
				unit := map[string]string{"u_value_W_m2K": "", "decrement_factor": "", "time_shift_h": " h"}[k]
				vals = append(vals, name+" "+quantityOf(k).format(q)+unit)
			}
		}
		if len(vals) > 0 {
			body.text(valuesX, y+barH/2+4, "start", "nm", strings.Join(vals, " · "))
		}
	}
	legendY := top + rowH*float64(len(r.Variants)) + legendGapPx - 20
	h := legendY + body.legendHeight(used, stripX, svgWidth-10)
	w := svgWriter{idp: "ts-opt-"}
	w.open(0, svgWidth, h, "The options compared, each drawn to the same scale, outside on the left", false)
	w.patterns(used, true)
	w.WriteString(body.String())
	w.legend(used, stripX, legendY, svgWidth-10)
	w.f(`</svg>`)
	f := &figure{SVG: template.HTML(w.String()),
		Caption: "The options side by side, every build-up to the same scale (outside on the left), with the U-value (W/(m²·K)), the decrement factor f and the time shift of the first analysis period."}
	if widened {
		f.Notes = append(f.Notes, fmt.Sprintf("Layers thinner than %g px at this scale are drawn %g px wide.", minStripPx, minStripPx))
	}
	return f
}

// sweepTable lists the quantities at each value of a one-parameter sweep.
func sweepTable(r *results.Results) *block {
	s := r.Sweep
	if s == nil || len(s.Points) == 0 {
		return nil
	}
	var ss []results.Summary
	for _, p := range s.Points {
		ss = append(ss, p.Quantities)
	}
	keys := summaryKeys(ss...)
	label := paramWords(s.ParameterLabel, s.Parameter)
	head := []string{withUnit(upperFirst(label), s.Unit)}
	for _, k := range keys {
		head = append(head, quantityOf(k).label)
	}
	t := newTable("Sweep of the "+label, head, "text")
	for _, p := range s.Points {
		v := p.Text
		if v == "" {
			v = trimZeros(sig(p.Value, 4)) + " " + s.Unit
		}
		t.row(append([]string{v}, summaryCells(p.Quantities, keys)...)...)
	}
	t.Notes = append(t.Notes, "Each row is a full run of the scenario with only the "+label+" changed (parameter path "+s.Parameter+").")
	return &block{Table: t}
}

// targetBlock reports a target search and its scan.
func targetBlock(r *results.Results) []*block {
	tr := r.Target
	if tr == nil {
		return nil
	}
	q := quantityOf(tr.Quantity)
	rel := "at most"
	if tr.AtLeast {
		rel = "at least"
	}
	name, unit := q.nameUnit()
	label := paramWords(tr.ParameterLabel, tr.Parameter)
	var text string
	if tr.Met {
		text = fmt.Sprintf("Target met: %s at %s gives %s = %s%s (goal: %s %s%s; margin %s%s; found to %s). %d runs.",
			upperFirst(label), numberUnit(exact(tr.Value), tr.Unit), name, q.format(tr.Achieved), unit, rel, q.format(tr.Goal), unit, sig(tr.Margin, 2), unit,
			numberUnit(exact(tr.Tolerance), tr.Unit), tr.Evaluations)
	} else {
		text = fmt.Sprintf("Target not met between %s and %s: the closest, %s at %s, gives %s = %s%s (goal: %s %s%s). %d runs.",
			numberUnit(trimZeros(sig(tr.From, 4)), tr.Unit), numberUnit(trimZeros(sig(tr.To, 4)), tr.Unit), label, numberUnit(exact(results.RoundToTolerance(tr.Value, tr.Tolerance)), tr.Unit), name, q.format(tr.Achieved), unit, rel, q.format(tr.Goal), unit, tr.Evaluations)
	}
	out := []*block{{Text: []string{text}}}
	if len(tr.Scan) > 0 {
		t := newTable("Target search: scan of the "+label, []string{withUnit(upperFirst(label), tr.Unit), q.label, "Meets the goal"}, "", "", "text")
		for _, p := range tr.Scan {
			m := "no"
			if p.Meets {
				m = "yes"
			}
			t.row(trimZeros(sig(p.Value, 4)), q.format(p.Quantity), m)
		}
		t.Notes = append(t.Notes, "The scan brackets the goal; the value above is then refined between the bracketing points.")
		out = append(out, &block{Table: t})
	}
	return out
}

// uncertaintyTables report a Monte Carlo propagation.
func uncertaintyTables(r *results.Results) []*block {
	u := r.Uncertainty
	if u == nil {
		return nil
	}
	p := newTable("Uncertain inputs", []string{"Parameter", "Distribution", "Values"}, "text", "text", "text")
	for _, x := range u.Parameters {
		vals := fmt.Sprintf("mean %s, standard deviation %s %s", trimZeros(sig(x.A, 4)), trimZeros(sig(x.B, 4)), x.Unit)
		if x.Distribution == "uniform" {
			vals = fmt.Sprintf("from %s to %s %s", trimZeros(sig(x.A, 4)), trimZeros(sig(x.B, 4)), x.Unit)
		}
		p.row(upperFirst(paramWords(x.ParameterLabel, x.Parameter)), x.Distribution, vals)
	}
	p.Notes = append(p.Notes, fmt.Sprintf("%d samples (seed %d).", u.Samples, u.Seed))
	if u.Rejected > 0 {
		p.Notes = append(p.Notes, fmt.Sprintf("%d samples were rejected as impossible inputs; the first: %s", u.Rejected, u.FirstRejection))
	}
	q := newTable("Spread of the results", []string{"Quantity", "Samples", "Mean", "Standard deviation", "5 %", "Median", "95 %", "Lowest", "Highest"}, "text")
	for _, s := range u.Quantities {
		f := quantityOf(s.Quantity).format
		q.row(quantityOf(s.Quantity).label, fmt.Sprint(s.N), f(s.Mean), sig(s.SD, 2), f(s.P5), f(s.P50), f(s.P95), f(s.Min), f(s.Max))
	}
	q.Notes = append(q.Notes, "5 %, median and 95 % are percentiles over the samples: nine samples in ten fall between the 5 % and 95 % columns.")
	return []*block{{Table: p}, {Table: q}}
}

// fitTables report a diffusivity fit to logged temperatures.
func fitTables(r *results.Results) []*block {
	f := r.Fit
	if f == nil {
		return nil
	}
	t := newTable("Thermal diffusivity fitted to the logged temperatures", []string{"Quantity", "Value"}, "text", "text")
	t.row("Record", f.File)
	t.row("Method", f.Method)
	t.row("Diffusivity a", sig(f.Diffusivity_m2_s, 3)+" m²/s")
	if f.StdErr_m2_s > 0 {
		t.row("Standard error", sig(f.StdErr_m2_s, 2)+" m²/s")
	}
	if f.Low_m2_s > 0 && f.High_m2_s > 0 {
		t.row("95 % interval", sig(f.Low_m2_s, 3)+" to "+sig(f.High_m2_s, 3)+" m²/s")
	}
	if f.InversionRMS_K > 0 {
		t.row("Misfit of the model (RMS)", sig(f.InversionRMS_K, 2)+fmt.Sprintf(" K after %d evaluations", f.InversionEvaluations))
	}
	if f.HarmonicCombined_m2_s > 0 {
		t.row("Harmonic estimate (amplitude and phase of sensor pairs)", sig(f.HarmonicCombined_m2_s, 3)+" ± "+sig(f.HarmonicStdErr_m2_s, 2)+" m²/s")
	}
	if f.Conductivity_W_mK > 0 {
		t.row("Conductivity λ = a·C", sig(f.Conductivity_W_mK, 3)+" W/(m·K) with C = "+sig(f.HeatCapacityUsed_J_m3K/1e6, 3)+" MJ/(m³·K) of layer 1")
	}
	out := []*block{{Table: t}}
	if len(f.Pairs) > 0 {
		p := newTable("Sensor pairs", []string{"Period", "Upper (m)", "Lower (m)", "From amplitude (m²/s)", "From phase (m²/s)", "Used", "Note"}, "text", "", "", "", "", "text", "text")
		for _, x := range f.Pairs {
			used := "no"
			if x.Usable {
				used = "yes"
			}
			p.row(periodLabel(x.Period_h), fixed(x.UpperDepth_m, 2), fixed(x.LowerDepth_m, 2), sig(x.AmplitudeMethod_m2_s, 3), sig(x.PhaseMethod_m2_s, 3), used, x.Note)
		}
		out = append(out, &block{Table: p})
	}
	return out
}

// recordRows adds one row per measured series to the inputs table.
func recordRows(t *table, r *results.Results) *block {
	var gaps *table
	for _, rec := range r.Records {
		v := fmt.Sprintf("%s (column %s): %d rows from %s to %s, every %s h", rec.File, strings.Join(rec.Columns, ", "), rec.Rows, rec.First, rec.Last, trimZeros(sig(rec.Step_h, 3)))
		if n := len(rec.Bridged); n > 0 {
			v += fmt.Sprintf("; %d gaps bridged by linear interpolation (listed below)", n)
		} else {
			v += "; no gaps"
		}
		fit := fmt.Sprintf("mean %s", trimZeros(sig(rec.FitMean, 3)))
		if rec.FitAnnualAmp > 0 {
			fit += fmt.Sprintf(", annual swing ±%s peaking on day %s", trimZeros(sig(rec.FitAnnualAmp, 3)), fixed(rec.FitAnnualPeak, 0))
		}
		if rec.FitDailyAmp > 0 {
			fit += fmt.Sprintf(", daily swing ±%s peaking at %s h", trimZeros(sig(rec.FitDailyAmp, 3)), fixed(rec.FitDailyPeak, 1))
		}
		t.row("Measured "+rec.Use, v)
		t.row("Least-squares fit of that record (used by the exact periodic analysis)", fit)
		for _, g := range rec.Bridged {
			if gaps == nil {
				gaps = newTable("Gaps bridged in the measured series", []string{"File", "Column", "After line", "From", "To", "Values filled"}, "text", "text", "", "text", "text", "")
			}
			col := g.Column
			if col == "" {
				col = "whole rows"
			}
			gaps.row(rec.File, col, fmt.Sprint(g.Line), g.From, g.To, fmt.Sprint(g.Filled))
		}
	}
	if gaps == nil {
		return nil
	}
	return &block{Table: gaps}
}

// paramWords returns a parameter's label in words, or its path when it
// has none.
func paramWords(label, path string) string {
	if label != "" {
		return label
	}
	return path
}

// withUnit appends " (unit)" to a heading, nothing for a ratio.
func withUnit(head, unit string) string {
	if unit == "" {
		return head
	}
	return head + " (" + unit + ")"
}

// numberUnit joins a formatted number and its unit.
func numberUnit(num, unit string) string {
	if unit == "" {
		return num
	}
	return num + " " + unit
}

// exact writes v with the fewest digits that give it back (a target value
// already rounded to its tolerance keeps exactly its digits).
func exact(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) }

// upperFirst capitalises the first letter of s.
func upperFirst(s string) string {
	r := []rune(s)
	if len(r) == 0 {
		return s
	}
	return strings.ToUpper(string(r[:1])) + string(r[1:])
}
