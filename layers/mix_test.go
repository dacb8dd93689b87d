package layers

import (
	"math"
	"math/rand"
	"strings"
	"testing"
)

// massive is a plain test layer of thickness d (m) and conductivity k
// (W/(m K)).
func massive(name string, d, k, rho, c float64) Layer {
	return Layer{Name: name, Thickness: d, Conductivity: k, Density: rho, SpecificHeat: c}
}

func mustMix(t *testing.T, name string, d float64, parts ...MixPart) Layer {
	t.Helper()
	l, err := NewMix(name, d, parts)
	if err != nil {
		t.Fatal(err)
	}
	return l
}

func near(a, b, rel float64) bool { return math.Abs(a-b) <= rel*math.Abs(b) }

// The combined method of ISO 6946 (clause 6.7 of ISO 6946:2017, 6.2 of
// ISO 6946:2007 [memory]) worked by hand on numbers chosen to give exact
// fractions [derived]: surfaces and plain layers 0.13 + 0.33 + 0.04 = 0.5
// m2 K/W; a mixed layer 0.1 m thick of 20 % of conductivity 0.1 (R = 1)
// and 80 % of conductivity 0.04 (R = 2.5).
//
//	upper: 1/R'_T = 0.2/(0.5+1) + 0.8/(0.5+2.5) = 0.4, R'_T = 2.5
//	lower: 1/R''_j = 0.2/1 + 0.8/2.5 = 0.52, R''_T = 0.5 + 1/0.52 = 31.5/13
//	R_T = (2.5 + 31.5/13)/2 = 32/13, e = (2.5 - 31.5/13)/(2 x 32/13) = 1/64
func TestCombinedByHand(t *testing.T) {
	mix := mustMix(t, "studs", 0.1,
		MixPart{Layer: massive("a", 0, 0.1, 500, 1600), Fraction: 0.2},
		MixPart{Layer: massive("b", 0, 0.04, 40, 1000), Fraction: 0.8})
	c := Construction{Layers: []Layer{massive("plain", 0.33, 1, 2000, 1000), mix}}
	got, err := c.Combined(0.13, 0.04)
	if err != nil {
		t.Fatal(err)
	}
	for _, q := range []struct {
		name      string
		got, want float64
	}{
		{"upper", got.Upper, 2.5},
		{"lower", got.Lower, 31.5 / 13},
		{"total", got.Total, 32.0 / 13},
		{"relative error", got.RelativeError, 1.0 / 64},
	} {
		if !near(q.got, q.want, 1e-12) {
			t.Errorf("%s = %.15g, want %.15g", q.name, q.got, q.want)
		}
	}
	if got.Paths != 2 {
		t.Errorf("paths = %d, want 2", got.Paths)
	}
	// The mix's own values [derived]: rho = 0.2x500 + 0.8x40 = 132 kg/m3;
	// rho c = 0.2x500x1600 + 0.8x40x1000 = 192000 J/(m3 K); lambda'' =
	// 0.1 x 0.52 = 0.052 W/(m K) before homogenising.
	if !near(mix.Density, 132, 1e-12) || !near(mix.HeatCapacity(), 192000, 1e-12) || !near(mix.Conductivity, 0.052, 1e-12) {
		t.Errorf("mix rho = %g, rho c = %g, lambda'' = %g; want 132, 192000, 0.052", mix.Density, mix.HeatCapacity(), mix.Conductivity)
	}
	// Homogenised: R_eq = 1/0.52 + (32/13 - 31.5/13) = 1/0.52 + 0.5/13, so
	// lambda_eq = 0.1 / R_eq, and the copy's U is 13/32 [derived].
	h, _, err := c.Homogenised(0.13, 0.04)
	if err != nil {
		t.Fatal(err)
	}
	if want := 0.1 / (1/0.52 + 0.5/13); !near(h.Layers[1].Conductivity, want, 1e-12) {
		t.Errorf("equivalent conductivity %.15g, want %.15g", h.Layers[1].Conductivity, want)
	}
	if u := h.UValue(0.13, 0.04); !near(u, 13.0/32, 1e-12) {
		t.Errorf("homogenised U = %.15g, want 13/32", u)
	}
	if c.Layers[1].Conductivity != mix.Conductivity {
		t.Error("Homogenised changed the construction it was given")
	}
}

// Two mixed layers laid out independently (battens across studs): four
// paths of a quarter each [derived]. Surfaces and plain layers 0.5; mix 1:
// halves of R 1 and 3; mix 2: halves of R 1 and 2.
//
//	upper: 1/R'_T = (1/4)(1/2.5 + 1/3.5 + 1/4.5 + 1/5.5)
//	             = (1/2)(1/5 + 1/7 + 1/9 + 1/11) = 944/3465
//	lower: R''_T = 0.5 + 1/(1/2 + 1/6) + 1/(1/2 + 1/4) = 0.5 + 1.5 + 4/3 = 10/3
func TestCombinedTwoMixesByHand(t *testing.T) {
	m1 := mustMix(t, "m1", 1,
		MixPart{Layer: massive("a", 0, 1, 500, 1000), Fraction: 0.5},
		MixPart{Layer: massive("b", 0, 1.0/3, 500, 1000), Fraction: 0.5})
	m2 := mustMix(t, "m2", 1,
		MixPart{Layer: massive("c", 0, 1, 500, 1000), Fraction: 0.5},
		MixPart{Layer: massive("d", 0, 0.5, 500, 1000), Fraction: 0.5})
	c := Construction{Layers: []Layer{m1, massive("plain", 0.33, 1, 2000, 1000), m2}}
	got, err := c.Combined(0.13, 0.04)
	if err != nil {
		t.Fatal(err)
	}
	if !near(got.Upper, 3465.0/944, 1e-12) || !near(got.Lower, 10.0/3, 1e-12) || got.Paths != 4 {
		t.Errorf("upper %.15g lower %.15g paths %d; want %.15g, %.15g, 4", got.Upper, got.Lower, got.Paths, 3465.0/944, 10.0/3)
	}
	h, cr, err := c.Homogenised(0.13, 0.04)
	if err != nil {
		t.Fatal(err)
	}
	if r := h.TotalResistance(0.13, 0.04); !near(r, cr.Total, 1e-12) {
		t.Errorf("homogenised RT %.15g, want the combined %.15g", r, cr.Total)
	}
}

// A timber-framed wall worked by hand with the formulas of ISO 6946
// [derived]; conductivities from the library (ISO 10456 values as the
// library cites them). Outside first: 102.5 mm clay brick (0.77), 12 mm
// plywood (0.13), 140 mm of 15 % softwood studs (0.13) in 85 % mineral
// wool (0.036), 12.5 mm gypsum board (0.25); Rse 0.04, Rsi 0.13.
//
//	R: brick 0.133117, plywood 0.092308, board 0.05, stud 1.076923, wool 3.888889
//	plain + surfaces = 0.445425
//	path through stud 1.522348, through wool 4.334313
//	upper: 1/(0.15/1.522348 + 0.85/4.334313) = 3.3940
//	lower: 0.445425 + 1/(0.15/1.076923 + 0.85/3.888889) = 0.445425 + 2.794411 = 3.2398
//	R_T = 3.3169, U = 0.3015 W/(m2 K), e = 0.07696/(2 x 3.3169) = 2.3232 %
func TestCombinedTimberFrameByHand(t *testing.T) {
	lib := func(key string, d float64) Layer {
		l, err := NewLayer(key, d)
		if err != nil {
			t.Fatal(err)
		}
		return l
	}
	part := func(key string, f float64) MixPart {
		m, _ := Lookup(key)
		return MixPart{Layer: m.Layer(), Fraction: f}
	}
	c := Construction{Layers: []Layer{
		lib("clay-brick", 0.1025),
		lib("plywood", 0.012),
		mustMix(t, "studs in wool", 0.14, part("softwood", 0.15), part("mineral-wool", 0.85)),
		lib("gypsum-board", 0.0125),
	}}
	got, err := c.Combined(0.13, 0.04)
	if err != nil {
		t.Fatal(err)
	}
	for _, q := range []struct {
		name      string
		got, want float64
	}{
		{"upper", got.Upper, 3.3940},
		{"lower", got.Lower, 3.2398},
		{"total", got.Total, 3.3169},
		{"U", 1 / got.Total, 0.3015},
		{"relative error", got.RelativeError, 0.023232},
	} {
		if !near(q.got, q.want, 2e-4) {
			t.Errorf("%s = %.5g, want %.5g", q.name, q.got, q.want)
		}
	}
}

// Degenerate cases [derived from the definitions]: a single part at
// fraction 1 is the plain layer; identical parts give identical limits
// equal to the plain layer's; no mixed layer gives e = 0.
func TestCombinedDegenerate(t *testing.T) {
	wool := massive("wool", 0, 0.036, 40, 1030)
	plainWool := wool
	plainWool.Thickness = 0.14
	brick := massive("brick", 0.1, 0.77, 1700, 1000)
	want := Construction{Layers: []Layer{brick, plainWool}}.TotalResistance(0.13, 0.04)

	single := mustMix(t, "one", 0.14, MixPart{Layer: wool, Fraction: 1})
	same := mustMix(t, "same", 0.14, MixPart{Layer: wool, Fraction: 0.3}, MixPart{Layer: wool, Fraction: 0.7})
	for _, tc := range []struct {
		name string
		l    Layer
	}{{"fraction 1", single}, {"identical parts", same}, {"no mix", plainWool}} {
		c := Construction{Layers: []Layer{brick, tc.l}}
		got, err := c.Combined(0.13, 0.04)
		if err != nil {
			t.Fatal(err)
		}
		if !near(got.Upper, want, 1e-14) || !near(got.Lower, want, 1e-14) || !near(got.Total, want, 1e-14) {
			t.Errorf("%s: limits %.15g, %.15g, want both %.15g", tc.name, got.Upper, got.Lower, want)
		}
		if math.Abs(got.RelativeError) > 1e-14 {
			t.Errorf("%s: relative error %g, want 0", tc.name, got.RelativeError)
		}
		if !near(tc.l.Conductivity, 0.036, 1e-14) || !near(tc.l.Density, 40, 1e-14) || !near(tc.l.SpecificHeat, 1030, 1e-14) {
			t.Errorf("%s: equivalent layer %g W/(m K), %g kg/m3, %g J/(kg K); want the plain layer's", tc.name, tc.l.Conductivity, tc.l.Density, tc.l.SpecificHeat)
		}
	}
	noMix := Construction{Layers: []Layer{brick, plainWool}}
	if got, _ := noMix.Combined(0.13, 0.04); got.RelativeError != 0 || got.Paths != 1 {
		t.Errorf("no mix: e = %g, paths %d; want exactly 0 and 1", got.RelativeError, got.Paths)
	}
}

// Seeded random constructions: the upper limit is never below the lower
// (they bound the true resistance from the two sides: adiabatic planes
// parallel to the flow, isothermal planes across it; ISO 6946 [memory]),
// and the homogenised copy reproduces R_T [derived].
func TestCombinedBoundsRandom(t *testing.T) {
	rng := rand.New(rand.NewSource(15))
	for n := 0; n < 300; n++ {
		var c Construction
		for i := 0; i < 1+rng.Intn(5); i++ {
			d := 0.01 + 0.2*rng.Float64()
			k := func() float64 { return math.Exp(rng.Float64()*8 - 4) }
			if rng.Intn(2) == 0 {
				c.Layers = append(c.Layers, massive("p", d, k(), 1000, 1000))
				continue
			}
			parts := make([]MixPart, 2+rng.Intn(3))
			var sum float64
			for j := range parts {
				parts[j] = MixPart{Layer: massive("q", 0, k(), 100+2000*rng.Float64(), 1000), Fraction: 0.05 + rng.Float64()}
				sum += parts[j].Fraction
			}
			for j := range parts {
				parts[j].Fraction /= sum
			}
			c.Layers = append(c.Layers, mustMix(t, "m", d, parts...))
		}
		rsi, rse := 0.13*rng.Float64(), 0.04*rng.Float64()
		cr, err := c.Combined(rsi, rse)
		if err != nil {
			t.Fatal(err)
		}
		if cr.Upper < cr.Lower*(1-1e-12) || cr.RelativeError < -1e-12 {
			t.Fatalf("case %d: upper %g below lower %g", n, cr.Upper, cr.Lower)
		}
		h, _, err := c.Homogenised(rsi, rse)
		if err != nil {
			t.Fatal(err)
		}
		if r := h.TotalResistance(rsi, rse); !near(r, cr.Total, 1e-10) {
			t.Fatalf("case %d: homogenised RT %g, want %g", n, r, cr.Total)
		}
	}
}

func TestNewMixErrors(t *testing.T) {
	wool := massive("wool", 0, 0.036, 40, 1030)
	air, _ := Lookup("air-gap-wall")
	for _, tc := range []struct {
		name  string
		d     float64
		parts []MixPart
		want  string
	}{
		{"sum", 0.1, []MixPart{{wool, 0.5}, {wool, 0.4}}, "sum to 90 %"},
		{"zero", 0.1, []MixPart{{wool, 0}, {wool, 1}}, "fraction must lie in (0, 1]"},
		{"above one", 0.1, []MixPart{{wool, 1.2}}, "fraction must lie in (0, 1]"},
		{"empty", 0.1, nil, "no parts"},
		{"thickness", 0, []MixPart{{wool, 1}}, "thickness must be positive"},
		{"air only", 0.02, []MixPart{{air.Layer(), 1}}, "every part is an air layer"},
	} {
		_, err := NewMix("m", tc.d, tc.parts)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error %v, want %q", tc.name, err, tc.want)
		}
	}
	// Within the tolerance the fractions are scaled to sum to 1.
	l, err := NewMix("m", 0.1, []MixPart{{wool, 0.333}, {wool, 0.333}, {wool, 0.333}})
	if err != nil {
		t.Fatal(err)
	}
	if f := l.Mix[0].Fraction + l.Mix[1].Fraction + l.Mix[2].Fraction; math.Abs(f-1) > 1e-15 {
		t.Errorf("fractions sum to %v after scaling", f)
	}
	// An air part takes the tabulated resistance at the mix's thickness:
	// 50 mm, horizontal flow, 0.18 m2 K/W (ISO 6946:2007 Table 2 [memory]).
	l, err = NewMix("battens", 0.05, []MixPart{{massive("batten", 0, 0.13, 500, 1600), 0.1}, {air.Layer(), 0.9}})
	if err != nil {
		t.Fatal(err)
	}
	if r := l.Mix[1].Layer.Resistance; !near(r, 0.18, 1e-12) {
		t.Errorf("air part resistance %g, want 0.18", r)
	}
}

// The timber-framed wall example of the Scottish Executive's guidance:
// Building (Scotland) Act 2003, consultation on building regulations and
// guidance document (non-domestic), Annex 6.B "Worked examples of U-value
// calculations using the combined method", 6.B.2 "Timber framed wall
// example". Read from it [read]: the resistances Rse 0.040, bricks 0.132,
// air cavity 0.090, plywood 0.146, mineral wool 3.333 (90.5 % of the
// face), timber studs 1.077 (9.5 %), plasterboard 0.100, Rsi 0.130 m2 K/W,
// and the path totals R1 = 3.971 (through the wool) and R2 = 1.715 m2 K/W
// (through a stud). The limits the document goes on to give could not be
// read; they are computed here from those inputs with the formulas of
// ISO 6946 [derived]:
//
//	upper: 1/(0.905/3.971 + 0.095/1.715) = 3.5299
//	lower: 0.638 + 1/(0.905/3.333 + 0.095/1.077) = 0.638 + 2.7798 = 3.4178
//	R_T = 3.4739, U = 0.2879 W/(m2 K), e = 1.61 %
func TestCombinedScottishAnnexExample(t *testing.T) {
	res := func(name string, r float64) Layer { return Layer{Name: name, Resistance: r} }
	const d = 0.14 // thickness of the stud layer; only the resistances matter
	c := Construction{Layers: []Layer{
		res("bricks", 0.132),
		res("air cavity", 0.090),
		res("plywood", 0.146),
		mustMix(t, "studs in wool", d,
			MixPart{Layer: massive("mineral wool", 0, d/3.333, 30, 1030), Fraction: 0.905},
			MixPart{Layer: massive("timber studs", 0, d/1.077, 500, 1600), Fraction: 0.095}),
		res("plasterboard", 0.100),
	}}
	// The path totals of the document, as this construction gives them.
	plain := 0.040 + 0.132 + 0.090 + 0.146 + 0.100 + 0.130
	for _, p := range []struct {
		name string
		got  float64
		want float64
	}{{"R1 (wool)", plain + c.Layers[3].Mix[0].Layer.ThermalResistance(), 3.971}, {"R2 (stud)", plain + c.Layers[3].Mix[1].Layer.ThermalResistance(), 1.715}} {
		if math.Abs(p.got-p.want) > 5e-4 {
			t.Errorf("%s = %.4f, the document gives %.3f", p.name, p.got, p.want)
		}
	}
	got, err := c.Combined(0.130, 0.040)
	if err != nil {
		t.Fatal(err)
	}
	for _, q := range []struct {
		name      string
		got, want float64
	}{
		{"upper", got.Upper, 3.5299},
		{"lower", got.Lower, 3.4178},
		{"total", got.Total, 3.4739},
		{"U", 1 / got.Total, 0.2879},
		{"relative error", got.RelativeError, 0.016128},
	} {
		if !near(q.got, q.want, 2e-4) {
			t.Errorf("%s = %.5g, want %.5g", q.name, q.got, q.want)
		}
	}
}
