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
// the layered form of Stefan's formula used by the multilayer procedure of
// the US Army frost manuals (TM 5-852-6 / AFR 88-19 Vol. 6, 1988,
// "Calculation methods for determination of depths of freeze and thaw in
// soils"; UFC 3-130-06; procedure [memory]; with lambda = 1). The frost
// line lies in the first layer whose cumulative index exceeds F; there the
// partial depth x solves L x (R_above + x/(2k)) = (F - F_above) 86400. The
// last layer continues downward. For one layer it is X = sqrt(2 k F 86400
// / L), Stefan's formula.
//
// Every layer must freeze (Freeze set with latent heat > 0); a massless
// layer adds its resistance and needs no index.
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
		if l.IsResistance() {
			rAbove += l.Resistance
			needed = append(needed, cum/secondsPerDay)
			continue
		}
		if l.Freeze == nil || !(l.Freeze.LatentHeat > 0) || !(l.Freeze.ConductivityFrozen > 0) {
			return 0, nil, fmt.Errorf("stefan: layer %d (%q) has no latent heat; Stefan's formula needs freezing water in every layer it reaches", i+1, l.Name)
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
