package scenarios

import (
	"context"
	"errors"
	"reflect"
	"testing"
	"time"
)

// TestRunLeavesScenarioUnchanged: a run changes nothing in the decoded
// scenario (defaults are resolved by the decoder, what a run learns is
// kept in the run): after running one of two identical decodings, both are
// still deeply equal. Cases cover a plain wall, a sun-fitted wall and a
// ground column with n-factors (the fitted-forcing and wave-depth caches).
func TestRunLeavesScenarioUnchanged(t *testing.T) {
	for _, src := range []string{
		studyWall,
		`
title: sun
kind: wall
layers:
  - {material: concrete, thickness: 150 mm}
outside:
  temperature: {mean: 10, daily: {amplitude: 5, peak_hour: 15}}
  solar: {absorptance: 0.5, irradiance: {mean: 100, daily: {amplitude: 200, peak_hour: 13}}}
analysis:
  simulate: {duration: 2d, step: 30min}
`,
		`
title: ground
kind: ground
layers:
  - {material: wet-clay, thickness: 10 m}
surface:
  cover: turf
  temperature: {mean: 4, annual: {amplitude: 12, peak_day: 200}}
analysis:
  simulate: {duration: 1y, step: 6h}
`,
	} {
		a, err := Decode("a.yaml", []byte(src))
		if err != nil {
			t.Fatal(err)
		}
		b, err := Decode("a.yaml", []byte(src))
		if err != nil {
			t.Fatal(err)
		}
		if !reflect.DeepEqual(a, b) {
			t.Fatal("two decodings differ before any run")
		}
		if _, err := Run(context.Background(), a, Options{}); err != nil {
			t.Fatal(err)
		}
		if !reflect.DeepEqual(a, b) {
			t.Errorf("%s: the run changed the scenario", a.Title)
		}
	}
}

// TestRunCancelled: a study whose context is cancelled stops at the next
// case and returns the context's error, long before the whole sweep would
// have run.
func TestRunCancelled(t *testing.T) {
	s, err := Decode("sweep.yaml", []byte(`
title: long sweep
kind: wall
layers:
  - {material: clay-brick, thickness: 240 mm}
  - {material: mineral-wool, thickness: 100 mm}
outside:
  temperature: {mean: 20, daily: {amplitude: 10, peak_hour: 15}}
analysis:
  simulate: {duration: 60d, step: 5min}
sweep:
  parameter: layers[2].thickness
  from: 50 mm
  to: 400 mm
  steps: 200
`))
	if err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	time.AfterFunc(300*time.Millisecond, cancel)
	start := time.Now()
	r, err := Run(ctx, s, Options{Workers: 2})
	if !errors.Is(err, context.Canceled) || r != nil {
		t.Fatalf("Run returned %v, %v; want context.Canceled", r != nil, err)
	}
	if d := time.Since(start); d > 10*time.Second {
		t.Errorf("cancelled run took %v", d)
	}
}
