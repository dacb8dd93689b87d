package solver

import (
	"math"
	"testing"
)

// A linear column under an annual wave with a geothermal flux at the
// bottom, started far from its periodic state (uniform 0 degC): Settle
// must reach the exact periodic solution (mean: steady conduction with the
// bottom flux, T = Ts + q x / k [derived]; wave: the ISO 13786 transfer
// matrices of a column insulated at its base), and the deep reset must get
// there in a fraction of the cycles the plain repetition needs.
func TestSettleReachesPeriodicState(t *testing.T) {
	const (
		year = 365 * 86400.0
		q    = 0.065
		mean = 6.0
		amp  = 10.0
	)
	col := Column{Layers: []Layer{
		{Name: "sand", Thickness: 2, Conductivity: 1.8, HeatCapacity: 2.2e6},
		{Name: "clay", Thickness: 18, Conductivity: 1.2, HeatCapacity: 2.8e6},
	}}
	mesh, err := NewMesh(col, MeshOptions{ResolvePeriod: year, MaxCell: 0.25})
	if err != nil {
		t.Fatal(err)
	}
	surf := func(t float64) float64 { return mean + amp*math.Cos(2*math.Pi*t/year) }
	p := Problem{
		Column: col, Mesh: mesh,
		Outside:     Boundary{Kind: Environment, Temperature: surf},
		Inside:      Boundary{Kind: PrescribedFlux, Flux: func(float64) float64 { return q }},
		Step:        86400 / 4,
		InitialFunc: func(float64) float64 { return 0 },
	}
	o := SettleOptions{Period: year, MaxCycles: 400, Tolerance: 0.005, FrontTolerance: 1e-3, ConstantInside: true}
	fast, err := Settle(p, o)
	if err != nil {
		t.Fatal(err)
	}
	o.ConstantInside = false
	slow, err := Settle(p, o)
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("with deep reset: %v; without: %v", fast, slow)
	if !fast.Converged || fast.DeepResets == 0 || fast.Cycles*5 > slow.Cycles {
		t.Errorf("deep reset %v, plain %v: want the reset to settle in under a fifth of the cycles", fast, slow)
	}
	// The settled state against the exact periodic solution at the cell
	// centres (t = 0, the start of a cycle).
	xs := mesh.Centers
	meanT, err := SteadyWithBottomFlux(col, mean, q, xs)
	if err != nil {
		t.Fatal(err)
	}
	wave, _, err := HarmonicInsulated(col, year, complex(amp, 0), xs)
	if err != nil {
		t.Fatal(err)
	}
	worst := 0.0
	for i, h := range fast.Enthalpy {
		exact := meanT[i] + real(wave[i])
		worst = math.Max(worst, math.Abs(h/p.Column.Layers[mesh.Layer[i]].HeatCapacity-exact))
	}
	// The time discretisation (6 h steps) and the mesh leave about 0.01 K.
	if worst > 0.03 {
		t.Errorf("settled state differs from the exact periodic solution by %.4f K", worst)
	}
}

// A steady permafrost base: a surface held at -2 degC over ground with a
// strong upward heat flow q = 0.4 W/m2. In steady state no latent heat
// flows at the base, which lies where the frozen gradient q/kf brings the
// temperature to 0 degC: z0 = 2 kf / q [derived]. Started unfrozen, the
// front would need decades to get there; the deep reset puts it there and
// Settle converges.
func TestSettlePermafrostBase(t *testing.T) {
	const (
		year = 365 * 86400.0
		q    = 0.4
		ts   = -2.0
		kf   = 1.6
		ku   = 1.2
	)
	col := Column{Layers: []Layer{{Name: "silt", Thickness: 12, Conductivity: ku, HeatCapacity: 2.6e6,
		Freeze: &Freezing{LatentHeat: 1.2e8, ConductivityFrozen: kf, HeatCapacityFrozen: 1.9e6}}}}
	mesh, err := NewMesh(col, MeshOptions{ResolvePeriod: year, MaxCell: 0.2})
	if err != nil {
		t.Fatal(err)
	}
	p := Problem{
		Column: col, Mesh: mesh,
		Outside:     Boundary{Kind: Environment, Temperature: func(float64) float64 { return ts }},
		Inside:      Boundary{Kind: PrescribedFlux, Flux: func(float64) float64 { return q }},
		Step:        86400,
		InitialFunc: func(float64) float64 { return 1 },
	}
	st, err := Settle(p, SettleOptions{Period: year, MaxCycles: 30, Tolerance: 0.01, FrontTolerance: 1e-3, ConstantInside: true})
	if err != nil {
		t.Fatal(err)
	}
	z0 := -ts * kf / q
	got := st.MaxFrost[len(st.MaxFrost)-1]
	t.Logf("%v; base %.4f m, steady %.4f m", st, got, z0)
	if !st.Converged || math.Abs(got-z0) > 0.02 {
		t.Errorf("permafrost base %.4f m after %d cycles (converged %v), want %.4f m", got, st.Cycles, st.Converged, z0)
	}
	// Without the reset the front is nowhere near after as many cycles.
	plain, err := Settle(p, SettleOptions{Period: year, MaxCycles: st.Cycles, Tolerance: 0.01, FrontTolerance: 1e-3})
	if err != nil {
		t.Fatal(err)
	}
	if pb := plain.MaxFrost[len(plain.MaxFrost)-1]; plain.Converged || math.Abs(pb-z0) < 0.5 {
		t.Errorf("without the deep reset: %v, base %.3f m: want it unsettled and far from %.3f m", plain, pb, z0)
	}
	// Below the base the unfrozen gradient q/ku [derived].
	i := len(mesh.Centers) - 1
	j := i - 5
	hi, hj := st.Enthalpy[i], st.Enthalpy[j]
	ph := newFvPhase(col.Layers[0])
	ti, _, _, _ := ph.state(hi)
	tj, _, _, _ := ph.state(hj)
	if g := (ti - tj) / (mesh.Centers[i] - mesh.Centers[j]); math.Abs(g-q/ku) > 1e-3*q/ku {
		t.Errorf("gradient below the base %.6f K/m, want q/ku = %.6f", g, q/ku)
	}
}
