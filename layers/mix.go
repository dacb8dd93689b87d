package layers

import (
	"fmt"
	"math"
	"strings"
)

// MixPart is one material of a mixed (thermally inhomogeneous) layer,
// such as the timber studs between insulation batts or the mortar joints
// of blockwork, with the fraction of the layer's face area it takes.
type MixPart struct {
	Layer    Layer   // the material as a homogeneous layer of the mix's thickness
	Fraction float64 // area fraction f, in (0, 1]; the parts of a mix sum to 1
}

// MixFractionTolerance is how far the fractions of a mix may sum away from
// 1 (rounded percentages: 3 x 33.3 % = 99.9 %); NewMix scales them to sum
// to 1 exactly.
const MixFractionTolerance = 0.005

// MaxMixPaths bounds the heat-flow paths of a construction with mixed
// layers (the product of the parts of every mixed layer); past it
// Combined returns an error.
const MaxMixPaths = 1 << 16

// IsMix reports whether l is a mixed layer.
func (l Layer) IsMix() bool { return len(l.Mix) > 0 }

// NewMix makes a mixed layer of the given name and thickness (m) from its
// parts. Each part's layer is set to the thickness (an air layer of the
// library takes its tabulated resistance at it) and validated; each
// fraction must lie in (0, 1] and together they must sum to 1 within
// MixFractionTolerance (they are then scaled to sum to 1). At least one
// part must be massive.
//
// The layer returned carries the parts in Mix and, until
// Construction.Homogenised replaces it, the equivalent conductivity of
// the lower limit of ISO 6946 (clause 6.7.2.3 of the 2017 edition, 6.2.4
// of 2007 [memory]): lambda_lo = d / R_lo, 1/R_lo = sum f_m / R_m, with R_m
// = d/lambda_m (or an air part's resistance). Density and volumetric heat
// capacity are the area-fraction-weighted means, rho = sum f_m rho_m and
// rho c = sum f_m rho_m c_m (the heat stored by the parts side by side;
// an air part stores none), so SpecificHeat is the mass-weighted mean.
func NewMix(name string, thickness float64, parts []MixPart) (Layer, error) {
	if len(parts) == 0 {
		return Layer{}, fmt.Errorf("mixed layer %q has no parts", name)
	}
	if !(thickness > 0) || math.IsInf(thickness, 0) {
		return Layer{}, fmt.Errorf("mixed layer %q: thickness must be positive, got %g m", name, thickness)
	}
	var sum float64
	massive := false
	out := make([]MixPart, len(parts))
	for i, p := range parts {
		if !(p.Fraction > 0 && p.Fraction <= 1) {
			return Layer{}, fmt.Errorf("mixed layer %q, part %d: fraction must lie in (0, 1], got %g", name, i+1, p.Fraction)
		}
		if p.Layer.IsMix() {
			return Layer{}, fmt.Errorf("mixed layer %q, part %d: a part cannot be a mix itself", name, i+1)
		}
		if p.Layer.Freeze != nil {
			return Layer{}, fmt.Errorf("mixed layer %q, part %d: a part of a mix cannot freeze", name, i+1)
		}
		pl := p.Layer
		if err := pl.SetThickness(thickness); err != nil {
			return Layer{}, fmt.Errorf("mixed layer %q, part %d: %w", name, i+1, err)
		}
		if err := pl.Validate(); err != nil {
			return Layer{}, fmt.Errorf("mixed layer %q, part %d: %w", name, i+1, err)
		}
		massive = massive || !pl.Massless()
		sum += p.Fraction
		out[i] = MixPart{Layer: pl, Fraction: p.Fraction}
	}
	if math.Abs(sum-1) > MixFractionTolerance {
		return Layer{}, fmt.Errorf("mixed layer %q: the fractions sum to %s, not 100 %%", name, FormatQuantity(sum, Fraction))
	}
	if !massive {
		return Layer{}, fmt.Errorf("mixed layer %q: every part is an air layer; give at least one material", name)
	}
	l := Layer{Name: name, Thickness: thickness, Mix: out}
	var rhoc, largest float64
	for i := range out {
		out[i].Fraction /= sum
		p := out[i]
		l.Density += p.Fraction * p.Layer.Density
		rhoc += p.Fraction * p.Layer.HeatCapacity()
		if p.Fraction > largest {
			largest, l.Family = p.Fraction, p.Layer.Family
		}
	}
	l.SpecificHeat = rhoc / l.Density
	l.Conductivity = thickness / l.lowerResistance()
	l.Source = "mix of " + l.MixLabel() + "; equivalent homogeneous layer (see the methods)"
	return l, nil
}

// MixLabel lists the parts of a mixed layer with their fractions, e.g.
// "15 % softwood, 85 % mineral-wool"; "" for a plain layer.
func (l Layer) MixLabel() string {
	parts := make([]string, len(l.Mix))
	for i, p := range l.Mix {
		name := p.Layer.MaterialKey
		if name == "" {
			name = p.Layer.Name
		}
		parts[i] = FormatQuantity(p.Fraction, Fraction) + " " + name
	}
	return strings.Join(parts, ", ")
}

// lowerResistance is the resistance of layer l in the lower limit of the
// combined method, m2 K/W: for a mixed layer 1 / sum f_m/R_m (parallel
// parts between isothermal planes), otherwise ThermalResistance.
func (l Layer) lowerResistance() float64 {
	if !l.IsMix() {
		return l.ThermalResistance()
	}
	var g float64
	for _, p := range l.Mix {
		g += p.Fraction / p.Layer.ThermalResistance()
	}
	return 1 / g
}

// CombinedResistance is the total thermal resistance of a construction by
// the combined method of ISO 6946 (clause 6.7 of ISO 6946:2017, 6.2 of
// ISO 6946:2007 [memory]), environment to environment, m2 K/W.
type CombinedResistance struct {
	// Upper is the upper limit R'_T: the paths of heat flow through the
	// construction side by side, each path in series from environment to
	// environment, 1/R'_T = sum over paths f_p / R_Tp.
	Upper float64
	// Lower is the lower limit R''_T: the layers in series, each mixed
	// layer as its parts side by side, Rsi + sum R''_j + Rse with
	// 1/R''_j = sum f_m / R_mj.
	Lower float64
	// Total is R_T = (R'_T + R''_T) / 2.
	Total float64
	// RelativeError is the maximum relative error of Total that the
	// standard gives, e = (R'_T - R''_T) / (2 R_T), dimensionless; 0 when
	// no layer is mixed.
	RelativeError float64
	// Paths is the number of heat-flow paths of the upper limit.
	Paths int
}

// Combined returns the total resistance of c by the combined method of
// ISO 6946 with the surface resistances rsi and rse (m2 K/W). The paths
// of the upper limit are every combination of one part from each mixed
// layer; a path's area fraction is the product of its parts' fractions.
// This takes the mixes of different layers as laid out independently of
// each other (studs in one layer, battens across them in another); studs
// that run through two layers in line are one mixed layer of the two
// thicknesses. Without a mixed layer both limits are rsi + sum R + rse and
// the relative error is 0.
func (c Construction) Combined(rsi, rse float64) (CombinedResistance, error) {
	// Lower limit, and the resistance of the plain layers common to every path.
	lower := rsi + rse
	plain := rsi + rse
	var mixed []Layer
	paths := 1
	for _, l := range c.Layers {
		lower += l.lowerResistance()
		if !l.IsMix() {
			plain += l.ThermalResistance()
			continue
		}
		mixed = append(mixed, l)
		paths *= len(l.Mix)
		if paths > MaxMixPaths {
			return CombinedResistance{}, fmt.Errorf("the mixed layers make more than %d heat-flow paths; merge mixed layers or give fewer parts", MaxMixPaths)
		}
	}
	// Upper limit: 1/R'_T = sum over paths of f_p / R_Tp, walking every
	// combination of parts (an odometer over the mixed layers).
	var g float64
	idx := make([]int, len(mixed))
	for {
		f, r := 1.0, plain
		for k, l := range mixed {
			p := l.Mix[idx[k]]
			f *= p.Fraction
			r += p.Layer.ThermalResistance()
		}
		g += f / r
		k := 0
		for ; k < len(mixed); k++ {
			idx[k]++
			if idx[k] < len(mixed[k].Mix) {
				break
			}
			idx[k] = 0
		}
		if k == len(mixed) {
			break
		}
	}
	upper := 1 / g
	if len(mixed) == 0 {
		upper = lower // the same sum; avoid round-off in 1/(1/x)
	}
	total := (upper + lower) / 2
	return CombinedResistance{
		Upper:         upper,
		Lower:         lower,
		Total:         total,
		RelativeError: (upper - lower) / (2 * total),
		Paths:         paths,
	}, nil
}

// HasMix reports whether a layer of c is mixed.
func (c Construction) HasMix() bool {
	for _, l := range c.Layers {
		if l.IsMix() {
			return true
		}
	}
	return false
}

// Homogenised returns a copy of c in which every mixed layer is the
// equivalent homogeneous layer used for the periodic analysis and the
// simulation, and the combined-method resistance it is built on. Its
// conductivity is chosen so that the layers in series give the combined
// method's R_T: each mixed layer j gets the resistance
//
//	R_eq,j = R''_j + (R_T - R''_T) R''_j / sum_k R''_k   (k over the mixed layers),
//
// the lower-limit resistance plus a share of the difference in proportion
// to it (the whole difference for a single mixed layer), and the
// conductivity lambda_eq = d / R_eq,j; density and specific heat stay the
// fraction-weighted values of NewMix. Then Rsi + sum R + Rse of the copy
// equals R_T and its U-value is the combined method's 1/R_T. The parts stay
// in Mix for the report. A construction without a mixed layer is returned
// as it is.
func (c Construction) Homogenised(rsi, rse float64) (Construction, CombinedResistance, error) {
	cr, err := c.Combined(rsi, rse)
	if err != nil || !c.HasMix() {
		return c, cr, err
	}
	var lowerMixed float64
	for _, l := range c.Layers {
		if l.IsMix() {
			lowerMixed += l.lowerResistance()
		}
	}
	out := c
	out.Layers = append([]Layer(nil), c.Layers...)
	for i, l := range out.Layers {
		if !l.IsMix() {
			continue
		}
		r := l.lowerResistance()
		r += (cr.Total - cr.Lower) * r / lowerMixed
		out.Layers[i].Conductivity = l.Thickness / r
	}
	return out, cr, nil
}
