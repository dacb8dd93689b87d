package ground

import (
	"errors"
	"fmt"
	"math"

	"tempstack/solver"
)

// secondsPerDay converts an index in K day to K s.
const secondsPerDay = 86400.0

// Stefan returns the depth (m) to which a surface index of the given size
// freezes or thaws a soil, by Stefan's formula: all heat is latent heat
// conducted through the frozen (thawed) layer with a linear temperature
// profile, the sensible heat neglected:
//
//	X = sqrt(2 k I 86400 / L)
//
// with k the conductivity of the layer the heat crosses (W/(m K)): the
// frozen conductivity for frost depth, the unfrozen one for thaw depth;
// I the surface freezing (thawing) index, K day, >= 0; L the latent heat,
// J/m3, > 0 (Stefan 1891, from memory; the form as used in Handy and Spangler, Geotechnical Engineering, 5th ed. 2007,
// Example 11.7). Stefan's depth is an upper bound of the
// modified Berggren depth for the same k.
func Stefan(k, latent, index float64) (float64, error) {
	if err := checkStefan(k, latent); err != nil {
		return 0, err
	}
	if !finite(index) || index < 0 {
		return 0, fmt.Errorf("stefan: the surface index must be a degree-day total >= 0, got %g K day", index)
	}
	return math.Sqrt(2 * k * index * secondsPerDay / latent), nil
}

// StefanIndex is the inverse of Stefan: the surface index (K day) that
// freezes or thaws a soil to depth x (m), I = L x^2 / (2 k 86400).
func StefanIndex(k, latent, depth float64) (float64, error) {
	if err := checkStefan(k, latent); err != nil {
		return 0, err
	}
	if !finite(depth) || depth < 0 {
		return 0, fmt.Errorf("stefan: depth must be >= 0, got %g m", depth)
	}
	return latent * depth * depth / (2 * k * secondsPerDay), nil
}

func checkStefan(k, latent float64) error {
	if !finite(k) || k <= 0 {
		return fmt.Errorf("stefan: conductivity must be positive, got %g W/(m K)", k)
	}
	if !finite(latent) || latent <= 0 {
		return fmt.Errorf("stefan: latent heat must be positive, got %g J/m3 (a soil without water has no Stefan depth)", latent)
	}
	return nil
}

// BerggrenCoefficient returns the correction coefficient lambda of the
// modified Berggren formula (Aldrich and Paynter 1953; US Army TM 5-852-6 /
// UFC 3-130-06) for the thermal ratio alpha >= 0 and the fusion parameter
// mu > 0, and the root xi it comes from.
//
// lambda is computed from the two-phase Neumann solution with equal frozen
// and unfrozen properties (Aldrich and Paynter 1953 [memory]; [derived]), not read from the
// manuals' chart: xi solves
//
//	f(xi) = mu exp(-xi^2) [1/erf(xi) - alpha/erfc(xi)] - sqrt(pi) xi = 0
//
// and lambda = xi sqrt(2/mu).
//
// Root: for xi > 0 every term of f is strictly decreasing (exp(-x^2)/erf(x)
// decreases; exp(-x^2)/erfc(x) increases by the Mills-ratio inequality
// erfc(x) < exp(-x^2)/(x sqrt(pi)); -sqrt(pi) x decreases), f -> +inf as
// xi -> 0+ and f -> -inf as xi -> inf, so the positive root is unique. For
// xi >= 1, erf(xi) >= 0.8427 gives f < mu exp(-xi^2)/0.8427 - sqrt(pi) xi,
// which is negative at xi_hi = max(1, sqrt(ln mu)); the root lies in
// (0, xi_hi] and is found by bisection on f erf erfc (same sign, finite at 0)
// to a relative width of 1e-15. lambda lies in (0, 1] and tends to 1 as
// mu -> 0 (xi^2 -> mu/2).
func BerggrenCoefficient(alpha, mu float64) (lambda, xi float64, err error) {
	if !finite(alpha) || alpha < 0 {
		return 0, 0, fmt.Errorf("berggren: thermal ratio alpha must be >= 0, got %g (a mean annual temperature below freezing is permafrost, outside the method)", alpha)
	}
	if !finite(mu) || mu <= 0 {
		return 0, 0, fmt.Errorf("berggren: fusion parameter mu must be positive, got %g", mu)
	}
	// g = f erf erfc: finite on [0, hi], g(0) = mu > 0.
	g := func(x float64) float64 {
		ef, ec := math.Erf(x), math.Erfc(x)
		return mu*math.Exp(-x*x)*(ec-alpha*ef) - math.SqrtPi*x*ef*ec
	}
	lo, hi := 0.0, 1.0
	if mu > math.E {
		hi = math.Sqrt(math.Log(mu))
	}
	if g(hi) >= 0 {
		return 0, 0, fmt.Errorf("berggren: no root bracketed for alpha %g, mu %g", alpha, mu)
	}
	for i := 0; i < 200 && hi-lo > 1e-15*hi; i++ {
		mid := 0.5 * (lo + hi)
		if g(mid) > 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	xi = 0.5 * (lo + hi)
	return xi * math.Sqrt(2/mu), xi, nil
}

// BerggrenInput describes a modified Berggren frost depth problem.
//
// The index and the temperatures are relative to 0 degC: the method treats
// freezing as isothermal at 0 degC; the Freeze.Point and Freeze.Range of
// the layers are not used.
type BerggrenInput struct {
	// SurfaceIndex is the surface freezing index F_s, K day (> 0): the air
	// index times the n-factor of the surface (see NFactor).
	SurfaceIndex float64
	// SeasonDays is the length t of the freezing season, days (> 0).
	SeasonDays float64
	// MeanAnnual is the mean annual temperature, degC (>= 0); v0 = MeanAnnual
	// is its difference above freezing. The manuals use the mean annual air
	// temperature.
	MeanAnnual float64
	// Layers is the profile from the surface down; the last layer, which
	// continues downward without end, must have Freeze set with
	// LatentHeat > 0. Layers above it may lack latent heat (pavement,
	// insulation, a dry base) or be massless resistances (see
	// ModifiedBerggren). A homogeneous soil is one layer (any thickness).
	Layers []solver.Layer
}

// BerggrenResult is the outcome of ModifiedBerggren. Alpha, Mu, Lambda and
// Xi are those of the final (frozen-through) depth: in a layered soil mu
// and lambda use the depth-weighted properties down to the frost line.
type BerggrenResult struct {
	Depth        float64 // frost depth X, m
	Alpha        float64 // thermal ratio v0 / vs
	Mu           float64 // fusion parameter C vs / L
	Lambda       float64 // correction coefficient, 0 < lambda <= 1
	Xi           float64 // root of the Neumann equation, lambda = xi sqrt(2/mu)
	Layer        int     // index of the layer that holds the frost line
	SurfaceSpeed float64 // vs = F_s / t, K: mean surface temperature below freezing during the season
	// Needed lists the cumulative surface index (K day) that freezes
	// through the bottom of each layer reached; the last entry is for the
	// whole frost depth (equal to SurfaceIndex up to round-off).
	Needed []float64
}

// ModifiedBerggren returns the frost depth by the modified Berggren
// formula. For one layer (homogeneous soil):
//
//	X = lambda sqrt(2 k F_s 86400 / L)
//
// with k the mean of the frozen and unfrozen conductivities, L the latent
// heat (J/m3), F_s the surface index (K day), and lambda from
// BerggrenCoefficient(alpha, mu), alpha = v0/vs, vs = F_s/t,
// mu = C vs / L, C the mean of the frozen and unfrozen volumetric heat
// capacities (Aldrich and Paynter 1953; TM 5-852-6 / AFR 88-19 Vol. 6,
// 1988 [memory]).
//
// Layered soil (multilayer procedure of TM 5-852-6 / UFC 3-130-06 as this
// package implements it; procedure from memory): layer i has thickness d_i,
// resistance R_i = d_i / k_i with k_i the mean of its frozen and unfrozen
// conductivities. The index that freezes through layer n, once layers
// 1..n-1 are frozen, is
//
//	dF_n = L_n d_n (R_1 + ... + R_(n-1) + R_n / 2) / (86400 lambda_n^2)
//
// where lambda_n = BerggrenCoefficient(alpha, mu_n) with mu_n = C_avg vs /
// L_avg and C_avg, L_avg the thickness-weighted means over layers 1..n.
// The indices are summed until the sum passes F_s; inside that layer the
// frozen part x solves the same expression with d_n = x (and the weighted
// means taken down to x), by fixed-point iteration on the quadratic in x
// (bisection as a fallback). For identical layers this reduces
// exactly to the homogeneous formula. When F_s exceeds the sum for all
// layers, the last layer is taken to continue downward.
//
// Pavement and insulation layers (no latent heat) need no index of their
// own (dF = 0 with L_n = 0): the frost passes them at once, they add their
// resistance (conductivity, or the mean of frozen and unfrozen when both
// are given) to the layers below and their heat capacity (with zero
// latent heat) to the weighted means, as the multilayer procedure of the
// manuals treats them; a massless layer adds its resistance only.
func ModifiedBerggren(in BerggrenInput) (BerggrenResult, error) {
	if err := in.validate(); err != nil {
		return BerggrenResult{}, err
	}
	vs := in.SurfaceIndex / in.SeasonDays
	alpha := in.MeanAnnual / vs
	res := BerggrenResult{Alpha: alpha, SurfaceSpeed: vs}
	fz := berggrenFront{vs: vs, alpha: alpha}
	cum := 0.0 // index that freezes through the layers passed, K day

	last := len(in.Layers) - 1
	for i, l := range in.Layers {
		if i == last && (l.Massless() || latentHeat(l) == 0) {
			return BerggrenResult{}, fmt.Errorf("berggren: the frost reaches the deepest layer %d (%q), which has no latent heat, so the method puts no bound on the frost depth", i+1, l.Name)
		}
		if l.Massless() {
			fz.sumR += l.Resistance
			res.Needed = append(res.Needed, cum)
			continue
		}
		if i < last && latentHeat(l) == 0 {
			// Freezes at once: adds its resistance and heat capacity.
			res.Needed = append(res.Needed, cum)
			fz.pass(l)
			continue
		}
		if i < last {
			dF, lambda, mu, xi, err := fz.needed(l, l.Thickness)
			if err != nil {
				return BerggrenResult{}, err
			}
			if cum+dF <= in.SurfaceIndex {
				cum += dF
				res.Needed = append(res.Needed, cum)
				fz.pass(l)
				if cum == in.SurfaceIndex {
					res.Depth, res.Lambda, res.Mu, res.Xi, res.Layer = fz.sumD, lambda, mu, xi, i
					return res, nil
				}
				continue
			}
		}
		// The frost line is in layer i: find x with cum + dF(x) = F_s.
		x, err := fz.depthIn(l, in.SurfaceIndex-cum, i == last)
		if err != nil {
			return BerggrenResult{}, err
		}
		dF, lambda, mu, xi, err := fz.needed(l, x)
		if err != nil {
			return BerggrenResult{}, err
		}
		res.Needed = append(res.Needed, cum+dF)
		res.Depth, res.Lambda, res.Mu, res.Xi, res.Layer = fz.sumD+x, lambda, mu, xi, i
		return res, nil
	}
	return BerggrenResult{}, errors.New("berggren: internal error: frost line not placed")
}

// berggrenFront is the state of ModifiedBerggren's walk down the layers:
// the surface speed and thermal ratio, and running sums over the layers
// the frost has already passed.
type berggrenFront struct {
	vs    float64 // surface speed F_s / t, K
	alpha float64 // thermal ratio v0 / vs
	sumR  float64 // resistance of the layers passed, m2 K/W
	sumD  float64 // their thickness, m
	sumC  float64 // their heat capacity per area, J/(m2 K)
	sumL  float64 // their latent heat per area, J/m2
}

// pass adds a massive layer l, frozen through, to the running sums: its
// resistance d/k (k the mean conductivity), thickness, heat capacity and
// latent heat (zero for pavement or insulation).
func (fz *berggrenFront) pass(l solver.Layer) {
	fz.sumR += l.Thickness / meanConductivity(l)
	fz.sumD += l.Thickness
	fz.sumC += meanHeatCapacity(l) * l.Thickness
	if lat := latentHeat(l); lat != 0 {
		fz.sumL += lat * l.Thickness
	}
}

// needed returns the index dF (K day) to freeze x metres of layer l below
// the layers passed, with its coefficient lambda, the fusion parameter mu
// of the weighted means down to x and the Neumann root xi:
//
//	dF = L x (R_passed + x/(2k)) / (86400 lambda^2)
//
// A layer without latent heat needs no index (dF = 0, lambda = 1, mu
// infinite).
func (fz *berggrenFront) needed(l solver.Layer, x float64) (dF, lambda, mu, xi float64, err error) {
	k := meanConductivity(l)
	c := meanHeatCapacity(l)
	lat := latentHeat(l)
	if lat == 0 {
		return 0, 1, math.Inf(1), 0, nil
	}
	vs, sumR := fz.vs, fz.sumR
	d := fz.sumD + x
	cAvg := (fz.sumC + c*x) / d
	lAvg := (fz.sumL + lat*x) / d
	mu = cAvg * vs / lAvg
	lambda, xi, err = BerggrenCoefficient(fz.alpha, mu)
	if err != nil {
		return 0, 0, 0, 0, err
	}
	dF = lat * x * (sumR + x/(2*k)) / (secondsPerDay * lambda * lambda)
	return dF, lambda, mu, xi, nil
}

// depthIn returns the frozen part x (m) of layer l that needs the index
// rest (K day) left when the frost reaches its top; the deepest layer
// (last) continues without end. It tries the fixed point first and falls
// back to bisection.
func (fz *berggrenFront) depthIn(l solver.Layer, rest float64, last bool) (float64, error) {
	maxX := l.Thickness
	if last {
		maxX = math.Inf(1)
	}
	x, ok, err := fz.fixedPointDepth(l, rest, maxX)
	if err != nil || ok {
		return x, err
	}
	return fz.bisectDepth(l, rest, last)
}

// fixedPointDepth solves dF(x) = rest for 0 < x <= maxX by fixed-point
// iteration: for a given lambda, dF(x) = rest is a quadratic in x,
//
//	x^2/(2k) + R x = rest 86400 lambda^2 / L,
//
// solved in its cancellation-free form; then lambda is updated for the
// new depth. lambda varies slowly with x (only through the weighted
// means), so this converges in a few steps; exactly one for a single
// layer. ok is false when an iterate leaves (0, maxX] or the steps run
// out.
func (fz *berggrenFront) fixedPointDepth(l solver.Layer, rest, maxX float64) (x float64, ok bool, err error) {
	sumR := fz.sumR
	k := meanConductivity(l)
	x = math.NaN()
	_, lambda, _, _, err := fz.needed(l, math.Min(maxX, math.Max(l.Thickness, 1e-3)))
	if err != nil {
		return 0, false, err
	}
	for n := 0; n < fixedPointSteps; n++ {
		q := rest * secondsPerDay * lambda * lambda / latentHeat(l)
		xn := 2 * q / (sumR + math.Sqrt(sumR*sumR+2*q/k))
		if !(xn > 0 && xn <= maxX) {
			break
		}
		_, lambda, _, _, err = fz.needed(l, xn)
		if err != nil {
			return 0, false, err
		}
		if math.Abs(xn-x) <= 1e-13*xn {
			return xn, true, nil
		}
		x = xn
	}
	return x, false, nil
}

// bisectDepth solves dF(x) = rest by bisection, the fallback of
// fixedPointDepth. dF grows without bound, so in the last layer the upper
// end is doubled until it brackets.
func (fz *berggrenFront) bisectDepth(l solver.Layer, rest float64, last bool) (float64, error) {
	hi := l.Thickness
	if last {
		for n := 0; ; n++ {
			dF, _, _, _, err := fz.needed(l, hi)
			if err != nil {
				return 0, err
			}
			if dF >= rest {
				break
			}
			if n > 200 {
				return 0, errors.New("berggren: frost depth does not converge")
			}
			hi *= 2
		}
	}
	lo := 0.0
	for n := 0; n < 200 && hi-lo > 1e-13*hi; n++ {
		mid := 0.5 * (lo + hi)
		dF, _, _, _, err := fz.needed(l, mid)
		if err != nil {
			return 0, err
		}
		if dF < rest {
			lo = mid
		} else {
			hi = mid
		}
	}
	return 0.5 * (lo + hi), nil
}

// fixedPointSteps bounds the fixed-point iteration of ModifiedBerggren
// before it falls back to bisection (a variable so that the tests can force
// the fallback).
var fixedPointSteps = 50

// meanConductivity is the mean of the frozen and unfrozen conductivity,
// W/(m K); a layer without freezing data has one conductivity.
func meanConductivity(l solver.Layer) float64 {
	if l.Freeze == nil || !(l.Freeze.ConductivityFrozen > 0) {
		return l.Conductivity
	}
	return 0.5 * (l.Conductivity + l.Freeze.ConductivityFrozen)
}

// meanHeatCapacity is the mean of the frozen and unfrozen volumetric heat
// capacity, J/(m3 K).
func meanHeatCapacity(l solver.Layer) float64 {
	if l.Freeze == nil || !(l.Freeze.HeatCapacityFrozen > 0) {
		return l.HeatCapacity
	}
	return 0.5 * (l.HeatCapacity + l.Freeze.HeatCapacityFrozen)
}

// latentHeat is the layer's latent heat, J/m3 (0 without freezing data).
func latentHeat(l solver.Layer) float64 {
	if l.Freeze == nil || !(l.Freeze.LatentHeat > 0) {
		return 0
	}
	return l.Freeze.LatentHeat
}

func (in BerggrenInput) validate() error {
	switch {
	case !finite(in.SurfaceIndex) || in.SurfaceIndex <= 0:
		return fmt.Errorf("berggren: the surface freezing index must be positive, got %g K day", in.SurfaceIndex)
	case !finite(in.SeasonDays) || in.SeasonDays <= 0:
		return fmt.Errorf("berggren: the freezing season must last a positive number of days, got %g", in.SeasonDays)
	case !finite(in.MeanAnnual) || in.MeanAnnual < 0:
		return fmt.Errorf("berggren: the mean annual temperature must be >= 0 degC, got %g (below freezing is permafrost, outside the method)", in.MeanAnnual)
	case len(in.Layers) == 0:
		return errors.New("berggren: no soil layers")
	}
	for i, l := range in.Layers {
		if err := l.Validate(); err != nil {
			return fmt.Errorf("berggren: layer %d: %w", i+1, err)
		}
	}
	return nil
}
