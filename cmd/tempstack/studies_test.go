package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"tempstack/scenarios/results"
)

// TestRunPrintsStudies: run prints what a study found on the terminal, in
// short tables whose headings carry units, the sweep named in words, and
// the target value as results.json has it (rounded to its tolerance).
func TestRunPrintsStudies(t *testing.T) {
	for _, c := range []struct {
		args []string
		want []string
	}{
		{[]string{"--example", "wall-options"}, []string{
			"  options compared:\n",
			"    option             U-value (W/(m2 K))  decrement factor  time shift (h)  whole time shift (h)\n",
			"  sweep of the thickness of layer 2 (Mineral wool",
			"    value (mm)  U-value (W/(m2 K))",
			"  target met: thickness of layer 3 (Clay brickwork",
		}},
		{[]string{filepath.Join("..", "..", "testdata", "golden", "scenarios", "wall-study.yaml")}, []string{
			"  uncertainty, 30 samples (0 refused) varying the thickness of layer 3",
			"    quantity                                mean ",
			"  median  95 %\n",
			"    U-value (W/(m2 K))  ",
		}},
	} {
		dir := t.TempDir()
		code, out, stderr := runCLI(t, append([]string{"run", "--out", dir}, c.args...)...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", c.args, code, stderr)
		}
		for _, w := range c.want {
			if !strings.Contains(out, w) {
				t.Errorf("%v: output lacks %q:\n%s", c.args, w, out)
			}
		}
		var r results.Results
		data, err := os.ReadFile(filepath.Join(dir, "results.json"))
		if err != nil {
			t.Fatal(err)
		}
		if err := json.Unmarshal(data, &r); err != nil {
			t.Fatal(err)
		}
		if tg := r.Target; tg != nil {
			want := " at " + strconv.FormatFloat(tg.Value, 'f', -1, 64) + " " + tg.Unit + " gives whole time shift"
			if !strings.Contains(out, want) {
				t.Errorf("%v: the target line does not give %q:\n%s", c.args, want, out)
			}
		}
	}
}

// TestRunPrintsTargetNotMet: a target out of reach prints the closest
// value rounded to the tolerance's grid (99.87 mm on a 0.2 mm grid is
// 99.8 mm, rounded by hand) and the quantity with its own digits (one
// decimal for a time shift), on the terminal as in results.json.
func TestRunPrintsTargetNotMet(t *testing.T) {
	dir := t.TempDir()
	file := filepath.Join(dir, "reach.yaml")
	src := `title: out of reach
kind: wall
layers:
  - {material: cement-render, thickness: 15 mm}
  - {material: eps, thickness: 100 mm}
  - {material: concrete, thickness: 180 mm}
  - {material: gypsum-plaster, thickness: 13 mm}
outside:
  temperature: {mean: 20, daily: {amplitude: 10, peak_hour: 15}}
analysis:
  simulate: false
target:
  parameter: layers[3].thickness
  from: 20.37 mm
  to: 99.87 mm
  quantity: time_shift_unwrapped_h
  at_least: 30
  tolerance: 0.2
`
	if err := os.WriteFile(file, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "out")
	code, stdout, stderr := runCLI(t, "run", "--out", out, file)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	data, err := os.ReadFile(filepath.Join(out, "results.json"))
	if err != nil {
		t.Fatal(err)
	}
	var r results.Results
	if err := json.Unmarshal(data, &r); err != nil {
		t.Fatal(err)
	}
	tg := r.Target
	if tg == nil || tg.Met || tg.Value != 99.87 {
		t.Fatalf("want the goal out of reach with the closest at the top of the range: %+v", tg)
	}
	achieved := strconv.FormatFloat(tg.Achieved, 'f', 1, 64) + " h"
	if want := "; the closest, 99.8 mm, gives " + achieved + " ("; !strings.Contains(stdout, want) {
		t.Errorf("terminal lacks %q:\n%s", want, stdout)
	}
	if want := "the closest is 99.8 mm: time_shift_unwrapped_h = " + strings.TrimSuffix(achieved, " h"); !strings.HasSuffix(tg.Message, want) {
		t.Errorf("results.json message %q does not end in %q", tg.Message, want)
	}
}
