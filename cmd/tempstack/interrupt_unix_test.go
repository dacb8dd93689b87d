//go:build unix

package main

import (
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

// TestInterruptStopsAStudy sends the process a real SIGINT (what Ctrl-C
// sends) once `run` watches for it, during a long sweep: the command stops
// at the next case with exit status 130 (128 + SIGINT, common practice for
// shells), one line saying so, and writes nothing.
func TestInterruptStopsAStudy(t *testing.T) {
	dir := t.TempDir()
	scen := filepath.Join(dir, "sweep.yaml")
	os.WriteFile(scen, []byte(`title: long sweep
kind: wall
layers:
  - {material: clay-brick, thickness: 240 mm}
  - {material: mineral-wool, thickness: 100 mm}
outside:
  temperature: {mean: 20, daily: {amplitude: 10, peak_hour: 15}}
analysis:
  simulate: {duration: 60d, step: 5min}
sweep:
  parameter: layers[2].thickness
  from: 50 mm
  to: 400 mm
  steps: 200
`), 0o644)
	signalsWatched = func() {
		time.AfterFunc(300*time.Millisecond, func() { syscall.Kill(os.Getpid(), syscall.SIGINT) })
	}
	defer func() { signalsWatched = nil }()
	out := filepath.Join(dir, "out")
	start := time.Now()
	code, _, stderr := runCLI(t, "run", scen, "--out", out, "-q")
	if code != 130 || strings.Count(stderr, "\n") != 1 || !strings.Contains(stderr, "interrupted") {
		t.Fatalf("exit %d, stderr %q; want 130 and one line saying it was interrupted", code, stderr)
	}
	if d := time.Since(start); d > 15*time.Second {
		t.Errorf("the interrupted run took %v", d)
	}
	if entries, _ := os.ReadDir(out); len(entries) != 0 {
		t.Errorf("files written: %v", entries)
	}
}
