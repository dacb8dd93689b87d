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
