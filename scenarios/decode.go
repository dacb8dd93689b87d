package scenarios

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"gopkg.in/yaml.v3"

	"tempstack/climate"
	"tempstack/ground"
	"tempstack/layers"
	"tempstack/solver"
)

// maxLayers bounds the layers of a column: real constructions have a
// handful, measured soil profiles a few dozen.
const maxLayers = 1000

// maxFileSize bounds a scenario file; anything larger is surely not one.
const maxFileSize = 4 << 20

// Load reads and decodes the scenario file at path.
func Load(path string) (*Scenario, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, &Error{File: path, Msg: cleanOSError(err)}
	}
	defer f.Close()
	data, err := io.ReadAll(io.LimitReader(f, maxFileSize+1))
	if err != nil {
		return nil, &Error{File: path, Msg: cleanOSError(err)}
	}
	if len(data) > maxFileSize {
		return nil, &Error{File: path, Msg: fmt.Sprintf("file is larger than %d MiB; is it a scenario file?", maxFileSize>>20)}
	}
	return Decode(path, data)
}

func cleanOSError(err error) string {
	var pe *os.PathError
	if errors.As(err, &pe) {
		return pe.Err.Error()
	}
	return err.Error()
}

var (
	topKeys      = []string{"title", "description", "project", "client", "prepared_by", "revision", "kind", "orientation", "layers", "outside", "inside", "surface", "bottom", "analysis", "variants", "sweep", "target", "uncertainty"}
	layerKeys    = []string{"material", "name", "thickness", "conductivity", "density", "specific_heat", "resistance", "conductivity_frozen", "specific_heat_frozen", "latent_heat", "freezing_point", "freezing_range", "soil", "family"}
	soilKeys     = []string{"texture", "dry_density", "water_content", "model", "quartz", "solids_density", "solids_specific_heat", "freezing_point", "freezing_range"}
	sideKeys     = []string{"resistance", "temperature", "heat_flux", "adiabatic", "solar"}
	surfaceKeys  = []string{"resistance", "temperature", "n_factor", "cover"}
	bottomKeys   = []string{"temperature", "heat_flux", "adiabatic"}
	tempKeys     = []string{"mean", "daily", "annual", "harmonics", "step"}
	analysisKeys = []string{"periods", "response", "probes", "simulate", "step_response", "design_freezing_index", "design_season_length", "fit"}
	simulateKeys = []string{"start", "duration", "step", "output_step", "initial_temperature", "mesh", "spin_up_cycles"}
	meshKeys     = []string{"surface_cell", "growth", "max_cell", "cells_per_depth", "min_cells_per_layer"}
)

// Decode decodes a scenario from data; file names it in error messages and
// files the scenario names (CSV series) are read relative to its folder.
func Decode(file string, data []byte) (*Scenario, error) {
	return DecodeFS(file, data, os.DirFS(filepath.Dir(file)))
}

// DecodeFS is Decode with the files the scenario names read from fsys.
func DecodeFS(file string, data []byte, fsys fs.FS) (*Scenario, error) {
	doc, err := parseYAML(file, data)
	if err != nil {
		return nil, err
	}
	return decodeDoc(file, doc, fsys, nil)
}

// parseYAML parses data into its one YAML document node.
func parseYAML(file string, data []byte) (*yaml.Node, error) {
	d := &decoder{file: file}
	if len(bytes.TrimSpace(data)) == 0 {
		return nil, &Error{File: file, Line: 1, Msg: "file is empty; start from `tempstack new wall`"}
	}
	var doc yaml.Node
	dec := yaml.NewDecoder(bytes.NewReader(data))
	if err := dec.Decode(&doc); err != nil {
		if errors.Is(err, io.EOF) {
			return nil, &Error{File: file, Line: 1, Msg: "file is empty (only comments); start from `tempstack new wall`"}
		}
		return nil, yamlError(file, data, err)
	}
	var extra yaml.Node
	if err := dec.Decode(&extra); err == nil {
		return nil, d.errf(&extra, "", "the file holds more than one YAML document (a second '---'); a scenario is one document")
	}
	if doc.Kind != yaml.DocumentNode || len(doc.Content) == 0 {
		return nil, &Error{File: file, Line: 1, Msg: "file is empty (only comments); start from `tempstack new wall`"}
	}
	return doc.Content[0], nil
}

// decodeDoc decodes the top mapping of a scenario.
func decodeDoc(file string, root *yaml.Node, fsys fs.FS, cache *seriesCache) (*Scenario, error) {
	if cache == nil {
		cache = &seriesCache{}
	}
	d := &decoder{file: file, fsys: fsys, cache: cache}
	top, err := d.object(root, "", topKeys)
	if err != nil {
		return nil, err
	}
	s := &Scenario{File: file}

	title, ok, err := top.str("title")
	if err != nil {
		return nil, err
	}
	if !ok || title == "" {
		return nil, top.missing("title", "a one-line name for the report")
	}
	s.Title = title
	if s.Description, _, err = top.str("description"); err != nil {
		return nil, err
	}
	if err := decodeTitleBlock(top, s); err != nil {
		return nil, err
	}

	kind, ok, err := top.choice("kind", []string{string(Wall), string(Ground)})
	if err != nil {
		return nil, err
	}
	if !ok {
		return nil, top.missing("kind", "wall or ground")
	}
	s.Kind = Kind(kind)

	if err := d.decodeOrientation(top, s); err != nil {
		return nil, err
	}
	if err := d.decodeLayers(top, s); err != nil {
		return nil, err
	}
	if err := d.decodeSides(top, s); err != nil {
		return nil, err
	}
	if err := d.decodeAnalysis(top, s); err != nil {
		return nil, err
	}
	if err := d.decodeStudy(top, s); err != nil {
		return nil, err
	}
	if s.Analysis.Simulate != nil && s.Outside.Temperature != nil {
		// Resolved here, once: no run changes a decoded scenario.
		simDefaults(s)
	}
	s.root, s.fsys, s.cache = root, fsys, cache
	if err := checkStudy(s); err != nil {
		return nil, err
	}
	return s, nil
}

// yamlError turns a yaml.v3 syntax error ("yaml: line 3: ...") into an
// *Error with the line split out.
func yamlError(file string, data []byte, err error) error {
	msg := err.Error()
	msg = strings.TrimPrefix(msg, "yaml: ")
	line := 0
	if n, _ := fmt.Sscanf(msg, "line %d:", &line); n == 1 {
		if i := strings.Index(msg, ":"); i >= 0 {
			msg = strings.TrimSpace(msg[i+1:])
		}
	}
	if te := (*yaml.TypeError)(nil); errors.As(err, &te) && len(te.Errors) > 0 {
		msg = te.Errors[0]
	}
	if line == 0 {
		// yaml.v3 gives no line for some errors: an unclosed quote or
		// bracket runs to the end of the file; others point at the top.
		line = 1
		if strings.Contains(msg, "end of stream") {
			line = bytes.Count(bytes.TrimRight(data, "\n"), []byte("\n")) + 1
			msg += " (an unclosed quote or bracket?)"
		}
	}
	return &Error{File: file, Line: line, Msg: "not valid YAML: " + msg}
}

func (d *decoder) decodeOrientation(top *object, s *Scenario) error {
	word, ok, err := top.choice("orientation", []string{"wall", "roof", "floor"})
	if err != nil {
		return err
	}
	if ok && s.Kind == Ground {
		return top.errKey("orientation", "applies to kind: wall only (a ground column is always horizontal)")
	}
	if !ok {
		word = "wall"
	}
	o, err := layers.ParseOrientation(word)
	if err != nil {
		return top.errKey("orientation", "%v", err)
	}
	s.Orientation = o
	return nil
}

func (d *decoder) decodeLayers(top *object, s *Scenario) error {
	items, ok, err := top.list("layers")
	if err != nil {
		return err
	}
	if ok && len(items) == 0 {
		return top.errKey("layers", "the list is empty; give at least one layer")
	}
	if len(items) > maxLayers {
		return top.errKey("layers", "%d layers is more than the limit of %d; merge thin layers of the same material", len(items), maxLayers)
	}
	if !ok {
		return top.missing("layers", "a list of layers, "+map[Kind]string{Wall: "outside first", Ground: "surface first"}[s.Kind])
	}
	for i, n := range items {
		path := fmt.Sprintf("layers[%d]", i+1)
		lo, err := d.object(n, path, layerKeys)
		if err != nil {
			return err
		}
		l, err := d.decodeLayer(lo, s)
		if err != nil {
			return err
		}
		s.Layers = append(s.Layers, l)
		s.LayerLines = append(s.LayerLines, n.Line)
	}
	return nil
}

func (d *decoder) decodeLayer(o *object, s *Scenario) (layers.Layer, error) {
	var l layers.Layer
	key, hasMat, err := o.str("material")
	if err != nil {
		return l, err
	}
	if hasMat {
		m, ok := layers.Lookup(key)
		switch {
		case ok:
			l = m.Layer()
		default:
			p, isSoil := ground.Preset(key)
			if !isSoil {
				msg := fmt.Sprintf("unknown material %q", key)
				if sug := layers.Closest(key, allMaterialKeys(), 1); len(sug) > 0 {
					msg += fmt.Sprintf("; did you mean %q?", sug[0])
				} else {
					msg += "; `tempstack materials` lists the library"
				}
				return l, o.errKey("material", "%s", msg)
			}
			var err error
			if l, err = presetLayer(p); err != nil {
				return l, o.errKey("material", "%v", err)
			}
		}
	}
	if o.has("soil") {
		if hasMat {
			return l, o.errKey("soil", "give either material or soil, not both")
		}
		sl, err := d.decodeSoil(o, s)
		if err != nil {
			return l, err
		}
		l = sl
		hasMat = true // properties come from the soil model
	}
	if name, ok, err := o.str("name"); err != nil {
		return l, err
	} else if ok {
		l.Name = name
	}
	if err := decodeFamily(o, &l); err != nil {
		return l, err
	}

	if d, ok, err := o.positive("thickness", layers.Length); err != nil {
		return l, err
	} else if ok {
		if err := l.SetThickness(d); err != nil {
			return l, o.errKey("thickness", "%v", err)
		}
	}
	fields := []struct {
		key  string
		kind layers.Kind
		dst  *float64
	}{
		{"conductivity", layers.Conductivity, &l.Conductivity},
		{"density", layers.Density, &l.Density},
		{"specific_heat", layers.SpecificHeat, &l.SpecificHeat},
		{"resistance", layers.Resistance, &l.Resistance},
	}
	for _, f := range fields {
		v, ok, err := o.positive(f.key, f.kind)
		if err != nil {
			return l, err
		}
		if ok {
			*f.dst = v
			if f.key != "resistance" && hasMat {
				l.Source = "given in the scenario (overrides the library value)"
			}
		}
	}
	if !hasMat && !o.has("resistance") {
		if l.Name == "" {
			l.Name = fmt.Sprintf("layer %d", len(s.Layers)+1)
		}
		for _, k := range []string{"conductivity", "density", "specific_heat"} {
			if !o.has(k) {
				return l, o.missing(k, "a layer without a library material needs conductivity, density and specific_heat (or a material key)")
			}
		}
		l.Source = "given in the scenario"
	}
	if !hasMat && o.has("resistance") {
		if o.has("conductivity") || o.has("density") || o.has("specific_heat") {
			return l, o.errKey("resistance", "a resistance layer (air gap, membrane) has no conductivity, density or specific_heat")
		}
		if l.Name == "" {
			l.Name = "air layer"
		}
		l.Source = "given in the scenario"
	}
	if !o.has("thickness") && l.Resistance == 0 {
		return l, o.missing("thickness", `e.g. "105 mm" or 0.105 (m)`)
	}

	if err := d.decodeFreezing(o, &l); err != nil {
		return l, err
	}
	if err := l.Validate(); err != nil {
		return l, &Error{File: d.file, Line: o.node.Line, Key: o.path, Msg: err.Error()}
	}
	return l, nil
}

func (d *decoder) decodeFreezing(o *object, l *layers.Layer) error {
	keys := []string{"latent_heat", "conductivity_frozen", "specific_heat_frozen", "freezing_point", "freezing_range"}
	any := false
	for _, k := range keys {
		any = any || o.has(k)
	}
	if !any {
		return nil
	}
	if l.Freeze != nil {
		// A soil or preset already freezes: the keys override single values.
		fz := *l.Freeze
		if v, ok, err := o.positive("latent_heat", layers.LatentHeatVolumetric); err != nil {
			return err
		} else if ok {
			fz.LatentHeat = v
		}
		if v, ok, err := o.positive("conductivity_frozen", layers.Conductivity); err != nil {
			return err
		} else if ok {
			fz.ConductivityFrozen = v
		}
		if v, ok, err := o.positive("specific_heat_frozen", layers.SpecificHeat); err != nil {
			return err
		} else if ok {
			fz.HeatCapacityFrozen = v * l.Density
		}
		if v, ok, err := o.quantity("freezing_point", layers.Temperature); err != nil {
			return err
		} else if ok {
			fz.Point = v
		}
		if v, ok, err := o.nonNegative("freezing_range", layers.TemperatureDifference); err != nil {
			return err
		} else if ok {
			fz.Range = v
		}
		l.Freeze = &fz
		return nil
	}
	if !o.has("latent_heat") {
		return o.missing("latent_heat", "freezing keys need the latent heat of the layer's water, J/m3 of layer (e.g. dry density x water content x 334 kJ/kg)")
	}
	lh, _, err := o.positive("latent_heat", layers.LatentHeatVolumetric)
	if err != nil {
		return err
	}
	f := &layerFreeze{Latent: lh, Conductivity: l.Conductivity, SpecificHeat: l.SpecificHeat}
	if v, ok, err := o.positive("conductivity_frozen", layers.Conductivity); err != nil {
		return err
	} else if ok {
		f.Conductivity = v
	}
	if v, ok, err := o.positive("specific_heat_frozen", layers.SpecificHeat); err != nil {
		return err
	} else if ok {
		f.SpecificHeat = v
	}
	if v, ok, err := o.quantity("freezing_point", layers.Temperature); err != nil {
		return err
	} else if ok {
		f.Point = v
	}
	if v, ok, err := o.nonNegative("freezing_range", layers.TemperatureDifference); err != nil {
		return err
	} else if ok {
		f.Range = v
	}
	if l.Resistance > 0 && l.Thickness == 0 {
		return o.errKey("latent_heat", "a resistance layer cannot freeze")
	}
	f.apply(l)
	return nil
}

func (d *decoder) decodeSides(top *object, s *Scenario) error {
	outKey, inKey := "outside", "inside"
	wrongOut, wrongIn := "surface", "bottom"
	if s.Kind == Ground {
		outKey, inKey, wrongOut, wrongIn = wrongOut, wrongIn, outKey, inKey
	}
	for _, w := range []struct{ wrong, right string }{{wrongOut, outKey}, {wrongIn, inKey}} {
		if top.has(w.wrong) {
			return top.errKey(w.wrong, "a %s scenario names this side %q", s.Kind, w.right)
		}
	}
	rsi, rse := layers.SurfaceResistances(s.Orientation)
	var err error
	if s.Outside, err = d.decodeSide(top, outKey, s, rse, true); err != nil {
		return err
	}
	if s.Inside, err = d.decodeSide(top, inKey, s, rsi, false); err != nil {
		return err
	}
	return nil
}

func (d *decoder) decodeSide(top *object, key string, s *Scenario, defaultR float64, outside bool) (Side, error) {
	side := Side{Resistance: defaultR, NFreezing: 1, NThawing: 1}
	allowed := sideKeys
	if s.Kind == Ground {
		side.Resistance = 0
		allowed = bottomKeys
		if outside {
			allowed = surfaceKeys
		}
	}
	o, ok, err := top.child(key, allowed)
	if err != nil {
		return side, err
	}
	if !ok {
		switch {
		case outside:
			return side, top.missing(key, "the temperature on this side, e.g. temperature: {mean: 10, daily: {amplitude: 8, peak_hour: 15}}")
		case s.Kind == Ground:
			// Default bottom: the continental mean geothermal heat flux,
			// 65 mW/m2 (Pollack, Hurter and Johnson 1993, Rev. Geophys.
			// 31:267, abstract [read]).
			side.HeatFlux, side.Flux = DefaultGeothermalFlux, true
			return side, nil
		}
		// Default inside: 20 degC air behind the ISO 6946 resistance.
		side.Temperature = &Forcing{Periodic: climate.Periodic{Mean: 20}}
		return side, nil
	}
	if v, ok, err := o.nonNegative("resistance", layers.Resistance); err != nil {
		return side, err
	} else if ok {
		side.Resistance = v
	}
	if err := d.decodeNFactors(o, &side); err != nil {
		return side, err
	}
	n := 0
	if o.has("temperature") {
		n++
		f, err := d.decodeForcing(o, "temperature", forcingTemperature)
		if err != nil {
			return side, err
		}
		side.Temperature = f
	}
	if o.has("solar") {
		if !outside {
			return side, o.errKey("solar", "the sun shines on the outside surface only")
		}
		if err := d.decodeSolar(o, s, &side); err != nil {
			return side, err
		}
	}
	if v, ok, err := o.quantity("heat_flux", layers.HeatFlux); err != nil {
		return side, err
	} else if ok {
		n++
		side.HeatFlux, side.Flux = v, true
	}
	if b, ok, err := o.boolean("adiabatic"); err != nil {
		return side, err
	} else if ok && b {
		n++
		side.Adiabatic = true
	}
	switch {
	case n == 0:
		return side, o.missing("temperature", "give temperature, heat_flux or adiabatic: true")
	case n > 1:
		return side, o.d.errf(o.node, o.path, "give only one of temperature, heat_flux and adiabatic")
	}
	if outside && side.Temperature == nil {
		return side, o.missing("temperature", "the "+key+" side is driven by a temperature")
	}
	if s.Kind == Ground && !outside && side.Temperature != nil && len(side.Temperature.Harmonics) > 0 {
		return side, o.errKey("temperature", "the bottom temperature must be constant: give only a mean")
	}
	return side, nil
}

// forcingKind says what a forcing block holds.
type forcingKind int

const (
	forcingTemperature forcingKind = iota // degC, amplitudes in K
	forcingIrradiance                     // W/m2, amplitudes in W/m2
)

// decodeForcing reads a temperature (or irradiance) forcing: a single
// value, a mapping of mean and harmonics, a step, or a CSV series.
func (d *decoder) decodeForcing(parent *object, key string, kind forcingKind) (*Forcing, error) {
	valueKind, ampKind, unit := layers.Temperature, layers.TemperatureDifference, "C"
	if kind == forcingIrradiance {
		valueKind, ampKind, unit = layers.Irradiance, layers.Irradiance, "W/m2"
	}
	f := &Forcing{Line: parent.line(key)}
	v := parent.values[key]
	if v.Kind == yaml.ScalarNode {
		// A bare value: a constant temperature.
		t, _, err := parent.quantity(key, valueKind)
		if err != nil {
			return nil, err
		}
		f.Mean = t
		return f, nil
	}
	o, err := d.object(v, join(parent.path, key), append(append([]string(nil), tempKeys...), seriesKeys...))
	if err != nil {
		return nil, err
	}
	if o.has("file") {
		for _, k := range tempKeys {
			if o.has(k) {
				return nil, o.errKey(k, "a measured series stands alone; remove %s or file", k)
			}
		}
		m, err := d.decodeSeries(o, unit)
		if err != nil {
			return nil, err
		}
		p, err := fitMeasured(m)
		if err != nil {
			return nil, o.errKey("file", "cannot fit the record's mean and harmonics: %v", err)
		}
		f.Measured, f.Periodic = m, p
		return f, nil
	}
	for _, k := range seriesKeys {
		if o.has(k) {
			return nil, o.errKey(k, "belongs to a measured series: give file too")
		}
	}
	if kind == forcingIrradiance && o.has("step") {
		return nil, o.errKey("step", "irradiance takes a mean and harmonics, or a series")
	}
	if st, ok, err := o.child("step", []string{"from", "to", "at"}); err != nil {
		return nil, err
	} else if ok {
		for _, k := range []string{"mean", "daily", "annual", "harmonics"} {
			if o.has(k) {
				return nil, o.errKey(k, "a step forcing stands alone; remove %s or step", k)
			}
		}
		var step Step
		for _, k := range []string{"from", "to"} {
			t, ok, err := st.quantity(k, layers.Temperature)
			if err != nil {
				return nil, err
			}
			if !ok {
				return nil, st.missing(k, "temperature in degC")
			}
			if k == "from" {
				step.From = t
			} else {
				step.To = t
			}
		}
		at, _, err := st.nonNegative("at", layers.Duration)
		if err != nil {
			return nil, err
		}
		step.At = at
		f.Step = &step
		f.Mean = step.From
		return f, nil
	}
	mean, ok, err := o.quantity("mean", valueKind)
	if err != nil {
		return nil, err
	}
	if !ok {
		return nil, o.missing("mean", "the mean value")
	}
	f.Mean = mean
	if h, ok, err := d.harmonicBlock(o, "daily", "peak_hour", climate.Day, climate.Day/24, ampKind); err != nil {
		return nil, err
	} else if ok {
		f.Harmonics = append(f.Harmonics, h)
	}
	if h, ok, err := d.harmonicBlock(o, "annual", "peak_day", climate.Year, climate.Day, ampKind); err != nil {
		return nil, err
	} else if ok {
		f.Harmonics = append(f.Harmonics, h)
	}
	if items, ok, err := o.list("harmonics"); err != nil {
		return nil, err
	} else if ok {
		for i, n := range items {
			ho, err := d.object(n, fmt.Sprintf("%s.harmonics[%d]", o.path, i+1), []string{"period", "amplitude", "peak"})
			if err != nil {
				return nil, err
			}
			p, ok, err := ho.positive("period", layers.Period)
			if err != nil {
				return nil, err
			}
			if !ok {
				return nil, ho.missing("period", `e.g. "12h" or "365d"`)
			}
			a, ok, err := ho.nonNegative("amplitude", ampKind)
			if err != nil {
				return nil, err
			}
			if !ok {
				return nil, ho.missing("amplitude", "half the peak-to-peak swing")
			}
			pk, _, err := ho.nonNegative("peak", layers.Duration)
			if err != nil {
				return nil, err
			}
			f.Harmonics = append(f.Harmonics, climate.Harmonic{Period: p, Amplitude: a, Peak: pk})
		}
	}
	return f, nil
}

// harmonicBlock decodes {amplitude, peak_X} where the peak is given in
// units of unit seconds (hours for daily, days for annual).
func (d *decoder) harmonicBlock(o *object, key, peakKey string, period, unit float64, ampKind layers.Kind) (climate.Harmonic, bool, error) {
	c, ok, err := o.child(key, []string{"amplitude", peakKey})
	if err != nil || !ok {
		return climate.Harmonic{}, false, err
	}
	a, ok, err := c.nonNegative("amplitude", ampKind)
	if err != nil {
		return climate.Harmonic{}, false, err
	}
	if !ok {
		return climate.Harmonic{}, false, c.missing("amplitude", "half the peak-to-peak swing")
	}
	h := climate.Harmonic{Period: period, Amplitude: a}
	if c.has(peakKey) {
		s, _, err := c.scalar(peakKey)
		if err != nil {
			return h, false, err
		}
		var x float64
		if _, err := fmt.Sscan(s, &x); err != nil || strings.ContainsAny(s, " \t") {
			return h, false, c.errKey(peakKey, "expected a number, got %q", s)
		}
		max := period / unit
		if x < 0 || x > max {
			return h, false, c.errKey(peakKey, "must lie between 0 and %g, got %g", max, x)
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
	return h, true, nil
}

func (d *decoder) decodeAnalysis(top *object, s *Scenario) error {
	a := &s.Analysis
	a.Periods = []float64{climate.Day}
	a.Response = Response{From: 3600, To: climate.Year, Points: 61}
	if s.Kind == Ground {
		a.Periods = []float64{climate.Year, climate.Day}
	}
	o, ok, err := top.child("analysis", analysisKeys)
	if err != nil {
		return err
	}
	a.Simulate = &Simulate{}
	if !ok {
		return nil
	}
	a.Line = top.line("analysis")
	if err := d.decodeSimulate(o, s); err != nil {
		return err
	}
	if err := d.decodeStepResponse(o, s); err != nil {
		return err
	}
	if err := d.decodeFit(o, s); err != nil {
		return err
	}
	if items, ok, err := o.list("periods"); err != nil {
		return err
	} else if ok {
		if len(items) == 0 {
			return o.errKey("periods", "the list is empty; give at least one period, e.g. [24h]")
		}
		a.Periods = nil
		for i, n := range items {
			p, err := d.scalarQuantity(n, fmt.Sprintf("analysis.periods[%d]", i+1), layers.Period)
			if err != nil {
				return err
			}
			if !(p > 0) {
				return d.errf(n, fmt.Sprintf("analysis.periods[%d]", i+1), "a period must be positive")
			}
			a.Periods = append(a.Periods, p)
		}
	}
	if v, ok, err := o.quantity("design_freezing_index", layers.DegreeDays); err != nil {
		return err
	} else if ok {
		if s.Kind != Ground {
			return o.errKey("design_freezing_index", "applies to kind: ground only")
		}
		if v < 0 {
			return o.errKey("design_freezing_index", "a freezing index is a sum of degree-days below 0 degC and cannot be negative, got %g", v)
		}
		a.DesignFreezingIndex = &v
		a.DesignLine = o.line("design_freezing_index")
	}
	if v, ok, err := o.positive("design_season_length", layers.Duration); err != nil {
		return err
	} else if ok {
		if !o.has("design_freezing_index") {
			return o.errKey("design_season_length", "goes with design_freezing_index")
		}
		if v > climate.Year {
			return o.errKey("design_season_length", "a freezing season cannot be longer than a year")
		}
		a.DesignSeason = v
	}
	if r, ok, err := o.child("response", []string{"from", "to", "points"}); err != nil {
		return err
	} else if ok {
		if v, ok, err := r.positive("from", layers.Period); err != nil {
			return err
		} else if ok {
			a.Response.From = v
		}
		if v, ok, err := r.positive("to", layers.Period); err != nil {
			return err
		} else if ok {
			a.Response.To = v
		}
		if n, ok, err := r.integer("points"); err != nil {
			return err
		} else if ok {
			if n < 2 || n > 1000 {
				return r.errKey("points", "must lie between 2 and 1000, got %d", n)
			}
			a.Response.Points = n
		}
		if a.Response.To <= a.Response.From {
			return r.errKey("to", "must be longer than from")
		}
	}
	if items, ok, err := o.list("probes"); err != nil {
		return err
	} else if ok {
		for i, n := range items {
			key := fmt.Sprintf("analysis.probes[%d]", i+1)
			z, err := d.scalarQuantity(n, key, layers.Length)
			if err != nil {
				return err
			}
			if z < 0 {
				return d.errf(n, key, "a probe depth must not be negative")
			}
			if total := s.construction().Thickness(); z > total*(1+1e-12) && s.Kind == Wall {
				return d.errf(n, key, "probe at %g m lies outside the column, which is %g m thick", z, total)
			}
			a.Probes = append(a.Probes, z)
			a.ProbeLines = append(a.ProbeLines, n.Line)
		}
	}
	return nil
}

func (d *decoder) scalarQuantity(n *yaml.Node, key string, kind layers.Kind) (float64, error) {
	if n.Kind != yaml.ScalarNode {
		return 0, d.errf(n, key, "expected a single value, found %s", kindName(n))
	}
	v, err := layers.ParseQuantity(n.Value, kind)
	if err != nil {
		return 0, d.errf(n, key, "%v", err)
	}
	return v, nil
}

// layerFreeze collects the freezing keys of a layer before they are turned
// into volumetric values.
type layerFreeze struct {
	Latent       float64 // J/m3
	Conductivity float64 // W/(m K), frozen
	SpecificHeat float64 // J/(kg K), frozen
	Point        float64 // degC
	Range        float64 // K
}

func (f layerFreeze) apply(l *layers.Layer) {
	l.Freeze = &solver.Freezing{
		Point:              f.Point,
		Range:              f.Range,
		LatentHeat:         f.Latent,
		ConductivityFrozen: f.Conductivity,
		HeatCapacityFrozen: l.Density * f.SpecificHeat,
	}
}

func (d *decoder) decodeSimulate(o *object, s *Scenario) error {
	if !o.has("simulate") {
		return nil
	}
	v := o.values["simulate"]
	if v.Kind == yaml.ScalarNode && v.Tag == "!!bool" {
		b, _, err := o.boolean("simulate")
		if err != nil {
			return err
		}
		if !b {
			s.Analysis.Simulate = nil
		}
		return nil
	}
	so, _, err := o.child("simulate", simulateKeys)
	if err != nil {
		return err
	}
	sim := s.Analysis.Simulate
	sim.Line = o.line("simulate")
	sim.set = map[string]int{}
	for k := range so.keys {
		sim.set[k] = so.line(k)
	}
	if v, ok, err := so.positive("duration", layers.Duration); err != nil {
		return err
	} else if ok {
		sim.Duration = v
	}
	if v, ok, err := so.nonNegative("start", layers.Duration); err != nil {
		return err
	} else if ok {
		if m := s.Outside.Temperature; m != nil && m.Measured != nil {
			return so.errKey("start", "a measured series sets its own start; cut the file instead")
		}
		sim.Start = v
	}
	if v, ok, err := so.positive("step", layers.Duration); err != nil {
		return err
	} else if ok {
		sim.Step = v
	}
	if v, ok, err := so.positive("output_step", layers.Duration); err != nil {
		return err
	} else if ok {
		sim.Sample = v
	}
	if sim.Duration > 0 && sim.Step > sim.Duration {
		return so.errKey("step", "the time step (%s) is longer than the simulated duration (%s)", fmtDuration(sim.Step), fmtDuration(sim.Duration))
	}
	if v, ok, err := so.quantity("initial_temperature", layers.Temperature); err != nil {
		return err
	} else if ok {
		sim.Initial = &v
	}
	if n, ok, err := so.integer("spin_up_cycles"); err != nil {
		return err
	} else if ok {
		if n < 1 || n > 1000 {
			return so.errKey("spin_up_cycles", "must lie between 1 and 1000, got %d", n)
		}
		sim.MaxSpinUpCycles = n
	}
	if mo, ok, err := so.child("mesh", meshKeys); err != nil {
		return err
	} else if ok {
		m := &sim.Mesh
		for _, f := range []struct {
			key  string
			kind layers.Kind
			dst  *float64
		}{
			{"surface_cell", layers.Length, &m.SurfaceCell},
			{"max_cell", layers.Length, &m.MaxCell},
		} {
			if v, ok, err := mo.positive(f.key, f.kind); err != nil {
				return err
			} else if ok {
				*f.dst = v
			}
		}
		if mo.has("growth") {
			s, _, err := mo.scalar("growth")
			if err != nil {
				return err
			}
			g, err := strconv.ParseFloat(s, 64)
			if err != nil || g < 1 || g > 1.5 {
				return mo.errKey("growth", "must be a number from 1 (uniform cells) to 1.5, got %q", s)
			}
			m.Growth = g
		}
		if mo.has("cells_per_depth") {
			s, _, err := mo.scalar("cells_per_depth")
			if err != nil {
				return err
			}
			c, err := strconv.ParseFloat(s, 64)
			if err != nil || c < 1 || c > 1000 {
				return mo.errKey("cells_per_depth", "must be a number from 1 to 1000, got %q", s)
			}
			m.CellsPerDepth = c
		}
		if n, ok, err := mo.integer("min_cells_per_layer"); err != nil {
			return err
		} else if ok {
			if n < 1 || n > 10000 {
				return mo.errKey("min_cells_per_layer", "must lie between 1 and 10000, got %d", n)
			}
			m.MinCellsPerLayer = n
		}
	}
	return nil
}

func (d *decoder) decodeStepResponse(o *object, s *Scenario) error {
	so, ok, err := o.child("step_response", []string{"side", "change", "duration", "contact_temperature", "contact_effusivity"})
	if err != nil || !ok {
		return err
	}
	sides := []string{"outside", "inside"}
	if s.Kind == Ground {
		sides = []string{"surface"}
	}
	st := &StepResponse{Side: sides[0], Change: 10, Duration: 600, Line: o.line("step_response")}
	if s.Kind == Wall && (s.Orientation == layers.Floor) {
		st.Side = "inside"
	}
	if v, ok, err := so.choice("side", sides); err != nil {
		return err
	} else if ok {
		st.Side = v
	}
	if v, ok, err := so.quantity("change", layers.TemperatureDifference); err != nil {
		return err
	} else if ok {
		if v == 0 {
			return so.errKey("change", "a step of 0 K shows nothing; give e.g. 10 K")
		}
		st.Change = v
	}
	if v, ok, err := so.positive("duration", layers.Duration); err != nil {
		return err
	} else if ok {
		st.Duration = v
	}
	if v, ok, err := so.quantity("contact_temperature", layers.Temperature); err != nil {
		return err
	} else if ok {
		st.ContactTemperature = &v
	}
	if v, ok, err := so.positive("contact_effusivity", layers.Effusivity); err != nil {
		return err
	} else if ok {
		st.ContactEffusivity = v
	}
	if (st.ContactTemperature == nil) != (st.ContactEffusivity == 0) {
		return so.errKey("contact_effusivity", "give contact_temperature and contact_effusivity together")
	}
	s.Analysis.StepResponse = st
	return nil
}

// fmtDuration prints a duration in s in the largest whole unit.
func fmtDuration(sec float64) string {
	switch {
	case sec >= climate.Year && math.Mod(sec, climate.Year) == 0:
		return fmt.Sprintf("%gy", sec/climate.Year)
	case sec >= climate.Day && math.Mod(sec, climate.Day) == 0:
		return fmt.Sprintf("%gd", sec/climate.Day)
	case sec >= 3600:
		return fmt.Sprintf("%gh", sec/3600)
	case sec >= 60:
		return fmt.Sprintf("%gmin", sec/60)
	}
	return fmt.Sprintf("%gs", sec)
}

// allMaterialKeys lists the building materials and the ground presets, for
// did-you-mean suggestions.
func allMaterialKeys() []string {
	keys := layers.MaterialKeys()
	for _, p := range ground.Presets() {
		keys = append(keys, p.Key)
	}
	return keys
}

// presetLayer turns a ground preset into a layer (thickness set later).
func presetLayer(p ground.SoilPreset) (layers.Layer, error) {
	sl, err := p.Layer(p.Key, 1)
	if err != nil {
		return layers.Layer{}, err
	}
	l := fromSolverLayer(sl, bulkDensity(p.Soil))
	l.Name, l.MaterialKey, l.Source, l.Family = p.Description, p.Key, p.Source, "soil"
	l.Thickness = 0
	return l, nil
}

// bulkDensity is the wet bulk density of a soil, kg/m3: dry density plus
// pore water, rho_d (1 + w). A fixed-property preset reports 2000 kg/m3
// only to split its volumetric heat capacity into rho and c for display.
func bulkDensity(s *ground.Soil) float64 {
	if s == nil {
		return 2000
	}
	return s.DryDensity * (1 + s.WaterContent)
}

// fromSolverLayer converts a solver layer from the soil models into a
// layers.Layer with density rho and c = C / rho.
func fromSolverLayer(sl solver.Layer, rho float64) layers.Layer {
	return layers.Layer{
		Name:         sl.Name,
		Thickness:    sl.Thickness,
		Conductivity: sl.Conductivity,
		Density:      rho,
		SpecificHeat: sl.HeatCapacity / rho,
		Freeze:       sl.Freeze,
		Family:       "soil",
	}
}

// decodeSoil reads a soil: block (texture, dry density, water content) and
// returns the layer its property models give (thickness set later).
func (d *decoder) decodeSoil(parent *object, s *Scenario) (layers.Layer, error) {
	o, _, err := parent.child("soil", soilKeys)
	if err != nil {
		return layers.Layer{}, err
	}
	var soil ground.Soil
	tex, ok, err := o.choice("texture", []string{"sand", "gravel", "silt-clay", "silt", "clay"})
	if err != nil {
		return layers.Layer{}, err
	}
	if !ok {
		return layers.Layer{}, o.missing("texture", "sand (sand and gravel) or silt-clay")
	}
	if soil.Texture, err = ground.ParseTexture(tex); err != nil {
		return layers.Layer{}, o.errKey("texture", "%v", err)
	}
	v, ok, err := o.positive("dry_density", layers.Density)
	if err != nil {
		return layers.Layer{}, err
	}
	if !ok {
		return layers.Layer{}, o.missing("dry_density", "kg of solids per m3 of soil, e.g. 1700")
	}
	if v < 200 || v > 2600 {
		// Mineral soils lie far inside this range; values outside it are
		// typing slips (a unit of g/cm3 given as kg/m3, say).
		return layers.Layer{}, o.errKey("dry_density", "%g kg/m3 is not the dry density of a soil (expect 200 to 2600 kg/m3, typically 1200 to 2100)", v)
	}
	soil.DryDensity = v
	w, ok, err := o.nonNegative("water_content", layers.Fraction)
	if err != nil {
		return layers.Layer{}, err
	}
	if !ok {
		return layers.Layer{}, o.missing("water_content", "mass of water per mass of dry soil, e.g. 15 %")
	}
	soil.WaterContent = w
	if m, ok, err := o.choice("model", []string{"kersten", "johansen"}); err != nil {
		return layers.Layer{}, err
	} else if ok {
		if soil.Model, err = ground.ParseModel(m); err != nil {
			return layers.Layer{}, o.errKey("model", "%v", err)
		}
	}
	if q, ok, err := o.nonNegative("quartz", layers.Fraction); err != nil {
		return layers.Layer{}, err
	} else if ok {
		if q > 1 {
			return layers.Layer{}, o.errKey("quartz", "a fraction of the solids must not exceed 1 (100 %%)")
		}
		soil.Quartz = q
	}
	if v, ok, err := o.positive("solids_density", layers.Density); err != nil {
		return layers.Layer{}, err
	} else if ok {
		soil.SolidsDensity = v
	}
	if v, ok, err := o.positive("solids_specific_heat", layers.SpecificHeat); err != nil {
		return layers.Layer{}, err
	} else if ok {
		soil.SolidsHeat = v
	}
	if v, ok, err := o.quantity("freezing_point", layers.Temperature); err != nil {
		return layers.Layer{}, err
	} else if ok {
		soil.FreezingPoint = v
	}
	if v, ok, err := o.nonNegative("freezing_range", layers.TemperatureDifference); err != nil {
		return layers.Layer{}, err
	} else if ok {
		soil.FreezingRange = v
	}
	if err := soil.Validate(); err != nil {
		return layers.Layer{}, o.d.errf(o.node, o.path, "%v", err)
	}
	sl, err := soil.Layer("soil", 1)
	if err != nil {
		return layers.Layer{}, o.d.errf(o.node, o.path, "%v", err)
	}
	l := fromSolverLayer(sl, bulkDensity(&soil))
	l.Thickness = 0
	l.Name = fmt.Sprintf("%s, %.0f kg/m3 dry, %.0f %% water", tex, soil.DryDensity, 100*soil.WaterContent)
	model := "Kersten (1949)"
	if soil.Model == ground.ModelJohansen {
		model = "Johansen (1975)"
	}
	l.Source = "soil model: conductivity " + model + "; volumetric heat capacity of solids plus water or ice; latent heat = dry density × water content × 334 kJ/kg"
	return l, nil
}

// decodeNFactors reads n_factor (a number, or {freezing, thawing}) and
// cover (a surface preset of UFC 3-130-04 Table 4-1) of a ground surface.
func (d *decoder) decodeNFactors(o *object, side *Side) error {
	if o.has("cover") {
		keys := []string{}
		for _, n := range ground.Surfaces() {
			keys = append(keys, n.Surface)
		}
		c, _, err := o.choice("cover", keys)
		if err != nil {
			return err
		}
		n, _ := ground.NFactor(c)
		side.Cover = c
		side.NFreezing = n.Freezing
		if th, ok := n.Thawing(); ok {
			side.NThawing = th
		} else {
			side.NThawing = 0 // decided below: given, or 1 with a warning
		}
	}
	if o.has("n_factor") {
		v := o.values["n_factor"]
		if v.Kind == yaml.ScalarNode {
			n, _, err := o.positive("n_factor", layers.Fraction)
			if err != nil {
				return err
			}
			side.NFreezing, side.NThawing = n, n
		} else {
			no, _, err := o.child("n_factor", []string{"freezing", "thawing"})
			if err != nil {
				return err
			}
			if n, ok, err := no.positive("freezing", layers.Fraction); err != nil {
				return err
			} else if ok {
				side.NFreezing = n
			}
			if n, ok, err := no.positive("thawing", layers.Fraction); err != nil {
				return err
			} else if ok {
				side.NThawing = n
			}
		}
	}
	for _, n := range []float64{side.NFreezing, side.NThawing} {
		if n > 3 {
			return o.errKey("n_factor", "an n-factor above 3 is outside every published table; check the value")
		}
	}
	return nil
}
