package solver

import (
	"math"
	"reflect"
	"sort"
	"strings"
	"testing"
)

// settleKeyProblem is a small freezing column under an annual wave with a
// snow-like varying resistance, a prescribed bottom flux and a step that
// does not divide the period (so the last step of a cycle is short).
// Invented test data.
func settleKeyProblem() (Problem, SettleOptions) {
	year := 365 * 86400.0
	col := Column{Layers: []Layer{{Name: "silt", Thickness: 3, Conductivity: 1.5, HeatCapacity: 2.6e6,
		Freeze: &Freezing{LatentHeat: 8e7, ConductivityFrozen: 2.1, HeatCapacityFrozen: 1.9e6}}}}
	mesh, err := NewMesh(col, MeshOptions{SurfaceCell: 0.05, Growth: 1.2})
	if err != nil {
		panic(err)
	}
	p := Problem{
		Column: col, Mesh: mesh,
		Outside: Boundary{Kind: Environment, Resistance: 0.05,
			Temperature:  func(t float64) float64 { return 2 - 12*math.Cos(2*math.Pi*t/year) },
			ResistanceAt: func(t float64) float64 { return 0.05 + 0.1*math.Max(0, math.Cos(2*math.Pi*t/year)) }},
		Inside:      Boundary{Kind: PrescribedFlux, Flux: func(float64) float64 { return -0.06 }},
		InitialFunc: func(x float64) float64 { return 2 + 0.03*x },
		Step:        7 * 3600,
	}
	o := SettleOptions{Period: year, MaxCycles: 4, Tolerance: 0.01, FrontTolerance: 1e-3, ConstantInside: true}
	return p, o
}

// TestSettleKeyCoversTheEvaluatedTimes records every time at which Settle
// evaluates a boundary function, for each time scheme, and wants each of
// them among the times the key evaluates (settleTimes): the key then sees
// every boundary value the settled state depends on.
func TestSettleKeyCoversTheEvaluatedTimes(t *testing.T) {
	for _, scheme := range []TimeScheme{TRBDF2, CrankNicolson, BackwardEuler} {
		for _, freeze := range []bool{true, false} {
			p, o := settleKeyProblem()
			p.Scheme = scheme
			if freeze {
				o.CoarseStep = 3 * p.Step
			}
			if !freeze {
				l := p.Column.Layers[0]
				l.Freeze = nil
				p.Column.Layers = []Layer{l}
			}
			keyed := map[float64]bool{}
			for _, x := range keyTimes(p, o) {
				keyed[x] = true
			}
			seen := map[float64]bool{}
			wrap := func(f func(float64) float64) func(float64) float64 {
				return func(x float64) float64 { seen[x] = true; return f(x) }
			}
			p.Outside.Temperature = wrap(p.Outside.Temperature)
			p.Outside.ResistanceAt = wrap(p.Outside.ResistanceAt)
			p.Inside.Flux = wrap(p.Inside.Flux)
			if _, err := Settle(p, o); err != nil {
				t.Fatal(err)
			}
			if len(seen) < 100 {
				t.Fatalf("scheme %d: only %d times evaluated", scheme, len(seen))
			}
			for x := range seen {
				if !keyed[x] {
					t.Fatalf("scheme %d, freeze %v: Settle evaluates a boundary at t = %v s, which the key does not", scheme, freeze, x)
				}
			}
		}
	}
}

// TestSettleKeySeesEveryInput changes each input of Settle in turn and
// wants a new key, and changes only what Settle ignores and wants the
// same key. It also lists the fields of every type the key reads, so that
// a field added to one of them fails here until the key decides about it.
func TestSettleKeySeesEveryInput(t *testing.T) {
	p0, o0 := settleKeyProblem()
	base, err := SettleKey(p0, o0)
	if err != nil {
		t.Fatal(err)
	}
	year := o0.Period
	freeze := func(f func(*Freezing)) func(*Problem, *SettleOptions) {
		return func(p *Problem, _ *SettleOptions) {
			fz := *p.Column.Layers[0].Freeze
			f(&fz)
			l := p.Column.Layers[0]
			l.Freeze = &fz
			p.Column.Layers = []Layer{l}
		}
	}
	layer := func(f func(*Layer)) func(*Problem, *SettleOptions) {
		return func(p *Problem, _ *SettleOptions) {
			l := p.Column.Layers[0]
			f(&l)
			p.Column.Layers = []Layer{l}
		}
	}
	changes := map[string]func(*Problem, *SettleOptions){
		"Period":             func(_ *Problem, o *SettleOptions) { o.Period *= 2 },
		"MaxCycles":          func(_ *Problem, o *SettleOptions) { o.MaxCycles++ },
		"Tolerance":          func(_ *Problem, o *SettleOptions) { o.Tolerance /= 2 },
		"FrontTolerance":     func(_ *Problem, o *SettleOptions) { o.FrontTolerance /= 2 },
		"ConstantInside":     func(_ *Problem, o *SettleOptions) { o.ConstantInside = false },
		"OutputStep":         func(_ *Problem, o *SettleOptions) { o.OutputStep = 2 * 86400 },
		"CoarseStep":         func(p *Problem, o *SettleOptions) { o.CoarseStep = 3 * p.Step },
		"DeferCheck":         func(_ *Problem, o *SettleOptions) { o.DeferCheck = true },
		"Start":              func(p *Problem, _ *SettleOptions) { p.Start = 86400 },
		"Step":               func(p *Problem, _ *SettleOptions) { p.Step = 3600 },
		"Scheme":             func(p *Problem, _ *SettleOptions) { p.Scheme = CrankNicolson },
		"SpinUpDepth":        func(p *Problem, _ *SettleOptions) { p.SpinUpDepth = 1 },
		"Thickness":          layer(func(l *Layer) { l.Thickness = 3.5 }),
		"Conductivity":       layer(func(l *Layer) { l.Conductivity = 1.6 }),
		"HeatCapacity":       layer(func(l *Layer) { l.HeatCapacity = 2.5e6 }),
		"Resistance":         func(p *Problem, _ *SettleOptions) { p.Column.Layers = append(p.Column.Layers, Layer{Resistance: 0.1}) },
		"Freeze":             layer(func(l *Layer) { l.Freeze = nil }),
		"Point":              freeze(func(f *Freezing) { f.Point = -0.1 }),
		"Range":              freeze(func(f *Freezing) { f.Range = 0.5 }),
		"LatentHeat":         freeze(func(f *Freezing) { f.LatentHeat = 7e7 }),
		"ConductivityFrozen": freeze(func(f *Freezing) { f.ConductivityFrozen = 2 }),
		"HeatCapacityFrozen": freeze(func(f *Freezing) { f.HeatCapacityFrozen = 2e6 }),
		"OutsideResistance":  func(p *Problem, _ *SettleOptions) { p.Column.OutsideResistance = 0.04 },
		"InsideResistance":   func(p *Problem, _ *SettleOptions) { p.Column.InsideResistance = 0.13 },
		"HalfSpace":          func(p *Problem, _ *SettleOptions) { p.Column.HalfSpace = true },
		"Mesh": func(p *Problem, _ *SettleOptions) {
			p.Mesh, _ = NewMesh(p.Column, MeshOptions{SurfaceCell: 0.04, Growth: 1.2})
		},
		"InitialEnthalpy": func(p *Problem, _ *SettleOptions) { p.InitialEnthalpy = make([]float64, p.Mesh.Cells()) },
		"Initial":         func(p *Problem, _ *SettleOptions) { p.Initial = make([]float64, p.Mesh.Cells()) },
		"InitialFunc":     func(p *Problem, _ *SettleOptions) { p.InitialFunc = func(float64) float64 { return 2 } },
		"Kind":            func(p *Problem, _ *SettleOptions) { p.Inside = Boundary{Kind: Adiabatic} },
		"Boundary.Resistance": func(p *Problem, _ *SettleOptions) {
			p.Outside.Resistance = 0.06
		},
		// A change of the forcing late in the cycle, and one between the
		// samples a daily check would see.
		"Temperature": func(p *Problem, _ *SettleOptions) {
			f := p.Outside.Temperature
			p.Outside.Temperature = func(t float64) float64 {
				if t > 0.9*year {
					return f(t) + 1e-9
				}
				return f(t)
			}
		},
		"Flux": func(p *Problem, _ *SettleOptions) {
			p.Inside.Flux = func(t float64) float64 { return -0.06 + 0.01*math.Sin(2*math.Pi*t/3600) }
		},
		"ResistanceAt": func(p *Problem, _ *SettleOptions) { p.Outside.ResistanceAt = nil },
	}
	same := map[string]func(*Problem, *SettleOptions){
		"Name":       layer(func(l *Layer) { l.Name = "other" }),
		"Duration":   func(p *Problem, _ *SettleOptions) { p.Duration = 30 * year },
		"Probes":     func(p *Problem, _ *SettleOptions) { p.Probes = []float64{0.5, 1} },
		"OutputStep": func(p *Problem, _ *SettleOptions) { p.OutputStep = 3600 },
		"Progress":   func(p *Problem, _ *SettleOptions) { p.Progress = func(float64) {} },
		"Observe":    func(p *Problem, _ *SettleOptions) { p.Observe = func(*Sample) {} },
		"CheckCycle": func(p *Problem, _ *SettleOptions) { p.CheckCycle = &Settled{Pending: true} },
		"Settle.Progress": func(_ *Problem, o *SettleOptions) {
			o.Progress = func(int) {}
		},
	}
	for name, f := range changes {
		p, o := settleKeyProblem()
		f(&p, &o)
		k, err := SettleKey(p, o)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if k == base {
			t.Errorf("a change of %s leaves the settle key unchanged", name)
		}
	}
	for name, f := range same {
		p, o := settleKeyProblem()
		f(&p, &o)
		if k, _ := SettleKey(p, o); k != base {
			t.Errorf("a change of %s, which Settle ignores, changes the settle key", name)
		}
	}
	// Every field of the types the key reads is either keyed or ignored
	// above: a new field must be decided on.
	covered := map[string]bool{}
	for name := range changes {
		covered[name[strings.LastIndex(name, ".")+1:]] = true
	}
	for name := range same {
		covered[name[strings.LastIndex(name, ".")+1:]] = true
	}
	var missing []string
	for _, v := range []any{Problem{}, SettleOptions{}, Column{}, Layer{}, Freezing{}, Boundary{}} {
		ty := reflect.TypeOf(v)
		for i := 0; i < ty.NumField(); i++ {
			n := ty.Field(i).Name
			switch n {
			case "Column", "Outside", "Inside", "Layers":
				continue // read field by field
			}
			if !covered[n] {
				missing = append(missing, ty.Name()+"."+n)
			}
		}
	}
	sort.Strings(missing)
	if len(missing) > 0 {
		t.Errorf("fields the settle key has not decided on: %v", missing)
	}
}

// TestSettleKeySameState: two problems with one key settle to the same
// state bit for bit, though they differ in what Settle ignores.
func TestSettleKeySameState(t *testing.T) {
	p, o := settleKeyProblem()
	q := p
	q.Duration, q.Probes, q.OutputStep = 10*o.Period, []float64{1}, 3600
	kp, _ := SettleKey(p, o)
	kq, _ := SettleKey(q, o)
	if kp != kq {
		t.Fatal("keys differ")
	}
	a, err := Settle(p, o)
	if err != nil {
		t.Fatal(err)
	}
	b, err := Settle(q, o)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(a, b) {
		t.Error("problems with one key settle differently")
	}
}

// TestSettleCoarseCyclesSameState: cheap coarse cycles first (6 h steps)
// settle a freezing column under an annual and a daily wave at the state
// the hourly cycles alone reach (the fixed point of the hourly step, to
// within the tolerances: the deepest frost of a year run from either
// within 2 mm, every cell within 0.05 K at its end), with fewer hourly
// cycles. Invented test data.
func TestSettleCoarseCyclesSameState(t *testing.T) {
	year := 365 * 86400.0
	col := Column{Layers: []Layer{{Name: "silt", Thickness: 6, Conductivity: 1.5, HeatCapacity: 2.6e6,
		Freeze: &Freezing{LatentHeat: 8e7, ConductivityFrozen: 2.1, HeatCapacityFrozen: 1.9e6}}}}
	mesh, err := NewMesh(col, MeshOptions{SurfaceCell: 0.03, Growth: 1.15})
	if err != nil {
		t.Fatal(err)
	}
	p := Problem{
		Column: col, Mesh: mesh,
		Outside: Boundary{Kind: Environment, Resistance: 0.05, Temperature: func(t float64) float64 {
			return 3 - 14*math.Cos(2*math.Pi*t/year) + 4*math.Sin(2*math.Pi*t/86400)
		}},
		Inside:      Boundary{Kind: PrescribedFlux, Flux: func(float64) float64 { return 0.06 }},
		InitialFunc: func(x float64) float64 { return 3 + 0.04*x },
		Step:        3600,
	}
	o := SettleOptions{Period: year, MaxCycles: 30, Tolerance: 0.02, FrontTolerance: 1e-3, ConstantInside: true}
	plain, err := Settle(p, o)
	if err != nil {
		t.Fatal(err)
	}
	o.CoarseStep = 6 * 3600
	coarse, err := Settle(p, o)
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("plain: %v; coarse first: %d coarse cycles, then %v", plain, coarse.CoarseCycles, coarse)
	if !plain.Converged || !coarse.Converged || coarse.CoarseCycles == 0 || coarse.Cycles >= plain.Cycles {
		t.Fatalf("want both settled and fewer hourly cycles after coarse ones: plain %v, coarse %v", plain, coarse)
	}
	year1 := func(h []float64) *Result {
		q := p
		q.InitialEnthalpy, q.InitialFunc, q.Duration, q.OutputStep = h, nil, year, 86400
		r, err := Simulate(q)
		if err != nil {
			t.Fatal(err)
		}
		return r
	}
	a, b := year1(plain.Enthalpy), year1(coarse.Enthalpy)
	fa, fb := 0.0, 0.0
	for k := range a.FrostDepth {
		fa, fb = math.Max(fa, a.FrostDepth[k]), math.Max(fb, b.FrostDepth[k])
	}
	if fa < 0.5 || math.Abs(fa-fb) > 2e-3 {
		t.Errorf("deepest frost %.4f m after the plain spin-up, %.4f m after the coarse one", fa, fb)
	}
	for i := range a.Final {
		if d := math.Abs(a.Final[i] - b.Final[i]); d > 0.05 {
			t.Fatalf("cell %d ends %.4f K apart", i, d)
		}
	}
}
