package ground_test

import (
	"fmt"

	"tempstack/climate"
	"tempstack/ground"
	"tempstack/solver"
)

// A moist sand described by dry density and water content (an invented
// site), turned into thermal properties and a solver layer.
func ExampleSoil() {
	s := ground.Soil{Texture: ground.Sand, DryDensity: 1850, WaterContent: 0.12}
	p, err := s.Properties()
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("porosity %.3f, saturation %.2f\n", p.Porosity, p.Saturation)
	fmt.Printf("conductivity frozen %.2f, unfrozen %.2f W/(m K)\n", p.ConductivityFrozen, p.ConductivityUnfrozen)
	fmt.Printf("latent heat %.1f MJ/m3\n", p.LatentHeat/1e6)
	l, _ := s.Layer("sand fill", 0.8)
	fmt.Printf("layer %q: %.2f m, freezes at %g degC\n", l.Name, l.Thickness, l.Freeze.Point)

	s.WaterContent = 0.35
	_, err = s.Properties()
	fmt.Println(err)
	// Output:
	// porosity 0.302, saturation 0.74
	// conductivity frozen 3.04, unfrozen 2.38 W/(m K)
	// latent heat 74.1 MJ/m3
	// layer "sand fill": 0.80 m, freezes at 0 degC
	// soil: water content 35 % exceeds saturation: at dry density 1850 kg/m3 (porosity 0.302) the pores hold at most 16.3 %
}

// Stefan's frost depth and the thaw index for the same depth.
func ExampleStefan() {
	x, _ := ground.Stefan(2.5, 9e7, 600) // k W/(m K), L J/m3, surface index K day
	fmt.Printf("frost depth %.2f m\n", x)
	i, _ := ground.StefanIndex(2.0, 9e7, x) // thaw through it with the unfrozen k
	fmt.Printf("thawing index to thaw it %.0f K day\n", i)
	// Output:
	// frost depth 1.70 m
	// thawing index to thaw it 750 K day
}

// Modified Berggren frost depth under turf for an invented winter: a
// 0.4 m sand layer over silt-clay.
func ExampleModifiedBerggren() {
	turf, _ := ground.NFactor("turf")
	fs, _ := ground.SurfaceIndex(1100, turf.Freezing)
	sand, _ := ground.Soil{Texture: ground.Sand, DryDensity: 1800, WaterContent: 0.08}.Layer("sand", 0.4)
	clay, _ := ground.Soil{Texture: ground.SiltClay, DryDensity: 1600, WaterContent: 0.22}.Layer("silt-clay", 1)
	r, err := ground.ModifiedBerggren(ground.BerggrenInput{
		SurfaceIndex: fs,
		SeasonDays:   130,
		MeanAnnual:   4.5,
		Layers:       []solver.Layer{sand, clay},
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("surface index %.0f K day\n", fs)
	fmt.Printf("alpha %.2f, mu %.3f, lambda %.3f\n", r.Alpha, r.Mu, r.Lambda)
	fmt.Printf("frost depth %.2f m (in layer %d)\n", r.Depth, r.Layer+1)
	// Output:
	// surface index 550 K day
	// alpha 1.06, mu 0.094, lambda 0.843
	// frost depth 1.07 m (in layer 2)
}

// The Berggren correction coefficient from its two parameters.
func ExampleBerggrenCoefficient() {
	lambda, _, _ := ground.BerggrenCoefficient(1, 0.2)
	fmt.Printf("%.3f\n", lambda)
	// Output: 0.776
}

// Freezing index and season from a periodic air temperature.
func ExamplePeriodicFrostClimate() {
	air := climate.Periodic{Mean: 5, Harmonics: []climate.Harmonic{
		{Period: climate.Year, Amplitude: 13, Peak: 205 * climate.Day},
	}}
	bare, _ := ground.NFactor("bare-soil")
	fc, _ := ground.PeriodicFrostClimate(air, climate.Year, climate.Day, bare.Freezing)
	fmt.Printf("air index %.0f K day, surface %.0f K day, season %.0f days, mean %.1f degC\n",
		fc.AirIndex, fc.SurfaceIndex, fc.SeasonDays, fc.MeanAnnual)
	F, _, days, _ := ground.SineIndices(5, 13, 365)
	fmt.Printf("closed form: %.0f K day, %.0f days\n", F, days)
	// Output:
	// air index 711 K day, surface 498 K day, season 136 days, mean 5.0 degC
	// closed form: 711 K day, 137 days
}

// Annual ground temperature at pipe depth.
func ExampleKusuda() {
	w, _ := ground.Kusuda(8, 11, 25*climate.Day, 0.5e-6)
	fmt.Printf("damping depth %.2f m\n", w.DampingDepth())
	lo, hi := w.Envelope(1.5)
	fmt.Printf("at 1.5 m: %.1f to %.1f degC, coldest %.0f days after the surface\n", lo, hi, w.LagAt(1.5)/climate.Day)
	z, _ := w.FrostFreeDepth(0)
	fmt.Printf("never below 0 degC under %.2f m (latent heat ignored)\n", z)
	// Output:
	// damping depth 2.24 m
	// at 1.5 m: 2.4 to 13.6 degC, coldest 39 days after the surface
	// never below 0 degC under 0.71 m (latent heat ignored)
}
