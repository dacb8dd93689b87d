package solver

import (
	"math"
	"testing"
)

// fvtConst returns a constant boundary function.
func fvtConst(v float64) func(float64) float64 { return func(float64) float64 { return v } }

// fvtSoil is the soil of Incropera et al., Example 5.6 [read]:
// k 0.52 W/(m K), rho 2050 kg/m3, c 1840 J/(kg K).
var fvtSoil = Layer{Name: "soil", Thickness: 6, Conductivity: 0.52, HeatCapacity: 2050 * 1840}

func TestSimulateErfStepIncroperaExample56(t *testing.T) {
	// Incropera Example 5.6 [read]: soil at 20 degC, surface held at
	// -15 degC for 60 days; 0 degC isotherm at 0.6766 m [derived], and the
	// erf profile (Incropera eq. 5.57) everywhere. Default mesh, hourly steps.
	col := Column{Layers: []Layer{fvtSoil}, HalfSpace: true}
	probes := []float64{0, 0.05, 0.2, 0.5, 0.6766, 1, 1.5}
	res, err := Simulate(Problem{
		Column:   col,
		Outside:  Boundary{Kind: Environment, Temperature: fvtConst(-15)},
		Inside:   Boundary{Kind: Adiabatic},
		Initial:  fvtFill(col, 20),
		Duration: 60 * 86400, Step: 3600, OutputStep: 86400,
		Probes: probes,
	})
	if err != nil {
		t.Fatal(err)
	}
	k := len(res.Times) - 1
	tt := res.Times[k]
	worst := 0.0
	for j, x := range probes {
		want := 20 - 35*StepResponseHalfSpace(0.52, 2050*1840, 0, x, tt)
		got := res.Probe[j][k]
		worst = math.Max(worst, math.Abs(got-want)/35)
		if math.Abs(got-want) > 0.005*35 {
			t.Errorf("x = %g m: %.3f degC, erf solution %.3f", x, got, want)
		}
	}
	t.Logf("largest deviation from the erf profile %.3f %% of the step", 100*worst)
	if x := res.FrostDepth[k]; math.Abs(x-0.6766) > 0.005*0.6766 {
		t.Errorf("0 degC isotherm at %.4f m, want 0.6766 m", x)
	} else {
		t.Logf("0 degC isotherm at %.4f m after 60 d (exact 0.6766 m), %d cells", x, res.Mesh.Cells())
	}
	q := -35 * StepFluxHalfSpace(0.52, 2050*1840, 0, tt)
	if got := res.FluxOutside[k]; math.Abs(got-q) > 0.005*math.Abs(q) {
		t.Errorf("surface flux %.4f W/m2, want %.4f", got, q)
	}
	if res.Energy.RelativeError > 1e-8 {
		t.Errorf("energy balance error %g", res.Energy.RelativeError)
	}
}

// fvtFill returns a uniform initial state for the default mesh of c.
func fvtFill(c Column, v float64) []float64 {
	m, err := NewMesh(c, MeshOptions{})
	if err != nil {
		panic(err)
	}
	x := make([]float64, m.Cells())
	for i := range x {
		x[i] = v
	}
	return x
}

func TestSimulateFluxAndConvectiveSteps(t *testing.T) {
	// Incropera section 5.7 cases 2 (constant surface flux, eq. 5.59) and 3
	// (surface convection, eq. 5.60), in a wet clay half-space (Moene and
	// van Dam 2014, Table 2.2 [2nd-hand]: k 1.4 W/(m K), a 0.45e-6 m2/s).
	clay := Layer{Name: "clay", Thickness: 4, Conductivity: 1.4, HeatCapacity: 1.4 / 0.45e-6}
	col := Column{Layers: []Layer{clay}, HalfSpace: true}
	probes := []float64{0, 0.02, 0.1, 0.3, 0.6}
	for _, c := range []struct {
		name string
		out  Boundary
		want func(x, t float64) float64
		span float64 // scale of the temperature change, K
	}{
		{"flux 60 W/m2", Boundary{Kind: PrescribedFlux, Flux: fvtConst(60)},
			func(x, t float64) float64 {
				return 5 + ConstantFluxHalfSpace(clay.Conductivity, clay.HeatCapacity, 60, x, t)
			}, 0},
		{"convective R 0.1", Boundary{Kind: Environment, Resistance: 0.1, Temperature: fvtConst(25)},
			func(x, t float64) float64 {
				return 5 + 20*StepResponseHalfSpace(clay.Conductivity, clay.HeatCapacity, 0.1, x, t)
			}, 0},
	} {
		res, err := Simulate(Problem{
			Column: col, Outside: c.out, Inside: Boundary{Kind: Adiabatic},
			Initial: fvtFill(col, 5), Duration: 10 * 86400, Step: 1800, OutputStep: 86400, Probes: probes,
		})
		if err != nil {
			t.Fatal(err)
		}
		worst := 0.0
		for k := 1; k < len(res.Times); k++ {
			tt := res.Times[k]
			span := math.Abs(c.want(0, tt) - 5)
			for j, x := range probes {
				want := c.want(x, tt)
				got := res.Probe[j][k]
				worst = math.Max(worst, math.Abs(got-want)/span)
				if math.Abs(got-want) > 0.005*span {
					t.Errorf("%s: t = %g d, x = %g m: %.4f degC, closed form %.4f", c.name, tt/86400, x, got, want)
				}
			}
		}
		t.Logf("%s: largest deviation %.3f %% of the surface change (%d cells)", c.name, 100*worst, res.Mesh.Cells())
		if res.Energy.RelativeError > 1e-8 {
			t.Errorf("%s: energy balance error %g", c.name, res.Energy.RelativeError)
		}
	}
}

func TestEnergyBalanceLinear(t *testing.T) {
	// Brick, insulation, a massless air gap and plaster between two
	// environments with surface resistances (ISO 6946 Rse 0.04, Rsi 0.13
	// [read]); the stored heat must equal the integrated surface flows to
	// round-off for every scheme. Invented demo construction.
	col := Column{Layers: []Layer{
		{Name: "brick", Thickness: 0.105, Conductivity: 0.77, HeatCapacity: 1700 * 1000},
		{Name: "gap", Resistance: 0.18},
		{Name: "insulation", Thickness: 0.08, Conductivity: 0.035, HeatCapacity: 30 * 1400},
		{Name: "plaster", Thickness: 0.015, Conductivity: 0.57, HeatCapacity: 1300 * 1000},
	}}
	out := func(t float64) float64 { return 10 + 12*math.Sin(2*math.Pi*t/86400) + 3*math.Sin(2*math.Pi*t/3600/7) }
	for _, s := range []TimeScheme{TRBDF2, CrankNicolson, BackwardEuler} {
		res, err := Simulate(Problem{
			Column:      col,
			Outside:     Boundary{Kind: Environment, Resistance: 0.04, Temperature: out},
			Inside:      Boundary{Kind: Environment, Resistance: 0.13, Temperature: fvtConst(20)},
			InitialFunc: func(x float64) float64 { return 15 },
			Duration:    10*86400 + 1234, Step: 600, Scheme: s,
		})
		if err != nil {
			t.Fatal(err)
		}
		e := res.Energy
		t.Logf("scheme %d: stored %.6g J/m2, in %.6g + %.6g, exchanged %.4g, relative error %.2g", s, e.Stored, e.InflowOutside, e.InflowInside, e.Exchanged, e.RelativeError)
		if !(e.RelativeError < 1e-8) || e.Exchanged <= 0 {
			t.Errorf("scheme %d: relative energy error %g", s, e.RelativeError)
		}
	}
}

func TestCrankNicolsonRingsTRBDF2DoesNot(t *testing.T) {
	// A sudden change of surface temperature with a step far longer than
	// the diffusion time of the surface cell. Crank-Nicolson's stability
	// function tends to -1 for such stiff modes, so the surface cell
	// overshoots and keeps oscillating from step to step (Hairer and Wanner,
	// Solving ODEs II, section IV.3). TR-BDF2 is L-stable: its stability
	// function behaves as -(1+(1-g)^2)/(g (1-g) |z|) = -4.83/|z| for stiff
	// modes [derived], so at most a small dip in the first step, gone after
	// the second.
	concrete := Layer{Name: "concrete", Thickness: 0.3, Conductivity: 2.3, HeatCapacity: 2400 * 1000}
	col := Column{Layers: []Layer{concrete}}
	mesh, err := NewMesh(col, MeshOptions{SurfaceCell: 0.002, Growth: 1.2})
	if err != nil {
		t.Fatal(err)
	}
	osc := func(s TimeScheme) (signChanges int, late float64) {
		res, err := Simulate(Problem{
			Column: col, Mesh: mesh,
			Outside:     Boundary{Kind: Environment, Temperature: fvtConst(0)},
			Inside:      Boundary{Kind: Adiabatic},
			InitialFunc: func(float64) float64 { return 20 },
			Duration:    12 * 3600, Step: 3600, Scheme: s,
			Probes: []float64{mesh.Centers[0]},
		})
		if err != nil {
			t.Fatal(err)
		}
		p := res.Probe[0]
		for k := 2; k < len(p); k++ {
			if (p[k]-p[k-1])*(p[k-1]-p[k-2]) < 0 {
				signChanges++
			}
		}
		// Overshoot below the 0 degC surface from the third step on.
		for _, v := range p[3:] {
			late = math.Max(late, -v)
		}
		return signChanges, late
	}
	cnS, cnO := osc(CrankNicolson)
	trS, trO := osc(TRBDF2)
	t.Logf("Crank-Nicolson: %d reversals, overshoot after step 2 %.3f K; TR-BDF2: %d reversals, overshoot after step 2 %.2g K", cnS, cnO, trS, trO)
	if cnS < 8 || cnO < 1 {
		t.Errorf("Crank-Nicolson did not ring (%d reversals, %g K)", cnS, cnO)
	}
	if trS > 2 || trO > 1e-3 {
		t.Errorf("TR-BDF2 rings: %d reversals, overshoot %g K", trS, trO)
	}
}
