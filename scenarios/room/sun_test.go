package room

import (
	"context"
	"math"
	"strings"
	"testing"

	"tempstack/layers"
)

// Constant window sun absorbed at the surfaces (sun_to) under constant
// forcing: the steady balance by hand [derived from the surface node
// balance]. Of the sun Q on the wall's surface, backed by the outside,
// (1 - Rsi U) reaches the air and Rsi U leaves through the wall; on the
// adiabatic floor all of it reaches the air; the rest of the window's sun
// heats the air directly:
//
//	theta_air = theta_e + (Phi + Q_air + Q_floor + (1 - Rsi U) Q_wall) / h
//
// The exact solution, the simulation and the room without its mass (same
// U, the sun on the same massless surfaces) all give it, and the results
// say where the sun went.
func TestRunSteadyRoomSunOnSurfaces(t *testing.T) {
	s := steadySpec()
	const irr, g, area = 300.0, 0.5, 2.0
	s.Windows[0].G = g
	s.Windows[0].Sun = &Forcing{At: func(float64) float64 { return irr }}
	s.Windows[0].SunTo = []SunShare{{Element: 0, Fraction: 0.5}, {Element: 1, Fraction: 0.3}}
	sun := irr * g * area
	rsi, rse := layers.SurfaceResistances(layers.Wall)
	u := 1 / (rsi + 0.2/1.0 + rse)
	h := AirHeatCapacity*50*0.5/3600 + 1.4*2 + 20*u
	want := 5 + (600+0.2*sun+0.3*sun+(1-rsi*u)*0.5*sun)/h
	rm, warnings, err := Run(context.Background(), s)
	if err != nil {
		t.Fatal(err)
	}
	if len(warnings) > 0 {
		t.Errorf("warnings: %q", warnings)
	}
	for _, c := range []struct {
		name string
		got  float64
	}{
		{"exact mean", rm.Periodic.AirMean_C},
		{"exact max", rm.Periodic.AirMax_C},
		{"simulated max", rm.Simulation.AirMax_C},
		{"simulated min", rm.Simulation.AirMin_C},
		{"without mass, exact mean", rm.MassRemoved.Periodic.AirMean_C},
		{"without mass, simulated max", rm.MassRemoved.Simulation.AirMax_C},
	} {
		if math.Abs(c.got-want) > 1e-6 {
			t.Errorf("%s: %.9f degC, steady balance %.9f", c.name, c.got, want)
		}
	}
	// All of the sun is counted in the gains, wherever it lands.
	if math.Abs(rm.GainsMean_W-(600+sun)) > 1e-9 {
		t.Errorf("gains_mean_W %g, want %g", rm.GainsMean_W, 600+sun)
	}
	for k, f := range []float64{0.5, 0.3} {
		if v := rm.Elements[k].WindowSunMean_W; v == nil || math.Abs(*v-f*sun) > 1e-9 {
			t.Errorf("element %d: window sun %v W, want %g", k, v, f*sun)
		}
	}
	w := rm.Windows[0]
	if len(w.SunTo) != 2 || w.SunTo[0].Element != "wall" || w.SunTo[1].Element != "floor" || w.SunToAirFraction == nil || math.Abs(*w.SunToAirFraction-0.2) > 1e-15 {
		t.Errorf("window sun_to %+v, air %v", w.SunTo, w.SunToAirFraction)
	}
}

// A Spec whose sun_to is impossible is refused at the window's key:
// an element that does not exist, a fraction out of [0, 1], fractions
// above 1 in all.
func TestCheckSunTo(t *testing.T) {
	for _, c := range []struct {
		name  string
		share []SunShare
	}{
		{"no such element", []SunShare{{Element: 2, Fraction: 0.5}}},
		{"negative", []SunShare{{Element: 0, Fraction: -0.1}}},
		{"above one", []SunShare{{Element: 0, Fraction: 1.2}}},
		{"sum above one", []SunShare{{Element: 0, Fraction: 0.6}, {Element: 1, Fraction: 0.5}}},
		{"twice", []SunShare{{Element: 0, Fraction: 0.2}, {Element: 0, Fraction: 0.2}}},
	} {
		s := steadySpec()
		s.Windows[0].SunTo = c.share
		err := Check(s)
		if err == nil {
			t.Errorf("%s: accepted", c.name)
			continue
		}
		if got := err.Error(); !strings.Contains(got, "windows[1].sun_to") {
			t.Errorf("%s: %v, want the key windows[1].sun_to", c.name, err)
		}
	}
	s := steadySpec()
	s.Windows[0].SunTo = []SunShare{{Element: 0, Fraction: 0.7}, {Element: 1, Fraction: 0.3}}
	if err := Check(s); err != nil {
		t.Errorf("fractions adding up to 1: %v", err)
	}
}
