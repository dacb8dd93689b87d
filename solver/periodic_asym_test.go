package solver

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"testing"
)

// isoMatrix is an independent ISO 13786 transfer matrix written from the
// standard's equations (ISO 13786:2017, clause 6 and Annex A [memory]): for a layer of thickness d, conductivity lambda and
// penetration depth delta = sqrt(lambda T / (pi rho c)), xi = d/delta,
//
//	Z11 = Z22 = cosh((1+i) xi)
//	Z12 = -delta sinh((1+i) xi) / (lambda (1+i))
//	Z21 = -lambda (1+i) sinh((1+i) xi) / delta
//
// and [[1, -R], [0, 1]] for a surface or other massless resistance R. It
// shares no code with matrix.go (plain complex128 arithmetic, no scaling).
func isoMatrix(l Layer, period float64) [2][2]complex128 {
	if l.Massless() {
		return [2][2]complex128{{1, complex(-l.Resistance, 0)}, {0, 1}}
	}
	delta := math.Sqrt(l.Conductivity * period / (math.Pi * l.HeatCapacity))
	z := complex(1, 1) * complex(l.Thickness/delta, 0)
	ch, sh := cmplx.Cosh(z), cmplx.Sinh(z)
	return [2][2]complex128{
		{ch, -complex(delta, 0) * sh / (complex(l.Conductivity, 0) * complex(1, 1))},
		{-complex(l.Conductivity, 0) * complex(1, 1) * sh / complex(delta, 0), ch},
	}
}

func isoMul(a, b [2][2]complex128) [2][2]complex128 {
	var c [2][2]complex128
	for i := 0; i < 2; i++ {
		for j := 0; j < 2; j++ {
			c[i][j] = a[i][0]*b[0][j] + a[i][1]*b[1][j]
		}
	}
	return c
}

// TestAsymmetricWallsAgainstISOEquations draws seeded random asymmetric
// walls (two to four layers of different materials, some with a massless
// air layer, unequal surface resistances) and checks every periodic
// property on both sides against the independent matrix product
// Z = Z_se Z_outer ... Z_inner Z_si of isoMatrix (ISO 13786, 7.2-7.4
// [memory]):
//
//	Y12 = -1/Z12, Y11 = -Z11/Z12, Y22 = -Z22/Z12,
//	kappa1 = T/(2 pi) |(Z11 - 1)/Z12|, kappa2 = T/(2 pi) |(Z22 - 1)/Z12|,
//
// leads T/(2 pi) arg Y. For a symmetric wall Y11 = Y22 and kappa1 = kappa2,
// so a swap of the two sides is invisible there; every wall here is
// required to be asymmetric by at least 5 % in |Y11| / |Y22|.
func TestAsymmetricWallsAgainstISOEquations(t *testing.T) {
	rng := rand.New(rand.NewPCG(17, 1317))
	materials := []Layer{ // invented but plausible building materials
		{Name: "dense", Conductivity: 1.8, HeatCapacity: 2.0e6},
		{Name: "brick", Conductivity: 0.7, HeatCapacity: 1.5e6},
		{Name: "timber", Conductivity: 0.13, HeatCapacity: 0.8e6},
		{Name: "insulation", Conductivity: 0.035, HeatCapacity: 0.03e6},
		{Name: "gypsum", Conductivity: 0.25, HeatCapacity: 0.9e6},
	}
	period := 86400.0
	checked := 0
	for trial := 0; trial < 40; trial++ {
		n := 2 + rng.IntN(3)
		var col Column
		for i := 0; i < n; i++ {
			l := materials[rng.IntN(len(materials))]
			l.Thickness = 0.01 + 0.25*rng.Float64()
			col.Layers = append(col.Layers, l)
		}
		if rng.IntN(3) == 0 {
			at := 1 + rng.IntN(n-1)
			air := Layer{Name: "air", Resistance: 0.18}
			col.Layers = append(col.Layers[:at], append([]Layer{air}, col.Layers[at:]...)...)
		}
		col.OutsideResistance = 0.04
		col.InsideResistance = []float64{0.10, 0.13, 0.17}[rng.IntN(3)]

		z := isoMatrix(Layer{Resistance: col.OutsideResistance}, period)
		for _, l := range col.Layers {
			z = isoMul(z, isoMatrix(l, period))
		}
		z = isoMul(z, isoMatrix(Layer{Resistance: col.InsideResistance}, period))
		y12, y11, y22 := -1/z[0][1], -z[0][0]/z[0][1], -z[1][1]/z[0][1]
		tp := period / (2 * math.Pi)
		k1 := tp * cmplx.Abs((z[0][0]-1)/z[0][1])
		k2 := tp * cmplx.Abs((z[1][1]-1)/z[0][1])
		if r := cmplx.Abs(y11) / cmplx.Abs(y22); math.Abs(r-1) < 0.05 {
			continue // too close to symmetric to tell the sides apart
		}
		checked++

		p, err := Periodic(col, period)
		if err != nil {
			t.Fatal(err)
		}
		rel := func(name string, got, want float64) {
			t.Helper()
			if math.Abs(got-want) > 1e-9*math.Max(1, math.Abs(want)) {
				t.Errorf("trial %d (%d layers): %s = %.10g, ISO equations %.10g", trial, len(col.Layers), name, got, want)
			}
		}
		rel("|Y12|", p.PeriodicTransmittance, cmplx.Abs(y12))
		rel("|Y11|", p.InsideAdmittance, cmplx.Abs(y11))
		rel("|Y22|", p.OutsideAdmittance, cmplx.Abs(y22))
		rel("Y11 lead (s)", p.InsideAdmittanceLead, tp*cmplx.Phase(y11))
		rel("Y22 lead (s)", p.OutsideAdmittanceLead, tp*cmplx.Phase(y22))
		rel("kappa1", p.InsideArealHeatCapacity, k1)
		rel("kappa2", p.OutsideArealHeatCapacity, k2)
		lag := math.Mod(-tp*cmplx.Phase(y12)+period, period)
		rel("time shift (s)", p.TimeShift, lag)
		if cmplx.Abs(p.Y22-y22) > 1e-9*cmplx.Abs(y22) || cmplx.Abs(p.Y11-y11) > 1e-9*cmplx.Abs(y11) {
			t.Errorf("trial %d: complex admittances %v %v, ISO equations %v %v", trial, p.Y11, p.Y22, y11, y22)
		}
	}
	if checked < 20 {
		t.Fatalf("test set-up: only %d asymmetric walls checked", checked)
	}
	t.Logf("%d asymmetric walls agree with the ISO 13786 equations", checked)
}
