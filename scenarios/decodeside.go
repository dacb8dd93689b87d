package scenarios

import (
	"fmt"
	"strings"

	"gopkg.in/yaml.v3"

	"tempstack/climate"
	"tempstack/ground"
	"tempstack/layers"
)

func (d *decoder) decodeSides(top *object, s *Scenario) {
	outKey, inKey := "outside", "inside"
	wrongOut, wrongIn := "surface", "bottom"
	if s.Kind == Ground {
		outKey, inKey, wrongOut, wrongIn = wrongOut, wrongIn, outKey, inKey
	}
	for _, w := range []struct{ wrong, right string }{{wrongOut, outKey}, {wrongIn, inKey}} {
		if top.has(w.wrong) {
			top.failf(w.wrong, "a %s scenario names this side %q", s.Kind, w.right)
			top.unknown = true // the side is misnamed, not missing
		}
	}
	rsi, rse := layers.SurfaceResistances(s.Orientation)
	if out, ok := d.decodeSide(top, outKey, s, rse, true).(Environment); ok {
		s.Outside = out
	}
	s.Inside = d.decodeSide(top, inKey, s, rsi, false)
}

// forcingKind says what a forcing block holds.
type forcingKind int

const (
	forcingTemperature forcingKind = iota // degC, amplitudes in K
	forcingIrradiance                     // W/m2, amplitudes in W/m2
	forcingHeatFlux                       // W/m2 into the column, amplitudes in W/m2
)

// kinds returns the quantity kinds of a forcing's values and amplitudes,
// and the unit of a series of it.
func (k forcingKind) kinds() (value, amplitude layers.Kind, unit string) {
	switch k {
	case forcingIrradiance:
		return layers.Irradiance, layers.Irradiance, "W/m2"
	case forcingHeatFlux:
		return layers.HeatFlux, layers.HeatFlux, "W/m2"
	}
	return layers.Temperature, layers.TemperatureDifference, "C"
}

// decodeForcing reads a temperature (or irradiance) forcing: a single
// value, a mapping of mean and harmonics, a step, or a CSV series. It
// returns nil after a mistake.
func (d *decoder) decodeForcing(parent *object, key string, kind forcingKind) *Forcing {
	valueKind, _, _ := kind.kinds()
	f := &Forcing{Line: parent.line(key)}
	if parent.values[key].Kind == yaml.ScalarNode {
		// A bare value: a constant temperature.
		if !parent.quantity(key, valueKind, &f.Mean) {
			return nil
		}
		return f
	}
	table := forcingKeys
	if kind == forcingHeatFlux {
		table = fluxForcingKeys
	}
	o := d.object(parent.values[key], join(parent.path, key), table)
	if o == nil {
		return nil
	}
	switch {
	case o.has("file"):
		d.decodeMeasuredForcing(o, kind, f)
	case rejectSeriesKeys(o):
	case kind == forcingIrradiance && o.has("step"):
		o.failf("step", "irradiance takes a mean and harmonics, or a series")
	case o.has("step"):
		d.decodeStepForcing(o, f)
	default:
		d.decodeHarmonicForcing(o, kind, f)
	}
	if !o.clean() {
		return nil
	}
	return f
}

// decodeMeasuredForcing reads a forcing given as a CSV series, and fits its
// mean and harmonics.
func (d *decoder) decodeMeasuredForcing(o *object, kind forcingKind, f *Forcing) {
	for _, k := range tempKeys.names() {
		if o.has(k) {
			o.failf(k, "a measured series stands alone; remove %s or file", k)
			return
		}
	}
	_, _, unit := kind.kinds()
	m := d.decodeSeries(o, unit)
	if m == nil {
		return
	}
	p, err := fitMeasured(m)
	if err != nil {
		o.failf("file", "cannot fit the record's mean and harmonics: %v", err)
		return
	}
	f.Measured, f.Periodic = m, p
}

// rejectSeriesKeys reports the keys of a series in a forcing without file.
func rejectSeriesKeys(o *object) bool {
	for _, k := range seriesKeys.names() {
		if o.has(k) {
			o.failf(k, "belongs to a measured series: give file too")
			return true
		}
	}
	return false
}

// decodeStepForcing reads {step: {from, to, at}}.
func (d *decoder) decodeStepForcing(o *object, f *Forcing) {
	st := o.child("step", stepKeys)
	if st == nil {
		return
	}
	for _, k := range []string{"mean", "daily", "annual", "harmonics"} {
		if o.has(k) {
			o.failf(k, "a step forcing stands alone; remove %s or step", k)
			return
		}
	}
	var step Step
	for _, k := range []struct {
		key string
		dst *float64
	}{{"from", &step.From}, {"to", &step.To}} {
		if !st.quantity(k.key, layers.Temperature, k.dst) && !st.has(k.key) {
			st.missing(k.key, "temperature in degC")
		}
	}
	st.nonNegative("at", layers.Duration, &step.At)
	f.Step = &step
	f.Mean = step.From
}

// decodeHarmonicForcing reads a mean with daily, annual and further
// harmonics.
func (d *decoder) decodeHarmonicForcing(o *object, kind forcingKind, f *Forcing) {
	valueKind, ampKind, _ := kind.kinds()
	if !o.quantity("mean", valueKind, &f.Mean) && !o.has("mean") {
		o.missing("mean", "the mean value")
	}
	if h, ok := d.harmonicBlock(o, "daily", "peak_hour", climate.Day, climate.Day/24, ampKind); ok {
		f.Harmonics = append(f.Harmonics, h)
	}
	if h, ok := d.harmonicBlock(o, "annual", "peak_day", climate.Year, climate.Day, ampKind); ok {
		f.Harmonics = append(f.Harmonics, h)
	}
	items, _ := o.list("harmonics")
	for i, n := range items {
		ho := d.object(n, fmt.Sprintf("%s.harmonics[%d]", o.path, i+1), harmonicKeys)
		if ho == nil {
			continue
		}
		var h climate.Harmonic
		if !ho.positive("period", layers.Period, &h.Period) && !ho.has("period") {
			ho.missing("period", `e.g. "12h" or "365d"`)
		}
		if !ho.nonNegative("amplitude", ampKind, &h.Amplitude) && !ho.has("amplitude") {
			ho.missing("amplitude", "half the peak-to-peak swing")
		}
		ho.nonNegative("peak", layers.Duration, &h.Peak)
		f.Harmonics = append(f.Harmonics, h)
	}
}

// harmonicBlock decodes {amplitude, peak_X} where the peak is given in
// units of unit seconds (hours for daily, days for annual).
func (d *decoder) harmonicBlock(o *object, key, peakKey string, period, unit float64, ampKind layers.Kind) (climate.Harmonic, bool) {
	c := o.child(key, map[string]*keyTable{"peak_hour": dailyKeys, "peak_day": annualKeys}[peakKey])
	if c == nil {
		return climate.Harmonic{}, false
	}
	h := climate.Harmonic{Period: period}
	if !c.nonNegative("amplitude", ampKind, &h.Amplitude) && !c.has("amplitude") {
		c.missing("amplitude", "half the peak-to-peak swing")
	}
	var s string
	if c.str(peakKey, &s) {
		var x float64
		max := period / unit
		if _, err := fmt.Sscan(s, &x); err != nil || strings.ContainsAny(s, " \t") {
			c.failf(peakKey, "expected a number, got %q", s)
		} else if x < 0 || x > max {
			c.failf(peakKey, "must lie between 0 and %g, got %g", max, x)
		}
		h.Peak = x * unit
		if peakKey == "peak_day" {
			// Day numbers count from 1 January = day 1; the peak is taken at noon.
			h.Peak = (x - 0.5) * unit
			if h.Peak < 0 {
				h.Peak += period
			}
		}
	}
	return h, c.clean()
}

// decodeNFactors reads n_factor (a number, or {freezing, thawing}) and
// cover (a surface preset of UFC 3-130-04 Table 4-1) of a ground surface;
// nil when neither is given.
func (d *decoder) decodeNFactors(o *object) *NFactors {
	if !o.has("cover") && !o.has("n_factor") {
		return nil
	}
	nf := &NFactors{Freezing: 1, Thawing: 1}
	var c string
	if o.choice("cover", surfaceCovers(), &c) {
		n, _ := ground.NFactor(c)
		nf.Cover = c
		nf.Freezing = n.Freezing
		nf.Thawing = 0 // decided later: given, or 1 with a warning
		if th, ok := n.Thawing(); ok {
			nf.Thawing = th
		}
	}
	if o.has("n_factor") {
		if o.values["n_factor"].Kind == yaml.ScalarNode {
			var n float64
			if o.positive("n_factor", layers.Fraction, &n) {
				nf.Freezing, nf.Thawing = n, n
			}
		} else if no := o.child("n_factor", nFactorKeys); no != nil {
			no.positive("freezing", layers.Fraction, &nf.Freezing)
			no.positive("thawing", layers.Fraction, &nf.Thawing)
		}
	}
	if nf.Freezing > 3 || nf.Thawing > 3 {
		o.failf("n_factor", "an n-factor above 3 is outside every published table; check the value")
	}
	return nf
}

// surfaceCovers lists the surface presets of ground.Surfaces by name.
func surfaceCovers() []string {
	var keys []string
	for _, n := range ground.Surfaces() {
		keys = append(keys, n.Surface)
	}
	return keys
}
