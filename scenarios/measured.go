package scenarios

import (
	"errors"
	"fmt"
	"io/fs"
	"math"
	"path"
	"path/filepath"
	"sort"
	"strings"
	"sync"
	"time"

	"tempstack/climate"
	"tempstack/layers"
	"tempstack/scenarios/results"
)

// Measured is a forcing read from a CSV time series.
type Measured struct {
	File   string          // as written in the scenario
	Path   string          // as opened, for messages
	Column string          // value column
	Series *climate.Series // the record (s since 1 January of its first year)
	at     func(t float64) float64
}

// Span returns the first and last time of the record, s.
func (m *Measured) Span() (float64, float64) {
	return m.Series.T[0], m.Series.T[len(m.Series.T)-1]
}

// decodeSeries reads a `{file: ..., column: ...}` block: a CSV series named
// relative to the scenario file. valueUnit is "C" for temperatures or
// "W/m2" for irradiance. It returns nil after a mistake (reported).
func (d *decoder) decodeSeries(o *object, valueUnit string) *Measured {
	var name, col string
	if o.has("file") && !o.str("file", &name) {
		return nil
	}
	switch {
	case name == "":
		o.failf("file", "give the CSV file name, relative to the scenario file")
		return nil
	case d.fsys == nil:
		o.failf("file", "this scenario cannot read files")
		return nil
	}
	if !o.str("column", &col) {
		if !o.has("column") {
			o.missing("column", "the header name of the value column")
		}
		return nil
	}
	opt, ok := d.seriesOptions(o, col, valueUnit)
	if !ok {
		return nil
	}
	p := path.Clean(filepath.ToSlash(name))
	shown := filepath.Join(filepath.Dir(d.file), filepath.FromSlash(p))
	key := fmt.Sprintf("%s|%+v", p, opt)
	if m := d.cache.get(key); m != nil {
		return m
	}
	ser, err := d.readSeries(p, shown, opt)
	if err != nil {
		if fe := (*Error)(nil); errors.As(err, &fe) {
			d.report(fe)
		} else {
			o.fail("file", err)
		}
		return nil
	}
	at, err := ser.At(col)
	if err != nil {
		o.fail("column", err)
		return nil
	}
	m := &Measured{File: name, Path: shown, Column: col, Series: ser, at: at}
	d.cache.put(key, m)
	return m
}

// seriesOptions reads how the CSV file of a series block is read: its time
// columns, number format, unit and longest gap.
func (d *decoder) seriesOptions(o *object, col, valueUnit string) (climate.CSVOptions, bool) {
	opt := climate.CSVOptions{Columns: []string{col}, DecimalHint: `decimal: "," next to its file: key`}
	if len(d.extraColumns) > 0 {
		opt.Columns = d.extraColumns
	}
	o.str("time_column", &opt.TimeColumn)
	o.str("date_column", &opt.DateColumn)
	o.str("hour_column", &opt.HourColumn)
	switch {
	case opt.HourColumn != "" && opt.DateColumn == "":
		o.failf("hour_column", "goes with date_column (a date and an hour); with a full time stamp use time_column")
	case opt.TimeColumn != "" && opt.DateColumn != "":
		o.failf("date_column", "give either time_column or date_column (with hour_column), not both")
	case opt.TimeColumn == "" && opt.DateColumn == "":
		opt.TimeColumn = "time"
	}
	var dec, sep string
	if o.choice("decimal", []string{".", ","}, &dec) {
		opt.Decimal = rune(dec[0])
	}
	if o.choice("separator", []string{",", ";", "tab"}, &sep) {
		opt.Separator = map[string]rune{",": ',', ";": ';', "tab": '\t'}[sep]
	}
	switch {
	case valueUnit == "C":
		o.choice("unit", []string{"C", "F", "K"}, &opt.Unit)
	case o.has("unit"):
		o.failf("unit", "irradiance is read in W/m2")
	default:
		opt.ColumnUnits = map[string]string{col: "W/m2"}
	}
	var g float64
	if o.positive("max_gap", layers.Duration, &g) {
		opt.MaxGap = time.Duration(g * float64(time.Second))
	}
	return opt, o.clean()
}

// readSeries opens and reads the CSV file p (shown in messages as shown).
// A mistake in the file is an *Error located in it.
func (d *decoder) readSeries(p, shown string, opt climate.CSVOptions) (*climate.Series, error) {
	f, err := d.fsys.Open(p)
	if err != nil {
		msg := "cannot open the series file"
		var pe *fs.PathError
		if errors.As(err, &pe) {
			msg += ": " + pe.Err.Error()
		}
		return nil, fmt.Errorf("%s (%s)", msg, shown)
	}
	defer f.Close()
	ser, err := climate.ReadCSV(f, shown, opt)
	if err != nil {
		var fe *Error
		if errors.As(err, &fe) {
			if fe.Line == 0 {
				fe.Line = 1
			}
			return nil, fe
		}
		return nil, &Error{File: shown, Line: 1, Err: err}
	}
	if len(ser.T) < 2 {
		return nil, &Error{File: shown, Line: 1, Msg: "the series holds fewer than two records"}
	}
	return ser, nil
}

// seriesCache keeps the records a scenario read, so that the cases of a
// study (each decoded anew) do not read and parse them again. A Measured
// is read-only once made, and safe to share between goroutines.
type seriesCache struct {
	mu sync.Mutex
	m  map[string]*Measured
}

func (c *seriesCache) get(key string) *Measured {
	if c == nil {
		return nil
	}
	c.mu.Lock()
	defer c.mu.Unlock()
	return c.m[key]
}

func (c *seriesCache) put(key string, m *Measured) {
	if c == nil {
		return
	}
	c.mu.Lock()
	defer c.mu.Unlock()
	if c.m == nil {
		c.m = map[string]*Measured{}
	}
	c.m[key] = m
}

// fitMeasured fits the mean and the annual (when the record spans most of
// a year) and daily harmonics to a record by least squares, so that the
// exact periodic analysis and the start of the simulation can use it.
func fitMeasured(m *Measured) (climate.Periodic, error) {
	t0, t1 := m.Span()
	periods := []float64{climate.Day}
	if t1-t0 >= 300*climate.Day {
		periods = []float64{climate.Year, climate.Day}
	}
	v, _ := m.Series.Value(m.Column)
	p, _, err := climate.FitHarmonics(m.Series.T, v, periods)
	return p, err
}

// Solar turns the outside air temperature of a wall into the sol-air
// temperature T_sa = T_air + a I / h_e - dR (climate.SolAir), with h_e =
// 1/Rse.
type Solar struct {
	Absorptance   float64  // 0..1
	Irradiance    *Forcing // W/m2 on the surface (harmonics or a series); negative values count as 0
	SkyCorrection float64  // K subtracted for long-wave exchange with the sky
	AbsorptanceOf string   // the preset name, when one was used
}

func (d *decoder) decodeSolar(o *object, s *Scenario) *Solar {
	so := o.child("solar", solarKeys)
	if so == nil {
		return nil
	}
	sol := &Solar{}
	var txt string
	if so.str("absorptance", &txt) {
		if a, perr := layers.ParseQuantity(txt, layers.Fraction); perr != nil {
			a, aerr := climate.Absorptance(txt)
			if aerr != nil {
				so.fail("absorptance", aerr)
			}
			sol.Absorptance, sol.AbsorptanceOf = a, txt
		} else if a < 0 || a > 1 {
			so.failf("absorptance", "a solar absorptance lies between 0 and 1, got %g", a)
		} else {
			sol.Absorptance = a
		}
	} else if !so.has("absorptance") {
		so.missing("absorptance", "a number from 0 to 1, or a preset: light, medium, dark, white-paint, red-brick, ...")
	}
	if so.has("irradiance") {
		sol.Irradiance = d.decodeForcing(so, "irradiance", forcingIrradiance)
	} else {
		so.missing("irradiance", "solar irradiance on the surface, W/m2: {mean, daily, annual} or {file, column}")
	}
	// Long-wave correction: ASHRAE's 7 degF (3.9 K) for horizontal
	// surfaces and 0 for vertical ones (ASHRAE Handbook of Fundamentals,
	// sol-air temperature [memory], via climate.SkyCorrection*).
	sol.SkyCorrection = climate.SkyCorrectionVertical
	if s.Orientation.String() == "roof" {
		sol.SkyCorrection = climate.SkyCorrectionHorizontal
	}
	so.nonNegative("sky_correction", layers.TemperatureDifference, &sol.SkyCorrection)
	return sol
}

// env returns the environment temperature function of a side, degC at t
// (s): the forcing, with sol-air and n-factors applied.
func (sd Environment) env() func(t float64) float64 {
	f := sd.Temperature
	if f == nil {
		return nil
	}
	base := f.At
	if sol := sd.Solar; sol != nil {
		he := 1 / math.Max(sd.Resistance, 1e-3)
		irr := sol.Irradiance
		air := base
		base = func(t float64) float64 {
			return climate.SolAir(air(t), math.Max(0, irr.At(t)), sol.Absorptance, he, sol.SkyCorrection)
		}
	}
	if sd.hasNFactors() {
		nf, nt := sd.nFactors()
		inner := base
		base = func(t float64) float64 { return nFactored(inner(t), nf, nt) }
	}
	return base
}

// isPlainHarmonic reports whether the side's environment is exactly its
// harmonic forcing (no series, sun, n-factors or step).
func (sd Environment) isPlainHarmonic() bool {
	f := sd.Temperature
	return f != nil && f.Measured == nil && f.Step == nil && sd.Solar == nil && !sd.hasNFactors()
}

// describe is a one-line description of a forcing for messages.
func (f *Forcing) describe() string {
	switch {
	case f == nil:
		return "none"
	case f.Measured != nil:
		return fmt.Sprintf("series %s, column %q", f.Measured.File, f.Measured.Column)
	case f.Step != nil:
		return fmt.Sprintf("step from %g to %g degC", f.Step.From, f.Step.To)
	}
	var parts []string
	for _, h := range f.Harmonics {
		parts = append(parts, fmt.Sprintf("%g K over %s", h.Amplitude, layers.FormatDuration(h.Period)))
	}
	if len(parts) == 0 {
		return fmt.Sprintf("constant %g", f.Mean)
	}
	return fmt.Sprintf("mean %g with %s", f.Mean, strings.Join(parts, ", "))
}

// surfaceForcing is the outside (surface) environment as a mean plus
// harmonics. For a plain harmonic forcing it is the forcing itself. With a
// measured series, the sun (sol-air) or n-factors, it is a least-squares
// fit of the true environment temperature (hourly samples over the
// record, or over the longest period) to the same periods (plus the
// second and third daily harmonics under the sun): exact periodic results
// and the simulation's first guess use it; the simulation itself applies
// the true environment at every step. Fitted reports whether it is a fit.
func (s *run) surfaceForcing() *Forcing {
	sd := s.Outside
	f := sd.Temperature
	if f == nil || sd.isPlainHarmonic() || f.Step != nil {
		return f
	}
	if s.surface != nil {
		return s.surface
	}
	env := sd.env()
	periods := map[float64]bool{}
	for _, h := range f.Harmonics {
		periods[h.Period] = true
	}
	t0, t1 := 0.0, 0.0
	if f.Measured != nil {
		t0, t1 = f.Measured.Span()
	}
	if sol := sd.Solar; sol != nil {
		for _, h := range sol.Irradiance.Harmonics {
			periods[h.Period] = true
		}
		if m := sol.Irradiance.Measured; m != nil {
			a, b := m.Span()
			if f.Measured == nil {
				t0, t1 = a, b
			} else {
				t0, t1 = math.Max(t0, a), math.Min(t1, b)
			}
		}
		if periods[climate.Day] {
			periods[climate.Day/2], periods[climate.Day/3] = true, true
		}
	}
	var ps []float64
	longest := 0.0
	for p := range periods {
		ps = append(ps, p)
		longest = math.Max(longest, p)
	}
	sortFloats(ps)
	if t1 <= t0 {
		t0, t1 = 0, longest
	}
	if t1 <= t0 {
		// No period and no record: a constant environment.
		s.surface = &Forcing{Periodic: climate.Periodic{Mean: env(0)}, Line: f.Line}
		return s.surface
	}
	step := math.Min(3600, (t1-t0)/96)
	n := int((t1-t0)/step) + 1
	ts := make([]float64, 0, n)
	vs := make([]float64, 0, n)
	for k := 0; k < n; k++ {
		t := t0 + float64(k)*step
		ts = append(ts, t)
		vs = append(vs, env(t))
	}
	fit := climate.Periodic{Mean: mean(vs)}
	var rms float64
	if len(ps) > 0 {
		if p, q, err := climate.FitHarmonics(ts, vs, ps); err == nil {
			fit, rms = p, q.RMS
		}
	}
	s.surface = &Forcing{Periodic: fit, Line: f.Line}
	// A fit that reproduces the environment to a millikelvin is exact for
	// all purposes (for example a steady sun on a harmonic climate).
	s.surfaceInexact = f.Measured != nil || rms > 1e-3
	return s.surface
}

func mean(v []float64) float64 {
	var s float64
	for _, x := range v {
		s += x
	}
	return s / float64(max(1, len(v)))
}

func sortFloats(v []float64) { sort.Float64s(v) }

// recordInfo summarises a measured forcing for the results.
func recordInfo(use string, f *Forcing) results.RecordInfo {
	m := f.Measured
	ser := m.Series
	ri := results.RecordInfo{Use: use, File: m.File, Columns: ser.Columns, Rows: len(ser.T),
		First: ser.Times[0].Format(time.RFC3339), Last: ser.Times[len(ser.Times)-1].Format(time.RFC3339),
		Step_h: ser.Step / 3600, Bridged: []results.BridgedGap{}, FitMean: f.Mean}
	for _, g := range ser.Bridged {
		ri.Bridged = append(ri.Bridged, results.BridgedGap{Column: g.Column, Line: g.Line,
			From: g.From.Format(time.RFC3339), To: g.To.Format(time.RFC3339), Filled: g.Filled})
	}
	for _, h := range f.Harmonics {
		switch {
		case math.Abs(h.Period-climate.Year) < 1:
			ri.FitAnnualAmp, ri.FitAnnualPeak = h.Amplitude, h.Peak/climate.Day+0.5
		case math.Abs(h.Period-climate.Day) < 1:
			ri.FitDailyAmp, ri.FitDailyPeak = h.Amplitude, h.Peak/3600
		}
	}
	return ri
}

// records lists the measured series of a scenario.
func (s *Scenario) records() []results.RecordInfo {
	var out []results.RecordInfo
	use := "outside temperature"
	if s.Kind == Ground {
		use = "surface air temperature"
	}
	if f := s.Outside.Temperature; f != nil && f.Measured != nil {
		out = append(out, recordInfo(use, f))
	}
	if sol := s.Outside.Solar; sol != nil && sol.Irradiance.Measured != nil {
		out = append(out, recordInfo("solar irradiance", sol.Irradiance))
	}
	if f := s.Inside.temperature(); f != nil && f.Measured != nil {
		out = append(out, recordInfo("inside temperature", f))
	}
	if fs := s.Analysis.Fit; fs != nil {
		out = append(out, recordInfo("sensors", &Forcing{Measured: fs.Measured}))
	}
	return out
}

// forcingInfo describes the sides of a scenario for the results.
func (s *Scenario) forcingInfo() *results.ForcingInfo {
	fi := &results.ForcingInfo{Outside: s.Outside.Info()}
	in := s.Inside.Info()
	fi.Inside = &in
	return fi
}

func harmonicsInfo(hs []climate.Harmonic) []results.HarmonicInfo {
	var out []results.HarmonicInfo
	for _, h := range hs {
		out = append(out, results.HarmonicInfo{Period_h: h.Period / 3600, Amplitude: h.Amplitude, Peak_h: h.Peak / 3600})
	}
	return out
}
