package ground_test

import (
	"fmt"
	"math/rand/v2"

	"tempstack/climate"
	"tempstack/ground"
)

// Diffusivity of the soil at an invented site from three weeks of hourly
// readings at 5, 15 and 30 cm. The readings are SYNTHETIC: the exact
// periodic temperature of a soil of 0.45e-6 m2/s (Kusuda and Achenbach
// form) under an annual and a daily surface wave, plus 0.05 K of logger
// noise. The exact daily ratios are exp(dz/d) = 2.46 and 9.47 and the lags
// 3.4 h and 8.6 h (d = sqrt(a P / pi) = 0.111 m); the noise at 30 cm, where
// the daily swing is down to 0.27 K, moves the second pair most.
func ExampleFitDiffusivity() {
	const a = 0.45e-6 // m2/s, the value to recover
	annual, _ := ground.Kusuda(9, 11, 20*climate.Day, a)
	daily := ground.Wave{Amplitude: 4, Coldest: 3 * 3600, Period: climate.Day, Diffusivity: a}
	rng := rand.New(rand.NewPCG(2024, 1))
	rec := ground.SensorRecord{Depths: []float64{0.05, 0.15, 0.30}, Temps: make([][]float64, 3)}
	for k := range 21 * 24 {
		t := float64(k) * 3600
		rec.Times = append(rec.Times, t)
		for i, z := range rec.Depths {
			v := annual.Temperature(z, t) + daily.Temperature(z, t) + 0.05*rng.NormFloat64()
			rec.Temps[i] = append(rec.Temps[i], v)
		}
	}

	r, err := ground.FitDiffusivity(rec, ground.FitOptions{Periods: []float64{climate.Day}})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, p := range r.Harmonic[:2] {
		fmt.Printf("%.2f-%.2f m: amplitude ratio %.2f, lag %.1f h\n", p.DepthUpper, p.DepthLower, p.Ratio, p.Lag/3600)
	}
	fmt.Printf("harmonic methods: %.2f mm2/s\n", r.HarmonicCombined*1e6)
	inv := r.Inversion
	fmt.Printf("inversion: %.2f mm2/s (bottom: %v, fitted after %.1f days)\n", inv.Diffusivity*1e6, inv.Bottom, inv.Discard/climate.Day)
	fmt.Printf("residual %.2f K\n", inv.RMS)
	// Output:
	// 0.05-0.15 m: amplitude ratio 2.46, lag 3.5 h
	// 0.05-0.30 m: amplitude ratio 9.16, lag 8.8 h
	// harmonic methods: 0.44 mm2/s
	// inversion: 0.45 mm2/s (bottom: deepest-sensor, fitted after 1.0 days)
	// residual 0.05 K
}
