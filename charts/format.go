package charts

import (
	"math"
	"strconv"
	"strings"
)

// nan marks a missing value.
var nan = math.NaN()

// finite reports whether v is neither NaN nor ±Inf.
func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// num returns v rounded to 6 significant digits for a chart option, or nil
// (JSON null, a gap in a chart) when v is NaN or ±Inf. Six digits keep the
// report small and are far finer than any chart can show.
func num(v float64) any {
	if !finite(v) {
		return nil
	}
	r, err := strconv.ParseFloat(strconv.FormatFloat(v, 'g', 6, 64), 64)
	if err != nil {
		return nil
	}
	return r
}

// dash is printed in tables where a value is missing or not finite.
const dash = "–"

// fixed formats v with d decimals, using a true minus sign; NaN and ±Inf
// give a dash. Negative zero prints as 0.
func fixed(v float64, d int) string {
	if !finite(v) {
		return dash
	}
	s := strconv.FormatFloat(v, 'f', d, 64)
	if strings.Trim(s, "-0.") == "" {
		s = strings.TrimPrefix(s, "-")
	}
	return strings.Replace(s, "-", "−", 1)
}

// sig formats v with n significant digits in plain (not exponent) notation
// where that stays short; tiny or huge values use "×10^" notation.
func sig(v float64, n int) string {
	if !finite(v) {
		return dash
	}
	if v == 0 {
		return "0"
	}
	a := math.Abs(v)
	if a < 1e-3 || a >= 1e7 {
		s := strconv.FormatFloat(v, 'e', n-1, 64)
		mant, exp, _ := strings.Cut(s, "e")
		e, _ := strconv.Atoi(exp)
		return strings.Replace(mant, "-", "−", 1) + "×10" + superscript(e)
	}
	d := n - 1 - int(math.Floor(math.Log10(a)))
	if d < 0 {
		d = 0
	}
	return fixed(v, d)
}

// superscript writes an integer exponent with Unicode superscript digits.
func superscript(e int) string {
	const digits = "⁰¹²³⁴⁵⁶⁷⁸⁹"
	var b strings.Builder
	if e < 0 {
		b.WriteString("⁻")
		e = -e
	}
	for _, c := range strconv.Itoa(e) {
		b.WriteString(string([]rune(digits)[c-'0']))
	}
	return b.String()
}

// degC formats a temperature in degrees Celsius, one decimal, the one
// format used for temperatures throughout the report.
func degC(v float64) string {
	if !finite(v) {
		return dash
	}
	return fixed(v, 1) + " °C"
}

// percent formats a ratio (0.21) as a whole percentage ("21 %"), with one
// decimal below 10 %.
func percent(ratio float64) string {
	if !finite(ratio) {
		return dash
	}
	p := 100 * ratio
	if math.Abs(p) < 10 {
		return fixed(p, 1) + " %"
	}
	return fixed(p, 0) + " %"
}

// hours formats a duration given in hours; long ones also in days.
func hours(h float64) string {
	if !finite(h) {
		return dash
	}
	if math.Abs(h) >= 72 {
		return fixed(h, 0) + " h (" + fixed(h/24, 1) + " d)"
	}
	return fixed(h, 1) + " h"
}

// periodLabel names a period in hours in the unit a reader would use.
func periodLabel(h float64) string {
	switch {
	case !finite(h):
		return dash
	case math.Abs(h-8760) < 1 || math.Abs(h-8766) < 1:
		return "1 year"
	case h > 24 && math.Mod(h, 24) == 0:
		return fixed(h/24, 0) + " d"
	default:
		return trimZeros(sig(h, 3)) + " h"
	}
}

// trimZeros drops trailing zeros after a decimal point ("24.0" -> "24").
func trimZeros(s string) string {
	if !strings.Contains(s, ".") || strings.Contains(s, "×") {
		return s
	}
	return strings.TrimSuffix(strings.TrimRight(s, "0"), ".")
}
