package climate

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"testing"
)

func TestFitHarmonicsRecoversSynthetic(t *testing.T) {
	// Synthetic signal with known parameters; the least-squares fit of
	// an exact sum of sinusoids must return them to round-off (closed form:
	// the model is linear in mean, a_k, b_k).
	truth := Periodic{Mean: 4.2, Harmonics: []Harmonic{
		{Period: Year, Amplitude: 12.3, Peak: 201.5 * Day},
		{Period: Day, Amplitude: 4.7, Peak: 14.6 * 3600},
		{Period: Day / 2, Amplitude: 1.1, Peak: 3 * 3600},
	}}
	periods := []float64{Year, Day, Day / 2}
	rng := rand.New(rand.NewPCG(1, 2))
	tests := []struct {
		name string
		t    []float64
	}{
		{"hourly, 2 years", grid(0, 3600, 2*8760)},
		{"hourly from year 30", grid(30*Year+7777, 3600, 2*8760)},
		{"irregular, 400 days", jitter(rng, grid(0, 3*3600, 400*8), 3000)},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			v := make([]float64, len(tc.t))
			for i, x := range tc.t {
				v[i] = truth.At(x)
			}
			got, fit, err := FitHarmonics(tc.t, v, periods)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(got.Mean-truth.Mean) > 1e-6 {
				t.Errorf("mean %v, want %v", got.Mean, truth.Mean)
			}
			for k, h := range truth.Harmonics {
				g := got.Harmonics[k]
				if g.Period != h.Period || math.Abs(g.Amplitude-h.Amplitude) > 1e-6 ||
					cmplx.Abs(g.Phasor()-h.Phasor()) > 1e-6 || math.Abs(g.Peak-h.Peak) > 1e-6*h.Period {
					t.Errorf("harmonic %d: got %+v, want %+v", k, g, h)
				}
			}
			if fit.RMS > 1e-6 || fit.MaxAbs > 1e-6 || math.Abs(fit.R2-1) > 1e-9 || fit.N != len(v) {
				t.Errorf("fit %+v, want exact", fit)
			}
		})
	}
}

func TestFitHarmonicsNoise(t *testing.T) {
	// Synthetic: hourly annual + daily signal plus white noise of 2 K. The
	// residual RMS must match the noise level, and the amplitude errors
	// stay within the least-squares standard error sigma sqrt(2/N) (4x).
	rng := rand.New(rand.NewPCG(3, 4))
	tt := grid(0, 3600, 3*8760)
	v := make([]float64, len(tt))
	for i, x := range tt {
		v[i] = 2 + 10*math.Cos(2*math.Pi*(x-190*Day)/Year) + 5*math.Cos(2*math.Pi*(x-15*3600)/Day) + 2*rng.NormFloat64()
	}
	p, fit, err := FitHarmonics(tt, v, []float64{Year, Day})
	if err != nil {
		t.Fatal(err)
	}
	se := 2 * math.Sqrt(2/float64(len(tt)))
	if math.Abs(p.Harmonics[0].Amplitude-10) > 4*se || math.Abs(p.Harmonics[1].Amplitude-5) > 4*se {
		t.Errorf("amplitudes %v, %v; want 10, 5 within %v", p.Harmonics[0].Amplitude, p.Harmonics[1].Amplitude, 4*se)
	}
	if math.Abs(fit.RMS-2) > 0.05 {
		t.Errorf("residual RMS %v, want about 2", fit.RMS)
	}
}

func TestFitHarmonicsErrors(t *testing.T) {
	day := grid(0, 3600, 24)
	v := make([]float64, len(day))
	tests := []struct {
		name    string
		t, v    []float64
		periods []float64
	}{
		{"length mismatch", day, v[:3], []float64{Day}},
		{"too few samples", day[:2], v[:2], []float64{Day}},
		{"zero period", day, v, []float64{0}},
		{"repeated period", day, v, []float64{Day, Day}},
		{"annual from one day", day, v, []float64{Year}},
		{"NaN", day, append([]float64{math.NaN()}, v[1:]...), []float64{Day}},
	}
	for _, tc := range tests {
		if _, _, err := FitHarmonics(tc.t, tc.v, tc.periods); err == nil {
			t.Errorf("%s: no error", tc.name)
		}
	}
}

func grid(t0, step float64, n int) []float64 {
	t := make([]float64, n)
	for i := range t {
		t[i] = t0 + float64(i)*step
	}
	return t
}

func jitter(rng *rand.Rand, t []float64, amp float64) []float64 {
	for i := range t {
		t[i] += amp * (rng.Float64() - 0.5)
	}
	return t
}
