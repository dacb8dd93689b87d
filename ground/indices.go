package ground

import (
	"errors"
	"fmt"
	"math"

	"tempstack/climate"
	"tempstack/solver"
)

// The functions here read a sampled temperature series: series[i] is the
// temperature (degC) that holds for the interval of length step seconds
// starting at sample i (a daily mean with step 86400, an hourly value with
// step 3600). Degree-day sums are rectangle sums, as climate.DegreeDays;
// for measured multi-year records use climate.Winters and
// FrostClimateFromWinter. What is here serves periodic climates: the
// freezing season of one period that may straddle the end of the record,
// the closed form for a cosine, and the inputs of the Berggren method.

func checkSeries(series []float64, step float64) error {
	if len(series) == 0 {
		return errors.New("temperature series is empty")
	}
	if !finite(step) || step <= 0 {
		return fmt.Errorf("time step must be positive, got %g s", step)
	}
	for i, v := range series {
		if !finite(v) {
			return fmt.Errorf("temperature sample %d is not a finite number", i)
		}
	}
	return nil
}

// DaysBelow returns the time the series spends below base, days.
func DaysBelow(series []float64, step, base float64) (float64, error) {
	if err := checkSeries(series, step); err != nil {
		return 0, err
	}
	n := 0
	for _, v := range series {
		if v < base {
			n++
		}
	}
	return float64(n) * step / secondsPerDay, nil
}

// Season is a freezing or thawing season read from the cumulative
// degree-day curve.
type Season struct {
	Index float64 // K day, >= 0: the drop (freezing) or rise (thawing) of the curve
	Start int     // sample at which the season starts (the curve's turning point)
	End   int     // sample after the season's last one; End - Start samples
	Days  float64 // season length, (End - Start) step / 86400
}

// CyclicFreezingSeason reads the freezing season of a series that is one
// period of a periodic signal (for example one year sampled from a
// climate.Periodic) from the cumulative curve of (T - base) degree-days:
// the index is the largest fall of the curve from a maximum to a later
// minimum, so thaws inside the winter are netted out (the cumulative-curve
// definition of the US Army frost manuals, from memory; the same
// definition as climate.Winters). The series wraps around, so the season
// may straddle its end: Start is in [0, len) and End may exceed len (End -
// len is then a sample of the next period). The season is at most one
// period long; a series never below base gives a zero Season.
func CyclicFreezingSeason(series []float64, step, base float64) (Season, error) {
	return season(series, step, base, -1)
}

// CyclicThawingSeason is CyclicFreezingSeason for the thawing season: the
// largest rise of the curve.
func CyclicThawingSeason(series []float64, step, base float64) (Season, error) {
	return season(series, step, base, +1)
}

// season finds the largest move of the cumulative curve in direction sign
// (-1 fall, +1 rise) over a periodic series: the series is taken twice and
// the span limited to one period, with a sliding-window minimum (monotone
// deque) so the cost stays linear.
func season(series []float64, step, base float64, sign float64) (Season, error) {
	if err := checkSeries(series, step); err != nil {
		return Season{}, err
	}
	n := len(series)
	m := 2 * n
	// c[k] is the curve after k samples, oriented so that we look for the
	// largest rise c[j] - c[i], i < j <= i + n.
	c := make([]float64, m+1)
	for k := 0; k < m; k++ {
		c[k+1] = c[k] + sign*(series[k%n]-base)
	}
	var best Season
	dq := make([]int, 0, m+1) // indices with increasing c: window minima
	for j := 0; j <= m; j++ {
		for len(dq) > 0 && dq[0] < j-n {
			dq = dq[1:]
		}
		// A season starting at i >= n repeats one starting at i - n,
		// already seen: keep Start in [0, n).
		if len(dq) > 0 && dq[0] < n {
			if i := dq[0]; c[j]-c[i] > best.Index {
				best = Season{Index: c[j] - c[i], Start: i, End: j}
			}
		}
		for len(dq) > 0 && c[dq[len(dq)-1]] >= c[j] {
			dq = dq[:len(dq)-1]
		}
		dq = append(dq, j)
	}
	best.Index *= step / secondsPerDay
	best.Days = float64(best.End-best.Start) * step / secondsPerDay
	return best, nil
}

// Sample returns the values of a periodic signal at t = from, from + step,
// ... while t < to (seconds), ready for the series functions above.
func Sample(p climate.Periodic, from, to, step float64) ([]float64, error) {
	if !finite(from) || !finite(to) || !finite(step) || step <= 0 || to <= from {
		return nil, fmt.Errorf("sample: need from < to and step > 0, got %g, %g, %g s", from, to, step)
	}
	n := int(math.Ceil((to - from) / step))
	out := make([]float64, n)
	for i := range out {
		out[i] = p.At(from + float64(i)*step)
	}
	return out, nil
}

// SineIndices returns the freezing and thawing indices (K day) and the
// freezing-season length (days) of one period of T(t) = mean +
// amplitude cos(2 pi t / P), P = periodDays, relative to 0 degC [derived by
// integrating the cosine over the part of the period below 0 degC]:
//
//	theta0 = arccos(-mean / amplitude)   (clamped to [0, pi])
//	F = (P / pi) (amplitude sin(theta0) - mean (pi - theta0))
//	I = F + mean P                       (thawing index)
//	season = P (pi - theta0) / pi
func SineIndices(mean, amplitude, periodDays float64) (freezing, thawing, seasonDays float64, err error) {
	if !finite(mean) || !finite(amplitude) || amplitude < 0 || !finite(periodDays) || periodDays <= 0 {
		return 0, 0, 0, fmt.Errorf("sine indices: need a finite mean, amplitude >= 0 and period > 0, got %g, %g, %g", mean, amplitude, periodDays)
	}
	var theta0 float64
	switch {
	case mean >= amplitude:
		return 0, mean * periodDays, 0, nil // never below freezing
	case mean <= -amplitude:
		theta0 = 0 // always below freezing
	default:
		theta0 = math.Acos(-mean / amplitude)
	}
	freezing = periodDays / math.Pi * (amplitude*math.Sin(theta0) - mean*(math.Pi-theta0))
	freezing = math.Max(0, freezing)
	thawing = freezing + mean*periodDays
	return freezing, thawing, periodDays * (math.Pi - theta0) / math.Pi, nil
}

// FrostClimate is what the frost-depth closed forms need from a climate.
type FrostClimate struct {
	AirIndex        float64 // air freezing index, K day (cumulative-curve fall)
	NFactorFreezing float64 // freezing n-factor applied
	SurfaceIndex    float64 // NFactorFreezing x AirIndex, K day
	SeasonDays      float64 // freezing season length, days (cumulative-curve span)
	MeanAnnual      float64 // mean temperature of the record, degC
}

// PeriodicFrostClimate reads a FrostClimate from a periodic air
// temperature p of the given period (s; climate.Year for an annual climate)
// sampled every step seconds (climate.Day for daily means), with the
// freezing n-factor n of the surface (see NFactor). The mean annual
// temperature is p.Mean.
func PeriodicFrostClimate(p climate.Periodic, period, step, n float64) (FrostClimate, error) {
	if !finite(n) || n <= 0 {
		return FrostClimate{}, fmt.Errorf("n-factor must be positive, got %g", n)
	}
	series, err := Sample(p, 0, period, step)
	if err != nil {
		return FrostClimate{}, err
	}
	s, err := CyclicFreezingSeason(series, step, 0)
	if err != nil {
		return FrostClimate{}, err
	}
	return FrostClimate{
		AirIndex:        s.Index,
		NFactorFreezing: n,
		SurfaceIndex:    n * s.Index,
		SeasonDays:      s.Days,
		MeanAnnual:      p.Mean,
	}, nil
}

// FrostClimateFromWinter turns one winter of a measured record (see
// climate.Winters) into a FrostClimate with the freezing n-factor n.
func FrostClimateFromWinter(w climate.Winter, n float64) (FrostClimate, error) {
	if !finite(n) || n <= 0 {
		return FrostClimate{}, fmt.Errorf("n-factor must be positive, got %g", n)
	}
	if !finite(w.FreezingIndex) || w.FreezingIndex < 0 {
		return FrostClimate{}, fmt.Errorf("winter %s: freezing index %g is not a degree-day total >= 0", w.Label, w.FreezingIndex)
	}
	return FrostClimate{
		AirIndex:        w.FreezingIndex,
		NFactorFreezing: n,
		SurfaceIndex:    n * w.FreezingIndex,
		SeasonDays:      w.Days,
		MeanAnnual:      w.MeanTemperature,
	}, nil
}

// Berggren returns the BerggrenInput for this climate over the given soil
// layers (surface first).
func (f FrostClimate) Berggren(layers []solver.Layer) BerggrenInput {
	return BerggrenInput{SurfaceIndex: f.SurfaceIndex, SeasonDays: f.SeasonDays, MeanAnnual: f.MeanAnnual, Layers: layers}
}
