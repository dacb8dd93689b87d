// Package climate describes the temperature (and later flux and radiation)
// forcing at the surfaces of a column: harmonic series, measured series,
// sol-air temperature, degree-days and freezing indices.
//
// Time t is in seconds from 1 January 00:00 of the first simulated year; a
// year is 365 days (8760 h) throughout tempstack.
//
// Measured series (ReadCSV) keep their real timestamps: t is the true
// elapsed time from 1 January 00:00 of the first record's year, so a leap
// day is a real day on the axis and the 365-day Year of the harmonic model
// drifts against the calendar by one day per leap year (negligible for
// annual harmonics). Winters splits seasons at real calendar dates.
//
// Units: temperatures in degC (converted from degF or K when read), times
// in s, irradiance in W/m2, surface coefficients in W/(m2 K), degree-days
// and freezing or thawing indices in degC day (= K day; multiply by 24 for
// the K h of ISO 13793).
//
// The main entry points: ReadCSV, Series.Resample and Series.At for
// measured forcing; DegreeDays, DailyMeans, Winters and
// DesignFreezingIndex for frost indices; GumbelFit and Gumbel.ReturnLevel
// for return-period freezing indices; FitHarmonics to reduce a record to a
// Periodic; SolAir, SolAirFunc and SolAirPeriodic with Absorptance for sunlit
// surfaces; GenerateDemo for an invented demonstration record.
package climate

import (
	"math"
	"math/cmplx"
)

// Year and Day are the annual and daily periods in seconds.
const (
	Day  = 86400.0
	Year = 365 * Day
)

// Harmonic is one cosine component of a periodic signal:
// A cos(2 pi (t - Peak) / Period).
type Harmonic struct {
	Period    float64 // s, > 0
	Amplitude float64 // half the peak-to-peak swing, K (or the signal's unit)
	Peak      float64 // s, a time at which the component is at its maximum
}

// At returns the value of the component at time t (s).
func (h Harmonic) At(t float64) float64 {
	return h.Amplitude * math.Cos(2*math.Pi*(t-h.Peak)/h.Period)
}

// Phasor returns the complex amplitude of h in the exp(+i omega t)
// convention used by package solver: h(t) = Re(Phasor * exp(i omega t)),
// omega = 2 pi / Period. That is Amplitude * exp(-i omega Peak).
func (h Harmonic) Phasor() complex128 {
	w := 2 * math.Pi / h.Period
	return cmplx.Rect(h.Amplitude, -w*h.Peak)
}

// HarmonicFromPhasor is the inverse of Harmonic.Phasor: the component of
// period p (s) whose complex amplitude is z. Peak is returned in [0, p).
func HarmonicFromPhasor(p float64, z complex128) Harmonic {
	w := 2 * math.Pi / p
	peak := math.Mod(-cmplx.Phase(z)/w, p)
	if peak < 0 {
		peak += p
	}
	return Harmonic{Period: p, Amplitude: cmplx.Abs(z), Peak: peak}
}

// Periodic is a mean plus a sum of harmonics: the compact description of a
// surface climate (for example a mean, a daily and an annual swing).
type Periodic struct {
	Mean      float64
	Harmonics []Harmonic
}

// At returns the value of the signal at time t (s).
func (p Periodic) At(t float64) float64 {
	v := p.Mean
	for _, h := range p.Harmonics {
		v += h.At(t)
	}
	return v
}
