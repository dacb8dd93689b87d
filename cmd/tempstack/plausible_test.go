package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestPlausibilityWarningsShown: a unit slip (a layer thickness of 240
// without a unit, read as 240 m) is a warning, not an error: check prints
// it with file, line and key and exits 0; run shows it on the terminal,
// in results.json's warnings and in the report.
func TestPlausibilityWarningsShown(t *testing.T) {
	dir := t.TempDir()
	file := filepath.Join(dir, "slip.yaml")
	src := "title: slip\nkind: wall\nlayers:\n  - material: clay-brick\n    thickness: 240\noutside:\n  temperature: {mean: 5, daily: {amplitude: 6, peak_hour: 14}}\ninside:\n  temperature: 20\n"
	if err := os.WriteFile(file, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	code, out, stderr := runCLI(t, "check", file)
	if code != 0 || !strings.Contains(out, ": ok:") {
		t.Fatalf("check: exit %d, stdout %q, stderr %q; want 0 and ok", code, out, stderr)
	}
	want := "tempstack: warning: " + file + `:5: layers[1].thickness: a bare 240 is read as 240 m`
	if !strings.Contains(stderr, want) || strings.Count(stderr, "\n") != 1 {
		t.Errorf("check stderr %q, want one line with %q", stderr, want)
	}

	outDir := filepath.Join(dir, "out")
	code, out, stderr = runCLI(t, "run", file, "--out", outDir)
	if code != 0 {
		t.Fatalf("run: exit %d: %s", code, stderr)
	}
	text := "line 5, layers[1].thickness: a bare 240 is read as 240 m"
	if !strings.Contains(out, "note: "+text) {
		t.Errorf("run terminal output does not show %q:\n%s", text, out)
	}
	data, err := os.ReadFile(filepath.Join(outDir, "results.json"))
	if err != nil {
		t.Fatal(err)
	}
	var res struct {
		Warnings []string `json:"warnings"`
	}
	if err := json.Unmarshal(data, &res); err != nil {
		t.Fatal(err)
	}
	if len(res.Warnings) == 0 || !strings.HasPrefix(res.Warnings[0], text) {
		t.Errorf("results.json warnings %q, want the slip first", res.Warnings)
	}
	report, err := os.ReadFile(filepath.Join(outDir, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(report), "Line 5, layers[1].thickness: a bare 240 is read as 240 m") {
		t.Error("report.html does not show the warning")
	}
}

// TestIndicesFahrenheitColumnWarns: indices reading a column named like
// Fahrenheit in degC (the default --unit) warns on stderr and still
// answers; with --unit F it is quiet.
func TestIndicesFahrenheitColumnWarns(t *testing.T) {
	path := writeTiny(t, "tiny.csv", ",", func(c float64) float64 { return c*9/5 + 32 }, false)
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, []byte(strings.Replace(string(data), "day,air\n", "day,air_F\n", 1)), 0o644); err != nil {
		t.Fatal(err)
	}
	args := []string{"indices", path, "--time-column", "day", "--max-gap", "400d"}
	code, _, stderr := runCLI(t, args...)
	want := `tempstack: warning: ` + path + `: column "air_F" is named like degrees Fahrenheit but is read in degC (--unit C); if it holds degF, give --unit F`
	if code != 0 || !strings.Contains(stderr, want) {
		t.Errorf("exit %d, stderr %q; want 0 and %q", code, stderr, want)
	}
	code, _, stderr = runCLI(t, append(args, "--unit", "F")...)
	if code != 0 || stderr != "" {
		t.Errorf("--unit F: exit %d, stderr %q; want 0 and nothing", code, stderr)
	}
}
