package climate

import (
	"fmt"
	"math"
	"sort"
	"strings"
)

// Sol-air temperature folds the sun and the long-wave exchange with the sky
// into one equivalent outdoor temperature seen through the external surface
// resistance:
//
//	T_sa = T_air + a I / h_e - eps dR / h_e
//
// T_air outdoor air temperature (degC), a solar absorptance of the surface
// (0..1), I solar irradiance on the surface (W/m2), h_e = 1/Rse external
// surface coefficient (W/(m2 K)), eps dR / h_e the long-wave correction (K).
// (ASHRAE Handbook, Fundamentals, sol-air temperature section [memory];
// the same form is in the meteorological glossary of the AMS, entry
// "sol-air temperature" [read].)

// ExternalSurfaceCoefficient is h_e = 1/Rse = 25 W/(m2 K), from the external
// surface resistance Rse = 0.04 m2 K/W of ISO 6946:2017 [2nd-hand; memory
// agrees].
const ExternalSurfaceCoefficient = 1 / 0.04

// Long-wave sky corrections eps dR / h_e (K) for SolAir's skyCorrection:
// about 7 degF (3.9 K) for horizontal surfaces, which see the cold sky, and
// zero for vertical surfaces, whose sky deficit is taken as offset by warm
// ground and surroundings (ASHRAE Handbook, Fundamentals, sol-air
// temperature [memory]; 0 K vertical and about 4 K horizontal are common
// practice). Night-sky cooling of a clear,
// dry climate can be several times larger.
const (
	SkyCorrectionHorizontal = 7 * 5.0 / 9 // K (7 degF)
	SkyCorrectionVertical   = 0.0         // K
)

// SolAir returns the sol-air temperature (degC) for air temperature tAir
// (degC), solar irradiance on the surface (W/m2, >= 0), solar absorptance
// (0..1), external surface coefficient he (W/(m2 K), > 0; see
// ExternalSurfaceCoefficient) and long-wave correction skyCorrection (K,
// subtracted; see SkyCorrectionHorizontal).
func SolAir(tAir, irradiance, absorptance, he, skyCorrection float64) float64 {
	return tAir + absorptance*irradiance/he - skyCorrection
}

// SolAirFunc returns t -> SolAir(air(t), irradiance(t), ...) for time
// series forcing (for example interpolators from Series.At). A nil
// irradiance means no sun.
func SolAirFunc(air, irradiance func(t float64) float64, absorptance, he, skyCorrection float64) (func(t float64) float64, error) {
	if err := checkSolAir(absorptance, he); err != nil {
		return nil, err
	}
	if air == nil {
		return nil, fmt.Errorf("climate: sol-air needs an air temperature")
	}
	return func(t float64) float64 {
		var I float64
		if irradiance != nil {
			I = irradiance(t)
		}
		return SolAir(air(t), I, absorptance, he, skyCorrection)
	}, nil
}

// SolAirPeriodic returns the sol-air temperature of a harmonic climate:
// since the equation is linear, it is the air temperature plus a/h_e times
// the irradiance, harmonic by harmonic (components of equal period are
// added as phasors), with the mean lowered by skyCorrection. irradiance is
// in W/m2, for example fitted by FitHarmonics with periods Day, Day/2,
// Day/3 (a daily irradiance curve is far from one sinusoid).
func SolAirPeriodic(air, irradiance Periodic, absorptance, he, skyCorrection float64) (Periodic, error) {
	if err := checkSolAir(absorptance, he); err != nil {
		return Periodic{}, err
	}
	k := absorptance / he
	out := Periodic{Mean: air.Mean + k*irradiance.Mean - skyCorrection}
	sum := map[float64]complex128{}
	var order []float64
	add := func(h Harmonic, f float64) {
		if _, ok := sum[h.Period]; !ok {
			order = append(order, h.Period)
		}
		sum[h.Period] += complex(f, 0) * h.Phasor()
	}
	for _, h := range air.Harmonics {
		add(h, 1)
	}
	for _, h := range irradiance.Harmonics {
		add(h, k)
	}
	for _, p := range order {
		out.Harmonics = append(out.Harmonics, HarmonicFromPhasor(p, sum[p]))
	}
	return out, nil
}

func checkSolAir(a, he float64) error {
	if !(a >= 0 && a <= 1) {
		return fmt.Errorf("climate: solar absorptance %g is outside 0..1", a)
	}
	if !(he > 0) || math.IsInf(he, 0) {
		return fmt.Errorf("climate: external surface coefficient %g W/(m2 K) must be > 0", he)
	}
	return nil
}

// AbsorptancePreset is a named solar absorptance with its source.
type AbsorptancePreset struct {
	Name   string  // key, lower case with hyphens
	Value  float64 // solar absorptance, 0..1
	Source string  // where the value comes from, with its tag
}

// Solar absorptances by surface colour and for a few common finishes.
// Absorptance varies widely with colour, soiling and age; these are
// round design values to start from, not measurements. A weathered light
// surface is darker than a new one.
var absorptancePresets = []AbsorptancePreset{
	{"light", 0.3, "light colours; common practice (round value) [memory]"},
	{"medium", 0.6, "medium colours; 0.6 is the default for opaque elements in ISO 52016-1 [memory]"},
	{"dark", 0.9, "dark colours; common practice (round value) [memory]"},
	{"light-handbook", 0.45, "ASHRAE Handbook, Fundamentals, sol-air temperature: a/h_o = 0.15 h ft2 degF/Btu for light surfaces, with h_o = 3.0 Btu/(h ft2 degF) [memory]"},
	{"dark-handbook", 0.90, "ASHRAE Handbook, Fundamentals, sol-air temperature: a/h_o = 0.30 h ft2 degF/Btu for dark surfaces, with h_o = 3.0 Btu/(h ft2 degF) [memory]"},
	{"white-paint", 0.25, "white paint, clean; handbook absorptance tables [memory]"},
	{"red-brick", 0.65, "red brick; handbook absorptance tables [memory]"},
	{"concrete", 0.65, "concrete, grey; handbook absorptance tables [memory]"},
	{"black-roofing", 0.90, "black bitumen roofing felt or membrane; handbook absorptance tables [memory]"},
	{"asphalt", 0.90, "asphalt paving; handbook absorptance tables [memory]"},
}

// renamedAbsorptance maps preset keys of earlier releases, which carried a
// trade society's name, to the descriptive keys that replaced them. They
// are refused with a pointer to the new key.
var renamedAbsorptance = map[string]string{
	"ashrae-light": "light-handbook",
	"ashrae-dark":  "dark-handbook",
}

// AbsorptancePresets returns the named solar absorptances, sorted by name.
func AbsorptancePresets() []AbsorptancePreset {
	p := append([]AbsorptancePreset(nil), absorptancePresets...)
	sort.Slice(p, func(i, j int) bool { return p[i].Name < p[j].Name })
	return p
}

// Absorptance returns the solar absorptance of a named preset ("light",
// "medium", "dark", "white-paint", "red-brick", ...; case and spaces
// ignored).
func Absorptance(name string) (float64, error) {
	key := strings.ReplaceAll(strings.ToLower(strings.TrimSpace(name)), " ", "-")
	var names []string
	for _, p := range absorptancePresets {
		if p.Name == key {
			return p.Value, nil
		}
		names = append(names, p.Name)
	}
	msg := fmt.Sprintf("climate: no absorptance preset %q", name)
	if s, ok := renamedAbsorptance[key]; ok {
		msg += fmt.Sprintf(" (renamed); did you mean %q?", s)
	} else if s := closest(key, names); s != "" {
		msg += fmt.Sprintf("; did you mean %q?", s)
	}
	sort.Strings(names)
	return 0, fmt.Errorf("%s (have %s)", msg, strings.Join(names, ", "))
}
