package solver

import (
	"math"
	"math/cmplx"
	"testing"
)

// This file holds checks against sources outside the transfer-matrix
// method: an independent finite-volume discretisation of the periodic heat
// equation and published closed forms.

// tmFVPeriodic solves the complex periodic heat equation
// i omega C theta = d/dx(lambda d theta/dx) on a vertex-centred grid with n
// cells per penetration depth (at least 4 per layer), times refine: nodes on every
// interface, lumped half-cell capacities, series conductances, massless
// layers as a conductance between two nodes, surface resistances to the
// environments (Rse or Rsi = 0 imposes the temperature). It returns the
// node positions and temperatures for outside and inside environment
// amplitudes te, ti, and the heat flux densities into the inside
// environment (qi, +x) and entering from the outside (qo, +x).
// Second-order accurate in the cell size; a complex Thomas sweep solves the
// tridiagonal system. It shares no code with the transfer-matrix solution.
func tmFVPeriodic(c Column, period float64, n, refine int, te, ti complex128) (x []float64, theta []complex128, qo, qi complex128) {
	omega := 2 * math.Pi / period
	var capa []float64 // node heat capacities, J/(m2 K)
	var g []float64    // conductance between node k and k+1, W/(m2 K)
	x = []float64{0}
	capa = []float64{0}
	pos := 0.0
	for _, l := range c.Layers {
		if l.Massless() {
			g = append(g, 1/l.Resistance)
			capa = append(capa, 0)
			x = append(x, pos)
			continue
		}
		delta := LayerPenetrationDepth(l, period)
		m := refine * max(4, int(math.Ceil(float64(n)*l.Thickness/delta)))
		h := l.Thickness / float64(m)
		for range m {
			capa[len(capa)-1] += l.HeatCapacity * h / 2
			g = append(g, l.Conductivity/h)
			capa = append(capa, l.HeatCapacity*h/2)
			pos += h
			x = append(x, pos)
		}
	}
	N := len(capa)
	lo := make([]complex128, N)
	di := make([]complex128, N)
	up := make([]complex128, N)
	rhs := make([]complex128, N)
	for k := range N {
		di[k] = complex(0, omega*capa[k])
		if k > 0 {
			di[k] += complex(g[k-1], 0)
			lo[k] = complex(-g[k-1], 0)
		}
		if k < N-1 {
			di[k] += complex(g[k], 0)
			up[k] = complex(-g[k], 0)
		}
	}
	// Boundaries: a very large conductance stands in for a zero resistance.
	gse, gsi := 1e12, 1e12
	if c.OutsideResistance > 0 {
		gse = 1 / c.OutsideResistance
	}
	if c.InsideResistance > 0 {
		gsi = 1 / c.InsideResistance
	}
	di[0] += complex(gse, 0)
	rhs[0] += complex(gse, 0) * te
	di[N-1] += complex(gsi, 0)
	rhs[N-1] += complex(gsi, 0) * ti
	// Thomas algorithm.
	for k := 1; k < N; k++ {
		w := lo[k] / di[k-1]
		di[k] -= w * up[k-1]
		rhs[k] -= w * rhs[k-1]
	}
	theta = make([]complex128, N)
	theta[N-1] = rhs[N-1] / di[N-1]
	for k := N - 2; k >= 0; k-- {
		theta[k] = (rhs[k] - up[k]*theta[k+1]) / di[k]
	}
	// Surface fluxes from the discrete energy balance of the end nodes (exact
	// for the discrete system, and free of the cancellation in
	// gse (te - theta0) when gse stands in for a zero resistance).
	iw := complex(0, omega)
	qo = iw*complex(capa[0], 0)*theta[0] + complex(g[0], 0)*(theta[0]-theta[1])
	qi = complex(g[N-2], 0)*(theta[N-2]-theta[N-1]) - iw*complex(capa[N-1], 0)*theta[N-1]
	return x, theta, qo, qi
}

// TestFiniteVolumeCrossCheck: Y12, Y11, Y22 and the temperature profile of
// several walls against the independent finite-volume solution, Richardson
// extrapolated from 200 and 400 cells per penetration depth (nested grids), to
// 1e-9 (relative for Y, K per K of forcing for the profile) [derived:
// second-order discretisation of the heat equation; measured agreement about
// 1e-11].
func TestFiniteVolumeCrossCheck(t *testing.T) {
	walls := map[string]Column{
		"TABULA":              tmTabula(),
		"cavity with air gap": {Layers: []Layer{tmWith(tmBrick, 0.105), {Resistance: 0.18}, tmWith(tmMinWool, 0.08), tmWith(tmConcrete, 0.15), tmWith(tmPlaster, 0.015)}, OutsideResistance: 0.04, InsideResistance: 0.13},
		"timber, no Rs":       {Layers: []Layer{tmWith(tmSoftwood, 0.06), tmWith(tmMinWool, 0.12), tmWith(tmPlaster, 0.0125)}},
		"heavy 0.6 m":         {Layers: []Layer{tmWith(tmConcrete, 0.6)}, OutsideResistance: 0.04, InsideResistance: 0.13},
	}
	for name, c := range walls {
		for _, period := range []float64{3600 * 6, tmDay} {
			p, err := Periodic(c, period)
			if err != nil {
				t.Fatal(err)
			}
			fv := func(te, ti complex128) ([]float64, []complex128, complex128, complex128) {
				x1, th1, qo1, qi1 := tmFVPeriodic(c, period, 200, 1, te, ti)
				x2, th2, qo2, qi2 := tmFVPeriodic(c, period, 200, 2, te, ti)
				// The fine grid halves every cell of the coarse one; match the
				// coarse nodes in order (a massless layer gives two nodes at
				// the same position, in the same order on both grids).
				th := make([]complex128, len(x1))
				j := 0
				for i := range x1 {
					for math.Abs(x2[j]-x1[i]) > 1e-12 {
						j++
					}
					th[i] = (4*th2[j] - th1[i]) / 3
					j++
				}
				return x1, th, (4*qo2 - qo1) / 3, (4*qi2 - qi1) / 3
			}
			x, th, qo, qi := fv(1, 0)
			_, _, qoI, qiI := fv(0, 1)
			for _, chk := range []struct {
				what      string
				got, want complex128
			}{
				{"Y12 (flux into the room)", p.Y12, qi},
				{"Y22 (flux entering outside)", p.Y22, qo},
				{"Y11 (flux from the room into the wall, -x)", p.Y11, -qiI},
				{"Y12 (reciprocity: flux to outside, -x)", p.Y12, -qoI},
			} {
				if e := tmCRel(chk.got, chk.want); e > 1e-9 {
					t.Errorf("%s T=%gh: %s = %v, finite volumes %v (rel %.2g)", name, period/3600, chk.what, chk.got, chk.want, e)
				}
			}
			// Profile at the finite-volume nodes (massless layers: the node
			// after the gap is the deeper face, as Harmonic returns).
			temp, _, err := Harmonic(c, period, 1, 0, x)
			if err != nil {
				t.Fatal(err)
			}
			for i := range x {
				if i+1 < len(x) && x[i+1] == x[i] {
					continue // shallower face of a massless layer
				}
				if cmplx.Abs(temp[i]-th[i]) > 1e-9 {
					t.Errorf("%s T=%gh x=%g: theta %v, finite volumes %v", name, period/3600, x[i], temp[i], th[i])
					break
				}
			}
		}
	}
}

// TestSemiInfinitePeriodicClosedForm: steady-periodic temperature in a
// semi-infinite body whose surface follows Ti + dT sin(omega t),
// T = Ti + dT exp(-x m) sin(omega t - x m), m = sqrt(omega/(2a))
// (Carslaw and Jaeger, Conduction of Heat in Solids, 2nd ed., section 2.6,
// periodic surface temperature; Nellis and Klein, Heat Transfer, 2009,
// semi-infinite body with a periodic surface temperature [memory]). Case of our own: Ti = 293 K, dT = 15 K,
// omega = 7.272 rad/s, a = 1.1e-4 m2/s, x = 0.01 m, t = 0.5 s. By hand
// [derived]: m = sqrt(7.272 / 2.2e-4) = 181.81 1/m, x m = 1.8181,
// exp(-1.8181) = 0.16233, sin(3.636 - 1.8181) = sin(1.8179) = 0.96962,
// T = 293 + 15 x 0.16233 x 0.96962 = 295.361 K.
func TestSemiInfinitePeriodicClosedForm(t *testing.T) {
	const (
		ti, dT, omega, a, x, tm = 293.0, 15.0, 7.272, 1.1e-4, 0.01, 0.5
	)
	period := 2 * math.Pi / omega
	c := Column{Layers: []Layer{{Thickness: 0.001, Conductivity: 1, HeatCapacity: 1 / a}}, HalfSpace: true}
	// dT sin(omega t) = Re(-i dT exp(i omega t)).
	temp, _, err := Harmonic(c, period, complex(0, -dT), 0, []float64{x})
	if err != nil {
		t.Fatal(err)
	}
	got := ti + real(temp[0]*cmplx.Exp(complex(0, omega*tm)))
	if math.Abs(got-295.361) > 0.002 {
		t.Errorf("T = %.4f K, hand value 295.361 K", got)
	}
	m := math.Sqrt(omega / (2 * a))
	if want := ti + dT*math.Exp(-m*x)*math.Sin(omega*tm-m*x); math.Abs(got-want) > 1e-10 {
		t.Errorf("T = %.12f K, closed form %.12f K", got, want)
	}
}

// TestSlabPrescribedSurfaces: a slab 0 < x < L with periodic surface
// temperatures A (x = 0) and B (x = L) and no surface resistances has
// theta(x) = [A sinh(k(L-x)) + B sinh(k x)] / sinh(k L), k = (1+i)/delta
// (Carslaw and Jaeger, Conduction of Heat in Solids, 2nd ed., section 3.6,
// periodic surface temperature of a slab, form [memory]; it solves
// d2theta/dx2 = k^2 theta with the two boundary values [derived]).
func TestSlabPrescribedSurfaces(t *testing.T) {
	for _, tc := range []struct {
		l      Layer
		d, per float64
	}{{tmConcrete, 0.2, tmDay}, {tmBrick, 0.35, 6 * 3600}, {tmWetClay, 3, tmYear}, {tmSoftwood, 0.04, 3600}} {
		c := Column{Layers: []Layer{tmWith(tc.l, tc.d)}}
		A, B := complex(4, -1), complex(-0.5, 2)
		var x []float64
		for i := range 11 {
			x = append(x, tc.d*float64(i)/10)
		}
		temp, flux, err := Harmonic(c, tc.per, A, B, x)
		if err != nil {
			t.Fatal(err)
		}
		k := complex(1, 1) / complex(LayerPenetrationDepth(tc.l, tc.per), 0)
		L := complex(tc.d, 0)
		lam := complex(tc.l.Conductivity, 0)
		for i, xi := range x {
			X := complex(xi, 0)
			want := (A*cmplx.Sinh(k*(L-X)) + B*cmplx.Sinh(k*X)) / cmplx.Sinh(k*L)
			// q = -lambda dtheta/dx.
			wantQ := -lam * k * (-A*cmplx.Cosh(k*(L-X)) + B*cmplx.Cosh(k*X)) / cmplx.Sinh(k*L)
			if cmplx.Abs(temp[i]-want) > 1e-12*cmplx.Abs(A) || cmplx.Abs(flux[i]-wantQ) > 1e-11*cmplx.Abs(lam*k*A) {
				t.Errorf("%s x=%g: theta %v q %v, closed form %v %v", tc.l.Name, xi, temp[i], flux[i], want, wantQ)
			}
		}
	}
}

// TestSwingDepthClosedForm: the depth where the amplitude has fallen to a
// fraction r of the surface value is d ln(1/r), d = sqrt(2a/omega), the
// damping depth of the periodic half-space solution (Carslaw and Jaeger,
// section 2.6; Hillel, Introduction to Soil Physics, 1982, chapter on soil
// temperature [memory]). Case of our own: a = 2e-7 m2/s, annual cycle,
// 5 % of the surface swing -> d = sqrt(2e-7 x 31.536e6 / pi) = 1.41691 m,
// z = d ln 20 = 4.2447 m [derived by hand]; the depths where the daily and
// annual swings fall to 1/20 are in the ratio sqrt(365) [derived: d scales
// with sqrt(period)].
func TestSwingDepthClosedForm(t *testing.T) {
	soil := Layer{Thickness: 1, Conductivity: 0.4, HeatCapacity: 0.4 / 2e-7}
	c := Column{Layers: []Layer{soil}, HalfSpace: true}
	za, err := SwingDepth(c, tmYear, 1, 0.05)
	if err != nil {
		t.Fatal(err)
	}
	d := math.Sqrt(2 * 2e-7 / (2 * math.Pi / tmYear))
	if tmRel(za, d*math.Log(20)) > 1e-12 || math.Abs(za-4.2447) > 5e-5 {
		t.Errorf("annual 5%% depth %.6g m, want d ln 20 = %.6g m (4.2447 m by hand)", za, d*math.Log(20))
	}
	zd, err := SwingDepth(c, tmDay, 1, 0.05)
	if err != nil {
		t.Fatal(err)
	}
	if tmRel(za/zd, math.Sqrt(365)) > 1e-12 {
		t.Errorf("annual/daily depth ratio %.12g, want sqrt(365) = %.12g", za/zd, math.Sqrt(365))
	}
}
