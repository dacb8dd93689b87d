package solver

import (
	"errors"
	"fmt"
	"math"
)

// Closed-form solutions of one-dimensional conduction in a semi-infinite
// solid (x >= 0, x the depth below the surface), used as reference
// solutions by the tests and offered to users as quick estimates.
// Throughout: k conductivity W/(m K), c volumetric heat capacity J/(m3 K),
// a = k/c diffusivity m2/s, t time since the change s, x depth m,
// temperatures degC, fluxes W/m2 positive into the solid.

// Erfcx is the scaled complementary error function exp(x^2) erfc(x),
// computed without overflow for large x (it tends to 1/(x sqrt(pi))).
//
// For x < 5 it is exp(x^2) math.Erfc(x); above, the continued fraction
//
//	erfcx(x) = (1/sqrt(pi)) / (x + (1/2)/(x + 1/(x + (3/2)/(x + 2/(x + ...)))))
//
// (Abramowitz and Stegun 7.1.14), evaluated by the modified Lentz method.
// For x < 0, erfcx(x) = 2 exp(x^2) - erfcx(-x) (which overflows below
// about -26.6).
func Erfcx(x float64) float64 {
	switch {
	case math.IsNaN(x):
		return math.NaN()
	case x < 0:
		return 2*math.Exp(x*x) - Erfcx(-x)
	case x < 5:
		return math.Exp(x*x) * math.Erfc(x)
	case math.IsInf(x, 1):
		return 0
	}
	// Lentz: f = x + a1/(x + a2/(x + ...)), a_j = j/2.
	const tiny = 1e-300
	f := x
	cj, dj := f, 0.0
	for j := 1; j < 200; j++ {
		aj := float64(j) / 2
		dj = x + aj*dj
		if dj == 0 {
			dj = tiny
		}
		cj = x + aj/cj
		if cj == 0 {
			cj = tiny
		}
		dj = 1 / dj
		delta := cj * dj
		f *= delta
		if math.Abs(delta-1) < 1e-16 {
			break
		}
	}
	return 1 / (math.Sqrt(math.Pi) * f)
}

// StepResponseHalfSpace is the response of a semi-infinite solid, initially
// uniform at Ti, to a step of the environment temperature from Ti to Te at
// t = 0 behind the surface resistance r (m2 K/W): it returns
// (T(x,t) - Ti)/(Te - Ti), between 0 and 1. With r = 0 the surface itself
// steps to Te and
//
//	(T - Ti)/(Te - Ti) = erfc(x / (2 sqrt(a t)))
//
// (Incropera et al., Fundamentals of Heat and Mass Transfer, section 5.7,
// case 1, eq. 5.57; Carslaw and Jaeger section 2.4); with r > 0, h = 1/r,
//
//	(T - Ti)/(Te - Ti) = erfc(eta) - exp(h x/k + h^2 a t/k^2) erfc(eta + h sqrt(a t)/k)
//	                   = erfc(eta) - exp(-eta^2) erfcx(eta + beta),
//
// eta = x/(2 sqrt(a t)), beta = h sqrt(a t)/k (Incropera section 5.7, case
// 3, eq. 5.60; the second form avoids overflow). t <= 0 gives 0.
func StepResponseHalfSpace(k, c, r, x, t float64) float64 {
	if t <= 0 {
		return 0
	}
	a := k / c
	eta := x / (2 * math.Sqrt(a*t))
	if r == 0 {
		return math.Erfc(eta)
	}
	beta := math.Sqrt(a*t) / (r * k)
	return math.Erfc(eta) - math.Exp(-eta*eta)*Erfcx(eta+beta)
}

// StepFluxHalfSpace is the heat flux into a semi-infinite solid per kelvin
// of a step of the environment temperature behind the surface resistance
// r, W/(m2 K), at time t after the step: multiply by (Te - Ti). With r = 0
//
//	q / (Te - Ti) = k / sqrt(pi a t)
//
// (Incropera section 5.7, eq. 5.58); with r > 0 it is h (Te - Ts)/(Te - Ti)
// = h erfcx(h sqrt(a t)/k), h = 1/r (from eq. 5.60 at x = 0).
func StepFluxHalfSpace(k, c, r, t float64) float64 {
	if t <= 0 {
		if r == 0 {
			return math.Inf(1)
		}
		return 1 / r
	}
	a := k / c
	if r == 0 {
		return k / math.Sqrt(math.Pi*a*t)
	}
	return Erfcx(math.Sqrt(a*t)/(r*k)) / r
}

// ConstantFluxHalfSpace is the temperature rise T(x,t) - Ti (K) of a
// semi-infinite solid initially at Ti whose surface receives the constant
// flux q (W/m2, into the solid) from t = 0:
//
//	T - Ti = (2 q sqrt(a t/pi) / k) exp(-x^2/(4 a t)) - (q x / k) erfc(x/(2 sqrt(a t)))
//
// (Incropera section 5.7, case 2, eq. 5.59).
func ConstantFluxHalfSpace(k, c, q, x, t float64) float64 {
	if t <= 0 {
		return 0
	}
	a := k / c
	return 2*q*math.Sqrt(a*t/math.Pi)/k*math.Exp(-x*x/(4*a*t)) - q*x/k*math.Erfc(x/(2*math.Sqrt(a*t)))
}

// StepIsothermDepth is the depth (m) at which a semi-infinite solid
// initially at ti, whose surface is held at ts from t = 0, has the
// temperature tx at time t (s), a its diffusivity (m2/s): from the erf
// solution (Incropera eq. 5.57),
//
//	x = 2 sqrt(a t) erfinv((tx - ts)/(ti - ts)).
//
// It returns an error when tx does not lie between ts and ti.
func StepIsothermDepth(a, ti, ts, tx, t float64) (float64, error) {
	f := (tx - ts) / (ti - ts)
	if !(f >= 0 && f < 1) || !(a > 0) || !(t >= 0) {
		return 0, fmt.Errorf("solver: temperature %g is not between the surface %g and the initial %g", tx, ts, ti)
	}
	return 2 * math.Sqrt(a*t) * math.Erfinv(f), nil
}

// StepPenetrationDepth is the depth sqrt(pi a t) (m) reached by a step
// change at the surface of a semi-infinite solid after t seconds (the
// thickness of the linear profile that carries the same surface flux,
// Incropera section 5.7).
func StepPenetrationDepth(a, t float64) float64 { return math.Sqrt(math.Pi * a * t) }

// HalfSpaceTime is the time (s) after a step change of surface temperature
// at which a point at depth d (m) of a semi-infinite solid of diffusivity a
// (m2/s) has seen the fraction frac (0 < frac < 1) of the step. A slab of
// thickness d behaves as a half-space, within about frac of the step, until
// then: its far face has not yet been reached. From erfc(d/(2 sqrt(a t))) =
// frac [derived from Incropera eq. 5.57],
//
//	t = d^2 / (4 a erfcinv(frac)^2),
//
// so for frac = 0.01 the Fourier number a t/d^2 is 0.0754.
func HalfSpaceTime(a, d, frac float64) float64 {
	e := math.Erfcinv(frac)
	return d * d / (4 * a * e * e)
}

// HalfSpaceDepth is the inverse of HalfSpaceTime: the depth (m) a step
// change at the surface of a solid of diffusivity a (m2/s) reaches with the
// fraction frac of its size after t seconds, d = 2 sqrt(a t) erfcinv(frac).
// A column at least this deep stands in for a half-space over a run of
// length t (for frac = 0.01, d = 3.64 sqrt(a t)).
func HalfSpaceDepth(a, t, frac float64) float64 {
	return 2 * math.Sqrt(a*t) * math.Erfcinv(frac)
}

// ContactTemperature is the interface temperature (degC) of two
// semi-infinite bodies at t1 and t2 brought into perfect contact:
//
//	Tc = (b1 t1 + b2 t2) / (b1 + b2),  b = sqrt(k c) the thermal effusivity
//
// (Carslaw and Jaeger section 2.15; Incropera section 5.7, eq. 5.63).
func ContactTemperature(k1, c1, t1, k2, c2, t2 float64) float64 {
	b1, b2 := math.Sqrt(k1*c1), math.Sqrt(k2*c2)
	return (b1*t1 + b2*t2) / (b1 + b2)
}

// fvBisect finds the root of the decreasing or increasing function f on
// [lo, hi], where f(lo) and f(hi) differ in sign, to the floating-point
// resolution.
func fvBisect(f func(float64) float64, lo, hi float64) float64 {
	flo := f(lo)
	for i := 0; i < 200; i++ {
		mid := 0.5 * (lo + hi)
		if mid <= lo || mid >= hi {
			break
		}
		fm := f(mid)
		if fm == 0 {
			return mid
		}
		if (fm < 0) == (flo < 0) {
			lo, flo = mid, fm
		} else {
			hi = mid
		}
	}
	return 0.5 * (lo + hi)
}

// StefanRoot solves the one-phase Stefan problem's transcendental equation
//
//	lambda exp(lambda^2) erf(lambda) = St / sqrt(pi)
//
// for lambda, given the Stefan number St = c (Tf - Ts)/L > 0 (c the
// volumetric heat capacity of the growing phase, Tf the phase-change and
// Ts the surface temperature, L latent heat J/m3). The front is then at
// X = 2 lambda sqrt(a t) (Carslaw and Jaeger section 11.2; Lunardini 1981).
// The root is bracketed and bisected.
func StefanRoot(st float64) (float64, error) {
	if !(st > 0) || math.IsInf(st, 0) {
		return 0, fmt.Errorf("solver: Stefan number must be positive and finite, got %g", st)
	}
	f := func(l float64) float64 { return l*math.Exp(l*l)*math.Erf(l) - st/math.Sqrt(math.Pi) }
	hi := 1.0
	for f(hi) < 0 {
		hi *= 2
	}
	return fvBisect(f, 0, hi), nil
}

// NeumannProblem is a semi-infinite solid, uniformly at Initial, whose
// surface is held at Surface from t = 0, with a phase change at
// FreezingPoint between them (freezing when Surface < FreezingPoint <
// Initial, thawing when Surface > FreezingPoint > Initial). Conductivities
// W/(m K), volumetric heat capacities J/(m3 K), LatentHeat J/m3,
// temperatures degC.
type NeumannProblem struct {
	ConductivityFrozen, HeatCapacityFrozen     float64
	ConductivityUnfrozen, HeatCapacityUnfrozen float64
	LatentHeat                                 float64
	Surface, Initial, FreezingPoint            float64
}

// phases returns the properties of the phase next to the surface (frozen
// when freezing) and of the far phase, and the temperature differences
// seen by each: dn = |Tf - Ts|, df = |Ti - Tf|.
func (p NeumannProblem) phases() (kn, cn, kf, cf, dn, df float64, err error) {
	switch {
	case p.Surface < p.FreezingPoint && p.Initial >= p.FreezingPoint:
		return p.ConductivityFrozen, p.HeatCapacityFrozen, p.ConductivityUnfrozen, p.HeatCapacityUnfrozen,
			p.FreezingPoint - p.Surface, p.Initial - p.FreezingPoint, nil
	case p.Surface > p.FreezingPoint && p.Initial <= p.FreezingPoint:
		return p.ConductivityUnfrozen, p.HeatCapacityUnfrozen, p.ConductivityFrozen, p.HeatCapacityFrozen,
			p.Surface - p.FreezingPoint, p.FreezingPoint - p.Initial, nil
	}
	return 0, 0, 0, 0, 0, 0, errors.New("solver: the freezing point must lie between the surface and the initial temperature")
}

// NeumannFront returns the coefficient m (m/s^0.5) of the two-phase Neumann
// solution: the phase-change front is at X = m sqrt(t) = 2 lambda sqrt(an t),
// an the diffusivity of the phase next to the surface, where lambda solves
// the heat balance at the front (Carslaw and Jaeger section 11.2; Lunardini
// 1981, Heat Transfer in Cold Climates, chapter 3):
//
//	exp(-lambda^2)/erf(lambda) - (kf/kn) nu (dTf/dTn) exp(-lambda^2 nu^2)/erfc(lambda nu)
//	    = lambda sqrt(pi) L / (cn dTn),   nu = sqrt(an/af),
//
// (kn, cn, an near phase; kf, af far phase; dTn = |Tf - Ts|, dTf = |Ti - Tf|).
// exp(-z^2)/erfc(z) is taken as 1/Erfcx(z). The left side minus the right
// falls monotonically from +infinity; the root is bracketed and bisected.
// With Initial = FreezingPoint it reduces to StefanRoot.
func NeumannFront(p NeumannProblem) (m float64, err error) {
	kn, cn, kf, cf, dn, df, err := p.phases()
	if err != nil {
		return 0, err
	}
	if !(kn > 0 && cn > 0 && kf > 0 && cf > 0) || !(p.LatentHeat >= 0) {
		return 0, errors.New("solver: Neumann problem needs positive conductivities and heat capacities and a non-negative latent heat")
	}
	an, af := kn/cn, kf/cf
	nu := math.Sqrt(an / af)
	g := func(l float64) float64 {
		return math.Exp(-l*l)/math.Erf(l) - kf/kn*nu*df/dn/Erfcx(l*nu) - l*math.Sqrt(math.Pi)*p.LatentHeat/(cn*dn)
	}
	lo, hi := 1e-12, 1.0
	for g(hi) > 0 {
		hi *= 2
		if hi > 1e6 {
			return 0, errors.New("solver: Neumann front equation has no root")
		}
	}
	l := fvBisect(g, lo, hi)
	return 2 * l * math.Sqrt(an), nil
}

// NeumannTemperature is the temperature (degC) of the Neumann solution at
// depth x (m) and time t (s), for the front coefficient m of NeumannFront:
//
//	x < X:  T = Ts + (Tf - Ts) erf(x/(2 sqrt(an t))) / erf(lambda)
//	x > X:  T = Ti - (Ti - Tf) erfc(x/(2 sqrt(af t))) / erfc(lambda nu)
//
// (Carslaw and Jaeger section 11.2).
func NeumannTemperature(p NeumannProblem, m, x, t float64) float64 {
	kn, cn, kf, cf, _, _, err := p.phases()
	if err != nil || t <= 0 {
		return p.Initial
	}
	an, af := kn/cn, kf/cf
	l := m / (2 * math.Sqrt(an))
	if x < m*math.Sqrt(t) {
		return p.Surface + (p.FreezingPoint-p.Surface)*math.Erf(x/(2*math.Sqrt(an*t)))/math.Erf(l)
	}
	return p.Initial - (p.Initial-p.FreezingPoint)*math.Erfc(x/(2*math.Sqrt(af*t)))/math.Erfc(l*math.Sqrt(an/af))
}

// PlaneWallEigen returns the first n roots zeta_j of zeta tan(zeta) = bi
// (bi = h L / k the Biot number of a plane wall of half-thickness L) and
// the coefficients C_j = 4 sin(zeta_j) / (2 zeta_j + sin(2 zeta_j)) of the
// series solution for a wall initially uniform, cooled on both faces
// (Incropera et al., section 5.5.1, eqs. 5.39-5.39c). The j-th root lies in
// ((j-1) pi, (j-1) pi + pi/2) and is bracketed there.
func PlaneWallEigen(bi float64, n int) (zeta, c []float64, err error) {
	if !(bi > 0) || math.IsInf(bi, 0) || n < 1 {
		return nil, nil, fmt.Errorf("solver: plane wall needs a positive finite Biot number and n >= 1, got %g, %d", bi, n)
	}
	zeta, c = make([]float64, n), make([]float64, n)
	for j := range zeta {
		lo := float64(j) * math.Pi
		hi := lo + math.Pi/2*(1-1e-15)
		f := func(z float64) float64 { return z*math.Sin(z) - bi*math.Cos(z) }
		z := fvBisect(f, lo, hi)
		zeta[j] = z
		c[j] = 4 * math.Sin(z) / (2*z + math.Sin(2*z))
	}
	return zeta, c, nil
}

// PlaneWallCooling is the dimensionless temperature
// (T - Tinf)/(Ti - Tinf) of a plane wall of half-thickness L, initially at
// Ti, whose two faces exchange heat with an environment at Tinf through
// h = 1/R from t = 0, at x* = x/L from the mid-plane and Fourier number
// Fo = a t / L^2, Biot number bi = h L / k: the series
//
//	theta = sum_j C_j exp(-zeta_j^2 Fo) cos(zeta_j x*)
//
// (Incropera section 5.5.1, eq. 5.39a) with the given number of terms.
func PlaneWallCooling(bi, fo, xstar float64, terms int) (float64, error) {
	zeta, c, err := PlaneWallEigen(bi, terms)
	if err != nil {
		return 0, err
	}
	var th float64
	for j := range zeta {
		th += c[j] * math.Exp(-zeta[j]*zeta[j]*fo) * math.Cos(zeta[j]*xstar)
	}
	return th, nil
}
