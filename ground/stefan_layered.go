package ground

import (
	"errors"
	"fmt"
	"math"

	"tempstack/solver"
)

// StefanLayered returns the depth (m) to which the surface freezing index
// (K day) freezes a layered soil by Stefan's assumptions (all heat is latent
// heat, conducted through the frozen layers with a linear profile in each),
// and the cumulative index needed to freeze through each whole layer.
//
// Each layer i (frozen conductivity k_i, latent heat L_i, thickness d_i)
// needs the index
//
//	dF_i = L_i d_i (R_above + d_i / (2 k_i)) / 86400,  R_above = sum_{j<i} d_j / k_j,
//
// the layered form of Stefan's formula of the multilayer procedure of the
// US Army frost manuals (TM 5-852-6 / AFR 88-19 Vol. 6, 1988, "Calculation
// methods for determination of depths of freeze and thaw in soils";
// UFC 3-130-06; Aldrich and Paynter 1953; procedure [memory]; with
// lambda = 1). The frost line lies in the
// first layer whose cumulative index exceeds F; there the partial depth x
// solves L x (R_above + x/(2k)) = (F - F_above) 86400. The last layer
// continues downward. For one layer it is X = sqrt(2 k F 86400 / L),
// Stefan's formula.
//
// A layer without latent heat (asphalt, concrete, a dry base course,
// insulation board: no Freeze, or LatentHeat 0) freezes at once, needs no
// index (dF = 0) and only adds its resistance d/k (frozen conductivity when
// given, else its conductivity) to the layers below, as the manuals treat
// pavement and insulation layers; a massless layer adds its resistance.
// When the deepest layer has no latent heat the method puts no bound on
// the frost depth and StefanLayered returns an error.
func StefanLayered(layers []solver.Layer, surfaceIndex float64) (depth float64, needed []float64, err error) {
	if len(layers) == 0 {
		return 0, nil, errors.New("stefan: no layers")
	}
	if !finite(surfaceIndex) || surfaceIndex < 0 {
		return 0, nil, fmt.Errorf("stefan: the surface index must be a degree-day total >= 0, got %g K day", surfaceIndex)
	}
	F := surfaceIndex * secondsPerDay // K s
	var rAbove, dAbove, cum float64   // m2K/W, m, K s
	for i, l := range layers {
		if l.Massless() {
			rAbove += l.Resistance
			needed = append(needed, cum/secondsPerDay)
			continue
		}
		if l.Freeze == nil || !(l.Freeze.LatentHeat > 0) {
			// No water to freeze: the frost passes at once, the layer
			// only adds its resistance.
			k := l.Conductivity
			if l.Freeze != nil && l.Freeze.ConductivityFrozen > 0 {
				k = l.Freeze.ConductivityFrozen
			}
			if !(k > 0) || !(l.Thickness > 0) {
				return 0, nil, fmt.Errorf("stefan: layer %d (%q) needs a positive thickness and conductivity", i+1, l.Name)
			}
			if i == len(layers)-1 {
				return 0, nil, fmt.Errorf("stefan: the deepest layer %d (%q) has no latent heat, so Stefan's formula puts no bound on the frost depth below %.3g m", i+1, l.Name, dAbove+l.Thickness)
			}
			rAbove += l.Thickness / k
			dAbove += l.Thickness
			needed = append(needed, cum/secondsPerDay)
			continue
		}
		if !(l.Freeze.ConductivityFrozen > 0) {
			return 0, nil, fmt.Errorf("stefan: layer %d (%q) has no frozen conductivity", i+1, l.Name)
		}
		k, L := l.Freeze.ConductivityFrozen, l.Freeze.LatentHeat
		whole := L * l.Thickness * (rAbove + l.Thickness/(2*k))
		if i == len(layers)-1 || cum+whole > F {
			// Partial layer: (L/(2k)) x^2 + L R x - (F - cum) = 0.
			rest := F - cum
			x := k * (-rAbove + math.Sqrt(rAbove*rAbove+2*rest/(L*k)))
			return dAbove + x, needed, nil
		}
		cum += whole
		needed = append(needed, cum/secondsPerDay)
		rAbove += l.Thickness / k
		dAbove += l.Thickness
	}
	return dAbove, needed, nil
}
