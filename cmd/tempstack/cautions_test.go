package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"tempstack/scenarios"
)

// readResults runs `run` on args into a new folder and returns stdout,
// results.json decoded and report.html.
func readResults(t *testing.T, args ...string) (string, map[string]any, string) {
	t.Helper()
	dir := filepath.Join(t.TempDir(), "out")
	code, out, stderr := runCLI(t, append([]string{"run", "--out", dir}, args...)...)
	if code != 0 {
		t.Fatalf("run %v: exit %d: %s", args, code, stderr)
	}
	data, err := os.ReadFile(filepath.Join(dir, "results.json"))
	if err != nil {
		t.Fatal(err)
	}
	var res map[string]any
	if err := json.Unmarshal(data, &res); err != nil {
		t.Fatal(err)
	}
	html, err := os.ReadFile(filepath.Join(dir, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	return out, res, string(html)
}

// TestCautionsEverywhere wants the frost cautions (who sets footing and
// pipe depths; no method is a safe upper bound) in results.json's
// cautions[], in the report and on the terminal for the ground demos, the
// record's short-record warnings for the station demo, and the
// one-dimensional caution for a wall. The rule comes from the project's
// brief: frost advice can hurt people (common practice for such tools).
func TestCautionsEverywhere(t *testing.T) {
	tests := []struct {
		example string
		want    []string
	}{
		{"farm-frost", []string{"local codes", "licensed engineer", "pipe cover depth", "Footing depth", "safe upper bound",
			"is below the simulated frost depth"}},
		{"station-frost", []string{"local codes", "licensed engineer", "safe upper bound",
			"fewer than the 30 the rule asks for", "100-year index extrapolates from 10 winters"}},
		{"brick-wall", []string{"one-dimensional heat flow", "homogeneous layers"}},
	}
	for _, tc := range tests {
		t.Run(tc.example, func(t *testing.T) {
			out, res, html := readResults(t, "--example", tc.example)
			raw, ok := res["cautions"].([]any)
			if !ok || len(raw) == 0 {
				t.Fatalf("results.json has no cautions[]: %v", res["cautions"])
			}
			var all []string
			for _, c := range raw {
				all = append(all, c.(string))
			}
			joined := strings.Join(all, "\n")
			for _, w := range tc.want {
				if !strings.Contains(joined, w) {
					t.Errorf("cautions[] lack %q:\n%s", w, joined)
				}
			}
			for _, c := range all {
				// The report escapes its text: compare a stretch without
				// quotes or ampersands, where escaping changes nothing.
				if !strings.Contains(html, c[:min(len(c), 40)]) {
					t.Errorf("report lacks the caution %q", c)
				}
				if !strings.Contains(out, "caution: "+c) {
					t.Errorf("terminal lacks the caution %q", c)
				}
			}
		})
	}
}

// TestGroundStarterOpensWithCaution wants the ground starter file to begin
// with the frost caution, before any key.
func TestGroundStarterOpensWithCaution(t *testing.T) {
	code, out, stderr := runCLI(t, "new", "ground", "--out", "-")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	// The editor's schema line may come first; the caution comes before any key.
	out = strings.TrimPrefix(out, "# yaml-language-server: $schema="+scenarios.SchemaFile+"\n")
	first, _, _ := strings.Cut(out, "\ntitle:")
	if !strings.HasPrefix(out, "# CAUTION:") {
		t.Errorf("starter begins %q, want the caution", out[:min(len(out), 60)])
	}
	for _, w := range []string{"local codes", "licensed engineer", "pipe", "safe upper bound"} {
		if !strings.Contains(first, w) {
			t.Errorf("the starter's opening comment lacks %q", w)
		}
	}
}

// TestResistanceOnlyWallThroughTheCommand: `check` accepts a wall of
// resistance layers, `run` solves it exactly and says on the terminal, in
// the report and in results.json (simulation null, simulation_skipped)
// that the simulation was skipped and why.
func TestResistanceOnlyWallThroughTheCommand(t *testing.T) {
	src := filepath.Join(t.TempDir(), "air.yaml")
	if err := os.WriteFile(src, []byte(`# invented test data
title: two air layers
kind: wall
layers:
  - material: air-gap-wall
    thickness: 25 mm
  - material: air-gap-wall
    thickness: 25 mm
outside:
  temperature: {mean: 5, daily: {amplitude: 6, peak_hour: 15}}
inside:
  temperature: {mean: 20}
`), 0o644); err != nil {
		t.Fatal(err)
	}
	if code, _, stderr := runCLI(t, "check", src); code != 0 {
		t.Fatalf("check: exit %d: %s", code, stderr)
	}
	out, res, html := readResults(t, src)
	sim, present := res["simulation"]
	if !present || sim != nil {
		t.Errorf("results.json simulation = %v (present %v), want null", sim, present)
	}
	why, _ := res["simulation_skipped"].(string)
	if !strings.Contains(why, "only resistance layers") {
		t.Errorf("simulation_skipped = %q", why)
	}
	if !strings.Contains(out, "simulation skipped: "+why) {
		t.Errorf("terminal does not say the simulation was skipped:\n%s", out)
	}
	if !strings.Contains(html, "only resistance layers") {
		t.Error("report does not say why the simulation was skipped")
	}
}
