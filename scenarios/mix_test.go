package scenarios

import (
	"context"
	"math"
	"reflect"
	"strings"
	"testing"
)

// A scenario with a mixed layer: results.json carries the combined
// method's limits, mean and relative error, U is 1/R_T, and the periodic
// analysis and the simulation run on the equivalent homogeneous layer. The
// wall is the timber frame worked by hand in layers/mix_test.go
// (TestCombinedTimberFrameByHand, ISO 6946 formulas [derived]): upper
// 3.3940, lower 3.2398, mean 3.3169 m2 K/W, e = 2.3232 %.
func TestMixedLayerRun(t *testing.T) {
	src := `
title: frame
kind: wall
layers:
  - {material: clay-brick, thickness: 102.5 mm}
  - {material: plywood, thickness: 12 mm}
  - thickness: 140 mm
    fractions:
      - {material: softwood, fraction: 15 %}
      - {material: mineral-wool, fraction: 0.85}
  - {material: gypsum-board, thickness: 12.5 mm}
outside:
  resistance: 0.04
  temperature: {mean: 10, daily: {amplitude: 5, peak_hour: 15}}
inside:
  resistance: 0.13
  temperature: {mean: 20}
analysis:
  periods: [24h]
  simulate: {duration: 4d, step: 30min}
`
	s, err := Decode("frame.yaml", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	r, err := Run(context.Background(), s, Options{})
	if err != nil {
		t.Fatal(err)
	}
	cm := r.Steady.CombinedMethod
	if cm == nil {
		t.Fatal("no combined_method in the steady results")
	}
	for _, q := range []struct {
		name      string
		got, want float64
	}{
		{"upper", cm.UpperLimit_m2K_W, 3.3940},
		{"lower", cm.LowerLimit_m2K_W, 3.2398},
		{"mean", cm.Mean_m2K_W, 3.3169},
		{"relative error", cm.RelativeError, 0.023232},
		{"total resistance", r.Steady.TotalResistance_m2K_W, 3.3169},
		{"U", r.Steady.UValue_W_m2K, 1 / 3.3169},
	} {
		if math.Abs(q.got-q.want) > 2e-4*q.want {
			t.Errorf("%s = %.5g, want %.5g", q.name, q.got, q.want)
		}
	}
	if r.Layers[2].Mix == nil || len(r.Layers[2].Mix) != 2 || r.Layers[2].Mix[0].Fraction != 0.15 {
		t.Errorf("layer 3 parts %+v; want the two parts with their fractions", r.Layers[2].Mix)
	}
	// The equivalent layer's resistance completes R_T [derived: R_T minus
	// the surface and plain-layer resistances].
	plain := 0.04 + 0.1025/0.77 + 0.012/0.13 + 0.0125/0.25 + 0.13
	if got, want := r.Layers[2].Resistance_m2K_W, cm.Mean_m2K_W-plain; math.Abs(got-want) > 1e-12 {
		t.Errorf("equivalent layer R = %.15g, want %.15g", got, want)
	}
	// The exact periodic analysis sees the same steady U as the combined
	// method (its zero-frequency limit is the layers in series).
	if s.construction().UValue(0.13, 0.04) != r.Steady.UValue_W_m2K {
		t.Error("the column of the periodic analysis is not the equivalent construction")
	}
	if r.Simulation == nil || !strings.Contains(cm.Equivalent, "equivalent homogeneous layer") {
		t.Errorf("simulation %v, equivalent note %q", r.Simulation, cm.Equivalent)
	}
}

// A mix of one part at fraction 1 gives the same results as the plain
// layer (degenerate case); without a mixed layer there is no
// combined_method block.
func TestMixedLayerSinglePartIsPlain(t *testing.T) {
	const head = `
title: same
kind: wall
layers:
  - {material: clay-brick, thickness: 200 mm}
`
	const tail = `
outside:
  temperature: {mean: 10, daily: {amplitude: 5, peak_hour: 15}}
inside:
  temperature: {mean: 20}
analysis:
  periods: [24h, 12h]
`
	run := func(layer string) (steady, periodic any, cm bool) {
		s, err := Decode("same.yaml", []byte(head+layer+tail))
		if err != nil {
			t.Fatal(err)
		}
		res, err := Run(context.Background(), s, Options{})
		if err != nil {
			t.Fatal(err)
		}
		cm = res.Steady.CombinedMethod != nil
		res.Steady.CombinedMethod = nil
		return res.Steady, res.Periodic, cm
	}
	s1, p1, cm1 := run("  - {material: mineral-wool, thickness: 100 mm}\n")
	s2, p2, cm2 := run("  - thickness: 100 mm\n    fractions: [{material: mineral-wool, fraction: 1}]\n")
	if cm1 || !cm2 {
		t.Errorf("combined_method present: plain %v, mix %v; want false, true", cm1, cm2)
	}
	if !reflect.DeepEqual(s1, s2) {
		t.Errorf("steady differs:\n%+v\n%+v", s1, s2)
	}
	if !reflect.DeepEqual(p1, p2) {
		t.Errorf("periodic differs:\n%+v\n%+v", p1, p2)
	}
}

// Mistakes in a mixed layer name the file, line and key.
func TestMixedLayerErrors(t *testing.T) {
	for _, tc := range []struct {
		name, layer, want string
	}{
		{"no thickness", "  - fractions: [{material: softwood, fraction: 1}]\n", "layers[1].thickness: missing key"},
		{"empty", "  - {thickness: 0.1, fractions: []}\n", "the list is empty"},
		{"unknown material", "  - {thickness: 0.1, fractions: [{material: sofwood, fraction: 1}]}\n", `did you mean "softwood"`},
		{"no fraction", "  - {thickness: 0.1, fractions: [{material: softwood}]}\n", "layers[1].fractions[1].fraction: missing key"},
		{"inline incomplete", "  - {thickness: 0.1, fractions: [{conductivity: 0.1, fraction: 1}]}\n", "fractions[1].density: missing key"},
		{"zero fraction", "  - {thickness: 0.1, fractions: [{material: softwood, fraction: 0}, {material: eps, fraction: 1}]}\n", "must be positive"},
		{"soil", "  - {thickness: 0.1, soil: {texture: sand}, fractions: [{material: softwood, fraction: 1}]}\n", "layers[1].soil: a mixed layer takes its properties from its parts"},
	} {
		src := "title: x\nkind: wall\nlayers:\n" + tc.layer + "outside:\n  temperature: {mean: 5}\ninside:\n  temperature: {mean: 20}\n"
		_, err := Decode("m.yaml", []byte(src))
		if err == nil || !strings.Contains(err.Error(), tc.want) || !strings.Contains(err.Error(), "m.yaml:4") {
			t.Errorf("%s: error %v, want m.yaml:4 and %q", tc.name, err, tc.want)
		}
	}
}
