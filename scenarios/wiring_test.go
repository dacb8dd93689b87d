package scenarios

import (
	"context"
	"fmt"
	"math"
	"math/cmplx"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
	"time"
)

// TestGroundNFactorsReachSurface runs a ground column whose surface
// temperature is an annual sine of the air, mean 0 and amplitude 10 degC,
// with a freezing n-factor of 0.5 and a thawing n-factor of 1.5. By the
// definition of the n-factor (surface index = n x air index, UFC 3-130-04
// Table 4-1 [read]) applied to each instant, the simulated surface swings
// from -5 to +15 degC, its freezing index is half the air's,
// 365/pi x 10 = 1161.8 degC day [derived, integral of the negative half of
// a sine], and its mean is (1.5 - 0.5) x 10/pi = 3.183 degC [derived]. An
// exchange of the two n-factors gives -15 to +5 and a mean of -3.183.
func TestGroundNFactorsReachSurface(t *testing.T) {
	r := mustRun(t, `
title: n-factor wiring
kind: ground
layers:
  - {name: rock, conductivity: 2.5, density: 2600, specific_heat: 850, thickness: 12 m}
surface:
  temperature: {mean: 0, annual: {amplitude: 10, peak_day: 200}}
  n_factor: {freezing: 0.5, thawing: 1.5}
bottom:
  heat_flux: 0
analysis:
  simulate: {duration: 365d, step: 1d}
`)
	ser := r.Series
	lo, hi := math.Inf(1), math.Inf(-1)
	var below float64
	for k, v := range ser.Simulation.OutsideSurface_C {
		lo, hi = math.Min(lo, v), math.Max(hi, v)
		if k > 0 && v < 0 {
			below -= v * (ser.Simulation.Time_h[k] - ser.Simulation.Time_h[k-1]) / 24
		}
	}
	if math.Abs(lo+5) > 0.01 || math.Abs(hi-15) > 0.01 {
		t.Errorf("simulated surface from %.3f to %.3f degC, want -5 to +15 (n_f 0.5 below 0, n_t 1.5 above)", lo, hi)
	}
	air := 365 / math.Pi * 10
	if math.Abs(below/(0.5*air)-1) > 0.005 {
		t.Errorf("surface freezing index %.1f degC day, want 0.5 x %.1f", below, air)
	}
	if g := r.Ground; g == nil || math.Abs(g.SurfaceMean_C-10/math.Pi) > 0.02 ||
		g.NFactorFreezing != 0.5 || g.NFactorThawing != 1.5 {
		t.Errorf("ground summary %+v: want surface mean %.3f and n-factors 0.5 / 1.5", g, 10/math.Pi)
	}
	if f := r.Frost; f == nil || f.FreezingIndex_Cd == nil || math.Abs(*f.FreezingIndex_Cd/air-1) > 0.005 ||
		math.Abs(*f.SurfaceFreezingIndex_Cd-0.5**f.FreezingIndex_Cd) > 1e-9 {
		t.Errorf("frost summary %+v: want air index %.1f and surface index half of it", f, air)
	}
}

// TestGroundBottomFluxSteady holds the surface of a deep column at 5 degC
// with a bottom heat flux of 0.5 W/m2 (upward into the column; a large,
// invented value so that a wrong sign shows within a year). The steady
// state is the linear geotherm T(z) = 5 + q z / k [derived from Fourier's
// law], and over the run the bottom lets in q t and the surface lets out
// the same heat: 0.5 x 365 x 86400 = 1.5768e7 J/m2.
func TestGroundBottomFluxSteady(t *testing.T) {
	r := mustRun(t, `
title: geotherm
kind: ground
layers:
  - {name: rock, conductivity: 2.0, density: 2000, specific_heat: 1000, thickness: 20 m}
surface:
  temperature: {mean: 5}
bottom:
  heat_flux: 0.5
analysis:
  probes: [2, 10, 20]
  simulate: {duration: 365d, step: 1d}
`)
	q, k := 0.5, 2.0
	ser := r.Series
	for j, z := range ser.Simulation.ProbeDepth_m {
		want := 5 + q*z/k
		got := ser.Simulation.Probes_C[j][len(ser.Simulation.Probes_C[j])-1]
		if math.Abs(got-want) > 0.01 {
			t.Errorf("simulated %.3f degC at %g m after a year, geotherm %.3f", got, z, want)
		}
	}
	for _, gp := range r.Ground.Periodic {
		for _, p := range gp.Probes {
			if want := 5 + q*p.Depth_m/k; math.Abs(p.Mean_C-want) > 1e-9 {
				t.Errorf("exact mean %.4f degC at %g m, geotherm %.4f", p.Mean_C, p.Depth_m, want)
			}
		}
	}
	heat := q * 365 * 86400
	sim := r.Simulation
	if math.Abs(sim.HeatInInside_J_m2/heat-1) > 1e-6 || math.Abs(sim.HeatInOutside_J_m2/heat+1) > 1e-3 {
		t.Errorf("heat in at the bottom %.5g, at the surface %.5g J/m2; want +%.5g and -%.5g",
			sim.HeatInInside_J_m2, sim.HeatInOutside_J_m2, heat, heat)
	}
	if g := r.Ground.GeothermalFlux_W_m2; g == nil || *g != q {
		t.Errorf("geothermal flux reported %v, want %g", g, q)
	}
}

// sineWinter is the cumulative-curve freezing index and season of one
// winter of T = m + A cos(2 pi t / L), L days long: F = L/pi (A sin th0 -
// m (pi - th0)), season L (pi - th0)/pi, th0 = acos(-m/A) [derived; the
// form of ground.SineIndices, recomputed here].
func sineWinter(m, a, days float64) (index, season float64) {
	th := math.Acos(-m / a)
	return days / math.Pi * (a*math.Sin(th) - m*(math.Pi-th)), days * (math.Pi - th) / math.Pi
}

// TestRecordDesignIndexColdestWinters builds a three-hourly air record of six
// winters, 1 July 2010 to 1 July 2016, each one whole cosine of its own
// amplitude (10, 16, 12, 18, 14, 11 K about a mean of 2 degC) and length
// (365 or 366 days), and checks the closed-form inputs of a ground run on
// it: the design freezing index is the mean of the three coldest complete
// winters (US Army practice, UFC 3-130-01 [memory]), the season length the
// mean of those same winters' seasons, and the surface index carries the
// freezing n-factor 0.6 (surface index = n x air index, UFC 3-130-04
// Table 4-1 [read]).
func TestRecordDesignIndexColdestWinters(t *testing.T) {
	dir := t.TempDir()
	amps := []float64{10, 16, 12, 18, 14, 11}
	const mean = 2.0
	var b strings.Builder
	b.WriteString("# synthetic record: one cosine per winter, invented for this test\ntime,air_C\n")
	type winter struct{ index, season float64 }
	var ws []winter
	for y, a := range amps {
		from := time.Date(2010+y, 7, 1, 0, 0, 0, 0, time.UTC)
		to := time.Date(2011+y, 7, 1, 0, 0, 0, 0, time.UTC)
		days := to.Sub(from).Hours() / 24
		for ts := from; ts.Before(to) || (y == len(amps)-1 && ts.Equal(to)); ts = ts.Add(3 * time.Hour) {
			ph := ts.Sub(from).Hours() / 24 / days
			fmt.Fprintf(&b, "%s,%.6f\n", ts.Format("2006-01-02T15:04"), mean+a*math.Cos(2*math.Pi*ph))
		}
		f, s := sineWinter(mean, a, days)
		ws = append(ws, winter{f, s})
	}
	if err := os.WriteFile(filepath.Join(dir, "air.csv"), []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	file := filepath.Join(dir, "record.yaml")
	os.WriteFile(file, []byte(`title: design index from a record
kind: ground
layers:
  - soil: {texture: silt-clay, dry_density: 1600, water_content: 0.20}
    thickness: 12 m
surface:
  temperature: {file: air.csv, column: air_C}
  n_factor: {freezing: 0.6}
`), 0o644)
	s, err := Load(file)
	if err != nil {
		t.Fatal(err)
	}
	r, err := Run(context.Background(), s, Options{})
	if err != nil {
		t.Fatal(err)
	}
	sort.Slice(ws, func(i, j int) bool { return ws[i].index > ws[j].index })
	design := (ws[0].index + ws[1].index + ws[2].index) / 3
	season := (ws[0].season + ws[1].season + ws[2].season) / 3
	warmest := (ws[3].season + ws[4].season + ws[5].season) / 3
	if season-warmest < 4 {
		t.Fatalf("test set-up: the coldest winters' seasons (%.1f d) must differ from the warmest (%.1f d)", season, warmest)
	}
	f := r.Frost
	if f == nil {
		t.Fatal("no frost results")
	}
	if f.FreezingIndex_Cd == nil || f.SeasonLength_d == nil || f.SurfaceFreezingIndex_Cd == nil {
		t.Fatalf("frost climate not computed: %v", f.NotComputed)
	}
	t.Logf("design index %.1f (hand %.1f) degC day, season %.1f (hand %.1f) d", *f.FreezingIndex_Cd, design, *f.SeasonLength_d, season)
	if math.Abs(*f.FreezingIndex_Cd/design-1) > 0.005 {
		t.Errorf("design freezing index %.1f degC day, mean of the 3 coldest winters %.1f", *f.FreezingIndex_Cd, design)
	}
	if math.Abs(*f.SeasonLength_d-season) > 1.5 {
		t.Errorf("design season %.1f d, mean of the 3 coldest winters' seasons %.1f d", *f.SeasonLength_d, season)
	}
	if math.Abs(*f.SurfaceFreezingIndex_Cd-0.6**f.FreezingIndex_Cd) > 1e-9 || f.NFactorFreezing != 0.6 {
		t.Errorf("surface index %.2f with n-factor %g, want 0.6 x %.2f", *f.SurfaceFreezingIndex_Cd, f.NFactorFreezing, *f.FreezingIndex_Cd)
	}
}

// isoWallMatrix multiplies ISO 13786 transfer matrices written from the
// standard's equations (clause 6 and Annex A [memory]): Z11 = Z22 =
// cosh((1+i) xi), Z12 = -delta sinh((1+i) xi) / (lambda (1+i)), Z21 =
// -lambda (1+i) sinh((1+i) xi) / delta, [[1, -R], [0, 1]] for a surface
// resistance; layers given as {d, lambda, rho c}, outside first.
func isoWallMatrix(rse, rsi, period float64, ls [][3]float64) [2][2]complex128 {
	mul := func(a, b [2][2]complex128) [2][2]complex128 {
		return [2][2]complex128{
			{a[0][0]*b[0][0] + a[0][1]*b[1][0], a[0][0]*b[0][1] + a[0][1]*b[1][1]},
			{a[1][0]*b[0][0] + a[1][1]*b[1][0], a[1][0]*b[0][1] + a[1][1]*b[1][1]},
		}
	}
	res := func(r float64) [2][2]complex128 { return [2][2]complex128{{1, complex(-r, 0)}, {0, 1}} }
	z := res(rse)
	for _, l := range ls {
		delta := math.Sqrt(l[1] * period / (math.Pi * l[2]))
		w := complex(1, 1) * complex(l[0]/delta, 0)
		lam := complex(l[1], 0)
		z = mul(z, [2][2]complex128{
			{cmplx.Cosh(w), -complex(delta, 0) * cmplx.Sinh(w) / (lam * complex(1, 1))},
			{-lam * complex(1, 1) * cmplx.Sinh(w) / complex(delta, 0), cmplx.Cosh(w)},
		})
	}
	return mul(z, res(rsi))
}

// TestOrientationSurfaceResistancesInResults decodes one asymmetric wall
// (insulation outside, concrete inside) as a wall, a roof and a floor and
// checks that the default surface resistances of ISO 6946 Table 7
// [memory] (Rsi 0.13 horizontal, 0.10 upward, 0.17 downward heat flow;
// Rse 0.04) reach the results: the reported resistances, U, and the inside
// and outside admittances, which an exchange of Rsi and Rse changes
// although U stays the same. The admittances are computed here from the
// ISO 13786 equations (isoWallMatrix).
func TestOrientationSurfaceResistancesInResults(t *testing.T) {
	ls := [][3]float64{{0.08, 0.04, 30 * 1400}, {0.15, 1.7, 2200 * 900}}
	for _, c := range []struct {
		orientation string
		rsi         float64
	}{{"wall", 0.13}, {"roof", 0.10}, {"floor", 0.17}} {
		r := mustRun(t, `
title: orientation
kind: wall
orientation: `+c.orientation+`
layers:
  - {name: insulation, conductivity: 0.04, density: 30, specific_heat: 1400, thickness: 80 mm}
  - {name: concrete, conductivity: 1.7, density: 2200, specific_heat: 900, thickness: 150 mm}
outside:
  temperature: {mean: 0, daily: {amplitude: 5, peak_hour: 15}}
analysis:
  periods: [24h]
  simulate: false
`)
		rse := 0.04
		st := r.Steady
		if st.InsideSurfaceResistance != c.rsi || st.OutsideSurfaceResistance != rse {
			t.Errorf("%s: Rsi %g Rse %g, want %g %g", c.orientation, st.InsideSurfaceResistance, st.OutsideSurfaceResistance, c.rsi, rse)
		}
		if u := 1 / (rse + 0.08/0.04 + 0.15/1.7 + c.rsi); math.Abs(st.UValue_W_m2K-u) > 1e-12 {
			t.Errorf("%s: U %.6f, want %.6f", c.orientation, st.UValue_W_m2K, u)
		}
		z := isoWallMatrix(rse, c.rsi, 86400, ls)
		y11, y22 := -z[0][0]/z[0][1], -z[1][1]/z[0][1]
		p := r.Periodic[0]
		if math.Abs(p.InsideAdmittance_W_m2K/cmplx.Abs(y11)-1) > 1e-9 || math.Abs(p.OutsideAdmittance_W_m2K/cmplx.Abs(y22)-1) > 1e-9 {
			t.Errorf("%s: admittances inside %.5f outside %.5f W/(m2 K), ISO 13786 %.5f %.5f",
				c.orientation, p.InsideAdmittance_W_m2K, p.OutsideAdmittance_W_m2K, cmplx.Abs(y11), cmplx.Abs(y22))
		}
		lead := 24 / (2 * math.Pi) * cmplx.Phase(y11)
		if math.Abs(p.InsideAdmittanceLead_h-lead) > 1e-9 {
			t.Errorf("%s: inside admittance lead %.5f h, ISO 13786 %.5f h", c.orientation, p.InsideAdmittanceLead_h, lead)
		}
	}
}

// TestStepResponseFiniteSlab steps the surface of a 20 mm granite slab on
// an adiabatic base by 15 K for 10 minutes. At 1 s the slab is still a
// half-space: q = b dT / sqrt(pi t) (Incropera et al., Fundamentals of
// Heat and Mass Transfer, section 5.7 [memory]). At the end (Fourier
// number a t / L^2 = 1.6) it is not: the series solution of a slab with
// one face stepped and the other insulated gives
//
//	q = (k dT / L) 2 sum_n exp(-l_n^2 Fo),  l_n = (2n+1) pi / 2,
//	Q = C L dT (1 - sum_n 8 / ((2n+1)^2 pi^2) exp(-l_n^2 Fo))
//
// (separation of variables, Carslaw and Jaeger, Conduction of Heat in
// Solids, section 3.3 [memory]; [derived]), about 78 W/m2 against the
// half-space's 932 W/m2.
func TestStepResponseFiniteSlab(t *testing.T) {
	r := mustRun(t, `
title: thin slab step
kind: ground
layers:
  - {name: granite slab, conductivity: 2.8, density: 2600, specific_heat: 1000, thickness: 20 mm}
surface:
  temperature: {mean: 10}
bottom:
  adiabatic: true
analysis:
  step_response: {change: 15 K, duration: 10min}
`)
	sr := r.StepResponse
	if sr == nil {
		t.Fatal("no step response")
	}
	k, c, L, dT, D := 2.8, 2600*1000.0, 0.02, 15.0, 600.0
	b := math.Sqrt(k * c)
	fo := k / c * D / (L * L)
	var qs, qq float64
	for n := 0; n < 50; n++ {
		l := float64(2*n+1) * math.Pi / 2
		qs += 2 * math.Exp(-l*l*fo)
		qq += 8 / (float64(2*n+1) * float64(2*n+1) * math.Pi * math.Pi) * math.Exp(-l*l*fo)
	}
	qEnd, heat := k*dT/L*qs, c*L*dT*(1-qq)
	q1 := b * dT / math.Sqrt(math.Pi)
	t.Logf("flux at 1 s %.0f (half-space %.0f), at the end %.2f (slab series %.2f) W/m2; heat %.0f (%.0f) J/m2",
		sr.FluxAt1s_W_m2, q1, sr.FluxAtEnd_W_m2, qEnd, sr.HeatAbsorbed_J_m2, heat)
	if math.Abs(sr.FluxAt1s_W_m2/q1-1) > 0.015 {
		t.Errorf("flux at 1 s %.0f W/m2, half-space %.0f", sr.FluxAt1s_W_m2, q1)
	}
	if math.Abs(sr.FluxAtEnd_W_m2/qEnd-1) > 0.01 {
		t.Errorf("flux at the end %.3f W/m2, slab series %.3f", sr.FluxAtEnd_W_m2, qEnd)
	}
	if math.Abs(sr.HeatAbsorbed_J_m2/heat-1) > 0.002 {
		t.Errorf("heat taken up %.0f J/m2, slab series %.0f", sr.HeatAbsorbed_J_m2, heat)
	}
	if hs := b * dT / math.Sqrt(math.Pi*D); math.Abs(sr.FluxAtEndHalfSpace_W_m2/hs-1) > 1e-12 {
		t.Errorf("half-space flux at the end %.3f W/m2, closed form %.3f", sr.FluxAtEndHalfSpace_W_m2, hs)
	}
}

// TestContactTemperatureUnequalEffusivities touches the granite floor of
// stoneFloor (surface at its steady temperature) with a body at 34 degC of
// effusivity 1000 W s^0.5/(m2 K). Two semi-infinite bodies in contact meet
// at Tc = (b1 T1 + b2 T2) / (b1 + b2) (Incropera et al., section 5.7,
// eq. 5.63 [memory]); the floor surface is at T_i - (T_i - T_o) Rsi / R_tot
// with Rsi 0.17 for a floor (ISO 6946 Table 7 [memory]) [derived].
func TestContactTemperatureUnequalEffusivities(t *testing.T) {
	y := strings.Replace(stoneFloor, "duration: 1min}", "duration: 1min, contact_temperature: 34, contact_effusivity: 1000}", 1)
	r := mustRun(t, y)
	sr := r.StepResponse
	if sr == nil || sr.ContactTemperature_C == nil {
		t.Fatal("no contact temperature")
	}
	var rl float64
	for _, l := range r.Layers {
		rl += l.Thickness_m / l.Conductivity_W_mK
	}
	rtot := 0.04 + rl + 0.17
	ts := 20 - (20-18)*0.17/rtot
	g := r.Layers[len(r.Layers)-1]
	b := math.Sqrt(g.Conductivity_W_mK * g.Density_kg_m3 * g.SpecificHeat_J_kgK)
	want := (b*ts + 1000*34) / (b + 1000)
	if math.Abs(sr.SurfaceTemperature_C-ts) > 1e-9 {
		t.Errorf("floor surface %.4f degC, steady %.4f", sr.SurfaceTemperature_C, ts)
	}
	if math.Abs(*sr.ContactTemperature_C-want) > 1e-9 {
		t.Errorf("contact temperature %.4f degC, want %.4f (b floor %.0f, body 1000)", *sr.ContactTemperature_C, want, b)
	}
}

// TestMeanProfileIsSteady: over whole periods the time mean of a periodic
// state is the steady state of the mean forcing (the harmonics average to
// zero), so the simulated mean temperature profile of a wall started on its
// periodic solution is T(x) = T_o + (T_i - T_o) R(x) / R_tot, with R(x)
// the resistance from the outside environment to x [derived].
func TestMeanProfileIsSteady(t *testing.T) {
	r := mustRun(t, `
title: mean profile
kind: wall
layers:
  - {name: brick, conductivity: 0.8, density: 1800, specific_heat: 900, thickness: 200 mm}
  - {name: insulation, conductivity: 0.035, density: 25, specific_heat: 1400, thickness: 60 mm}
outside:
  temperature: {mean: 4, daily: {amplitude: 8, peak_hour: 15}}
analysis:
  simulate: {duration: 2d, step: 15min}
`)
	ser := r.Series
	rse, rsi := r.Steady.OutsideSurfaceResistance, r.Steady.InsideSurfaceResistance
	rtot := rse + 0.2/0.8 + 0.06/0.035 + rsi
	worst := 0.0
	for i, x := range ser.SimProfile.Position_m {
		rx := rse + math.Min(x, 0.2)/0.8 + math.Max(0, x-0.2)/0.035
		want := 4 + (20-4)*rx/rtot
		worst = math.Max(worst, math.Abs(ser.SimProfile.Mean_C[i]-want))
	}
	t.Logf("mean profile against the steady state: worst %.4f K over %d cells", worst, len(ser.SimProfile.Position_m))
	if worst > 0.01 || len(ser.SimProfile.Position_m) < 10 {
		t.Errorf("mean profile differs from the steady state by %.4f K", worst)
	}
}

// TestDefaultGeothermalFlux: a ground column without a bottom condition
// gets the continental mean heat flow, 65 mW/m2 (Pollack, Hurter and
// Johnson 1993, Reviews of Geophysics 31:267 [memory]), upward into the
// column, and its exact mean profile is the geotherm 5 + q z / k [derived].
func TestDefaultGeothermalFlux(t *testing.T) {
	r := mustRun(t, `
title: default bottom
kind: ground
layers:
  - {name: rock, conductivity: 2.6, density: 2600, specific_heat: 850, thickness: 30 m}
surface:
  temperature: {mean: 5, annual: {amplitude: 10, peak_day: 200}}
analysis:
  probes: [20]
  simulate: false
`)
	g := r.Ground
	if g.GeothermalFlux_W_m2 == nil || *g.GeothermalFlux_W_m2 != 0.065 {
		t.Fatalf("geothermal flux %v, want 0.065 W/m2", g.GeothermalFlux_W_m2)
	}
	if p := g.Periodic[0].Probes[0]; math.Abs(p.Mean_C-(5+0.065*20/2.6)) > 1e-9 {
		t.Errorf("mean at 20 m %.4f degC, geotherm %.4f", p.Mean_C, 5+0.065*20/2.6)
	}
}
