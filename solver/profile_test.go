package solver

import (
	"math"
	"math/cmplx"
	"testing"
)

// Soil values of Moene and van Dam (2014), Transport in the
// Atmosphere-Vegetation-Soil Continuum, Table 2.2 after de Vries 1963
// [2nd-hand]: conductivity W/(m K) and
// diffusivity m2/s, so HeatCapacity = lambda / a.
var (
	tmDrySand = Layer{Name: "dry sand", Conductivity: 0.24, HeatCapacity: 0.24 / 0.19e-6}
	tmWetClay = Layer{Name: "wet clay", Conductivity: 1.4, HeatCapacity: 1.4 / 0.45e-6}
	tmRock    = Layer{Name: "rock", Conductivity: 2.9, HeatCapacity: 2.9 / 1.4e-6}
)

const tmYear = 365 * tmDay

// TestHarmonicSurfaceRelations: the profile at x = 0 and x = Thickness
// reproduces the ISO 13786 definitions of Y12, Y11 and Y22 [derived from
// the definitions of ISO 13786:2017, clause 6]: with the outside environment
// forced (inside 0) the flux into the room is Y12 and the flux entering at
// the outside is Y22; with the inside forced the flux leaving the room into
// the wall is Y11 and the flux reaching the outside environment is Y12
// (reciprocity). Surface temperatures follow from the surface resistances.
func TestHarmonicSurfaceRelations(t *testing.T) {
	walls := map[string]Column{
		"TABULA": tmTabula(),
		"insulated with air layer": {Layers: []Layer{tmWith(tmBrick, 0.105), {Resistance: 0.18}, tmWith(tmMinWool, 0.1), tmWith(tmConcrete, 0.15), tmWith(tmPlaster, 0.015)},
			OutsideResistance: 0.04, InsideResistance: 0.13},
		"no surface resistances":  {Layers: []Layer{tmWith(tmSoftwood, 0.05), tmWith(tmConcrete, 0.2)}},
		"air layer at both faces": {Layers: []Layer{{Resistance: 0.1}, tmWith(tmConcrete, 0.2), {Resistance: 0.2}}},
	}
	for name, c := range walls {
		for _, period := range []float64{3600, tmDay, tmYear} {
			p, err := Periodic(c, period)
			if err != nil {
				t.Fatal(err)
			}
			L := c.Thickness()
			x := []float64{0, L}
			temp, flux, err := Harmonic(c, period, 1, 0, x)
			if err != nil {
				t.Fatal(err)
			}
			tempI, fluxI, err := Harmonic(c, period, 0, 1, x)
			if err != nil {
				t.Fatal(err)
			}
			// Massless layers at a face: Harmonic returns the deeper face, so
			// at x = 0 the resistance from the outside environment includes
			// them, and at x = L only Rsi lies between surface and room.
			rOut := c.OutsideResistance
			if l := c.Layers[0]; l.Massless() {
				rOut += l.Resistance
			}
			rIn := c.InsideResistance
			for _, chk := range []struct {
				what      string
				got, want complex128
			}{
				{"outside forced: flux into room", flux[1], p.Y12},
				{"outside forced: flux at outside", flux[0], p.Y22},
				{"outside forced: outside surface", temp[0], 1 - complex(rOut, 0)*p.Y22},
				{"outside forced: inside surface", temp[1], complex(rIn, 0) * p.Y12},
				{"inside forced: flux into wall (-x)", -fluxI[1], p.Y11},
				{"inside forced: flux to outside (-x)", -fluxI[0], p.Y12},
				{"inside forced: inside surface", tempI[1], 1 - complex(rIn, 0)*p.Y11},
				{"inside forced: outside surface", tempI[0], complex(rOut, 0) * p.Y12},
			} {
				if e := cmplx.Abs(chk.got - chk.want); e > 1e-12*math.Max(1, cmplx.Abs(chk.want)) {
					t.Errorf("%s, T=%g: %s = %v, want %v", name, period, chk.what, chk.got, chk.want)
				}
			}
		}
	}
}

// TestHalfSpaceHomogeneous: with no surface resistance the periodic
// temperature in a homogeneous half-space is theta(z) = theta_s
// exp(-(1+i) z/d), d = sqrt(a P / pi): amplitude ratio exp(-z/d), lag
// z/d P/(2 pi) (Kusuda and Achenbach 1965 form [memory],
// checked against the heat equation [derived]), to 1e-9. Depths reach far
// below the layer's nominal thickness (the layer continues) and past one
// period of lag (z > 2 pi d).
func TestHalfSpaceHomogeneous(t *testing.T) {
	for _, tc := range []struct {
		l      Layer
		period float64
	}{{tmWetClay, tmYear}, {tmDrySand, tmDay}, {tmRock, tmYear}} {
		c := Column{Layers: []Layer{tmWith(tc.l, 0.5)}, HalfSpace: true}
		d := math.Sqrt(tc.l.Diffusivity() * tc.period / math.Pi)
		var z []float64
		for i := range 40 {
			z = append(z, float64(i)*0.25*d)
		}
		g, err := GroundPeriodic(c, tc.period, z)
		if err != nil {
			t.Fatal(err)
		}
		temp, flux, err := Harmonic(c, tc.period, 1, 99 /* ignored */, z)
		if err != nil {
			t.Fatal(err)
		}
		for i, zi := range z {
			want := cmplx.Exp(complex(-zi/d, -zi/d))
			if math.Abs(g.AmplitudeRatio[i]-math.Exp(-zi/d)) > 1e-9*math.Exp(-zi/d) {
				t.Errorf("%s z=%.3g m: amplitude ratio %.12g, want %.12g", tc.l.Name, zi, g.AmplitudeRatio[i], math.Exp(-zi/d))
			}
			if lag := zi / d * tc.period / (2 * math.Pi); math.Abs(g.Lag[i]-lag) > 1e-9*tc.period {
				t.Errorf("%s z=%.3g m: lag %.12g s, want %.12g s", tc.l.Name, zi, g.Lag[i], lag)
			}
			if tmCRel(temp[i], want) > 1e-9 {
				t.Errorf("%s z=%.3g m: theta %v, want %v", tc.l.Name, zi, temp[i], want)
			}
			// Fourier: q = -lambda dtheta/dz = lambda (1+i)/d theta.
			if wantQ := complex(tc.l.Conductivity/d, tc.l.Conductivity/d) * want; tmCRel(flux[i], wantQ) > 1e-9 {
				t.Errorf("%s z=%.3g m: flux %v, want %v", tc.l.Name, zi, flux[i], wantQ)
			}
		}
		if g.Lag[len(z)-1] < tc.period {
			t.Errorf("%s: deepest lag %g s should exceed one period", tc.l.Name, g.Lag[len(z)-1])
		}
	}
}

// TestLayeredIdenticalEqualsHomogeneous: splitting a layer into identical
// layers changes nothing [derived], for a half-space and for a wall.
func TestLayeredIdenticalEqualsHomogeneous(t *testing.T) {
	z := []float64{0, 0.1, 0.2, 0.35, 0.5, 0.7, 1.0, 1.3, 2, 4}
	for _, rse := range []float64{0, 0.04} {
		one := Column{Layers: []Layer{tmWith(tmWetClay, 1)}, OutsideResistance: rse, HalfSpace: true}
		three := Column{Layers: []Layer{tmWith(tmWetClay, 0.2), tmWith(tmWetClay, 0.5), tmWith(tmWetClay, 0.3)}, OutsideResistance: rse, HalfSpace: true}
		for _, period := range []float64{tmDay, tmYear} {
			a, _, err := Harmonic(one, period, 3, 0, z)
			if err != nil {
				t.Fatal(err)
			}
			b, _, err := Harmonic(three, period, 3, 0, z)
			if err != nil {
				t.Fatal(err)
			}
			ga, _ := GroundPeriodic(one, period, z)
			gb, _ := GroundPeriodic(three, period, z)
			for i := range z {
				if tmCRel(b[i], a[i]) > 1e-12 || math.Abs(gb.Lag[i]-ga.Lag[i]) > 1e-12*period {
					t.Errorf("Rse=%g T=%g z=%g: layered %v lag %g, homogeneous %v lag %g", rse, period, z[i], b[i], gb.Lag[i], a[i], ga.Lag[i])
				}
			}
		}
	}
	wallOne := Column{Layers: []Layer{tmWith(tmConcrete, 0.3)}, OutsideResistance: 0.04, InsideResistance: 0.13}
	wallTwo := Column{Layers: []Layer{tmWith(tmConcrete, 0.12), tmWith(tmConcrete, 0.18)}, OutsideResistance: 0.04, InsideResistance: 0.13}
	p1, _ := Periodic(wallOne, tmDay)
	p2, _ := Periodic(wallTwo, tmDay)
	if tmCRel(p2.Y12, p1.Y12) > 1e-12 || tmCRel(p2.Y11, p1.Y11) > 1e-12 || math.Abs(p2.TimeShiftUnwrapped-p1.TimeShiftUnwrapped) > 1e-9 {
		t.Errorf("split wall %+v differs from %+v", p2, p1)
	}
}

// TestGroundLagUnwrapping: the lag of GroundPeriodic in a layered soil with
// a surface resistance and an insulation board agrees with an independent
// unwrapping of the principal phase of theta(z)/theta_env sampled every
// delta/50 from the surface [derived].
func TestGroundLagUnwrapping(t *testing.T) {
	c := Column{Layers: []Layer{tmWith(tmDrySand, 0.3), {Resistance: 1.2}, tmWith(tmWetClay, 1.5), tmWith(tmRock, 2)},
		OutsideResistance: 0.04, HalfSpace: true}
	for _, period := range []float64{tmDay, tmYear} {
		dmin := LayerPenetrationDepth(tmDrySand, period)
		var z []float64
		for x := 0.0; x < 3.8+8*LayerPenetrationDepth(tmRock, period); x += dmin / 50 {
			z = append(z, x)
		}
		g, err := GroundPeriodic(c, period, z)
		if err != nil {
			t.Fatal(err)
		}
		phi := cmplx.Phase(g.Ratio[0])
		maxLag := 0.0
		for i := range z {
			if i > 0 {
				d := cmplx.Phase(g.Ratio[i]) - cmplx.Phase(g.Ratio[i-1])
				phi += d - 2*math.Pi*math.Round(d/(2*math.Pi))
			}
			want := -phi * period / (2 * math.Pi)
			if math.Abs(g.Lag[i]-want) > 1e-9*period {
				t.Fatalf("T=%g z=%g: lag %g s, sampled unwrapping %g s", period, z[i], g.Lag[i], want)
			}
			maxLag = math.Max(maxLag, g.Lag[i])
			if i > 0 && g.AmplitudeRatio[i] > g.AmplitudeRatio[i-1]*(1+1e-12) {
				t.Errorf("T=%g: amplitude rises from z=%g to %g", period, z[i-1], z[i])
			}
		}
		if maxLag < period {
			t.Errorf("T=%g: lag never passes one period (max %g s)", period, maxLag)
		}
	}
}

// TestInterfacesAndMasslessLayers: a position on a massless layer returns
// its deeper face; the jump across it is R times the flux, which is
// continuous [derived: a massless resistance stores no heat]. Positions
// within 1e-12 of an interface are put on it.
func TestInterfacesAndMasslessLayers(t *testing.T) {
	c := Column{Layers: []Layer{tmWith(tmBrick, 0.105), {Resistance: 0.18}, tmWith(tmMinWool, 0.1), tmWith(tmConcrete, 0.15)},
		OutsideResistance: 0.04, InsideResistance: 0.13}
	const eps = 1e-9
	x := []float64{0.105 - eps, 0.105, 0.105 * (1 + 1e-14), 0.205, 0.355}
	temp, flux, err := Harmonic(c, tmDay, 5, 1, x)
	if err != nil {
		t.Fatal(err)
	}
	if jump, want := temp[0]-temp[1], complex(0.18, 0)*flux[1]; cmplx.Abs(jump-want) > 1e-6*cmplx.Abs(want) {
		t.Errorf("jump across the air layer %v, want R q = %v", jump, want)
	}
	if tmCRel(flux[0], flux[1]) > 1e-6 {
		t.Errorf("flux not continuous: %v vs %v", flux[0], flux[1])
	}
	if temp[2] != temp[1] {
		t.Errorf("position 1e-14 off the interface gives %v, on it %v", temp[2], temp[1])
	}
	// Steady: the same rule, and the linear profile of ISO 6946.
	ts, q, err := Steady(c, -5, 20, x)
	if err != nil {
		t.Fatal(err)
	}
	wantQ := (-5.0 - 20) / (0.04 + 0.105/0.77 + 0.18 + 0.1/0.04 + 0.15/2.3 + 0.13)
	if tmRel(q, wantQ) > 1e-14 {
		t.Errorf("steady flux %g, want %g", q, wantQ)
	}
	wantT := []float64{-5 - wantQ*(0.04+(0.105-eps)/0.77), -5 - wantQ*(0.04+0.105/0.77+0.18), -5 - wantQ*(0.04+0.105/0.77+0.18),
		-5 - wantQ*(0.04+0.105/0.77+0.18+0.1/0.04), -5 - wantQ*(0.04+0.105/0.77+0.18+0.1/0.04+0.15/2.3)}
	for i := range x {
		if math.Abs(ts[i]-wantT[i]) > 1e-12 {
			t.Errorf("steady T(%g) = %.15g, want %.15g", x[i], ts[i], wantT[i])
		}
	}
	if math.Abs(wantT[4]-(20+wantQ*0.13)) > 1e-12 {
		t.Errorf("inside surface %g does not meet the inside resistance", wantT[4])
	}
}

// TestLongPeriodIsSteady: as the period grows the harmonic solution tends
// to the steady one (period -> infinity) [derived].
func TestLongPeriodIsSteady(t *testing.T) {
	c := Column{Layers: []Layer{tmWith(tmBrick, 0.105), {Resistance: 0.18}, tmWith(tmMinWool, 0.1), tmWith(tmConcrete, 0.15)},
		OutsideResistance: 0.04, InsideResistance: 0.13}
	x := []float64{0, 0.05, 0.105, 0.2, 0.3, 0.355}
	ts, q, _ := Steady(c, 7, -3, x)
	th, qh, err := Harmonic(c, 1e14, 7, -3, x)
	if err != nil {
		t.Fatal(err)
	}
	for i := range x {
		if cmplx.Abs(th[i]-complex(ts[i], 0)) > 1e-6 || cmplx.Abs(qh[i]-complex(q, 0)) > 1e-6 {
			t.Errorf("x=%g: harmonic %v %v, steady %g %g", x[i], th[i], qh[i], ts[i], q)
		}
	}
}

// TestSteadyGeothermal: with an upward geothermal flux q the temperature
// rises with depth by q integral dz/lambda (Fourier's law; 0.065 W/m2 is the
// continental mean of Pollack, Hurter and Johnson 1993, Heat flow from the
// Earth's interior, Rev. Geophys. 31:267, abstract [read]). A half-space without bottom flux is uniform.
func TestSteadyGeothermal(t *testing.T) {
	c := Column{Layers: []Layer{tmWith(tmDrySand, 2), tmWith(tmRock, 10)}, HalfSpace: true}
	z := []float64{0, 1, 2, 7, 12, 50}
	got, err := SteadyWithBottomFlux(c, 8.5, 0.065, z)
	if err != nil {
		t.Fatal(err)
	}
	for i, zi := range z {
		want := 8.5 + 0.065*(math.Min(zi, 2)/0.24+math.Max(zi-2, 0)/2.9)
		if math.Abs(got[i]-want) > 1e-12 {
			t.Errorf("T(%g m) = %.15g, want %.15g", zi, got[i], want)
		}
	}
	uni, q, err := Steady(c, 8.5, 100, z)
	if err != nil {
		t.Fatal(err)
	}
	for i := range z {
		if uni[i] != 8.5 || q != 0 {
			t.Errorf("half-space steady T(%g) = %g, q = %g; want 8.5, 0", z[i], uni[i], q)
		}
	}
}

// TestSwingDepth: in a homogeneous half-space with no surface resistance
// the swing A exp(-z/d) reaches the threshold at z = d ln(A/threshold)
// (from the amplitude ratio exp(-z/d) [derived]); in a layered column the returned depth
// has exactly the threshold amplitude in the exact solution (bisection
// branch) [derived].
func TestSwingDepth(t *testing.T) {
	// Annual wave of 10 K in wet clay, threshold 0.1 K.
	c := Column{Layers: []Layer{tmWith(tmWetClay, 1)}, HalfSpace: true}
	d := math.Sqrt(0.45e-6 * tmYear / math.Pi)
	got, err := SwingDepth(c, tmYear, 10, 0.1)
	if err != nil {
		t.Fatal(err)
	}
	if want := d * math.Log(100); tmRel(got, want) > 1e-12 {
		t.Errorf("homogeneous damping depth %.12g m, want %.12g m", got, want)
	}
	layered := Column{Layers: []Layer{tmWith(tmDrySand, 0.8), {Resistance: 0.5}, tmWith(tmWetClay, 3), tmWith(tmRock, 1)},
		OutsideResistance: 0.04, HalfSpace: true}
	for _, thr := range []float64{8, 3, 1, 0.1, 0.01, 1e-6} {
		z, err := SwingDepth(layered, tmYear, 10, thr)
		if err != nil {
			t.Fatal(err)
		}
		temp, _, err := Harmonic(layered, tmYear, 10, 0, []float64{z})
		if err != nil {
			t.Fatal(err)
		}
		a := cmplx.Abs(temp[0])
		onJump := z == 0.8 && a < thr
		if !onJump && tmRel(a, thr) > 1e-9 {
			t.Errorf("threshold %g: depth %.9g m has amplitude %.12g", thr, z, a)
		}
		if onJump {
			above, _, _ := Harmonic(layered, tmYear, 10, 0, []float64{0.8 - 1e-9})
			if cmplx.Abs(above[0]) < thr {
				t.Errorf("threshold %g: reported at the board but reached above it", thr)
			}
		}
	}
	if z, _ := SwingDepth(c, tmYear, 0.05, 0.1); z != 0 {
		t.Errorf("amplitude below threshold at the surface: depth %g, want 0", z)
	}
}

// TestThickWallProfile: a wall 1000 penetration depths thick gives finite
// values everywhere; near the outside it is a half-space with surface
// resistance, theta(z) = theta(0) exp(-(1+i) z/delta) [derived].
func TestThickWallProfile(t *testing.T) {
	l := tmConcrete
	delta := LayerPenetrationDepth(l, tmDay)
	c := Column{Layers: []Layer{tmWith(l, 1000*delta)}, OutsideResistance: 0.04, InsideResistance: 0.13}
	x := []float64{0, 3 * delta, 500 * delta, 997 * delta, 1000 * delta}
	temp, flux, err := Harmonic(c, tmDay, 1, 1, x)
	if err != nil {
		t.Fatal(err)
	}
	for i := range x {
		if cmplx.IsNaN(temp[i]) || cmplx.IsInf(temp[i]) || cmplx.IsNaN(flux[i]) || cmplx.IsInf(flux[i]) {
			t.Fatalf("x=%g: non-finite %v %v", x[i], temp[i], flux[i])
		}
	}
	if want := temp[0] * cmplx.Exp(complex(-3, -3)); tmCRel(temp[1], want) > 1e-12 {
		t.Errorf("3 delta in: %v, want %v", temp[1], want)
	}
	// Symmetrically from the inside face.
	if want := temp[4] * cmplx.Exp(complex(-3, -3)); tmCRel(temp[3], want) > 1e-12 {
		t.Errorf("3 delta from the inside: %v, want %v", temp[3], want)
	}
	if cmplx.Abs(temp[2]) > 1e-200 {
		t.Errorf("middle of the wall %v, want ~0", temp[2])
	}
	// Half-space with surface resistance a: theta(0) = 1/(1 + a lambda k).
	lk := complex(l.Conductivity, 0) * complex(1, 1) / complex(delta, 0)
	if want := 1 / (1 + 0.04*lk); tmCRel(temp[0], want) > 1e-12 {
		t.Errorf("outside surface %v, want %v", temp[0], want)
	}
}

// TestProfileErrors: invalid input gives errors, not panics.
func TestProfileErrors(t *testing.T) {
	wall := tmTabula()
	ground := Column{Layers: []Layer{tmWith(tmWetClay, 1)}, HalfSpace: true}
	if _, _, err := Harmonic(wall, tmDay, 1, 0, []float64{-0.01}); err == nil {
		t.Error("negative position: no error")
	}
	if _, _, err := Harmonic(wall, tmDay, 1, 0, []float64{0.5}); err == nil {
		t.Error("position beyond a wall: no error")
	}
	if _, _, err := Harmonic(wall, tmDay, 1, 0, []float64{math.NaN()}); err == nil {
		t.Error("NaN position: no error")
	}
	if _, _, err := Harmonic(ground, tmDay, 1, 0, []float64{50}); err != nil {
		t.Errorf("deep position in a half-space: %v", err)
	}
	if _, _, err := Harmonic(wall, 0, 1, 0, []float64{0}); err == nil {
		t.Error("zero period: no error")
	}
	if _, err := GroundPeriodic(wall, tmDay, []float64{0}); err == nil {
		t.Error("GroundPeriodic on a wall: no error")
	}
	if _, err := SwingDepth(wall, tmDay, 1, 0.1); err == nil {
		t.Error("SwingDepth on a wall: no error")
	}
	if _, err := SwingDepth(ground, tmDay, 1, 0); err == nil {
		t.Error("zero threshold: no error")
	}
	if _, err := SteadyWithBottomFlux(ground, 0, math.NaN(), []float64{1}); err == nil {
		t.Error("NaN flux: no error")
	}
	if _, _, err := Steady(Column{}, 0, 0, nil); err == nil {
		t.Error("empty column: no error")
	}
	if _, err := SurfaceAdmittance(ground, -1); err == nil {
		t.Error("negative period: no error")
	}
}

// TestSurfaceAdmittanceWall: for a wall SurfaceAdmittance is Y22 [derived
// from the ISO 13786 definition], and infinite surface resistances are
// rejected.
func TestSurfaceAdmittanceWall(t *testing.T) {
	c := tmTabula()
	p, _ := Periodic(c, tmDay)
	y, err := SurfaceAdmittance(c, tmDay)
	if err != nil {
		t.Fatal(err)
	}
	if tmCRel(y, p.Y22) > 1e-12 {
		t.Errorf("SurfaceAdmittance %v, Y22 %v", y, p.Y22)
	}
	c.OutsideResistance = math.Inf(1)
	if _, err := SurfaceAdmittance(c, tmDay); err == nil {
		t.Error("infinite Rse: no error")
	}
	if _, _, err := Harmonic(c, tmDay, 1, 0, []float64{0}); err == nil {
		t.Error("infinite Rse: Harmonic gives no error")
	}
}

// TestHarmonicInsulated: a slab with periodic surface temperature A and an
// adiabatic far face has theta(x) = A cosh(k(L-x))/cosh(kL) (Carslaw and
// Jaeger, section 3.6, form [memory]; solves d2theta/dx2 = k^2 theta with
// theta'(L) = 0 [derived]). A layered column with a surface resistance
// matches a wall whose inside resistance tends to infinity [derived].
func TestHarmonicInsulated(t *testing.T) {
	l := tmWith(tmWetClay, 2)
	c := Column{Layers: []Layer{l}, HalfSpace: true}
	var x []float64
	for i := range 21 {
		x = append(x, 0.1*float64(i))
	}
	A := complex(3, -4)
	temp, flux, err := HarmonicInsulated(c, tmYear, A, x)
	if err != nil {
		t.Fatal(err)
	}
	k := complex(1, 1) / complex(LayerPenetrationDepth(l, tmYear), 0)
	for i, xi := range x {
		want := A * cmplx.Cosh(k*complex(2-xi, 0)) / cmplx.Cosh(k*2)
		if cmplx.Abs(temp[i]-want) > 1e-12*cmplx.Abs(A) {
			t.Errorf("x=%g: theta %v, closed form %v", xi, temp[i], want)
		}
	}
	if cmplx.Abs(flux[len(x)-1]) > 1e-12 {
		t.Errorf("flux at the insulated face %v, want 0", flux[len(x)-1])
	}
	layered := Column{Layers: []Layer{tmWith(tmDrySand, 0.4), {Resistance: 0.8}, tmWith(tmWetClay, 1.5)}, OutsideResistance: 0.04, InsideResistance: 0.13}
	xs := []float64{0, 0.2, 0.4, 1, 1.9}
	got, _, err := HarmonicInsulated(layered, tmDay*30, 1, xs)
	if err != nil {
		t.Fatal(err)
	}
	layered.InsideResistance = 1e14
	want, _, _ := Harmonic(layered, tmDay*30, 1, 0, xs)
	for i := range xs {
		if cmplx.Abs(got[i]-want[i]) > 1e-9 {
			t.Errorf("x=%g: insulated %v, Rsi -> infinity %v", xs[i], got[i], want[i])
		}
	}
}
