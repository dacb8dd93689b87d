package solver

import (
	"math"
	"strings"
	"testing"
)

// lumpedSlab is a thin, highly conductive slab (Biot number (L/k)/R about
// 1e-3) with an adiabatic back face: its temperature follows the lumped
// capacitance equation C dT/dt = (T_env - T)/R(t), C = rho c L.
func lumpedSlab(resistanceAt func(float64) float64, r0 float64, dt, duration float64) (*Result, error) {
	col := Column{Layers: []Layer{{Name: "slab", Thickness: 0.1, Conductivity: 1000, HeatCapacity: 1e7}}}
	env := func(float64) float64 { return 10 }
	return Simulate(Problem{
		Column:      col,
		Outside:     Boundary{Kind: Environment, Resistance: r0, Temperature: env, ResistanceAt: resistanceAt},
		Inside:      Boundary{Kind: Adiabatic},
		InitialFunc: func(float64) float64 { return 0 },
		Duration:    duration,
		Step:        dt,
		Probes:      []float64{0.05},
	})
}

// TestResistanceStepLumped: the resistance steps from 0.1 to 0.5 m2 K/W at
// t1 = 1 d. The lumped capacitance solution (Incropera and DeWitt,
// Fundamentals of Heat and Mass Transfer, Eq. 5.6 [memory], applied piece
// by piece [derived]) is
//
//	T(t) = T_env + (T0 - T_env) exp(-t1/(R1 C)) exp(-(t - t1)/(R2 C)),  t >= t1,
//
// with C = 1e6 J/(m2 K); the slab's internal gradient adds a relative error
// of about Bi/3 = 3e-4.
func TestResistanceStepLumped(t *testing.T) {
	const c, r1, r2, t1 = 1e6, 0.1, 0.5, 86400.0
	step := func(t float64) float64 {
		if t < t1 {
			return r1
		}
		return r2
	}
	res, err := lumpedSlab(step, r1, 600, 4*86400)
	if err != nil {
		t.Fatal(err)
	}
	for k, tk := range res.Times {
		want := 10 - 10*math.Exp(-tk/(r1*c))
		if tk > t1 {
			want = 10 - 10*math.Exp(-t1/(r1*c))*math.Exp(-(tk-t1)/(r2*c))
		}
		if got := res.Probe[0][k]; math.Abs(got-want) > 5e-3 {
			t.Fatalf("t = %g h: T = %.5f degC, lumped closed form %.5f", tk/3600, got, want)
		}
	}
	if e := res.Energy.RelativeError; e > 1e-8 {
		t.Errorf("energy balance off by %g", e)
	}
	// The step matters: a constant 0.1 ends far warmer.
	still, err := lumpedSlab(nil, r1, 600, 4*86400)
	if err != nil {
		t.Fatal(err)
	}
	if d := still.Final[0] - res.Final[0]; d < 1 {
		t.Errorf("the step of resistance changes the end by only %g K", d)
	}
}

// TestResistanceSmoothLumped: R(t) = R0 (1 + 0.6 sin(2 pi t / 2 d)). The
// reference integrates the lumped equation exactly,
// T = T_env + (T0 - T_env) exp(-int_0^t ds/(R(s) C)) [derived], the
// integral by composite Simpson quadrature written here; the solver holds R
// at each step's midpoint, so halving the step cuts its error about
// fourfold (second order).
func TestResistanceSmoothLumped(t *testing.T) {
	const c, r0, period, dur = 1e6, 0.1, 2 * 86400.0, 2 * 86400.0
	rAt := func(t float64) float64 { return r0 * (1 + 0.6*math.Sin(2*math.Pi*t/period)) }
	const n = 20000 // Simpson intervals (even)
	h := dur / n
	integral := 1/rAt(0) + 1/rAt(dur)
	for i := 1; i < n; i++ {
		w := 2.0
		if i%2 == 1 {
			w = 4
		}
		integral += w / rAt(float64(i)*h)
	}
	integral *= h / 3 / c
	want := 10 - 10*math.Exp(-integral)
	var errs []float64
	for _, dt := range []float64{3600, 1800, 900} {
		res, err := lumpedSlab(rAt, r0, dt, dur)
		if err != nil {
			t.Fatal(err)
		}
		errs = append(errs, math.Abs(res.Final[0]-want))
	}
	if errs[2] > 2e-3 {
		t.Errorf("end temperature off the reference by %g K at dt = 900 s", errs[2])
	}
	// Time error (second order) over the slab's own Bi/3 error, which does
	// not shrink with dt: compare the differences between step sizes.
	if ratio := (errs[0] - errs[1]) / (errs[1] - errs[2]); !(ratio > 3 && ratio < 5) {
		t.Errorf("errors %v: ratio %g, want about 4 (second order)", errs, ratio)
	}
}

// TestResistanceAtConstant: a constant resistance given as a function of
// time gives the same run, bit for bit, on a linear and a freezing column.
func TestResistanceAtConstant(t *testing.T) {
	soil := Layer{Name: "soil", Thickness: 2, Conductivity: 1.5, HeatCapacity: 2.4e6,
		Freeze: &Freezing{LatentHeat: 5e7, ConductivityFrozen: 2, HeatCapacityFrozen: 1.9e6}}
	for _, l := range []Layer{{Name: "concrete", Thickness: 0.3, Conductivity: 1.6, HeatCapacity: 2e6}, soil} {
		run := func(at func(float64) float64) *Result {
			res, err := Simulate(Problem{
				Column:      Column{Layers: []Layer{l}},
				Outside:     Boundary{Kind: Environment, Resistance: 0.3, Temperature: func(t float64) float64 { return -8 + 10*math.Sin(t/86400) }, ResistanceAt: at},
				Inside:      Boundary{Kind: Environment, Resistance: 0.13, Temperature: func(float64) float64 { return 4 }},
				InitialFunc: func(float64) float64 { return 4 },
				Duration:    20 * 86400, Step: 3600, Probes: []float64{0.1},
			})
			if err != nil {
				t.Fatal(err)
			}
			return res
		}
		a, b := run(nil), run(func(float64) float64 { return 0.3 })
		for i := range a.Final {
			if a.Final[i] != b.Final[i] {
				t.Fatalf("%s: cell %d ends at %v with Resistance, %v with ResistanceAt", l.Name, i, a.Final[i], b.Final[i])
			}
		}
	}
}

func TestResistanceAtBad(t *testing.T) {
	_, err := lumpedSlab(func(t float64) float64 { return -1 }, 0.1, 600, 3600)
	if err == nil || !strings.Contains(err.Error(), "surface resistance") {
		t.Errorf("a negative resistance in time: %v", err)
	}
}
