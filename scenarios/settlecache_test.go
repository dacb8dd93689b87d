package scenarios

import (
	"context"
	"reflect"
	"testing"
)

// TestStudySharesTheSpinUp: the cases of a study that change only what
// comes after the spin-up (a probe, the years simulated) take the base
// scenario's settled start, a case that changes the column settles its
// own, and every case gives exactly the quantities it gives when run on
// its own (unshared). Invented test data.
func TestStudySharesTheSpinUp(t *testing.T) {
	if testing.Short() {
		t.Skip("ground runs")
	}
	s, err := Decode("study.yaml", []byte(`# Invented test data.
title: shared spin-up
kind: ground
layers:
  - name: silt
    soil: {texture: silt-clay, dry_density: 1500, water_content: 20 %}
    thickness: 12 m
surface:
  cover: snow
  temperature: {mean: 4, annual: {amplitude: 14, peak_day: 200}}
bottom:
  heat_flux: 60 mW/m2
analysis:
  periods: [8760h]
  probes: [0.5 m, 1 m]
  simulate: {duration: 2y, step: 12h, start: 196d}
variants:
  - name: three years
    set:
      analysis.simulate.duration: 3y
  - name: wetter
    set:
      layers[1].soil.water_content: 28 %
sweep:
  parameter: analysis.probes[2]
  values: [0.8 m, 1.5 m]
`))
	if err != nil {
		t.Fatal(err)
	}
	c := newSettleCache()
	r, err := Run(context.Background(), s, Options{settled: c})
	if err != nil {
		t.Fatal(err)
	}
	if c.runs != 2 {
		t.Errorf("%d spin-ups for a base, a longer run, two probes and one wetter soil; want 2 (the wetter soil its own)", c.runs)
	}
	alone := func(cs studyCase) map[string]float64 {
		sc, err := decodeCase(s, cs)
		if err != nil {
			t.Fatal(err)
		}
		rr, err := Run(context.Background(), sc, Options{}) // a cache of its own
		if err != nil {
			t.Fatal(err)
		}
		return summarize(rr)
	}
	for i, v := range s.Study.Variants {
		if got, want := r.Variants[i+1].Quantities, alone(v.Sets); !reflect.DeepEqual(map[string]float64(got), want) {
			t.Errorf("variant %q: shared start gives %v, alone %v", v.Name, got, want)
		}
	}
	sw := s.Study.Sweep
	for i := range sw.Values {
		cs := studyCase{{Path: sw.Parameter, Value: scalarAt(sw.Values[i], sw.Line, 1), Line: sw.Line}}
		if got, want := r.Sweep.Points[i].Quantities, alone(cs); !reflect.DeepEqual(map[string]float64(got), want) {
			t.Errorf("sweep point %s: shared start gives %v, alone %v", sw.Values[i], got, want)
		}
	}
	if r.Variants[2].Quantities["max_frost_depth_m"] == r.Variants[0].Quantities["max_frost_depth_m"] {
		t.Error("the wetter soil freezes exactly as deep as the base: the case did not change the column")
	}
}
