package layers

import (
	"regexp"
	"slices"
	"strings"
	"testing"
)

var kebab = regexp.MustCompile(`^[a-z0-9]+(-[a-z0-9]+)*$`)

// TestLibrary checks every row of the material table: identity, family,
// physically possible values, and an honest source tag.
func TestLibrary(t *testing.T) {
	ms := Materials()
	if len(ms) < 32 {
		t.Fatalf("library has %d materials, want at least 32", len(ms))
	}
	tag := regexp.MustCompile(`\[(read|2nd-hand|memory)[^\]]*\]`)
	for _, m := range ms {
		if !kebab.MatchString(m.Key) {
			t.Errorf("%q: key is not kebab-case", m.Key)
		}
		if m.Name == "" {
			t.Errorf("%q: no name", m.Key)
		}
		if familyRank(m.Family) == len(familyOrder) {
			t.Errorf("%q: unknown family %q", m.Key, m.Family)
		}
		if !tag.MatchString(m.Source) {
			t.Errorf("%q: source %q carries no [read], [2nd-hand] or [memory] tag", m.Key, m.Source)
		}
		// A value seen only as another document quotes it is [2nd-hand].
		if secondHand.MatchString(m.Source) {
			t.Errorf("%q: source %q says the value was quoted but tags it [read]", m.Key, m.Source)
		}
		if m.Massless() {
			if m.Family != FamilyAir || m.Conductivity != 0 || m.Density != 0 || m.SpecificHeat != 0 {
				t.Errorf("%q: an air layer has only a resistance", m.Key)
			}
			if !(m.ResistanceThickness > 0) {
				t.Errorf("%q: air layer without the thickness its resistance applies to", m.Key)
			}
			r, err := AirLayerResistance(m.ResistanceThickness, m.HeatFlow)
			if err != nil || r != m.Resistance {
				t.Errorf("%q: resistance %g disagrees with the air-layer table %g (%v)", m.Key, m.Resistance, r, err)
			}
			continue
		}
		// Plausible ranges for building materials (common practice):
		// conductivity from still-air insulation to copper, density from
		// light foams to copper, specific heat from metals to water.
		if m.Conductivity < 0.02 || m.Conductivity > 400 {
			t.Errorf("%q: conductivity %g W/(m K) out of range", m.Key, m.Conductivity)
		}
		if m.Density < 10 || m.Density > 9000 {
			t.Errorf("%q: density %g kg/m3 out of range", m.Key, m.Density)
		}
		if m.SpecificHeat < 300 || m.SpecificHeat > 4200 {
			t.Errorf("%q: specific heat %g J/(kg K) out of range", m.Key, m.SpecificHeat)
		}
		if l, err := NewLayer(m.Key, 0.1); err != nil || l.Solver().Validate() != nil {
			t.Errorf("%q: 0.1 m layer does not validate: %v", m.Key, err)
		}
	}
	// Sorted by family order, then key.
	for i := 1; i < len(ms); i++ {
		a, b := ms[i-1], ms[i]
		if ra, rb := familyRank(a.Family), familyRank(b.Family); ra > rb || ra == rb && a.Key >= b.Key {
			t.Errorf("Materials not sorted at %q, %q", a.Key, b.Key)
		}
	}
	if len(MaterialKeys()) != len(ms) || !slices.IsSorted(MaterialKeys()) {
		t.Error("MaterialKeys: wrong length or not sorted")
	}
	// Materials returns a copy.
	ms[0].Conductivity = -1
	if Materials()[0].Conductivity == -1 {
		t.Error("Materials exposes the library itself")
	}
}

// secondHand matches a [read] tag that itself says the value was seen as
// another document quotes it ("[read, as quoted in ...]", "[read, via
// ...]", "[read per ...]"): such a value is [2nd-hand].
var secondHand = regexp.MustCompile(`(?i)\[read\b[^\]]*\b(quoted|via|per)\b`)

func TestSecondHandTag(t *testing.T) {
	for _, tc := range []struct {
		src string
		bad bool
	}{
		{"ISO 10456:2007 Table 3 [read, as quoted in a note]", true},
		{"Moene and van Dam (2014) Table 2.2 [read, via a note]", true},
		{"ISO 10456:2007 Table 3 [2nd-hand; memory agrees]", false},
		{"Kersten (1949), as tabulated in Handy and Spangler (2007) Table 11.1 [read]", false},
		{"CIBSE Guide A, Table 3.36 (impermeable materials) [read]", false},
	} {
		if got := secondHand.MatchString(tc.src); got != tc.bad {
			t.Errorf("%q: flagged %v, want %v", tc.src, got, tc.bad)
		}
	}
}

// Rows with published design values must hold exactly those values.
func TestLibraryAgainstPublishedValues(t *testing.T) {
	tests := []struct {
		key         string
		lambda, rho float64
		c           float64 // 0: not checked
		src         string
	}{
		{"steel", 50, 7800, 450, "ISO 10456:2007 Table 3 [2nd-hand; memory agrees]"},
		{"softwood", 0.13, 500, 1600, "ISO 10456:2007 Table 3, timber 500 kg/m3 [2nd-hand; memory agrees]"},
		{"reinforced-concrete", 2.3, 2400, 0, "ISO 10456:2007 Table 3, reinforced concrete [memory]"},
		{"water", 0.60, 1000, 4190, "CRC Handbook of Chemistry and Physics, water near 10 to 20 degC, rounded [memory]"},
		{"ice", 2.30, 920, 2000, "CRC Handbook of Chemistry and Physics, ice near -10 degC, rounded [memory]"},
	}
	for _, tc := range tests {
		m, ok := Lookup(tc.key)
		if !ok {
			t.Errorf("%s missing", tc.key)
			continue
		}
		if m.Conductivity != tc.lambda || m.Density != tc.rho || tc.c != 0 && m.SpecificHeat != tc.c {
			t.Errorf("%s = %g / %g / %g, want %g / %g / %g (%s)", tc.key, m.Conductivity, m.Density, m.SpecificHeat, tc.lambda, tc.rho, tc.c, tc.src)
		}
	}
	// The brief's families are all present.
	for _, key := range []string{
		"concrete", "reinforced-concrete", "lightweight-concrete", "aerated-concrete",
		"clay-brick", "perforated-clay-block", "calcium-silicate-brick", "concrete-block-hollow",
		"granite", "limestone", "sandstone", "marble",
		"lime-plaster", "gypsum-plaster", "cement-render",
		"gypsum-board", "osb", "plywood", "particleboard", "fibreboard",
		"softwood", "hardwood",
		"mineral-wool", "glass-wool", "eps", "xps", "pur", "pir", "wood-fibre", "cellulose", "cork",
		"steel", "aluminium", "copper", "glass", "water", "ice", "snow", "screed", "asphalt",
		"air-gap-wall", "air-gap-roof", "air-gap-floor",
	} {
		if _, ok := Lookup(key); !ok {
			t.Errorf("library lacks %q", key)
		}
	}
}

func TestLookup(t *testing.T) {
	for _, k := range []string{"clay-brick", "Clay Brick", " clay_brick ", "CLAY-BRICK"} {
		if m, ok := Lookup(k); !ok || m.Key != "clay-brick" {
			t.Errorf("Lookup(%q) = %q, %v", k, m.Key, ok)
		}
	}
	if _, ok := Lookup("unobtainium"); ok {
		t.Error("Lookup(unobtainium) found something")
	}
	if _, ok := Lookup(""); ok {
		t.Error("Lookup(\"\") found something")
	}
}

func TestFilter(t *testing.T) {
	tests := []struct {
		q        string
		contains []string
		excludes []string
	}{
		{"brick", []string{"clay-brick", "calcium-silicate-brick"}, []string{"granite"}},
		{"INSULATION", []string{"eps", "mineral-wool", "cork"}, []string{"steel"}},
		{"polystyrene", []string{"eps", "xps"}, []string{"pur"}},
		{"air", []string{"air-gap-wall", "air-gap-roof", "air-gap-floor"}, []string{"concrete"}},
		{"zzz", nil, []string{"steel"}},
	}
	for _, tc := range tests {
		var keys []string
		for _, m := range Filter(tc.q) {
			keys = append(keys, m.Key)
		}
		for _, k := range tc.contains {
			if !slices.Contains(keys, k) {
				t.Errorf("Filter(%q) lacks %q: %v", tc.q, k, keys)
			}
		}
		for _, k := range tc.excludes {
			if slices.Contains(keys, k) {
				t.Errorf("Filter(%q) holds %q", tc.q, k)
			}
		}
	}
	if len(Filter("")) != len(Materials()) {
		t.Error("Filter(\"\") should return the whole library")
	}
}

func TestSuggest(t *testing.T) {
	tests := []struct {
		in    string
		first string
	}{
		{"clay-brik", "clay-brick"},
		{"clay brick", "clay-brick"},
		{"granit", "granite"},
		{"minral-wool", "mineral-wool"},
		{"plywod", "plywood"},
		{"stel", "steel"},
		{"aluminum", "aluminium"}, // US spelling
		{"glasswool", "glass-wool"},
		{"brick", "clay-brick"}, // a part of the key
		{"calcium-silcate-brick", "calcium-silicate-brick"},
	}
	for _, tc := range tests {
		got := Suggest(tc.in)
		if len(got) == 0 || got[0] != tc.first {
			t.Errorf("Suggest(%q) = %v, want %q first", tc.in, got, tc.first)
		}
		if len(got) > 3 {
			t.Errorf("Suggest(%q) returned %d keys, want at most 3", tc.in, len(got))
		}
	}
	if got := Suggest("quantum-foam-9000"); got != nil {
		t.Errorf("Suggest(nonsense) = %v, want nil", got)
	}
	_, err := NewLayer("clay-brik", 0.1)
	if err == nil || !strings.Contains(err.Error(), `did you mean "clay-brick"`) {
		t.Errorf("NewLayer(clay-brik): error %v, want a did-you-mean", err)
	}
	var ue *UnknownMaterialError
	if !asUnknown(err, &ue) || ue.Key != "clay-brik" {
		t.Errorf("NewLayer(clay-brik): error %T, want *UnknownMaterialError", err)
	}
}

func asUnknown(err error, target **UnknownMaterialError) bool {
	u, ok := err.(*UnknownMaterialError)
	if ok {
		*target = u
	}
	return ok
}

func TestClosest(t *testing.T) {
	keys := []string{"title", "kind", "layers", "material", "name", "thickness", "conductivity",
		"density", "specific_heat", "outside", "inside", "resistance", "temperature", "analysis"}
	tests := []struct {
		word string
		max  int
		want []string
	}{
		{"thikness", 3, []string{"thickness"}},
		{"thicknes", 1, []string{"thickness"}},
		{"specific-heat", 3, []string{"specific_heat"}}, // hyphen for underscore
		{"specifc_heat", 3, []string{"specific_heat"}},
		{"Density", 3, []string{"density"}}, // exact up to case
		{"conductivty", 2, []string{"conductivity"}},
		{"tempreature", 3, []string{"temperature"}}, // swapped letters count 1
		{"nmae", 3, []string{"name"}},
		{"xyz", 3, nil},
		{"", 3, nil},
		{"name", 0, nil},
	}
	for _, tc := range tests {
		got := Closest(tc.word, keys, tc.max)
		if !slices.Equal(got, tc.want) {
			t.Errorf("Closest(%q, keys, %d) = %v, want %v", tc.word, tc.max, got, tc.want)
		}
	}
	// Word and substring matches rank ahead of a distant edit: "brick" is
	// two edits from "rock" but a word of "clay-brick".
	mats := MaterialKeys()
	words := []struct {
		word string
		want []string
	}{
		{"brick", []string{"clay-brick", "clay-brick-protected", "calcium-silicate-brick"}},
		{"Brick Clay", []string{"clay-brick", "clay-brick-protected"}},
		{"solid-clay-brick", []string{"clay-brick"}},
		{"wool", []string{"glass-wool", "mineral-wool", "mineral-wool-light"}},
		{"fibre", []string{"wood-fibre", "gypsum-fibre-board", "fibreboard"}}, // whole words first
		{"clay-brik", []string{"clay-brick"}},                                 // a typo
		{"xyzzy", nil},
	}
	for _, tc := range words {
		got := Closest(tc.word, mats, 3)
		if !slices.Equal(got, tc.want) {
			t.Errorf("Closest(%q, materials, 3) = %v, want %v", tc.word, got, tc.want)
		}
	}
	if got := Suggest("brick"); len(got) == 0 || got[0] != "clay-brick" {
		t.Errorf("Suggest(brick) = %v, want clay-brick first", got)
	}
	// Order: closest first, then nearest in length, then alphabetical.
	got := Closest("kin", []string{"skin", "kind", "king", "pin", "kilns"}, 10)
	if !slices.Equal(got, []string{"pin", "kind", "king", "skin", "kilns"}) {
		t.Errorf("Closest order = %v", got)
	}
}

// Edit distances checked by hand against the definition (Levenshtein 1966
// with adjacent transpositions): kitten -> sitting is the textbook 3.
func TestEditDistance(t *testing.T) {
	tests := []struct {
		a, b string
		want int
	}{
		{"kitten", "sitting", 3},
		{"", "abc", 3},
		{"abc", "", 3},
		{"abc", "abc", 0},
		{"ab", "ba", 1},
		{"ca", "abc", 3}, // OSA, not full Damerau-Levenshtein (which gives 2)
		{"flaw", "lawn", 2},
		{"°c", "c", 1}, // runes, not bytes
	}
	for _, tc := range tests {
		if got := editDistance(tc.a, tc.b); got != tc.want {
			t.Errorf("editDistance(%q, %q) = %d, want %d", tc.a, tc.b, got, tc.want)
		}
	}
}
