package solver

import (
	"math"
	"testing"
)

func TestErfcx(t *testing.T) {
	// Reference: the definition exp(x^2) erfc(x) with the standard
	// library's erfc, where it does not overflow.
	for _, x := range []float64{-3, -1, -0.2, 0, 0.3, 1, 2.5, 4.99, 5, 5.01, 7, 10, 15, 20, 25} {
		want := math.Exp(x*x) * math.Erfc(x)
		got := Erfcx(x)
		if math.Abs(got-want) > 1e-13*want {
			t.Errorf("Erfcx(%g) = %.16g, want %.16g", x, got, want)
		}
	}
	// Asymptotic series 1/(x sqrt(pi)) (1 - 1/(2x^2) + 3/(4x^4) - 15/(8x^6)
	// + 105/(16x^8)) (Abramowitz and Stegun 7.1.23) where exp(x^2)
	// overflows; the next term is below 1e-13 relative from x = 30.
	for _, x := range []float64{30, 100, 1e4} {
		x2 := x * x
		want := (1 - 1/(2*x2) + 3/(4*x2*x2) - 15/(8*x2*x2*x2) + 105/(16*x2*x2*x2*x2)) / (x * math.Sqrt(math.Pi))
		if got := Erfcx(x); math.Abs(got-want) > 1e-13*want {
			t.Errorf("Erfcx(%g) = %.16g, want %.16g", x, got, want)
		}
	}
}

func TestStepIsothermDepthIncroperaExample56(t *testing.T) {
	// Incropera et al., Fundamentals of Heat and Mass Transfer, Example
	// 5.6 [read]: soil k 0.52 W/(m K), rho 2050 kg/m3, c 1840 J/(kg K),
	// initially 20 degC, surface at -15 degC for 60 days: the 0 degC
	// isotherm lies at 0.68 m (0.6766 m exact [derived]).
	a := 0.52 / (2050 * 1840)
	x, err := StepIsothermDepth(a, 20, -15, 0, 60*86400)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(x-0.6766) > 0.00005 {
		t.Errorf("isotherm depth %.5f m, want 0.6766 m", x)
	}
	if math.Abs(x-0.68) > 0.005 {
		t.Errorf("isotherm depth %.4f m, book rounds to 0.68 m", x)
	}
	// The isotherm depth and the erf profile agree.
	if got := 20 + (-15-20)*StepResponseHalfSpace(0.52, 2050*1840, 0, x, 60*86400); math.Abs(got) > 1e-9 {
		t.Errorf("temperature at the isotherm %g, want 0", got)
	}
}

func TestStefanRootTable(t *testing.T) {
	// One-phase Stefan problem: roots of lambda exp(lambda^2) erf(lambda)
	// = St/sqrt(pi) [derived] (Carslaw and Jaeger, Conduction of Heat in
	// Solids, 2nd ed., chapter XI, form [memory]).
	for _, c := range []struct{ st, want float64 }{
		{0.1, 0.22002}, {0.5, 0.46479}, {1, 0.62006}, {2, 0.80060},
	} {
		got, err := StefanRoot(c.st)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(got-c.want) > 1e-5 {
			t.Errorf("StefanRoot(%g) = %.6f, want %.5f", c.st, got, c.want)
		}
		if r := got * math.Exp(got*got) * math.Erf(got); math.Abs(r-c.st/math.Sqrt(math.Pi)) > 1e-13 {
			t.Errorf("StefanRoot(%g): residual %g", c.st, r-c.st/math.Sqrt(math.Pi))
		}
	}
	if _, err := StefanRoot(0); err == nil {
		t.Error("StefanRoot(0): no error")
	}
}

// fvLunardini is the two-phase Neumann case of Lunardini (1981) with
// Jumikis (1966) soil data (Lunardini, Heat Transfer in Cold Climates)
// [2nd-hand].
var fvLunardini = NeumannProblem{
	ConductivityFrozen: 2.324, HeatCapacityFrozen: 1.966e6,
	ConductivityUnfrozen: 1.860, HeatCapacityUnfrozen: 2.862e6,
	LatentHeat: 1.1045e8,
	Surface:    -10, Initial: 2, FreezingPoint: 0,
}

func TestNeumannFrontLunardini(t *testing.T) {
	m, err := NeumannFront(fvLunardini)
	if err != nil {
		t.Fatal(err)
	}
	// m = 3.6 cm/h^0.5 [2nd-hand], 3.5945 [derived]; X(60 d) = 1.364 m.
	mcm := m * 100 * math.Sqrt(3600)
	if math.Abs(mcm-3.5945) > 0.0005 {
		t.Errorf("m = %.5f cm/h^0.5, want 3.5945", mcm)
	}
	if x := m * math.Sqrt(60*86400); math.Abs(x-1.364) > 0.0005 {
		t.Errorf("X(60 d) = %.4f m, want 1.364", x)
	}
	// The solution satisfies its own conditions: T(0) = Ts, T(X) = Tf and
	// the heat balance at the front kn dT/dx(X-) - kf dT/dx(X+) = L dX/dt
	// (checked by finite differences).
	p := fvLunardini
	tt := 30 * 86400.0
	X := m * math.Sqrt(tt)
	if got := NeumannTemperature(p, m, 0, tt); math.Abs(got-p.Surface) > 1e-12 {
		t.Errorf("surface %g", got)
	}
	eps := 1e-5
	tl, tr := NeumannTemperature(p, m, X-eps, tt), NeumannTemperature(p, m, X+eps, tt)
	if math.Abs(tl) > 1e-4 || math.Abs(tr) > 1e-4 {
		t.Errorf("front temperatures %g %g, want 0", tl, tr)
	}
	gl := (NeumannTemperature(p, m, X-eps, tt) - NeumannTemperature(p, m, X-2*eps, tt)) / eps
	gr := (NeumannTemperature(p, m, X+2*eps, tt) - NeumannTemperature(p, m, X+eps, tt)) / eps
	lhs := p.ConductivityFrozen*gl - p.ConductivityUnfrozen*gr
	rhs := p.LatentHeat * m / (2 * math.Sqrt(tt))
	if math.Abs(lhs-rhs) > 1e-3*rhs {
		t.Errorf("front balance %g W/m2 conducted, %g W/m2 latent", lhs, rhs)
	}
}

func TestNeumannReducesToStefan(t *testing.T) {
	// With the far phase at the freezing point the two-phase equation is
	// the one-phase Stefan equation (Carslaw and Jaeger section 11.2).
	for _, st := range []float64{0.1, 1, 2} {
		p := NeumannProblem{
			ConductivityFrozen: 1, HeatCapacityFrozen: 1,
			ConductivityUnfrozen: 3, HeatCapacityUnfrozen: 2,
			LatentHeat: 1 / st, Surface: -1, Initial: 0, FreezingPoint: 0,
		}
		m, err := NeumannFront(p)
		if err != nil {
			t.Fatal(err)
		}
		l, _ := StefanRoot(st)
		if math.Abs(m-2*l) > 1e-12 {
			t.Errorf("St %g: Neumann m %g, Stefan 2 lambda %g", st, m, 2*l)
		}
		// Thawing is the mirror problem.
		q := p
		q.ConductivityFrozen, q.ConductivityUnfrozen = p.ConductivityUnfrozen, p.ConductivityFrozen
		q.HeatCapacityFrozen, q.HeatCapacityUnfrozen = p.HeatCapacityUnfrozen, p.HeatCapacityFrozen
		q.Surface, q.Initial = 1, 0
		m2, err := NeumannFront(q)
		if err != nil || math.Abs(m2-m) > 1e-12 {
			t.Errorf("thawing mirror: %g, %v; want %g", m2, err, m)
		}
	}
	if _, err := NeumannFront(NeumannProblem{Surface: 1, Initial: 2, FreezingPoint: 0}); err == nil {
		t.Error("no phase change: no error")
	}
}

func TestHalfSpaceTime(t *testing.T) {
	// For 1 % of the step, Fourier number 1/(4 erfcinv(0.01)^2) = 0.0754
	// [derived from Incropera eq. 5.57].
	a, d := 1e-6, 0.3
	tt := HalfSpaceTime(a, d, 0.01)
	if fo := a * tt / (d * d); math.Abs(fo-0.07536) > 1e-4 {
		t.Errorf("Fourier number %g, want 0.0754", fo)
	}
	if f := StepResponseHalfSpace(1, 1e6, 0, d, tt); math.Abs(f-0.01) > 1e-12 {
		t.Errorf("response at the far face %g, want 0.01", f)
	}
	if got := HalfSpaceDepth(a, tt, 0.01); math.Abs(got-d) > 1e-12 {
		t.Errorf("HalfSpaceDepth %g, want %g", got, d)
	}
}

func TestStepResponseHalfSpace(t *testing.T) {
	k, c := 1.2, 2e6
	tt := 5 * 86400.0
	// A vanishing surface resistance gives the erf solution.
	for _, x := range []float64{0, 0.05, 0.3} {
		if d := StepResponseHalfSpace(k, c, 1e-9, x, tt) - StepResponseHalfSpace(k, c, 0, x, tt); math.Abs(d) > 1e-6 {
			t.Errorf("x %g: small resistance differs from erf solution by %g", x, d)
		}
	}
	// The surface flux per kelvin and the surface temperature obey
	// q = (Te - Ts)/r at the surface (Incropera eq. 5.60 at x = 0).
	for _, r := range []float64{0.04, 0.13, 1} {
		ts := StepResponseHalfSpace(k, c, r, 0, tt)
		if q := StepFluxHalfSpace(k, c, r, tt); math.Abs(q-(1-ts)/r) > 1e-12*q {
			t.Errorf("r %g: flux %g, (1-Ts)/r %g", r, q, (1-ts)/r)
		}
	}
	// Erf surface flux k/sqrt(pi a t) (Incropera eq. 5.58).
	if q := StepFluxHalfSpace(k, c, 0, tt); math.Abs(q-k/math.Sqrt(math.Pi*k/c*tt)) > 1e-12*q {
		t.Errorf("erf surface flux %g", q)
	}
	// Huge arguments stay finite (the reason for Erfcx).
	if v := StepResponseHalfSpace(50, 1e6, 1e-6, 0.01, 1e9); math.IsNaN(v) || math.IsInf(v, 0) || v < 0 || v > 1 {
		t.Errorf("large argument: %g", v)
	}
}

func TestConstantFluxHalfSpace(t *testing.T) {
	// The response to a constant flux q is the time integral of the flux
	// response; here checked by its limits (Incropera eq. 5.59): the
	// surface rises as 2 q sqrt(a t/pi)/k, and the heat stored equals q t.
	k, c, q, tt := 0.8, 1.5e6, 40.0, 2*86400.0
	a := k / c
	if got, want := ConstantFluxHalfSpace(k, c, q, 0, tt), 2*q*math.Sqrt(a*tt/math.Pi)/k; math.Abs(got-want) > 1e-12*want {
		t.Errorf("surface rise %g, want %g", got, want)
	}
	// Stored heat by Simpson's rule over depth.
	L := 20 * math.Sqrt(a*tt)
	n := 2000
	dx := L / float64(n)
	sum := ConstantFluxHalfSpace(k, c, q, 0, tt) + ConstantFluxHalfSpace(k, c, q, L, tt)
	for i := 1; i < n; i++ {
		w := 4.0
		if i%2 == 0 {
			w = 2
		}
		sum += w * ConstantFluxHalfSpace(k, c, q, float64(i)*dx, tt)
	}
	if stored := c * sum * dx / 3; math.Abs(stored-q*tt) > 1e-8*q*tt {
		t.Errorf("stored %g J/m2, supplied %g", stored, q*tt)
	}
}

func TestContactTemperature(t *testing.T) {
	// Equal effusivities meet half way; Tc is nearer the body of the larger
	// effusivity (Incropera eq. 5.63). Steel on softwood, ISO 10456 values
	// [read]: steel 50 W/(m K), 7800 kg/m3, 450 J/(kg K); softwood 0.13, 500,
	// 1600: Tc from 60 and 20 degC = 59.049 degC [derived].
	if got := ContactTemperature(1, 2e6, 10, 1, 2e6, 30); math.Abs(got-20) > 1e-12 {
		t.Errorf("equal bodies: %g", got)
	}
	got := ContactTemperature(50, 7800*450, 60, 0.13, 500*1600, 20)
	if math.Abs(got-59.049) > 0.0005 {
		t.Errorf("steel on softwood: %.3f degC", got)
	}
}

func TestPlaneWallEigen(t *testing.T) {
	// Bi = 1: zeta1 = 0.8603, C1 = 1.1191 [derived; matches Incropera
	// Table 5.1 from memory]. Bi = 0.1 (Incropera Table 5.1 from memory):
	// zeta1 = 0.3111, C1 = 1.0161.
	for _, c := range []struct{ bi, z, c1 float64 }{{1, 0.8603, 1.1191}, {0.1, 0.3111, 1.0161}} {
		z, cc, err := PlaneWallEigen(c.bi, 3)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(z[0]-c.z) > 5e-5 || math.Abs(cc[0]-c.c1) > 5e-5 {
			t.Errorf("Bi %g: zeta1 %.5f C1 %.5f, want %.4f %.4f", c.bi, z[0], cc[0], c.z, c.c1)
		}
		for j := range z {
			if r := z[j]*math.Tan(z[j]) - c.bi; math.Abs(r) > 1e-9 {
				t.Errorf("Bi %g root %d: residual %g", c.bi, j, r)
			}
		}
	}
	// At Fo = 0 the series approaches the uniform initial state.
	if th, _ := PlaneWallCooling(1, 1e-4, 0.3, 2000); math.Abs(th-1) > 1e-3 {
		t.Errorf("initial state %g, want 1", th)
	}
}

func TestSimulatePlaneWallCooling(t *testing.T) {
	// A plane wall of half-thickness 0.1 m cooled on both faces, Bi = 1,
	// modelled as its half with an adiabatic mid-plane: the mid-plane and
	// surface temperatures against the series of Incropera eq. 5.39a at
	// Fo = 0.2, 0.5, 1, within 0.5 % of the initial difference.
	L, k, C := 0.1, 1.4, 2.0e6
	R := L / k // Bi = h L / k = 1
	col := Column{Layers: []Layer{{Name: "slab", Thickness: L, Conductivity: k, HeatCapacity: C}}}
	a := k / C
	tEnd := 1.0 * L * L / a
	res, err := Simulate(Problem{
		Column:      col,
		Outside:     Boundary{Kind: Environment, Resistance: R, Temperature: fvtConst(0)},
		Inside:      Boundary{Kind: Adiabatic},
		InitialFunc: func(float64) float64 { return 1 },
		Duration:    tEnd, Step: tEnd / 200, OutputStep: tEnd / 5,
		Probes: []float64{0, L},
	})
	if err != nil {
		t.Fatal(err)
	}
	for k := 1; k < len(res.Times); k++ {
		fo := a * res.Times[k] / (L * L)
		for j, xs := range []float64{1, 0} { // x = 0 is the surface (x* = 1), x = L the mid-plane
			want, _ := PlaneWallCooling(1, fo, xs, 50)
			if got := res.Probe[j][k]; math.Abs(got-want) > 0.005 {
				t.Errorf("Fo %.2f, x* %g: %.5f, series %.5f", fo, xs, got, want)
			}
		}
	}
}
