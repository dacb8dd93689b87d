package scenarios

import (
	"fmt"
	"strings"

	"gopkg.in/yaml.v3"

	"tempstack/climate"
	"tempstack/ground"
	"tempstack/layers"
	"tempstack/solver"
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
	s.Outside = d.decodeSide(top, outKey, s, rse, true)
	s.Inside = d.decodeSide(top, inKey, s, rsi, false)
}

// decodeSide reads one side: its resistance, n-factors, and exactly one of
// a temperature (with the sun on a wall's outside), a heat flux or an
// adiabatic face. A side that is not given takes its default: 20 degC
// behind the ISO 6946 resistance inside a wall, the geothermal flux below
// the ground.
func (d *decoder) decodeSide(top *object, key string, s *Scenario, defaultR float64, outside bool) Side {
	side := Side{Resistance: defaultR, NFreezing: 1, NThawing: 1}
	allowed := sideKeys
	if s.Kind == Ground {
		side.Resistance = 0
		allowed = bottomKeys
		if outside {
			allowed = surfaceKeys
		}
	}
	if !top.has(key) {
		switch {
		case outside:
			top.missing(key, "the temperature on this side, e.g. temperature: {mean: 10, daily: {amplitude: 8, peak_hour: 15}}")
		case s.Kind == Ground:
			// Default bottom: the continental mean geothermal heat flux,
			// 65 mW/m2 (Pollack, Hurter and Johnson 1993, Rev. Geophys.
			// 31:267, abstract [read]).
			side.Condition, side.HeatFlux = solver.PrescribedFlux, DefaultGeothermalFlux
		default:
			// Default inside: 20 degC air behind the ISO 6946 resistance.
			side.Temperature = &Forcing{Periodic: climate.Periodic{Mean: 20}}
		}
		return side
	}
	o := top.child(key, allowed)
	if o == nil {
		return side
	}
	d.decodeResistance(o, &side)
	d.decodeNFactors(o, &side)
	if o.has("temperature") {
		side.Temperature = d.decodeForcing(o, "temperature", forcingTemperature)
	}
	if o.has("solar") {
		if outside {
			d.decodeSolar(o, s, &side)
		} else {
			o.failf("solar", "the sun shines on the outside surface only")
		}
	}
	given := 0
	if o.has("temperature") {
		given++
	}
	if o.quantity("heat_flux", layers.HeatFlux, &side.HeatFlux) {
		side.Condition = solver.PrescribedFlux
		given++
	}
	var adiabatic bool
	if o.boolean("adiabatic", &adiabatic) && adiabatic {
		side.Condition = solver.Adiabatic
		given++
	}
	if o.clean() {
		checkSideCondition(o, key, s, side, outside, given)
	}
	return side
}

// checkSideCondition says what is wrong with the condition of a side that
// was read without a mistake.
// given counts the conditions given (temperature, heat_flux, adiabatic:
// true).
func checkSideCondition(o *object, key string, s *Scenario, side Side, outside bool, n int) {
	switch {
	case n == 0:
		o.missing("temperature", "give temperature, heat_flux or adiabatic: true")
	case n > 1:
		o.d.failf(o.node, o.path, "give only one of temperature, heat_flux and adiabatic")
	case outside && side.Temperature == nil:
		o.missing("temperature", "the "+key+" side is driven by a temperature")
	case s.Kind == Ground && !outside && side.Temperature != nil && len(side.Temperature.Harmonics) > 0:
		o.failf("temperature", "the bottom temperature must be constant: give only a mean")
	}
}

// forcingKind says what a forcing block holds.
type forcingKind int

const (
	forcingTemperature forcingKind = iota // degC, amplitudes in K
	forcingIrradiance                     // W/m2, amplitudes in W/m2
)

// kinds returns the quantity kinds of a forcing's values and amplitudes,
// and the unit of a series of it.
func (k forcingKind) kinds() (value, amplitude layers.Kind, unit string) {
	if k == forcingIrradiance {
		return layers.Irradiance, layers.Irradiance, "W/m2"
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
	o := d.object(parent.values[key], join(parent.path, key), forcingKeys)
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
// cover (a surface preset of UFC 3-130-04 Table 4-1) of a ground surface.
func (d *decoder) decodeNFactors(o *object, side *Side) {
	var c string
	if o.choice("cover", surfaceCovers(), &c) {
		n, _ := ground.NFactor(c)
		side.Cover = c
		side.NFreezing = n.Freezing
		side.NThawing = 0 // decided later: given, or 1 with a warning
		if th, ok := n.Thawing(); ok {
			side.NThawing = th
		}
	}
	if o.has("n_factor") {
		if o.values["n_factor"].Kind == yaml.ScalarNode {
			var n float64
			if o.positive("n_factor", layers.Fraction, &n) {
				side.NFreezing, side.NThawing = n, n
			}
		} else if no := o.child("n_factor", nFactorKeys); no != nil {
			no.positive("freezing", layers.Fraction, &side.NFreezing)
			no.positive("thawing", layers.Fraction, &side.NThawing)
		}
	}
	if side.NFreezing > 3 || side.NThawing > 3 {
		o.failf("n_factor", "an n-factor above 3 is outside every published table; check the value")
	}
}

// surfaceCovers lists the surface presets of ground.Surfaces by name.
func surfaceCovers() []string {
	var keys []string
	for _, n := range ground.Surfaces() {
		keys = append(keys, n.Surface)
	}
	return keys
}
