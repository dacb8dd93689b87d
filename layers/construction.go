package layers

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"tempstack/solver"
)

// Orientation is the position of a building element, which fixes the
// direction of heat flow for the conventional surface resistances and the
// resistance of air layers (ISO 6946). The zero value is Wall.
type Orientation int

const (
	// Wall: horizontal heat flow (vertical element, within 30 degrees of vertical).
	Wall Orientation = iota
	// Roof: upward heat flow (a roof or ceiling heated from below).
	Roof
	// Floor: downward heat flow (a floor above a colder space).
	Floor
)

// String returns "wall", "roof" or "floor".
func (o Orientation) String() string {
	switch o {
	case Wall:
		return "wall"
	case Roof:
		return "roof"
	case Floor:
		return "floor"
	}
	return fmt.Sprintf("Orientation(%d)", int(o))
}

// HeatFlow describes the direction of heat flow of o: "horizontal",
// "upward" or "downward".
func (o Orientation) HeatFlow() string {
	switch o {
	case Wall:
		return "horizontal"
	case Roof:
		return "upward"
	case Floor:
		return "downward"
	}
	return o.String()
}

// ParseOrientation reads an orientation: "wall" or "horizontal"; "roof",
// "ceiling", "up" or "upward"; "floor", "down" or "downward". Case and
// surrounding space are ignored.
func ParseOrientation(s string) (Orientation, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "wall", "horizontal":
		return Wall, nil
	case "roof", "ceiling", "up", "upward", "upwards":
		return Roof, nil
	case "floor", "down", "downward", "downwards":
		return Floor, nil
	}
	return Wall, fmt.Errorf("unknown orientation %q; use wall (horizontal heat flow), roof (upward) or floor (downward)", s)
}

// Conventional surface resistances of ISO 6946 (Table 7 of the 2017
// edition, table number from memory), m2 K/W: inside Rsi 0.10 for upward, 0.13 for horizontal and 0.17
// for downward heat flow; outside Rse 0.04 in all directions. Source:
// ISO 6946:2017 [2nd-hand: quoted from the standard's table; memory
// agrees].
const (
	RsiUp         = 0.10
	RsiHorizontal = 0.13
	RsiDown       = 0.17
	Rse           = 0.04
)

// SurfaceResistances returns the conventional inside and outside surface
// resistances (rsi, rse) of ISO 6946 for orientation o, m2 K/W. An unknown
// orientation gives the wall values.
func SurfaceResistances(o Orientation) (rsi, rse float64) {
	switch o {
	case Roof:
		return RsiUp, Rse
	case Floor:
		return RsiDown, Rse
	}
	return RsiHorizontal, Rse
}

// airLayerTable is the thermal resistance of an unventilated air layer
// between surfaces of high emissivity (>= 0.8), ISO 6946:2007 Table 2
// [memory]: thickness in mm, then R in m2 K/W for upward, horizontal and
// downward heat flow. The standard allows linear interpolation between rows.
var airLayerTable = []struct {
	mm               float64
	up, horiz, downw float64
}{
	{0, 0, 0, 0},
	{5, 0.11, 0.11, 0.11},
	{7, 0.13, 0.13, 0.13},
	{10, 0.15, 0.15, 0.15},
	{15, 0.16, 0.17, 0.17},
	{25, 0.16, 0.18, 0.19},
	{50, 0.16, 0.18, 0.21},
	{100, 0.16, 0.18, 0.22},
	{300, 0.16, 0.18, 0.23},
}

// MaxAirLayerThickness is the thickest air layer AirLayerResistance covers, m.
const MaxAirLayerThickness = 0.3

// AirLayerResistance returns the thermal resistance (m2 K/W) of an
// unventilated air layer of the given thickness (m) with high-emissivity
// faces and heat flow in the direction of o, interpolating linearly in
// ISO 6946:2007 Table 2 [memory]. Thicknesses outside 0 to 0.3 m are an
// error: thicker air spaces need the standard's detailed method or a
// roof-space treatment. Low-emissivity (foil) faces are not covered.
func AirLayerResistance(thickness float64, o Orientation) (float64, error) {
	mm := thickness * 1000
	if math.IsNaN(mm) || mm < 0 || mm > MaxAirLayerThickness*1000*(1+1e-12) {
		return 0, fmt.Errorf("air layer thickness %s is outside the tabulated range 0 to 300 mm", FormatQuantity(thickness, Length))
	}
	pick := func(i int) float64 {
		r := airLayerTable[i]
		switch o {
		case Roof:
			return r.up
		case Floor:
			return r.downw
		}
		return r.horiz
	}
	for i := 1; i < len(airLayerTable); i++ {
		a, b := airLayerTable[i-1], airLayerTable[i]
		if mm <= b.mm {
			t := (mm - a.mm) / (b.mm - a.mm)
			return pick(i-1) + t*(pick(i)-pick(i-1)), nil
		}
	}
	return pick(len(airLayerTable) - 1), nil
}

// Layer is one homogeneous layer of a construction, in SI units.
//
// A massive layer has Thickness, Conductivity, Density and SpecificHeat and
// Resistance 0. A resistance layer (an air gap, a membrane) has Resistance
// > 0, zero Conductivity, Density and SpecificHeat, and a Thickness that is
// only geometry: it is drawn in reports but stores no heat and is handed to
// the solver as a massless resistance (see Solver and
// Construction.SolverDepth).
type Layer struct {
	Name        string // label; defaults to the material name
	MaterialKey string // library key, "" for inline properties
	Source      string // where the properties come from, with its tag
	Family      string // material family, for report tinting; "" if unknown

	Thickness    float64 // d, m
	Conductivity float64 // lambda, W/(m K); unfrozen value for a freezing layer
	Density      float64 // rho, kg/m3
	SpecificHeat float64 // c, J/(kg K); unfrozen value for a freezing layer
	Resistance   float64 // m2 K/W, resistance layers only

	Freeze *solver.Freezing // latent heat of pore water; nil: none

	// Mix holds the parts of a mixed layer (studs in insulation, mortar
	// joints in blockwork; see NewMix); nil for a homogeneous layer. The
	// properties above are then those of the equivalent homogeneous layer
	// (see Construction.Homogenised).
	Mix []MixPart
}

// NewLayer makes a layer of the given thickness (m) from the library
// material key. For an air layer the resistance is AirLayerResistance at
// that thickness for the material's heat flow direction; thickness 0 keeps
// the tabulated thickness. An unknown key gives an *UnknownMaterialError
// with suggestions. The layer is validated.
func NewLayer(key string, thickness float64) (Layer, error) {
	m, ok := Lookup(key)
	if !ok {
		return Layer{}, &UnknownMaterialError{Key: key, Suggestions: Suggest(key)}
	}
	l := m.Layer()
	if !(m.Massless() && thickness == 0) {
		if err := l.SetThickness(thickness); err != nil {
			return Layer{}, err
		}
	}
	return l, l.Validate()
}

// Layer returns a layer of material m with the material's name, key,
// family, source and properties. A massive layer has Thickness 0: set it
// with SetThickness (or assign it). An air layer comes at its tabulated
// thickness ResistanceThickness with the tabulated Resistance.
func (m Material) Layer() Layer {
	l := Layer{Name: m.Name, MaterialKey: m.Key, Source: m.Source, Family: m.Family}
	if m.Massless() {
		l.Thickness, l.Resistance = m.ResistanceThickness, m.Resistance
		return l
	}
	l.Conductivity, l.Density, l.SpecificHeat = m.Conductivity, m.Density, m.SpecificHeat
	return l
}

// SetThickness sets the thickness of l to d (m). For an air layer of the
// library (MaterialKey names an air material) it also sets Resistance to
// AirLayerResistance(d) for the material's direction of heat flow, and
// returns that function's error for a thickness outside its table. An
// explicit resistance should be assigned after SetThickness.
func (l *Layer) SetThickness(d float64) error {
	if m, ok := Lookup(l.MaterialKey); ok && m.Massless() && l.Massless() {
		r, err := AirLayerResistance(d, m.HeatFlow)
		if err != nil {
			return fmt.Errorf("material %q: %w", m.Key, err)
		}
		l.Resistance = r
	}
	l.Thickness = d
	return nil
}

// Massless reports whether l stores no heat: a resistance layer, whose
// drawn Thickness is only geometry (the solver gets it with thickness 0,
// where solver.Layer.Massless says the same).
func (l Layer) Massless() bool { return l.Resistance > 0 }

// HeatCapacity is the volumetric heat capacity rho*c, J/(m3 K); 0 for a
// resistance layer.
func (l Layer) HeatCapacity() float64 { return l.Density * l.SpecificHeat }

// ArealHeatCapacity is the heat stored per square metre and kelvin,
// rho*c*d, J/(m2 K); 0 for a resistance layer.
func (l Layer) ArealHeatCapacity() float64 { return l.HeatCapacity() * l.Thickness }

// ThermalResistance is d/lambda for a massive layer, or Resistance for a
// resistance layer, m2 K/W (ISO 6946, R = d/lambda).
func (l Layer) ThermalResistance() float64 {
	if l.Massless() {
		return l.Resistance
	}
	return l.Thickness / l.Conductivity
}

// Diffusivity is the thermal diffusivity a = lambda/(rho c), m2/s; 0 for a
// resistance layer.
func (l Layer) Diffusivity() float64 {
	if l.Massless() || l.HeatCapacity() == 0 {
		return 0
	}
	return l.Conductivity / l.HeatCapacity()
}

// Effusivity is the thermal effusivity b = sqrt(lambda rho c),
// W s^0.5/(m2 K). Two semi-infinite bodies brought into contact settle at
// the contact temperature (b1 T1 + b2 T2)/(b1 + b2) (a standard result of
// conduction in semi-infinite solids: Carslaw and Jaeger, Conduction of
// Heat in Solids, 2nd ed., chapter II [memory]; [derived] from the
// equal surface fluxes of the two erf solutions). It is 0
// for a resistance layer.
func (l Layer) Effusivity() float64 {
	if l.Massless() {
		return 0
	}
	return math.Sqrt(l.Conductivity * l.HeatCapacity())
}

// PenetrationDepth is the periodic penetration depth of ISO 13786,
// delta = sqrt(lambda T / (pi rho c)), m, for a period T in seconds: the
// depth at which the amplitude of a periodic surface temperature falls to
// 1/e in a semi-infinite slab of this material. It is 0 for a resistance
// layer and NaN for a period that is not positive.
func (l Layer) PenetrationDepth(period float64) float64 {
	if !(period > 0) {
		return math.NaN()
	}
	a := l.Diffusivity()
	if a == 0 {
		return 0
	}
	return math.Sqrt(a * period / math.Pi)
}

// Validate reports the first impossible value of l.
func (l Layer) Validate() error {
	name := l.Name
	if name == "" {
		name = l.MaterialKey
	}
	bad := func(v float64) bool { return math.IsNaN(v) || math.IsInf(v, 0) }
	if bad(l.Thickness) || bad(l.Conductivity) || bad(l.Density) || bad(l.SpecificHeat) || bad(l.Resistance) {
		return fmt.Errorf("layer %q: a property is not a finite number", name)
	}
	if l.Massless() {
		switch {
		case l.Thickness < 0:
			return fmt.Errorf("layer %q: thickness must not be negative, got %g m", name, l.Thickness)
		case l.Conductivity != 0 || l.Density != 0 || l.SpecificHeat != 0:
			return fmt.Errorf("layer %q: give either a thermal resistance or conductivity, density and specific heat, not both", name)
		case l.Freeze != nil:
			return fmt.Errorf("layer %q: a resistance layer cannot freeze", name)
		}
		return nil
	}
	switch {
	case l.Resistance < 0:
		return fmt.Errorf("layer %q: thermal resistance must not be negative, got %g m2 K/W", name, l.Resistance)
	case l.Thickness <= 0:
		return fmt.Errorf("layer %q: thickness must be positive, got %g m", name, l.Thickness)
	case l.Conductivity <= 0:
		return fmt.Errorf("layer %q: conductivity must be positive, got %g W/(m K)", name, l.Conductivity)
	case l.Density <= 0:
		return fmt.Errorf("layer %q: density must be positive, got %g kg/m3", name, l.Density)
	case l.SpecificHeat <= 0:
		return fmt.Errorf("layer %q: specific heat must be positive, got %g J/(kg K)", name, l.SpecificHeat)
	}
	return l.Solver().Validate()
}

// Solver converts l to the solver's layer: HeatCapacity = Density *
// SpecificHeat. A resistance layer becomes a massless solver layer
// (Thickness 0, Resistance R), whatever its drawn thickness.
func (l Layer) Solver() solver.Layer {
	name := l.Name
	if name == "" {
		name = l.MaterialKey
	}
	if l.Massless() {
		return solver.Layer{Name: name, Resistance: l.Resistance}
	}
	return solver.Layer{
		Name:         name,
		Thickness:    l.Thickness,
		Conductivity: l.Conductivity,
		HeatCapacity: l.HeatCapacity(),
		Freeze:       l.Freeze,
	}
}

// Construction is a building component made of layers in series.
type Construction struct {
	Layers      []Layer     // Layers[0] is the outside layer
	Orientation Orientation // fixes the conventional surface resistances
}

// ErrNoLayers is returned by Validate for a construction without layers.
var ErrNoLayers = errors.New("the construction has no layers")

// Validate checks every layer.
func (c Construction) Validate() error {
	if len(c.Layers) == 0 {
		return ErrNoLayers
	}
	for i, l := range c.Layers {
		if err := l.Validate(); err != nil {
			return fmt.Errorf("layer %d: %w", i+1, err)
		}
	}
	return nil
}

// Thickness is the total drawn thickness of the construction, m, including
// the thickness of air layers.
func (c Construction) Thickness() float64 {
	var d float64
	for _, l := range c.Layers {
		d += l.Thickness
	}
	return d
}

// ThermalResistance is the sum of the layer resistances, surface to
// surface, m2 K/W (ISO 6946: R = sum of d/lambda and air-layer resistances).
func (c Construction) ThermalResistance() float64 {
	var r float64
	for _, l := range c.Layers {
		r += l.ThermalResistance()
	}
	return r
}

// ArealHeatCapacity is the total heat stored per square metre and kelvin,
// sum of rho c d, J/(m2 K). It is not the ISO 13786 areal heat capacity of
// one side, which depends on the period.
func (c Construction) ArealHeatCapacity() float64 {
	var k float64
	for _, l := range c.Layers {
		k += l.ArealHeatCapacity()
	}
	return k
}

// TotalResistance is the environment-to-environment resistance
// RT = rsi + R + rse, m2 K/W (ISO 6946).
func (c Construction) TotalResistance(rsi, rse float64) float64 {
	return rsi + c.ThermalResistance() + rse
}

// UValue is the thermal transmittance U = 1/RT, W/(m2 K), with the given
// inside and outside surface resistances (ISO 6946). Use
// SurfaceResistances(c.Orientation) for the conventional ones. ISO 6946
// rounds a reported U to two significant figures; UValue does not round.
func (c Construction) UValue(rsi, rse float64) float64 {
	return 1 / c.TotalResistance(rsi, rse)
}

// StandardUValue is UValue with the conventional surface resistances of
// c.Orientation, W/(m2 K).
func (c Construction) StandardUValue() float64 {
	return c.UValue(SurfaceResistances(c.Orientation))
}

// Column returns the solver input for c: the layers outside first, the
// inside surface resistance rsi and the outside surface resistance rse
// (m2 K/W; 0 imposes the environment temperature on the surface), in the
// order of SurfaceResistances, UValue and TotalResistance.
func (c Construction) Column(rsi, rse float64) solver.Column {
	col := solver.Column{
		Layers:            make([]solver.Layer, len(c.Layers)),
		OutsideResistance: rse,
		InsideResistance:  rsi,
	}
	for i, l := range c.Layers {
		col.Layers[i] = l.Solver()
	}
	return col
}

// SolverDepth converts a depth x (m from the outside face, counting the
// drawn thickness of air layers) to the position in the solver column,
// where air layers have no thickness. A depth inside an air layer maps to
// the layer's position.
func (c Construction) SolverDepth(x float64) float64 {
	var drawn, solid float64
	for _, l := range c.Layers {
		if x <= drawn {
			break
		}
		if l.Massless() {
			drawn += l.Thickness
			continue
		}
		step := math.Min(l.Thickness, x-drawn)
		drawn += l.Thickness
		solid += step
	}
	if x > drawn {
		solid += x - drawn
	}
	return solid
}
