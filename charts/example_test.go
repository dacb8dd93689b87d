package charts_test

import (
	"bytes"
	"fmt"
	"log"
	"strings"

	"tempstack/charts"
	"tempstack/scenarios/results"
)

// ExampleWrite writes the report for a small set of results. The numbers
// are invented for the example; a real run fills Results from a scenario.
func ExampleWrite() {
	r := &results.Results{
		Title: "Example wall (invented numbers)",
		Kind:  "wall",
		Layers: []results.Layer{
			{Name: "brick", Thickness_m: 0.2, Conductivity_W_mK: 0.8, Density_kg_m3: 1800, SpecificHeat_J_kgK: 900, Resistance_m2K_W: 0.25},
		},
		Steady:   results.Steady{UValue_W_m2K: 2.38, ThermalResistance_m2K_W: 0.25, TotalResistance_m2K_W: 0.42, InsideSurfaceResistance: 0.13, OutsideSurfaceResistance: 0.04},
		Periodic: []results.PeriodicResult{{Period_h: 24, DecrementFactor: 0.43, TimeShift_h: 6.1, TimeShiftUnwrapped_h: 6.1}},
	}
	r.Series.Cycle.Time_h = []float64{0, 6, 12, 18, 24}
	r.Series.Cycle.OutsideAir_C = []float64{10, 14, 10, 6, 10}
	r.Series.Cycle.InsideSurface_C = []float64{19, 19.5, 20, 19.5, 19}

	var b bytes.Buffer
	if err := charts.Write(&b, r, charts.Options{ToolVersion: "0.1.0"}); err != nil {
		log.Fatal(err)
	}
	html := b.String()
	fmt.Println(strings.HasPrefix(html, "<!DOCTYPE html>"))
	fmt.Println(strings.Contains(html, `id="chart-cycle"`))
	fmt.Println(strings.Contains(html, "is 43 % of the swing"))
	// Output:
	// true
	// true
	// true
}
