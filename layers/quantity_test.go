package layers

import (
	"fmt"
	"math"
	"strings"
	"testing"
)

// closeRel reports whether got is within rel (relative) of want.
func closeRel(got, want, rel float64) bool {
	if want == 0 {
		return math.Abs(got) <= rel
	}
	return math.Abs(got-want) <= rel*math.Abs(want)
}

// Exact definitions used below (NIST SP 811, 2008 edition, Appendix B;
// international yard and pound agreement, 1959): 1 in = 0.0254 m,
// 1 ft = 0.3048 m, 1 lb = 0.45359237 kg exactly; 1 Btu(IT) =
// 1055.05585262 J exactly; a degree Fahrenheit interval is 5/9 K exactly;
// 0 degC = 273.15 K exactly (SI Brochure). Values written with fewer digits
// are the rounded conversion factors as printed in NIST SP 811 Appendix B.9
// [memory] and checked at the printed precision.
func TestParseQuantity(t *testing.T) {
	const exact = 1e-14
	tests := []struct {
		in   string
		kind Kind
		want float64
		rel  float64
		src  string
	}{
		// Length: default m.
		{"0.105", Length, 0.105, exact, "bare number in m (DESIGN)"},
		{"105 mm", Length, 0.105, exact, "SI prefix"},
		{"105mm", Length, 0.105, exact, "no space"},
		{"  105 mm  ", Length, 0.105, exact, "surrounding space"},
		{"2.5 cm", Length, 0.025, exact, "SI prefix"},
		{"1 m", Length, 1, exact, "SI"},
		{"4 in", Length, 4 * 0.0254, exact, "1 in = 0.0254 m exactly (NIST SP 811)"},
		{"12 in", Length, 0.3048, exact, "12 in = 1 ft = 0.3048 m exactly"},
		{"1 ft", Length, 0.3048, exact, "1 ft = 0.3048 m exactly (NIST SP 811)"},
		{"3 feet", Length, 0.9144, exact, "1 yd = 0.9144 m exactly"},
		{"5 MM", Length, 0.005, exact, "case-insensitive fallback"},
		{"-0.02 m", Length, -0.02, exact, "sign kept; range is the caller's job"},
		{"1e-3 m", Length, 0.001, exact, "exponent"},
		{".5 m", Length, 0.5, exact, "leading point"},
		{"+2. m", Length, 2, exact, "trailing point"},

		// Conductivity: default W/(m K).
		{"0.7", Conductivity, 0.7, exact, "bare number"},
		{"0.7 W/(m K)", Conductivity, 0.7, exact, "spelling"},
		{"0.7 W/mK", Conductivity, 0.7, exact, "spelling"},
		{"0.7 W/m/K", Conductivity, 0.7, exact, "spelling"},
		{"0.7 W/(m·K)", Conductivity, 0.7, exact, "spelling"},
		{"0.7 W m^-1 K^-1", Conductivity, 0.7, exact, "spelling"},
		{"0.7 W/(m °C)", Conductivity, 0.7, exact, "spelling"},
		{"35 mW/(m K)", Conductivity, 0.035, exact, "SI prefix"},
		{"1 Btu in/(h ft2 F)", Conductivity, 0.1442279, 1e-6, "NIST SP 811 B.9: 1.442279 E-01 [memory]"},
		{"1 Btu in/(h ft² °F)", Conductivity, 0.1442279, 1e-6, "as above, other spelling"},
		{"1 Btu/(h ft F)", Conductivity, 1.730735, 1e-6, "NIST SP 811 B.9: 1.730735 E+00 [memory]"},

		// Density: default kg/m3.
		{"1800", Density, 1800, exact, "bare number"},
		{"1800 kg/m3", Density, 1800, exact, "spelling"},
		{"1800 kg/m^3", Density, 1800, exact, "spelling"},
		{"1800 kg/m³", Density, 1800, exact, "spelling"},
		{"2.4 g/cm3", Density, 2400, exact, "SI prefix"},
		{"1 pcf", Density, 0.45359237 / (0.3048 * 0.3048 * 0.3048), exact, "lb/ft3 from the exact lb and ft"},
		{"1 pcf", Density, 16.018463, 1e-7, "NIST SP 811 B.9: 1.601846 E+01 [memory]"},
		{"100 lb/ft3", Density, 1601.8463, 1e-7, "derived from the exact lb and ft"},

		// Specific heat: default J/(kg K).
		{"1000", SpecificHeat, 1000, exact, "bare number"},
		{"840 J/(kg K)", SpecificHeat, 840, exact, "spelling"},
		{"840 J/kgK", SpecificHeat, 840, exact, "spelling"},
		{"1.6 kJ/(kg K)", SpecificHeat, 1600, exact, "SI prefix"},
		{"1.6 KJ/kgK", SpecificHeat, 1600, exact, "case-insensitive fallback"},
		{"1 Btu/(lb F)", SpecificHeat, 4186.8, 1e-12, "1 Btu(IT)/(lb F) = 4.1868 kJ/(kg K) exactly (NIST SP 811 B.9)"},

		// Volumetric heat capacity and latent heat.
		{"1.8e6", VolumetricHeatCapacity, 1.8e6, exact, "bare number"},
		{"1.8 MJ/(m3 K)", VolumetricHeatCapacity, 1.8e6, exact, "SI prefix"},
		{"1800 kJ/m3K", VolumetricHeatCapacity, 1.8e6, exact, "SI prefix"},
		{"77 MJ/m3", LatentHeatVolumetric, 77e6, exact, "SI prefix"},
		{"77000 kJ/m3", LatentHeatVolumetric, 77e6, exact, "SI prefix"},
		{"1.1045e8", LatentHeatVolumetric, 1.1045e8, exact, "bare number"},

		// Temperature: default degC; K and F carry an offset.
		{"12", Temperature, 12, exact, "bare number in degC"},
		{"-5 °C", Temperature, -5, exact, "spelling"},
		{"-5 degC", Temperature, -5, exact, "spelling"},
		{"-5C", Temperature, -5, exact, "spelling"},
		{"273.15 K", Temperature, 0, 1e-12, "0 degC = 273.15 K exactly"},
		{"300 K", Temperature, 26.85, 1e-12, "0 degC = 273.15 K exactly"},
		{"32 F", Temperature, 0, 1e-12, "water freezes at 32 degF"},
		{"212 °F", Temperature, 100, 1e-12, "water boils at 212 degF (1 atm)"},
		{"-40 degF", Temperature, -40, 1e-12, "the scales cross at -40"},

		// Temperature difference: no offset.
		{"8", TemperatureDifference, 8, exact, "bare number in K"},
		{"8 K", TemperatureDifference, 8, exact, "no offset"},
		{"8 °C", TemperatureDifference, 8, exact, "1 degC interval = 1 K"},
		{"9 F", TemperatureDifference, 5, 1e-12, "1 degF interval = 5/9 K exactly"},

		// Thermal resistance.
		{"0.13", Resistance, 0.13, exact, "bare number"},
		{"0.13 m2K/W", Resistance, 0.13, exact, "spelling"},
		{"0.13 m²·K/W", Resistance, 0.13, exact, "spelling"},
		{"0.13 m2 K/W", Resistance, 0.13, exact, "spelling"},
		{"1 h ft2 F/Btu", Resistance, 0.1761102, 1e-6, "NIST SP 811 B.9: 1.761102 E-01 [memory]"},

		// Heat flux and irradiance.
		{"0.065", HeatFlux, 0.065, exact, "bare number"},
		{"65 mW/m2", HeatFlux, 0.065, exact, "SI prefix"},
		{"65 mW/m²", HeatFlux, 0.065, exact, "spelling"},
		{"800", Irradiance, 800, exact, "bare number"},
		{"0.8 kW/m2", Irradiance, 800, exact, "SI prefix"},
		{"25", HeatTransferCoefficient, 25, exact, "bare number"},
		{"25 W/(m2 K)", HeatTransferCoefficient, 25, exact, "spelling"},
		{"25 W/m²K", HeatTransferCoefficient, 25, exact, "spelling"},

		// Durations: a bare number is in hours (DESIGN: units).
		{"24", Duration, 86400, exact, "bare number in hours"},
		{"1.5", Duration, 5400, exact, "bare number in hours"},
		{"30min", Duration, 1800, exact, "minutes"},
		{"90 s", Duration, 90, exact, "seconds"},
		{"1h", Duration, 3600, exact, "hours"},
		{"24h", Period, 86400, exact, "hours"},
		{"2d", Duration, 172800, exact, "days"},
		{"1w", Duration, 604800, exact, "weeks"},
		{"3y", Duration, 3 * 365 * 86400, exact, "year = 365 d (package rule)"},
		{"1 year", Period, 365 * 86400, exact, "long spelling"},
		{"8760 h", Period, 365 * 86400, exact, "365 d in hours"},

		// Fractions.
		{"0.12", Fraction, 0.12, exact, "bare fraction"},
		{"12 %", Fraction, 0.12, exact, "percent"},
		{"12%", Fraction, 0.12, exact, "percent"},
	}
	for _, tc := range tests {
		got, err := ParseQuantity(tc.in, tc.kind)
		if err != nil {
			t.Errorf("ParseQuantity(%q, %v): unexpected error %v", tc.in, tc.kind, err)
			continue
		}
		if !closeRel(got, tc.want, tc.rel) {
			t.Errorf("ParseQuantity(%q, %v) = %.10g, want %.10g (%s)", tc.in, tc.kind, got, tc.want, tc.src)
		}
	}
}

func TestParseQuantityErrors(t *testing.T) {
	tests := []struct {
		in   string
		kind Kind
		want string // substring of the error
	}{
		{"105 mmm", Length, `unknown unit "mmm" for a length; use m, mm, cm, in or ft`},
		{"", Length, "empty value for a length"},
		{"   ", Conductivity, "empty value for a thermal conductivity"},
		{"NaN", Length, "not a finite number"},
		{"nan mm", Length, "not a finite number"},
		{"Inf", Density, "not a finite number"},
		{"-Inf", Temperature, "not a finite number"},
		{"+infinity", Duration, "not a finite number"},
		{"1e400", Length, "out of range"},
		{"1e308 ft", Length, ""}, // 3e307 m is finite: no error, checked below
		{"abc", Length, "does not start with a number"},
		{"mm", Length, "does not start with a number"},
		{"-", Length, "does not start with a number"},
		{"1,5", Length, "decimal point"},
		{"1,5 mm", Length, "decimal point"},
		{"1.5.2", Length, "decimal point"},
		{"1 2", Length, "more than one number"},
		{"1 2 mm", Length, "more than one number"},
		{"5 m", Conductivity, `unknown unit "m" for a thermal conductivity; use W/(m K), mW/(m K), Btu in/(h ft2 F) or Btu/(h ft F)`},
		{"3 MW/m2", HeatFlux, `unknown unit "MW/m2" for a heat flux; use W/m2 or mW/m2`},
		{"3 mw/m2", HeatFlux, "unknown unit"},
		{"1.8 MJ/m3", VolumetricHeatCapacity, `use J/(m3 K), kJ/(m3 K) or MJ/(m3 K); "MJ/m3" is a unit of latent heat per volume`},
		{"5 m", Conductivity, `"m" is a unit of length`},
		{"20 °C", Resistance, `"°C" is a unit of temperature`},
		{"10 months", Duration, `use h, s, min, d, w or y`},
		{"5 m", Duration, "unknown unit"}, // minute or month? neither: ambiguous
		{"12 pct", Fraction, "use a bare fraction or %"},
		{"5 kelvins", Temperature, "unknown unit"},
	}
	for _, tc := range tests {
		v, err := ParseQuantity(tc.in, tc.kind)
		if tc.want == "" {
			if err != nil || math.IsInf(v, 0) {
				t.Errorf("ParseQuantity(%q, %v) = %g, %v; want a finite value", tc.in, tc.kind, v, err)
			}
			continue
		}
		if err == nil {
			t.Errorf("ParseQuantity(%q, %v) = %g, want an error containing %q", tc.in, tc.kind, v, tc.want)
			continue
		}
		if !strings.Contains(err.Error(), tc.want) {
			t.Errorf("ParseQuantity(%q, %v) error %q, want it to contain %q", tc.in, tc.kind, err, tc.want)
		}
	}
	if _, err := ParseQuantity("1", Kind(99)); err == nil {
		t.Error("ParseQuantity with an unknown kind: want an error")
	}
	// Overflow after conversion: 1e308 ft is finite, 1e308 y in seconds is not.
	if _, err := ParseQuantity("1e308 y", Duration); err == nil {
		t.Error("ParseQuantity(1e308 y): want an out-of-range error")
	}
}

// Every kind lists its units, the default first, and every listed unit
// parses: a unit table entry that cannot be typed would be a defect.
func TestUnitsParse(t *testing.T) {
	for k := Kind(0); k < numKinds; k++ {
		us := Units(k)
		if len(us) == 0 {
			t.Fatalf("Units(%v) is empty", k)
		}
		if us[0] != DefaultUnit(k) {
			t.Errorf("Units(%v)[0] = %q, DefaultUnit = %q", k, us[0], DefaultUnit(k))
		}
		if k.String() == "" || strings.HasPrefix(k.String(), "Kind(") {
			t.Errorf("kind %d has no name", int(k))
		}
		for _, u := range us {
			if _, err := ParseQuantity("2 "+u, k); u != "" && err != nil {
				t.Errorf("kind %v: listed unit %q does not parse: %v", k, u, err)
			}
		}
	}
	if Units(numKinds) != nil || DefaultUnit(-1) != "" || Kind(42).String() != "Kind(42)" {
		t.Error("unknown kinds must give nil, \"\" and Kind(n)")
	}
	if got := DefaultUnit(Duration); got != "h" {
		t.Errorf("DefaultUnit(Duration) = %q, want h (DESIGN: bare durations are hours)", got)
	}
}

func TestConvertTo(t *testing.T) {
	tests := []struct {
		v    float64
		kind Kind
		unit string
		want float64
	}{
		{0.105, Length, "mm", 105},
		{0.3048, Length, "ft", 1},
		{0.3048, Length, "", 0.3048},
		{20, Temperature, "K", 293.15},
		{100, Temperature, "F", 212},
		{5, TemperatureDifference, "F", 9},
		{86400, Period, "h", 24},
		{86400, Period, "", 24},
		{0.12, Fraction, "%", 12},
		{0.035, Conductivity, "mW/(m K)", 35},
		{16.018463373960138, Density, "pcf", 1},
	}
	for _, tc := range tests {
		got, err := ConvertTo(tc.v, tc.kind, tc.unit)
		if err != nil || !closeRel(got, tc.want, 1e-12) {
			t.Errorf("ConvertTo(%g, %v, %q) = %.12g, %v; want %g", tc.v, tc.kind, tc.unit, got, err, tc.want)
		}
	}
	if _, err := ConvertTo(1, Length, "furlong"); err == nil || !strings.Contains(err.Error(), "use m, mm") {
		t.Errorf("ConvertTo with an unknown unit: error %v", err)
	}
	if _, err := ConvertTo(1, Kind(-3), "m"); err == nil {
		t.Error("ConvertTo with an unknown kind: want an error")
	}
}

func TestFormatQuantity(t *testing.T) {
	tests := []struct {
		v    float64
		kind Kind
		want string
	}{
		{0.105, Length, "0.105 m"},
		{0.1 + 0.2, Length, "0.3 m"},
		{0.7, Conductivity, "0.7 W/(m K)"},
		{2400, Density, "2400 kg/m3"},
		{-5, Temperature, "-5 °C"},
		{0.13, Resistance, "0.13 m2 K/W"},
		{86400, Period, "24 h"},
		{3600, Duration, "1 h"},
		{1800, Duration, "30 min"},
		{90, Duration, "90 s"},
		{10 * 86400, Duration, "10 d"},
		{3 * 365 * 86400, Duration, "3 y"},
		{0.5, Duration, "0.000138889 h"},
		{0, Duration, "0 h"},
		{0.12, Fraction, "12 %"},
		{1.1045e8, LatentHeatVolumetric, "110450000 J/m3"},
		{1e-9, Length, "1e-09 m"},
	}
	for _, tc := range tests {
		if got := FormatQuantity(tc.v, tc.kind); got != tc.want {
			t.Errorf("FormatQuantity(%g, %v) = %q, want %q", tc.v, tc.kind, got, tc.want)
		}
	}
	// Round trip: what FormatQuantity writes, ParseQuantity reads back.
	for k := Kind(0); k < numKinds; k++ {
		for _, v := range []float64{0.0137, 1, 24.5, 3600, 123456} {
			s := FormatQuantity(v, k)
			got, err := ParseQuantity(s, k)
			if err != nil || !closeRel(got, v, 1e-5) {
				t.Errorf("round trip %v %g -> %q -> %g, %v", k, v, s, got, err)
			}
		}
	}
}

func ExampleParseQuantity() {
	for _, in := range []struct {
		text string
		kind Kind
	}{
		{"105 mm", Length},
		{"0.105", Length},
		{"4 in", Length},
		{"0.7 W/(m·K)", Conductivity},
		{"100 pcf", Density},
		{"-5 °C", Temperature},
		{"30min", Duration},
		{"24", Period}, // a bare duration is in hours
		{"12 %", Fraction},
	} {
		v, err := ParseQuantity(in.text, in.kind)
		if err != nil {
			fmt.Println(err)
			continue
		}
		fmt.Printf("%-13q %-22v -> %.6g (%s)\n", in.text, in.kind, v, FormatQuantity(v, in.kind))
	}
	_, err := ParseQuantity("105 mmm", Length)
	fmt.Println(err)
	// Output:
	// "105 mm"      length                 -> 0.105 (0.105 m)
	// "0.105"       length                 -> 0.105 (0.105 m)
	// "4 in"        length                 -> 0.1016 (0.1016 m)
	// "0.7 W/(m·K)" thermal conductivity   -> 0.7 (0.7 W/(m K))
	// "100 pcf"     density                -> 1601.85 (1601.85 kg/m3)
	// "-5 °C"       temperature            -> -5 (-5 °C)
	// "30min"       duration               -> 1800 (30 min)
	// "24"          period                 -> 86400 (24 h)
	// "12 %"        fraction               -> 0.12 (12 %)
	// unknown unit "mmm" for a length; use m, mm, cm, in or ft
}

func BenchmarkParseQuantity(b *testing.B) {
	in := []struct {
		s string
		k Kind
	}{
		{"105 mm", Length},
		{"0.7 W/(m K)", Conductivity},
		{"1800", Density},
		{"30min", Duration},
		{"-5 °C", Temperature},
	}
	b.ReportAllocs()
	for i := 0; b.Loop(); i++ {
		q := in[i%len(in)]
		if _, err := ParseQuantity(q.s, q.k); err != nil {
			b.Fatal(err)
		}
	}
}

// FuzzParseQuantity checks that no input panics and that every accepted
// value is finite and survives a FormatQuantity round trip.
func FuzzParseQuantity(f *testing.F) {
	for _, s := range []string{"105 mm", "0.7 W/(m·K)", "-5 °C", "3y", "1e308 ft", "12 %", "NaN", "1,5", "", "°", "1 2"} {
		f.Add(s, 0)
		f.Add(s, int(Duration))
	}
	f.Fuzz(func(t *testing.T, s string, k int) {
		kind := Kind(k)
		v, err := ParseQuantity(s, kind)
		if err != nil {
			return
		}
		if math.IsNaN(v) || math.IsInf(v, 0) {
			t.Fatalf("ParseQuantity(%q, %v) = %g without error", s, kind, v)
		}
		back, err := ParseQuantity(FormatQuantity(v, kind), kind)
		if err != nil || !closeRel(back, v, 1e-5) && math.Abs(back-v) > 1e-9 {
			t.Fatalf("round trip of %q (%v): %g -> %q -> %g, %v", s, kind, v, FormatQuantity(v, kind), back, err)
		}
	})
}

// TestFormatDuration: a duration is written in the largest unit that keeps
// it readable, and ParseQuantity reads the text back to the same seconds.
func TestFormatDuration(t *testing.T) {
	tests := []struct {
		sec  float64
		want string
	}{
		{2 * 365 * 86400, "2y"},
		{7 * 86400, "7d"},
		{49 * 3600, "49h"},
		{1.5 * 3600, "1.5h"},
		{900, "15min"},
		{30, "30s"},
	}
	for _, tc := range tests {
		got := FormatDuration(tc.sec)
		if got != tc.want {
			t.Errorf("FormatDuration(%g) = %q, want %q", tc.sec, got, tc.want)
		}
		if back, err := ParseQuantity(got, Duration); err != nil || back != tc.sec {
			t.Errorf("ParseQuantity(%q) = %g, %v; want %g", got, back, err, tc.sec)
		}
	}
}

// TestTemperatureAboveAbsoluteZero: 0 K (-273.15 degC, the definition of
// the Celsius scale) is the lowest temperature read, in every unit.
func TestTemperatureAboveAbsoluteZero(t *testing.T) {
	for _, s := range []string{"-273.15", "0 K", "-459.67 °F"} {
		if v, err := ParseQuantity(s, Temperature); err != nil || math.Abs(v-(-273.15)) > 1e-9 {
			t.Errorf("%q: %g, %v; want -273.15 degC", s, v, err)
		}
	}
	for _, s := range []string{"-300", "-1 K", "-500 °F"} {
		if _, err := ParseQuantity(s, Temperature); err == nil || !strings.Contains(err.Error(), "below absolute zero") {
			t.Errorf("%q: %v, want below absolute zero", s, err)
		}
	}
	if v, err := ParseQuantity("-300", TemperatureDifference); err != nil || v != -300 {
		t.Errorf("a temperature difference of -300 K: %g, %v; want it read", v, err)
	}
}
