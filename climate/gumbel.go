package climate

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"gonum.org/v1/gonum/stat"
	"gonum.org/v1/gonum/stat/distuv"
)

// FitMethod selects how GumbelFit estimates the parameters.
type FitMethod int

const (
	// Moments matches the sample mean and standard deviation (n-1 divisor):
	// Scale = sqrt(6) s / pi, Location = mean - gamma Scale, gamma the
	// Euler-Mascheroni constant (standard method of moments for the Gumbel
	// distribution of maxima).
	Moments FitMethod = iota
	// MaxLikelihood maximises the log-likelihood: Scale solves
	// Scale = mean(x) - sum x_i exp(-x_i/Scale) / sum exp(-x_i/Scale)
	// and Location = -Scale ln(mean(exp(-x_i/Scale))) (the standard
	// likelihood equations of the Gumbel distribution of maxima).
	MaxLikelihood
	// ReducedVariate is Gumbel's method for a sample of size n, common in
	// hydrology: x_T = mean + K_T s with K_T = (y_T - y_n)/s_n, y_T =
	// -ln(-ln(1 - 1/T)), where y_n and s_n are the mean and the standard
	// deviation (n divisor) of the reduced variates -ln(-ln(i/(n+1))),
	// i = 1..n, of the Weibull plotting positions. That is Scale = s/s_n,
	// Location = mean - y_n s/s_n. It gives wider (safer) return levels than
	// Moments for short records; y_n and s_n reproduce Gumbel's published
	// table (for example 0.4952 and 0.9496 for n = 10 [memory]).
	ReducedVariate
)

// fitMethodKeys are the plain keys of the fit methods, for scenario files
// and JSON.
var fitMethodKeys = []string{Moments: "moments", MaxLikelihood: "max-likelihood", ReducedVariate: "reduced-variate"}

// ParseFitMethod returns the method named by key: "moments",
// "max-likelihood" or "reduced-variate".
func ParseFitMethod(key string) (FitMethod, error) {
	k := strings.ToLower(strings.TrimSpace(key))
	for m, name := range fitMethodKeys {
		if k == name {
			return FitMethod(m), nil
		}
	}
	msg := fmt.Sprintf("climate: unknown fit method %q", key)
	if s := closest(k, fitMethodKeys); s != "" {
		msg += fmt.Sprintf("; did you mean %q?", s)
	}
	return 0, fmt.Errorf("%s (use %s)", msg, strings.Join(fitMethodKeys, ", "))
}

// MarshalText writes the method's key (see ParseFitMethod).
func (m FitMethod) MarshalText() ([]byte, error) {
	if m < 0 || int(m) >= len(fitMethodKeys) {
		return nil, fmt.Errorf("climate: unknown fit method %d", int(m))
	}
	return []byte(fitMethodKeys[m]), nil
}

// UnmarshalText reads a method key (see ParseFitMethod).
func (m *FitMethod) UnmarshalText(b []byte) error {
	v, err := ParseFitMethod(string(b))
	if err != nil {
		return err
	}
	*m = v
	return nil
}

// String returns the method's name in words, for reports.
func (m FitMethod) String() string {
	switch m {
	case Moments:
		return "method of moments"
	case MaxLikelihood:
		return "maximum likelihood"
	case ReducedVariate:
		return "Gumbel reduced variate (sample size n)"
	}
	return fmt.Sprintf("FitMethod(%d)", int(m))
}

// Gumbel is a Gumbel (extreme value type I, largest values) distribution
// fitted to annual maxima such as winter freezing indices:
// F(x) = exp(-exp(-(x - Location)/Scale)). Location and Scale are in the
// unit of the data (degC day for freezing indices).
type Gumbel struct {
	Location float64 // mode of the distribution
	Scale    float64 // > 0
	Method   FitMethod
	// Sample statistics the fit was made from, kept for the report.
	N             int
	SampleMean    float64
	SampleStdDev  float64 // n-1 divisor
	LogLikelihood float64 // of the sample under the fitted distribution
}

// eulerGamma is the Euler-Mascheroni constant.
const eulerGamma = 0.57721566490153286060651209008240243

// GumbelFit fits a Gumbel distribution of maxima to x (at least 3 values,
// not all equal), for example the freezing indices of the complete winters
// of a record (FreezingIndices). Frost-protected shallow foundations use
// the 100-year return-period air freezing index (ASCE 32-01, Design and
// Construction of Frost-Protected Shallow Foundations [2nd-hand]):
// g.ReturnLevel(100). A 100-year value
// from a ten-year record is an extrapolation with a wide uncertainty;
// report the method, the number of winters and the fitted parameters with
// it, and prefer the values of local codes, which a licensed engineer
// should confirm.
func GumbelFit(x []float64, method FitMethod) (Gumbel, error) {
	if len(x) < 3 {
		return Gumbel{}, fmt.Errorf("climate: a Gumbel fit needs at least 3 values, have %d", len(x))
	}
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return Gumbel{}, fmt.Errorf("climate: value %d is not a finite number", i+1)
		}
	}
	mean, sd := stat.MeanStdDev(x, nil)
	if !(sd > 0) {
		return Gumbel{}, errors.New("climate: a Gumbel fit needs values that are not all equal")
	}
	g := Gumbel{Method: method, N: len(x), SampleMean: mean, SampleStdDev: sd}
	switch method {
	case Moments:
		g.Scale = math.Sqrt(6) * sd / math.Pi
		g.Location = mean - eulerGamma*g.Scale
	case MaxLikelihood:
		g.Scale, g.Location = gumbelML(x, mean)
	case ReducedVariate:
		yn, sn := ReducedVariateStats(len(x))
		g.Scale = sd / sn
		g.Location = mean - yn*g.Scale
	default:
		return Gumbel{}, fmt.Errorf("climate: unknown fit method %v", method)
	}
	d := g.Distribution()
	for _, v := range x {
		g.LogLikelihood += d.LogProb(v)
	}
	return g, nil
}

// gumbelML solves the likelihood equation for the scale b:
// h(b) = mean - b - sum x w / sum w = 0, w = exp(-(x - xmin)/b).
// h decreases monotonically (dh/db = -1 - Var_w(x)/b^2), h(0+) = mean -
// min > 0 and h(mean - min) < 0, so bisection on (0, mean - min] converges.
func gumbelML(x []float64, mean float64) (scale, loc float64) {
	xmin := x[0]
	for _, v := range x {
		xmin = math.Min(xmin, v)
	}
	h := func(b float64) float64 {
		var sw, sxw float64
		for _, v := range x {
			w := math.Exp(-(v - xmin) / b)
			sw += w
			sxw += v * w
		}
		return mean - b - sxw/sw
	}
	lo, hi := 0.0, mean-xmin
	for i := 0; i < 200 && hi-lo > 1e-15*hi; i++ {
		mid := 0.5 * (lo + hi)
		if h(mid) > 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	b := 0.5 * (lo + hi)
	var sw float64
	for _, v := range x {
		sw += math.Exp(-(v - xmin) / b)
	}
	// loc = -b ln(mean exp(-x/b)) = xmin - b ln(sw/n).
	return b, xmin - b*math.Log(sw/float64(len(x)))
}

// Distribution returns the fitted distribution as gonum's GumbelRight
// (Mu = Location, Beta = Scale), for densities, quantiles and samples.
func (g Gumbel) Distribution() distuv.GumbelRight {
	return distuv.GumbelRight{Mu: g.Location, Beta: g.Scale}
}

// CDF returns the probability that one year's value is at most x.
func (g Gumbel) CDF(x float64) float64 {
	return math.Exp(-math.Exp(-(x - g.Location) / g.Scale))
}

// ReturnLevel returns the value exceeded on average once in the given
// number of years (> 1): the quantile of non-exceedance probability
// 1 - 1/years, x_T = Location - Scale ln(-ln(1 - 1/T)).
func (g Gumbel) ReturnLevel(years float64) float64 {
	if !(years > 1) {
		return math.NaN()
	}
	return g.Location - g.Scale*math.Log(-math.Log1p(-1/years))
}

// ReturnPeriod returns the mean number of years between values above x:
// 1 / (1 - F(x)).
func (g Gumbel) ReturnPeriod(x float64) float64 {
	return 1 / -math.Expm1(-math.Exp(-(x-g.Location)/g.Scale))
}

// ReducedVariateStats returns y_n and s_n for Gumbel's method with a sample
// of size n >= 1: the mean and the standard deviation (n divisor) of
// y_i = -ln(-ln(i/(n+1))), i = 1..n.
func ReducedVariateStats(n int) (yn, sn float64) {
	y := make([]float64, n)
	for i := range y {
		y[i] = -math.Log(-math.Log(float64(i+1) / float64(n+1)))
	}
	yn = stat.Mean(y, nil)
	sn = math.Sqrt(stat.MomentAbout(2, y, yn, nil))
	return yn, sn
}
