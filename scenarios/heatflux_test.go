package scenarios

import (
	"math"
	"strings"
	"testing"

	"tempstack/climate"
)

// TestHeatFluxVaryingHalfSpace: a daily heat flux q0 cos(w (t - tp)) into
// the inside face of a wall thick against its penetration depth (1 m,
// d = sqrt(2a/w) = 0.14 m: the wave reflected at the outside returns
// damped by exp(-2L/d) ~ 1e-6) behaves as on a half-space, whose surface
// temperature swings by q0 / (b sqrt(w)), b = sqrt(lambda rho c), peaking
// P/8 (3 h) after the flux (Carslaw and Jaeger, Conduction of Heat in
// Solids, 2nd ed., section 2.6, periodic surface flux on a semi-infinite
// solid [memory]; amplitude and phase from the surface admittance
// b sqrt(w) exp(i pi/4) [derived]). The simulated inside surface over the
// last day agrees within 1 % and 0.05 h.
func TestHeatFluxVaryingHalfSpace(t *testing.T) {
	const k, rho, c, q0, tp = 1.4, 2000.0, 1000.0, 20.0, 12 * 3600.0
	r := mustRun(t, `title: heating cable on a schedule
kind: wall
layers:
  - {name: slab, thickness: 1, conductivity: 1.4, density: 2000, specific_heat: 1000}
outside:
  temperature: 0
inside:
  heat_flux: {mean: 0, daily: {amplitude: 20, peak_hour: 12}}
analysis:
  simulate: {duration: 6d, step: 5min, output_step: 5min}
`)
	w := 2 * math.Pi / climate.Day
	wantAmp := q0 / (math.Sqrt(k*rho*c) * math.Sqrt(w))
	sim := r.Series.Simulation
	end := sim.Time_h[len(sim.Time_h)-1] * 3600
	var ts, vs []float64
	for i, th := range sim.Time_h {
		if tt := th * 3600; tt > end-climate.Day-1 {
			ts, vs = append(ts, tt), append(vs, sim.InsideSurface_C[i])
		}
	}
	fit, _, err := climate.FitHarmonics(ts, vs, []float64{climate.Day})
	if err != nil {
		t.Fatal(err)
	}
	h := fit.Harmonics[0]
	t.Logf("amplitude %.5f (half-space %.5f), lag %.4f h", h.Amplitude, wantAmp, math.Mod(h.Peak-tp+climate.Day, climate.Day)/3600)
	if math.Abs(h.Amplitude/wantAmp-1) > 0.01 {
		t.Errorf("surface amplitude %.4f K, half-space %.4f K", h.Amplitude, wantAmp)
	}
	lag := math.Mod(h.Peak-tp+climate.Day, climate.Day) / 3600
	if math.Abs(lag-3) > 0.05 {
		t.Errorf("surface peaks %.3f h after the flux, half-space 3 h", lag)
	}
	if in := r.Forcing.Inside; in.Kind != "heat_flux" || len(in.Harmonics) != 1 || *in.HeatFlux_W_m2 != 0 {
		t.Errorf("results describe the inside as %+v", in)
	}
	if !strings.Contains(strings.Join(r.Warnings, " "), "inside heat flux changes in time") {
		t.Errorf("no warning that the exact analysis uses the mean: %q", r.Warnings)
	}
}

// TestHeatFluxConstantAsMapping: a flux given as a mean without harmonics
// runs exactly as the plain number.
func TestHeatFluxConstantAsMapping(t *testing.T) {
	wall := func(q string) string {
		return `title: x
kind: wall
layers:
  - {name: slab, thickness: 0.2, conductivity: 1.4, density: 2000, specific_heat: 1000}
outside:
  temperature: {mean: 0, daily: {amplitude: 5, peak_hour: 15}}
inside:
  heat_flux: ` + q + `
analysis:
  simulate: {duration: 3d, step: 10min}
`
	}
	a, b := mustRun(t, wall("5")), mustRun(t, wall("{mean: 5}"))
	for i := range a.Series.Simulation.InsideSurface_C {
		if a.Series.Simulation.InsideSurface_C[i] != b.Series.Simulation.InsideSurface_C[i] {
			t.Fatalf("sample %d differs", i)
		}
	}
}
