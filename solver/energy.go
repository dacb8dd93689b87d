package solver

import "math"

// EnergyBalance is the heat budget of a transient simulation, J/m2 of
// column surface.
//
// Stored is the change of the heat content of the column (sensible and
// latent) between the start and the end of the run. InflowOutside and
// InflowInside are the heat that entered the column through each surface
// (positive into the column, whatever the direction of x), integrated with
// the quadrature weights of the time scheme, so that Stored equals
// InflowOutside + InflowInside up to round-off. Exchanged is the integral
// of the absolute surface fluxes of both surfaces: the scale against which
// RelativeError = |Stored - InflowOutside - InflowInside| / Exchanged is
// measured (0 when nothing was exchanged).
type EnergyBalance struct {
	Stored        float64 // J/m2, heat content at the end minus at the start
	InflowOutside float64 // J/m2, into the column through the outside surface
	InflowInside  float64 // J/m2, into the column through the inside surface
	Exchanged     float64 // J/m2, integral of |q| over both surfaces
	RelativeError float64 // |Stored - inflows| / Exchanged
}

// Residual returns Stored - InflowOutside - InflowInside, J/m2: the heat
// the discrete scheme created (positive) or lost (negative).
func (e EnergyBalance) Residual() float64 {
	return e.Stored - e.InflowOutside - e.InflowInside
}

// fvKahan is a compensated (Kahan-Babuska-Neumaier) running sum, so that
// the energy integrated over many thousands of time steps keeps its last
// digits.
type fvKahan struct{ sum, comp float64 }

func (k *fvKahan) add(v float64) {
	t := k.sum + v
	if math.Abs(k.sum) >= math.Abs(v) {
		k.comp += (k.sum - t) + v
	} else {
		k.comp += (v - t) + k.sum
	}
	k.sum = t
}

func (k *fvKahan) value() float64 { return k.sum + k.comp }
