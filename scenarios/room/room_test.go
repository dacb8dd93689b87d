package room

import (
	"math"
	"testing"
)

// The ventilation schedule: night from night_from to night_to, wrapping
// past midnight, and its daily mean weighted by the hours. [derived]
func TestVentilationSchedule(t *testing.T) {
	v := Ventilation{Day: 1, Night: 4, NightFrom: 22, NightTo: 7, Scheduled: true}
	for _, c := range []struct{ hour, want float64 }{{23, 4}, {0.5, 4}, {6.9, 4}, {7, 1}, {12, 1}, {21.9, 1}, {22, 4}, {-1, 4}, {24 + 12, 1}} {
		if got := v.At(c.hour * 3600); got != c.want {
			t.Errorf("%g h: %g air changes, want %g", c.hour, got, c.want)
		}
	}
	if m, want := v.Mean(), (9*4.0+15*1)/24; math.Abs(m-want) > 1e-12 {
		t.Errorf("daily mean %g, want %g", m, want)
	}
	v2 := Ventilation{Day: 1, Night: 3, NightFrom: 1, NightTo: 5, Scheduled: true}
	if v2.At(3*3600) != 3 || v2.At(6*3600) != 1 || math.Abs(v2.Mean()-(4*3.0+20)/24) > 1e-12 {
		t.Errorf("night within a day: %g %g %g", v2.At(3*3600), v2.At(6*3600), v2.Mean())
	}
}

// Hours above a threshold of a sampled daily sinusoid m + A cos(w t):
// the time above theta is (P/pi) arccos((theta - m)/A). [derived]
func TestHoursAboveSinusoid(t *testing.T) {
	const m, a, p = 25.0, 3.0, 86400.0
	var ts, vs []float64
	for j := 0; j <= 96; j++ {
		tt := p * float64(j) / 96
		ts, vs = append(ts, tt), append(vs, m+a*math.Cos(2*math.Pi*tt/p))
	}
	for _, th := range []float64{22.5, 24, 25, 26, 27.9} {
		want := p / math.Pi * math.Acos((th-m)/a)
		if got := hoursAbove(ts, vs, th); math.Abs(got-want) > 0.01*p/24 {
			t.Errorf("above %g: %.1f s, closed form %.1f s", th, got, want)
		}
	}
	if got := hoursAbove(ts, vs, 30); got != 0 {
		t.Errorf("above the peak: %g s", got)
	}
	if got := hoursAbove(ts, vs, 20); got != p {
		t.Errorf("below the trough: %g s, want the whole day", got)
	}
}
