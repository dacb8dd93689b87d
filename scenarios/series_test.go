package scenarios

import (
	"bytes"
	"context"
	"reflect"
	"testing"

	"tempstack/scenarios/results"
)

// runBoth runs s with series.csv kept in memory and streamed.
func runBoth(t *testing.T, s *Scenario) (mem, streamed *results.Results, csv []byte) {
	t.Helper()
	var err error
	if mem, err = Run(context.Background(), s, Options{}); err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	if streamed, err = Run(context.Background(), s, Options{Series: &b}); err != nil {
		t.Fatal(err)
	}
	return mem, streamed, b.Bytes()
}

// TestStreamedSeriesSameBytes: series.csv written while the simulation
// runs is byte for byte the file built afterwards from the samples kept in
// memory, for a wall with an inside environment, a ground column with
// probes and frost columns, and a dated record (time stamps); the results
// and the charts' series do not change either.
func TestStreamedSeriesSameBytes(t *testing.T) {
	names := []string{"brick-wall", "wall-options", "station-frost"}
	if testing.Short() {
		names = names[:2]
	}
	for _, name := range names {
		ex, ok := LookupExample(name)
		if !ok {
			t.Fatalf("no example %s", name)
		}
		s, err := ex.Decode()
		if err != nil {
			t.Fatal(err)
		}
		mem, str, csv := runBoth(t, s)
		var want []byte
		for _, f := range results.CSVFiles(mem) {
			if f.Name == "series.csv" {
				want = f.Data
			}
		}
		if len(want) == 0 || !bytes.Equal(csv, want) {
			t.Errorf("%s: streamed series.csv (%d bytes) differs from the one built in memory (%d bytes)", name, len(csv), len(want))
		}
		if !str.SeriesStreamed || mem.SeriesStreamed {
			t.Errorf("%s: SeriesStreamed %v (streamed) and %v (in memory)", name, str.SeriesStreamed, mem.SeriesStreamed)
		}
		for _, f := range results.CSVFiles(str) {
			if f.Name == "series.csv" && (!f.Streamed || f.Data != nil) {
				t.Errorf("%s: a streamed run lists series.csv with data", name)
			}
		}
		if !reflect.DeepEqual(mem.Series, str.Series) || !reflect.DeepEqual(mem.Simulation, str.Simulation) || !reflect.DeepEqual(mem.Frost, str.Frost) {
			t.Errorf("%s: the results differ when series.csv is streamed", name)
		}
	}
}

// TestStreamedLongRunThinsTheCharts: a streamed run of more than
// chartSamples samples keeps for the charts every stride-th sample and the
// last, within chartThinned, while the CSV has every sample; the frost per
// winter (read from every sample) is that of the run kept in memory.
func TestStreamedLongRunThinsTheCharts(t *testing.T) {
	if testing.Short() {
		t.Skip("a four-year ground run")
	}
	s, err := Decode("long.yaml", []byte(`# Invented test data.
title: four winters, hourly
kind: ground
layers:
  - soil: {texture: silt-clay, dry_density: 1600, water_content: 20 %}
    thickness: 6 m
surface:
  temperature: {mean: 1, annual: {amplitude: 12, peak_day: 200}, daily: {amplitude: 3, peak_hour: 15}}
analysis:
  probes: [0.3 m, 1 m]
  simulate: {duration: 4y, step: 1h, output_step: 1h}
`))
	if err != nil {
		t.Fatal(err)
	}
	mem, str, csv := runBoth(t, s)
	n := len(mem.Series.Simulation.Time_h)
	if n <= chartSamples {
		t.Fatalf("%d samples: not a long run", n)
	}
	if rows := bytes.Count(csv, []byte("\n")) - 1; rows != n {
		t.Errorf("streamed series.csv has %d rows, want %d", rows, n)
	}
	got := str.Series.Simulation
	stride := (n - 1 + chartThinned - 3) / (chartThinned - 2)
	if len(got.Time_h) > chartThinned || len(got.Time_h) < chartThinned/2 {
		t.Errorf("%d samples kept for the charts, want at most %d", len(got.Time_h), chartThinned)
	}
	full := mem.Series.Simulation
	for i, th := range got.Time_h {
		k := i * stride
		if i == len(got.Time_h)-1 {
			k = n - 1
		}
		if th != full.Time_h[k] || got.FrostDepth_m[i] != full.FrostDepth_m[k] || got.Probes_C[1][i] != full.Probes_C[1][k] {
			t.Fatalf("kept sample %d is not sample %d of the run", i, k)
		}
	}
	if !reflect.DeepEqual(mem.Frost, str.Frost) || !reflect.DeepEqual(mem.Simulation, str.Simulation) {
		t.Error("the frost analysis or the simulation summary differ when series.csv is streamed")
	}
}
