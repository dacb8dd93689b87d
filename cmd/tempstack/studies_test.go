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
