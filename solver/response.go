package solver

import "math"

// Response returns the ISO 13786 dynamic thermal characteristics of the
// wall column c for each period in periods (s), in the same order: the
// frequency response of the component. It stops at the first error
// (invalid column, a period that is not finite and positive, or
// ErrPeriodicHalfSpace for a ground column).
func Response(c Column, periods []float64) ([]PeriodicProperties, error) {
	out := make([]PeriodicProperties, 0, len(periods))
	for _, p := range periods {
		r, err := Periodic(c, p)
		if err != nil {
			return nil, err
		}
		out = append(out, r)
	}
	return out, nil
}

// LogPeriods returns n periods spaced evenly in logarithm from min to max
// (both included, s), for frequency-response charts. It returns nil when n
// < 1, min is not positive, max < min or a bound is not finite; n = 1
// gives [min].
func LogPeriods(min, max float64, n int) []float64 {
	if n < 1 || !(min > 0) || !(max >= min) || math.IsInf(max, 0) {
		return nil
	}
	out := make([]float64, n)
	if n == 1 {
		out[0] = min
		return out
	}
	lo, hi := math.Log(min), math.Log(max)
	for i := range out {
		out[i] = math.Exp(lo + (hi-lo)*float64(i)/float64(n-1))
	}
	out[0], out[n-1] = min, max
	return out
}
