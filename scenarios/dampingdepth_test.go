package scenarios

import (
	"math"
	"testing"
)

// TestGroundDepthKeys: in a uniform half-space with no surface resistance
// the swing of period P is A exp(-z/d) and lags by z/d P/(2 pi), with the
// damping depth d = sqrt(a P / pi) = sqrt(2a/omega) (Carslaw and Jaeger,
// Conduction of Heat in Solids, section 2.6 [memory]). A soil of our own,
// lambda 1.2 W/(m K), rho c = 1500 x 1600 J/(m3 K): a = 5e-7 m2/s, annual
// d = sqrt(5e-7 x 31 536 000 / pi) = 2.2404 m, daily 0.11726 m [derived by
// hand]. ground.periodic[].damping_depth_m is d; a probe at d has the
// swing A/e and the lag P/(2 pi); depth_swing_below_0_1K_m is
// d ln(A/0.1) (annual A = 12 K: 10.726 m), and the ground summary carries
// the annual one.
func TestGroundDepthKeys(t *testing.T) {
	r := mustRun(t, `
title: depth keys
kind: ground
layers:
  - {name: soil, conductivity: 1.2, density: 1500, specific_heat: 1600, thickness: 30 m}
surface:
  temperature: {mean: 8, annual: {amplitude: 12, peak_day: 200}, daily: {amplitude: 6, peak_hour: 14}}
bottom:
  heat_flux: 0
analysis:
  periods: [8760h, 24h]
  probes: [0.11726, 2.2404]
  simulate: false
`)
	g := r.Ground
	if g == nil || len(g.Periodic) != 2 {
		t.Fatalf("ground: %+v", g)
	}
	for i, c := range []struct {
		period, d, amp float64
		probe          int
	}{{8760, 2.2404, 12, 1}, {24, 0.11726, 6, 0}} {
		p := g.Periodic[i]
		if math.Abs(p.DampingDepth_m-c.d) > 1e-4 {
			t.Errorf("period %g h: damping_depth_m %.5f, want %.5f", c.period, p.DampingDepth_m, c.d)
		}
		q := p.Probes[c.probe]
		if math.Abs(q.Amplitude_K-c.amp/math.E) > 1e-3*c.amp || math.Abs(q.Lag_h-c.period/(2*math.Pi)) > 1e-3*c.period {
			t.Errorf("period %g h at d: swing %.4f K lag %.4f h, want A/e = %.4f and P/(2 pi) = %.4f",
				c.period, q.Amplitude_K, q.Lag_h, c.amp/math.E, c.period/(2*math.Pi))
		}
		want := c.d * math.Log(c.amp/0.1)
		if math.Abs(p.SwingDepth_m-want) > 1e-3*want {
			t.Errorf("period %g h: depth_swing_below_0_1K_m %.4f, want d ln(A/0.1) = %.4f", c.period, p.SwingDepth_m, want)
		}
	}
	if g.AnnualSwingDepth_m != g.Periodic[0].SwingDepth_m || math.Abs(g.AnnualSwingDepth_m-10.726) > 0.01 {
		t.Errorf("annual_depth_swing_below_0_1K_m %.4f, want the annual period's (10.726 m)", g.AnnualSwingDepth_m)
	}
}
