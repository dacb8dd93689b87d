package solver_test

import (
	"fmt"
	"math"
	"math/cmplx"

	"tempstack/solver"
)

// A solid brick wall with lime plaster inside, ISO 6946 surface
// resistances, daily period: the ISO 13786 characteristics.
func ExamplePeriodic() {
	wall := solver.Column{
		Layers: []solver.Layer{ // outside first
			{Name: "brick", Thickness: 0.22, Conductivity: 0.77, HeatCapacity: 1750 * 1000},
			{Name: "lime plaster", Thickness: 0.015, Conductivity: 0.7, HeatCapacity: 1600 * 1000},
		},
		OutsideResistance: 0.04, // m2 K/W
		InsideResistance:  0.13,
	}
	p, err := solver.Periodic(wall, 24*3600)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("U = %.3f W/(m2 K)\n", p.U)
	fmt.Printf("periodic transmittance = %.3f W/(m2 K)\n", p.PeriodicTransmittance)
	fmt.Printf("decrement factor = %.3f\n", p.DecrementFactor)
	fmt.Printf("time shift = %.2f h\n", p.TimeShift/3600)
	fmt.Printf("inside admittance = %.2f W/(m2 K), leading by %.2f h\n", p.InsideAdmittance, p.InsideAdmittanceLead/3600)
	fmt.Printf("areal heat capacities = %.1f / %.1f kJ/(m2 K)\n", p.InsideArealHeatCapacity/1e3, p.OutsideArealHeatCapacity/1e3)
	// Output:
	// U = 2.096 W/(m2 K)
	// periodic transmittance = 0.844 W/(m2 K)
	// decrement factor = 0.403
	// time shift = 7.67 h
	// inside admittance = 4.63 W/(m2 K), leading by 1.31 h
	// areal heat capacities = 72.3 / 114.8 kJ/(m2 K)
}

// The temperature swing through the same wall when the outside air swings
// by 8 K with its peak at 15:00 and the room is held steady.
func ExampleHarmonic() {
	wall := solver.Column{
		Layers: []solver.Layer{
			{Name: "brick", Thickness: 0.22, Conductivity: 0.77, HeatCapacity: 1750 * 1000},
			{Name: "lime plaster", Thickness: 0.015, Conductivity: 0.7, HeatCapacity: 1600 * 1000},
		},
		OutsideResistance: 0.04,
		InsideResistance:  0.13,
	}
	const day = 24 * 3600.0
	outside := cmplx.Rect(8, -2*math.Pi*15*3600/day) // 8 K peaking at 15:00, exp(+i omega t)
	x := []float64{0, 0.11, 0.22, 0.235}
	temp, flux, err := solver.Harmonic(wall, day, outside, 0, x)
	if err != nil {
		fmt.Println(err)
		return
	}
	for i := range x {
		peak := -cmplx.Phase(temp[i]) / (2 * math.Pi) * 24
		for peak < 0 {
			peak += 24
		}
		fmt.Printf("x = %.3f m: swing %.2f K, peak at %05.2f h, flux amplitude %.2f W/m2\n", x[i], cmplx.Abs(temp[i]), peak, cmplx.Abs(flux[i]))
	}
	// Output:
	// x = 0.000 m: swing 6.09 K, peak at 15.83 h, flux amplitude 61.02 W/m2
	// x = 0.110 m: swing 2.31 K, peak at 19.80 h, flux amplitude 21.82 W/m2
	// x = 0.220 m: swing 1.02 K, peak at 22.60 h, flux amplitude 6.94 W/m2
	// x = 0.235 m: swing 0.88 K, peak at 22.67 h, flux amplitude 6.75 W/m2
}

// The annual wave in a clay soil: amplitude ratio and lag at depth, and
// the depth below which the swing of a 10 K surface wave stays under 0.1 K.
func ExampleGroundPeriodic() {
	const year = 365 * 24 * 3600.0
	soil := solver.Column{
		Layers:    []solver.Layer{{Name: "wet clay", Thickness: 1, Conductivity: 1.4, HeatCapacity: 1.4 / 0.45e-6}},
		HalfSpace: true,
	}
	g, err := solver.GroundPeriodic(soil, year, []float64{0.5, 1, 2, 4})
	if err != nil {
		fmt.Println(err)
		return
	}
	for i, z := range g.Depths {
		fmt.Printf("z = %.1f m: amplitude ratio %.3f, lag %.0f days\n", z, g.AmplitudeRatio[i], g.Lag[i]/86400)
	}
	z, _ := solver.SwingDepth(soil, year, 10, 0.1)
	fmt.Printf("swing below 0.1 K deeper than %.2f m\n", z)
	// Output:
	// z = 0.5 m: amplitude ratio 0.790, lag 14 days
	// z = 1.0 m: amplitude ratio 0.625, lag 27 days
	// z = 2.0 m: amplitude ratio 0.390, lag 55 days
	// z = 4.0 m: amplitude ratio 0.152, lag 109 days
	// swing below 0.1 K deeper than 9.79 m
}
