package solver

import (
	"errors"
	"math"
	"testing"
)

func TestSimulateThawDepthNeumann(t *testing.T) {
	// Frozen ground at -4 degC whose surface is held at +8 degC: the thaw
	// front follows the two-phase Neumann solution with the phases swapped
	// (Carslaw and Jaeger section 11.2), here with the soil data of the
	// Lunardini case [2nd-hand]. Within 1 % after 30 days.
	p := fvLunardini
	p.Surface, p.Initial = 8, -4
	m, err := NeumannFront(p)
	if err != nil {
		t.Fatal(err)
	}
	col := fvtNeumannColumn(p, 6, 0)
	res, err := Simulate(Problem{
		Column:      col,
		Outside:     Boundary{Kind: Environment, Temperature: fvtConst(p.Surface)},
		Inside:      Boundary{Kind: Adiabatic},
		InitialFunc: func(float64) float64 { return p.Initial },
		Duration:    30 * 86400, Step: 3600, OutputStep: 10 * 86400,
	})
	if err != nil {
		t.Fatal(err)
	}
	for k := 1; k < len(res.Times); k++ {
		want := m * math.Sqrt(res.Times[k])
		if x := res.ThawDepth[k]; math.Abs(x-want) > 0.01*want {
			t.Errorf("t = %g d: thaw depth %.4f m, Neumann %.4f m", res.Times[k]/86400, x, want)
		}
		if res.FrostDepth[k] != col.Thickness() {
			t.Errorf("frost depth %g, want the whole column %g", res.FrostDepth[k], col.Thickness())
		}
	}
	if res.ThawDepth[0] != 0 {
		t.Errorf("thaw depth at the start %g", res.ThawDepth[0])
	}
}

func TestSimulateSteadyLayeredWall(t *testing.T) {
	// From the exact steady state of a layered wall with a massless layer
	// and surface resistances (U = 1/(sum R), ISO 6946 [read] surface
	// resistances 0.04 / 0.13), the simulation must stay put, its probes
	// must reproduce the piecewise-linear profile (including the jump
	// across the massless layer) and the surface fluxes equal U dT.
	col := Column{Layers: []Layer{
		{Name: "render", Thickness: 0.02, Conductivity: 0.8, HeatCapacity: 1.6e6},
		{Name: "membrane", Resistance: 0.05},
		{Name: "block", Thickness: 0.25, Conductivity: 0.3, HeatCapacity: 1.2e6},
		{Name: "plaster", Thickness: 0.015, Conductivity: 0.5, HeatCapacity: 1.3e6},
	}}
	rse, rsi, to, ti := 0.04, 0.13, -5.0, 20.0
	rtot := rse + 0.02/0.8 + 0.05 + 0.25/0.3 + 0.015/0.5 + rsi
	q := (to - ti) / rtot // +x flux
	exact := func(x float64) float64 {
		// Temperature on the column side after the resistances up to x.
		r := rse
		switch {
		case x <= 0.02:
			r += x / 0.8
		case x <= 0.27:
			r += 0.02/0.8 + 0.05 + (x-0.02)/0.3
		default:
			r += 0.02/0.8 + 0.05 + 0.25/0.3 + (x-0.27)/0.5
		}
		return to - q*r
	}
	col.OutsideResistance, col.InsideResistance = rse, rsi
	mesh, err := NewMesh(col, MeshOptions{})
	if err != nil {
		t.Fatal(err)
	}
	out, in := ColumnBoundaries(col, fvtConst(to), fvtConst(ti))
	res, err := Simulate(Problem{
		Column: col, Mesh: mesh,
		Outside: out, Inside: in,
		InitialFunc: exact,
		Duration:    86400, Step: 3600,
		Probes: []float64{0, 0.01, 0.02, 0.0200001, 0.1, 0.27, 0.28, 0.285},
	})
	if err != nil {
		t.Fatal(err)
	}
	k := len(res.Times) - 1
	for j, x := range res.Probes {
		want := exact(x)
		if x == 0.02 {
			want = to - q*(rse+0.02/0.8+0.05) // an interface belongs to the deeper side
		}
		if got := res.Probe[j][k]; math.Abs(got-want) > 1e-9 {
			t.Errorf("x = %g: %.10f degC, exact %.10f", x, got, want)
		}
	}
	if math.Abs(res.FluxOutside[k]-q) > 1e-9 || math.Abs(res.FluxInside[k]-q) > 1e-9 {
		t.Errorf("fluxes %g %g, want %g", res.FluxOutside[k], res.FluxInside[k], q)
	}
	if math.Abs(res.SurfaceOutside[k]-(to-q*rse)) > 1e-9 || math.Abs(res.SurfaceInside[k]-(ti+q*rsi)) > 1e-9 {
		t.Errorf("surface temperatures %g %g", res.SurfaceOutside[k], res.SurfaceInside[k])
	}
}

func TestSimulateSingleCellAndProgress(t *testing.T) {
	// A single cell between two environments relaxes as
	// T = Tinf + (T0 - Tinf) exp(-t/tau), tau = C h (R + h/(2k)) / 2 for
	// equal resistances on both sides [derived, lumped capacitance,
	// Incropera section 5.1]; TR-BDF2 with 200 steps per tau within 1e-5.
	l := Layer{Thickness: 0.01, Conductivity: 1, HeatCapacity: 1e6}
	col := Column{Layers: []Layer{l}}
	mesh := &Mesh{Faces: []float64{0, 0.01}, Centers: []float64{0.005}, Layer: []int{0}, FaceResistance: []float64{0, 0}}
	r := 0.2
	tau := 1e6 * 0.01 * (r + 0.005) / 2
	var calls int
	var lastFrac float64
	for _, freeze := range []bool{false, true} {
		c := col
		if freeze {
			c.Layers = []Layer{l}
			c.Layers[0].Freeze = &Freezing{Point: -30, LatentHeat: 1e7, ConductivityFrozen: 2, HeatCapacityFrozen: 9e5}
		}
		res, err := Simulate(Problem{
			Column: c, Mesh: mesh,
			Outside:  Boundary{Kind: Environment, Resistance: r, Temperature: fvtConst(10)},
			Inside:   Boundary{Kind: Environment, Resistance: r, Temperature: fvtConst(10)},
			Initial:  []float64{0},
			Duration: 3 * tau, Step: tau / 200,
			Progress: func(f float64) { calls++; lastFrac = f },
		})
		if err != nil {
			t.Fatal(err)
		}
		want := 10 - 10*math.Exp(-3)
		if got := res.Final[0]; math.Abs(got-want) > 1e-5 {
			t.Errorf("freeze %v: %g, want %g", freeze, got, want)
		}
	}
	if calls < 100 || lastFrac != 1 {
		t.Errorf("progress called %d times, last %g", calls, lastFrac)
	}
}

func TestSimulateErrors(t *testing.T) {
	l := Layer{Thickness: 0.1, Conductivity: 1, HeatCapacity: 1e6}
	col := Column{Layers: []Layer{l}}
	other, _ := NewMesh(Column{Layers: []Layer{{Thickness: 0.2, Conductivity: 1, HeatCapacity: 1e6}}}, MeshOptions{})
	good := func() Problem {
		return Problem{
			Column:      col,
			Outside:     Boundary{Kind: Environment, Temperature: fvtConst(0)},
			Inside:      Boundary{Kind: Adiabatic},
			InitialFunc: func(float64) float64 { return 1 },
			Duration:    3600, Step: 60,
		}
	}
	if _, err := Simulate(good()); err != nil {
		t.Fatalf("good problem: %v", err)
	}
	for name, edit := range map[string]func(*Problem){
		"no initial":        func(p *Problem) { p.InitialFunc = nil },
		"initial length":    func(p *Problem) { p.InitialFunc = nil; p.Initial = []float64{1} },
		"initial NaN":       func(p *Problem) { p.InitialFunc = func(float64) float64 { return math.NaN() } },
		"zero step":         func(p *Problem) { p.Step = 0 },
		"negative duration": func(p *Problem) { p.Duration = -1 },
		"sample spacing":    func(p *Problem) { p.OutputStep = 90 },
		"probe outside":     func(p *Problem) { p.Probes = []float64{0.2} },
		"no temperature":    func(p *Problem) { p.Outside.Temperature = nil },
		"no flux":           func(p *Problem) { p.Inside = Boundary{Kind: PrescribedFlux} },
		"bad kind":          func(p *Problem) { p.Inside = Boundary{Kind: 7} },
		"negative R":        func(p *Problem) { p.Outside.Resistance = -0.1 },
		"foreign mesh":      func(p *Problem) { p.Mesh = other },
		"bad scheme":        func(p *Problem) { p.Scheme = 9 },
		"NaN boundary":      func(p *Problem) { p.Outside.Temperature = func(t float64) float64 { return math.Log(-t) } },
		"bad column":        func(p *Problem) { p.Column = Column{} },
	} {
		p := good()
		edit(&p)
		if _, err := Simulate(p); err == nil {
			t.Errorf("%s: no error", name)
		}
	}
	if _, _, err := SpinUp(good(), 0, 1e-3, 10); err == nil {
		t.Error("spin-up with zero period: no error")
	}
	p := good()
	p.Outside.Temperature = func(t float64) float64 { return math.Sin(2 * math.Pi * t / 3600) }
	if _, _, err := SpinUp(p, 3600, 1e-15, 1); !errors.Is(err, ErrSpinUp) {
		t.Errorf("spin-up not converging: %v", err)
	}
}
