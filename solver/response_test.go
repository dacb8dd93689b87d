package solver

import (
	"math"
	"testing"
)

// TestResponse: Response is Periodic applied period by period, and the
// frequency response has the limits of the ISO 13786 matrices [derived]:
// f -> 1 and lag -> 0 as the period grows, and the unwrapped lag grows
// without jumps as the period shrinks.
func TestResponse(t *testing.T) {
	c := tmTabula()
	periods := LogPeriods(3600, 1e4*tmYear, 60)
	rs, err := Response(c, periods)
	if err != nil {
		t.Fatal(err)
	}
	if len(rs) != len(periods) {
		t.Fatalf("%d results for %d periods", len(rs), len(periods))
	}
	for i, r := range rs {
		p, _ := Periodic(c, periods[i])
		if r.Y12 != p.Y12 || r.TimeShiftUnwrapped != p.TimeShiftUnwrapped || r.Period != periods[i] {
			t.Errorf("period %g: Response differs from Periodic", periods[i])
		}
		if i > 0 {
			// Lag in radians of phase falls monotonically as the period grows here.
			ph := r.TimeShiftUnwrapped / r.Period
			prev := rs[i-1].TimeShiftUnwrapped / rs[i-1].Period
			if ph > prev+1e-12 {
				t.Errorf("phase lag rises from %g to %g cycles between %g s and %g s", prev, ph, periods[i-1], periods[i])
			}
		}
	}
	last := rs[len(rs)-1]
	if math.Abs(last.DecrementFactor-1) > 1e-3 || last.TimeShiftUnwrapped/last.Period > 1e-3 {
		t.Errorf("very long period: f = %g, lag %g periods; want 1 and 0", last.DecrementFactor, last.TimeShiftUnwrapped/last.Period)
	}
	if rs[0].TimeShiftUnwrapped <= rs[0].Period {
		t.Errorf("1 h period: unwrapped lag %g s should exceed the period", rs[0].TimeShiftUnwrapped)
	}
	if _, err := Response(c, []float64{tmDay, -1}); err == nil {
		t.Error("negative period: no error")
	}
	if _, err := Response(Column{Layers: c.Layers, HalfSpace: true}, []float64{tmDay}); err == nil {
		t.Error("half-space: no error")
	}
}

func TestLogPeriods(t *testing.T) {
	p := LogPeriods(3600, tmYear, 5)
	if len(p) != 5 || p[0] != 3600 || p[4] != tmYear {
		t.Fatalf("LogPeriods = %v", p)
	}
	r := p[1] / p[0]
	for i := 1; i < len(p); i++ {
		if math.Abs(p[i]/p[i-1]-r) > 1e-12*r {
			t.Errorf("ratio %g at %d, want %g", p[i]/p[i-1], i, r)
		}
	}
	if got := LogPeriods(60, 60, 1); len(got) != 1 || got[0] != 60 {
		t.Errorf("n = 1: %v", got)
	}
	for _, bad := range [][3]float64{{0, 10, 3}, {10, 1, 3}, {1, 10, 0}, {math.NaN(), 10, 3}, {1, math.Inf(1), 3}} {
		if got := LogPeriods(bad[0], bad[1], int(bad[2])); got != nil {
			t.Errorf("LogPeriods(%v) = %v, want nil", bad, got)
		}
	}
}
