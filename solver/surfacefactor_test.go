package solver

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"testing"
)

// TestSurfaceFactorMassless checks the thin-layer limit of the surface
// factor: for a wall without heat capacity Y11 = U, so
// F = 1 - Rsi U = (R + Rse)/(Rsi + R + Rse), real, with no lag: the heat
// absorbed at the inside surface splits between the path to the room (Rsi)
// and the path to the outside (R + Rse) in inverse proportion to their
// resistances [derived]. Seeded random walls of resistance layers, and
// every other one with a 1 nm steel sheet (d/delta ~ 1e-8), which must give
// the same.
func TestSurfaceFactorMassless(t *testing.T) {
	rng := rand.New(rand.NewPCG(15, 2))
	for i := 0; i < 50; i++ {
		rse, rsi := 0.04*rng.Float64(), 0.05+0.2*rng.Float64()
		c := Column{OutsideResistance: rse, InsideResistance: rsi}
		r := 0.0
		for j := 0; j <= rng.IntN(3); j++ {
			l := Layer{Name: "gap", Resistance: 0.05 + 3*rng.Float64()}
			r += l.Resistance
			c.Layers = append(c.Layers, l)
		}
		if i%2 == 1 {
			c.Layers = append(c.Layers, tmWith(tmSteel, 1e-9))
			r += 1e-9 / tmSteel.Conductivity
		}
		for _, period := range []float64{3600, tmDay, 365 * tmDay} {
			p, err := Periodic(c, period)
			if err != nil {
				t.Fatal(err)
			}
			want := (r + rse) / (rsi + r + rse)
			if tmCRel(p.SurfaceFactor, complex(want, 0)) > 1e-5 {
				t.Errorf("case %d, period %g s: F = %v, want (R+Rse)/Rtot = %g", i, period, p.SurfaceFactor, want)
			}
			if math.Abs(p.SurfaceFactorMagnitude-want) > 1e-5 {
				t.Errorf("case %d: |F| = %g, want %g", i, p.SurfaceFactorMagnitude, want)
			}
			if p.SurfaceFactorLag > 1e-5*period {
				t.Errorf("case %d: lag = %g s, want 0", i, p.SurfaceFactorLag)
			}
		}
	}
}

// TestSurfaceFactorHalfSpace checks the thick-layer limit: a slab many
// penetration depths thick looks from the inside like a half-space, whose
// surface admittance is lambda k, k = (1+i)/delta, so
// Y11 = 1/(Rsi + 1/(lambda k)) and F = 1/(1 + Rsi lambda k) [derived from
// the layer transfer matrix of ISO 13786, clause 6, as d/delta -> inf].
// The lag is T/(2 pi) arg(1 + Rsi lambda k), below T/8.
func TestSurfaceFactorHalfSpace(t *testing.T) {
	for _, tc := range []struct {
		l   Layer
		rsi float64
	}{
		{tmConcrete, 0.13}, {tmConcrete, 0.10}, {tmBrick, 0.17}, {tmSoftwood, 0.13}, {tmSteel, 0.13},
	} {
		for _, period := range []float64{3600, tmDay} {
			delta := LayerPenetrationDepth(tc.l, period)
			c := Column{Layers: []Layer{tmWith(tc.l, 40*delta)}, OutsideResistance: 0.04, InsideResistance: tc.rsi}
			p, err := Periodic(c, period)
			if err != nil {
				t.Fatal(err)
			}
			lk := complex(tc.l.Conductivity, 0) * complex(1, 1) / complex(delta, 0)
			wantY := 1 / (complex(tc.rsi, 0) + 1/lk)
			if tmCRel(p.Y11, wantY) > 1e-9 {
				t.Errorf("%s, Rsi %g, period %g: Y11 = %v, want %v", tc.l.Name, tc.rsi, period, p.Y11, wantY)
			}
			wantF := 1 / (1 + complex(tc.rsi, 0)*lk)
			if tmCRel(p.SurfaceFactor, wantF) > 1e-9 {
				t.Errorf("%s, Rsi %g, period %g: F = %v, want %v", tc.l.Name, tc.rsi, period, p.SurfaceFactor, wantF)
			}
			wantLag := period / (2 * math.Pi) * cmplx.Phase(1+complex(tc.rsi, 0)*lk)
			if math.Abs(p.SurfaceFactorLag-wantLag) > 1e-6*period || p.SurfaceFactorLag >= period/8 {
				t.Errorf("%s, Rsi %g, period %g: lag %g s, want %g s (< T/8)", tc.l.Name, tc.rsi, period, p.SurfaceFactorLag, wantLag)
			}
		}
	}
}

// TestSurfaceFactorHandCalculation checks one layered wall against a hand
// calculation [derived] with the expanded layer matrices of ISO 13786,
// clause 6 (Z11 = Z22 = cosh xi cos xi + i sinh xi sin xi,
// Z12 = -delta/(2 lambda) (sinh xi cos xi + cosh xi sin xi + i (cosh xi sin xi - sinh xi cos xi)),
// Z21 = -lambda/delta (sinh xi cos xi - cosh xi sin xi + i (sinh xi cos xi + cosh xi sin xi))),
// period 24 h, Rse 0.04 and Rsi 0.13 m2 K/W (ISO 6946, horizontal flow):
//
//	220 mm brick, lambda 0.77 W/(m K), rho c 1.75 MJ/(m3 K): delta = 0.1100 m, xi = 2.0000,
//	  Z11 = -1.5653 + 3.2978i, Z12 = -0.13657 - 0.35214i m2 K/W, Z21 = 34.507 - 13.383i W/(m2 K)
//	13 mm plaster, lambda 0.7, rho c 1.176 MJ/(m3 K): delta = 0.12795 m, xi = 0.10161,
//	  Z11 = 0.99998 + 0.01032i, Z12 = -0.018572 - 0.000064i, Z21 = 0.00383 - 1.11177i
//	Z = Z_se Z_brick Z_plaster Z_si: Z11 = -3.5235 + 3.8830i, Z12 = 0.44405 - 1.06059i
//	Y11 = -Z11/Z12 = 4.2986 + 1.5225i: |Y11| = 4.560 W/(m2 K), leading by 1.300 h
//	F = 1 - 0.13 Y11 = 0.44118 - 0.19793i: |F| = 0.4835, lag 24/(2 pi) atan(0.19793/0.44118) = 1.611 h
//
// (for comparison, the same wall without heat capacity: F = 1 - Rsi U = 0.726).
func TestSurfaceFactorHandCalculation(t *testing.T) {
	c := Column{Layers: []Layer{tmWith(tmBrick, 0.22), tmWith(tmPlaster, 0.013)}, OutsideResistance: 0.04, InsideResistance: 0.13}
	p, err := Periodic(c, tmDay)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(p.InsideAdmittance-4.560) > 0.001 || math.Abs(p.InsideAdmittanceLead/3600-1.300) > 0.001 {
		t.Errorf("Y11 = %.4f W/(m2 K) leading %.4f h, hand calculation 4.560 and 1.300 h", p.InsideAdmittance, p.InsideAdmittanceLead/3600)
	}
	if tmCRel(p.SurfaceFactor, complex(0.44118, -0.19793)) > 2e-4 {
		t.Errorf("F = %.5f, hand calculation 0.44118-0.19793i", p.SurfaceFactor)
	}
	if math.Abs(p.SurfaceFactorMagnitude-0.4835) > 0.0005 || math.Abs(p.SurfaceFactorLag/3600-1.611) > 0.001 {
		t.Errorf("|F| = %.4f, lag %.4f h; hand calculation 0.4835 and 1.611 h", p.SurfaceFactorMagnitude, p.SurfaceFactorLag/3600)
	}
}

// TestSurfaceFactorBounds checks, over seeded random layered walls, what
// follows from F = 1/(1 + Rsi Y_s) with arg Y_s in [0, pi/2] for any
// passive conducting structure [derived]: 0 < |F| <= 1, |F| no larger
// than for the same wall without heat capacity, and a lag in [0, T/4);
// and that F = 1 - Rsi Y11 holds for the returned values.
func TestSurfaceFactorBounds(t *testing.T) {
	rng := rand.New(rand.NewPCG(15, 4))
	mats := []Layer{tmConcrete, tmBrick, tmMinWool, tmPlaster, tmSoftwood, tmSteel}
	for i := 0; i < 200; i++ {
		c := Column{OutsideResistance: 0.04, InsideResistance: 0.05 + 0.15*rng.Float64()}
		r := c.OutsideResistance + c.InsideResistance
		for j := 0; j <= rng.IntN(4); j++ {
			l := tmWith(mats[rng.IntN(len(mats))], 0.005+0.3*rng.Float64())
			r += l.ThermalResistance()
			c.Layers = append(c.Layers, l)
		}
		period := 3600 * (1 + 200*rng.Float64())
		p, err := Periodic(c, period)
		if err != nil {
			t.Fatal(err)
		}
		massless := 1 - c.InsideResistance/r
		if !(p.SurfaceFactorMagnitude > 0 && p.SurfaceFactorMagnitude <= massless+1e-12) {
			t.Errorf("case %d: |F| = %g, want in (0, %g]", i, p.SurfaceFactorMagnitude, massless)
		}
		if !(p.SurfaceFactorLag >= 0 && p.SurfaceFactorLag < period/4) {
			t.Errorf("case %d: lag %g s outside [0, T/4) (T = %g s)", i, p.SurfaceFactorLag, period)
		}
		if tmCRel(p.SurfaceFactor, 1-complex(c.InsideResistance, 0)*p.Y11) > 1e-12 {
			t.Errorf("case %d: F = %v is not 1 - Rsi Y11", i, p.SurfaceFactor)
		}
	}
}
