package solver

import "testing"

// BenchmarkPeriodic: the ISO 13786 characteristics of one three-layer wall
// (the TABULA construction) for one period, also reported as periodic
// analyses per second.
func BenchmarkPeriodic(b *testing.B) {
	c := tmTabula()
	for b.Loop() {
		if _, err := Periodic(c, tmDay); err != nil {
			b.Fatal(err)
		}
	}
	if s := b.Elapsed().Seconds(); s > 0 {
		b.ReportMetric(float64(b.N)/s, "analyses/s")
	}
}

// BenchmarkHarmonic: the complex temperature and flux at 50 positions
// through the same wall.
func BenchmarkHarmonic(b *testing.B) {
	c := tmTabula()
	x := make([]float64, 50)
	for i := range x {
		x[i] = c.Thickness() * float64(i) / float64(len(x)-1)
	}
	for b.Loop() {
		if _, _, err := Harmonic(c, tmDay, 1, 0, x); err != nil {
			b.Fatal(err)
		}
	}
}
