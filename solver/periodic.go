package solver

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
)

// PeriodicProperties are the dynamic thermal characteristics of a wall,
// roof or floor (a column with an inside and an outside environment) for
// one harmonic period, as defined by ISO 13786. All values are SI.
//
// Sides follow ISO 13786: side 1 is the inside (the last element of
// Column.Layers, environment behind InsideResistance), side 2 the outside
// (Layers[0], environment behind OutsideResistance). All values include
// both surface resistances. Complex quantities use exp(+i omega t): a
// positive argument is a lead, a negative argument a lag.
type PeriodicProperties struct {
	Period float64 // s

	// U is the steady thermal transmittance 1 / (Rse + sum R + Rsi), W/(m2 K).
	U float64

	// Y12 is the periodic thermal transmittance (ISO 13786, 7.2),
	// W/(m2 K): the complex amplitude of the heat flux density into the
	// inside environment per unit complex amplitude of the outside
	// environment temperature, the inside temperature held constant.
	// Y12 = -1/Z12 of the column matrix Z = Z_se Z_layers Z_si.
	Y12 complex128
	// Y11 is the inside thermal admittance, W/(m2 K): flux from the
	// inside environment into the component per unit inside temperature
	// amplitude, the outside held constant. Y11 = -Z11/Z12.
	Y11 complex128
	// Y22 is the outside thermal admittance, W/(m2 K): flux from the
	// outside environment into the component per unit outside temperature
	// amplitude, the inside held constant. Y22 = -Z22/Z12.
	Y22 complex128

	PeriodicTransmittance float64 // |Y12|, W/(m2 K)
	DecrementFactor       float64 // f = |Y12| / U, dimensionless

	// TimeShift is the lag of the inside response (heat flux into the
	// inside) behind the outside forcing, s, in [0, Period):
	// (-T/(2 pi) arg Y12) mod T.
	TimeShift float64
	// TimeShiftUnwrapped is the same lag without the modulo, s: it can
	// exceed one period for thick heavy components. The phase of Y12 is
	// followed continuously while the component is built up element by
	// element from the inside (each added element multiplies Z12 by a
	// factor whose continuous argument is known in closed form), which
	// gives the same value as continuing the phase in frequency from very
	// long periods, where the lag tends to 0. It equals TimeShift modulo the
	// period; for a thick homogeneous slab it tends to
	// T/(2 pi) (d/delta - pi/4 + arg(1 + Rse lambda k) + arg(1 + Rsi lambda k)),
	// k = (1+i)/delta, each arg between 0 and pi/4.
	TimeShiftUnwrapped float64

	InsideAdmittance      float64 // |Y11|, W/(m2 K)
	InsideAdmittanceLead  float64 // T/(2 pi) arg Y11, s: time by which the inside flux leads the inside temperature
	OutsideAdmittance     float64 // |Y22|, W/(m2 K)
	OutsideAdmittanceLead float64 // T/(2 pi) arg Y22, s

	// InsideArealHeatCapacity kappa1 = T/(2 pi) |(Z11 - 1)/Z12|, J/(m2 K)
	// (ISO 13786, 7.4), and OutsideArealHeatCapacity
	// kappa2 = T/(2 pi) |(Z22 - 1)/Z12|, J/(m2 K).
	InsideArealHeatCapacity  float64
	OutsideArealHeatCapacity float64

	// SurfaceFactor is the surface factor of the admittance method,
	// F = 1 - Rsi Y11 (dimensionless, complex, exp(+i omega t)): of a
	// periodic heat flux absorbed at the inside surface (radiant gains
	// from sun or lights), the part that is passed on to the inside
	// environment through Rsi, with its phase; the rest goes into the
	// component. Rsi is the column's InsideResistance (ISO 6946 in a
	// scenario). A massless component gives (Rse + R)/(Rsi + R + Rse), real
	// (the heat splits between the two paths in inverse proportion to
	// their resistances); a heavy one passes on less, later.
	SurfaceFactor complex128
	// SurfaceFactorMagnitude is |F|, dimensionless, between 0 and 1.
	SurfaceFactorMagnitude float64
	// SurfaceFactorLag is the time by which the heat passed on to the inside
	// environment lags the absorbed heat, s, in [0, Period):
	// (-T/(2 pi) arg F) mod T.
	SurfaceFactorLag float64

	// PenetrationDepths holds the periodic penetration depth of each
	// layer, m, in the order of Column.Layers; 0 for massless layers.
	PenetrationDepths []float64
}

// ErrPeriodicHalfSpace is returned by Periodic and Response for a
// half-space (ground) column: it has no inside environment, hence no U,
// transmittance or decrement factor. Use GroundPeriodic, SurfaceAdmittance
// and SwingDepth for such columns.
var ErrPeriodicHalfSpace = errors.New("solver: a half-space column has no inside surface; use GroundPeriodic for ground columns")

// tmCheckColumn validates c and also rejects infinite surface resistances
// (Column.Validate accepts them; the periodic solution needs finite ones).
func tmCheckColumn(c Column) error {
	if err := c.Validate(); err != nil {
		return err
	}
	if math.IsInf(c.OutsideResistance, 0) || math.IsInf(c.InsideResistance, 0) {
		return errors.New("solver: surface resistances must be finite")
	}
	return nil
}

// tmCheckPeriod reports a period that is not a finite positive number of seconds.
func tmCheckPeriod(period float64) error {
	if !(period > 0) || math.IsInf(period, 0) {
		return fmt.Errorf("solver: period must be a finite positive number of seconds, got %g", period)
	}
	return nil
}

// tmElement is one element of a column in series: a massless resistance
// (layer < 0) or a massive slab of a layer's material.
type tmElement struct {
	r     float64 // m2 K/W, resistance elements
	layer Layer   // massive elements (Thickness may be a part of the layer)
}

func (e tmElement) isResistance() bool { return e.layer.Thickness == 0 }

// matrix returns the scaled transfer matrix of e.
func (e tmElement) matrix(period float64) ScaledMatrix {
	if e.isResistance() {
		return ScaledMatrix{M: ResistanceMatrix(e.r)}
	}
	return LayerMatrixScaled(e.layer, period)
}

// tmWallElements lists the elements of a wall, outside first: Rse, the
// layers, Rsi; zero surface resistances are left out.
func tmWallElements(c Column) []tmElement {
	els := make([]tmElement, 0, len(c.Layers)+2)
	if c.OutsideResistance > 0 {
		els = append(els, tmElement{r: c.OutsideResistance})
	}
	for _, l := range c.Layers {
		if l.Massless() {
			els = append(els, tmElement{r: l.Resistance})
		} else {
			els = append(els, tmElement{layer: l})
		}
	}
	if c.InsideResistance > 0 {
		els = append(els, tmElement{r: c.InsideResistance})
	}
	return els
}

// tmPhaseStep returns the continuous argument of the ratio
// r = S11 + S12 W, the factor by which an element S multiplies the
// temperature amplitude (theta_a = r theta_b) of a solution whose state on
// its inside face b has W = q/theta (ISO flux convention). yInf marks
// theta_b = 0 (nothing behind b yet); the result is then the argument of
// -S12 continued from zero thickness.
//
// For a resistance R: r = 1 + R Y with Y = -W the admittance seen from b,
// so arg r = Arg(1 + R Y) (principal value: Re Y >= 0 for any passive
// heat-conducting structure).
//
// For a slab with z = (1+i) xi, k = (1+i)/delta, y = Y/(lambda k):
//
//	r = cosh z + y sinh z = exp(z)/2 (1 + y) (1 + exp(-2z) (1-y)/(1+y)).
//
// Y is the admittance of an RC structure, arg Y in [0, pi/2], so arg y is
// in [-pi/4, pi/4], Re y > 0 and |(1-y)/(1+y)| < 1; the last factor then
// stays in the right half-plane as the slab grows from zero thickness, and
// the continuous argument is xi + Arg(1+y) + Arg(1 + exp(-2z)(1-y)/(1+y)),
// which is 0 at xi = 0. With nothing behind (y -> infinity):
// arg(sinh(z)/(lambda k)) = xi - pi/4 + Arg(1 - exp(-2z)). [derived]
func tmPhaseStep(e tmElement, period float64, w complex128, yInf bool) float64 {
	if e.isResistance() {
		if yInf {
			return 0
		}
		return cmplx.Phase(1 - complex(e.r, 0)*w)
	}
	delta := LayerPenetrationDepth(e.layer, period)
	xi := e.layer.Thickness / delta
	e2z := cmplx.Rect(math.Exp(-2*xi), -2*xi) // exp(-2 (1+i) xi)
	if yInf {
		if xi <= 1 {
			z := complex(xi, xi)
			return cmplx.Phase(cmplx.Sinh(z) / z) // principal value is the continuous one for xi <= 1
		}
		return xi - math.Pi/4 + cmplx.Phase(1-e2z)
	}
	k := complex(1, 1) / complex(delta, 0)
	y := -w / (complex(e.layer.Conductivity, 0) * k)
	rho := (1 - y) / (1 + y)
	return xi + cmplx.Phase(1+y) + cmplx.Phase(1+e2z*rho)
}

// Periodic returns the ISO 13786 dynamic thermal characteristics of a wall
// column for the period T (s). The column matrix is
// Z = Z_se Z_Layers[0] ... Z_Layers[n-1] Z_si, which is the standard's
// Z_se Z_N ... Z_1 Z_si with its layer 1 = the last element of c.Layers.
//
// It returns an error for an invalid column, a period that is not finite
// and positive, and ErrPeriodicHalfSpace for a half-space column. Results
// stay finite for layers of any thickness (the matrices are scaled; a
// transmittance below about 1e-308 W/(m2 K) is returned as 0).
func Periodic(c Column, period float64) (PeriodicProperties, error) {
	if err := tmCheckColumn(c); err != nil {
		return PeriodicProperties{}, err
	}
	if err := tmCheckPeriod(period); err != nil {
		return PeriodicProperties{}, err
	}
	if c.HalfSpace {
		return PeriodicProperties{}, ErrPeriodicHalfSpace
	}
	els := tmWallElements(c)
	z, phi := tmWallMatrix(els, period)

	rTot := c.OutsideResistance + c.InsideResistance
	for _, l := range c.Layers {
		rTot += l.ThermalResistance()
	}
	p := PeriodicProperties{Period: period, U: 1 / rTot}
	m := z.M
	inv := math.Exp(-z.LogScale) // 1 / scale; underflows to 0 for huge scales
	tOver2Pi := period / (2 * math.Pi)

	// ISO 13786, 7.2-7.4: Y12 = -1/Z12, Y11 = -Z11/Z12, Y22 = -Z22/Z12,
	// kappa1 = T/(2 pi) |(Z11 - 1)/Z12|, kappa2 = T/(2 pi) |(Z22 - 1)/Z12|,
	// with Z = exp(LogScale) M.
	y12unit := -1 / m[0][1] // Y12 up to the positive factor inv: carries the phase
	p.Y12 = y12unit * complex(inv, 0)
	p.Y11 = -m[0][0] / m[0][1]
	p.Y22 = -m[1][1] / m[0][1]
	p.PeriodicTransmittance = cmplx.Abs(p.Y12)
	p.DecrementFactor = p.PeriodicTransmittance / p.U
	p.TimeShift = tmLagMod(-tOver2Pi*cmplx.Phase(y12unit), period)
	p.TimeShiftUnwrapped = tOver2Pi * tmSnapPhase(phi, -cmplx.Phase(y12unit))
	if p.TimeShiftUnwrapped == 0 {
		p.TimeShiftUnwrapped = 0 // +0, not -0, in printed output
	}
	p.InsideAdmittance = cmplx.Abs(p.Y11)
	p.InsideAdmittanceLead = tOver2Pi * cmplx.Phase(p.Y11)
	p.OutsideAdmittance = cmplx.Abs(p.Y22)
	p.OutsideAdmittanceLead = tOver2Pi * cmplx.Phase(p.Y22)
	p.InsideArealHeatCapacity = tOver2Pi * cmplx.Abs((m[0][0]-complex(inv, 0))/m[0][1])
	p.OutsideArealHeatCapacity = tOver2Pi * cmplx.Abs((m[1][1]-complex(inv, 0))/m[0][1])
	p.SurfaceFactor, p.SurfaceFactorMagnitude, p.SurfaceFactorLag = SurfaceFactor(p.Y11, c.InsideResistance, period)
	p.PenetrationDepths = make([]float64, len(c.Layers))
	for i, l := range c.Layers {
		p.PenetrationDepths[i] = LayerPenetrationDepth(l, period)
	}
	return p, nil
}

// SurfaceFactor returns the surface factor F = 1 - rsi y11 of a component
// whose inside admittance is y11 (W/(m2 K), including the inside surface
// resistance rsi, m2 K/W), its magnitude and its lag (s, in
// [0, period)) behind the heat absorbed at the inside surface.
//
// The heat q absorbed at the surface node splits into the part that goes
// to the inside environment through rsi and the part that enters the
// component. With the environment held at zero swing, the surface
// temperature is theta_s = rsi q_room, and the component takes
// theta_s Y_s, Y_s its admittance seen from the surface; with
// y11 = Y_s / (1 + rsi Y_s) the passed-on part is
// q_room / q = 1/(1 + rsi Y_s) = 1 - rsi y11. [derived] This is the
// surface factor of the admittance method (CIBSE Guide A, section 5
// [memory]; the Guide's tables assume Rsi of about 0.12 m2 K/W, here the
// column's own Rsi is used). Time dependence exp(+i omega t): the lag is
// (-arg F / omega) mod period.
func SurfaceFactor(y11 complex128, rsi, period float64) (f complex128, magnitude, lag float64) {
	f = 1 - complex(rsi, 0)*y11
	return f, cmplx.Abs(f), tmLagMod(-period/(2*math.Pi)*cmplx.Phase(f), period)
}

// tmWallMatrix multiplies the elements (outside first) into the column
// matrix, building it from the inside outwards, and returns with it the
// continuous argument phi of -Z12 (so arg Y12 = -phi and the unwrapped lag
// is T phi / (2 pi)). phi is the sum of the continuous arguments of the
// ratios Z12(after)/Z12(before) as each element is added on the outside
// (tmPhaseStep); it starts at 0 when the first element is added (a
// resistance, or a slab continued from zero thickness, where -Z12 -> d/lambda
// is real and positive). This follows the phase continuously along the path
// "thicknesses grow from zero", which ends at the same value as continuing
// in frequency from omega -> 0 (where the lag vanishes): Z12 has no zero for
// positive thicknesses and omega > 0.
func tmWallMatrix(els []tmElement, period float64) (ScaledMatrix, float64) {
	p := ScaledMatrix{M: IdentityMatrix}
	phi := 0.0
	started := false
	for i := len(els) - 1; i >= 0; i-- {
		e := els[i]
		if started {
			w := p.M[1][1] / p.M[0][1] // W = q/theta on the inside face of e for the solution with theta_inside = 0
			phi += tmPhaseStep(e, period, w, false)
		} else {
			phi += tmPhaseStep(e, period, 0, true)
			started = true
		}
		p = e.matrix(period).Mul(p)
	}
	return p, phi
}

// tmSnapPhase returns the value congruent to principal (mod 2 pi) nearest
// to the continued phase phi, removing round-off from phi.
func tmSnapPhase(phi, principal float64) float64 {
	return principal + 2*math.Pi*math.Round((phi-principal)/(2*math.Pi))
}

// tmLagMod reduces a lag to [0, period).
func tmLagMod(lag, period float64) float64 {
	lag = math.Mod(lag, period)
	if lag < 0 {
		lag += period
	}
	if lag >= period || lag == 0 {
		lag = 0 // also turns -0 into +0
	}
	return lag
}
