package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// runCLI runs the command in-process and returns exit code, stdout, stderr.
func runCLI(t *testing.T, args ...string) (int, string, string) {
	t.Helper()
	var out, errb bytes.Buffer
	code := run(append([]string{"tempstack"}, args...), &out, &errb)
	return code, out.String(), errb.String()
}

// TestBadScenarios runs `check` on every broken file of the bad-input
// catalogue: exit 1, exactly one line on stderr naming file and line, and
// the expected words. The files are invented test data.
func TestBadScenarios(t *testing.T) {
	cases := []struct {
		file string
		line int
		want string
	}{
		{"bad-kind.yaml", 3, `did you mean "wall"`},
		{"bad-orientation.yaml", 4, `did you mean "roof"`},
		{"bad-yaml.yaml", 6, "not valid YAML"},
		{"duplicate-key.yaml", 3, "key given twice"},
		{"empty-layers.yaml", 4, "list is empty"},
		{"empty.yaml", 1, "file is empty"},
		{"freezing-without-latent.yaml", 5, "latent_heat: missing key"},
		{"ground-keys-on-wall.yaml", 8, `names this side "outside"`},
		{"inline-missing-density.yaml", 5, "density: missing key"},
		{"malformed-number.yaml", 6, "not a single number"},
		{"missing-kind.yaml", 2, "kind: missing key"},
		{"missing-mean.yaml", 9, "mean: missing key"},
		{"missing-outside.yaml", 2, "outside: missing key"},
		{"missing-thickness.yaml", 5, "thickness: missing key"},
		{"missing-title.yaml", 2, "title: missing key"},
		{"negative-probe.yaml", 10, "must not be negative"},
		{"negative-resistance.yaml", 8, "must not be negative"},
		{"negative-thickness.yaml", 6, "must be positive"},
		{"peak-hour-range.yaml", 10, "between 0 and 24"},
		{"two-conditions.yaml", 10, "only one of"},
		{"unknown-layer-key.yaml", 6, `did you mean "thickness"`},
		{"unknown-material.yaml", 5, `did you mean "clay-brick"`},
		{"unknown-top-key.yaml", 4, `did you mean "layers"`},
		{"wrong-unit.yaml", 6, `unknown unit "kg" for a length`},
		{"zero-conductivity.yaml", 6, "must be positive"},
		{"zero-period.yaml", 10, "period must be positive"},
		{"probe-outside.yaml", 10, "lies outside the column"},
		{"sim-step-longer.yaml", 10, "longer than the simulated duration"},
		{"sim-zero-duration.yaml", 10, "must be positive"},
		{"sim-unknown-key.yaml", 10, `did you mean "duration"`},
		{"step-missing-to.yaml", 9, "step.to: missing key"},
		{"ground-oversaturated.yaml", 5, "exceeds saturation"},
		{"ground-negative-index.yaml", 10, "cannot be negative"},
		{"ground-bad-cover.yaml", 8, `did you mean "turf"`},
		{"ground-soil-no-texture.yaml", 5, "texture: missing key"},
		{"ground-wall-keys.yaml", 8, `names this side "surface"`},
		{"ground-bottom-swing.yaml", 10, "must be constant"},
		{"wall-design-index.yaml", 10, "kind: ground only"},
	}
	seen := map[string]bool{}
	for _, c := range cases {
		seen[c.file] = true
		t.Run(c.file, func(t *testing.T) {
			path := filepath.Join("..", "..", "testdata", "bad", c.file)
			code, out, stderr := runCLI(t, "check", path)
			if code != 1 {
				t.Fatalf("exit code %d, want 1 (stdout %q, stderr %q)", code, out, stderr)
			}
			if strings.Count(stderr, "\n") != 1 {
				t.Errorf("stderr is not one line: %q", stderr)
			}
			prefix := path + ":" + itoa(c.line) + ":"
			if !strings.Contains(stderr, prefix) {
				t.Errorf("stderr %q does not name %s", stderr, prefix)
			}
			if !strings.Contains(stderr, c.want) {
				t.Errorf("stderr %q does not say %q", stderr, c.want)
			}
			if strings.Contains(stderr, "goroutine") || strings.Contains(stderr, "panic") {
				t.Errorf("stack trace on stderr: %q", stderr)
			}
		})
	}
	// Every file of the catalogue has a case.
	files, _ := filepath.Glob(filepath.Join("..", "..", "testdata", "bad", "*.yaml"))
	for _, f := range files {
		if !seen[filepath.Base(f)] {
			t.Errorf("catalogue file %s has no test case", filepath.Base(f))
		}
	}
}

func itoa(n int) string {
	b, _ := json.Marshal(n)
	return string(b)
}

func TestRunDemoWritesOutputs(t *testing.T) {
	dir := t.TempDir()
	code, out, stderr := runCLI(t, "run", "--out", dir, "--quiet")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if out != "" {
		t.Errorf("--quiet printed %q", out)
	}
	for _, name := range []string{"report.html", "results.json", "periodic.csv", "response.csv", "profile.csv", "cycle.csv", "series.csv"} {
		if fi, err := os.Stat(filepath.Join(dir, name)); err != nil || fi.Size() == 0 {
			t.Errorf("%s missing or empty: %v", name, err)
		}
	}
	// No temporary files are left behind.
	left, _ := filepath.Glob(filepath.Join(dir, ".*.tmp"))
	if len(left) > 0 {
		t.Errorf("temporary files left: %v", left)
	}
	var res map[string]any
	data, _ := os.ReadFile(filepath.Join(dir, "results.json"))
	if err := json.Unmarshal(data, &res); err != nil {
		t.Fatal(err)
	}
	// Core keys of the output contract (DESIGN.md).
	for _, k := range []string{"title", "kind", "steady", "periodic"} {
		if _, ok := res[k]; !ok {
			t.Errorf("results.json lacks %q", k)
		}
	}
	steady := res["steady"].(map[string]any)
	for _, k := range []string{"u_value_W_m2K", "thermal_resistance_m2K_W"} {
		if _, ok := steady[k]; !ok {
			t.Errorf("steady lacks %q", k)
		}
	}
	p := res["periodic"].([]any)[0].(map[string]any)
	for _, k := range []string{"period_h", "decrement_factor", "time_shift_h", "periodic_transmittance_W_m2K",
		"inside_admittance_W_m2K", "outside_admittance_W_m2K", "inside_areal_heat_capacity_kJ_m2K", "outside_areal_heat_capacity_kJ_m2K"} {
		if _, ok := p[k]; !ok {
			t.Errorf("periodic[0] lacks %q", k)
		}
	}
}

func TestRunFileThenFlag(t *testing.T) {
	// Flags after the file are honoured (urfave/cli alone would not).
	dir := t.TempDir()
	src := filepath.Join(dir, "w.yaml")
	code, _, stderr := runCLI(t, "new", "wall", "--out", src)
	if code != 0 {
		t.Fatalf("new: exit %d: %s", code, stderr)
	}
	out := filepath.Join(dir, "res")
	code, _, stderr = runCLI(t, "run", src, "--out", out, "-q")
	if code != 0 {
		t.Fatalf("run: exit %d: %s", code, stderr)
	}
	if _, err := os.Stat(filepath.Join(out, "report.html")); err != nil {
		t.Error(err)
	}
	// new refuses to overwrite without --force.
	code, _, stderr = runCLI(t, "new", "wall", "--out", src)
	if code != 1 || !strings.Contains(stderr, "exists") {
		t.Errorf("overwrite: exit %d, %q", code, stderr)
	}
}

func TestStartersAndExamplesAreValid(t *testing.T) {
	for _, kind := range []string{"wall", "ground"} {
		code, out, stderr := runCLI(t, "new", kind, "--out", "-")
		if code != 0 || !strings.Contains(out, "kind: "+kind) {
			t.Fatalf("new %s: exit %d %s", kind, code, stderr)
		}
		f := filepath.Join(t.TempDir(), kind+".yaml")
		os.WriteFile(f, []byte(out), 0o644)
		if code, _, stderr := runCLI(t, "check", f); code != 0 {
			t.Errorf("starter %s does not check: %s", kind, stderr)
		}
	}
	code, out, _ := runCLI(t, "examples")
	if code != 0 || !strings.Contains(out, "brick-wall") {
		t.Fatalf("examples: %d %q", code, out)
	}
}

func TestUsageErrors(t *testing.T) {
	cases := [][]string{
		{"frobnicate"},
		{"run", "--bogus"},
		{"run", "no-such-file.yaml"},
		{"new", "house"},
		{"materials", "unobtainium"},
		{"run", "--example", "nope"},
	}
	for _, args := range cases {
		code, out, stderr := runCLI(t, args...)
		if code != 1 {
			t.Errorf("%v: exit %d, want 1", args, code)
		}
		if strings.Count(stderr, "\n") != 1 {
			t.Errorf("%v: stderr not one line: %q", args, stderr)
		}
		if strings.Contains(out, "USAGE") {
			t.Errorf("%v: printed the whole help: %q", args, out)
		}
	}
}

func TestMaterialsFilter(t *testing.T) {
	code, out, _ := runCLI(t, "materials", "insulation")
	if code != 0 || !strings.Contains(out, "mineral-wool") || strings.Contains(out, "clay-brick") {
		t.Errorf("filter: %d %q", code, out)
	}
	code, out, _ = runCLI(t, "materials", "--json", "steel")
	var ms []map[string]any
	if code != 0 || json.Unmarshal([]byte(out), &ms) != nil || len(ms) == 0 {
		t.Errorf("json: %d %q", code, out)
	}
}
