package solver

import (
	"errors"
	"math"
	"math/cmplx"
	"math/rand/v2"
	"testing"
)

const tmDay = 86400.0 // s

// Material values used by the checks. Steel and softwood are the ISO 10456
// design values of ISO 10456:2007 Table 3 [2nd-hand; memory agrees]; the TABULA layers are
// those of the TABULA sheet [2nd-hand]; the others are plausible values for
// checks whose expected result is derived from the equations, so the
// property values themselves are not under test.
var (
	tmSteel    = Layer{Name: "steel", Conductivity: 50, HeatCapacity: 7800 * 450}
	tmSoftwood = Layer{Name: "softwood", Conductivity: 0.13, HeatCapacity: 500 * 1600}
	tmConcrete = Layer{Name: "concrete", Conductivity: 2.3, HeatCapacity: 2400 * 1000}
	tmBrick    = Layer{Name: "brick", Conductivity: 0.77, HeatCapacity: 1750 * 1000}
	tmMinWool  = Layer{Name: "mineral wool", Conductivity: 0.04, HeatCapacity: 30 * 1030}
	tmPlaster  = Layer{Name: "plaster", Conductivity: 0.7, HeatCapacity: 1400 * 840}
)

func tmWith(l Layer, d float64) Layer { l.Thickness = d; return l }

func tmRel(got, want float64) float64 {
	if want == 0 {
		return math.Abs(got)
	}
	return math.Abs(got-want) / math.Abs(want)
}

func tmCRel(got, want complex128) float64 {
	if want == 0 {
		return cmplx.Abs(got)
	}
	return cmplx.Abs(got-want) / cmplx.Abs(want)
}

// tmTabula is the Italian TABULA construction sheet Wall_01.03 (TABULA
// project, Italian national building typology) [2nd-hand], listed outside
// first.
func tmTabula() Column {
	return Column{Layers: []Layer{
		{Name: "outer plaster", Thickness: 0.02, Conductivity: 0.9, HeatCapacity: 1800 * 840},
		{Name: "masonry", Thickness: 0.36, Conductivity: 0.9, HeatCapacity: 2000 * 840},
		{Name: "inner plaster", Thickness: 0.02, Conductivity: 0.7, HeatCapacity: 1400 * 840},
	}, OutsideResistance: 0.04, InsideResistance: 0.13}
}

// tmLagByFrequency is an independent way to unwrap the lag of Y12: follow
// arg Y12 continuously in frequency from a very long period (where the lag
// tends to 0) down to the target period, in small steps, with the plain
// unscaled matrix product. Valid for layers with d/delta < ~300.
func tmLagByFrequency(t *testing.T, c Column, period float64) float64 {
	t.Helper()
	y12 := func(p float64) complex128 {
		z := ResistanceMatrix(c.OutsideResistance)
		for _, l := range c.Layers {
			z = z.Mul(LayerMatrix(l, p))
		}
		z = z.Mul(ResistanceMatrix(c.InsideResistance))
		return -1 / z[0][1]
	}
	p := period * 1e10
	phi := cmplx.Phase(y12(p))
	for p > period {
		next := math.Max(p/1.005, period)
		d := cmplx.Phase(y12(next)) - cmplx.Phase(y12(p))
		d -= 2 * math.Pi * math.Round(d/(2*math.Pi))
		phi += d
		p = next
	}
	return -phi * period / (2 * math.Pi)
}

// TestLayerMatrixExpandedForm compares LayerMatrix with the real/imaginary
// expansion of ISO 13786:2017, clause 6, heat transfer matrix of a
// homogeneous layer ([memory] of the standard, confirmed by derivation), a different formula for the same matrix.
func TestLayerMatrixExpandedForm(t *testing.T) {
	for _, xiWant := range []float64{0.05, 0.3, 0.9, 1.0, 1.1, 2.5, 7, 25} {
		l := tmWith(tmBrick, 1)
		delta := LayerPenetrationDepth(l, tmDay)
		l.Thickness = xiWant * delta
		xi := l.Thickness / delta
		lam := l.Conductivity
		ch, sh, c, s := math.Cosh(xi), math.Sinh(xi), math.Cos(xi), math.Sin(xi)
		want := Matrix{
			{complex(ch*c, sh*s), complex(-delta/(2*lam)*(sh*c+ch*s), -delta/(2*lam)*(ch*s-sh*c))},
			{complex(-lam/delta*(sh*c-ch*s), -lam/delta*(sh*c+ch*s)), complex(ch*c, sh*s)},
		}
		got := LayerMatrix(l, tmDay)
		for i := range 2 {
			for j := range 2 {
				if e := tmCRel(got[i][j], want[i][j]); e > 1e-13 {
					t.Errorf("xi=%g Z%d%d = %v, want %v (rel err %.2g)", xi, i+1, j+1, got[i][j], want[i][j], e)
				}
			}
		}
	}
	// Massless layer: [[1, -R], [0, 1]] (ISO 13786:2017, clause 6 [memory]).
	if got, want := LayerMatrix(Layer{Resistance: 0.18}, tmDay), (Matrix{{1, -0.18}, {0, 1}}); got != want {
		t.Errorf("air layer matrix = %v, want %v", got, want)
	}
}

// TestDetIsOne: det Z = 1 for every layer and product [derived].
func TestDetIsOne(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for n := range 200 {
		z := ScaledMatrix{M: IdentityMatrix}
		var plain Matrix = IdentityMatrix
		for range 1 + rng.IntN(6) {
			var l Layer
			if rng.IntN(4) == 0 {
				l = Layer{Resistance: 0.01 + rng.Float64()}
			} else {
				l = Layer{Thickness: 0.001 + 0.3*rng.Float64(), Conductivity: 0.03 + 3*rng.Float64(),
					HeatCapacity: 1e4 + 3e6*rng.Float64()}
			}
			p := 3600 * (1 + 8760*rng.Float64())
			z = LayerMatrixScaled(l, p).Mul(z)
			plain = LayerMatrix(l, p).Mul(plain)
		}
		// det(exp(s) M) = exp(2s) det M.
		det := z.M.Det() * complex(math.Exp(2*z.LogScale), 0)
		if cmplx.Abs(det-1) > 1e-9 {
			t.Errorf("case %d: scaled det = %v, want 1", n, det)
		}
		if d := plain.Det(); cmplx.Abs(d-1) > 1e-9*plain.maxAbs()*plain.maxAbs() {
			t.Errorf("case %d: det = %v, want 1", n, d)
		}
	}
}

// TestTabulaWall: TABULA sheet Wall_01.03 (Italian national building
// typology of the TABULA project) [2nd-hand]: U = 1.611 W/(m2 K), |Y12| = 0.266 W/(m2 K) at 24 h, both
// quoted to three decimals.
func TestTabulaWall(t *testing.T) {
	p, err := Periodic(tmTabula(), tmDay)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(p.U-1.611) > 0.0005 {
		t.Errorf("U = %.4f, want 1.611", p.U)
	}
	if math.Abs(p.PeriodicTransmittance-0.266) > 0.0005 {
		t.Errorf("|Y12| = %.4f, want 0.266", p.PeriodicTransmittance)
	}
	if math.Abs(p.DecrementFactor-p.PeriodicTransmittance/p.U) > 1e-15 {
		t.Errorf("f = %g, want |Y12|/U = %g", p.DecrementFactor, p.PeriodicTransmittance/p.U)
	}
}

// TestHalfSpaceAdmittance: the admittance of a semi-infinite solid with no
// surface resistance is lambda k, |Y| = sqrt(lambda rho c omega), leading
// the temperature by exactly T/8 (from Y11 = lambda (1+i)/delta of ISO 13786
// in the limit [derived]). A wall
// 40 penetration depths thick is a half-space to exp(-80) on both faces.
func TestHalfSpaceAdmittance(t *testing.T) {
	for _, tc := range []struct {
		l      Layer
		period float64
	}{{tmConcrete, tmDay}, {tmSoftwood, 3600}, {tmSteel, 365 * tmDay}} {
		omega := 2 * math.Pi / tc.period
		want := math.Sqrt(tc.l.Conductivity * tc.l.HeatCapacity * omega)
		delta := LayerPenetrationDepth(tc.l, tc.period)
		p, err := Periodic(Column{Layers: []Layer{tmWith(tc.l, 40*delta)}}, tc.period)
		if err != nil {
			t.Fatal(err)
		}
		for _, side := range []struct {
			name      string
			mod, lead float64
		}{{"inside", p.InsideAdmittance, p.InsideAdmittanceLead}, {"outside", p.OutsideAdmittance, p.OutsideAdmittanceLead}} {
			if tmRel(side.mod, want) > 1e-12 || math.Abs(side.lead-tc.period/8) > 1e-9*tc.period {
				t.Errorf("%s, T=%g: |Y| = %.12g lead %.12g s, want %.12g, %.12g s", tc.l.Name, tc.period, side.mod, side.lead, want, tc.period/8)
			}
		}
		// The same through the ground path: a half-space column.
		y, err := SurfaceAdmittance(Column{Layers: []Layer{tmWith(tc.l, 0.1)}, HalfSpace: true}, tc.period)
		if err != nil {
			t.Fatal(err)
		}
		if tmRel(cmplx.Abs(y), want) > 1e-12 || math.Abs(cmplx.Phase(y)-math.Pi/4) > 1e-12 {
			t.Errorf("%s half-space admittance %v, want %g at pi/4", tc.l.Name, y, want)
		}
	}
}

// TestThinLayerLimits: as d/delta -> 0, kappa1 + kappa2 -> rho c d (with no
// surface resistances, each tends to rho c d / 2) and f -> 1 (ISO 13786
// definitions [derived]); the relative deviation is O(xi^2).
func TestThinLayerLimits(t *testing.T) {
	for _, l := range []Layer{tmSteel, tmPlaster, tmSoftwood} {
		for _, xi := range []float64{1e-2, 1e-3} {
			d := xi * LayerPenetrationDepth(l, tmDay)
			p, err := Periodic(Column{Layers: []Layer{tmWith(l, d)}}, tmDay)
			if err != nil {
				t.Fatal(err)
			}
			if e := tmRel(p.InsideArealHeatCapacity+p.OutsideArealHeatCapacity, l.HeatCapacity*d); e > xi*xi {
				t.Errorf("%s xi=%g: kappa1+kappa2 = %g, rho c d = %g (rel %g)", l.Name, xi, p.InsideArealHeatCapacity+p.OutsideArealHeatCapacity, l.HeatCapacity*d, e)
			}
			// With ISO 6946 surface resistances f -> 1 as the stored heat vanishes.
			q, err := Periodic(Column{Layers: []Layer{tmWith(l, d*1e-3)}, OutsideResistance: 0.04, InsideResistance: 0.13}, tmDay)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(q.DecrementFactor-1) > 1e-6 || q.TimeShift > 1e-3*tmDay {
				t.Errorf("%s d=%g: f = %.9f lag %g s, want 1 and 0", l.Name, d*1e-3, q.DecrementFactor, q.TimeShift)
			}
		}
	}
}

// TestPureResistance: a component of massless layers only has f = 1,
// lag 0, Y11 = Y22 = Y12 = U and no areal heat capacity (ISO 13786
// definitions with massless layers [derived]).
func TestPureResistance(t *testing.T) {
	c := Column{Layers: []Layer{{Resistance: 0.18}, {Resistance: 2.5}}, OutsideResistance: 0.04, InsideResistance: 0.13}
	p, err := Periodic(c, tmDay)
	if err != nil {
		t.Fatal(err)
	}
	u := 1 / (0.04 + 0.18 + 2.5 + 0.13)
	if tmRel(p.U, u) > 1e-15 || math.Abs(p.DecrementFactor-1) > 1e-15 || p.TimeShift != 0 || p.TimeShiftUnwrapped != 0 {
		t.Errorf("U %g f %g lag %g/%g, want %g, 1, 0", p.U, p.DecrementFactor, p.TimeShift, p.TimeShiftUnwrapped, u)
	}
	for name, y := range map[string]complex128{"Y11": p.Y11, "Y12": p.Y12, "Y22": p.Y22} {
		if tmCRel(y, complex(u, 0)) > 1e-15 {
			t.Errorf("%s = %v, want %g", name, y, u)
		}
	}
	if p.InsideArealHeatCapacity > 1e-9 || p.OutsideArealHeatCapacity > 1e-9 { // round-off only, J/(m2 K)
		t.Errorf("kappa = %g, %g, want 0", p.InsideArealHeatCapacity, p.OutsideArealHeatCapacity)
	}
}

// tmThickLag is the lag of a homogeneous slab with d/delta = xi >> 1 between
// surface resistances a (outside) and b (inside) [derived]: with
// L11 = L22 ~ exp(z)/2, L12 ~ -exp(z)/(2 lambda k), L21 ~ -lambda k exp(z)/2,
// -Z12 ~ exp(z) (1 + a lambda k)(1 + b lambda k) / (2 lambda k), so
// lag = T/(2 pi) [xi - pi/4 + arg(1 + a lambda k) + arg(1 + b lambda k)]
// and |Y12| = 2 |lambda k| exp(-xi) / |(1 + a lambda k)(1 + b lambda k)|,
// both to relative order exp(-2 xi).
func tmThickLag(l Layer, d, a, b, period float64) (lag, y12 float64) {
	delta := LayerPenetrationDepth(l, period)
	lk := complex(l.Conductivity, 0) * complex(1, 1) / complex(delta, 0)
	fa, fb := 1+complex(a, 0)*lk, 1+complex(b, 0)*lk
	xi := d / delta
	lag = period / (2 * math.Pi) * (xi - math.Pi/4 + cmplx.Phase(fa) + cmplx.Phase(fb))
	y12 = 2 * cmplx.Abs(lk) * math.Exp(-xi) / cmplx.Abs(fa*fb)
	return lag, y12
}

// TestThickSlab: the unwrapped lag and |Y12| of thick homogeneous slabs
// against the asymptotic closed form tmThickLag [derived]; adding 0.1 m to a
// thick slab multiplies |Y12| by exp(-0.1/delta) and adds 0.1 T/(2 pi delta)
// to the lag (exp(-(1+i) d/delta) of a thick layer [derived]); TimeShift is the unwrapped
// lag modulo the period. Covers lags of several periods and xi up to 1e4.
func TestThickSlab(t *testing.T) {
	for _, tc := range []struct {
		l            Layer
		xi, a, b, pd float64
	}{
		{tmConcrete, 10, 0.04, 0.13, tmDay},
		{tmConcrete, 30, 0, 0, tmDay},
		{tmBrick, 55, 0.04, 0.13, tmDay},
		{tmSoftwood, 200, 0.1, 0.17, 3600},
		{tmConcrete, 1e3, 0.04, 0.13, tmDay},
		{tmConcrete, 1e4, 0.04, 0.13, tmDay},
	} {
		delta := LayerPenetrationDepth(tc.l, tc.pd)
		d := tc.xi * delta
		c := Column{Layers: []Layer{tmWith(tc.l, d)}, OutsideResistance: tc.a, InsideResistance: tc.b}
		p, err := Periodic(c, tc.pd)
		if err != nil {
			t.Fatal(err)
		}
		lag, y12 := tmThickLag(tc.l, d, tc.a, tc.b, tc.pd)
		asym := 10 * math.Exp(-2*tc.xi) // relative size of the neglected terms
		if tmRel(p.TimeShiftUnwrapped, lag) > 1e-12+asym {
			t.Errorf("%s xi=%g: unwrapped lag %.12g s, want %.12g s", tc.l.Name, tc.xi, p.TimeShiftUnwrapped, lag)
		}
		if tmRel(p.PeriodicTransmittance, y12) > 1e-11+asym && y12 > 1e-300 {
			t.Errorf("%s xi=%g: |Y12| = %g, want %g", tc.l.Name, tc.xi, p.PeriodicTransmittance, y12)
		}
		if want := math.Mod(lag, tc.pd); math.Abs(p.TimeShift-want) > 1e-9*lag && math.Abs(p.TimeShift-want) < tc.pd-1e-9*lag {
			t.Errorf("%s xi=%g: TimeShift %.12g s, want unwrapped mod T = %.12g", tc.l.Name, tc.xi, p.TimeShift, want)
		}
		for _, v := range []float64{p.U, p.PeriodicTransmittance, p.DecrementFactor, p.TimeShift, p.TimeShiftUnwrapped,
			p.InsideAdmittance, p.InsideAdmittanceLead, p.OutsideAdmittance, p.OutsideAdmittanceLead,
			p.InsideArealHeatCapacity, p.OutsideArealHeatCapacity, real(p.Y12), imag(p.Y12)} {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("%s xi=%g: non-finite result %+v", tc.l.Name, tc.xi, p)
			}
		}
		// +0.1 m.
		c2 := c
		c2.Layers = []Layer{tmWith(tc.l, d+0.1)}
		p2, err := Periodic(c2, tc.pd)
		if err != nil {
			t.Fatal(err)
		}
		if got, want := p2.TimeShiftUnwrapped-p.TimeShiftUnwrapped, 0.1*tc.pd/(2*math.Pi*delta); math.Abs(got-want) > 1e-9*p2.TimeShiftUnwrapped {
			t.Errorf("%s xi=%g: +0.1 m adds %.12g s to the lag, want %.12g", tc.l.Name, tc.xi, got, want)
		}
		if p.PeriodicTransmittance > 1e-290 {
			if got, want := p2.PeriodicTransmittance/p.PeriodicTransmittance, math.Exp(-0.1/delta); tmRel(got, want) > 1e-9 {
				t.Errorf("%s xi=%g: +0.1 m multiplies |Y12| by %.12g, want %.12g", tc.l.Name, tc.xi, got, want)
			}
		}
	}
}

// TestLagPastHalfAndFullPeriod: TimeShift is (-T/(2 pi) arg Y12) mod T also
// past T/2 (where taking abs() of the signed shift would be wrong), and the
// unwrapped lag past one period agrees with an independent unwrapping in
// frequency (tmLagByFrequency) [derived].
func TestLagPastHalfAndFullPeriod(t *testing.T) {
	for _, tc := range []struct {
		name       string
		c          Column
		minT, maxT float64 // expected range of the unwrapped lag, in periods
	}{
		{"TABULA wall", tmTabula(), 0.5, 1},
		{"0.5 m concrete", Column{Layers: []Layer{tmWith(tmConcrete, 0.5)}, OutsideResistance: 0.04, InsideResistance: 0.13}, 0.5, 1},
		{"brick 0.8 m + wool + air + plaster", Column{Layers: []Layer{tmWith(tmBrick, 0.8), tmWith(tmMinWool, 0.1), {Resistance: 0.18}, tmWith(tmPlaster, 0.015)},
			OutsideResistance: 0.04, InsideResistance: 0.13}, 1, 3},
		{"1.2 m concrete", Column{Layers: []Layer{tmWith(tmConcrete, 1.2)}, OutsideResistance: 0.04, InsideResistance: 0.13}, 1, 3},
	} {
		p, err := Periodic(tc.c, tmDay)
		if err != nil {
			t.Fatal(err)
		}
		n := p.TimeShiftUnwrapped / tmDay
		if n < tc.minT || n > tc.maxT {
			t.Errorf("%s: unwrapped lag %.3f periods, expected in [%g, %g]", tc.name, n, tc.minT, tc.maxT)
		}
		want := tmLagByFrequency(t, tc.c, tmDay)
		if math.Abs(p.TimeShiftUnwrapped-want) > 1e-6 {
			t.Errorf("%s: unwrapped lag %.9f s, by frequency continuation %.9f s", tc.name, p.TimeShiftUnwrapped, want)
		}
		direct := math.Mod(-tmDay/(2*math.Pi)*cmplx.Phase(p.Y12)+tmDay, tmDay)
		if math.Abs(p.TimeShift-direct) > 1e-6 || math.Abs(p.TimeShift-math.Mod(want, tmDay)) > 1e-6 {
			t.Errorf("%s: TimeShift %.9f s, want %.9f (from Y12) and %.9f (unwrapped mod T)", tc.name, p.TimeShift, direct, math.Mod(want, tmDay))
		}
	}
}

// TestUnwrapRandomWalls: the layer-by-layer unwrapping agrees with the
// frequency continuation on random multilayer walls at several periods
// [derived].
func TestUnwrapRandomWalls(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	mats := []Layer{tmConcrete, tmBrick, tmMinWool, tmPlaster, tmSoftwood, tmSteel}
	for n := range 40 {
		var c Column
		for range 1 + rng.IntN(5) {
			if rng.IntN(5) == 0 {
				c.Layers = append(c.Layers, Layer{Resistance: 0.05 + 0.3*rng.Float64()})
				continue
			}
			c.Layers = append(c.Layers, tmWith(mats[rng.IntN(len(mats))], 0.005+0.4*rng.Float64()))
		}
		if rng.IntN(2) == 0 {
			c.OutsideResistance, c.InsideResistance = 0.04, 0.13
		}
		if c.Validate() != nil || c.Layers[0].Massless() && c.OutsideResistance == 0 && len(c.Layers) == 1 {
			continue
		}
		period := []float64{3600, tmDay, 7 * tmDay}[rng.IntN(3)]
		p, err := Periodic(c, period)
		if err != nil {
			t.Fatal(err)
		}
		if want := tmLagByFrequency(t, c, period); math.Abs(p.TimeShiftUnwrapped-want) > 1e-6*math.Max(1, want) {
			t.Errorf("case %d (%d layers, T=%g): unwrapped lag %.9g s, frequency continuation %.9g s", n, len(c.Layers), period, p.TimeShiftUnwrapped, want)
		}
	}
}

// TestReverseLayers: reversing a component (layers and surface
// resistances) swaps Y11/Y22 and kappa1/kappa2 and keeps Y12 (reciprocity,
// det Z = 1); reversing only the layers changes f when Rsi != Rse, and
// not when they are equal ([derived] from Z = Z_se Z_N ... Z_1 Z_si).
func TestReverseLayers(t *testing.T) {
	layers := []Layer{tmWith(tmBrick, 0.1), tmWith(tmMinWool, 0.12), {Resistance: 0.17}, tmWith(tmConcrete, 0.2), tmWith(tmPlaster, 0.015)}
	rev := make([]Layer, len(layers))
	for i, l := range layers {
		rev[len(layers)-1-i] = l
	}
	fwd, err := Periodic(Column{Layers: layers, OutsideResistance: 0.04, InsideResistance: 0.13}, tmDay)
	if err != nil {
		t.Fatal(err)
	}
	full, err := Periodic(Column{Layers: rev, OutsideResistance: 0.13, InsideResistance: 0.04}, tmDay)
	if err != nil {
		t.Fatal(err)
	}
	for _, cmp := range []struct {
		name      string
		got, want complex128
	}{
		{"Y11 <-> Y22", full.Y11, fwd.Y22}, {"Y22 <-> Y11", full.Y22, fwd.Y11}, {"Y12", full.Y12, fwd.Y12},
		{"kappa1 <-> kappa2", complex(full.InsideArealHeatCapacity, 0), complex(fwd.OutsideArealHeatCapacity, 0)},
		{"kappa2 <-> kappa1", complex(full.OutsideArealHeatCapacity, 0), complex(fwd.InsideArealHeatCapacity, 0)},
	} {
		if tmCRel(cmp.got, cmp.want) > 1e-12 {
			t.Errorf("full reversal %s: %v, want %v", cmp.name, cmp.got, cmp.want)
		}
	}
	if math.Abs(full.TimeShiftUnwrapped-fwd.TimeShiftUnwrapped) > 1e-9 {
		t.Errorf("full reversal changes the lag: %g vs %g", full.TimeShiftUnwrapped, fwd.TimeShiftUnwrapped)
	}
	onlyLayers, err := Periodic(Column{Layers: rev, OutsideResistance: 0.04, InsideResistance: 0.13}, tmDay)
	if err != nil {
		t.Fatal(err)
	}
	if tmRel(onlyLayers.DecrementFactor, fwd.DecrementFactor) < 1e-3 {
		t.Errorf("reversing layers with Rsi != Rse: f %g vs %g, expected a change", onlyLayers.DecrementFactor, fwd.DecrementFactor)
	}
	eqFwd, _ := Periodic(Column{Layers: layers, OutsideResistance: 0.1, InsideResistance: 0.1}, tmDay)
	eqRev, _ := Periodic(Column{Layers: rev, OutsideResistance: 0.1, InsideResistance: 0.1}, tmDay)
	if tmRel(eqRev.DecrementFactor, eqFwd.DecrementFactor) > 1e-12 {
		t.Errorf("reversing layers with Rsi == Rse: f %g vs %g, expected equal", eqRev.DecrementFactor, eqFwd.DecrementFactor)
	}
}

// TestPeriodicErrors: invalid input gives an error, not a panic.
func TestPeriodicErrors(t *testing.T) {
	good := tmTabula()
	for _, tc := range []struct {
		name   string
		c      Column
		period float64
	}{
		{"empty", Column{}, tmDay},
		{"zero period", good, 0},
		{"negative period", good, -5},
		{"NaN period", good, math.NaN()},
		{"Inf period", good, math.Inf(1)},
		{"bad layer", Column{Layers: []Layer{{Thickness: 0.1, Conductivity: -1, HeatCapacity: 1e6}}}, tmDay},
		{"negative Rsi", Column{Layers: good.Layers, InsideResistance: -0.1}, tmDay},
		{"Inf Rse", Column{Layers: good.Layers, OutsideResistance: math.Inf(1)}, tmDay},
		{"half-space", Column{Layers: good.Layers, HalfSpace: true}, tmDay},
	} {
		if _, err := Periodic(tc.c, tc.period); err == nil {
			t.Errorf("%s: no error", tc.name)
		}
	}
	if _, err := Periodic(Column{Layers: good.Layers, HalfSpace: true}, tmDay); !errors.Is(err, ErrPeriodicHalfSpace) {
		t.Errorf("half-space: got %v, want ErrPeriodicHalfSpace", err)
	}
}

// TestVeryThickLayerMatrix: the scaled matrix of a layer 1e3 to 1e6
// penetration depths thick is finite with entries of order 1 and a scale
// of about xi (entries grow like exp(xi)/2 times lambda k or 1/(lambda k));
// the plain matrix overflows to infinities but holds no NaN [derived].
// (det M = exp(-2 xi) is below round-off here; det is checked on moderate
// layers in TestDetIsOne.)
func TestVeryThickLayerMatrix(t *testing.T) {
	for _, xi := range []float64{1e3, 1e4, 1e6} {
		l := tmWith(tmConcrete, xi*LayerPenetrationDepth(tmConcrete, tmDay))
		s := LayerMatrixScaled(l, tmDay)
		for i := range 2 {
			for j := range 2 {
				if v := s.M[i][j]; cmplx.IsNaN(v) || cmplx.IsInf(v) || cmplx.Abs(v) > 1+1e-12 {
					t.Errorf("xi=%g: scaled entry %d%d = %v", xi, i, j, v)
				}
			}
		}
		if math.Abs(s.LogScale-xi) > 10 {
			t.Errorf("xi=%g: log scale %g, want about xi", xi, s.LogScale)
		}
		z := LayerMatrix(l, tmDay)
		for i := range 2 {
			for j := range 2 {
				if cmplx.IsNaN(z[i][j]) {
					t.Errorf("xi=%g: LayerMatrix entry %d%d is NaN", xi, i, j)
				}
			}
		}
	}
}
