package scenarios

import (
	"fmt"

	"tempstack/ground"
	"tempstack/layers"
	"tempstack/solver"
)

// decodeLayers reads the layers list; it reports whether every layer was
// read without a mistake (checks that need the column's thickness use it).
func (d *decoder) decodeLayers(top *object, s *Scenario) bool {
	before := d.reported
	items, ok := top.list("layers")
	switch {
	case !ok && !top.has("layers"):
		top.missing("layers", "a list of layers, "+map[Kind]string{Wall: "outside first", Ground: "surface first"}[s.Kind])
	case !ok:
	case len(items) == 0:
		top.failf("layers", "the list is empty; give at least one layer")
	case len(items) > maxLayers:
		top.failf("layers", "%d layers is more than the limit of %d; merge thin layers of the same material", len(items), maxLayers)
	default:
		for i, n := range items {
			if lo := d.object(n, fmt.Sprintf("layers[%d]", i+1), layerKeys); lo != nil {
				s.Layers = append(s.Layers, d.decodeLayer(lo, len(s.Layers)))
				s.LayerLines = append(s.LayerLines, n.Line)
			}
		}
	}
	return d.reported == before
}

// decodeLayer reads one layer: a library material or ground preset, a
// soil, or properties given inline (or a bare resistance), each key of it
// overriding the library. index counts the layers read before it.
func (d *decoder) decodeLayer(o *object, index int) layers.Layer {
	if o.has("fractions") {
		return d.decodeMix(o, index)
	}
	l, fromLibrary := d.layerBase(o)
	o.str("name", &l.Name)
	var thickness float64
	if o.positive("thickness", layers.Length, &thickness) {
		if err := l.SetThickness(thickness); err != nil {
			o.fail("thickness", err)
		}
	}
	for _, f := range []struct {
		key  string
		kind layers.Kind
		dst  *float64
	}{
		{"conductivity", layers.Conductivity, &l.Conductivity},
		{"density", layers.Density, &l.Density},
		{"specific_heat", layers.SpecificHeat, &l.SpecificHeat},
		{"resistance", layers.Resistance, &l.Resistance},
	} {
		if o.positive(f.key, f.kind, f.dst) && f.key != "resistance" && fromLibrary {
			l.Source = "given in the scenario (overrides the library value)"
		}
	}
	if !fromLibrary {
		d.inlineLayer(o, &l, index)
	}
	if !o.has("thickness") && l.Resistance == 0 && o.clean() {
		o.missing("thickness", `e.g. "105 mm" or 0.105 (m)`)
	}
	d.decodeFreezing(o, &l)
	decodeFamily(o, &l)
	if o.clean() {
		if err := l.Validate(); err != nil {
			o.d.fail(o.node, o.path, err)
		}
	}
	return l
}

// layerBase is the layer that the material or soil key of o gives, and
// whether there was one (its properties then come from the library or the
// soil model).
func (d *decoder) layerBase(o *object) (l layers.Layer, fromLibrary bool) {
	var key string
	hasMat := o.str("material", &key)
	if hasMat {
		l = d.libraryLayer(o, key)
	}
	if o.has("soil") {
		if o.has("material") {
			o.failf("soil", "give either material or soil, not both")
			return l, true
		}
		return d.decodeSoil(o), true
	}
	return l, hasMat || o.has("material")
}

// libraryLayer looks key up among the building materials and the ground
// presets.
func (d *decoder) libraryLayer(o *object, key string) layers.Layer {
	if m, ok := layers.Lookup(key); ok {
		return m.Layer()
	}
	p, isSoil := ground.Preset(key)
	if !isSoil {
		msg := fmt.Sprintf("unknown material %q", key)
		if sug := layers.Closest(key, allMaterialKeys(), 1); len(sug) > 0 {
			msg += fmt.Sprintf("; did you mean %q?", sug[0])
		} else {
			msg += "; `tempstack materials` lists the library"
		}
		o.failf("material", "%s", msg)
		return layers.Layer{}
	}
	l, err := presetLayer(p)
	if err != nil {
		o.fail("material", err)
	}
	return l
}

// inlineLayer completes a layer given by its properties (no material): a
// massive layer needs conductivity, density and specific heat; a
// resistance layer (air gap, membrane) has none of them.
func (d *decoder) inlineLayer(o *object, l *layers.Layer, index int) {
	l.Source = "given in the scenario"
	if o.has("resistance") {
		if o.has("conductivity") || o.has("density") || o.has("specific_heat") {
			o.failf("resistance", "a resistance layer (air gap, membrane) has no conductivity, density or specific_heat")
		}
		if l.Name == "" {
			l.Name = "air layer"
		}
		return
	}
	if l.Name == "" {
		l.Name = fmt.Sprintf("layer %d", index+1)
	}
	for _, k := range []string{"conductivity", "density", "specific_heat"} {
		if !o.has(k) {
			o.missing(k, "a layer without a library material needs conductivity, density and specific_heat (or a material key)")
			return
		}
	}
}

// freezingKeys are the layer keys of the latent heat of its water.
var freezingKeys = []string{"latent_heat", "conductivity_frozen", "specific_heat_frozen", "freezing_point", "freezing_range"}

// decodeFreezing reads the freezing keys of a layer: they override single
// values of a soil or preset that freezes already, and otherwise make the
// layer freeze (latent_heat then required).
func (d *decoder) decodeFreezing(o *object, l *layers.Layer) {
	given := false
	for _, k := range freezingKeys {
		given = given || o.has(k)
	}
	if !given {
		return
	}
	var f layerFreeze
	if l.Freeze != nil {
		f = freezeOf(l)
	} else {
		if !o.has("latent_heat") {
			o.missing("latent_heat", "freezing keys need the latent heat of the layer's water, J/m3 of layer (e.g. dry density x water content x 334 kJ/kg)")
			return
		}
		f = layerFreeze{Conductivity: l.Conductivity, SpecificHeat: l.SpecificHeat}
	}
	o.positive("latent_heat", layers.LatentHeatVolumetric, &f.Latent)
	o.positive("conductivity_frozen", layers.Conductivity, &f.Conductivity)
	o.positive("specific_heat_frozen", layers.SpecificHeat, &f.SpecificHeat)
	o.quantity("freezing_point", layers.Temperature, &f.Point)
	o.nonNegative("freezing_range", layers.TemperatureDifference, &f.Range)
	if l.Freeze == nil && l.Resistance > 0 && l.Thickness == 0 {
		o.failf("latent_heat", "a resistance layer cannot freeze")
		return
	}
	f.apply(l)
}

// layerFreeze collects the freezing keys of a layer before they are turned
// into volumetric values.
type layerFreeze struct {
	Latent       float64 // J/m3
	Conductivity float64 // W/(m K), frozen
	SpecificHeat float64 // J/(kg K), frozen
	Point        float64 // degC
	Range        float64 // K
	heatCapacity float64 // J/(m3 K), frozen, of a layer that froze already; 0: from SpecificHeat
}

// freezeOf is the freezing of a layer that freezes already.
func freezeOf(l *layers.Layer) layerFreeze {
	fz := l.Freeze
	return layerFreeze{Latent: fz.LatentHeat, Conductivity: fz.ConductivityFrozen, Point: fz.Point, Range: fz.Range, heatCapacity: fz.HeatCapacityFrozen}
}

func (f layerFreeze) apply(l *layers.Layer) {
	c := f.heatCapacity
	if f.SpecificHeat != 0 || c == 0 {
		c = l.Density * f.SpecificHeat
	}
	l.Freeze = &solver.Freezing{
		Point:              f.Point,
		Range:              f.Range,
		LatentHeat:         f.Latent,
		ConductivityFrozen: f.Conductivity,
		HeatCapacityFrozen: c,
	}
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

// decodeSoil reads the soil: block of a layer (texture, dry density, water
// content) and returns the layer its property models give (thickness set
// later).
func (d *decoder) decodeSoil(parent *object) layers.Layer {
	o := parent.child("soil", soilKeys)
	if o == nil {
		return layers.Layer{}
	}
	var soil ground.Soil
	var tex, model string
	if o.choice("texture", []string{"sand", "gravel", "silt-clay", "silt", "clay"}, &tex) {
		var err error
		if soil.Texture, err = ground.ParseTexture(tex); err != nil {
			o.fail("texture", err)
		}
	} else if !o.has("texture") {
		o.missing("texture", "sand (sand and gravel) or silt-clay")
	}
	if o.positive("dry_density", layers.Density, &soil.DryDensity) && (soil.DryDensity < 200 || soil.DryDensity > 2600) {
		// Mineral soils lie far inside this range; values outside it are
		// typing slips (a unit of g/cm3 given as kg/m3, say).
		o.failf("dry_density", "%g kg/m3 is not the dry density of a soil (expect 200 to 2600 kg/m3, typically 1200 to 2100)", soil.DryDensity)
	} else if !o.has("dry_density") {
		o.missing("dry_density", "kg of solids per m3 of soil, e.g. 1700")
	}
	if !o.fraction("water_content", &soil.WaterContent) && !o.has("water_content") {
		o.missing("water_content", "mass of water per mass of dry soil, e.g. 15 %")
	}
	if o.choice("model", ground.ModelKeys(), &model) {
		var err error
		if soil.Model, err = ground.ParseModel(model); err != nil {
			o.fail("model", err)
		}
	}
	if o.fraction("quartz", &soil.Quartz) && soil.Quartz > 1 {
		o.failf("quartz", "a fraction of the solids must not exceed 1 (100 %%)")
	}
	o.positive("solids_density", layers.Density, &soil.SolidsDensity)
	o.positive("solids_specific_heat", layers.SpecificHeat, &soil.SolidsHeat)
	o.quantity("freezing_point", layers.Temperature, &soil.FreezingPoint)
	o.nonNegative("freezing_range", layers.TemperatureDifference, &soil.FreezingRange)
	if !o.clean() {
		return layers.Layer{}
	}
	if err := soil.Validate(); err != nil {
		o.d.fail(o.node, o.path, err)
		return layers.Layer{}
	}
	sl, err := soil.Layer("soil", 1)
	if err != nil {
		o.d.fail(o.node, o.path, err)
		return layers.Layer{}
	}
	l := fromSolverLayer(sl, bulkDensity(&soil))
	l.Thickness = 0
	l.Name = fmt.Sprintf("%s, %.0f kg/m3 dry, %.0f %% water", tex, soil.DryDensity, 100*soil.WaterContent)
	l.Source = "soil model: conductivity " + soil.Model.Label() + "; volumetric heat capacity of solids plus water or ice; latent heat = dry density × water content × 334 kJ/kg"
	return l
}

// decodeMix reads a mixed layer (studs in insulation, mortar joints in
// blockwork): a thickness and a fractions list of parts, each a library
// material or inline properties with the fraction of the face area it
// takes. The layer's properties come from its parts (layers.NewMix); the
// equivalent homogeneous layer is fixed once the surface resistances are
// known (homogeniseMixes).
func (d *decoder) decodeMix(o *object, index int) layers.Layer {
	for _, k := range layerKeys.names() {
		if o.has(k) && k != "fractions" && k != "name" && k != "thickness" && k != "family" {
			o.failf(k, "a mixed layer takes its properties from its parts: give %s inside a part of fractions, or drop fractions", k)
		}
	}
	var name string
	o.str("name", &name)
	var thickness float64
	if !o.positive("thickness", layers.Length, &thickness) && !o.has("thickness") {
		o.missing("thickness", `e.g. "140 mm" or 0.14 (m)`)
	}
	items, ok := o.list("fractions")
	if ok && len(items) == 0 {
		o.failf("fractions", "the list is empty; give the parts, e.g. [{material: softwood, fraction: 15 %%}, {material: mineral-wool, fraction: 85 %%}]")
	}
	var parts []layers.MixPart
	for i, n := range items {
		po := d.object(n, fmt.Sprintf("%s.fractions[%d]", o.path, i+1), mixPartKeys)
		if po == nil {
			continue
		}
		p := layers.MixPart{}
		var fromLibrary bool
		p.Layer, fromLibrary = d.layerBase(po)
		po.str("name", &p.Layer.Name)
		po.positive("conductivity", layers.Conductivity, &p.Layer.Conductivity)
		po.positive("density", layers.Density, &p.Layer.Density)
		po.positive("specific_heat", layers.SpecificHeat, &p.Layer.SpecificHeat)
		if !fromLibrary {
			if p.Layer.Name == "" {
				p.Layer.Name = fmt.Sprintf("part %d", i+1)
			}
			p.Layer.Source = "given in the scenario"
			for _, k := range []string{"conductivity", "density", "specific_heat"} {
				if !po.has(k) {
					po.missing(k, "a part without a library material needs conductivity, density and specific_heat (or a material key)")
					break
				}
			}
		} else if po.has("conductivity") || po.has("density") || po.has("specific_heat") {
			p.Layer.Source = "given in the scenario (overrides the library value)"
		}
		if po.positive("fraction", layers.Fraction, &p.Fraction) && p.Fraction > 1 {
			po.failf("fraction", "a fraction of the layer's face area must not exceed 1 (100 %%), got %s", po.values["fraction"].Value)
		} else if !po.has("fraction") {
			po.missing("fraction", "the part of the layer's face area, e.g. 15 % or 0.15")
		}
		parts = append(parts, p)
	}
	var l layers.Layer
	if o.clean() && ok && len(items) > 0 {
		var err error
		if l, err = layers.NewMix(name, thickness, parts); err != nil {
			o.d.fail(o.keys["fractions"], join(o.path, "fractions"), err) // at the key: the list starts a line below
		}
		if name == "" {
			l.Name = fmt.Sprintf("layer %d (%s)", index+1, l.MixLabel())
		}
	}
	decodeFamily(o, &l)
	return l
}

// homogeniseMixes replaces each mixed layer of s by its equivalent
// homogeneous layer (layers.Construction.Homogenised) with the scenario's
// surface resistances: the conductivity that makes the layers in series
// give the combined method's total resistance. A ground column has no
// inside surface resistance.
func homogeniseMixes(s *Scenario) error {
	c := s.construction()
	if !c.HasMix() {
		return nil
	}
	rsi := 0.0
	if s.Kind == Wall && s.Inside != nil {
		rsi = s.Inside.SurfaceResistance()
	}
	h, _, err := c.Homogenised(rsi, s.Outside.Resistance)
	if err != nil {
		line := 0
		if len(s.LayerLines) > 0 {
			line = s.LayerLines[0]
		}
		return &Error{File: s.File, Line: line, Key: "layers", Err: err}
	}
	s.Layers = h.Layers
	return nil
}
