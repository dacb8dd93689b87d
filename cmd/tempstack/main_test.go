package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"tempstack/scenarios"
)

// runCLI runs the command in-process and returns exit code, stdout, stderr.
func runCLI(t *testing.T, args ...string) (int, string, string) {
	t.Helper()
	var out, errb bytes.Buffer
	code := run(append([]string{"tempstack"}, args...), &out, &errb)
	return code, out.String(), errb.String()
}

// TestBadScenarios runs `check` on every broken file of the bad-input
// catalogue testdata/bad/: exit 1, exactly one line on stderr naming file
// and line, and the expected words. Each file states what it expects in a
// header line "# expect: line N: words". The files are invented test data.
func TestBadScenarios(t *testing.T) {
	files, err := filepath.Glob(filepath.Join("..", "..", "testdata", "bad", "*.yaml"))
	if err != nil || len(files) < 15 {
		t.Fatalf("catalogue has %d files (%v)", len(files), err)
	}
	expect := regexp.MustCompile(`(?m)^# expect: line (\d+): (.+)$`)
	for _, path := range files {
		t.Run(filepath.Base(path), func(t *testing.T) {
			data, err := os.ReadFile(path)
			if err != nil {
				t.Fatal(err)
			}
			m := expect.FindSubmatch(data)
			if m == nil {
				t.Fatalf("no '# expect: line N: words' header")
			}
			line, want := string(m[1]), string(m[2])
			code, out, stderr := runCLI(t, "check", path)
			if code != 1 {
				t.Fatalf("exit code %d, want 1 (stdout %q, stderr %q)", code, out, stderr)
			}
			if strings.Count(stderr, "\n") != 1 {
				t.Errorf("stderr is not one line: %q", stderr)
			}
			named := path
			if f := regexp.MustCompile(`(?m)^# expect-file: (\S+)$`).FindSubmatch(data); f != nil {
				named = filepath.Join(filepath.Dir(path), string(f[1]))
			}
			if prefix := named + ":" + line + ":"; !strings.Contains(stderr, prefix) {
				t.Errorf("stderr %q does not name %s", stderr, prefix)
			}
			if !strings.Contains(stderr, want) {
				t.Errorf("stderr %q does not say %q", stderr, want)
			}
			if strings.Contains(stderr, "goroutine") || strings.Contains(stderr, "panic") {
				t.Errorf("stack trace on stderr: %q", stderr)
			}
		})
	}
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
	// Core keys of the output contract (README, "Outputs": marked *).
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
	for _, kind := range []string{"wall", "ground", "room"} {
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

// TestGuardsInsteadOfCrashes: inputs that once crashed or hung are refused
// with one line naming the limit (invented test data).
func TestGuardsInsteadOfCrashes(t *testing.T) {
	dir := t.TempDir()
	var many strings.Builder
	many.WriteString("title: many\nkind: wall\nlayers:\n")
	for i := 0; i < 1001; i++ {
		many.WriteString("  - {material: clay-brick, thickness: 1 mm}\n")
	}
	many.WriteString("outside:\n  temperature: {mean: 5}\n")
	cases := []struct{ name, yaml, want string }{
		{"tiny-diffusivity", `title: x
kind: wall
layers:
  - {name: odd, conductivity: 1e-30, density: 1000, specific_heat: 1000, thickness: 0.1}
outside:
  temperature: {mean: 5, daily: {amplitude: 5, peak_hour: 15}}
`, "cells than the limit of 200000"},
		{"many-layers", many.String(), "more than the limit of 1000"},
		{"huge-density", `title: x
kind: wall
layers:
  - {name: odd, conductivity: 1, density: 1e30, specific_heat: 1000, thickness: 0.1}
outside:
  temperature: {mean: 5, daily: {amplitude: 5, peak_hour: 15}}
`, "cells than the limit"},
	}
	for _, c := range cases {
		p := filepath.Join(dir, c.name+".yaml")
		os.WriteFile(p, []byte(c.yaml), 0o644)
		code, _, stderr := runCLI(t, "run", p, "--out", filepath.Join(dir, "out-"+c.name), "-q")
		if code != 1 || !strings.Contains(stderr, c.want) || strings.Count(stderr, "\n") != 1 {
			t.Errorf("%s: exit %d, %q; want exit 1 saying %q", c.name, code, stderr, c.want)
		}
	}
}

// TestReportIsDeterministicUnlessDated: two runs give byte-identical
// outputs; --date adds a date to the report only.
func TestReportIsDeterministicUnlessDated(t *testing.T) {
	dir := t.TempDir()
	read := func(sub string, args ...string) map[string][]byte {
		out := filepath.Join(dir, sub)
		code, _, stderr := runCLI(t, append([]string{"run", "--out", out, "-q"}, args...)...)
		if code != 0 {
			t.Fatalf("exit %d: %s", code, stderr)
		}
		files, _ := filepath.Glob(filepath.Join(out, "*"))
		m := map[string][]byte{}
		for _, f := range files {
			m[filepath.Base(f)], _ = os.ReadFile(f)
		}
		return m
	}
	a, b, c := read("a"), read("b"), read("c", "--date")
	for name, data := range a {
		if !bytes.Equal(data, b[name]) {
			t.Errorf("%s differs between two runs", name)
		}
		if name != "report.html" && !bytes.Equal(data, c[name]) {
			t.Errorf("%s differs with --date", name)
		}
	}
	if bytes.Equal(a["report.html"], c["report.html"]) {
		t.Error("--date left the report unchanged")
	}
}

// `new` writes the schema its starter names beside the starter, and
// `schema` prints the schema published in the repository.
func TestNewWritesSchemaAndSchemaCommand(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "wall.yaml")
	code, stdout, stderr := runCLI(t, "new", "wall", "--out", out)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	written, err := os.ReadFile(filepath.Join(dir, scenarios.SchemaFile))
	if err != nil {
		t.Fatalf("new did not write the schema: %v (stdout %q)", err, stdout)
	}
	published, err := os.ReadFile(filepath.Join("..", "..", "scenarios", "schema", scenarios.SchemaFile))
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(written, published) {
		t.Error("the schema new writes differs from the published one")
	}
	code, printed, stderr := runCLI(t, "schema")
	if code != 0 || printed != string(published) {
		t.Errorf("schema: exit %d, %d bytes (stderr %q); want the published %d bytes", code, len(printed), stderr, len(published))
	}
	// A second starter in the same folder leaves the schema as it is.
	code, stdout, _ = runCLI(t, "new", "ground", "--out", filepath.Join(dir, "ground.yaml"))
	if code != 0 || strings.Contains(stdout, scenarios.SchemaFile) {
		t.Errorf("second new: exit %d, %q; want the schema left alone", code, stdout)
	}
}
