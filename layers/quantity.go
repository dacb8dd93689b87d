package layers

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Kind is the physical kind of a quantity. It fixes the SI unit that
// ParseQuantity returns, the default unit of a bare number and the units a
// string may carry.
type Kind int

// The kinds of quantity ParseQuantity understands. The comment after each
// gives the unit of the returned value, then the default unit of a bare
// number when it differs, then the other accepted units.
const (
	Length                  Kind = iota // m; mm, cm, in, ft
	Conductivity                        // W/(m K); mW/(m K), Btu in/(h ft2 F), Btu/(h ft F)
	Density                             // kg/m3; g/cm3, pcf (lb/ft3)
	SpecificHeat                        // J/(kg K); kJ/(kg K), Btu/(lb F)
	VolumetricHeatCapacity              // J/(m3 K); kJ/(m3 K), MJ/(m3 K)
	LatentHeatVolumetric                // J/m3 of material; kJ/m3, MJ/m3
	Temperature                         // degC; K (minus 273.15), F
	TemperatureDifference               // K; degC (same size), F (5/9 K)
	Resistance                          // m2 K/W; h ft2 F/Btu
	HeatFlux                            // W/m2; mW/m2
	Duration                            // s; bare number in hours; s, min, h, d, w, y (365 d)
	Period                              // s; bare number in hours; as Duration
	Fraction                            // 1 (0.12 = 12 %); %
	HeatTransferCoefficient             // W/(m2 K)
	Irradiance                          // W/m2; kW/m2
	DegreeDays                          // K day (degC day), the trade's unit of a freezing index; K h, F day
	Effusivity                          // W s^0.5/(m2 K), thermal effusivity sqrt(lambda rho c); J/(m2 K s^0.5)
	numKinds
)

// VolumetricHeat is another name for VolumetricHeatCapacity, J/(m3 K).
const VolumetricHeat = VolumetricHeatCapacity

// unit is one accepted unit of a kind: SI value = number*scale + offset.
type unit struct {
	name    string   // display name, listed in error messages
	aliases []string // other spellings; canonicalised before lookup
	scale   float64
	offset  float64
	strict  bool // case carries meaning (m/M prefixes): no case-insensitive match
}

type kindInfo struct {
	noun    string // "a length", used in messages
	short   string // "length", Kind.String
	def     int    // index of the unit a bare number is in
	show    int    // index of the unit FormatQuantity writes
	example string // a valid example with its unit
	units   []unit
}

// Exact conversion factors. Sources: NIST SP 811 (2008) Appendix B and the
// international yard and pound agreement (1959): inch, foot and pound are
// exact; the International Table Btu is 1055.05585262 J exactly; a degree
// Fahrenheit interval is exactly 5/9 K.
const (
	inch    = 0.0254     // m
	foot    = 0.3048     // m
	pound   = 0.45359237 // kg
	btu     = 1055.05585262
	degF    = 5.0 / 9.0 // K per degF interval
	hour    = 3600.0    // s
	day     = 24 * hour // s
	year    = 365 * day // s: a calendar year of 365 days
	kelvin0 = 273.15    // 0 degC in K
)

var durationUnits = []unit{
	{name: "s", aliases: []string{"sec", "second", "seconds"}, scale: 1},
	{name: "min", aliases: []string{"mins", "minute", "minutes"}, scale: 60},
	{name: "h", aliases: []string{"hr", "hrs", "hour", "hours"}, scale: hour},
	{name: "d", aliases: []string{"day", "days"}, scale: day},
	{name: "w", aliases: []string{"wk", "week", "weeks"}, scale: 7 * day},
	{name: "y", aliases: []string{"yr", "yrs", "year", "years", "a"}, scale: year},
}

var kinds = [numKinds]kindInfo{
	Length: {noun: "a length", short: "length", example: "105 mm", units: []unit{
		{name: "m", aliases: []string{"metre", "metres", "meter", "meters"}, scale: 1},
		{name: "mm", scale: 1e-3},
		{name: "cm", scale: 1e-2},
		{name: "in", aliases: []string{"inch", "inches"}, scale: inch},
		{name: "ft", aliases: []string{"foot", "feet"}, scale: foot},
	}},
	Conductivity: {noun: "a thermal conductivity", short: "thermal conductivity", example: "0.7 W/(m K)", units: []unit{
		{name: "W/(m K)", aliases: []string{"W/m/K", "W m-1 K-1", "W/(m °C)", "W/m/°C"}, scale: 1},
		{name: "mW/(m K)", aliases: []string{"mW/m/K", "mW m-1 K-1"}, scale: 1e-3, strict: true},
		{name: "Btu in/(h ft2 F)", aliases: []string{"Btu in/(h ft2 °F)", "Btu in/h/ft2/F"}, scale: btu / hour * inch / (foot * foot * degF)},
		{name: "Btu/(h ft F)", aliases: []string{"Btu/(h ft °F)", "Btu/h/ft/F"}, scale: btu / hour / (foot * degF)},
	}},
	Density: {noun: "a density", short: "density", example: "1800 kg/m3", units: []unit{
		{name: "kg/m3", aliases: []string{"kg m-3"}, scale: 1},
		{name: "g/cm3", aliases: []string{"g cm-3"}, scale: 1000},
		{name: "pcf", aliases: []string{"lb/ft3", "lb ft-3"}, scale: pound / (foot * foot * foot)},
	}},
	SpecificHeat: {noun: "a specific heat capacity", short: "specific heat capacity", example: "1000 J/(kg K)", units: []unit{
		{name: "J/(kg K)", aliases: []string{"J/kg/K", "J kg-1 K-1", "J/(kg °C)"}, scale: 1},
		{name: "kJ/(kg K)", aliases: []string{"kJ/kg/K", "kJ kg-1 K-1", "kJ/(kg °C)"}, scale: 1000},
		{name: "Btu/(lb F)", aliases: []string{"Btu/(lb °F)", "Btu/lb/F"}, scale: btu / (pound * degF)},
	}},
	VolumetricHeatCapacity: {noun: "a volumetric heat capacity", short: "volumetric heat capacity", example: "1.8 MJ/(m3 K)", units: []unit{
		{name: "J/(m3 K)", aliases: []string{"J/m3/K", "J m-3 K-1"}, scale: 1},
		{name: "kJ/(m3 K)", aliases: []string{"kJ/m3/K", "kJ m-3 K-1"}, scale: 1e3},
		{name: "MJ/(m3 K)", aliases: []string{"MJ/m3/K", "MJ m-3 K-1"}, scale: 1e6, strict: true},
	}},
	LatentHeatVolumetric: {noun: "a latent heat per volume", short: "latent heat per volume", example: "77 MJ/m3", units: []unit{
		{name: "J/m3", aliases: []string{"J m-3"}, scale: 1},
		{name: "kJ/m3", aliases: []string{"kJ m-3"}, scale: 1e3},
		{name: "MJ/m3", aliases: []string{"MJ m-3"}, scale: 1e6, strict: true},
	}},
	Temperature: {noun: "a temperature", short: "temperature", example: "-5 °C", units: []unit{
		{name: "°C", aliases: []string{"degC", "C", "celsius"}, scale: 1},
		{name: "K", aliases: []string{"kelvin"}, scale: 1, offset: -kelvin0},
		{name: "°F", aliases: []string{"degF", "F", "fahrenheit"}, scale: degF, offset: -32 * degF},
	}},
	TemperatureDifference: {noun: "a temperature difference", short: "temperature difference", example: "8 K", units: []unit{
		{name: "K", aliases: []string{"kelvin"}, scale: 1},
		{name: "°C", aliases: []string{"degC", "C"}, scale: 1},
		{name: "°F", aliases: []string{"degF", "F"}, scale: degF},
	}},
	Resistance: {noun: "a thermal resistance", short: "thermal resistance", example: "0.13 m2 K/W", units: []unit{
		{name: "m2 K/W", aliases: []string{"m2/W/K", "m2 °C/W", "m2 K W-1"}, scale: 1},
		{name: "h ft2 F/Btu", aliases: []string{"h ft2 °F/Btu", "ft2 F h/Btu", "ft2 °F h/Btu"}, scale: foot * foot * degF / (btu / hour)},
	}},
	HeatFlux: {noun: "a heat flux", short: "heat flux", example: "65 mW/m2", units: []unit{
		{name: "W/m2", aliases: []string{"W m-2"}, scale: 1},
		{name: "mW/m2", aliases: []string{"mW m-2"}, scale: 1e-3, strict: true},
	}},
	Duration: {noun: "a duration", short: "duration", def: 2, show: 2, example: "30min", units: durationUnits},
	Period:   {noun: "a period", short: "period", def: 2, show: 2, example: "24h", units: durationUnits},
	Fraction: {noun: "a fraction", short: "fraction", example: "12 %", units: []unit{
		{name: "", scale: 1},
		{name: "%", aliases: []string{"percent"}, scale: 0.01},
	}},
	HeatTransferCoefficient: {noun: "a heat transfer coefficient", short: "heat transfer coefficient", example: "25 W/(m2 K)", units: []unit{
		{name: "W/(m2 K)", aliases: []string{"W/m2/K", "W m-2 K-1", "W/(m2 °C)"}, scale: 1},
	}},
	Irradiance: {noun: "an irradiance", short: "irradiance", example: "800 W/m2", units: []unit{
		{name: "W/m2", aliases: []string{"W m-2"}, scale: 1},
		{name: "kW/m2", aliases: []string{"kW m-2"}, scale: 1e3},
	}},
	Effusivity: {noun: "a thermal effusivity", short: "thermal effusivity", example: "1100 W s0.5/(m2 K)", units: []unit{
		{name: "W s0.5/(m2 K)", aliases: []string{"W s^0.5/(m2 K)", "W s1/2/(m2 K)", "J/(m2 K s0.5)", "J m-2 K-1 s-0.5", "W s0.5 m-2 K-1"}, scale: 1},
	}},
	// A freezing or thawing index stays in degree-days inside the code, the
	// unit every frost formula and table of the trade uses; ISO 13793 writes
	// it in K h (24 K h = 1 K day).
	DegreeDays: {noun: "a degree-day index", short: "degree-day index", example: "1200 degC day", units: []unit{
		{name: "degC day", aliases: []string{"Cd", "°C d", "°C day", "°C days", "degC d", "degC days", "K d", "K day", "K days", "Kd", "C day", "C days"}, scale: 1},
		{name: "K h", aliases: []string{"Kh", "°C h", "degC h"}, scale: 1.0 / 24},
		{name: "degF day", aliases: []string{"°F day", "°F days", "F day", "F days", "Fd", "°F d"}, scale: degF},
	}},
}

// unitIndex maps canonical unit text to a unit index, per kind; foldIndex
// maps the lower-cased canonical text to all units it could mean.
var (
	unitIndex [numKinds]map[string]int
	foldIndex [numKinds]map[string][]int
)

func init() {
	for k := range kinds {
		unitIndex[k] = map[string]int{}
		foldIndex[k] = map[string][]int{}
		for i, u := range kinds[k].units {
			for _, a := range append([]string{u.name}, u.aliases...) {
				c := canonUnit(a)
				if j, dup := unitIndex[k][c]; dup && j != i {
					panic(fmt.Sprintf("layers: unit %q listed twice for %s", a, kinds[k].short))
				}
				unitIndex[k][c] = i
				f := strings.ToLower(c)
				if !containsInt(foldIndex[k][f], i) {
					foldIndex[k][f] = append(foldIndex[k][f], i)
				}
			}
		}
	}
}

func containsInt(s []int, v int) bool {
	for _, x := range s {
		if x == v {
			return true
		}
	}
	return false
}

// canonUnit reduces the spelling of a unit to a canonical form: no spaces,
// no multiplication dots or brackets, superscripts as digits, "°" as "deg".
// "W/(m·K)" and "W/mK" both become "W/mK".
func canonUnit(s string) string {
	var b strings.Builder
	for _, r := range s {
		switch r {
		case ' ', '\t', '·', '⋅', '*', '^', '.', '(', ')', '{', '}', '[', ']':
			continue
		case '²':
			b.WriteByte('2')
		case '³':
			b.WriteByte('3')
		case '°', 'º':
			b.WriteString("deg")
		case '−', '–': // Unicode minus and en dash, as in "m−3"
			b.WriteByte('-')
		default:
			b.WriteRune(r)
		}
	}
	return b.String()
}

// String returns the name of the kind, e.g. "length".
func (k Kind) String() string {
	if k < 0 || k >= numKinds {
		return fmt.Sprintf("Kind(%d)", int(k))
	}
	return kinds[k].short
}

func (k Kind) valid() bool { return k >= 0 && k < numKinds }

// Units returns the display names of the units accepted for kind k, the
// default unit of a bare number first. Fraction's default unit is the empty
// string (a bare fraction). Units returns nil for an unknown kind.
func Units(k Kind) []string {
	if !k.valid() {
		return nil
	}
	info := kinds[k]
	out := []string{info.units[info.def].name}
	for i, u := range info.units {
		if i != info.def {
			out = append(out, u.name)
		}
	}
	return out
}

// DefaultUnit returns the display name of the unit a bare number of kind k
// is read in ("m" for Length, "h" for Duration, "" for Fraction).
func DefaultUnit(k Kind) string {
	if !k.valid() {
		return ""
	}
	return kinds[k].units[kinds[k].def].name
}

// acceptedUnits lists the units for error messages: "m, mm, cm, in or ft".
func acceptedUnits(k Kind) string {
	var names []string
	for _, n := range Units(k) {
		if n == "" {
			names = append(names, "a bare fraction")
			continue
		}
		names = append(names, n)
	}
	switch len(names) {
	case 0:
		return ""
	case 1:
		return names[0]
	}
	return strings.Join(names[:len(names)-1], ", ") + " or " + names[len(names)-1]
}

// ParseQuantity reads a number with an optional unit, written as described
// in the package documentation, and returns its value in the SI unit of
// kind (degC for temperatures, seconds for durations and periods, a plain
// ratio for fractions).
//
// A bare number is in the default unit of the kind (see DefaultUnit); note
// that for Duration and Period this is hours. The error for bad text says
// what was wrong and lists the accepted units.
func ParseQuantity(s string, kind Kind) (float64, error) {
	if !kind.valid() {
		return 0, fmt.Errorf("layers: unknown quantity kind %d", int(kind))
	}
	info := &kinds[kind]
	text := strings.TrimSpace(s)
	if text == "" {
		return 0, fmt.Errorf("empty value for %s; write a number such as %q", info.noun, info.example)
	}
	n := numberPrefix(text)
	if n == 0 {
		if isNonFinite(text) {
			return 0, fmt.Errorf("%q is not a finite number; %s must be a finite number such as %q", s, info.noun, info.example)
		}
		return 0, fmt.Errorf("%q does not start with a number; write %s such as %q", s, info.noun, info.example)
	}
	v, err := strconv.ParseFloat(text[:n], 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		return 0, fmt.Errorf("%q is out of range for %s", s, info.noun)
	}
	rest := strings.TrimSpace(text[n:])
	if rest != "" && (rest[0] == ',' || (rest[0] == '.' && len(rest) > 1 && rest[1] >= '0' && rest[1] <= '9')) {
		return 0, fmt.Errorf("%q is not a single number; write the decimal point as \".\" and no thousands separator", s)
	}
	var u unit
	if rest == "" {
		u = info.units[info.def]
	} else {
		i, ok := lookupUnit(kind, rest)
		if !ok {
			if numberPrefix(rest) > 0 {
				return 0, fmt.Errorf("%q holds more than one number; write one number with one unit, such as %q", s, info.example)
			}
			return 0, fmt.Errorf("unknown unit %q for %s; use %s%s", rest, info.noun, acceptedUnits(kind), otherKindHint(kind, rest))
		}
		u = info.units[i]
	}
	out := v*u.scale + u.offset
	if math.IsInf(out, 0) || math.IsNaN(out) {
		return 0, fmt.Errorf("%q is out of range for %s", s, info.noun)
	}
	// A temperature (degC inside the code) cannot lie below absolute zero,
	// 0 K = -273.15 degC (the definition of the Celsius scale, SI Brochure),
	// allowing for the rounding of a unit conversion.
	if kind == Temperature && out < absoluteZero-1e-9 {
		return 0, fmt.Errorf("%q is below absolute zero (-273.15 °C)", s)
	}
	return out, nil
}

// absoluteZero is 0 K in degC.
const absoluteZero = -273.15

// otherKindHint says which other kind of quantity unit text belongs to,
// e.g. `; "m" is a unit of length`, or "" if none.
func otherKindHint(kind Kind, text string) string {
	for k := Kind(0); k < numKinds; k++ {
		if k == kind || twins(k, kind) {
			continue
		}
		if _, ok := lookupUnit(k, text); ok {
			return fmt.Sprintf(`; %q is a unit of %s`, text, kinds[k].short)
		}
	}
	return ""
}

// twins reports whether a and b are kinds measured in the same units
// (Duration and Period; HeatFlux and Irradiance).
func twins(a, b Kind) bool {
	pair := func(x, y Kind) bool { return a == x && b == y || a == y && b == x }
	return pair(Duration, Period) || pair(HeatFlux, Irradiance)
}

// lookupUnit finds the unit written as text for kind: exact canonical
// spelling first, then a case-insensitive match if it names exactly one
// unit and that unit is not case-strict.
func lookupUnit(kind Kind, text string) (int, bool) {
	c := canonUnit(text)
	if i, ok := unitIndex[kind][c]; ok {
		return i, true
	}
	cand := foldIndex[kind][strings.ToLower(c)]
	if len(cand) == 1 && !kinds[kind].units[cand[0]].strict {
		return cand[0], true
	}
	return 0, false
}

// numberPrefix returns the length of the decimal number at the start of s:
// optional sign, digits with an optional decimal point (at least one digit),
// optional exponent. It returns 0 if s does not start with a number.
func numberPrefix(s string) int {
	i := 0
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		i++
	}
	digits := 0
	for i < len(s) && s[i] >= '0' && s[i] <= '9' {
		i++
		digits++
	}
	if i < len(s) && s[i] == '.' {
		i++
		for i < len(s) && s[i] >= '0' && s[i] <= '9' {
			i++
			digits++
		}
	}
	if digits == 0 {
		return 0
	}
	// An exponent only if digits follow: "3e" is not a number with exponent.
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		j := i + 1
		if j < len(s) && (s[j] == '+' || s[j] == '-') {
			j++
		}
		k := j
		for k < len(s) && s[k] >= '0' && s[k] <= '9' {
			k++
		}
		if k > j {
			i = k
		}
	}
	return i
}

// isNonFinite reports whether s spells NaN or an infinity.
func isNonFinite(s string) bool {
	t := strings.ToLower(strings.TrimLeft(s, "+-"))
	return strings.HasPrefix(t, "nan") || strings.HasPrefix(t, "inf") || strings.HasPrefix(t, "∞")
}

// ConvertTo converts v, a value of kind k in its SI unit (as returned by
// ParseQuantity), to the unit named by unit (any accepted spelling; "" is
// the default unit of k). For a Temperature, ConvertTo(20, Temperature, "K")
// is 293.15.
func ConvertTo(v float64, k Kind, unit string) (float64, error) {
	if !k.valid() {
		return 0, fmt.Errorf("layers: unknown quantity kind %d", int(k))
	}
	info := &kinds[k]
	u := info.units[info.def]
	if strings.TrimSpace(unit) != "" {
		i, ok := lookupUnit(k, unit)
		if !ok {
			return 0, fmt.Errorf("unknown unit %q for %s; use %s", unit, info.noun, acceptedUnits(k))
		}
		u = info.units[i]
	}
	return (v - u.offset) / u.scale, nil
}

// FormatQuantity writes v, a value of kind k in its SI unit, for people:
// in the default unit of k with at most 6 significant digits, e.g.
// FormatQuantity(0.105, Length) is "0.105 m". Durations and periods are
// written in whole years if they are, in hours up to 48 h, else in the
// largest of d, h, min and s that holds them as a whole number ("3 y",
// "24 h", "10 d", "30 min"), otherwise in hours. A Fraction is
// written as a percentage ("12 %"). The result reads back with
// ParseQuantity to the same value within the 6 digits.
func FormatQuantity(v float64, k Kind) string {
	if !k.valid() {
		return formatNumber(v)
	}
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return formatNumber(v)
	}
	info := &kinds[k]
	switch k {
	case Duration, Period:
		whole := func(x float64) bool { return x != 0 && x == math.Trunc(x) && math.Abs(x) < 1e15 }
		if y := v / year; whole(y) {
			return formatNumber(y) + " y"
		}
		if h := v / hour; whole(h) && math.Abs(h) <= 48 {
			return formatNumber(h) + " h"
		}
		for _, u := range []unit{durationUnits[3], durationUnits[2], durationUnits[1], durationUnits[0]} {
			if x := v / u.scale; whole(x) {
				return formatNumber(x) + " " + u.name
			}
		}
		if v == 0 {
			return "0 h"
		}
		return formatNumber(v/hour) + " h"
	case Fraction:
		if math.IsInf(v*100, 0) {
			return formatNumber(v) // too large to write in percent
		}
		return formatNumber(v*100) + " %"
	}
	u := info.units[info.show]
	if x := (v - u.offset) / u.scale; !math.IsInf(x, 0) {
		return formatNumber(x) + " " + u.name
	}
	return formatNumber(v) + " " + info.units[0].name
}

// formatNumber writes x with at most 6 significant digits, without an
// exponent in the range 1e-4 to 1e15.
func formatNumber(x float64) string {
	if x == 0 || math.IsNaN(x) || math.IsInf(x, 0) {
		return strconv.FormatFloat(x, 'g', -1, 64)
	}
	r, _ := strconv.ParseFloat(strconv.FormatFloat(x, 'g', 6, 64), 64)
	if a := math.Abs(r); a >= 1e-4 && a < 1e15 {
		return strconv.FormatFloat(r, 'f', -1, 64)
	}
	return strconv.FormatFloat(r, 'g', -1, 64)
}

// FormatDuration writes a duration of sec seconds the way a scenario file
// writes it, in the largest unit that keeps it readable: "2y", "7d" (whole
// years and days only), "1.5h", "15min", "30s". ParseQuantity(s, Duration)
// reads it back.
func FormatDuration(sec float64) string {
	switch {
	case sec >= year && math.Mod(sec, year) == 0:
		return fmt.Sprintf("%gy", sec/year)
	case sec >= day && math.Mod(sec, day) == 0:
		return fmt.Sprintf("%gd", sec/day)
	case sec >= hour:
		return fmt.Sprintf("%gh", sec/hour)
	case sec >= 60:
		return fmt.Sprintf("%gmin", sec/60)
	}
	return fmt.Sprintf("%gs", sec)
}
