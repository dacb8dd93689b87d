package solver

import (
	"testing"
)

// TestObserveSeesTheRecordedSamples: a run whose samples go to
// Problem.Observe sees, sample by sample, bit for bit the values a run
// that records them stores, and keeps no per-sample series itself (the
// point of Observe: a long run needs no memory per sample).
func TestObserveSeesTheRecordedSamples(t *testing.T) {
	for _, freeze := range []bool{false, true} {
		p := fvtBenchProblem(freeze)
		p.Duration = 400 * 86400
		p.OutputStep = 5 * 3600 // 400 days is not a whole number of samples: the end is a sample of its own
		want, err := Simulate(p)
		if err != nil {
			t.Fatal(err)
		}
		q := p
		k := 0
		q.Observe = func(s *Sample) {
			if s.Index != k || s.Count != len(want.Times) {
				t.Fatalf("freeze %v: sample %d of %d, want %d of %d", freeze, s.Index, s.Count, k, len(want.Times))
			}
			got := []float64{s.Time, s.SurfaceOutside, s.SurfaceInside, s.FluxOutside, s.FluxInside,
				s.MeanFluxOutside, s.MeanFluxInside, s.FrostDepth, s.ThawDepth}
			exp := []float64{want.Times[k], want.SurfaceOutside[k], want.SurfaceInside[k], want.FluxOutside[k], want.FluxInside[k],
				want.MeanFluxOutside[k], want.MeanFluxInside[k], want.FrostDepth[k], want.ThawDepth[k]}
			for j := range want.Probe {
				got = append(got, s.Probe[j])
				exp = append(exp, want.Probe[j][k])
			}
			for i := range got {
				if got[i] != exp[i] {
					t.Fatalf("freeze %v, sample %d, value %d: observed %v, recorded %v", freeze, k, i, got[i], exp[i])
				}
			}
			k++
		}
		res, err := Simulate(q)
		if err != nil {
			t.Fatal(err)
		}
		if k != len(want.Times) {
			t.Errorf("freeze %v: observed %d samples, recorded %d", freeze, k, len(want.Times))
		}
		if res.Times != nil || res.Probe != nil || res.FrostDepth != nil || res.MeanFluxInside != nil {
			t.Errorf("freeze %v: an observed run kept per-sample series", freeze)
		}
		for i := range want.Mean {
			if res.Mean[i] != want.Mean[i] || res.Min[i] != want.Min[i] || res.Max[i] != want.Max[i] {
				t.Fatalf("freeze %v: cell %d range differs", freeze, i)
			}
		}
	}
}
