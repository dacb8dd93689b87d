package climate

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/stat"
	"gonum.org/v1/gonum/stat/distuv"
	"math/rand/v2"
	"strings"
)

func TestReducedVariateStatsTable(t *testing.T) {
	// Gumbel's reduced mean y_n and standard deviation s_n for sample size
	// n, as printed in the usual hydrology tables of Gumbel's method (for
	// example Subramanya, Engineering Hydrology, table of y_n and s_n)
	// [memory].
	tests := []struct {
		n      int
		yn, sn float64
	}{
		{10, 0.4952, 0.9496},
		{20, 0.5236, 1.0628},
		{30, 0.5362, 1.1124},
		{50, 0.5485, 1.1607},
		{100, 0.5600, 1.2065},
	}
	for _, tc := range tests {
		yn, sn := ReducedVariateStats(tc.n)
		if math.Abs(yn-tc.yn) > 6e-5 || math.Abs(sn-tc.sn) > 6e-5 {
			t.Errorf("n %d: y_n %.5f s_n %.5f, want %.4f %.4f", tc.n, yn, sn, tc.yn, tc.sn)
		}
	}
}

func TestGumbelReducedVariateFrequencyFactor(t *testing.T) {
	// Gumbel's method for a short record: x_T = mean + K_T s with the
	// frequency factor K_T = (y_T - y_n)/s_n, y_T = -ln(-ln(1 - 1/T)), s the
	// sample standard deviation (n - 1 divisor) and y_n, s_n the mean and
	// standard deviation of the reduced variates of the plotting positions
	// (Gumbel, Statistics of Extremes, 1958; Chow, Maidment and Mays,
	// Applied Hydrology, 1988, frequency factors [memory]). The reference
	// here is written out from that equation, with the sample statistics
	// from gonum's stat.MeanStdDev and y_n, s_n from the plotting positions
	// i/(n+1) [derived]. Ten invented annual maxima (degC day).
	x := []float64{412, 385, 170, 160, 530, 290, 320, 190, 215, 350}
	g, err := GumbelFit(x, ReducedVariate)
	if err != nil {
		t.Fatal(err)
	}
	mean, s := stat.MeanStdDev(x, nil)
	var yn, yy float64
	n := float64(len(x))
	for i := 1; i <= len(x); i++ {
		y := -math.Log(-math.Log(float64(i) / (n + 1)))
		yn += y / n
		yy += y * y / n
	}
	sn := math.Sqrt(yy - yn*yn)
	for _, T := range []float64{2, 10, 25, 50, 100} {
		yT := -math.Log(-math.Log(1 - 1/T))
		want := mean + (yT-yn)/sn*s
		if got := g.ReturnLevel(T); math.Abs(got-want) > 1e-9*want {
			t.Errorf("T %v: return level %.6f, frequency-factor form %.6f", T, got, want)
		}
	}
	// n = 10: y_n = 0.4952, s_n = 0.9496 in the printed tables [memory].
	if math.Abs(yn-0.4952) > 6e-5 || math.Abs(sn-0.9496) > 6e-5 {
		t.Errorf("n 10: y_n %.5f s_n %.5f", yn, sn)
	}
	// The method of moments gives a lower 100-year value for the same
	// data (the n-dependent factors widen the short-record estimate).
	m, _ := GumbelFit(x, Moments)
	if !(m.ReturnLevel(100) < g.ReturnLevel(100)) {
		t.Errorf("moments %v not below reduced-variate %v", m.ReturnLevel(100), g.ReturnLevel(100))
	}
}

func TestGumbelMomentsAgainstGonum(t *testing.T) {
	// Reference library: gonum's distuv.GumbelRight. The method-of-moments
	// fit must reproduce the sample mean and standard deviation as the
	// distribution's Mean and StdDev; return levels are its quantiles.
	x := []float64{1410, 1655, 980, 1222, 1876, 1530, 1102, 1390, 2210, 1315, 1460, 1188} // synthetic
	g, err := GumbelFit(x, Moments)
	if err != nil {
		t.Fatal(err)
	}
	d := distuv.GumbelRight{Mu: g.Location, Beta: g.Scale}
	if math.Abs(d.Mean()-g.SampleMean) > 1e-9 || math.Abs(d.StdDev()-g.SampleStdDev) > 1e-9 {
		t.Errorf("gonum mean %v sd %v, sample %v %v", d.Mean(), d.StdDev(), g.SampleMean, g.SampleStdDev)
	}
	for _, T := range []float64{2, 10, 30, 100, 500} {
		want := d.Quantile(1 - 1/T)
		if got := g.ReturnLevel(T); math.Abs(got-want) > 1e-9*math.Abs(want) {
			t.Errorf("T %v: return level %v, gonum quantile %v", T, got, want)
		}
		if got := g.ReturnPeriod(want); math.Abs(got-T) > 1e-9*T {
			t.Errorf("return period of the %v-year level = %v", T, got)
		}
		if got := g.CDF(want); math.Abs(got-d.CDF(want)) > 1e-12 {
			t.Errorf("CDF %v, gonum %v", got, d.CDF(want))
		}
	}
	if !math.IsNaN(g.ReturnLevel(1)) {
		t.Error("return level for T = 1 should be NaN")
	}
}

func TestGumbelMaxLikelihood(t *testing.T) {
	// Reference library: samples from gonum's GumbelRight (seeded), and its
	// LogProb as the likelihood. The fit must (a) maximise the
	// log-likelihood against nearby parameter pairs and (b) recover the
	// parameters within 4 standard errors (asymptotic standard errors of
	// the Gumbel ML estimates: 0.78 beta/sqrt(n) for the scale, 1.05
	// beta/sqrt(n) for the location, from the Fisher information [derived]).
	src := rand.NewPCG(7, 7)
	ref := distuv.GumbelRight{Mu: 1200, Beta: 350, Src: src}
	x := make([]float64, 2000)
	for i := range x {
		x[i] = ref.Rand()
	}
	g, err := GumbelFit(x, MaxLikelihood)
	if err != nil {
		t.Fatal(err)
	}
	n := math.Sqrt(float64(len(x)))
	if math.Abs(g.Scale-350) > 4*0.78*350/n || math.Abs(g.Location-1200) > 4*1.05*350/n {
		t.Errorf("fit mu %v beta %v, drawn from 1200, 350", g.Location, g.Scale)
	}
	ll := func(mu, beta float64) float64 {
		d := distuv.GumbelRight{Mu: mu, Beta: beta}
		var s float64
		for _, v := range x {
			s += d.LogProb(v)
		}
		return s
	}
	best := ll(g.Location, g.Scale)
	if math.Abs(best-g.LogLikelihood) > 1e-6*math.Abs(best) {
		t.Errorf("log-likelihood %v, gonum %v", g.LogLikelihood, best)
	}
	for _, dmu := range []float64{-1, 0, 1} {
		for _, db := range []float64{-1, 0, 1} {
			if dmu == 0 && db == 0 {
				continue
			}
			if l := ll(g.Location+0.5*dmu, g.Scale+0.5*db); l > best {
				t.Errorf("log-likelihood higher at mu%+v beta%+v: %v > %v", 0.5*dmu, 0.5*db, l, best)
			}
		}
	}
	// Small sample: still a maximum.
	small := []float64{1410, 1655, 980, 1222, 1876, 1530, 1102}
	gs, err := GumbelFit(small, MaxLikelihood)
	if err != nil {
		t.Fatal(err)
	}
	x = small
	b0 := ll(gs.Location, gs.Scale)
	for _, p := range [][2]float64{{1, 0}, {-1, 0}, {0, 1}, {0, -1}} {
		if l := ll(gs.Location+p[0], gs.Scale+p[1]); l > b0 {
			t.Errorf("small sample: higher likelihood off the fit at %v", p)
		}
	}
}

func TestGumbelFitErrors(t *testing.T) {
	for _, x := range [][]float64{nil, {1, 2}, {3, 3, 3}, {1, math.NaN(), 2}} {
		if _, err := GumbelFit(x, Moments); err == nil {
			t.Errorf("%v: no error", x)
		}
	}
	if _, err := GumbelFit([]float64{1, 2, 3}, FitMethod(9)); err == nil {
		t.Error("unknown method: no error")
	}
}

func TestFitMethodKeys(t *testing.T) {
	for _, m := range []FitMethod{Moments, MaxLikelihood, ReducedVariate} {
		b, err := m.MarshalText()
		if err != nil {
			t.Fatal(err)
		}
		var back FitMethod
		if err := back.UnmarshalText(b); err != nil || back != m {
			t.Errorf("%v: round trip via %q gave %v, %v", m, b, back, err)
		}
	}
	if _, err := ParseFitMethod("moment"); err == nil || !strings.Contains(err.Error(), `did you mean "moments"`) {
		t.Errorf("misspelt method: %v", err)
	}
	if _, err := FitMethod(7).MarshalText(); err == nil {
		t.Error("unknown method marshalled")
	}
}
