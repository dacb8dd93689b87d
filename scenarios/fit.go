package scenarios

import (
	"fmt"
	"math"

	"tempstack/climate"
	"tempstack/ground"
	"tempstack/layers"
	"tempstack/scenarios/results"
)

// FitSpec asks for the thermal diffusivity of the ground (or a wall) from
// temperatures logged at two or more depths (analysis.fit).
type FitSpec struct {
	Measured *Measured // the record (first sensor's column)
	Columns  []string
	Depths   []float64 // m
	Periods  []float64 // s
	Bottom   ground.BottomCondition
	Line     int
}

func (d *decoder) decodeFit(parent *object, s *Scenario) {
	o := parent.child("fit", fitKeys)
	if o == nil {
		return
	}
	spec := &FitSpec{Line: parent.line("fit")}
	if !d.decodeSensors(o, spec) {
		return
	}
	// Read the record through the series decoder, with every sensor column.
	o.values["column"] = scalarAt(spec.Columns[0], o.node.Line, 1)
	m := d.decodeSeriesColumns(o, spec.Columns)
	if m == nil {
		return
	}
	spec.Measured = m
	t0, t1 := m.Span()
	if items, ok := o.list("periods"); ok {
		for i, n := range items {
			key := fmt.Sprintf("analysis.fit.periods[%d]", i+1)
			p, ok := d.scalarQuantity(n, key, layers.Period)
			if ok && (!(p > 0) || p > t1-t0) {
				d.failf(n, key, "the record (%s) must cover the period (%s) at least once", layers.FormatDuration(t1-t0), layers.FormatDuration(p))
			} else if ok {
				spec.Periods = append(spec.Periods, p)
			}
		}
	} else {
		spec.Periods = []float64{climate.Day}
		if t1-t0 >= climate.Year {
			spec.Periods = []float64{climate.Year, climate.Day}
		}
	}
	var b string
	if o.choice("bottom", []string{"auto", "sensor", "adiabatic"}, &b) {
		spec.Bottom = map[string]ground.BottomCondition{"auto": ground.BottomAuto, "sensor": ground.BottomSensor, "adiabatic": ground.BottomAdiabatic}[b]
	}
	s.Analysis.Fit = spec
}

// decodeSensors reads the sensors of a fit, shallowest first; it reports
// whether they were read without a mistake.
func (d *decoder) decodeSensors(o *object, spec *FitSpec) bool {
	items, ok := o.list("sensors")
	if !ok || len(items) < 2 {
		if ok || !o.has("sensors") {
			o.missing("sensors", "at least two {depth, column} entries, shallowest first")
		}
		return false
	}
	clean := true
	for i, n := range items {
		so := d.object(n, fmt.Sprintf("analysis.fit.sensors[%d]", i+1), sensorKeys)
		if so == nil {
			clean = false
			continue
		}
		var z float64
		var col string
		if !so.nonNegative("depth", layers.Length, &z) && !so.has("depth") {
			so.missing("depth", "m below the surface")
		}
		if !so.has("column") || so.str("column", &col) && col == "" {
			so.missing("column", "the header name of this sensor's column")
		}
		if so.clean() && len(spec.Depths) > 0 && z <= spec.Depths[len(spec.Depths)-1] {
			so.failf("depth", "sensors must be listed shallowest first, each deeper than the last")
		}
		if !so.clean() {
			clean = false
			continue
		}
		spec.Depths = append(spec.Depths, z)
		spec.Columns = append(spec.Columns, col)
	}
	return clean
}

// decodeSeriesColumns is decodeSeries reading several value columns.
func (d *decoder) decodeSeriesColumns(o *object, cols []string) *Measured {
	d.extraColumns = cols
	defer func() { d.extraColumns = nil }()
	return d.decodeSeries(o, "C")
}

// runFit fits the diffusivity to the record and fills r.Fit.
func runFit(s *run, r *results.Results) error {
	spec := s.Analysis.Fit
	rec, err := ground.RecordFromSeries(spec.Measured.Series, spec.Columns, spec.Depths)
	if err != nil {
		return &Error{File: s.File, Line: spec.Line, Key: "analysis.fit", Err: err}
	}
	fr, err := ground.FitDiffusivity(rec, ground.FitOptions{Periods: spec.Periods, Bottom: spec.Bottom})
	if err != nil {
		return &Error{File: s.File, Line: spec.Line, Key: "analysis.fit", Err: err}
	}
	out := &results.FitResult{
		File:                  spec.Measured.File,
		Diffusivity_m2_s:      fr.Diffusivity,
		Method:                "numerical inversion (transient solver driven by the shallowest sensor, least squares on the deeper ones)",
		StdErr_m2_s:           fr.Inversion.StdErrAR1,
		Low_m2_s:              fr.Inversion.Low,
		High_m2_s:             fr.Inversion.High,
		InversionRMS_K:        fr.Inversion.RMS,
		InversionEvaluations:  fr.Inversion.Evaluations,
		HarmonicCombined_m2_s: fr.HarmonicCombined,
		HarmonicStdErr_m2_s:   fr.HarmonicStdErr,
	}
	if fr.Inversion.Diffusivity == 0 {
		out.Method = "harmonic amplitude and phase methods (weighted mean)"
		out.Diffusivity_m2_s = fr.HarmonicCombined
		out.StdErr_m2_s = fr.HarmonicStdErr
	}
	for _, p := range fr.Harmonic {
		out.Pairs = append(out.Pairs, results.FitPair{
			Period_h: p.Period / 3600, UpperDepth_m: p.DepthUpper, LowerDepth_m: p.DepthLower,
			AmplitudeMethod_m2_s: p.Amplitude, PhaseMethod_m2_s: p.Phase, Usable: p.Usable, Note: p.Note,
		})
	}
	// Conductivity follows where the heat capacity of the soil is known:
	// lambda = a rho c, from the first layer of the scenario.
	if len(s.Layers) > 0 && s.Layers[0].HeatCapacity() > 0 {
		out.HeatCapacityUsed_J_m3K = s.Layers[0].HeatCapacity()
		out.Conductivity_W_mK = out.Diffusivity_m2_s * out.HeatCapacityUsed_J_m3K
	}
	r.Fit = out
	// Chart data: measured and modelled at each fitted sensor.
	ser := &r.Series
	ser.Fit.Time_h = nil
	for _, t := range rec.Times {
		ser.Fit.Time_h = append(ser.Fit.Time_h, t/3600)
	}
	ser.Fit.Depth_m = spec.Depths
	ser.Fit.Measured_C = rec.Temps
	ser.Fit.Modelled_C = fr.Inversion.Modelled
	if math.IsNaN(out.Diffusivity_m2_s) {
		return &Error{File: s.File, Line: spec.Line, Key: "analysis.fit", Msg: "the fit did not converge"}
	}
	return nil
}
