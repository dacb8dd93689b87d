package ground

import (
	"fmt"
	"math"

	"tempstack/climate"
)

// Wave is the periodic temperature of a homogeneous half-space whose
// surface follows one cosine (Kusuda and Achenbach 1965, form from memory;
// it is the exact periodic solution of the heat equation, checked in the
// tests):
//
//	T(z, t) = Mean - Amplitude exp(-z/d) cos(2 pi (t - Coldest) / Period - z/d)
//	d = sqrt(a Period / pi)        (damping depth)
//
// z is the depth below the surface (m, positive downward), t the time (s),
// Coldest the time of the coldest surface temperature (s), a the thermal
// diffusivity (m2/s). The amplitude falls as exp(-z/d) and the extremes lag
// by z/d Period/(2 pi). Latent heat and a geothermal gradient are ignored.
type Wave struct {
	Mean        float64 // mean surface (and ground) temperature, degC
	Amplitude   float64 // half the surface temperature range, K (>= 0)
	Coldest     float64 // time of the coldest surface temperature, s
	Period      float64 // s, > 0 (climate.Year for the annual wave)
	Diffusivity float64 // m2/s, > 0
}

// Kusuda returns the annual ground wave (Period = climate.Year) of a soil
// with diffusivity a (m2/s) under a surface with the given mean (degC),
// amplitude (K) and time of the coldest temperature (s from 1 January).
func Kusuda(mean, amplitude, coldest, diffusivity float64) (Wave, error) {
	w := Wave{Mean: mean, Amplitude: amplitude, Coldest: coldest, Period: climate.Year, Diffusivity: diffusivity}
	return w, w.Validate()
}

// WaveFromHarmonic returns the ground wave under a surface mean
// (degC) and one harmonic h of the surface temperature (its Peak is the
// warmest time; the coldest is half a period later).
func WaveFromHarmonic(mean float64, h climate.Harmonic, diffusivity float64) (Wave, error) {
	w := Wave{
		Mean:        mean,
		Amplitude:   h.Amplitude,
		Coldest:     math.Mod(h.Peak+h.Period/2, h.Period),
		Period:      h.Period,
		Diffusivity: diffusivity,
	}
	return w, w.Validate()
}

// Validate reports the first impossible value of w.
func (w Wave) Validate() error {
	switch {
	case !finite(w.Mean) || !finite(w.Coldest):
		return fmt.Errorf("ground wave: mean and time of the coldest temperature must be finite")
	case !finite(w.Amplitude) || w.Amplitude < 0:
		return fmt.Errorf("ground wave: amplitude must be >= 0, got %g K", w.Amplitude)
	case !finite(w.Period) || w.Period <= 0:
		return fmt.Errorf("ground wave: period must be positive, got %g s", w.Period)
	case !finite(w.Diffusivity) || w.Diffusivity <= 0:
		return fmt.Errorf("ground wave: diffusivity must be positive, got %g m2/s", w.Diffusivity)
	}
	return nil
}

// DampingDepth is d = sqrt(a P / pi), m: the depth at which the amplitude
// has fallen to 1/e of the surface amplitude.
func (w Wave) DampingDepth() float64 {
	return math.Sqrt(w.Diffusivity * w.Period / math.Pi)
}

// Temperature returns T(z, t), degC, at depth z (m, >= 0) and time t (s).
func (w Wave) Temperature(z, t float64) float64 {
	d := w.DampingDepth()
	return w.Mean - w.Amplitude*math.Exp(-z/d)*math.Cos(2*math.Pi*(t-w.Coldest)/w.Period-z/d)
}

// AmplitudeAt returns the temperature amplitude at depth z, K:
// Amplitude exp(-z/d).
func (w Wave) AmplitudeAt(z float64) float64 {
	return w.Amplitude * math.Exp(-z/w.DampingDepth())
}

// LagAt returns how long the extremes at depth z trail those at the
// surface, s: (z/d) Period / (2 pi). It can exceed one period.
func (w Wave) LagAt(z float64) float64 {
	return z / w.DampingDepth() * w.Period / (2 * math.Pi)
}

// Envelope returns the lowest and highest temperature reached at depth z
// over a period, degC: Mean -+ Amplitude exp(-z/d).
func (w Wave) Envelope(z float64) (min, max float64) {
	a := w.AmplitudeAt(z)
	return w.Mean - a, w.Mean + a
}

// DepthForAmplitude returns the depth (m) below which the temperature
// amplitude stays under threshold (K, > 0): z = d ln(Amplitude / threshold);
// 0 when the surface amplitude is already at or under it.
func (w Wave) DepthForAmplitude(threshold float64) (float64, error) {
	if err := w.Validate(); err != nil {
		return 0, err
	}
	if !finite(threshold) || threshold <= 0 {
		return 0, fmt.Errorf("ground wave: threshold amplitude must be positive, got %g K", threshold)
	}
	if w.Amplitude <= threshold {
		return 0, nil
	}
	return w.DampingDepth() * math.Log(w.Amplitude/threshold), nil
}

// FrostFreeDepth returns the depth (m) below which this wave never takes
// the ground below temp (degC): where Mean - Amplitude exp(-z/d) = temp.
// It is 0 when the surface never goes below temp, and an error when the
// mean itself is at or below temp (the whole half-space then reaches it).
// Latent heat, which slows frost, is ignored: for frost this is an
// overestimate (common practice to treat it as a bound only).
func (w Wave) FrostFreeDepth(temp float64) (float64, error) {
	if w.Mean <= temp {
		return 0, fmt.Errorf("ground wave: mean %g degC is not above %g degC; every depth reaches it", w.Mean, temp)
	}
	return w.DepthForAmplitude(w.Mean - temp)
}
