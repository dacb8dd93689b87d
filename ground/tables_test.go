package ground

import (
	"math"
	"testing"
)

func TestNFactors(t *testing.T) {
	// UFC 3-130-04 Table 4-1 [read]: freezing n-factors snow 1.0, concrete
	// 0.75, asphalt 0.7, bare soil 0.7, turf 0.5, tree-covered 0.3; shaded surface 0.9. Thawing: concrete 1.5,
	// bituminous 1.6 to 2+, bare soil 1.4 to 2+, shaded 1.0, turf 0.8,
	// tree-covered 0.4, snow none.
	cases := []struct {
		key     string
		freeze  float64
		thaw    float64 // 0: no single value
		hasThaw bool
	}{
		{"snow", 1.0, 0, false},
		{"concrete", 0.75, 1.5, true},
		{"asphalt", 0.7, 0, true},
		{"bare-soil", 0.7, 0, true},
		{"shaded", 0.9, 1.0, true},
		{"turf", 0.5, 0.8, true},
		{"tree-covered", 0.3, 0.4, true},
	}
	for _, c := range cases {
		n, ok := NFactor(c.key)
		if !ok {
			t.Fatalf("%s: not found", c.key)
		}
		if n.Freezing != c.freeze || n.HasThawing != c.hasThaw {
			t.Errorf("%s: %+v", c.key, n)
		}
		th, single := n.Thawing()
		if single != (c.thaw != 0) || th != c.thaw {
			t.Errorf("%s: thawing %g %v, want %g", c.key, th, single, c.thaw)
		}
	}
	if a, _ := NFactor("asphalt"); a.ThawingMin != 1.6 || a.ThawingMax != 2 || !a.ThawingOpen {
		t.Errorf("asphalt thawing range %+v, want 1.6 to 2+", a)
	}
	if b, ok := NFactor(" Bare Soil "); !ok || b.Surface != "bare-soil" {
		t.Errorf("lookup with spaces: %+v %v", b, ok)
	}
	if _, ok := NFactor("gravel"); ok {
		t.Error("unknown surface found")
	}
	if len(Surfaces()) != len(cases) {
		t.Errorf("Surfaces() has %d entries", len(Surfaces()))
	}
	s, err := SurfaceIndex(1000, 0.5)
	if err != nil || s != 500 {
		t.Errorf("SurfaceIndex = %g, %v", s, err)
	}
	if _, err := SurfaceIndex(-5, 0.5); err == nil {
		t.Error("negative air index: want an error")
	}
	if _, err := SurfaceIndex(100, 0); err == nil {
		t.Error("zero n-factor: want an error")
	}
}

func TestPresets(t *testing.T) {
	// Moene and van Dam (2014) Table 2.2 after de Vries (1963) [2nd-hand]:
	// dry sand 0.24 W/(m K), 0.19e-6 m2/s; wet clay 1.4, 0.45e-6; rock 2.9,
	// 1.4e-6.
	fixed := []struct {
		key  string
		k, a float64
	}{
		{"dry-sand", 0.24, 0.19e-6}, {"wet-clay", 1.4, 0.45e-6}, {"rock", 2.9, 1.4e-6},
	}
	for _, c := range fixed {
		p, ok := Preset(c.key)
		if !ok {
			t.Fatalf("%s missing", c.key)
		}
		a, err := p.Diffusivity()
		if err != nil || p.Conductivity != c.k || math.Abs(a-c.a) > 1e-12 {
			t.Errorf("%s: k %g a %g, want %g %g", c.key, p.Conductivity, a, c.k, c.a)
		}
		l, err := p.Layer(c.key, 1)
		if err != nil || l.Freeze != nil {
			t.Errorf("%s layer: %+v %v", c.key, l, err)
		}
	}
	// The frost presets are Kersten's measured states in Handy and Spangler
	// Table 11.1 [read]: their properties match the table within 0.1.
	frost := []struct {
		key    string
		kf, ku float64
	}{
		{"frost-silt-clay-wet", 1.8, 1.4}, {"frost-silt-clay-dense", 1.3, 1.3},
		{"frost-sand-moist", 2.3, 2.6}, {"frost-sand-wet", 4.2, 3.1},
	}
	for _, c := range frost {
		p, ok := Preset(c.key)
		if !ok || p.Soil == nil {
			t.Fatalf("%s missing", c.key)
		}
		l, err := p.Layer(c.key, 0.5)
		if err != nil {
			t.Fatal(err)
		}
		if l.Freeze == nil || math.Abs(l.Freeze.ConductivityFrozen-c.kf) > 0.1 || math.Abs(l.Conductivity-c.ku) > 0.1 {
			t.Errorf("%s: %+v %+v", c.key, l, l.Freeze)
		}
	}
	all := Presets()
	if len(all) != len(fixed)+len(frost) {
		t.Errorf("Presets() has %d entries", len(all))
	}
	seen := map[string]bool{}
	for _, p := range all {
		if seen[p.Key] || p.Source == "" || p.Description == "" {
			t.Errorf("preset %+v: duplicate key or missing source", p)
		}
		seen[p.Key] = true
	}
	// Copies: changing a returned preset does not change the library.
	p, _ := Preset("frost-sand-wet")
	p.Soil.WaterContent = 0.5
	q, _ := Preset("FROST-SAND-WET")
	if q.Soil.WaterContent != 0.10 {
		t.Error("Preset returned a shared Soil")
	}
	if _, ok := Preset("peat"); ok {
		t.Error("peat has no sourced model and must not be a preset")
	}
}
