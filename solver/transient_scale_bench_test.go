package solver

import (
	"fmt"
	"testing"
)

// fvtScaleProblem is fvtBenchProblem on a uniform mesh of the given number
// of cells over two years (the per-cell-step cost against the size of the
// column; the 2 m freezing layer holds a fifth of the cells).
func fvtScaleProblem(freeze bool, cells int) Problem {
	p := fvtBenchProblem(freeze)
	mesh, err := NewMesh(p.Column, MeshOptions{SurfaceCell: 10 / float64(cells), Growth: 1})
	if err != nil {
		panic(err)
	}
	if mesh.Cells() != cells {
		panic(fmt.Sprintf("%d cells, want %d", mesh.Cells(), cells))
	}
	p.Mesh = mesh
	p.Duration = 2 * 365 * 86400
	return p
}

// BenchmarkSimulateCells runs the ground column of BenchmarkSimulateLinear
// and BenchmarkSimulateFreezing at 200 to 3200 cells for two years of
// hourly steps and reports the cost per cell-step and, with freezing, the
// enthalpy iterations per stage and the cost per cell and iteration
// (ns/cell-iter; a linear step counts its two stages as two iterations).
func BenchmarkSimulateCells(b *testing.B) {
	for _, freeze := range []bool{false, true} {
		for _, cells := range []int{200, 400, 800, 1600, 3200} {
			name := fmt.Sprintf("linear/cells=%d", cells)
			if freeze {
				name = fmt.Sprintf("freezing/cells=%d", cells)
			}
			b.Run(name, func(b *testing.B) {
				p := fvtScaleProblem(freeze, cells)
				steps := int(p.Duration / p.Step)
				b.ReportAllocs()
				var res *Result
				for b.Loop() {
					var err error
					if res, err = Simulate(p); err != nil {
						b.Fatal(err)
					}
				}
				ns := b.Elapsed().Seconds() * 1e9 / float64(b.N)
				cs := float64(cells) * float64(steps)
				b.ReportMetric(ns/cs, "ns/cell-step")
				iters := 2.0
				if freeze {
					iters = float64(res.Iterations) / float64(res.Steps)
					b.ReportMetric(iters/2, "iter/stage")
				}
				b.ReportMetric(ns/cs/iters, "ns/cell-iter")
			})
		}
	}
}
