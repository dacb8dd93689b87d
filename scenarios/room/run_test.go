package room

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"

	"tempstack/fileerr"
	"tempstack/layers"
	"tempstack/solver"
)

// steadySpec is a room under constant forcing: outdoor 5 degC, 600 W of
// gains, 0.5 air changes of 50 m3, a 2 m2 window and a 20 m2 concrete wall
// to the outside over a 20 m2 adiabatic floor.
func steadySpec() *Spec {
	concrete := layers.Layer{Name: "concrete", Thickness: 0.2, Conductivity: 1.0, Density: 2000, SpecificHeat: 900}
	out := func(float64) float64 { return 5 }
	return &Spec{
		File:        "room.yaml",
		Outdoor:     Forcing{At: out},
		Volume:      50,
		Ventilation: Ventilation{Day: 0.5},
		Gains:       Forcing{At: func(float64) float64 { return 600 }},
		Elements: []Element{
			{Name: "wall", Area: 20, Orientation: layers.Wall, Layers: []layers.Layer{concrete}, Back: solver.BackOutside, Environment: out},
			{Name: "floor", Area: 20, Orientation: layers.Floor, Layers: []layers.Layer{concrete}, Back: solver.BackAdiabatic},
		},
		Windows:    []Window{{Name: "window", Area: 2, U: 1.4}},
		Thresholds: []float64{10, 30},
		Step:       900,
		WarmUpAuto: true,
	}
}

// A room under constant forcing settles to the steady heat balance
// theta_air = theta_e + Q / (rho c V n/3600 + sum U A), the adiabatic
// floor taking no heat (ISO 13789 steady balance [derived]); the exact
// solution, the simulation and the room without mass all give it.
func TestRunSteadyRoom(t *testing.T) {
	s := steadySpec()
	rsi, rse := layers.SurfaceResistances(layers.Wall)
	h := AirHeatCapacity*50*0.5/3600 + 1.4*2 + 20/(rsi+0.2/1.0+rse)
	want := 5 + 600/h
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
		{"without mass, simulated max", rm.MassRemoved.Simulation.AirMax_C},
	} {
		if math.Abs(c.got-want) > 1e-6 {
			t.Errorf("%s: %.9f degC, steady balance %.9f", c.name, c.got, want)
		}
	}
	// The operative temperature lies between the wall's inside surface
	// and the air, here between 10 and 30 degC all day.
	if h := rm.Simulation.HoursAbove; math.Abs(h[0].Hours-24) > 1e-9 || h[1].Hours != 0 {
		t.Errorf("hours above 10 and 30 degC: %g, %g; want 24 and 0", h[0].Hours, h[1].Hours)
	}
}

// A room that nothing joins to the outdoors has no defined mean
// temperature: Check and Run say so with the room's key, and do not
// panic.
func TestCheckNothingJoinsOutdoors(t *testing.T) {
	s := steadySpec()
	s.Ventilation.Day = 0
	s.Windows = nil
	s.Elements[0].Back = solver.BackAdiabatic
	s.Elements[0].Environment = nil
	for name, err := range map[string]error{"Check": Check(s), "Run": func() error { _, _, err := Run(context.Background(), s); return err }()} {
		var fe *fileerr.Error
		if !errors.As(err, &fe) || fe.Key != "room" || fe.File != "room.yaml" {
			t.Errorf("%s: %v, want a mistake at key room", name, err)
		}
	}
}

// A room whose air the steady balance puts far outside what a building
// reaches (60 kW of gains, the kind of slip of kW written as W) is run but
// warned about; the same room with 600 W is not (TestRunSteadyRoom). The
// limit sits between: 5 + 60000/h degC is far above plausibleAirMax.
func TestRunWarnsImplausibleAir(t *testing.T) {
	s := steadySpec()
	s.Gains = Forcing{At: func(float64) float64 { return 60000 }}
	rm, warnings, err := Run(context.Background(), s)
	if err != nil {
		t.Fatal(err)
	}
	if rm.Simulation.AirMax_C <= plausibleAirMax {
		t.Fatalf("air max %.1f degC: the case does not test the limit", rm.Simulation.AirMax_C)
	}
	if len(warnings) != 1 || !strings.Contains(warnings[0], "outside what a building reaches") {
		t.Errorf("warnings %q, want one about the implausible air temperature", warnings)
	}
}
