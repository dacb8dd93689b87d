package scenarios

import (
	"math"
	"reflect"
	"strings"
	"testing"
)

// slabWall is a thin, highly conductive wall (C = rho c L = 1e6 J/(m2 K),
// Biot number (L/k)/R = 1e-3) with an adiabatic inside, starting at 0 degC
// under 10 degC outside air behind the given outside resistance.
func slabWall(resistance string) string {
	return `title: lumped slab
kind: wall
layers:
  - {name: slab, thickness: 0.1, conductivity: 1000, density: 5000, specific_heat: 2000}
outside:
  temperature: 10
  resistance: ` + resistance + `
inside:
  adiabatic: true
analysis:
  probes: [0.05]
  simulate: {duration: 4d, step: 10min, output_step: 1h, initial_temperature: 0}
`
}

// TestResistanceStepScenario: the outside resistance is 0.1 m2 K/W and
// 0.5 from the start of day 2 (t1 = 1 d) on. The lumped capacitance
// solution (Incropera and DeWitt, Fundamentals of Heat and Mass Transfer,
// Eq. 5.6 [memory], piece by piece [derived]),
// T = 10 - 10 exp(-t1/(R1 C)) exp(-(t - t1)/(R2 C)) after t1, holds the
// simulated slab within 0.01 K.
func TestResistanceStepScenario(t *testing.T) {
	const c, r1, r2, t1 = 1e6, 0.1, 0.5, 86400.0
	r := mustRun(t, slabWall("{value: 0.1, periods: [{from_day: 2, to_day: 366, value: 0.5}]}"))
	sim := r.Series.Simulation
	if len(sim.Time_h) < 90 {
		t.Fatalf("%d samples", len(sim.Time_h))
	}
	for k, th := range sim.Time_h {
		tk := th * 3600
		want := 10 - 10*math.Exp(-tk/(r1*c))
		if tk > t1 {
			want = 10 - 10*math.Exp(-t1/(r1*c))*math.Exp(-(tk-t1)/(r2*c))
		}
		if got := sim.Probes_C[0][k]; math.Abs(got-want) > 0.01 {
			t.Fatalf("t = %g h: %.4f degC, lumped closed form %.4f", th, got, want)
		}
	}
	if len(r.Forcing.Outside.ResistancePeriods) != 1 || !strings.Contains(strings.Join(r.Warnings, " "), "outside resistance changes") {
		t.Errorf("results do not carry the period (%+v) and its warning (%q)", r.Forcing.Outside.ResistancePeriods, r.Warnings)
	}
}

// TestResistanceConstantAsPeriods: a resistance given as periods that all
// carry the usual value runs exactly as the plain number.
func TestResistanceConstantAsPeriods(t *testing.T) {
	a := mustRun(t, slabWall("0.1"))
	b := mustRun(t, slabWall("{value: 0.1, periods: [{from_day: 1.5, to_day: 3, value: 0.1}, {from_day: 300, to_day: 365, value: 0.1}]}"))
	if !reflect.DeepEqual(a.Series.Simulation, b.Series.Simulation) {
		t.Error("the simulation differs")
	}
	if len(b.Warnings) != len(a.Warnings) {
		t.Errorf("warnings %q against %q", b.Warnings, a.Warnings)
	}
}

func TestResistancePeriodsOfYear(t *testing.T) {
	sd := Environment{Resistance: 0.04, ResistancePeriods: []ResistancePeriod{{From: 334 * 86400, To: 74 * 86400, Value: 0.8}}}
	at := sd.resistanceAt()
	for _, c := range []struct{ day, want float64 }{{0, 0.8}, {73.9, 0.8}, {74, 0.04}, {200, 0.04}, {334, 0.8}, {365 + 10, 0.8}, {365 + 100, 0.04}, {-1, 0.8}} {
		if got := at(c.day * 86400); got != c.want {
			t.Errorf("day %g: %g, want %g", c.day, got, c.want)
		}
	}
	if (Environment{Resistance: 1}).resistanceAt() != nil {
		t.Error("a constant resistance varies")
	}
	p := func(from, to float64) ResistancePeriod { return ResistancePeriod{From: from, To: to} }
	for _, c := range []struct {
		a, b ResistancePeriod
		want bool
	}{{p(10, 20), p(20, 30), false}, {p(10, 20), p(15, 30), true}, {p(300, 20), p(10, 40), true}, {p(300, 20), p(30, 290), false}, {p(30, 40), p(300, 50), true}} {
		if got := overlaps(c.a, c.b); got != c.want {
			t.Errorf("overlaps(%v, %v) = %v", c.a, c.b, got)
		}
	}
}
