package main

import (
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// The terminal and the report never print a 0 m frost depth or a 0
// freezing index that was not computed: a ground that never freezes says
// "not computed" with the reason, and results.json holds null.
func TestNoFalseZerosOnTheTerminal(t *testing.T) {
	dir := t.TempDir()
	file := filepath.Join(dir, "warm.yaml")
	os.WriteFile(file, []byte(`title: warm ground
kind: ground
layers:
  - {name: clay, thickness: 6, conductivity: 1.3, conductivity_frozen: 1.6, density: 1800, specific_heat: 1300, latent_heat: 100 MJ/m3}
surface:
  temperature: {mean: 10, annual: {amplitude: 5, peak_day: 200}}
analysis:
  periods: [8760h]
  simulate: {duration: 1y}
`), 0o644)
	out := filepath.Join(dir, "out")
	code, stdout, stderr := runCLI(t, "run", file, "--out", out)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if !strings.Contains(stdout, "Stefan not computed (the surface temperature never falls below 0 degC)") {
		t.Errorf("terminal does not say why Stefan was not computed:\n%s", stdout)
	}
	zero := regexp.MustCompile(`(Stefan|Berggren|index) 0(\.0+)? (m|degC)`)
	if m := zero.FindString(stdout); m != "" {
		t.Errorf("terminal prints a false zero %q:\n%s", m, stdout)
	}
	js, _ := os.ReadFile(filepath.Join(out, "results.json"))
	for _, k := range []string{"stefan_depth_m", "modified_berggren_depth_m", "freezing_index_Cd"} {
		if !regexp.MustCompile(`"` + k + `":\s*null`).Match(js) {
			t.Errorf("results.json: %s is not null", k)
		}
	}
	html, _ := os.ReadFile(filepath.Join(out, "report.html"))
	if !strings.Contains(string(html), "not computed: the surface temperature never falls below 0 degC") {
		t.Errorf("report does not say why the closed forms are missing")
	}
	if regexp.MustCompile(`Stefan estimate is 0\.00 m|modified Berggren estimate 0\.00 m`).Match(html) {
		t.Errorf("report prints a 0.00 m closed-form depth")
	}
}
