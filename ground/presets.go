package ground

import (
	"fmt"
	"strings"

	"tempstack/solver"
)

// SoilPreset is a built-in ground material. It is either a fixed-property
// material (Soil nil: Conductivity and HeatCapacity given, no freezing) or a
// soil described by texture, dry density and water content (Soil set: all
// properties, frozen ones included, come from the Soil's models).
type SoilPreset struct {
	Key          string  // lookup key, e.g. "wet-clay"
	Description  string  // one line for listings
	Source       string  // where the values come from, with its tag
	Soil         *Soil   // nil for a fixed-property material
	Conductivity float64 // W/(m K); fixed-property materials only
	HeatCapacity float64 // volumetric, J/(m3 K); fixed-property materials only
}

// Layer returns a solver layer of the given thickness (m) made of the
// preset. A fixed-property preset gives a non-freezing layer.
func (p SoilPreset) Layer(name string, thickness float64) (solver.Layer, error) {
	if p.Soil != nil {
		return p.Soil.Layer(name, thickness)
	}
	l := solver.Layer{Name: name, Thickness: thickness, Conductivity: p.Conductivity, HeatCapacity: p.HeatCapacity}
	if err := l.Validate(); err != nil {
		return solver.Layer{}, err
	}
	return l, nil
}

// Diffusivity returns the (unfrozen) thermal diffusivity of the preset,
// m2/s.
func (p SoilPreset) Diffusivity() (float64, error) {
	if p.Soil == nil {
		return p.Conductivity / p.HeatCapacity, nil
	}
	pr, err := p.Soil.Properties()
	if err != nil {
		return 0, err
	}
	return pr.ConductivityUnfrozen / pr.HeatCapacityUnfrozen, nil
}

const deVries = "Moene and van Dam (2014), Transport in the Atmosphere-Vegetation-Soil Continuum, Table 2.2, after de Vries (1963) [2nd-hand]; heat capacity = conductivity / diffusivity"

const kerstenState = "a state measured by Kersten (1949), as tabulated in Handy and Spangler (2007) Table 11.1 [read]; properties from Kersten's equations"

// presets holds the built-in materials. Fixed-property values are given as
// conductivity and diffusivity in the source; the heat capacity is their
// quotient.
var presets = []SoilPreset{
	{Key: "dry-sand", Description: "dry sand (fixed properties, no freezing)", Source: deVries,
		Conductivity: 0.24, HeatCapacity: 0.24 / 0.19e-6},
	{Key: "wet-clay", Description: "wet clay (fixed properties, no freezing)", Source: deVries,
		Conductivity: 1.4, HeatCapacity: 1.4 / 0.45e-6},
	{Key: "rock", Description: "rock (fixed properties, no freezing)", Source: deVries,
		Conductivity: 2.9, HeatCapacity: 2.9 / 1.4e-6},
	{Key: "frost-silt-clay-wet", Description: "silt-clay, dry density 100 lb/ft3 (1602 kg/m3), water content 20 %", Source: kerstenState,
		Soil: &Soil{Texture: SiltClay, DryDensity: 100 * pcf, WaterContent: 0.20}},
	{Key: "frost-silt-clay-dense", Description: "silt-clay, dry density 110 lb/ft3 (1762 kg/m3), water content 10 %", Source: kerstenState,
		Soil: &Soil{Texture: SiltClay, DryDensity: 110 * pcf, WaterContent: 0.10}},
	{Key: "frost-sand-moist", Description: "sand, dry density 130 lb/ft3 (2082 kg/m3), water content 5 %", Source: kerstenState,
		Soil: &Soil{Texture: Sand, DryDensity: 130 * pcf, WaterContent: 0.05}},
	{Key: "frost-sand-wet", Description: "sand, dry density 130 lb/ft3 (2082 kg/m3), water content 10 %", Source: kerstenState,
		Soil: &Soil{Texture: Sand, DryDensity: 130 * pcf, WaterContent: 0.10}},
}

// Preset returns the built-in ground material with the given key (case and
// surrounding spaces ignored). The returned value holds its own copy of the
// Soil.
func Preset(key string) (SoilPreset, bool) {
	key = strings.ToLower(strings.TrimSpace(key))
	for _, p := range presets {
		if p.Key == key {
			return clonePreset(p), true
		}
	}
	return SoilPreset{}, false
}

// Presets lists the built-in ground materials in a fixed order (copies).
func Presets() []SoilPreset {
	out := make([]SoilPreset, len(presets))
	for i, p := range presets {
		out[i] = clonePreset(p)
	}
	return out
}

func clonePreset(p SoilPreset) SoilPreset {
	if p.Soil != nil {
		s := *p.Soil
		p.Soil = &s
	}
	return p
}

// String describes the preset in one line.
func (p SoilPreset) String() string {
	return fmt.Sprintf("%s: %s", p.Key, p.Description)
}
