package scenarios

import (
	"math"
	"strings"
	"testing"

	"tempstack/scenarios/results"
)

// TestSurfaceFactorWiring runs the wall of the hand calculation in
// solver.TestSurfaceFactorHandCalculation (220 mm brick, 13 mm plaster,
// ISO 6946 Rsi 0.13 and Rse 0.04 m2 K/W, 24 h) from a scenario file and
// checks that results.json and periodic.csv carry |F| = 0.4835 and its lag
// 1.611 h [derived, hand calculation with the ISO 13786 clause 6
// matrices], and that a roof (ISO 6946 Rsi 0.10) uses its own Rsi:
// the same wall then gives |1 - 0.10 Y11| with Y11 of the roof's column.
func TestSurfaceFactorWiring(t *testing.T) {
	const wall = `
title: surface factor
kind: wall
orientation: ORIENT
layers:
  - {name: brick, conductivity: 0.77, density: 1750, specific_heat: 1000, thickness: 220 mm}
  - {name: plaster, conductivity: 0.7, density: 1400, specific_heat: 840, thickness: 13 mm}
outside:
  temperature: {mean: 10, daily: {amplitude: 5, peak_hour: 15}}
analysis:
  periods: [24h]
  simulate: false
`
	r := mustRun(t, strings.Replace(wall, "ORIENT", "wall", 1))
	p := r.Periodic[0]
	if math.Abs(p.SurfaceFactor-0.4835) > 0.0005 || math.Abs(p.SurfaceFactorLag_h-1.611) > 0.001 {
		t.Errorf("surface_factor %.4f, lag %.4f h; hand calculation 0.4835 and 1.611 h", p.SurfaceFactor, p.SurfaceFactorLag_h)
	}
	var csv string
	for _, f := range results.CSVFiles(r) {
		if f.Name == "periodic.csv" {
			csv = string(f.Data)
		}
	}
	lines := strings.Split(strings.TrimSpace(csv), "\n")
	if len(lines) != 2 || !strings.HasSuffix(lines[0], ",surface_factor,surface_factor_lag_h") {
		t.Fatalf("periodic.csv header %q, want surface_factor and surface_factor_lag_h last", lines[0])
	}
	cells := strings.Split(lines[1], ",")
	if !strings.HasPrefix(cells[len(cells)-2], "0.4835") || !strings.HasPrefix(cells[len(cells)-1], "1.61") {
		t.Errorf("periodic.csv row %q, want surface factor 0.4835... and lag 1.61... last", lines[1])
	}

	roof := mustRun(t, strings.Replace(wall, "ORIENT", "roof", 1))
	q := roof.Periodic[0]
	if q.InsideAdmittance_W_m2K <= p.InsideAdmittance_W_m2K {
		t.Errorf("roof Y11 %.4f not above the wall's %.4f (smaller Rsi)", q.InsideAdmittance_W_m2K, p.InsideAdmittance_W_m2K)
	}
	// |1 - Rsi Y11| from the roof's own |Y11| and lead, Rsi = 0.10 (ISO 6946, upward flow).
	y := q.InsideAdmittance_W_m2K
	phi := 2 * math.Pi * q.InsideAdmittanceLead_h / 24
	want := math.Hypot(1-0.10*y*math.Cos(phi), 0.10*y*math.Sin(phi))
	if math.Abs(q.SurfaceFactor-want) > 1e-6 {
		t.Errorf("roof surface factor %.6f, want |1 - 0.10 Y11| = %.6f", q.SurfaceFactor, want)
	}
}
