package solver

import (
	"errors"
	"fmt"
	"math"
)

// Freezing describes the latent heat of the pore water in a layer.
//
// Water freezes between Point-Range and Point (degrees Celsius); Range = 0
// is isothermal freezing at Point. Below the range the layer has the frozen
// conductivity and heat capacity; above it the unfrozen values of the Layer.
type Freezing struct {
	Point              float64 // freezing point, degC (0 for free water)
	Range              float64 // width of the freezing range below Point, K; 0 = isothermal
	LatentHeat         float64 // latent heat released on freezing, J/m3 of layer
	ConductivityFrozen float64 // W/(m K)
	HeatCapacityFrozen float64 // volumetric heat capacity when frozen, J/(m3 K)
}

// Layer is one homogeneous slab of a column, in SI units.
//
// A layer with Thickness 0 and Resistance > 0 is a massless thermal
// resistance (an air gap, a thin membrane): it stores no heat and has
// Conductivity and HeatCapacity 0. Every other layer has Thickness > 0,
// Conductivity > 0 and HeatCapacity > 0, and Resistance 0.
type Layer struct {
	Name         string    // label for messages; not used by the numerics
	Thickness    float64   // m
	Conductivity float64   // W/(m K); unfrozen value for a freezing layer
	HeatCapacity float64   // volumetric heat capacity rho*c, J/(m3 K); unfrozen value
	Resistance   float64   // m2 K/W, massless layers only
	Freeze       *Freezing // nil: no phase change
}

// Massless reports whether l stores no heat: a resistance layer, which
// the solver represents with Thickness 0 and Resistance > 0.
func (l Layer) Massless() bool { return l.Thickness == 0 && l.Resistance > 0 }

// Diffusivity is the thermal diffusivity lambda/(rho c) of an unfrozen layer, m2/s.
func (l Layer) Diffusivity() float64 { return l.Conductivity / l.HeatCapacity }

// ThermalResistance is d/lambda for a massive layer, or Resistance for a
// massless one, m2 K/W.
func (l Layer) ThermalResistance() float64 {
	if l.Massless() {
		return l.Resistance
	}
	return l.Thickness / l.Conductivity
}

// Validate reports the first physically impossible value of l.
func (l Layer) Validate() error {
	bad := func(v float64) bool { return math.IsNaN(v) || math.IsInf(v, 0) }
	if bad(l.Thickness) || bad(l.Conductivity) || bad(l.HeatCapacity) || bad(l.Resistance) {
		return fmt.Errorf("layer %q: a property is not a finite number", l.Name)
	}
	if l.Massless() {
		if l.Conductivity != 0 || l.HeatCapacity != 0 || l.Freeze != nil {
			return fmt.Errorf("layer %q: a massless resistance layer cannot have conductivity, heat capacity or freezing", l.Name)
		}
		return nil
	}
	switch {
	case l.Thickness <= 0:
		return fmt.Errorf("layer %q: thickness must be positive, got %g m", l.Name, l.Thickness)
	case l.Conductivity <= 0:
		return fmt.Errorf("layer %q: conductivity must be positive, got %g W/(m K)", l.Name, l.Conductivity)
	case l.HeatCapacity <= 0:
		return fmt.Errorf("layer %q: heat capacity must be positive, got %g J/(m3 K)", l.Name, l.HeatCapacity)
	case l.Resistance != 0:
		return fmt.Errorf("layer %q: a layer with thickness cannot also have a resistance", l.Name)
	}
	if f := l.Freeze; f != nil {
		switch {
		case bad(f.Point) || bad(f.Range) || bad(f.LatentHeat) || bad(f.ConductivityFrozen) || bad(f.HeatCapacityFrozen):
			return fmt.Errorf("layer %q: a freezing property is not a finite number", l.Name)
		case f.Range < 0:
			return fmt.Errorf("layer %q: freezing range must not be negative, got %g K", l.Name, f.Range)
		case f.LatentHeat < 0:
			return fmt.Errorf("layer %q: latent heat must not be negative, got %g J/m3", l.Name, f.LatentHeat)
		case f.ConductivityFrozen <= 0:
			return fmt.Errorf("layer %q: frozen conductivity must be positive, got %g W/(m K)", l.Name, f.ConductivityFrozen)
		case f.HeatCapacityFrozen <= 0:
			return fmt.Errorf("layer %q: frozen heat capacity must be positive, got %g J/(m3 K)", l.Name, f.HeatCapacityFrozen)
		}
	}
	return nil
}

// Column is a one-dimensional stack of layers between two surfaces.
//
// OutsideResistance and InsideResistance are the surface resistances (m2 K/W)
// between each surface and its environment; 0 means the environment
// temperature is imposed on the surface itself.
//
// When HalfSpace is true the last layer does not end: it continues as a
// semi-infinite solid (a ground column for periodic analysis), its
// Thickness counts only for meshing and depth reporting, and
// InsideResistance is ignored.
type Column struct {
	Layers            []Layer // Layers[0] touches the outside (x = 0)
	OutsideResistance float64 // m2 K/W
	InsideResistance  float64 // m2 K/W
	HalfSpace         bool
}

// ErrEmptyColumn is returned for a column without layers.
var ErrEmptyColumn = errors.New("solver: column has no layers")

// Validate checks every layer and the surface resistances.
func (c Column) Validate() error {
	if len(c.Layers) == 0 {
		return ErrEmptyColumn
	}
	for _, l := range c.Layers {
		if err := l.Validate(); err != nil {
			return err
		}
	}
	if c.HalfSpace && c.Layers[len(c.Layers)-1].Massless() {
		return errors.New("solver: a half-space column must end in a massive layer")
	}
	if c.OutsideResistance < 0 || c.InsideResistance < 0 ||
		math.IsNaN(c.OutsideResistance) || math.IsNaN(c.InsideResistance) {
		return errors.New("solver: surface resistances must be finite and not negative")
	}
	return nil
}

// Thickness is the total thickness of the column's layers, m.
func (c Column) Thickness() float64 {
	var d float64
	for _, l := range c.Layers {
		d += l.Thickness
	}
	return d
}

// Interfaces returns the positions of the layer boundaries, m from the
// outside: len(Layers)+1 values starting at 0. A massless layer gives two
// equal positions.
func (c Column) Interfaces() []float64 {
	x := make([]float64, len(c.Layers)+1)
	for i, l := range c.Layers {
		x[i+1] = x[i] + l.Thickness
	}
	return x
}

// LayerAt returns the index of the massive layer containing position x (m).
// A position on an interface belongs to the deeper layer; positions beyond
// the column belong to the last layer.
func (c Column) LayerAt(x float64) int {
	var top float64
	for i, l := range c.Layers {
		if l.Massless() {
			continue
		}
		if x < top+l.Thickness {
			return i
		}
		top += l.Thickness
	}
	for i := len(c.Layers) - 1; i >= 0; i-- {
		if !c.Layers[i].Massless() {
			return i
		}
	}
	return len(c.Layers) - 1
}
