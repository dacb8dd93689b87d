package solver

import "math"

// fvPhase is the enthalpy-temperature relation of a freezing layer.
//
// With Tl = Point - Range the lower end of the freezing range, the liquid
// (unfrozen) fraction is phi = 0 below Tl, 1 above Point and linear in
// between; the volumetric heat capacity and the conductivity are blended by
// phi: C = Cf + phi (Cu - Cf), k = kf + phi (ku - kf). The volumetric
// enthalpy, measured from the frozen state at Tl, is
//
//	H(T) = Cf (T - Tl)                                          T <= Tl
//	H(T) = Cf u + (Cu - Cf) u^2 / (2 R) + L u / R,  u = T - Tl  Tl < T < Point
//	H(T) = Hp + Cu (T - Point),  Hp = R (Cf + Cu)/2 + L          T >= Point
//
// (H = integral of C dT + L phi, the enthalpy method of Voller and
// Swaminathan, Numer. Heat Transfer B 19 (1991) 175). For Range = 0 the
// middle branch collapses: at T = Point the enthalpy takes any value in
// [0, L] and phi = H / L.
type fvPhase struct {
	tl, tp  float64 // lower and upper ends of the freezing range, degC
	cf, cu  float64 // frozen and unfrozen volumetric heat capacity, J/(m3 K)
	kf, ku  float64 // frozen and unfrozen conductivity, W/(m K)
	lat     float64 // latent heat, J/m3
	hp      float64 // enthalpy at T = Point, fully unfrozen, J/m3
	qa, qb  float64 // H = qa u^2 + qb u inside the range
	rng     float64 // Range, K
	isoTerm bool    // Range == 0
}

func newFvPhase(l Layer) fvPhase {
	f := l.Freeze
	p := fvPhase{
		tl: f.Point - f.Range, tp: f.Point,
		cf: f.HeatCapacityFrozen, cu: l.HeatCapacity,
		kf: f.ConductivityFrozen, ku: l.Conductivity,
		lat: f.LatentHeat, rng: f.Range,
		isoTerm: f.Range == 0,
	}
	p.hp = p.rng*(p.cf+p.cu)/2 + p.lat
	if !p.isoTerm {
		p.qa = (p.cu - p.cf) / (2 * p.rng)
		p.qb = p.cf + p.lat/p.rng
	}
	return p
}

// enthalpy returns H(T), J/m3. At T = Point with Range = 0 it returns the
// fully unfrozen value.
func (p *fvPhase) enthalpy(t float64) float64 {
	switch {
	case t >= p.tp:
		return p.hp + p.cu*(t-p.tp)
	case t <= p.tl:
		return p.cf * (t - p.tl)
	default:
		u := t - p.tl
		return p.qa*u*u + p.qb*u
	}
}

// state returns the temperature T(H) (degC), the liquid fraction phi, the
// slope dT/dH (m3 K/J; 0 in an isothermal mushy state) and the
// conductivity k (W/(m K)) for the enthalpy h (J/m3).
func (p *fvPhase) state(h float64) (t, phi, slope, k float64) {
	switch {
	case h >= p.hp:
		return p.tp + (h-p.hp)/p.cu, 1, 1 / p.cu, p.ku
	case h <= 0:
		return p.tl + h/p.cf, 0, 1 / p.cf, p.kf
	case p.isoTerm:
		phi = h / p.lat
		return p.tp, phi, 0, p.kf + phi*(p.ku-p.kf)
	default:
		// Root u in [0, Range] of qa u^2 + qb u - h = 0, in the form that
		// does not cancel when qa is small.
		u := 2 * h / (p.qb + math.Sqrt(p.qb*p.qb+4*p.qa*h))
		u = math.Min(math.Max(u, 0), p.rng)
		phi = u / p.rng
		return p.tl + u, phi, 1 / (p.qb + 2*p.qa*u), p.kf + phi*(p.ku-p.kf)
	}
}

// region returns 0 (frozen), 1 (within the freezing range or mushy) or 2
// (unfrozen) for the enthalpy h.
func (p *fvPhase) region(h float64) int8 {
	switch {
	case h >= p.hp:
		return 2
	case h <= 0:
		return 0
	}
	return 1
}

// kink returns the state (T, phi, dT/dH, k) at a kink of T(H), seen from
// the region next (0 frozen, 1 freezing range, 2 unfrozen): at the enthalpy
// hp (fully unfrozen at Point) when atHp, else at 0 (fully frozen at
// Point - Range).
func (p *fvPhase) kink(atHp bool, next int8) (t, phi, slope, k float64) {
	if atHp {
		t, phi, k = p.tp, 1, p.ku
		switch {
		case next == 2:
			slope = 1 / p.cu
		case !p.isoTerm:
			slope = 1 / (p.qb + 2*p.qa*p.rng)
		}
		return t, phi, slope, k
	}
	t, phi, k = p.tl, 0, p.kf
	switch {
	case next == 0:
		slope = 1 / p.cf
	case !p.isoTerm:
		slope = 1 / p.qb
	}
	return t, phi, slope, k
}

// cond returns the conductivity (W/(m K)) at temperature t: kf below the
// range, ku above, blended by the liquid fraction within it.
func (p *fvPhase) cond(t float64) float64 {
	switch {
	case t >= p.tp:
		return p.ku
	case t <= p.tl:
		return p.kf
	}
	phi := (t - p.tl) / p.rng
	return p.kf + phi*(p.ku-p.kf)
}
