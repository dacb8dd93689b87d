package results

import (
	"math"
	"strconv"
)

// TargetStep returns the grid a target value is given on, in the unit of
// the parameter: the largest 1, 2 or 5 times a power of ten not above the
// tolerance tol (> 0), so the value is printed with the digits its
// tolerance justifies.
func TargetStep(tol float64) float64 {
	p := math.Pow(10, math.Floor(math.Log10(tol)))
	for _, m := range []float64{5, 2, 1} {
		if m*p <= tol*(1+1e-12) {
			return m * p
		}
	}
	return p
}

// OnGrid returns k*step written with the decimals of step, so that 199.2
// is 199.2 and not 199.20000000000002.
func OnGrid(k, step float64) float64 {
	dec := max(0, int(-math.Floor(math.Log10(step)+1e-9)))
	v, _ := strconv.ParseFloat(strconv.FormatFloat(k*step, 'f', dec, 64), 64)
	return v
}

// RoundToTolerance returns v rounded to the nearest point of the grid
// TargetStep(tol), in the same unit: how a target's closest value (a scan
// point, when the goal is not met) is printed, with the digits a found
// value has. v is returned unchanged when tol is not positive and finite
// or v is not finite.
func RoundToTolerance(v, tol float64) float64 {
	if !(tol > 0) || math.IsInf(tol, 0) || math.IsNaN(v) || math.IsInf(v, 0) {
		return v
	}
	step := TargetStep(tol)
	return OnGrid(math.Round(v/step), step)
}

// Format writes v with the quantity's digits: Decimals decimals in fixed
// notation, or three significant digits (Sig3) when Decimals is -1.
func (q QuantityInfo) Format(v float64) string {
	if q.Decimals >= 0 {
		return strconv.FormatFloat(v, 'f', q.Decimals, 64)
	}
	return Sig3(v)
}

// Sig3 writes v with three significant digits in fixed notation (0.260,
// 75.9, 1230); zero and non-finite values as strconv writes them.
func Sig3(v float64) string {
	if v == 0 || math.IsNaN(v) || math.IsInf(v, 0) {
		return strconv.FormatFloat(v, 'f', -1, 64)
	}
	d := 2 - int(math.Floor(math.Log10(math.Abs(v))))
	if d < 0 {
		return strconv.FormatFloat(math.Round(v/math.Pow(10, float64(-d)))*math.Pow(10, float64(-d)), 'f', 0, 64)
	}
	return strconv.FormatFloat(v, 'f', d, 64)
}
