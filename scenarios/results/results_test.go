package results

import (
	"bytes"
	"encoding/json"
	"math"
	"strings"
	"testing"
)

// TestIndexSourceText: every origin writes the text results.json has
// always carried and reads back to the same value.
func TestIndexSourceText(t *testing.T) {
	cases := []struct {
		src  IndexSource
		text string
	}{
		{IndexSource{}, ""},
		{IndexSource{Origin: FromForcing}, "forcing"},
		{IndexSource{Origin: FromDesign}, "design"},
		{IndexSource{Origin: FromSimulated}, "simulated period"},
		{IndexSource{Origin: FromRecord, Coldest: 3, Winters: 10}, "record: mean of the 3 coldest of 10 complete winters"},
		{IndexSource{Origin: FromRecord, Coldest: 1, Winters: 2, ColdestLabel: "2021/22"}, "record: the coldest of 2 complete winters (2021/22; a design index needs 3)"},
	}
	for _, c := range cases {
		js, err := json.Marshal(c.src)
		if err != nil {
			t.Fatal(err)
		}
		want, _ := json.Marshal(c.text)
		if !bytes.Equal(js, want) {
			t.Errorf("%+v: %s, want %s", c.src, js, want)
		}
		var back IndexSource
		if err := json.Unmarshal(js, &back); err != nil || back != c.src {
			t.Errorf("%s read back as %+v (%v)", js, back, err)
		}
		if d := c.src.Detail(); (c.src.Origin == FromRecord) != (d != "") || strings.HasPrefix(d, "record") {
			t.Errorf("%+v: detail %q", c.src, d)
		}
	}
	var s IndexSource
	if err := s.UnmarshalText([]byte("something else")); err == nil {
		t.Error("an unknown source was accepted")
	}
}

// TestSurfaceIndexUsed: with a design index the surface index is the
// freezing n-factor times it (surface index = n x air index, UFC 3-130-04
// Table 4-1 [2nd-hand]); otherwise the forcing's surface index.
func TestSurfaceIndexUsed(t *testing.T) {
	d, s := 1000.0, 400.0
	f := &Frost{NFactorFreezing: 0.6, DesignFreezingIndex_Cd: &d, SurfaceFreezingIndex_Cd: &s, IndexSource: IndexSource{Origin: FromDesign}}
	if got := f.SurfaceIndexUsed(); got == nil || *got != 600 {
		t.Errorf("design: %v, want 600", got)
	}
	f.IndexSource = IndexSource{Origin: FromForcing}
	if got := f.SurfaceIndexUsed(); got != &s {
		t.Errorf("forcing: %v, want the surface index", got)
	}
}

// TestHalfSpaceFluxAt: q = b dT / sqrt(pi t) (Incropera et al., section
// 5.7, eq. 5.58 [derived]); b = 2000 W s^0.5/(m2 K), dT = 10 K at t = 1 s
// gives 20000 / sqrt(pi) = 11283.79 W/m2 (by hand), a quarter of the time
// twice as much.
func TestHalfSpaceFluxAt(t *testing.T) {
	s := &StepResult{SurfaceEffusivity_Ws05_m2K: 2000, Change_K: 10}
	if got := s.HalfSpaceFluxAt(1); math.Abs(got-11283.79) > 0.01 {
		t.Errorf("q(1 s) = %.2f, want 11283.79", got)
	}
	if r := s.HalfSpaceFluxAt(0.25) / s.HalfSpaceFluxAt(1); math.Abs(r-2) > 1e-12 {
		t.Errorf("q(0.25 s)/q(1 s) = %g, want 2", r)
	}
}

// TestWriteJSONAndNonFinite: results.json ends with a newline, and a NaN
// is found under its JSON path.
func TestWriteJSONAndNonFinite(t *testing.T) {
	r := &Results{Title: "t", Kind: Wall, Periodic: []PeriodicResult{{Period_h: 24}, {DecrementFactor: math.NaN()}}}
	if at := NonFinite(r); at != "periodic[1].decrement_factor" {
		t.Errorf("NonFinite = %q", at)
	}
	r.Periodic = r.Periodic[:1]
	if at := NonFinite(r); at != "" {
		t.Errorf("NonFinite = %q on a finite result", at)
	}
	var b bytes.Buffer
	if err := WriteJSON(&b, r); err != nil || !bytes.HasSuffix(b.Bytes(), []byte("}\n")) || !bytes.Contains(b.Bytes(), []byte(`"kind": "wall"`)) {
		t.Errorf("WriteJSON: %v\n%s", err, b.String())
	}
}
