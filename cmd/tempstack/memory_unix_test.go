//go:build unix

package main

import (
	"bytes"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"runtime"
	"strconv"
	"strings"
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
	peak := peakRSS(t, bin, "run", "-q", "--out", out, filepath.Join("..", "..", "testdata", "perf", "frost-30y-hourly.yaml"))
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

// peakRSS runs the command and returns its peak resident memory in bytes.
// The command is started from a fresh copy of the test binary
// (TestPeakRSSHelper), not from this process: Linux counts into a child's
// peak the peak of the process it was started from (exec records the
// memory it replaces, and Go starts commands in the parent's memory), and
// this test process may be large.
func peakRSS(t *testing.T, name string, args ...string) float64 {
	t.Helper()
	helper := exec.Command(os.Args[0], "-test.run=^TestPeakRSSHelper$")
	helper.Env = append(os.Environ(), "TEMPSTACK_PEAK_RSS_COMMAND="+strings.Join(append([]string{name}, args...), "\x1f"))
	var stdout, stderr bytes.Buffer
	helper.Stdout, helper.Stderr = &stdout, &stderr
	if err := helper.Run(); err != nil {
		t.Fatalf("%v: %s%s", err, stdout.String(), stderr.String())
	}
	m := regexp.MustCompile(`peak-rss-bytes (\d+)`).FindStringSubmatch(stdout.String())
	if m == nil {
		t.Fatalf("no peak from the helper: %s", stdout.String())
	}
	v, _ := strconv.ParseFloat(m[1], 64)
	return v
}

// TestPeakRSSHelper is the helper process of peakRSS: it does nothing
// unless TEMPSTACK_PEAK_RSS_COMMAND names a command (its arguments
// separated by U+001F), which it runs, printing its peak resident memory.
func TestPeakRSSHelper(t *testing.T) {
	spec := os.Getenv("TEMPSTACK_PEAK_RSS_COMMAND")
	if spec == "" {
		t.Skip("helper process of peakRSS")
	}
	argv := strings.Split(spec, "\x1f")
	cmd := exec.Command(argv[0], argv[1:]...)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	if err := cmd.Run(); err != nil {
		t.Fatalf("%v: %s", err, stderr.String())
	}
	ru, ok := cmd.ProcessState.SysUsage().(*syscall.Rusage)
	if !ok {
		t.Skip("no resource usage on this system")
	}
	peak := ru.Maxrss * 1024 // kilobytes on Linux and the BSDs
	if runtime.GOOS == "darwin" {
		peak = ru.Maxrss // bytes
	}
	fmt.Printf("peak-rss-bytes %d\n", peak)
}
