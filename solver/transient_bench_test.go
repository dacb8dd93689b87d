package solver

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/lapack/gonum"
)

// fvtBenchProblem is a 400-cell ground column (10 m, uniform cells) under
// ten years of hourly steps: an annual and a daily surface wave behind a
// surface resistance, the geothermal flux at the bottom, daily samples and
// three probes. With freeze, the top 2 m freeze and thaw every winter.
func fvtBenchProblem(freeze bool) Problem {
	soil := Layer{Name: "silt", Thickness: 2, Conductivity: 1.5, HeatCapacity: 2.6e6}
	if freeze {
		soil.Freeze = &Freezing{Point: 0, LatentHeat: 9e7, ConductivityFrozen: 2.1, HeatCapacityFrozen: 1.9e6}
	}
	rock := Layer{Name: "rock", Thickness: 8, Conductivity: 2.9, HeatCapacity: 2.9 / 1.4e-6}
	col := Column{Layers: []Layer{soil, rock}, HalfSpace: true}
	mesh, err := NewMesh(col, MeshOptions{SurfaceCell: 0.025, Growth: 1})
	if err != nil {
		panic(err)
	}
	year := 365 * 86400.0
	return Problem{
		Column: col, Mesh: mesh,
		Outside: Boundary{Kind: Environment, Resistance: 0.05, Temperature: func(t float64) float64 {
			return 3 - 14*math.Cos(2*math.Pi*t/year) + 4*math.Sin(2*math.Pi*t/86400)
		}},
		Inside:      Boundary{Kind: PrescribedFlux, Flux: func(float64) float64 { return 0.065 }},
		InitialFunc: func(x float64) float64 { return 6 + 0.02*x },
		Duration:    10 * year, Step: 3600, OutputStep: 86400,
		Probes: []float64{0.5, 1, 2},
	}
}

func fvtBench(b *testing.B, freeze bool) {
	p := fvtBenchProblem(freeze)
	cells := p.Mesh.Cells()
	steps := int(p.Duration / p.Step)
	b.ReportAllocs()
	b.ResetTimer()
	var res *Result
	for i := 0; i < b.N; i++ {
		var err error
		if res, err = Simulate(p); err != nil {
			b.Fatal(err)
		}
	}
	b.StopTimer()
	b.ReportMetric(float64(cells)*float64(steps)*float64(b.N)/b.Elapsed().Seconds(), "cell-steps/s")
	b.ReportMetric(float64(cells), "cells")
	if freeze {
		b.ReportMetric(float64(res.Iterations)/float64(2*res.Steps), "iter/stage")
	}
}

// BenchmarkSimulateLinear: 400 cells, 87600 hourly steps without freezing.
func BenchmarkSimulateLinear(b *testing.B) { fvtBench(b, false) }

// BenchmarkSimulateFreezing: the same column with a freezing top layer.
func BenchmarkSimulateFreezing(b *testing.B) { fvtBench(b, true) }

// BenchmarkTridiagSolve compares the package's L D L^T solve with gonum's
// Dpttrs on a 400-unknown system.
func BenchmarkTridiagSolve(b *testing.B) {
	n := 400
	d, e := make([]float64, n), make([]float64, n-1)
	for i := range d {
		d[i] = 4
	}
	for i := range e {
		e[i] = -1
	}
	rhs := make([]float64, n)
	b.Run("fvSymTridiag", func(b *testing.B) {
		var f fvSymTridiag
		if err := f.factor(d, e); err != nil {
			b.Fatal(err)
		}
		b.ReportAllocs()
		for i := 0; i < b.N; i++ {
			rhs[i%n] = 1
			f.solve(rhs)
		}
		b.ReportMetric(b.Elapsed().Seconds()*1e9/float64(b.N*n), "ns/unknown")
	})
	b.Run("gonumDpttrs", func(b *testing.B) {
		var impl gonum.Implementation
		dd, ee := append([]float64(nil), d...), append([]float64(nil), e...)
		if !impl.Dpttrf(n, dd, ee) {
			b.Fatal("not positive definite")
		}
		b.ReportAllocs()
		for i := 0; i < b.N; i++ {
			rhs[i%n] = 1
			impl.Dpttrs(n, 1, dd, ee, rhs, 1)
		}
		b.ReportMetric(b.Elapsed().Seconds()*1e9/float64(b.N*n), "ns/unknown")
	})
}

func TestSimulateAllocationsIndependentOfSteps(t *testing.T) {
	// No allocation inside the time loop: a run of 10 times as many steps
	// (same number of samples) allocates the same.
	for _, freeze := range []bool{false, true} {
		p := fvtBenchProblem(freeze)
		p.Probes = nil
		// The least of three counts: testing.AllocsPerRun reads the
		// process-wide malloc count, which a stray allocation of the
		// runtime can raise but nothing can lower, while an allocation per
		// step would show in every count.
		count := func(steps int) float64 {
			q := p
			q.Duration = float64(steps) * q.Step
			q.OutputStep = q.Duration
			least := math.Inf(1)
			for range 3 {
				least = math.Min(least, testing.AllocsPerRun(3, func() {
					if _, err := Simulate(q); err != nil {
						t.Fatal(err)
					}
				}))
			}
			return least
		}
		a, b := count(50), count(500)
		if a != b {
			t.Errorf("freeze %v: %g allocations for 50 steps, %g for 500", freeze, a, b)
		}
	}
}

func TestTridiagAgainstGonum(t *testing.T) {
	// The package's factorised solves and Thomas sweep against gonum's
	// Dpttrf/Dpttrs (a general-purpose reference library).
	n := 7
	d := []float64{4, 5, 3, 6, 4, 7, 5}
	e := []float64{-1, 0.5, -2, 1, -1.5, 0.3}
	b := []float64{1, -2, 3, 0.5, 2, -1, 4}
	var impl gonum.Implementation
	dd, ee, want := append([]float64(nil), d...), append([]float64(nil), e...), append([]float64(nil), b...)
	if !impl.Dpttrf(n, dd, ee) {
		t.Fatal("gonum: not positive definite")
	}
	impl.Dpttrs(n, 1, dd, ee, want, 1)
	var f fvSymTridiag
	if err := f.factor(d, e); err != nil {
		t.Fatal(err)
	}
	got := append([]float64(nil), b...)
	f.solve(got)
	var fu fvSymTridiagUp
	if err := fu.factor(d, e); err != nil {
		t.Fatal(err)
	}
	gu := append([]float64(nil), b...)
	fu.solve(gu)
	for i := range want {
		if math.Abs(gu[i]-want[i]) > 1e-14 {
			t.Errorf("x[%d]: U D U^T %g, gonum %g", i, gu[i], want[i])
		}
	}
	lo := append([]float64{0}, e...)
	up := append(append([]float64(nil), e...), 0)
	th := append([]float64(nil), b...)
	fvThomas(lo, d, up, th, make([]float64, n))
	for i := range want {
		if math.Abs(got[i]-want[i]) > 1e-14 || math.Abs(th[i]-want[i]) > 1e-14 {
			t.Errorf("x[%d]: LDLt %g, Thomas %g, gonum %g", i, got[i], th[i], want[i])
		}
	}
	if err := f.factor([]float64{1, 1}, []float64{2}); err == nil {
		t.Error("indefinite matrix factorised without error")
	}
	if err := fu.factor([]float64{1, 1}, []float64{2}); err == nil {
		t.Error("indefinite matrix factorised (U D U^T) without error")
	}
}
