package solver_test

import (
	"fmt"
	"math"

	"tempstack/solver"
)

// A soil half-space at 20 degC whose surface is held at -15 degC for 60
// days (the case of Incropera et al., Example 5.6): the simulated 0 degC
// isotherm beside the erf solution.
func ExampleSimulate() {
	soil := solver.Layer{Name: "soil", Thickness: 6, Conductivity: 0.52, HeatCapacity: 2050 * 1840}
	col := solver.Column{Layers: []solver.Layer{soil}, HalfSpace: true}
	res, err := solver.Simulate(solver.Problem{
		Column:      col,
		Outside:     solver.Boundary{Kind: solver.Environment, Temperature: func(float64) float64 { return -15 }},
		Inside:      solver.Boundary{Kind: solver.Adiabatic},
		InitialFunc: func(x float64) float64 { return 20 },
		Duration:    60 * 86400,
		Step:        3600,
		OutputStep:  30 * 86400,
		Probes:      []float64{0.5},
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	exact, _ := solver.StepIsothermDepth(soil.Diffusivity(), 20, -15, 0, 60*86400)
	last := len(res.Times) - 1
	fmt.Printf("0 degC isotherm after 60 days: %.3f m (erf solution %.3f m)\n", res.FrostDepth[last], exact)
	for k := 1; k <= last; k++ {
		t := res.Times[k]
		q := -35 * solver.StepFluxHalfSpace(soil.Conductivity, soil.HeatCapacity, 0, t)
		fmt.Printf("day %2.0f: %5.2f degC at 0.5 m, surface flux %6.2f W/m2 (erf solution %6.2f)\n", t/86400, res.Probe[0][k], res.FluxOutside[k], q)
	}
	fmt.Println("energy balance closes:", res.Energy.RelativeError < 1e-8)
	// Output:
	// 0 degC isotherm after 60 days: 0.677 m (erf solution 0.677 m)
	// day 30:  0.60 degC at 0.5 m, surface flux -17.17 W/m2 (erf solution -17.18)
	// day 60: -3.66 degC at 0.5 m, surface flux -12.14 W/m2 (erf solution -12.15)
	// energy balance closes: true
}

// The two-phase Neumann solution for soil frozen from the surface.
func ExampleNeumannFront() {
	p := solver.NeumannProblem{
		ConductivityFrozen: 2.324, HeatCapacityFrozen: 1.966e6,
		ConductivityUnfrozen: 1.860, HeatCapacityUnfrozen: 2.862e6,
		LatentHeat: 1.1045e8,
		Surface:    -10, Initial: 2, FreezingPoint: 0,
	}
	m, err := solver.NeumannFront(p)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("X = m sqrt(t), m = %.4f cm/h^0.5\n", m*100*math.Sqrt(3600))
	for _, days := range []float64{10, 30, 60} {
		t := days * 86400
		fmt.Printf("after %2.0f days: front at %.3f m, %.2f degC at 0.5 m\n", days, m*math.Sqrt(t), solver.NeumannTemperature(p, m, 0.5, t))
	}
	// Output:
	// X = m sqrt(t), m = 3.5945 cm/h^0.5
	// after 10 days: front at 0.557 m, -0.98 degC at 0.5 m
	// after 30 days: front at 0.965 m, -4.72 degC at 0.5 m
	// after 60 days: front at 1.364 m, -6.25 degC at 0.5 m
}
