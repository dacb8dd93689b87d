package scenarios

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"testing/fstest"

	"tempstack/layers"
)

// plausibleRecord is an invented three-day hourly record for the series
// warnings.
func plausibleRecord(col string) []byte {
	var b strings.Builder
	fmt.Fprintf(&b, "time,%s\n", col)
	for h := 0; h < 72; h++ {
		fmt.Fprintf(&b, "2024-01-%02dT%02d:00,%d\n", 1+h/24, h%24, 30+h%5)
	}
	return []byte(b.String())
}

// wallWith is a small wall scenario with the given layers block and
// extra top-level lines; the layers start on line 4.
func wallWith(layersBlock, outside, extra string) string {
	if outside == "" {
		outside = "{mean: 5, daily: {amplitude: 6, peak_hour: 14}}"
	}
	return "title: x\nkind: wall\nlayers:\n" + layersBlock +
		"outside:\n  temperature: " + outside + "\ninside:\n  temperature: 20\n" + extra
}

// TestPlausibilityWarnings: one test per unit slip. Each file decodes
// (the value is valid) and gives exactly the one warning, naming its key
// and line; the same file with the slip mended gives none. The limits
// are stated with their reasons beside the constants in plausible.go.
func TestPlausibilityWarnings(t *testing.T) {
	inline := func(k, rho, c string) string {
		return fmt.Sprintf("  - name: custom\n    thickness: 0.2\n    conductivity: %s\n    density: %s\n    specific_heat: %s\n", k, rho, c)
	}
	tests := []struct {
		name        string
		slip, fixed string
		line        int
		key, words  string
	}{
		{"wall layer of 240 m", wallWith("  - material: clay-brick\n    thickness: 240\n", "", ""),
			wallWith("  - material: clay-brick\n    thickness: 240 mm\n", "", ""),
			5, "layers[1].thickness", `write the unit, e.g. "240 mm"`},
		{"density of 1.7", wallWith(inline("0.8", "1.7", "1000"), "", ""),
			wallWith(inline("0.8", "1.7 g/cm3", "1000"), "", ""),
			7, "layers[1].density", `did you mean 1700 kg/m3 ("1.7 g/cm3")?`},
		{"specific heat of 0.84", wallWith(inline("0.8", "1700", "0.84"), "", ""),
			wallWith(inline("0.8", "1700", "0.84 kJ/(kg K)"), "", ""),
			8, "layers[1].specific_heat", `did you mean "0.84 kJ/(kg K)"?`},
		{"conductivity of 35", wallWith(inline("35", "30", "1400"), "", ""),
			wallWith(inline("35 mW/(m K)", "30", "1400"), "", ""),
			6, "layers[1].conductivity", `did you mean "35 mW/(m K)"?`},
		{"conductivity of a metal layer", wallWith(inline("35", "7800", "450"), "", ""),
			wallWith(strings.Replace(inline("35", "7800", "450"), "    thickness", "    family: metal\n    thickness", 1), "", ""),
			6, "layers[1].conductivity", "give family: metal"},
		{"thickness sweep 50..200", wallWith("  - material: clay-brick\n    thickness: 240 mm\n", "", "sweep:\n  parameter: layers[1].thickness\n  from: 50\n  to: 200\n  steps: 3\n"),
			wallWith("  - material: clay-brick\n    thickness: 240 mm\n", "", "sweep:\n  parameter: layers[1].thickness\n  from: 50 mm\n  to: 200 mm\n  steps: 3\n"),
			11, "sweep", "50, 200 of layers[1].thickness have no unit"},
		{"thickness sweep values", wallWith("  - material: clay-brick\n    thickness: 240 mm\n", "", "sweep:\n  parameter: layers[1].thickness\n  values: [100, 200]\n"),
			wallWith("  - material: clay-brick\n    thickness: 240 mm\n", "", "sweep:\n  parameter: layers[1].thickness\n  values: [0.1, 0.2]\n"),
			11, "sweep", "100, 200 of layers[1].thickness"},
		{"uncertainty range in mm", wallWith("  - material: clay-brick\n    thickness: 240 mm\n", "", "uncertainty:\n  samples: 10\n  vary:\n    - parameter: layers[1].thickness\n      uniform: {min: 220, max: 260}\n"),
			wallWith("  - material: clay-brick\n    thickness: 240 mm\n", "", "uncertainty:\n  samples: 10\n  vary:\n    - parameter: layers[1].thickness\n      uniform: {min: 220 mm, max: 260 mm}\n"),
			14, "uncertainty.vary[1].uniform", "220, 260 of layers[1].thickness"},
		{"variant thickness set by path", wallWith("  - material: clay-brick\n    thickness: 240 mm\n", "", "variants:\n  - name: thicker\n    set:\n      layers[1].thickness: 365\n"),
			wallWith("  - material: clay-brick\n    thickness: 240 mm\n", "", "variants:\n  - name: thicker\n    set:\n      layers[1].thickness: 365 mm\n"),
			13, "variants[1].set.layers[1].thickness", "a bare 365 for layers[1].thickness is read as 365 m"},
		{"variant layer list", wallWith("  - material: clay-brick\n    thickness: 240 mm\n", "", "variants:\n  - name: other\n    set:\n      layers:\n        - {material: clay-brick, thickness: 300}\n"),
			wallWith("  - material: clay-brick\n    thickness: 240 mm\n", "", "variants:\n  - name: other\n    set:\n      layers:\n        - {material: clay-brick, thickness: 300 mm}\n"),
			14, "variants[1].set.layers[1].thickness", "a bare 300 is read as 300 m"},
		{"Fahrenheit column read as degC", wallWith("  - material: clay-brick\n    thickness: 240 mm\n", "{file: rec.csv, column: temp_F}", ""),
			wallWith("  - material: clay-brick\n    thickness: 240 mm\n", "{file: rec.csv, column: temp_F, unit: F}", ""),
			7, "outside.temperature.column", `column "temp_F" is named like degrees Fahrenheit but is read in degC`},
		{"window sun_to without irradiance", roomWindow("{name: w, area: 4, u_value: 1.2, sun_to: [{element: floor, fraction: 0.6}]}"),
			roomWindow("{name: w, area: 4, u_value: 1.2, g_value: 0.5, irradiance: 100, sun_to: [{element: floor, fraction: 0.6}]}"),
			29, "windows[1].sun_to", "the window has no irradiance"},
		{"window sun_to with g 0", roomWindow("{name: w, area: 4, u_value: 1.2, g_value: 0, irradiance: 100, sun_to: [{element: floor, fraction: 0.6}]}"),
			roomWindow("{name: w, area: 4, u_value: 1.2, g_value: 0, irradiance: 100}"),
			29, "windows[1].sun_to", "g_value is 0"},
	}
	fsys := fstest.MapFS{"rec.csv": {Data: plausibleRecord("temp_F")}}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s, err := DecodeFS("x.yaml", []byte(tc.slip), fsys)
			if err != nil {
				t.Fatalf("the slip does not decode: %v", err)
			}
			ws := Warnings(s)
			if len(ws) != 1 {
				t.Fatalf("%d warnings, want 1: %v", len(ws), ws)
			}
			w := ws[0]
			if w.Line != tc.line || w.Key != tc.key || !strings.Contains(w.Msg, tc.words) {
				t.Errorf("warning %q (line %d, key %q), want line %d, key %q, saying %q", w, w.Line, w.Key, tc.line, tc.key, tc.words)
			}
			if txt := WarningTexts(ws)[0]; !strings.HasPrefix(txt, fmt.Sprintf("line %d, %s: ", tc.line, tc.key)) {
				t.Errorf("results text %q does not start with the line and key", txt)
			}
			fixed, err := DecodeFS("x.yaml", []byte(tc.fixed), fsys)
			if err != nil {
				t.Fatalf("the mended file does not decode: %v", err)
			}
			if ws := Warnings(fixed); len(ws) != 0 {
				t.Errorf("the mended file warns: %v", ws)
			}
		})
	}
}

// TestPlausibilityRealisticFilesQuiet: the embedded examples, the starter
// files and the scenarios of the golden outputs raise no plausibility
// warning, nor does any library building material written out as an
// inline layer of 0.2 m (the limits lie outside every material of the
// library, metals with family: metal).
func TestPlausibilityRealisticFilesQuiet(t *testing.T) {
	for _, ex := range Examples() {
		s, err := ex.Decode()
		if err != nil {
			t.Fatalf("%s: %v", ex.Name, err)
		}
		if ws := Warnings(s); len(ws) != 0 {
			t.Errorf("example %s warns: %v", ex.Name, ws)
		}
	}
	for _, kind := range []string{"wall", "ground"} {
		data, ok := Starter(kind)
		if !ok {
			t.Fatalf("no %s starter", kind)
		}
		s, err := Decode(kind+".yaml", data)
		if err != nil {
			t.Fatalf("%s starter: %v", kind, err)
		}
		if ws := Warnings(s); len(ws) != 0 {
			t.Errorf("%s starter warns: %v", kind, ws)
		}
	}
	golden, _ := filepath.Glob(filepath.Join("..", "testdata", "golden", "scenarios", "*.yaml"))
	if len(golden) == 0 {
		t.Fatal("no golden scenarios found")
	}
	for _, f := range golden {
		data, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		s, err := Decode(f, data)
		if err != nil {
			t.Fatalf("%s: %v", f, err)
		}
		if ws := Warnings(s); len(ws) != 0 {
			t.Errorf("%s warns: %v", f, ws)
		}
	}
	// The fit's sensor columns are temperatures too.
	src, err := os.ReadFile(filepath.Join("..", "testdata", "golden", "scenarios", "sensor-fit.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	rec, err := os.ReadFile(filepath.Join("..", "testdata", "golden", "scenarios", "sensors.csv"))
	if err != nil {
		t.Fatal(err)
	}
	fsysF := fstest.MapFS{"sensors.csv": {Data: []byte(strings.Replace(string(rec), "time,t20,", "time,t20_F,", 1))}}
	s, err := DecodeFS("fit.yaml", []byte(strings.Replace(string(src), "column: t20}", "column: t20_F}", 1)), fsysF)
	if err != nil {
		t.Fatal(err)
	}
	if ws := Warnings(s); len(ws) != 1 || ws[0].Line != 15 || ws[0].Key != "analysis.fit.sensors[1].column" {
		t.Errorf("fit sensor column t20_F: warnings %v, want one at line 15", ws)
	}
	for _, m := range layers.Materials() {
		l := m.Layer()
		if m.Massless() {
			continue
		}
		block := fmt.Sprintf("  - name: %s\n    family: %s\n    thickness: 0.2\n    conductivity: %g\n    density: %g\n    specific_heat: %g\n", m.Key, m.Family, l.Conductivity, l.Density, l.SpecificHeat)
		s, err := Decode("x.yaml", []byte(wallWith(block, "", "")))
		if err != nil {
			t.Fatalf("%s: %v", m.Key, err)
		}
		if ws := Warnings(s); len(ws) != 0 {
			t.Errorf("library material %s written inline warns: %v", m.Key, ws)
		}
	}
}

// roomWindow is roomYAML with its window written as win (one flow
// mapping, on line 29).
func roomWindow(win string) string {
	i := strings.Index(roomYAML, "  - {name: window")
	return roomYAML[:i] + "  - " + win + "\n"
}
