package ground

import (
	"math"
	"strings"
	"testing"
)

// TestModelTable holds the one table of conductivity models together: every
// key parses back to its model, prints as its key, has a label citing an
// author and year, and the soil's conductivity through the table is the
// model's own equations (Kersten's regression and Johansen's method, whose
// values are checked against their published tables in soil_test.go).
func TestModelTable(t *testing.T) {
	keys := ModelKeys()
	if len(keys) != 2 || keys[0] != "kersten" {
		t.Fatalf("ModelKeys() = %v, want the default kersten first", keys)
	}
	soil := Soil{Texture: Sand, DryDensity: 1700, WaterContent: 0.10, Quartz: 0.6}
	direct := map[Model]func() (float64, float64){
		ModelKersten: func() (float64, float64) {
			f, _ := KerstenFrozen(Sand, 1700, 0.10)
			u, _ := KerstenUnfrozen(Sand, 1700, 0.10)
			return f, u
		},
		ModelJohansen: func() (float64, float64) {
			n, sr := soil.Porosity(), math.Min(1, soil.Saturation())
			return JohansenFrozen(Sand, n, sr, 0.6, 1700), JohansenUnfrozen(Sand, n, sr, 0.6, 1700)
		},
	}
	for _, k := range keys {
		m, err := ParseModel(" " + strings.ToUpper(k) + " ")
		if err != nil || m.String() != k {
			t.Errorf("ParseModel(%q) = %v, %v", k, m, err)
		}
		if l := m.Label(); !strings.Contains(l, "(19") {
			t.Errorf("%s: label %q names no year", k, l)
		}
		soil.Model = m
		f, u, err := soil.Conductivity()
		wf, wu := direct[m]()
		if err != nil || f != wf || u != wu {
			t.Errorf("%s: Conductivity() = %g, %g, %v; the model's equations give %g, %g", k, f, u, err, wf, wu)
		}
	}
	if _, err := ParseModel("guess"); err == nil || !strings.Contains(err.Error(), "kersten or johansen") {
		t.Errorf("ParseModel(guess): %v", err)
	}
	if err := (Soil{Texture: Sand, DryDensity: 1700, WaterContent: 0.1, Model: Model(7)}).Validate(); err == nil {
		t.Error("a model outside the table validates")
	}
}
