//go:build unix

package main

import (
	"bytes"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"syscall"
	"testing"
)

// TestLongHourlyRunMemory runs thirty years of hourly output (262,801
// samples, four probes) through the built command and holds its peak
// resident memory under 40 MiB: series.csv is written as the simulation
// runs, the analyses keep three numbers per sample, and the report a
// thinned copy. Before the series was streamed this run peaked at
// 155 MiB (the whole CSV built in memory).
func TestLongHourlyRunMemory(t *testing.T) {
	bin := builtCommand(t)
	out := filepath.Join(t.TempDir(), "out")
	cmd := exec.Command(bin, "run", "-q", "--out", out, filepath.Join("..", "..", "testdata", "perf", "frost-30y-hourly.yaml"))
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	if err := cmd.Run(); err != nil {
		t.Fatalf("%v: %s", err, stderr.String())
	}
	ru, ok := cmd.ProcessState.SysUsage().(*syscall.Rusage)
	if !ok {
		t.Skip("no resource usage on this system")
	}
	peak := float64(ru.Maxrss) * 1024 // kilobytes on Linux and the BSDs
	if runtime.GOOS == "darwin" {
		peak = float64(ru.Maxrss) // bytes
	}
	if peak > 40<<20 {
		t.Errorf("peak resident memory %.1f MiB, want under 40 MiB", peak/(1<<20))
	}
	t.Logf("peak resident memory %.1f MiB", peak/(1<<20))
	data, err := os.ReadFile(filepath.Join(out, "series.csv"))
	if err != nil {
		t.Fatal(err)
	}
	if rows := bytes.Count(data, []byte("\n")) - 1; rows != 30*8760+1 {
		t.Errorf("series.csv has %d rows, want %d (every hour of 30 years and the start)", rows, 30*8760+1)
	}
}
