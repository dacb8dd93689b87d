package scenarios

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"tempstack/fileerr"
	"tempstack/scenarios/results"
	"testing"
	"testing/fstest"
	"time"
)

// fuzzFS is the folder the fuzzed scenarios read series files from: the
// CSV files of the bad-input catalogue plus two small invented records.
func fuzzFS(tb testing.TB) fstest.MapFS {
	fsys := fstest.MapFS{
		"obs.csv": {Data: []byte("time,air,sun\n2021-01-01T00:00,-2,0\n2021-01-01T06:00,-4,0\n" +
			"2021-01-01T12:00,3,400\n2021-01-01T18:00,1,0\n2021-01-02T00:00,-1,0\n2021-01-02T06:00,-3,0\n")},
		"empty.csv": {Data: nil},
	}
	csvs, _ := filepath.Glob(filepath.Join("..", "testdata", "bad", "*.csv"))
	for _, p := range csvs {
		data, err := os.ReadFile(p)
		if err != nil {
			tb.Fatal(err)
		}
		fsys[filepath.Base(p)] = &fstest.MapFile{Data: data}
	}
	return fsys
}

// checkDecodeError holds a decoding error to the contract of the package:
// an *Error naming a file, printed on one line that starts with the file.
func checkDecodeError(t *testing.T, name string, s *Scenario, err error) {
	t.Helper()
	all := fileerr.All(err)
	if len(all) == 0 {
		t.Fatalf("error is %T, not *scenarios.Error: %v", err, err)
	}
	if s != nil {
		t.Fatalf("a scenario came with the error %v", err)
	}
	if len(all) > maxErrors {
		t.Fatalf("%d mistakes reported, more than the limit %d", len(all), maxErrors)
	}
	for _, se := range all {
		msg := se.Error()
		if strings.ContainsAny(msg, "\n\r") {
			t.Fatalf("error is not one line: %q", msg)
		}
		if se.File == "" || !strings.HasPrefix(msg, se.File) {
			t.Fatalf("error does not start with a file name: %q", msg)
		}
		// Errors in the scenario itself carry a line; an error inside a series
		// file names that file instead (checked by climate's own fuzz test).
		if se.File == name && se.Line <= 0 {
			t.Fatalf("error names no line: %q", msg)
		}
	}
}

// checkScenario checks what a successful decode promises: at least one
// layer, finite SI values, and a forcing on the outside.
func checkScenario(t *testing.T, s *Scenario) {
	t.Helper()
	if s == nil {
		t.Fatal("nil scenario without error")
	}
	finite := func(what string, v float64) {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			t.Fatalf("%s is %g after decoding", what, v)
		}
	}
	all := s.Layers
	if rs := s.Room; s.Kind == Room {
		// A room: its elements carry the layers.
		if rs == nil || len(rs.Elements) == 0 {
			t.Fatal("room without elements")
		}
		finite("the volume", rs.Volume)
		for _, e := range rs.Elements {
			if len(e.Layers) == 0 {
				t.Fatalf("element %s without layers", e.Name)
			}
			finite("an element's area", e.Area)
			all = append(all, e.Layers...)
		}
		if rs.Outdoor == nil {
			t.Fatal("room without an outdoor temperature")
		}
	} else if len(s.Layers) == 0 {
		t.Fatal("scenario without layers")
	}
	for i, l := range all {
		for _, v := range []float64{l.Thickness, l.Conductivity, l.Density, l.SpecificHeat, l.Resistance} {
			finite("a value of layer "+l.Name, v)
		}
		if f := l.Freeze; f != nil {
			for _, v := range []float64{f.LatentHeat, f.ConductivityFrozen, f.HeatCapacityFrozen, f.Point, f.Range} {
				finite("a freezing value of layer "+l.Name, v)
			}
		}
		if l.Thickness < 0 || l.Resistance < 0 {
			t.Fatalf("layer %d has a negative thickness or resistance", i+1)
		}
	}
	if s.Outside.Temperature == nil && s.Kind != Room {
		t.Fatal("no outside temperature")
	}
	sides := []Side{s.Outside, s.Inside}
	if s.Kind == Room {
		sides = nil // a room's outdoor air is RoomSpec.Outdoor
	}
	for _, sd := range sides {
		finite("a surface resistance", sd.SurfaceResistance())
		finite("a heat flux", sd.steadyFlux())
		if f := sd.temperature(); f != nil {
			finite("a mean temperature", f.Mean)
			for _, h := range f.Harmonics {
				finite("a harmonic", h.Period+h.Amplitude+h.Peak)
			}
		}
	}
	for _, p := range s.Analysis.Periods {
		if !(p > 0) || math.IsInf(p, 0) {
			t.Fatalf("analysis period %g", p)
		}
	}
}

// FuzzDecode feeds arbitrary bytes to the scenario decoder. It must never
// panic; it returns either a scenario with finite values or an *Error whose
// message is one line starting with the file name (and, for the scenario
// file itself, a line number). The seed corpus (testdata/fuzz/FuzzDecode)
// holds the embedded examples, the starter files and the bad-input
// catalogue (all invented data).
func FuzzDecode(f *testing.F) {
	fsys := fuzzFS(f)
	f.Add([]byte("title: t\nkind: ground\nlayers: [{material: dry-sand, thickness: 3}]\nsurface:\n  temperature: {file: obs.csv, column: air}\n"))
	f.Add([]byte("title: t\nkind: wall\nlayers: [{material: clay-brick, thickness: 0.1}]\noutside:\n  temperature: 5\n  solar: {absorptance: dark, irradiance: {file: obs.csv, column: sun}}\n"))
	f.Add([]byte("title: t\nkind: ground\nlayers: [{material: dry-sand, thickness: 3}]\nsurface:\n  temperature: {file: empty.csv, column: air}\n"))
	f.Add([]byte("title: &a t\nkind: *a\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		const name = "fuzz.yaml"
		s, err := DecodeFS(name, data, fsys)
		if err != nil {
			checkDecodeError(t, name, s, err)
			return
		}
		checkScenario(t, s)
	})
}

// FuzzRun decodes arbitrary bytes and runs every scenario that decodes,
// with the transient parts switched off (the exact periodic analysis, the
// steady state, the profiles and frequency response, the closed-form frost
// estimates). A run must not panic, must finish within runBudget, and must
// either fail with an *Error or give results that encode as JSON (no NaN
// or infinity anywhere). Its seeds are those of FuzzDecode.
func FuzzRun(f *testing.F) {
	fsys := fuzzFS(f)
	seeds, _ := filepath.Glob(filepath.Join("testdata", "fuzz", "FuzzDecode", "*"))
	for _, p := range seeds {
		if data, err := os.ReadFile(p); err == nil {
			if v, ok := unquoteCorpus(data); ok {
				f.Add(v)
			}
		}
	}
	const runBudget = 10 * time.Second
	f.Fuzz(func(t *testing.T, data []byte) {
		const name = "fuzz.yaml"
		s, err := DecodeFS(name, data, fsys)
		if err != nil {
			return
		}
		s.Analysis.Simulate = nil
		s.Analysis.StepResponse = nil
		if s.Room != nil {
			// A room always simulates: keep it short (no warm-up, hourly steps).
			s.Room.WarmUp, s.Room.WarmUpAuto, s.Room.Step = 0, false, 3600
		}
		type outcome struct {
			r   *results.Results
			err error
			p   any
		}
		done := make(chan outcome, 1)
		go func() {
			var o outcome
			defer func() {
				o.p = recover()
				done <- o
			}()
			o.r, o.err = Run(context.Background(), s, Options{})
		}()
		var o outcome
		select {
		case o = <-done:
		case <-time.After(runBudget):
			t.Fatalf("Run took longer than %v", runBudget)
		}
		if o.p != nil {
			t.Fatalf("Run panicked: %v", o.p)
		}
		if o.err != nil {
			checkDecodeError(t, "", nil, o.err)
			return
		}
		if _, err := json.Marshal(o.r); err != nil {
			t.Fatalf("results do not encode: %v", err)
		}
	})
}

// TestRunRegressions runs inputs that once failed (found by FuzzRun or by
// hand): each must run without panic to JSON-encodable results.
func TestRunRegressions(t *testing.T) {
	cases := []struct {
		name, yaml string
	}{
		{"constant air under a cover (FuzzRun 7e0e1ffb)", "title: 0\nkind: ground\nlayers:\n  - soil: {texture: clay,dry_density: 1500,water_content: 20 %}\n    thickness: 1\nsurface:\n  cover: turf\n  temperature: 0"},
		{"constant air and constant sun on a wall", "title: t\nkind: wall\nlayers:\n  - {material: clay-brick, thickness: 0.1}\noutside:\n  temperature: 5\n  solar: {absorptance: 0.5, irradiance: 100}\n"},
		{"fixed bottom temperature", "title: g\nkind: ground\nlayers:\n  - material: wet-clay\n    thickness: 20 m\nsurface:\n  temperature: {mean: 8, annual: {amplitude: 10, peak_day: 200}}\nbottom:\n  temperature: 9\n"},
		{"adiabatic bottom", "title: g\nkind: ground\nlayers:\n  - material: wet-clay\n    thickness: 20 m\nsurface:\n  temperature: {mean: 8, annual: {amplitude: 10, peak_day: 200}}\nbottom:\n  adiabatic: true\n"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s, err := Decode("regression.yaml", []byte(c.yaml))
			if err != nil {
				t.Fatal(err)
			}
			s.Analysis.Simulate = nil
			var failure string
			func() {
				defer func() {
					if p := recover(); p != nil {
						failure = fmt.Sprintf("panic: %v", p)
					}
				}()
				r, err := Run(context.Background(), s, Options{})
				if err != nil {
					failure = err.Error()
				} else if _, err := json.Marshal(r); err != nil {
					failure = "results.json: " + err.Error()
				}
			}()
			if failure != "" {
				t.Fatal(failure)
			}
		})
	}
}

// unquoteCorpus reads a one-value []byte corpus file of the go fuzzing
// format ("go test fuzz v1" then `[]byte("...")`).
func unquoteCorpus(data []byte) ([]byte, bool) {
	lines := strings.SplitN(string(data), "\n", 2)
	if len(lines) != 2 || lines[0] != "go test fuzz v1" {
		return nil, false
	}
	v := strings.TrimSpace(lines[1])
	if !strings.HasPrefix(v, "[]byte(") || !strings.HasSuffix(v, ")") {
		return nil, false
	}
	s, err := strconv.Unquote(v[len("[]byte(") : len(v)-1])
	if err != nil {
		return nil, false
	}
	return []byte(s), true
}
