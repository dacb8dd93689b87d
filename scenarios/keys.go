package scenarios

import (
	"fmt"
	"sort"
	"strings"
	"sync"

	"tempstack/ground"
	"tempstack/layers"
)

// The key tables below are the one description of the scenario file's
// keys: the decoder opens every mapping with one of them (object, child),
// so a key it does not list is unknown, and its value helpers check at
// every read that the table gives the key the shape they read (see
// object.expect; a mismatch is recorded as drift, which the tests fail
// on). Schema turns the same tables into the JSON Schema published in
// scenarios/schema. A new kind of scenario adds its tables here and hangs
// them under topKeys.

// shape is what a key's value looks like in the file.
type shape int

const (
	shapeText     shape = iota // a string
	shapeNumber                // a plain number
	shapeMeasure               // a number with an optional unit of any kind ("240 mm"), as studies read them
	shapeQuantity              // a quantity: a number in the key's default unit, or a string with a unit
	shapeBool                  // true or false
	shapeInteger               // a whole number
	shapeChoice                // one word of a fixed list
	shapeObject                // a mapping of the keys of a table
	shapeList                  // a list of items of one form
	shapeMap                   // a mapping of free keys (parameter paths)
)

// form is one accepted form of a key's value.
type form struct {
	shape shape
	kinds []layers.Kind    // shapeQuantity: the quantity kinds (a forcing is a temperature or an irradiance)
	enum  func() []string  // shapeChoice: the words
	table func() *keyTable // shapeObject: the keys (a func: tables refer to each other)
	item  *form            // shapeList: the form of an item
}

// keySpec describes one key of a mapping.
type keySpec struct {
	Name  string
	Doc   string
	Forms []form // accepted forms; more than one: any of them
}

// keyTable is the set of keys of one mapping of the scenario file.
type keyTable struct {
	Name     string // definition name in the schema
	Doc      string
	Keys     []keySpec
	Required []string // keys the schema requires (the decoder may require more, by kind)
}

// names lists the keys of t in table order.
func (t *keyTable) names() []string {
	out := make([]string, len(t.Keys))
	for i, k := range t.Keys {
		out[i] = k.Name
	}
	return out
}

// key returns the spec of name, nil when t has no such key.
func (t *keyTable) key(name string) *keySpec {
	for i := range t.Keys {
		if t.Keys[i].Name == name {
			return &t.Keys[i]
		}
	}
	return nil
}

// plus returns a table with the keys of t and then those of u.
func (t *keyTable) plus(name, doc string, u *keyTable) *keyTable {
	keys := append(append([]keySpec(nil), t.Keys...), u.Keys...)
	return &keyTable{Name: name, Doc: doc, Keys: keys}
}

// only returns a table named name holding the keys of t that are listed,
// in t's order.
func (t *keyTable) only(name, doc string, keys ...string) *keyTable {
	out := &keyTable{Name: name, Doc: doc}
	for _, ks := range t.Keys {
		for _, want := range keys {
			if ks.Name == want {
				out.Keys = append(out.Keys, ks)
			}
		}
	}
	return out
}

// Form constructors.
var (
	fText    = form{shape: shapeText}
	fNumber  = form{shape: shapeNumber}
	fMeasure = form{shape: shapeMeasure}
	fBool    = form{shape: shapeBool}
	fInteger = form{shape: shapeInteger}
	fMap     = form{shape: shapeMap}
)

func fQty(k ...layers.Kind) form         { return form{shape: shapeQuantity, kinds: k} }
func fChoice(words func() []string) form { return form{shape: shapeChoice, enum: words} }
func fWords(words ...string) form {
	return fChoice(func() []string { return words })
}
func fObject(t func() *keyTable) form { return form{shape: shapeObject, table: t} }
func fList(item form) form            { return form{shape: shapeList, item: &item} }

func k(name, doc string, forms ...form) keySpec { return keySpec{Name: name, Doc: doc, Forms: forms} }

// Quantity kinds of a forcing's values and amplitudes: a temperature
// (degC, K) or an irradiance (W/m2).
var (
	forcingValue     = []layers.Kind{layers.Temperature, layers.Irradiance, layers.HeatFlux}
	forcingAmplitude = []layers.Kind{layers.TemperatureDifference, layers.Irradiance, layers.HeatFlux}
)

// The key tables of the scenario file. The decoder uses them under these
// names (d.object, o.child).
var (
	topKeys = &keyTable{
		Name: "scenario", Doc: "A tempstack scenario: a layered wall, roof or floor, a ground column, or a room of layered elements, and its climate.",
		Required: []string{"title", "kind"},
		Keys: append([]keySpec{
			k("title", "a one-line name for the report", fText),
			k("description", "a paragraph shown under the title", fText),
			k("project", "title block: project", fText),
			k("client", "title block: client", fText),
			k("prepared_by", "title block: prepared by", fText),
			k("revision", "title block: revision", fText),
			k("kind", "what the file describes", fChoice(kindWords)),
			k("orientation", "wall kind: heat-flow direction for the ISO 6946 surface resistances", fWords("wall", "roof", "floor")),
			k("layers", "wall: outside first; ground: surface first", fList(fObject(func() *keyTable { return layerKeys }))),
			k("outside", "wall kind: the outside side; room kind: the outdoor air", fObject(func() *keyTable { return sideKeys }), fObject(func() *keyTable { return roomOutsideKeys })),
			k("inside", "wall kind: the inside side (default 20 degC behind Rsi)", fObject(func() *keyTable { return sideKeys })),
			k("surface", "ground kind: the ground surface", fObject(func() *keyTable { return surfaceKeys })),
			k("bottom", "ground kind: the bottom of the column (default the geothermal flux 0.065 W/m2)", fObject(func() *keyTable { return bottomKeys })),
			k("analysis", "what to compute", fObject(func() *keyTable { return analysisKeys })),
			k("variants", "design study: named variants of the file", fList(fObject(func() *keyTable { return variantKeys }))),
			k("sweep", "design study: one parameter over a range", fObject(func() *keyTable { return sweepKeys })),
			k("target", "design study: the parameter value that meets a goal", fObject(func() *keyTable { return targetKeys })),
			k("uncertainty", "design study: Monte Carlo over uncertain parameters", fObject(func() *keyTable { return uncertaintyKeys })),
		}, roomTopKeys.Keys...),
	}
	// roomTopKeys are the top keys of kind: room only.
	roomTopKeys = &keyTable{
		Name: "roomTop", Doc: "The top keys of a room scenario.",
		Keys: []keySpec{
			k("room", "room kind: the air volume, ventilation and gains", fObject(func() *keyTable { return roomKeys })),
			k("elements", "room kind: the walls, roof, floor and partitions", fList(fObject(func() *keyTable { return roomElementKeys }))),
			k("windows", "room kind: massless glazing, U A and transmitted sun", fList(fObject(func() *keyTable { return windowKeys }))),
			k("thresholds", "room kind: temperatures whose hours above are counted (default 25, 26, 28 degC)", fList(fQty(layers.Temperature))),
		},
	}
	roomKeys = &keyTable{
		Name: "room", Doc: "The room air node.",
		Keys: []keySpec{
			k("volume", "air volume, m3", fNumber),
			k("ventilation", "air changes per hour, or a day and night rate", fNumber, fObject(func() *keyTable { return ventilationKeys })),
			k("gains", "heat gains to the air, W: a constant, or a mean with a daily swing", fNumber, fObject(func() *keyTable { return gainsKeys })),
			k("step", "time step of the simulation (divides one hour; default 15 min)", fQty(layers.Duration)),
			k("warm_up", "auto (repeat the cycle until it repeats) or a duration", fWords("auto"), fQty(layers.Duration)),
		},
	}
	ventilationKeys = &keyTable{
		Name: "ventilation", Doc: "Air changes per hour by day and at night.",
		Keys: []keySpec{
			k("day", "air changes per hour by day", fNumber),
			k("night", "air changes per hour at night", fNumber),
			k("night_from", "hour the night rate starts, 0 to 24 (default 22)", fNumber),
			k("night_to", "hour the night rate ends, 0 to 24 (default 7)", fNumber),
		},
	}
	gainsKeys = &keyTable{
		Name: "gains", Doc: "Heat gains to the room air, W.",
		Keys: []keySpec{
			k("mean", "mean gains, W", fNumber),
			k("daily", "the daily swing", fObject(func() *keyTable { return gainsDailyKeys })),
		},
	}
	gainsDailyKeys = &keyTable{
		Name: "gainsDaily", Doc: "The daily swing of the gains.",
		Keys: []keySpec{
			k("amplitude", "half the peak-to-peak swing, W", fNumber),
			k("peak_hour", "0 to 24", fNumber),
		},
	}
	roomElementKeys = &keyTable{
		Name: "element", Doc: "One layered element of a room: wall, roof, floor or partition.",
		Required: []string{"area"},
		Keys: []keySpec{
			k("name", "label", fText),
			k("area", "m2", fNumber),
			k("orientation", "heat-flow direction for the surface resistances (ISO 6946)", fWords(orientationWords...)),
			k("layers", "back (outside) first", fList(fObject(func() *keyTable { return layerKeys }))),
			k("construction", "a wall scenario file whose layers this element takes", fText),
			k("back", "what lies behind: outside (default) or adiabatic", fWords(backWords...)),
			k("solar", "sun on the back face (back: outside)", fObject(func() *keyTable { return solarKeys })),
		},
	}
	windowKeys = &keyTable{
		Name: "window", Doc: "A massless window: U A to the outdoor air, g A I of sun into the room (to the air, or in part to the surfaces sun_to names).",
		Required: []string{"area", "u_value"},
		Keys: []keySpec{
			k("name", "label", fText),
			k("area", "m2", fNumber),
			k("u_value", "", fQty(layers.HeatTransferCoefficient)),
			k("g_value", "total solar energy transmittance, 0 to 1", fQty(layers.Fraction)),
			k("irradiance", "solar irradiance on the window", fQty(layers.Irradiance), fObject(func() *keyTable { return forcingKeys })),
			k("sun_to", "where the transmitted sun is absorbed: fractions on elements' inside surfaces (the rest heats the air; default: all to the air)", fList(fObject(func() *keyTable { return sunToKeys }))),
		},
	}
	sunToKeys = &keyTable{
		Name: "sunTo", Doc: "A part of a window's transmitted sun absorbed at the inside surface of one element.",
		Required: []string{"element", "fraction"},
		Keys: []keySpec{
			k("element", "the name of a room element", fText),
			k("fraction", "part of the window's transmitted sun, 0 to 1", fQty(layers.Fraction)),
		},
	}
	roomOutsideKeys = &keyTable{
		Name: "roomOutside", Doc: "The outdoor air of a room.",
		Keys: []keySpec{sideTemperature},
	}
	layerKeys = &keyTable{
		Name: "layer", Doc: "One layer: a library material, a soil, properties given inline, a resistance, or a mix.",
		Keys: []keySpec{
			k("material", "a key of `tempstack materials` (building materials, air layers, soil and rock presets)", fText),
			k("name", "label", fText),
			k("thickness", "", fQty(layers.Length)),
			k("conductivity", "unfrozen value for a freezing layer", fQty(layers.Conductivity)),
			k("density", "", fQty(layers.Density)),
			k("specific_heat", "unfrozen value for a freezing layer", fQty(layers.SpecificHeat)),
			k("resistance", "a massless layer (air gap, membrane)", fQty(layers.Resistance)),
			k("conductivity_frozen", "", fQty(layers.Conductivity)),
			k("specific_heat_frozen", "", fQty(layers.SpecificHeat)),
			k("latent_heat", "per m3 of layer: makes the layer freeze", fQty(layers.LatentHeatVolumetric)),
			k("freezing_point", "", fQty(layers.Temperature)),
			k("freezing_range", "below the freezing point", fQty(layers.TemperatureDifference)),
			k("soil", "a soil described by its state", fObject(func() *keyTable { return soilKeys })),
			k("family", "how the report tints the layer", fChoice(layers.Families)),
			k("fractions", "a mixed layer (studs in insulation): parts side by side with their area fractions", fList(fObject(func() *keyTable { return mixPartKeys }))),
		},
	}
	mixPartKeys = &keyTable{
		Name: "mixPart", Doc: "One part of a mixed layer: a library material or inline properties, and its fraction of the face area.",
		Required: []string{"fraction"},
		Keys: []keySpec{
			k("material", "a key of `tempstack materials`", fText),
			k("name", "label", fText),
			k("fraction", "of the layer's face area, in (0, 1] (e.g. 15 % or 0.15); the parts sum to 1", fQty(layers.Fraction)),
			k("conductivity", "", fQty(layers.Conductivity)),
			k("density", "", fQty(layers.Density)),
			k("specific_heat", "", fQty(layers.SpecificHeat)),
		},
	}
	soilKeys = &keyTable{
		Name: "soil", Doc: "A soil whose property models give every value of the layer.",
		Keys: []keySpec{
			k("texture", "sand (sand and gravel) or silt-clay", fWords("sand", "gravel", "silt-clay", "silt", "clay")),
			k("dry_density", "kg of solids per m3 of soil", fQty(layers.Density)),
			k("water_content", "mass of water per mass of dry soil", fQty(layers.Fraction)),
			k("model", "conductivity model", fChoice(ground.ModelKeys)),
			k("quartz", "fraction of the solids (Johansen)", fQty(layers.Fraction)),
			k("solids_density", "", fQty(layers.Density)),
			k("solids_specific_heat", "", fQty(layers.SpecificHeat)),
			k("freezing_point", "", fQty(layers.Temperature)),
			k("freezing_range", "", fQty(layers.TemperatureDifference)),
		},
	}
	sideKeys = &keyTable{
		Name: "side", Doc: "A side of a wall: surface resistance and one of temperature, heat_flux or adiabatic.",
		Keys: []keySpec{sideResistance, sideTemperature, sideHeatFlux, sideAdiabatic,
			k("solar", "outside only: sol-air temperature", fObject(func() *keyTable { return solarKeys })),
		},
	}
	surfaceKeys = &keyTable{
		Name: "surface", Doc: "The ground surface: its temperature, resistance and n-factors.",
		Keys: []keySpec{sideResistance, sideTemperature,
			k("n_factor", "surface over air temperature: a number, or freezing and thawing", fQty(layers.Fraction), fObject(func() *keyTable { return nFactorKeys })),
			k("cover", "a surface preset that sets the n-factors", fChoice(surfaceCovers)),
		},
	}
	bottomKeys = &keyTable{
		Name: "bottom", Doc: "The bottom of a ground column: a constant temperature, a heat flux or adiabatic.",
		Keys: []keySpec{sideTemperature, sideHeatFlux, sideAdiabatic},
	}
	sideResistanceKeys = &keyTable{
		Name: "resistanceByPeriod", Doc: "A surface resistance that changes with the time of year (a snow cover).",
		Keys: []keySpec{
			k("value", "outside the periods", fQty(layers.Resistance)),
			k("periods", "", fList(fObject(func() *keyTable { return resistancePeriodKeys }))),
		},
	}
	resistancePeriodKeys = &keyTable{
		Name: "resistancePeriod", Doc: "A time of year with another surface resistance.",
		Keys: []keySpec{
			k("from_day", "day of the year, 1 = 1 January", fNumber),
			k("to_day", "day of the year, up to 366 (the end of the year)", fNumber),
			k("value", "", fQty(layers.Resistance)),
		},
	}
	nFactorKeys = &keyTable{
		Name: "nFactor", Doc: "Surface over air temperature below and above 0 degC.",
		Keys: []keySpec{
			k("freezing", "", fQty(layers.Fraction)),
			k("thawing", "", fQty(layers.Fraction)),
		},
	}
	tempKeys = &keyTable{
		Name: "harmonicForcing", Doc: "A mean with harmonics, or a step.",
		Keys: []keySpec{
			k("mean", "", fQty(forcingValue...)),
			k("daily", "", fObject(func() *keyTable { return dailyKeys })),
			k("annual", "", fObject(func() *keyTable { return annualKeys })),
			k("harmonics", "further harmonics", fList(fObject(func() *keyTable { return harmonicKeys }))),
			k("step", "temperature only: a sudden change", fObject(func() *keyTable { return stepKeys })),
		},
	}
	// fluxForcingKeys is a heat flux that changes in time: a mean with
	// harmonics (no step, no measured series).
	fluxForcingKeys = tempKeys.only("fluxForcing", "A heat flux over time: a mean with harmonics.", "mean", "daily", "annual", "harmonics")
	seriesKeys      = &keyTable{
		Name: "series", Doc: "A measured series in a CSV file.",
		Keys: []keySpec{
			k("file", "CSV file, relative to the scenario file", fText),
			k("time_column", "", fText),
			k("date_column", "", fText),
			k("hour_column", "", fText),
			k("column", "the value column", fText),
			k("decimal", "decimal mark", fWords(".", ",")),
			k("separator", "", fWords(",", ";", "tab")),
			k("unit", "temperature unit of the column", fWords("C", "F", "K")),
			k("max_gap", "longest gap bridged", fQty(layers.Duration)),
		},
	}
	forcingKeys = tempKeys.plus("forcing", "A temperature or irradiance over time: a mean with harmonics, a step, or a measured series.", seriesKeys)
	dailyKeys   = &keyTable{
		Name: "daily", Doc: "The daily harmonic.",
		Keys: []keySpec{
			k("amplitude", "half the peak-to-peak swing", fQty(forcingAmplitude...)),
			k("peak_hour", "0 to 24", fNumber),
		},
	}
	annualKeys = &keyTable{
		Name: "annual", Doc: "The annual harmonic.",
		Keys: []keySpec{
			k("amplitude", "half the peak-to-peak swing", fQty(forcingAmplitude...)),
			k("peak_day", "day of the year of the peak, 0 to 365", fNumber),
		},
	}
	harmonicKeys = &keyTable{
		Name: "harmonic", Doc: "A harmonic of any period.",
		Keys: []keySpec{
			k("period", "", fQty(layers.Period)),
			k("amplitude", "", fQty(forcingAmplitude...)),
			k("peak", "time of the peak after the start of the period", fQty(layers.Duration)),
		},
	}
	stepKeys = &keyTable{
		Name: "step", Doc: "A step change of the temperature.",
		Keys: []keySpec{
			k("from", "", fQty(layers.Temperature)),
			k("to", "", fQty(layers.Temperature)),
			k("at", "after the start", fQty(layers.Duration)),
		},
	}
	solarKeys = &keyTable{
		Name: "solar", Doc: "Sun on the outside surface: sol-air temperature.",
		Keys: []keySpec{
			k("absorptance", "0 to 1, or a preset (light, medium, dark, ...)", fNumber, fText),
			k("irradiance", "on the surface", fQty(layers.Irradiance), fObject(func() *keyTable { return forcingKeys })),
			k("sky_correction", "long-wave correction", fQty(layers.TemperatureDifference)),
		},
	}
	analysisKeys = &keyTable{
		Name: "analysis", Doc: "What to compute.",
		Keys: []keySpec{
			k("periods", "periods of the exact analysis", fList(fQty(layers.Period))),
			k("response", "range of the frequency response", fObject(func() *keyTable { return responseKeys })),
			k("probes", "depths from the outside or surface", fList(fQty(layers.Length))),
			k("simulate", "false: no simulation; or its settings", fBool, fObject(func() *keyTable { return simulateKeys })),
			k("step_response", "surface heat uptake after a step", fObject(func() *keyTable { return stepResponseKeys })),
			k("design_freezing_index", "ground kind", fQty(layers.DegreeDays)),
			k("design_season_length", "goes with design_freezing_index", fQty(layers.Duration)),
			k("fit", "fit the soil's diffusivity to measured temperatures", fObject(func() *keyTable { return fitKeys })),
		},
	}
	responseKeys = &keyTable{
		Name: "response", Doc: "Range of the frequency response.",
		Keys: []keySpec{
			k("from", "", fQty(layers.Period)),
			k("to", "", fQty(layers.Period)),
			k("points", "", fInteger),
		},
	}
	simulateKeys = &keyTable{
		Name: "simulate", Doc: "The transient simulation.",
		Keys: []keySpec{
			k("start", "time of year of the start", fQty(layers.Duration)),
			k("duration", "", fQty(layers.Duration)),
			k("step", "time step", fQty(layers.Duration)),
			k("output_step", "", fQty(layers.Duration)),
			k("initial_temperature", "", fQty(layers.Temperature)),
			k("mesh", "", fObject(func() *keyTable { return meshKeys })),
			k("spin_up_cycles", "", fInteger),
		},
	}
	meshKeys = &keyTable{
		Name: "mesh", Doc: "Mesh of the simulation.",
		Keys: []keySpec{
			k("surface_cell", "", fQty(layers.Length)),
			k("growth", "1 to 1.5", fNumber),
			k("max_cell", "", fQty(layers.Length)),
			k("cells_per_depth", "1 to 1000", fNumber),
			k("min_cells_per_layer", "", fInteger),
		},
	}
	stepResponseKeys = &keyTable{
		Name: "stepResponse", Doc: "Surface heat uptake after a step of surface temperature.",
		Keys: []keySpec{
			k("side", "", fWords("outside", "inside", "surface")),
			k("change", "", fQty(layers.TemperatureDifference)),
			k("duration", "", fQty(layers.Duration)),
			k("contact_temperature", "", fQty(layers.Temperature)),
			k("contact_effusivity", "", fQty(layers.Effusivity)),
		},
	}
	fitKeys = &keyTable{
		Name: "fit", Doc: "Fit the soil's thermal diffusivity to temperatures measured at depth.",
		Keys: []keySpec{
			k("file", "CSV file, relative to the scenario file", fText),
			k("time_column", "", fText),
			k("date_column", "", fText),
			k("hour_column", "", fText),
			k("decimal", "decimal mark", fWords(".", ",")),
			k("separator", "", fWords(",", ";", "tab")),
			k("unit", "", fWords("C", "F", "K")),
			k("max_gap", "", fQty(layers.Duration)),
			k("sensors", "shallowest first", fList(fObject(func() *keyTable { return sensorKeys }))),
			k("periods", "", fList(fQty(layers.Period))),
			k("bottom", "", fWords("auto", "sensor", "adiabatic")),
		},
	}
	sensorKeys = &keyTable{
		Name: "sensor", Doc: "One sensor of a fit.",
		Keys: []keySpec{
			k("depth", "", fQty(layers.Length)),
			k("column", "", fText),
		},
	}
	variantKeys = &keyTable{
		Name: "variant", Doc: "A named variant: parameter paths and their values.",
		Keys: []keySpec{
			k("name", "", fText),
			k("set", "parameter path: value, e.g. layers[2].thickness: 240 mm", fMap),
		},
	}
	sweepKeys = &keyTable{
		Name: "sweep", Doc: "One parameter over a range or a list of values.",
		Keys: []keySpec{
			k("parameter", "a path such as layers[2].thickness", fText),
			k("from", "", fMeasure),
			k("to", "", fMeasure),
			k("steps", "", fInteger),
			k("values", "", fList(fMeasure)),
		},
	}
	targetKeys = &keyTable{
		Name: "target", Doc: "The value of a parameter that meets a goal.",
		Keys: []keySpec{
			k("parameter", "a path such as layers[2].thickness", fText),
			k("from", "", fMeasure),
			k("to", "", fMeasure),
			k("quantity", "", fChoice(allQuantityNames)),
			k("at_least", "", fMeasure),
			k("at_most", "", fMeasure),
			k("prefer", "", fWords("smallest", "largest")),
			k("tolerance", "", fMeasure),
		},
	}
	uncertaintyKeys = &keyTable{
		Name: "uncertainty", Doc: "Monte Carlo over uncertain parameters.",
		Keys: []keySpec{
			k("samples", "", fInteger),
			k("seed", "", fInteger),
			k("vary", "", fList(fObject(func() *keyTable { return varyKeys }))),
		},
	}
	varyKeys = &keyTable{
		Name: "vary", Doc: "One uncertain parameter and its distribution.",
		Keys: []keySpec{
			k("parameter", "a path such as layers[2].conductivity", fText),
			k("normal", "", fObject(func() *keyTable { return normalKeys })),
			k("uniform", "", fObject(func() *keyTable { return uniformKeys })),
		},
	}
	normalKeys = &keyTable{
		Name: "normal", Doc: "A normal distribution.",
		Keys: []keySpec{k("mean", "", fMeasure), k("sd", "standard deviation, same unit", fMeasure)},
	}
	uniformKeys = &keyTable{
		Name: "uniform", Doc: "A uniform distribution.",
		Keys: []keySpec{k("min", "", fMeasure), k("max", "same unit", fMeasure)},
	}
)

// Keys shared by the sides.
var (
	sideResistance  = k("resistance", "surface resistance; 0 imposes the temperature on the surface", fQty(layers.Resistance), fObject(func() *keyTable { return sideResistanceKeys }))
	sideTemperature = k("temperature", "environment temperature: a constant, or a forcing", fQty(layers.Temperature), fObject(func() *keyTable { return forcingKeys }))
	sideHeatFlux    = k("heat_flux", "into the column: a constant, or a mean with harmonics", fQty(layers.HeatFlux), fObject(func() *keyTable { return fluxForcingKeys }))
	sideAdiabatic   = k("adiabatic", "no heat crosses the face", fBool)
)

// kindWords lists the scenario kinds.
// orientationWords and backWords are the choices of a room element.
var (
	orientationWords = []string{"wall", "roof", "floor"}
	backWords        = []string{"outside", "adiabatic"}
)

func kindWords() []string { return []string{string(Wall), string(Ground), string(Room)} }

// allQuantityNames lists the study quantities of every kind.
func allQuantityNames() []string {
	seen := map[string]bool{}
	var out []string
	for _, kd := range kindWords() {
		for _, n := range quantityNames(Kind(kd)) {
			if !seen[n] {
				seen[n] = true
				out = append(out, n)
			}
		}
	}
	sort.Strings(out)
	return out
}

// ---- drift between the tables and the decoder ----

// keyDrift records reads of the decoder that disagree with the key
// tables (a programming mistake, never a user's); the tests fail on any.
var keyDrift struct {
	sync.Mutex
	msgs []string
}

func recordDrift(msg string) {
	keyDrift.Lock()
	defer keyDrift.Unlock()
	if len(keyDrift.msgs) < 100 {
		keyDrift.msgs = append(keyDrift.msgs, msg)
	}
}

// takeDrift returns the drift recorded so far and forgets it.
func takeDrift() []string {
	keyDrift.Lock()
	defer keyDrift.Unlock()
	out := keyDrift.msgs
	keyDrift.msgs = nil
	return out
}

// read is what a value helper of the decoder reads.
type read struct {
	shape shape
	kind  layers.Kind // shapeQuantity
	words []string    // shapeChoice
	table *keyTable   // shapeObject
}

// matches reports whether form f of the table accepts what r reads.
func (f form) matches(r read) bool {
	switch r.shape {
	case shapeText: // a helper reading the plain text of any scalar
		return f.shape != shapeObject && f.shape != shapeList && f.shape != shapeMap
	case shapeQuantity:
		if f.shape != shapeQuantity {
			return false
		}
		for _, kd := range f.kinds {
			if kd == r.kind {
				return true
			}
		}
		return false
	case shapeChoice:
		if f.shape != shapeChoice {
			return false
		}
		all := f.enum()
		for _, w := range r.words {
			if !contains(all, w) {
				return false
			}
		}
		return true
	case shapeObject:
		return f.shape == shapeObject && f.table() == r.table
	}
	return f.shape == r.shape
}

func (r read) String() string {
	switch r.shape {
	case shapeQuantity:
		return "a quantity of kind " + r.kind.String()
	case shapeChoice:
		return "one of " + strings.Join(r.words, ", ")
	case shapeObject:
		return "the keys of " + r.table.Name
	}
	return shapeNames[r.shape]
}

var shapeNames = map[shape]string{
	shapeText: "a scalar", shapeNumber: "a number", shapeMeasure: "a number with a unit",
	shapeQuantity: "a quantity", shapeBool: "a boolean", shapeInteger: "an integer",
	shapeChoice: "a choice", shapeObject: "a mapping", shapeList: "a list", shapeMap: "a free mapping",
}

// expect checks that the table of o gives key a form that accepts r; a
// key the file does not hold (or a value the decoder placed itself) is
// not checked.
func (o *object) expect(key string, r read) {
	if o.table == nil || o.keys[key] == nil {
		return
	}
	spec := o.table.key(key)
	if spec == nil {
		recordDrift(fmt.Sprintf("%s: the decoder reads a key that table %s does not list", join(o.path, key), o.table.Name))
		return
	}
	for _, f := range spec.Forms {
		if f.matches(r) {
			return
		}
	}
	recordDrift(fmt.Sprintf("%s: the decoder reads %s, table %s does not say so", join(o.path, key), r, o.table.Name))
}
