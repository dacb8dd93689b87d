package ground

import (
	"math"
	"strings"
	"testing"

	"tempstack/solver"
)

func TestStefanHandySpangler(t *testing.T) {
	// Handy and Spangler, Geotechnical Engineering, 5th ed. 2007, Example
	// 11.7 [read]: k_frozen 3.3 W/(m K), L about
	// 77,000 kJ/m3, 10 days at -5 degC (50 degC day): X = 0.6 m
	// (0.609 m [derived]).
	x, err := Stefan(3.3, 77e6, 50)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(x-0.609) > 0.0005 {
		t.Errorf("Stefan depth %.4f m, want 0.609", x)
	}
	// Same example from the soil description (dry unit weight 18.9 kN/m3,
	// w 12 %): the latent heat from the soil gives 0.608 m, still 0.6 m.
	s := Soil{Texture: Sand, DryDensity: 18900 / 9.81, WaterContent: 0.12}
	x2, err := Stefan(3.3, s.LatentHeat(), 50)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(x2-0.6) > 0.01 {
		t.Errorf("Stefan depth from soil %.4f m, want 0.6", x2)
	}
	// Thawing the 0.6 m back with the unfrozen k 2.6 W/(m K) needs 62 degC
	// day [read].
	I, err := StefanIndex(2.6, 77e6, 0.6)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(I-62) > 0.5 {
		t.Errorf("thaw index %.2f degC day, want 62", I)
	}
	t.Logf("Example 11.7: X = %.4f m (book 0.6), thaw index %.2f degC day (book 62)", x, I)
	// Round trip [derived].
	x3, _ := Stefan(2.6, 77e6, I)
	if math.Abs(x3-0.6) > 1e-12 {
		t.Errorf("round trip %g", x3)
	}
}

func TestStefanBadInputs(t *testing.T) {
	bad := [][3]float64{{3.3, 77e6, -1}, {0, 77e6, 50}, {3.3, 0, 50}, {3.3, 77e6, math.NaN()}, {-1, 77e6, 50}}
	for _, c := range bad {
		if _, err := Stefan(c[0], c[1], c[2]); err == nil {
			t.Errorf("Stefan%v: want an error", c)
		}
	}
	if _, err := StefanIndex(2.6, 77e6, -0.1); err == nil {
		t.Error("StefanIndex at negative depth: want an error")
	}
}

func TestBerggrenCoefficient(t *testing.T) {
	cases := []struct {
		alpha, mu, lambda, tol float64
		src                    string
	}{
		{0, 0.5, 0.930, 0.0005, "Neumann solution, equal properties [derived]"},
		{1, 0.2, 0.776, 0.0005, "Neumann solution, equal properties [derived]"},
		// alpha = 0 is the one-phase Stefan problem with St = mu:
		// xi exp(xi^2) erf(xi) = St/sqrt(pi); xi = 0.22002, 0.46479,
		// 0.62006, 0.80060 for St 0.1, 0.5, 1, 2 [derived: roots of that
		// equation]; lambda =
		// xi sqrt(2/St).
		{0, 0.1, 0.22002 * math.Sqrt(20), 2e-5, "one-phase Stefan St 0.1"},
		{0, 1, 0.62006 * math.Sqrt(2), 2e-5, "one-phase Stefan St 1"},
		{0, 2, 0.80060, 2e-5, "one-phase Stefan St 2"},
		// mu -> 0: lambda -> 1 (xi^2 -> mu/2) [derived]. Expanding erf and
		// erfc for small xi gives sqrt(pi) xi^2 + alpha mu xi = mu sqrt(pi)/2,
		// so lambda = 1 - alpha sqrt(mu / (2 pi)) + O(mu) [derived]: with
		// alpha > 0 the approach is as sqrt(mu).
		{0, 1e-8, 1, 1e-7, "limit mu -> 0"},
		{3, 1e-8, 1 - 3*math.Sqrt(1e-8/(2*math.Pi)), 1e-7, "limit mu -> 0, alpha 3"},
		{0.5, 1e-6, 1 - 0.5*math.Sqrt(1e-6/(2*math.Pi)), 2e-6, "limit mu -> 0, alpha 0.5"},
	}
	for _, c := range cases {
		l, xi, err := BerggrenCoefficient(c.alpha, c.mu)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(l-c.lambda) > c.tol {
			t.Errorf("alpha %g mu %g: lambda %.6f, want %.6f (%s)", c.alpha, c.mu, l, c.lambda, c.src)
		}
		// The root satisfies the transcendental equation.
		f := c.mu*math.Exp(-xi*xi)*(1/math.Erf(xi)-c.alpha/math.Erfc(xi)) - math.SqrtPi*xi
		if math.Abs(f) > 1e-9*(1+c.mu/xi) {
			t.Errorf("alpha %g mu %g: residual %g", c.alpha, c.mu, f)
		}
		t.Logf("alpha %g mu %g: lambda %.6f (%s, want %.6f)", c.alpha, c.mu, l, c.src, c.lambda)
	}
}

func TestBerggrenCoefficientProperties(t *testing.T) {
	// Properties [derived]: 0 < lambda <= 1; lambda falls as alpha or mu
	// grows (more sensible heat to remove per unit of latent heat).
	alphas := []float64{0, 0.25, 0.5, 1, 2, 4, 8, 15}
	mus := []float64{0.01, 0.05, 0.1, 0.2, 0.5, 1, 2, 5, 20, 100}
	for _, a := range alphas {
		prev := 1.0 + 1e-12
		for _, m := range mus {
			l, _, err := BerggrenCoefficient(a, m)
			if err != nil {
				t.Fatal(err)
			}
			if !(l > 0 && l < prev) {
				t.Errorf("alpha %g mu %g: lambda %g not in (0, %g)", a, m, l, prev)
			}
			prev = l
		}
	}
	for _, m := range mus {
		prev := 1.0 + 1e-12
		for _, a := range alphas {
			l, _, _ := BerggrenCoefficient(a, m)
			if !(l < prev) {
				t.Errorf("mu %g alpha %g: lambda %g not below %g", m, a, l, prev)
			}
			prev = l
		}
	}
	for _, c := range [][2]float64{{-1, 0.5}, {0, 0}, {0, -1}, {math.NaN(), 1}, {1, math.Inf(1)}} {
		if _, _, err := BerggrenCoefficient(c[0], c[1]); err == nil {
			t.Errorf("BerggrenCoefficient%v: want an error", c)
		}
	}
}

// neumannTwoPhase returns the constant m of the two-phase Neumann freezing
// front X = m sqrt(t) (m/s^0.5) for a half-space initially at Tf + v0 whose
// surface is held at Tf - vs from t = 0. It solves the Stefan condition in
// its classical form (Carslaw and Jaeger section 11.2; Lunardini 1981):
//
//	kf vs e^(-l^2) / (erf(l) sqrt(pi af)) -
//	ku v0 e^(-l^2 af/au) / (erfc(l sqrt(af/au)) sqrt(pi au)) = L l sqrt(af)
//
// with X = 2 l sqrt(af t), by bisection. It is a test oracle written in a
// different algebra from BerggrenCoefficient.
func neumannTwoPhase(kf, ku, cf, cu, latent, vs, v0 float64) float64 {
	af, au := kf/cf, ku/cu
	r := math.Sqrt(af / au)
	h := func(l float64) float64 {
		return kf*vs*math.Exp(-l*l)/(math.Erf(l)*math.Sqrt(math.Pi*af)) -
			ku*v0*math.Exp(-l*l*r*r)/(math.Erfc(l*r)*math.Sqrt(math.Pi*au)) -
			latent*l*math.Sqrt(af)
	}
	lo, hi := 1e-9, 5.0
	for i := 0; i < 200; i++ {
		mid := 0.5 * (lo + hi)
		if h(mid) > 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	return 2 * 0.5 * (lo + hi) * math.Sqrt(af)
}

func TestNeumannOracle(t *testing.T) {
	// The oracle against Lunardini (1981), Heat Transfer in Cold Climates,
	// with Jumikis (1966) soil data [2nd-hand]:
	// m = 3.6 cm/h^0.5 (3.5945 [derived]); X(60 days) = 1.364 m.
	m := neumannTwoPhase(2.324, 1.860, 1.966e6, 2.862e6, 1.1045e8, 10, 2)
	cmh := m * 100 * 60
	if math.Abs(cmh-3.5945) > 0.0005 {
		t.Errorf("m = %.4f cm/h^0.5, want 3.5945", cmh)
	}
	if x := m * math.Sqrt(60*86400); math.Abs(x-1.364) > 0.001 {
		t.Errorf("X(60 d) = %.4f m, want 1.364", x)
	}
}

func freezeLayer(name string, d, kf, ku, cf, cu, latent float64) solver.Layer {
	return solver.Layer{Name: name, Thickness: d, Conductivity: ku, HeatCapacity: cu,
		Freeze: &solver.Freezing{LatentHeat: latent, ConductivityFrozen: kf, HeatCapacityFrozen: cf}}
}

func TestModifiedBerggrenIsNeumann(t *testing.T) {
	// With equal frozen and unfrozen properties and a surface held vs below
	// freezing for the whole season over soil starting v0 above it, the
	// modified Berggren depth is the exact two-phase Neumann front
	// (Aldrich and Paynter 1953: lambda is derived from that solution
	// [derived]).
	cases := []struct{ k, c, L, vs, v0, days float64 }{
		{2.0, 2.0e6, 1.0e8, 8, 3, 100},
		{1.2, 2.6e6, 1.4e8, 5, 8, 120},
		{3.0, 1.8e6, 3.0e7, 15, 0, 150},
	}
	for _, c := range cases {
		in := BerggrenInput{
			SurfaceIndex: c.vs * c.days,
			SeasonDays:   c.days,
			MeanAnnual:   c.v0,
			Layers:       []solver.Layer{freezeLayer("soil", 1, c.k, c.k, c.c, c.c, c.L)},
		}
		r, err := ModifiedBerggren(in)
		if err != nil {
			t.Fatal(err)
		}
		want := neumannTwoPhase(c.k, c.k, c.c, c.c, c.L, c.vs, c.v0) * math.Sqrt(c.days*86400)
		if math.Abs(r.Depth-want) > 1e-9*want {
			t.Errorf("%+v: Berggren %.9f m, Neumann %.9f m", c, r.Depth, want)
		}
		// The Stefan depth with the same k bounds it from above.
		xs, _ := Stefan(c.k, c.L, in.SurfaceIndex)
		if !(r.Depth < xs) || math.Abs(r.Depth-r.Lambda*xs) > 1e-9*xs {
			t.Errorf("%+v: Berggren %g, lambda %g, Stefan %g", c, r.Depth, r.Lambda, xs)
		}
	}
}

func TestModifiedBerggrenHomogeneous(t *testing.T) {
	// One soil layer: X = lambda sqrt(2 k F 86400 / L) with k and C the means
	// of frozen and unfrozen values (modified Berggren formula, Aldrich
	// and Paynter 1953; TM 5-852-6 [memory]).
	l := freezeLayer("silt", 0.3, 1.8, 1.4, 1.9e6, 2.6e6, 1.0e8)
	in := BerggrenInput{SurfaceIndex: 900, SeasonDays: 110, MeanAnnual: 6, Layers: []solver.Layer{l}}
	r, err := ModifiedBerggren(in)
	if err != nil {
		t.Fatal(err)
	}
	vs := 900.0 / 110
	alpha, mu := 6/vs, 0.5*(1.9e6+2.6e6)*vs/1.0e8
	lam, _, _ := BerggrenCoefficient(alpha, mu)
	want := lam * math.Sqrt(2*1.6*900*86400/1.0e8)
	if math.Abs(r.Alpha-alpha) > 1e-12 || math.Abs(r.Mu-mu) > 1e-12 || math.Abs(r.Lambda-lam) > 1e-12 {
		t.Errorf("alpha/mu/lambda %g/%g/%g, want %g/%g/%g", r.Alpha, r.Mu, r.Lambda, alpha, mu, lam)
	}
	if math.Abs(r.Depth-want) > 1e-10*want {
		t.Errorf("depth %.10f, want %.10f", r.Depth, want)
	}
	if r.Layer != 0 || len(r.Needed) != 1 || math.Abs(r.Needed[0]-900) > 1e-6 {
		t.Errorf("layer %d needed %v", r.Layer, r.Needed)
	}
}

func TestModifiedBerggrenThinLayers(t *testing.T) {
	// A homogeneous soil split into many thin identical layers gives the
	// homogeneous answer: the layered sum telescopes to L X^2 / (2 k 86400
	// lambda^2) [derived].
	base := freezeLayer("clay", 2, 1.5, 1.2, 2.0e6, 2.8e6, 1.2e8)
	in := BerggrenInput{SurfaceIndex: 1500, SeasonDays: 140, MeanAnnual: 4, Layers: []solver.Layer{base}}
	one, err := ModifiedBerggren(in)
	if err != nil {
		t.Fatal(err)
	}
	for _, n := range []int{3, 17, 200} {
		layers := make([]solver.Layer, n)
		for i := range layers {
			layers[i] = base
			layers[i].Thickness = 3.0 / float64(n)
		}
		in.Layers = layers
		r, err := ModifiedBerggren(in)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(r.Depth-one.Depth) > 1e-9 {
			t.Errorf("%d layers: depth %.12f, homogeneous %.12f", n, r.Depth, one.Depth)
		}
		if r.Layer != int(one.Depth/(3.0/float64(n))) {
			t.Errorf("%d layers: frost line in layer %d", n, r.Layer)
		}
	}
}

func TestModifiedBerggrenLayered(t *testing.T) {
	// A dry, well-conducting gravel base over a wet clay: the base's small
	// latent heat lets frost reach deeper than in clay alone, and not as deep
	// as in gravel alone [derived: the layered index is bracketed by the
	// single-soil indices]. The last layer continues downward.
	gravel := freezeLayer("gravel", 0.5, 2.5, 2.0, 1.6e6, 1.8e6, 2.5e7)
	clay := freezeLayer("clay", 0.5, 1.5, 1.2, 2.0e6, 2.8e6, 1.2e8)
	in := BerggrenInput{SurfaceIndex: 800, SeasonDays: 120, MeanAnnual: 5}
	depth := func(ls ...solver.Layer) BerggrenResult {
		in.Layers = ls
		r, err := ModifiedBerggren(in)
		if err != nil {
			t.Fatal(err)
		}
		return r
	}
	g, c, gc := depth(gravel), depth(clay), depth(gravel, clay)
	if !(c.Depth < gc.Depth && gc.Depth < g.Depth) {
		t.Errorf("clay %g < layered %g < gravel %g fails", c.Depth, gc.Depth, g.Depth)
	}
	for _, r := range []BerggrenResult{g, c, gc} {
		if n := r.Needed[len(r.Needed)-1]; math.Abs(n-800) > 1e-9*800 {
			t.Errorf("index needed for the whole depth %g, want 800", n)
		}
	}
	if gc.Layer != 1 || gc.Depth <= 0.5 || len(gc.Needed) != 2 || gc.Needed[0] >= 800 {
		t.Errorf("layered result %+v", gc)
	}
	// The index needed to freeze through the gravel, by hand: L d (R/2) /
	// (86400 lambda^2) with R = 0.5/2.25, mu from the gravel alone.
	vs := 800.0 / 120
	lam, _, _ := BerggrenCoefficient(5/vs, 1.7e6*vs/2.5e7)
	want := 2.5e7 * 0.5 * (0.5 / 2.25 / 2) / (86400 * lam * lam)
	if math.Abs(gc.Needed[0]-want) > 1e-9*want {
		t.Errorf("index through gravel %g, want %g", gc.Needed[0], want)
	}
	// The partial clay layer, by the documented procedure: x = X - 0.5,
	// means weighted over 0.5 m gravel + x clay, dF = L2 x (R1 + x/(2 k2)) /
	// (86400 lambda^2), and F1 + dF = 800.
	x := gc.Depth - 0.5
	cAvg := (1.7e6*0.5 + 2.4e6*x) / (0.5 + x)
	lAvg := (2.5e7*0.5 + 1.2e8*x) / (0.5 + x)
	lam2, _, _ := BerggrenCoefficient(5/vs, cAvg*vs/lAvg)
	dF := 1.2e8 * x * (0.5/2.25 + x/(2*1.35)) / (86400 * lam2 * lam2)
	if math.Abs(gc.Needed[0]+dF-800) > 1e-8 || math.Abs(gc.Lambda-lam2) > 1e-12 {
		t.Errorf("partial layer: F1 + dF = %g, want 800; lambda %g vs %g", gc.Needed[0]+dF, gc.Lambda, lam2)
	}
	t.Logf("gravel alone %.3f m, clay alone %.3f m, gravel on clay %.3f m (gravel frozen through at %.1f K day)",
		g.Depth, c.Depth, gc.Depth, gc.Needed[0])
}

func TestModifiedBerggrenBadInputs(t *testing.T) {
	good := freezeLayer("soil", 1, 2, 2, 2e6, 2e6, 1e8)
	dry := good
	dry.Freeze = nil
	bad := []BerggrenInput{
		{SurfaceIndex: -100, SeasonDays: 100, MeanAnnual: 5, Layers: []solver.Layer{good}},
		{SurfaceIndex: 0, SeasonDays: 100, MeanAnnual: 5, Layers: []solver.Layer{good}},
		{SurfaceIndex: 500, SeasonDays: 0, MeanAnnual: 5, Layers: []solver.Layer{good}},
		{SurfaceIndex: 500, SeasonDays: 100, MeanAnnual: -2, Layers: []solver.Layer{good}},
		{SurfaceIndex: 500, SeasonDays: 100, MeanAnnual: 5},
		{SurfaceIndex: 500, SeasonDays: 100, MeanAnnual: 5, Layers: []solver.Layer{dry}},
		{SurfaceIndex: 5000, SeasonDays: 100, MeanAnnual: 5, Layers: []solver.Layer{good, dry}}, // frost reaches a dry deepest layer: no bound
		{SurfaceIndex: 5000, SeasonDays: 100, MeanAnnual: 5, Layers: []solver.Layer{good, {Name: "gap", Resistance: 0.2}}},
		{SurfaceIndex: math.NaN(), SeasonDays: 100, MeanAnnual: 5, Layers: []solver.Layer{good}},
	}
	for i, in := range bad {
		if _, err := ModifiedBerggren(in); err == nil {
			t.Errorf("case %d: want an error", i)
		}
	}
}

func BenchmarkModifiedBerggren(b *testing.B) {
	l := freezeLayer("silt", 1, 1.8, 1.4, 1.9e6, 2.6e6, 1.0e8)
	in := BerggrenInput{SurfaceIndex: 900, SeasonDays: 110, MeanAnnual: 6, Layers: []solver.Layer{l}}
	for b.Loop() {
		if _, err := ModifiedBerggren(in); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkModifiedBerggrenLayered(b *testing.B) {
	layers := []solver.Layer{
		freezeLayer("gravel", 0.3, 2.5, 2.0, 1.6e6, 1.8e6, 2.5e7),
		freezeLayer("sand", 0.4, 2.2, 1.9, 1.7e6, 2.2e6, 5e7),
		freezeLayer("clay", 1, 1.5, 1.2, 2.0e6, 2.8e6, 1.2e8),
	}
	in := BerggrenInput{SurfaceIndex: 1200, SeasonDays: 130, MeanAnnual: 5, Layers: layers}
	for b.Loop() {
		if _, err := ModifiedBerggren(in); err != nil {
			b.Fatal(err)
		}
	}
}

func TestModifiedBerggrenMonotoneAndContinuous(t *testing.T) {
	// Properties [derived]: the frost depth grows with the surface index,
	// and at the index that freezes exactly through a layer (same mean
	// surface temperature vs) the depth is the layer's bottom (no jump at
	// the interface).
	layers := []solver.Layer{
		freezeLayer("gravel", 0.3, 2.5, 2.0, 1.6e6, 1.8e6, 2.5e7),
		freezeLayer("sand", 0.4, 2.2, 1.9, 1.7e6, 2.2e6, 5e7),
		freezeLayer("clay", 1, 1.5, 1.2, 2.0e6, 2.8e6, 1.2e8),
	}
	in := BerggrenInput{SeasonDays: 120, MeanAnnual: 5, Layers: layers}
	prev := 0.0
	for F := 25.0; F <= 3000; F *= 1.25 {
		in.SurfaceIndex = F
		in.SeasonDays = 40 + F/10 // season and index grow together
		r, err := ModifiedBerggren(in)
		if err != nil {
			t.Fatal(err)
		}
		if r.Depth <= prev {
			t.Errorf("F %g: depth %g not above %g", F, r.Depth, prev)
		}
		prev = r.Depth
	}
	in.SurfaceIndex, in.SeasonDays = 600, 120
	r, err := ModifiedBerggren(in)
	if err != nil {
		t.Fatal(err)
	}
	for i, f := range r.Needed[:len(r.Needed)-1] {
		// Same vs = F/t, so alpha and mu are those of the full run.
		in.SurfaceIndex, in.SeasonDays = f, f*120/600
		ri, err := ModifiedBerggren(in)
		if err != nil {
			t.Fatal(err)
		}
		var bottom float64
		for _, l := range layers[:i+1] {
			bottom += l.Thickness
		}
		if math.Abs(ri.Depth-bottom) > 1e-9 {
			t.Errorf("index %g (through layer %d): depth %.12f, want %.12f", f, i+1, ri.Depth, bottom)
		}
	}
}

func TestModifiedBerggrenBisectionFallback(t *testing.T) {
	// The fallback (bisection on depth) and the fixed point agree.
	layers := []solver.Layer{
		freezeLayer("gravel", 0.3, 2.5, 2.0, 1.6e6, 1.8e6, 2.5e7),
		freezeLayer("clay", 1, 1.5, 1.2, 2.0e6, 2.8e6, 1.2e8),
	}
	for _, F := range []float64{20, 300, 2500} {
		in := BerggrenInput{SurfaceIndex: F, SeasonDays: 120, MeanAnnual: 5, Layers: layers}
		fast, err := ModifiedBerggren(in)
		if err != nil {
			t.Fatal(err)
		}
		fixedPointSteps = 0
		slow, err := ModifiedBerggren(in)
		fixedPointSteps = 50
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(fast.Depth-slow.Depth) > 1e-10*fast.Depth || fast.Layer != slow.Layer {
			t.Errorf("F %g: fixed point %.12f (layer %d), bisection %.12f (layer %d)", F, fast.Depth, fast.Layer, slow.Depth, slow.Layer)
		}
	}
}

// Pavement and insulation layers in the layered closed forms, checked by
// hand against the multilayer procedure of the US Army frost manuals
// (TM 5-852-6 / AFR 88-19 Vol. 6, 1988, "Calculation methods for
// determination of depths of freeze and thaw in soils"; Aldrich and
// Paynter 1953) [memory]: a layer without latent heat freezes at once and
// adds only its resistance d/k (and, for modified Berggren, its heat
// capacity to the weighted means); Stefan's equation is summed layer by
// layer, dF_n = L_n d_n (sum_{i<n} R_i + d_n/(2 k_n)) / 86400. Layer
// values are invented for the test (asphalt 0.75 W/(m K); silty clay
// L = 1600 kg/m3 x 20 % x 334 kJ/kg; XPS 0.035 W/(m K)).
func TestPavementLayers(t *testing.T) {
	asphalt := solver.Layer{Name: "asphalt", Thickness: 0.1, Conductivity: 0.75, HeatCapacity: 1.9e6}
	clay := freezeLayer("silty clay", 3, 1.6, 1.3, 2.2e6, 2.9e6, 1600*0.2*334e3)
	gravel := freezeLayer("gravel base", 0.3, 2.2, 1.9, 1.8e6, 2.0e6, 2000*0.03*334e3)
	xps := solver.Layer{Name: "XPS board", Thickness: 0.05, Conductivity: 0.035, HeatCapacity: 35 * 1450}
	const F = 700.0 // surface freezing index, K day

	// Stefan, 100 mm asphalt over clay: the clay part x must need exactly
	// the index left, L x (R_asphalt + x/(2 kf)) / 86400 = F.
	X, needed, err := StefanLayered([]solver.Layer{asphalt, clay}, F)
	if err != nil {
		t.Fatal(err)
	}
	x := X - 0.1
	if got := clay.Freeze.LatentHeat * x * (0.1/0.75 + x/(2*1.6)) / 86400; math.Abs(got-F) > 1e-9*F || needed[0] != 0 {
		t.Errorf("asphalt over clay: X = %.4f m needs %.6f K day, want %g; asphalt needs %g, want 0", X, got, F, needed[0])
	}
	// The asphalt's resistance makes the frost shallower than in bare clay
	// by less than the asphalt thickness would add.
	bare, _ := Stefan(1.6, clay.Freeze.LatentHeat, F)
	if !(X < bare+0.1 && X > 0.1) {
		t.Errorf("asphalt over clay %.4f m, bare clay %.4f m", X, bare)
	}

	// Stefan, 300 mm gravel, 50 mm XPS, clay: the gravel needs
	// L_g d_g (d_g/(2 k_g)), the board none, and the clay the rest through
	// R = 0.3/2.2 + 0.05/0.035.
	X2, needed2, err := StefanLayered([]solver.Layer{gravel, xps, clay}, F)
	if err != nil {
		t.Fatal(err)
	}
	fg := gravel.Freeze.LatentHeat * 0.3 * (0.3 / (2 * 2.2)) / 86400
	x2 := X2 - 0.35
	fc := clay.Freeze.LatentHeat * x2 * (0.3/2.2 + 0.05/0.035 + x2/(2*1.6)) / 86400
	if math.Abs(needed2[0]-fg) > 1e-9*fg || math.Abs(needed2[1]-fg) > 1e-9*fg || math.Abs(fg+fc-F) > 1e-9*F {
		t.Errorf("gravel/XPS/clay: needed %v, want [%g %g ...]; gravel + clay %g, want %g", needed2, fg, fg, fg+fc, F)
	}
	t.Logf("Stefan: asphalt over clay %.3f m (bare clay %.3f m); gravel + XPS + clay %.3f m (gravel needs %.1f K day)", X, bare, X2, fg)

	// Modified Berggren, asphalt over clay, by the same procedure: alpha
	// = v0/vs, vs = F/t; over the frozen depth 0.1 + x the weighted means
	// C = (C_a 0.1 + C_c x)/(0.1 + x), L = L_c x/(0.1 + x), mu = C vs / L;
	// dF = L_c x (R_a + x/(2 k_c)) / (86400 lambda^2) = F with k the means
	// of frozen and unfrozen.
	in := BerggrenInput{SurfaceIndex: F, SeasonDays: 110, MeanAnnual: 6, Layers: []solver.Layer{asphalt, clay}}
	b, err := ModifiedBerggren(in)
	if err != nil {
		t.Fatal(err)
	}
	vs := F / 110
	xb := b.Depth - 0.1
	cAvg := (1.9e6*0.1 + 0.5*(2.2e6+2.9e6)*xb) / (0.1 + xb)
	lAvg := clay.Freeze.LatentHeat * xb / (0.1 + xb)
	lam, _, err := BerggrenCoefficient(6/vs, cAvg*vs/lAvg)
	if err != nil {
		t.Fatal(err)
	}
	kc := 0.5 * (1.6 + 1.3)
	dF := clay.Freeze.LatentHeat * xb * (0.1/0.75 + xb/(2*kc)) / (86400 * lam * lam)
	if math.Abs(dF-F) > 1e-8*F || math.Abs(b.Lambda-lam) > 1e-12 || !(b.Depth < X) {
		t.Errorf("Berggren asphalt over clay: X = %.4f m needs %.6f K day (want %g), lambda %.6f vs %.6f; Stefan %.4f m", b.Depth, dF, F, b.Lambda, lam, X)
	}
	// With the board: gravel frozen through first, the board adds its
	// resistance and heat capacity, then the clay.
	b2, err := ModifiedBerggren(BerggrenInput{SurfaceIndex: F, SeasonDays: 110, MeanAnnual: 6, Layers: []solver.Layer{gravel, xps, clay}})
	if err != nil {
		t.Fatal(err)
	}
	if !(b2.Depth < X2 && b2.Depth > 0.35) || len(b2.Needed) != 3 || b2.Needed[0] != b2.Needed[1] {
		t.Errorf("Berggren gravel/XPS/clay %.4f m (Stefan %.4f m), needed %v", b2.Depth, X2, b2.Needed)
	}
	t.Logf("modified Berggren: asphalt over clay %.3f m (lambda %.4f); gravel + XPS + clay %.3f m", b.Depth, b.Lambda, b2.Depth)

	// A dry deepest layer that the frost reaches: no bound, said so by
	// both; one it does not reach changes nothing.
	thin := clay
	thin.Thickness = 0.5
	if _, _, err := StefanLayered([]solver.Layer{thin, asphalt}, F); err == nil || !strings.Contains(err.Error(), "no bound") {
		t.Errorf("Stefan, dry deepest layer: err %v", err)
	}
	if _, err := ModifiedBerggren(BerggrenInput{SurfaceIndex: F, SeasonDays: 110, MeanAnnual: 6, Layers: []solver.Layer{thin, asphalt}}); err == nil || !strings.Contains(err.Error(), "no bound") {
		t.Errorf("Berggren, dry deepest layer: err %v", err)
	}
	if d, _, err := StefanLayered([]solver.Layer{clay, asphalt}, F); err != nil || math.Abs(d-bare) > 1e-12 {
		t.Errorf("Stefan, dry layer below the frost: %v, %g m (bare clay %g m)", err, d, bare)
	}
}
