package solver

import (
	"math"
	"testing"
)

// TestMeanFluxAddsUpToTheEnergyBalance: the interval-mean surface fluxes,
// times their intervals, add up to the heat that entered through each
// surface (the energy balance's inflows), with and without freezing.
func TestMeanFluxAddsUpToTheEnergyBalance(t *testing.T) {
	soil := Layer{Name: "soil", Thickness: 2, Conductivity: 1.8, HeatCapacity: 2.4e6,
		Freeze: &Freezing{LatentHeat: 8e7, ConductivityFrozen: 2.2, HeatCapacityFrozen: 1.9e6}}
	for _, col := range []Column{
		{Layers: []Layer{{Name: "slab", Thickness: 0.3, Conductivity: 1.2, HeatCapacity: 2e6}}},
		{Layers: []Layer{soil}},
	} {
		res, err := Simulate(Problem{
			Column:      col,
			Outside:     Boundary{Kind: Environment, Temperature: func(t float64) float64 { return -8 + 10*math.Sin(2*math.Pi*t/86400) }},
			Inside:      Boundary{Kind: Environment, Resistance: 0.13, Temperature: func(float64) float64 { return 5 }},
			InitialFunc: func(float64) float64 { return 3 },
			Duration:    20 * 86400, Step: 1800, OutputStep: 7200,
		})
		if err != nil {
			t.Fatal(err)
		}
		var qo, qi float64
		for k := 1; k < len(res.Times); k++ {
			dt := res.Times[k] - res.Times[k-1]
			qo += res.MeanFluxOutside[k] * dt
			qi -= res.MeanFluxInside[k] * dt // FluxInside is positive out of the column
		}
		if math.Abs(qo-res.Energy.InflowOutside) > 1e-9*math.Abs(res.Energy.Exchanged) ||
			math.Abs(qi-res.Energy.InflowInside) > 1e-9*math.Abs(res.Energy.Exchanged) {
			t.Errorf("%s: mean fluxes give %g and %g J/m2, the balance %g and %g", col.Layers[0].Name, qo, qi, res.Energy.InflowOutside, res.Energy.InflowInside)
		}
	}
}
