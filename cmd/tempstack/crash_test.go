package main

import (
	"bytes"
	"errors"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"reflect"
	"regexp"
	"strings"
	"syscall"
	"tempstack/charts"
	"testing"
	"time"

	"tempstack/scenarios/results"
)

// The tests in this file hold the command to its robustness rules: output
// folders are never half-written or clobbered, absurd inputs are refused
// with a message naming the limit, and nothing crashes. All scenarios are
// invented test data.

// snapshot reads every file of dir (names and bytes).
func snapshot(t *testing.T, dir string) map[string][]byte {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	out := map[string][]byte{}
	for _, e := range entries {
		data, err := os.ReadFile(filepath.Join(dir, e.Name()))
		if err != nil {
			t.Fatal(err)
		}
		out[e.Name()] = data
	}
	return out
}

// sameFiles fails unless dir holds exactly the files of want, byte for byte.
func sameFiles(t *testing.T, dir string, want map[string][]byte) {
	t.Helper()
	got := snapshot(t, dir)
	for name, data := range got {
		old, ok := want[name]
		switch {
		case !ok:
			t.Errorf("new file %s left in the output folder", name)
		case !bytes.Equal(old, data):
			t.Errorf("%s changed (%d bytes, was %d)", name, len(data), len(old))
		}
	}
	for name := range want {
		if _, ok := got[name]; !ok {
			t.Errorf("%s was removed", name)
		}
	}
}

// oneLine checks a user-error outcome: exit code, one line on stderr
// holding every word, no stack trace.
func oneLine(t *testing.T, code int, stderr string, wantCode int, words ...string) {
	t.Helper()
	if code != wantCode {
		t.Errorf("exit %d, want %d (stderr %q)", code, wantCode, stderr)
	}
	if strings.Count(stderr, "\n") != 1 || !strings.HasSuffix(stderr, "\n") {
		t.Errorf("stderr is not one line: %q", stderr)
	}
	for _, w := range words {
		if !strings.Contains(stderr, w) {
			t.Errorf("stderr %q does not say %q", stderr, w)
		}
	}
	if strings.Contains(stderr, "goroutine") || strings.Contains(stderr, "panic") {
		t.Errorf("stack trace: %q", stderr)
	}
}

func TestOutputFolderRules(t *testing.T) {
	base := t.TempDir()

	// A new nested folder is created.
	fresh := filepath.Join(base, "a", "b", "res")
	code, _, stderr := runCLI(t, "run", "--out", fresh, "-q")
	if code != 0 {
		t.Fatalf("new folder: exit %d: %s", code, stderr)
	}
	if _, err := os.Stat(filepath.Join(fresh, "results.json")); err != nil {
		t.Fatal(err)
	}

	// A folder of earlier results is overwritten file by file; a file of
	// the user's beside them is kept and a note says which outputs are old.
	notes := filepath.Join(fresh, "notes.txt")
	os.WriteFile(notes, []byte("my notes\n"), 0o644)
	stale := filepath.Join(fresh, "step_response.csv")
	os.WriteFile(stale, []byte("time_s\n"), 0o644)
	code, out, stderr := runCLI(t, "run", "--out", fresh)
	if code != 0 {
		t.Fatalf("earlier results: exit %d: %s", code, stderr)
	}
	if b, _ := os.ReadFile(notes); string(b) != "my notes\n" {
		t.Errorf("notes.txt changed: %q", b)
	}
	if !strings.Contains(out, "kept "+stale+" from an earlier run") {
		t.Errorf("no note about the stale step_response.csv in %q", out)
	}

	// A non-empty folder without results.json is refused before the run,
	// and accepted with --force; its files are untouched either way.
	other := filepath.Join(base, "photos")
	os.Mkdir(other, 0o755)
	os.WriteFile(filepath.Join(other, "holiday.jpg"), []byte("not really a photo"), 0o644)
	before := snapshot(t, other)
	start := time.Now()
	code, _, stderr = runCLI(t, "run", "--example", "farm-frost", "--out", other)
	oneLine(t, code, stderr, 1, other, "not empty", "--force")
	if d := time.Since(start); d > 2*time.Second {
		t.Errorf("refusal took %v: the folder must be checked before the run", d)
	}
	sameFiles(t, other, before)
	code, _, stderr = runCLI(t, "run", "--out", other, "--force", "-q")
	if code != 0 {
		t.Fatalf("--force: exit %d: %s", code, stderr)
	}
	if b, _ := os.ReadFile(filepath.Join(other, "holiday.jpg")); string(b) != "not really a photo" {
		t.Error("--force changed a file of the user's")
	}

	// Hidden temporary files of an interrupted run do not make a folder
	// count as foreign.
	tmpOnly := filepath.Join(base, "interrupted")
	os.Mkdir(tmpOnly, 0o755)
	os.WriteFile(filepath.Join(tmpOnly, ".report.html.123.tmp"), []byte("partial"), 0o644)
	if code, _, stderr := runCLI(t, "run", "--out", tmpOnly, "-q"); code != 0 {
		t.Errorf("folder with only a temporary file: exit %d: %s", code, stderr)
	}

	// A file given as the folder, and a folder that cannot be created.
	file := filepath.Join(base, "file.txt")
	os.WriteFile(file, []byte("x"), 0o644)
	code, _, stderr = runCLI(t, "run", "--out", file)
	oneLine(t, code, stderr, 1, file, "is a file")
	code, _, stderr = runCLI(t, "run", "--out", filepath.Join(file, "sub"))
	oneLine(t, code, stderr, 1, "cannot", filepath.Join(file, "sub"))
	if b, _ := os.ReadFile(file); string(b) != "x" {
		t.Error("the file given as folder changed")
	}

	// A folder in the place of an output file: refused before anything is
	// renamed, earlier results intact.
	blocked := filepath.Join(base, "blocked")
	if code, _, stderr := runCLI(t, "run", "--out", blocked, "-q"); code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	os.Remove(filepath.Join(blocked, "profile.csv"))
	os.Mkdir(filepath.Join(blocked, "profile.csv"), 0o755)
	before = snapshotNoDirs(t, blocked)
	code, _, stderr = runCLI(t, "run", "--out", blocked, "--example", "timber-roof")
	oneLine(t, code, stderr, 1, "profile.csv", "something other than a file")
	if got := snapshotNoDirs(t, blocked); !reflect.DeepEqual(got, before) {
		t.Error("earlier results changed after a refused write")
	}
}

// snapshotNoDirs is snapshot without sub-folders.
func snapshotNoDirs(t *testing.T, dir string) map[string][]byte {
	t.Helper()
	entries, _ := os.ReadDir(dir)
	out := map[string][]byte{}
	for _, e := range entries {
		if e.IsDir() {
			continue
		}
		data, err := os.ReadFile(filepath.Join(dir, e.Name()))
		if err != nil {
			t.Fatal(err)
		}
		out[e.Name()] = data
	}
	return out
}

// TestFailedWriteKeepsEarlierResults makes the third temporary file fail to
// be created: nothing may be renamed, the earlier results stay byte for
// byte, and no temporary file is left.
func TestFailedWriteKeepsEarlierResults(t *testing.T) {
	dir := t.TempDir()
	if code, _, stderr := runCLI(t, "run", "--out", dir, "-q"); code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	before := snapshot(t, dir)
	calls := 0
	createTemp = func(d, pattern string) (*os.File, error) {
		calls++
		if calls == 3 {
			return nil, &os.PathError{Op: "open", Path: filepath.Join(d, pattern), Err: syscall.ENOSPC}
		}
		return os.CreateTemp(d, pattern)
	}
	defer func() { createTemp = os.CreateTemp }()
	code, _, stderr := runCLI(t, "run", "--out", dir, "--example", "timber-roof")
	oneLine(t, code, stderr, 1, "cannot write in", "no space left on device")
	if calls != 3 {
		t.Errorf("%d temporary files were attempted, want 3", calls)
	}
	sameFiles(t, dir, before)
}

// TestRunKilledKeepsEarlierResults starts the built command on a long
// ground simulation into a folder of earlier results, kills it with
// SIGKILL while it computes, and checks that the folder is as it was:
// earlier files byte for byte, no partial or new output; the only thing a
// killed run may leave is the hidden temporary file series.csv was being
// streamed into (".series.csv.RANDOM.tmp", which a later run accepts in
// the folder; nothing else can remove it after SIGKILL).
func TestRunKilledKeepsEarlierResults(t *testing.T) {
	bin := builtCommand(t)
	tmp := t.TempDir()
	out := filepath.Join(tmp, "out")
	if b, err := exec.Command(bin, "run", "--out", out, "-q").CombinedOutput(); err != nil {
		t.Fatalf("earlier run: %v: %s", err, b)
	}
	before := snapshot(t, out)
	// Thirty winters of hourly steps: minutes of work, killed after 1.5 s.
	slow := filepath.Join(tmp, "slow.yaml")
	os.WriteFile(slow, []byte(`# Invented test data: a long frost simulation.
title: long frost run
kind: ground
layers:
  - soil: {texture: silt-clay, dry_density: 1600, water_content: 20 %}
    thickness: 15 m
surface:
  temperature: {mean: 2, annual: {amplitude: 14, peak_day: 200}, daily: {amplitude: 4, peak_hour: 15}}
analysis:
  simulate: {duration: 30y, step: 1h}
`), 0o644)
	for _, delay := range []time.Duration{300 * time.Millisecond, 1500 * time.Millisecond} {
		cmd := exec.Command(bin, "run", slow, "--out", out)
		var stderr bytes.Buffer
		cmd.Stderr = &stderr
		if err := cmd.Start(); err != nil {
			t.Fatal(err)
		}
		time.Sleep(delay)
		if err := cmd.Process.Signal(syscall.SIGKILL); err != nil {
			t.Fatal(err)
		}
		err := cmd.Wait()
		var ee *exec.ExitError
		if !errors.As(err, &ee) || ee.Sys().(syscall.WaitStatus).Signal() != syscall.SIGKILL {
			t.Fatalf("after %v: the run was not killed while working (%v; stderr %q)", delay, err, stderr.String())
		}
		entries, _ := os.ReadDir(out)
		for _, e := range entries {
			if n := e.Name(); strings.HasPrefix(n, ".series.csv.") && isTempName(n) {
				os.Remove(filepath.Join(out, n))
			}
		}
		sameFiles(t, out, before)
	}
}

// TestCatalogueCoversTheReference holds the bad-input catalogue to its
// size and form: at least 60 files, each opening with a comment line that
// says what is wrong, and every series file a scenario names present.
func TestCatalogueCoversTheReference(t *testing.T) {
	files, _ := filepath.Glob(filepath.Join("..", "..", "testdata", "bad", "*.yaml"))
	if len(files) < 60 {
		t.Fatalf("catalogue has %d files, want at least 60", len(files))
	}
	expectFile := regexp.MustCompile(`(?m)^# expect-file: (\S+)$`)
	for _, p := range files {
		data, _ := os.ReadFile(p)
		if !bytes.HasPrefix(data, []byte("# ")) || !bytes.Contains(bytes.SplitN(data, []byte("\n"), 2)[0], []byte("invented test data")) {
			t.Errorf("%s: first line is not a comment saying what is wrong (invented test data)", filepath.Base(p))
		}
		if m := expectFile.FindSubmatch(data); m != nil {
			if _, err := os.Stat(filepath.Join(filepath.Dir(p), string(m[1]))); err != nil {
				t.Errorf("%s: %v", filepath.Base(p), err)
			}
		}
	}
}

// TestLimitsThroughTheCommand runs absurd but well-formed scenarios: each
// is either solved with finite results or refused in one line that names
// the limit.
func TestLimitsThroughTheCommand(t *testing.T) {
	wall := func(layer, analysis string) string {
		return "title: limits\nkind: wall\nlayers:\n" + layer +
			"outside:\n  temperature: {mean: 5, daily: {amplitude: 5, peak_hour: 15}}\n" + analysis
	}
	brick := "  - material: clay-brick\n    thickness: 0.2\n"
	cases := []struct {
		name, yaml string
		code       int
		words      []string
	}{
		{"one-second steps for fifty years", wall(brick, "analysis:\n  simulate: {duration: 50y, step: 1s}\n"),
			1, []string{"time steps is more than the limit of 5e7", "analysis.simulate"}},
		{"micrometre cells", wall(brick, "analysis:\n  simulate: {duration: 1d, step: 1h, mesh: {surface_cell: 0.0005 mm, max_cell: 0.0005 mm, growth: 1}}\n"),
			1, []string{"cells than the limit of 200000", "analysis.simulate.mesh"}},
		{"a kilometre of ground", "title: deep\nkind: ground\nlayers:\n  - material: rock\n    thickness: 1000 m\n" +
			"surface:\n  temperature: {mean: 5, annual: {amplitude: 10, peak_day: 200}}\nanalysis:\n  simulate: {duration: 1y, step: 1d}\n",
			0, nil},
		{"conductivity 1e-30 over a thousand km", wall("  - {name: odd, conductivity: 1e-30, density: 1000, specific_heat: 1000, thickness: 1e6}\n",
			"analysis:\n  simulate: false\n"), 0, nil},
		{"values of 1e30", wall("  - {name: odd, conductivity: 1e30, density: 1e30, specific_heat: 1e30, thickness: 0.1}\n",
			"analysis:\n  simulate: false\n"), 0, nil},
		{"a mean of 1e300 degC", "title: hot\nkind: wall\nlayers:\n" + brick + "outside:\n  temperature: {mean: 1e300}\nanalysis:\n  simulate: false\n",
			0, nil},
		{"no heat capacity", wall("  - {name: odd, conductivity: 1, density: 1e-300, specific_heat: 1e-300, thickness: 0.1}\n", ""),
			1, []string{"heat capacity must be positive", "layers[1]"}},
	}
	dir := t.TempDir()
	for i, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			f := filepath.Join(dir, c.name+".yaml")
			os.WriteFile(f, []byte(c.yaml), 0o644)
			out := filepath.Join(dir, "out", string(rune('a'+i)))
			start := time.Now()
			code, _, stderr := runCLI(t, "run", f, "--out", out, "-q")
			if d := time.Since(start); d > 15*time.Second {
				t.Errorf("took %v", d)
			}
			if c.code != 0 {
				oneLine(t, code, stderr, c.code, append([]string{f + ":"}, c.words...)...)
				return
			}
			if code != 0 {
				t.Fatalf("exit %d: %s", code, stderr)
			}
			// results.json holds no NaN or infinity (encoding would fail),
			// and the CSV files no NaN text.
			for name, data := range snapshot(t, out) {
				if bytes.Contains(bytes.ToLower(data), []byte("nan")) && strings.HasSuffix(name, ".csv") {
					t.Errorf("%s holds NaN", name)
				}
			}
		})
	}
}

// TestNonFiniteResultsAreRefused checks the guard of writeOutputs: a
// result holding NaN or infinity is an error naming the value, and nothing
// is written.
func TestNonFiniteResultsAreRefused(t *testing.T) {
	res := &results.Results{Title: "t", Kind: "wall", Periodic: []results.PeriodicResult{{Period_h: 24}, {Period_h: 12, DecrementFactor: math.Inf(1)}}}
	dir := t.TempDir()
	_, err := writeOutputs(dir, res, charts.Options{ToolVersion: version})
	if err == nil || !strings.Contains(err.Error(), "periodic[1].decrement_factor") {
		t.Fatalf("err = %v, want one naming periodic[1].decrement_factor", err)
	}
	if entries, _ := os.ReadDir(dir); len(entries) != 0 {
		t.Errorf("files written: %v", entries)
	}
	if at := results.NonFinite(&results.Results{Title: "t"}); at != "" {
		t.Errorf("a finite result reported at %s", at)
	}
}
