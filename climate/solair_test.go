package climate

import (
	"math"
	"strings"
	"testing"
)

func TestSolAirInchPoundForm(t *testing.T) {
	// The inch-pound working form of the sol-air equation for a light,
	// horizontal surface, t_e = t_o + 0.15 I - 7 (degF, I in Btu/(h ft2);
	// a/h_o = 0.15, eps dR/h_o = 7 degF) (ASHRAE Handbook, Fundamentals,
	// sol-air temperature [memory]), evaluated at t_o = 95 degF, I = 300,
	// gives 133 degF. The SI call with a = 0.45, h_o = 3.0 Btu/(h ft2 degF)
	// must give the same temperature. Conversions: 1 Btu/(h ft2) =
	// 3.154591 W/m2, 1 Btu/(h ft2 degF) = 5.678263 W/(m2 K) [memory].
	const btuFlux, btuCoef = 3.154591, 5.678263
	tIP := 95 + 0.15*300 - 7.0
	want := (tIP - 32) * 5 / 9
	got := SolAir((95-32)*5/9.0, 300*btuFlux, 0.45, 3.0*btuCoef, SkyCorrectionHorizontal)
	if math.Abs(got-want) > 1e-4 { // conversion factors carry 7 digits
		t.Errorf("sol-air %v degC, want %v degC (133 degF)", got, want)
	}
	// Rse = 0.04 m2 K/W (ISO 6946 [read]) gives h_e = 25 W/(m2 K).
	if ExternalSurfaceCoefficient != 25 {
		t.Errorf("h_e = %v, want 25", ExternalSurfaceCoefficient)
	}
	// No sun, vertical: sol-air equals air temperature.
	if got := SolAir(-3, 0, 0.9, ExternalSurfaceCoefficient, SkyCorrectionVertical); got != -3 {
		t.Errorf("no sun, vertical: %v, want -3", got)
	}
}

func TestSolAirPeriodicMatchesPointwise(t *testing.T) {
	// Linearity [derived]: the harmonic sol-air temperature equals the
	// pointwise equation applied to harmonic air temperature and irradiance.
	air := Periodic{Mean: 18, Harmonics: []Harmonic{{Period: Day, Amplitude: 6, Peak: 15 * 3600}, {Period: Year, Amplitude: 9, Peak: 200 * Day}}}
	sun := Periodic{Mean: 220, Harmonics: []Harmonic{{Period: Day, Amplitude: 310, Peak: 12.5 * 3600}, {Period: Day / 2, Amplitude: 90, Peak: 0.5 * 3600}}}
	a, he := 0.7, ExternalSurfaceCoefficient
	p, err := SolAirPeriodic(air, sun, a, he, SkyCorrectionHorizontal)
	if err != nil {
		t.Fatal(err)
	}
	if len(p.Harmonics) != 3 {
		t.Errorf("%d harmonics, want 3 (daily merged)", len(p.Harmonics))
	}
	f, err := SolAirFunc(air.At, sun.At, a, he, SkyCorrectionHorizontal)
	if err != nil {
		t.Fatal(err)
	}
	for x := 0.0; x < 3*Day; x += 1234.5 {
		if d := p.At(x) - f(x); math.Abs(d) > 1e-9 {
			t.Fatalf("t %v: periodic %v, pointwise %v", x, p.At(x), f(x))
		}
	}
}

func TestSolAirErrors(t *testing.T) {
	if _, err := SolAirPeriodic(Periodic{}, Periodic{}, 1.2, 25, 0); err == nil {
		t.Error("absorptance 1.2: no error")
	}
	if _, err := SolAirFunc(func(float64) float64 { return 0 }, nil, 0.5, 0, 0); err == nil {
		t.Error("h_e 0: no error")
	}
	if _, err := SolAirFunc(nil, nil, 0.5, 25, 0); err == nil {
		t.Error("no air temperature: no error")
	}
}

func TestAbsorptancePresets(t *testing.T) {
	ps := AbsorptancePresets()
	if len(ps) < 6 {
		t.Fatalf("%d presets", len(ps))
	}
	for _, p := range ps {
		if !(p.Value > 0 && p.Value <= 1) {
			t.Errorf("%s: %v outside (0, 1]", p.Name, p.Value)
		}
		if !strings.Contains(p.Source, "[") {
			t.Errorf("%s: source %q has no tag", p.Name, p.Source)
		}
		got, err := Absorptance(strings.ToUpper(p.Name))
		if err != nil || got != p.Value {
			t.Errorf("Absorptance(%q) = %v, %v", p.Name, got, err)
		}
	}
	light, _ := Absorptance("light")
	dark, _ := Absorptance("dark")
	white, _ := Absorptance("white paint")
	black, _ := Absorptance("black roofing")
	if !(white < light || white <= 0.3) || !(light < dark) || !(black >= 0.85) {
		t.Errorf("ordering: white %v light %v dark %v black %v", white, light, dark, black)
	}
	if _, err := Absorptance("red brik"); err == nil || !strings.Contains(err.Error(), `did you mean "red-brick"`) {
		t.Errorf("misspelt preset: %v", err)
	}
	// Keys of earlier releases are refused and point to their new names.
	for old, want := range map[string]string{"ashrae-light": "light-handbook", "ASHRAE dark": "dark-handbook"} {
		if _, err := Absorptance(old); err == nil || !strings.Contains(err.Error(), `did you mean "`+want+`"`) {
			t.Errorf("old key %q: %v, want a pointer to %q", old, err, want)
		}
	}
	if a, err := Absorptance("light-handbook"); err != nil || a != 0.45 {
		t.Errorf("light-handbook = %v, %v", a, err)
	}
}
