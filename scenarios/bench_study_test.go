package scenarios

import (
	"context"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"testing"
)

// BenchmarkGroundSweep64 runs the 64 one-year cases of a ground sweep
// (testdata/perf: the farm-frost column, hourly steps) with 1, 2 and all
// cores: "columns" sweeps a layer's water content (every case settles a
// column of its own), "probe" the depth of a probe (one settled start
// shared by every case). Each iteration is a whole study of tens of
// seconds: run with -benchtime=1x.
func BenchmarkGroundSweep64(b *testing.B) {
	workers := []int{1, 2}
	if n := runtime.NumCPU(); n > 2 {
		workers = append(workers, n)
	}
	for _, study := range []struct{ name, file string }{
		{"columns", "ground-sweep-64.yaml"},
		{"probe", "probe-sweep-64.yaml"},
	} {
		path := filepath.Join("..", "testdata", "perf", study.file)
		data, err := os.ReadFile(path)
		if err != nil {
			b.Fatal(err)
		}
		for _, w := range workers {
			b.Run(fmt.Sprintf("%s/workers=%d", study.name, w), func(b *testing.B) {
				for i := 0; i < b.N; i++ {
					s, err := Decode(path, data)
					if err != nil {
						b.Fatal(err)
					}
					r, err := Run(context.Background(), s, Options{Workers: w})
					if err != nil {
						b.Fatal(err)
					}
					if r.Sweep == nil || len(r.Sweep.Points) != 64 {
						b.Fatal("not a 64-case sweep")
					}
				}
				b.ReportMetric(b.Elapsed().Seconds()/float64(b.N)/64*1000, "ms/case")
			})
		}
	}
}

// BenchmarkFarmFrost runs the embedded farm-frost demo end to end in
// scenarios (three years of a 20 m freezing column in hourly steps after
// the settled start), series.csv streamed to nowhere as the command
// streams it to a file.
func BenchmarkFarmFrost(b *testing.B) {
	ex, ok := LookupExample("farm-frost")
	if !ok {
		b.Fatal("no farm-frost demo")
	}
	for i := 0; i < b.N; i++ {
		s, err := ex.Decode()
		if err != nil {
			b.Fatal(err)
		}
		if _, err := Run(context.Background(), s, Options{Series: io.Discard}); err != nil {
			b.Fatal(err)
		}
	}
}
