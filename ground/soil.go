package ground

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"tempstack/solver"
)

// Texture is the grain-size class a conductivity model needs.
type Texture int

const (
	// Sand is a coarse-grained soil: sand and gravel (Kersten's "sandy soils";
	// Johansen's coarse soils).
	Sand Texture = iota + 1
	// SiltClay is a fine-grained soil: silt and clay (Kersten's "silt-clay
	// soils"; Johansen's fine soils).
	SiltClay
)

// String returns the texture's key: "sand" or "silt-clay".
func (t Texture) String() string {
	switch t {
	case Sand:
		return "sand"
	case SiltClay:
		return "silt-clay"
	}
	return fmt.Sprintf("Texture(%d)", int(t))
}

// ParseTexture reads a texture key. It accepts "sand", "gravel" and "coarse"
// for Sand, and "silt-clay", "silt", "clay" and "fine" for SiltClay (case
// and surrounding spaces ignored).
func ParseTexture(s string) (Texture, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "sand", "gravel", "coarse":
		return Sand, nil
	case "silt-clay", "silt", "clay", "fine":
		return SiltClay, nil
	}
	return 0, fmt.Errorf("unknown soil texture %q (want sand, gravel, coarse, silt-clay, silt, clay or fine)", s)
}

// Model selects the conductivity model of a Soil.
type Model int

const (
	// ModelKersten uses Kersten's (1949) regression equations (the default).
	ModelKersten Model = iota
	// ModelJohansen uses Johansen's (1975) method with the Kersten number.
	ModelJohansen
)

// A ConductivityModel gives the frozen and unfrozen thermal conductivity
// of a soil, W/(m K).
type ConductivityModel interface {
	Conductivity(s Soil) (frozen, unfrozen float64, err error)
}

// models is the one table of the conductivity models: the key a scenario
// names it by, the label a report cites, and the model itself. A new model
// is one more row (and its equations with their sources).
var models = []struct {
	model Model
	key   string // scenario key (lower case)
	label string // author and year, for the source of a layer
	impl  ConductivityModel
}{
	{ModelKersten, "kersten", "Kersten (1949)", kerstenModel{}},
	{ModelJohansen, "johansen", "Johansen (1975)", johansenModel{}},
}

// ModelKeys lists the keys of the conductivity models, the default first.
func ModelKeys() []string {
	keys := make([]string, len(models))
	for i, m := range models {
		keys[i] = m.key
	}
	return keys
}

// String returns the model's key, e.g. "kersten".
func (m Model) String() string {
	if int(m) >= 0 && int(m) < len(models) {
		return models[m].key
	}
	return fmt.Sprintf("Model(%d)", int(m))
}

// Label returns the author and year of the model, e.g. "Kersten (1949)".
func (m Model) Label() string {
	if int(m) >= 0 && int(m) < len(models) {
		return models[m].label
	}
	return m.String()
}

// valid reports whether m is a row of the table.
func (m Model) valid() bool { return int(m) >= 0 && int(m) < len(models) }

// ParseModel reads a model key (ModelKeys); "" is the default, Kersten.
func ParseModel(s string) (Model, error) {
	k := strings.ToLower(strings.TrimSpace(s))
	if k == "" {
		return ModelKersten, nil
	}
	for _, m := range models {
		if m.key == k {
			return m.model, nil
		}
	}
	return 0, fmt.Errorf("unknown conductivity model %q (want %s)", s, strings.Join(ModelKeys(), " or "))
}

// kerstenModel is Kersten's regression (KerstenFrozen, KerstenUnfrozen).
type kerstenModel struct{}

func (kerstenModel) Conductivity(s Soil) (frozen, unfrozen float64, err error) {
	if frozen, err = KerstenFrozen(s.Texture, s.DryDensity, s.WaterContent); err != nil {
		return 0, 0, fmt.Errorf("soil: %w", err)
	}
	if unfrozen, err = KerstenUnfrozen(s.Texture, s.DryDensity, s.WaterContent); err != nil {
		return 0, 0, fmt.Errorf("soil: %w", err)
	}
	return frozen, unfrozen, nil
}

// johansenModel is Johansen's method (JohansenFrozen, JohansenUnfrozen).
type johansenModel struct{}

func (johansenModel) Conductivity(s Soil) (frozen, unfrozen float64, err error) {
	n, sr := s.Porosity(), math.Min(1, s.Saturation())
	return JohansenFrozen(s.Texture, n, sr, s.Quartz, s.DryDensity),
		JohansenUnfrozen(s.Texture, n, sr, s.Quartz, s.DryDensity), nil
}

// Physical constants of the pore water and the soil solids.
const (
	// WaterDensity is the density of liquid water, kg/m3.
	WaterDensity = 1000.0
	// DefaultSolidsDensity is the particle density of mineral soil solids,
	// kg/m3: 2650 (quartz; the common value for mineral soils, from memory).
	DefaultSolidsDensity = 2650.0
	// DefaultSolidsHeat is the specific heat of soil solids, J/(kg K):
	// 0.17 Btu/(lb degF) = 712 J/(kg K), the value of the US Army frost
	// manuals' heat-capacity formula C = rho_d (0.17 + w) Btu/(ft3 degF)
	// (from memory; textbooks give 0.71 to 0.84 kJ/(kg K) for minerals).
	DefaultSolidsHeat = 0.17 * 4186.8
	// WaterHeat is the specific heat of liquid water near 10 degC, J/(kg K)
	// (CRC Handbook of Chemistry and Physics, properties of water
	// [memory]).
	WaterHeat = 4190.0
	// IceHeat is the specific heat of ice near -10 degC, J/(kg K) (CRC
	// Handbook of Chemistry and Physics [memory]).
	IceHeat = 2000.0
	// LatentHeatFusion is the latent heat of fusion of water, J/kg
	// (334 kJ/kg; CRC Handbook of Chemistry and Physics [memory]).
	LatentHeatFusion = 334e3
)

// Unit conversions for Kersten's equations, which are stated in US units.
const (
	// pcf is one pound per cubic foot in kg/m3.
	pcf = 0.45359237 / (0.3048 * 0.3048 * 0.3048)
	// btuIn is one Btu in/(ft2 h degF) in W/(m K) (International Table Btu).
	btuIn = 1055.05585262 * 0.0254 / (0.3048 * 0.3048 * 3600 * 5.0 / 9.0)
)

// Kersten's lower limits of water content, as fractions: below them his
// unfrozen equations fall off (the logarithm turns negative) and were not
// fitted (limits as quoted with the equations, from memory).
const (
	kerstenMinWaterSand     = 0.01
	kerstenMinWaterSiltClay = 0.07
)

// KerstenUnfrozen returns the conductivity of an unfrozen soil, W/(m K), by
// Kersten's (1949) regression, as given by Farouki (1981, CRREL Monograph
// 81-1) and Andersland and Ladanyi (Frozen Ground Engineering) (equations
// from memory; they reproduce Handy and Spangler Table 11.1 within
// 0.1 W/(m K), see the tests). With k in Btu in/(ft2 h degF), the dry unit
// weight gd in lb/ft3 and w in percent:
//
//	sand (coarse):    k = (0.7 log10(w) + 0.4) 10^(0.01 gd),  w >= 1 %
//	silt-clay (fine): k = (0.9 log10(w) - 0.2) 10^(0.01 gd),  w >= 7 %
//
// dryDensity is in kg/m3 and water the water content by dry mass (fraction).
// Below the lower water content an error is returned: use the Johansen model.
func KerstenUnfrozen(t Texture, dryDensity, water float64) (float64, error) {
	gd, w, err := kerstenArgs(t, dryDensity, water)
	if err != nil {
		return 0, err
	}
	var k float64
	switch t {
	case Sand:
		k = (0.7*math.Log10(w) + 0.4) * math.Pow(10, 0.01*gd)
	case SiltClay:
		k = (0.9*math.Log10(w) - 0.2) * math.Pow(10, 0.01*gd)
	}
	return k * btuIn, nil
}

// KerstenFrozen returns the conductivity of a frozen soil, W/(m K), by
// Kersten's (1949) regression (sources and units as for KerstenUnfrozen):
//
//	sand (coarse):    k = 0.076 10^(0.013 gd) + 0.032 10^(0.0146 gd) w
//	silt-clay (fine): k = 0.01 10^(0.022 gd) + 0.085 10^(0.008 gd) w
//
// The same lower water contents as for KerstenUnfrozen are enforced so that
// the frozen and unfrozen values of a soil come from the same fitted range.
func KerstenFrozen(t Texture, dryDensity, water float64) (float64, error) {
	gd, w, err := kerstenArgs(t, dryDensity, water)
	if err != nil {
		return 0, err
	}
	var k float64
	switch t {
	case Sand:
		k = 0.076*math.Pow(10, 0.013*gd) + 0.032*math.Pow(10, 0.0146*gd)*w
	case SiltClay:
		k = 0.01*math.Pow(10, 0.022*gd) + 0.085*math.Pow(10, 0.008*gd)*w
	}
	return k * btuIn, nil
}

// kerstenArgs checks the arguments of Kersten's equations and returns them
// in their original units (lb/ft3 and percent).
func kerstenArgs(t Texture, dryDensity, water float64) (gd, w float64, err error) {
	if !finite(dryDensity) || dryDensity <= 0 {
		return 0, 0, fmt.Errorf("dry density must be positive, got %g kg/m3", dryDensity)
	}
	if !finite(water) || water < 0 {
		return 0, 0, fmt.Errorf("water content must not be negative, got %g", water)
	}
	var min float64
	switch t {
	case Sand:
		min = kerstenMinWaterSand
	case SiltClay:
		min = kerstenMinWaterSiltClay
	default:
		return 0, 0, fmt.Errorf("Kersten's equations need the texture sand or silt-clay, got %v", t)
	}
	if water < min {
		return 0, 0, fmt.Errorf("Kersten's %v equation holds for water contents of %g %% and more, got %.3g %%; use the Johansen model",
			t, 100*min, 100*water)
	}
	return dryDensity / pcf, 100 * water, nil
}

// Johansen's constants (Johansen 1975, as given by Farouki 1981; quoted the
// same way in many land-surface model codes): conductivities in W/(m K).
const (
	johansenQuartz       = 7.7  // quartz
	johansenOtherFine    = 2.0  // other minerals; also coarse soils with quartz > 0.2
	johansenOtherCoarseQ = 3.0  // other minerals of coarse soils with quartz <= 0.2
	johansenWater        = 0.57 // liquid water
	johansenIce          = 2.2  // ice
)

// JohansenSolids returns the conductivity of the soil solids, W/(m K),
// after Johansen (1975) as given by Farouki (1981): the geometric mean
// ks = 7.7^q k0^(1-q) of quartz (7.7) and the other minerals, k0 = 2.0, or
// 3.0 for a coarse soil with a quartz fraction q <= 0.2.
func JohansenSolids(t Texture, quartz float64) float64 {
	k0 := johansenOtherFine
	if t == Sand && quartz <= 0.2 {
		k0 = johansenOtherCoarseQ
	}
	return math.Pow(johansenQuartz, quartz) * math.Pow(k0, 1-quartz)
}

// JohansenDry returns the conductivity of a dry natural soil, W/(m K), from
// its dry density rho_d (kg/m3), Johansen (1975) as given by Farouki (1981)
// (Farouki 1981, Thermal Properties of Soils, CRREL Monograph 81-1,
// equation for dry natural soils [memory]; stated accuracy +-20 %):
//
//	k_dry = (0.135 rho_d + 64.7) / (2700 - 0.947 rho_d)
func JohansenDry(dryDensity float64) float64 {
	return (0.135*dryDensity + 64.7) / (2700 - 0.947*dryDensity)
}

// JohansenUnfrozen returns the conductivity of an unfrozen soil, W/(m K),
// by Johansen's (1975) method (Farouki 1981):
//
//	k = (k_sat - k_dry) Ke + k_dry
//	k_sat = ks^(1-n) 0.57^n                       (saturated, geometric mean)
//	Ke = 0.7 log10(Sr) + 1   coarse, Sr > 0.05    (Kersten number)
//	Ke = log10(Sr) + 1       fine,   Sr > 0.1
//
// with porosity n, degree of saturation Sr and Ke = 0 below the limits.
func JohansenUnfrozen(t Texture, porosity, saturation, quartz, dryDensity float64) float64 {
	ksat := math.Pow(JohansenSolids(t, quartz), 1-porosity) * math.Pow(johansenWater, porosity)
	var ke float64
	switch t {
	case Sand:
		if saturation > 0.05 {
			ke = 0.7*math.Log10(saturation) + 1
		}
	default:
		if saturation > 0.1 {
			ke = math.Log10(saturation) + 1
		}
	}
	ke = math.Max(0, math.Min(1, ke))
	kdry := JohansenDry(dryDensity)
	return (ksat-kdry)*ke + kdry
}

// JohansenFrozen returns the conductivity of a frozen soil, W/(m K), by
// Johansen's (1975) method (Farouki 1981), all pore water frozen:
//
//	k = (k_sat - k_dry) Sr + k_dry,   k_sat = ks^(1-n) 2.2^n
//
// (the Kersten number of a frozen soil is its degree of saturation).
func JohansenFrozen(t Texture, porosity, saturation, quartz, dryDensity float64) float64 {
	ksat := math.Pow(JohansenSolids(t, quartz), 1-porosity) * math.Pow(johansenIce, porosity)
	ke := math.Max(0, math.Min(1, saturation))
	kdry := JohansenDry(dryDensity)
	return (ksat-kdry)*ke + kdry
}

// Soil describes a mineral soil by the quantities a site investigation
// reports. The zero values of SolidsDensity, SolidsHeat, FreezingPoint,
// FreezingRange and Model mean the documented defaults.
type Soil struct {
	Texture       Texture
	DryDensity    float64 // rho_d, kg of solids per m3 of soil
	WaterContent  float64 // w, kg of water per kg of solids (fraction, 0.12 = 12 %)
	SolidsDensity float64 // particle density rho_s, kg/m3; 0 = DefaultSolidsDensity
	SolidsHeat    float64 // specific heat of the solids, J/(kg K); 0 = DefaultSolidsHeat
	Quartz        float64 // quartz fraction of the solids, Johansen only; 0 = no quartz
	Model         Model   // conductivity model; zero value = ModelKersten
	FreezingPoint float64 // degC, top of the freezing range (0 for free pore water)
	FreezingRange float64 // K, width of the freezing range below FreezingPoint; 0 = isothermal
}

func (s Soil) solidsDensity() float64 {
	if s.SolidsDensity == 0 {
		return DefaultSolidsDensity
	}
	return s.SolidsDensity
}

func (s Soil) solidsHeat() float64 {
	if s.SolidsHeat == 0 {
		return DefaultSolidsHeat
	}
	return s.SolidsHeat
}

// Porosity is the volume fraction of pores, n = 1 - rho_d / rho_s.
func (s Soil) Porosity() float64 { return 1 - s.DryDensity/s.solidsDensity() }

// VoidRatio is the ratio of pore volume to solids volume, e = n / (1 - n).
func (s Soil) VoidRatio() float64 { return s.solidsDensity()/s.DryDensity - 1 }

// Saturation is the degree of saturation, the fraction of the pore volume
// filled with (liquid) water: Sr = w rho_d / (rho_w n).
func (s Soil) Saturation() float64 {
	return s.WaterContent * s.DryDensity / (WaterDensity * s.Porosity())
}

// SaturatedWaterContent is the water content that fills the pores at this
// dry density, w_sat = rho_w n / rho_d (fraction).
func (s Soil) SaturatedWaterContent() float64 {
	return WaterDensity * s.Porosity() / s.DryDensity
}

// VolumetricWater is the volume fraction of water, theta = w rho_d / rho_w.
func (s Soil) VolumetricWater() float64 { return s.WaterContent * s.DryDensity / WaterDensity }

// Validate reports the first impossible value of s, including a water
// content above saturation (the message gives the largest possible one).
func (s Soil) Validate() error {
	switch {
	case s.Texture != Sand && s.Texture != SiltClay:
		return fmt.Errorf("soil: texture must be sand or silt-clay, got %v", s.Texture)
	case !finite(s.DryDensity) || s.DryDensity <= 0:
		return fmt.Errorf("soil: dry density must be positive, got %g kg/m3", s.DryDensity)
	case !finite(s.SolidsDensity) || s.SolidsDensity < 0:
		return fmt.Errorf("soil: solids density must be positive, got %g kg/m3", s.SolidsDensity)
	case s.DryDensity >= s.solidsDensity():
		return fmt.Errorf("soil: dry density %g kg/m3 must be below the solids density %g kg/m3", s.DryDensity, s.solidsDensity())
	case !finite(s.WaterContent) || s.WaterContent < 0:
		return fmt.Errorf("soil: water content must not be negative, got %g", s.WaterContent)
	case !finite(s.SolidsHeat) || s.SolidsHeat < 0:
		return fmt.Errorf("soil: solids specific heat must be positive, got %g J/(kg K)", s.SolidsHeat)
	case !finite(s.Quartz) || s.Quartz < 0 || s.Quartz > 1:
		return fmt.Errorf("soil: quartz fraction must be between 0 and 1, got %g", s.Quartz)
	case !s.Model.valid():
		return fmt.Errorf("soil: unknown conductivity model %v", s.Model)
	case !finite(s.FreezingPoint):
		return errors.New("soil: freezing point is not a finite number")
	case !finite(s.FreezingRange) || s.FreezingRange < 0:
		return fmt.Errorf("soil: freezing range must not be negative, got %g K", s.FreezingRange)
	}
	// Allow round-off: a soil given exactly at saturation must pass.
	if max := s.SaturatedWaterContent(); s.WaterContent > max*(1+1e-9) {
		return fmt.Errorf("soil: water content %.3g %% exceeds saturation: at dry density %g kg/m3 (porosity %.3f) the pores hold at most %.3g %%",
			100*s.WaterContent, s.DryDensity, s.Porosity(), 100*max)
	}
	return nil
}

// Conductivity returns the frozen and unfrozen thermal conductivities of s,
// W/(m K), by its Model.
func (s Soil) Conductivity() (frozen, unfrozen float64, err error) {
	if err := s.Validate(); err != nil {
		return 0, 0, err
	}
	return models[s.Model].impl.Conductivity(s)
}

// HeatCapacity returns the volumetric heat capacities of s, J/(m3 K), frozen
// (all pore water as ice) and unfrozen, as the mass-weighted sum of the
// solids and the water or ice:
//
//	C_unfrozen = rho_d (c_s + w c_water),  C_frozen = rho_d (c_s + w c_ice)
//
// (the form of the US Army frost manuals, C = gd (0.17 + w) and
// gd (0.17 + 0.5 w) Btu/(ft3 degF), from memory; c_water 4190, c_ice 2000
// J/(kg K)).
func (s Soil) HeatCapacity() (frozen, unfrozen float64) {
	cs := s.solidsHeat()
	return s.DryDensity * (cs + s.WaterContent*IceHeat), s.DryDensity * (cs + s.WaterContent*WaterHeat)
}

// LatentHeat is the latent heat released when all pore water freezes, J/m3
// of soil: L = rho_d w 334 kJ/kg (the latent heat per volume used with
// Stefan's formula; Handy and Spangler, Geotechnical Engineering, 5th ed.
// 2007, Example 11.7, find about 77,000 kJ/m3 for 18.9 kN/m3 and w 12 %
// [read]).
func (s Soil) LatentHeat() float64 { return s.DryDensity * s.WaterContent * LatentHeatFusion }

// Properties collects the derived thermal properties of a soil, SI units.
type Properties struct {
	Porosity             float64 // volume fraction of pores
	Saturation           float64 // degree of saturation, fraction
	ConductivityFrozen   float64 // W/(m K)
	ConductivityUnfrozen float64 // W/(m K)
	HeatCapacityFrozen   float64 // J/(m3 K)
	HeatCapacityUnfrozen float64 // J/(m3 K)
	LatentHeat           float64 // J/m3 of soil
}

// Properties validates s and returns its derived thermal properties.
func (s Soil) Properties() (Properties, error) {
	kf, ku, err := s.Conductivity()
	if err != nil {
		return Properties{}, err
	}
	cf, cu := s.HeatCapacity()
	return Properties{
		Porosity:             s.Porosity(),
		Saturation:           s.Saturation(),
		ConductivityFrozen:   kf,
		ConductivityUnfrozen: ku,
		HeatCapacityFrozen:   cf,
		HeatCapacityUnfrozen: cu,
		LatentHeat:           s.LatentHeat(),
	}, nil
}

// Layer returns a solver layer of the given thickness (m) made of s: the
// unfrozen conductivity and heat capacity, and, when s holds water, the
// freezing description (freezing point and range, latent heat, frozen
// conductivity and heat capacity). A soil without water has no Freeze.
func (s Soil) Layer(name string, thickness float64) (solver.Layer, error) {
	p, err := s.Properties()
	if err != nil {
		return solver.Layer{}, err
	}
	l := solver.Layer{
		Name:         name,
		Thickness:    thickness,
		Conductivity: p.ConductivityUnfrozen,
		HeatCapacity: p.HeatCapacityUnfrozen,
	}
	if s.WaterContent > 0 {
		l.Freeze = &solver.Freezing{
			Point:              s.FreezingPoint,
			Range:              s.FreezingRange,
			LatentHeat:         p.LatentHeat,
			ConductivityFrozen: p.ConductivityFrozen,
			HeatCapacityFrozen: p.HeatCapacityFrozen,
		}
	}
	if err := l.Validate(); err != nil {
		return solver.Layer{}, err
	}
	return l, nil
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
