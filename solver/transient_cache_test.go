package solver

import (
	"math"
	"testing"
)

// TestEnthalpyCachedStateMatchesFresh checks the premise of the shortcuts
// in the enthalpy iteration: after every time step, each freezing cell's
// remembered region, temperature, liquid fraction, slope, conductivity,
// resistances and their derivatives equal what a fresh evaluation from its
// enthalpy gives (fvPhase.state and setHalves), the span mLo..mHi holds
// every cell in its freezing range, each partly frozen isothermal cell has
// the resistances of the side sideUp reports, and the conductances agree
// with the resistances. The column mixes an isothermal and a
// freezing-range layer under a daily wave that freezes and thaws the top
// cells every day, in each time scheme. A second column freezes from both
// ends, an isothermal layer at each under a long stretch of rock, so that
// the later iterations of a stage, restricted to the rows around one
// front, leave the partly frozen cells of the other outside their rows.
func TestEnthalpyCachedStateMatchesFresh(t *testing.T) {
	iso := func(name string, d float64) Layer {
		return Layer{Name: name, Thickness: d, Conductivity: 1.2, HeatCapacity: 2.4e6,
			Freeze: &Freezing{Point: 0, LatentHeat: 8e7, ConductivityFrozen: 1.9, HeatCapacityFrozen: 1.8e6}}
	}
	cases := []struct {
		name   string
		col    Column
		mesh   MeshOptions
		inside Boundary
	}{
		{"isothermal over a freezing range", Column{Layers: []Layer{
			iso("top", 0.3),
			{Name: "below", Thickness: 0.7, Conductivity: 1.6, HeatCapacity: 2.6e6,
				Freeze: &Freezing{Point: -0.1, Range: 0.8, LatentHeat: 6e7, ConductivityFrozen: 2.2, HeatCapacityFrozen: 2.0e6}},
			{Name: "rock", Thickness: 1, Conductivity: 2.5, HeatCapacity: 2.2e6},
		}}, MeshOptions{SurfaceCell: 0.02, Growth: 1.1}, Boundary{Kind: PrescribedFlux, Flux: func(float64) float64 { return 0.06 }}},
		{"freezing at both ends", Column{Layers: []Layer{
			iso("top", 0.3),
			{Name: "rock", Thickness: 3, Conductivity: 2.5, HeatCapacity: 2.2e6},
			iso("bottom", 0.3),
		}}, MeshOptions{SurfaceCell: 0.02, Growth: 1}, Boundary{Kind: Environment, Resistance: 0.1, Temperature: func(t float64) float64 { return -4 + 3*math.Sin(2*math.Pi*t/(3*86400)) }}},
	}
	for _, tc := range cases {
		col := tc.col
		mesh, err := NewMesh(col, tc.mesh)
		if err != nil {
			t.Fatal(err)
		}
		for _, scheme := range []TimeScheme{TRBDF2, CrankNicolson, BackwardEuler} {
			cachedStateRun(t, tc.name, scheme, Problem{
				Column: col, Mesh: mesh, Scheme: scheme,
				Outside: Boundary{Kind: Environment, Resistance: 0.04, Temperature: func(t float64) float64 {
					return -3 - 6*math.Cos(2*math.Pi*t/(20*86400)) + 5*math.Sin(2*math.Pi*t/86400)
				}},
				Inside:      tc.inside,
				InitialFunc: func(x float64) float64 { return 1 + 0.2*x },
				Duration:    30 * 86400, Step: 1800,
			})
		}
	}
}

// cachedStateRun steps p and checks the cached state after every step
// (see TestEnthalpyCachedStateMatchesFresh).
func cachedStateRun(t *testing.T, name string, scheme TimeScheme, p Problem) {
	t.Helper()
	{
		r, err := newFvRun(&p, false)
		if err != nil {
			t.Fatal(err)
		}
		if r.vo, r.vi, err = r.values(p.Start); err != nil {
			t.Fatal(err)
		}
		n := r.n
		mushy, transitions := 0, 0
		prev := make([]int8, n)
		for step := 0; step < int(p.Duration/p.Step); step++ {
			if err := r.stepEnthalpy(p.Start+float64(step)*p.Step, p.Step); err != nil {
				t.Fatal(err)
			}
			for _, i := range r.pcells {
				ph := r.phases[r.pidx[i]]
				if g := ph.region(r.H[i]); g != r.reg[i] {
					t.Fatalf("scheme %d, step %d cell %d: region %d remembered, %d from H", scheme, step, i, r.reg[i], g)
				}
				if r.reg[i] != prev[i] {
					transitions++
				}
				prev[i] = r.reg[i]
				if r.reg[i] == 1 {
					mushy++
					if i < r.mLo || i > r.mHi {
						t.Fatalf("%s, scheme %d, step %d: cell %d in its freezing range outside %d..%d", name, scheme, step, i, r.mLo, r.mHi)
					}
				}
				tt, phi, s, k := ph.state(r.H[i])
				if tt != r.T[i] || phi != r.phi[i] || s != r.slope[i] || k != r.kc[i] {
					t.Fatalf("scheme %d, step %d cell %d: cached (T, phi, slope, k) = (%g, %g, %g, %g), fresh (%g, %g, %g, %g)",
						scheme, step, i, r.T[i], r.phi[i], r.slope[i], r.kc[i], tt, phi, s, k)
				}
				rh, rd, du, dd := r.rh[i], r.rd[i], r.dru[i], r.drd[i]
				r.setHalves(i)
				if rh != r.rh[i] || rd != r.rd[i] || du != r.dru[i] || dd != r.drd[i] {
					t.Fatalf("scheme %d, step %d cell %d: cached resistances (%g, %g, %g, %g), fresh (%g, %g, %g, %g)",
						scheme, step, i, rh, rd, du, dd, r.rh[i], r.rd[i], r.dru[i], r.drd[i])
				}
			}
			for j := range r.gg {
				if g := 1 / (r.rd[j] + r.rf[j+1] + r.rh[j+1]); g != r.gg[j] {
					t.Fatalf("scheme %d, step %d face %d: conductance %g, from the resistances %g", scheme, step, j, r.gg[j], g)
				}
			}
		}
		t.Logf("%s, scheme %d: %d cell-steps in a freezing range, %d region changes", name, scheme, mushy, transitions)
		// The run must exercise what the test is about.
		if mushy == 0 || transitions < 20 {
			t.Errorf("scheme %d: %d cell-steps in a freezing range, %d region changes: the case does not exercise the phase changes", scheme, mushy, transitions)
		}
	}
}
