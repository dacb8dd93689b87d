package scenarios

import (
	"fmt"
	"sort"
	"strconv"
	"strings"

	"gopkg.in/yaml.v3"

	"tempstack/climate"
	"tempstack/layers"
)

// Plausibility limits: values a file may hold but that are almost surely a
// unit slip. They give warnings, never errors: a rare real case (a metre
// of rammed earth, a metal layer written without its family) still runs.
const (
	// plausibleWallLayer is the thickest layer of a wall, roof or slab, m,
	// that a bare number (read in metres) is taken to mean: solid masonry
	// and earth walls reach about 1 m, the other layers are millimetres to
	// decimetres thick (common practice). A bare 240 is 240 mm written
	// without its unit.
	plausibleWallLayer = 1.0

	// plausibleDensity is the lightest density of a building material,
	// kg/m3: the lightest foam and fibre insulations are about 10 to
	// 20 kg/m3 (the lightest entries of the material library are 20 kg/m3;
	// product ranges of ISO 10456:2007 Table 3 start near 10 [memory]). A
	// density of 1.7 is 1.7 t/m3 (g/cm3) written in the wrong unit.
	plausibleDensity = 10.0

	// plausibleSpecificHeat is the smallest specific heat capacity of a
	// building material, J/(kg K): metals have the smallest, copper
	// 380 J/(kg K) (ISO 10456:2007 Table 3 [memory]) and lead about
	// 130 J/(kg K) (CRC Handbook of Chemistry and Physics [memory]). A
	// specific heat of 0.84 is 0.84 kJ/(kg K).
	plausibleSpecificHeat = 100.0

	// plausibleConductivity is the highest conductivity of a building
	// material that is not a metal, W/(m K): the most conductive stones of
	// ISO 10456:2007 Table 3 reach 3.5 (marble) [memory] and quartz-rich
	// rocks about 6 to 8 [memory]; steel is 50, stainless steel 17 (same
	// table [memory]). A conductivity of 35 for a non-metal is most often
	// 35 mW/(m K), an insulation's declared value.
	plausibleConductivity = 10.0
)

// Warnings returns the plausibility warnings of a decoded scenario: values
// that decode but are most likely a unit slip (a layer thickness of 240
// read as metres, a density of 1.7 kg/m3, a specific heat of
// 0.84 J/(kg K), a non-metal conducting 35 W/(m K), a thickness sweep or
// uncertainty range from 50 to 200 m, a column named like Fahrenheit read
// in degC, a window's sun_to with no sun to place). Each names the file, line and key, formatted like an error;
// they are warnings, not errors: `check` prints them and Run puts them
// first in Results.Warnings.
func Warnings(s *Scenario) []*Error {
	if s == nil || s.root == nil {
		return nil
	}
	w := &warner{file: s.File, kind: s.Kind}
	top := s.root
	if s.Kind == Wall {
		w.layerList(mapValue(top, "layers"), "layers")
		if vs := mapValue(top, "variants"); vs != nil && vs.Kind == yaml.SequenceNode {
			for i, v := range vs.Content {
				set := mapValue(v, "set")
				w.layerList(mapValue(set, "layers"), fmt.Sprintf("variants[%d].set.layers", i+1))
				// Single values set by path: layers[2].thickness: 240.
				for j := 0; set != nil && set.Kind == yaml.MappingNode && j+1 < len(set.Content); j += 2 {
					k, val := set.Content[j], set.Content[j+1]
					w.thicknessRange(val, fmt.Sprintf("variants[%d].set.%s", i+1, k.Value), k, []*yaml.Node{val})
				}
			}
		}
		w.studies(top)
	}
	if s.Kind == Room {
		w.windowSun(mapValue(top, "windows"))
	}
	w.series(top, "")
	sort.SliceStable(w.out, func(i, j int) bool { return w.out[i].Line < w.out[j].Line })
	return w.out
}

// windowSun warns of a window whose sun_to places sun it never lets in:
// no irradiance, or a g_value of 0.
func (w *warner) windowSun(list *yaml.Node) {
	if list == nil || list.Kind != yaml.SequenceNode {
		return
	}
	for i, win := range list.Content {
		to := mapValue(win, "sun_to")
		if to == nil {
			continue
		}
		key := fmt.Sprintf("windows[%d].sun_to", i+1)
		if mapValue(win, "irradiance") == nil {
			w.add(to, key, "has no effect: the window has no irradiance, so no sun comes through it; give irradiance or remove sun_to")
		} else if g, ok := quantityIn(mapValue(win, "g_value"), layers.Fraction); ok && g == 0 {
			w.add(to, key, "has no effect: the window's g_value is 0, so no sun comes through it")
		}
	}
}

// WarningTexts writes plausibility warnings as Results.Warnings holds
// them: "line 7, layers[2].thickness: a bare 240 is read as 240 m, ...".
func WarningTexts(ws []*Error) []string {
	var out []string
	for _, e := range ws {
		out = append(out, fmt.Sprintf("line %d, %s: %s", e.Line, e.Key, e.Msg))
	}
	return out
}

// warner collects the warnings of one scenario file.
type warner struct {
	file string
	kind Kind
	out  []*Error
}

func (w *warner) add(n *yaml.Node, key, format string, args ...any) {
	w.out = append(w.out, &Error{File: w.file, Line: n.Line, Key: key, Msg: fmt.Sprintf(format, args...)})
}

// mapValue returns the value of key in the mapping n, or nil.
func mapValue(n *yaml.Node, key string) *yaml.Node {
	if n == nil || n.Kind != yaml.MappingNode {
		return nil
	}
	for i := 0; i+1 < len(n.Content); i += 2 {
		if n.Content[i].Value == key {
			return n.Content[i+1]
		}
	}
	return nil
}

// scalarText returns the text of a scalar node, or "" and false.
func scalarText(n *yaml.Node) (string, bool) {
	if n == nil || n.Kind != yaml.ScalarNode {
		return "", false
	}
	return strings.TrimSpace(n.Value), true
}

// bareNumber returns the number of a scalar written without a unit.
func bareNumber(n *yaml.Node) (float64, bool) {
	t, ok := scalarText(n)
	if !ok {
		return 0, false
	}
	v, err := strconv.ParseFloat(t, 64)
	return v, err == nil
}

// quantityIn returns the SI value of a scalar quantity of kind k.
func quantityIn(n *yaml.Node, k layers.Kind) (float64, bool) {
	t, ok := scalarText(n)
	if !ok {
		return 0, false
	}
	v, err := layers.ParseQuantity(t, k)
	return v, err == nil
}

// layerList checks the layers of a wall: thickness, density, specific heat
// and conductivity.
func (w *warner) layerList(list *yaml.Node, path string) {
	if list == nil || list.Kind != yaml.SequenceNode {
		return
	}
	for i, l := range list.Content {
		key := fmt.Sprintf("%s[%d]", path, i+1)
		if n := mapValue(l, "thickness"); n != nil {
			if v, ok := bareNumber(n); ok && v > plausibleWallLayer {
				w.add(n, key+".thickness", "a bare %s is read as %s m, thicker than any layer of a wall; write the unit, e.g. \"%s mm\"", n.Value, n.Value, n.Value)
			}
		}
		if n := mapValue(l, "density"); n != nil {
			if v, ok := quantityIn(n, layers.Density); ok && v > 0 && v < plausibleDensity {
				w.add(n, key+".density", "%s kg/m3 is lighter than any building material (the lightest insulations are about 10 kg/m3); did you mean %s kg/m3 (\"%s g/cm3\")?",
					fmtNum(v), fmtNum(1000*v), fmtNum(v))
			}
		}
		for _, k := range []string{"specific_heat", "specific_heat_frozen"} {
			if n := mapValue(l, k); n != nil {
				if v, ok := quantityIn(n, layers.SpecificHeat); ok && v > 0 && v < plausibleSpecificHeat {
					w.add(n, key+"."+k, "%s J/(kg K) is below the specific heat of any building material (metals, the lowest, have about 130 to 500); did you mean \"%s kJ/(kg K)\"?",
						fmtNum(v), fmtNum(v))
				}
			}
		}
		family := layerFamily(l)
		for _, k := range []string{"conductivity", "conductivity_frozen"} {
			if n := mapValue(l, k); n != nil && family != "metal" {
				if v, ok := quantityIn(n, layers.Conductivity); ok && v > plausibleConductivity {
					w.add(n, key+"."+k, "%s W/(m K) is a metal's conductivity (stone reaches about 3.5, insulation 0.02 to 0.05); did you mean \"%s mW/(m K)\"? For a metal layer, give family: metal",
						fmtNum(v), fmtNum(v))
				}
			}
		}
	}
}

// layerFamily is the family a layer names, or that of its library
// material; "" when neither says.
func layerFamily(l *yaml.Node) string {
	if f, ok := scalarText(mapValue(l, "family")); ok {
		return strings.ToLower(f)
	}
	if k, ok := scalarText(mapValue(l, "material")); ok {
		if m, ok := layers.Lookup(k); ok {
			return m.Family
		}
	}
	return ""
}

// studies checks that a sweep, target or uncertainty range of a layer
// thickness is not a range of millimetres written without a unit.
func (w *warner) studies(top *yaml.Node) {
	if sw := mapValue(top, "sweep"); sw != nil {
		ends := []*yaml.Node{mapValue(sw, "from"), mapValue(sw, "to")}
		if vals := mapValue(sw, "values"); vals != nil && vals.Kind == yaml.SequenceNode {
			ends = vals.Content
		}
		w.thicknessRange(sw, "sweep", mapValue(sw, "parameter"), ends)
	}
	if tg := mapValue(top, "target"); tg != nil {
		w.thicknessRange(tg, "target", mapValue(tg, "parameter"), []*yaml.Node{mapValue(tg, "from"), mapValue(tg, "to")})
	}
	if vs := mapValue(mapValue(top, "uncertainty"), "vary"); vs != nil && vs.Kind == yaml.SequenceNode {
		for i, v := range vs.Content {
			key := fmt.Sprintf("uncertainty.vary[%d]", i+1)
			param := mapValue(v, "parameter")
			if n := mapValue(v, "normal"); n != nil {
				w.thicknessRange(n, key+".normal", param, []*yaml.Node{mapValue(n, "mean")})
			}
			if n := mapValue(v, "uniform"); n != nil {
				w.thicknessRange(n, key+".uniform", param, []*yaml.Node{mapValue(n, "min"), mapValue(n, "max")})
			}
		}
	}
}

// thicknessRange warns at block when param is a layer thickness and the
// values are bare numbers of which one reads as a layer thicker than any
// of a wall.
func (w *warner) thicknessRange(block *yaml.Node, key string, param *yaml.Node, values []*yaml.Node) {
	p, _ := scalarText(param)
	if !strings.HasSuffix(p, ".thickness") || len(values) == 0 {
		return
	}
	var nums []string
	big := false
	for _, n := range values {
		v, ok := bareNumber(n)
		if !ok {
			return // a unit, or not a number: nothing to say
		}
		nums = append(nums, n.Value)
		big = big || v > plausibleWallLayer
	}
	switch {
	case big && len(nums) == 1:
		w.add(block, key, "a bare %s for %s is read as %s m, thicker than any layer of a wall; write the unit, e.g. \"%s mm\"", nums[0], p, nums[0], nums[0])
	case big:
		w.add(block, key, "the thickness values %s of %s have no unit and are read in metres, thicker than any layer of a wall; write the unit, e.g. \"%s mm\"",
			strings.Join(nums, ", "), p, nums[len(nums)-1])
	}
}

// series finds the temperature records of the file (a mapping with a
// file key under a temperature key, and the fit record) and warns when a
// column named like Fahrenheit is read in degC.
func (w *warner) series(n *yaml.Node, path string) {
	if n == nil {
		return
	}
	switch n.Kind {
	case yaml.SequenceNode:
		for i, c := range n.Content {
			w.series(c, fmt.Sprintf("%s[%d]", path, i+1))
		}
		return
	case yaml.MappingNode:
	default:
		return
	}
	if mapValue(n, "file") != nil {
		unit, _ := scalarText(mapValue(n, "unit"))
		celsius := unit == "" || unit == "C"
		type column struct {
			key  string
			node *yaml.Node
		}
		var cols []column
		switch {
		case strings.HasSuffix(path, "temperature"):
			cols = append(cols, column{join(path, "column"), mapValue(n, "column")})
		case path == "analysis.fit":
			if ss := mapValue(n, "sensors"); ss != nil && ss.Kind == yaml.SequenceNode {
				for i, s := range ss.Content {
					cols = append(cols, column{fmt.Sprintf("%s.sensors[%d].column", path, i+1), mapValue(s, "column")})
				}
			}
		}
		for _, c := range cols {
			if name, ok := scalarText(c.node); ok && celsius && climate.LooksFahrenheit(name) {
				w.add(c.node, c.key, "column %q is named like degrees Fahrenheit but is read in degC (unit: C%s); if it holds degF, add unit: F",
					name, map[bool]string{true: ", the default", false: ""}[unit == ""])
			}
		}
		return
	}
	for i := 0; i+1 < len(n.Content); i += 2 {
		w.series(n.Content[i+1], join(path, n.Content[i].Value))
	}
}

// fmtNum writes a number for a message, without an exponent where that
// reads well.
func fmtNum(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }
