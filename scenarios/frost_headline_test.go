package scenarios

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// Relic frost: a soil whose linear start state holds sub-zero ground far
// below the settled frost (mean 0.5 degC, swing 8 K) must settle at the
// depth of the independent explicit enthalpy reference (referenceFrost,
// started from the mean geothermal profile and run until two winters
// agree within 1 mm), with no winter frozen all year: with equal frozen
// and unfrozen conductivity, a positive mean and an upward geothermal flux
// the cycle-mean temperature rises linearly with depth from the surface
// mean [derived: the cycle-mean flux equals the bottom flux at every
// depth], so no ground can stay below 0 degC all year.
func TestRelicFrostSettles(t *testing.T) {
	s := refSoil{ku: 1.5, kf: 1.5, cu: 2e6, cf: 2e6, latent: 100e6, mean: 0.5, amp: 8, peakDay: 200, depth: 20, flux: 0.065}
	ref := referenceFrost(s, 0.015)
	r := mustRun(t, s.yaml())
	fr := r.Frost
	if fr.MaxFrostDepth_m == nil || !r.Simulation.SpinUpConverged {
		t.Fatalf("no settled headline: %v, spin-up converged %v", fr.NotComputed, r.Simulation.SpinUpConverged)
	}
	got := *fr.MaxFrostDepth_m
	t.Logf("tempstack %.4f m after %d spin-up cycles; reference %.4f m after %d years (history %.4f)", got, r.Simulation.SpinUpCycles, ref.frost, ref.years, ref.history)
	if math.Abs(got-ref.frost) > 0.02*ref.frost {
		t.Errorf("headline frost depth %.4f m, reference %.4f m", got, ref.frost)
	}
	for _, w := range fr.Winters {
		if w.FrozenAllYear || !w.Complete || !w.Settled {
			t.Errorf("%s: complete %v, settled %v, frozen all year %v; want every winter complete, settled and thawing", w.Label, w.Complete, w.Settled, w.FrozenAllYear)
		}
	}
}

// The spring front: a thin lens of last ice must not read as frost one
// cell deeper. The deepest frost comes in March or April, at the depth of
// the independent reference.
func TestSpringFrontReproduction(t *testing.T) {
	s := refSoil{ku: 1.3, kf: 1.3, cu: 1.8e6, cf: 1.8e6, latent: 125e6, mean: 3.2, amp: 7.5, peakDay: 223, depth: 20, flux: 0.065}
	ref := referenceFrost(s, 0.015)
	r := mustRun(t, s.yaml())
	fr := r.Frost
	if fr.MaxFrostDepth_m == nil {
		t.Fatalf("no headline: %v", fr.NotComputed)
	}
	got := *fr.MaxFrostDepth_m
	var day float64
	for _, w := range fr.Winters {
		if w.Label == fr.HeadlineWinter {
			day = math.Mod(w.MaxFrostDay, 365)
		}
	}
	t.Logf("tempstack %.4f m on day %.0f (%s); reference %.4f m", got, day, fr.HeadlineWinter, ref.frost)
	if math.Abs(got-ref.frost) > 0.02*ref.frost {
		t.Errorf("headline frost depth %.4f m, reference %.4f m", got, ref.frost)
	}
	if day < 59 || day >= 120 {
		t.Errorf("deepest frost on day %.0f of the year, want March or April (59-119)", day)
	}
}

// No false zeros: every forcing with a freezing season gets closed forms,
// and what was not computed is null with a reason, never 0.
func TestClosedFormsForEveryColdForcing(t *testing.T) {
	// Layer: kf 1.6 W/(m K), L 100 MJ/m3; Stefan's formula X = sqrt(2 kf F
	// 86400 / L) (Handy and Spangler, Geotechnical Engineering, 5th ed.
	// 2007, Example 11.7 uses the same form [read]).
	const layer = `layers:
  - {name: clay, thickness: 6, conductivity: 1.3, conductivity_frozen: 1.6, density: 1800, specific_heat: 1300, latent_heat: 100 MJ/m3}
`
	stefan := func(F float64) float64 { return math.Sqrt(2 * 1.6 * F * 86400 / 100e6) }
	cases := []struct {
		name, surface, analysis string
		index                   float64 // degC day, 0: none
	}{
		// -8 degC held for 40 days: F = 320 degC day.
		{"constant", "temperature: {mean: -8}", "simulate: {duration: 40d, step: 1h, initial_temperature: 2}", 320},
		// A step from +2 to -8 degC at the start, 40 days: F = 320.
		{"step", "temperature: {step: {from: 2, to: -8, at: 0}}", "simulate: {duration: 40d, step: 1h}", 320},
		// Never below freezing: no index, no closed forms.
		{"warm", "temperature: {mean: 10, annual: {amplitude: 5, peak_day: 200}}", "periods: [8760h]", 0},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			y := "title: " + tc.name + "\nkind: ground\n" + layer + "surface:\n  " + tc.surface + "\nbottom: {heat_flux: 0}\nanalysis:\n  " + tc.analysis + "\n"
			r := mustRun(t, y)
			f := r.Frost
			b, _ := jsonOf(t, f)
			if tc.index == 0 {
				if f.StefanDepth_m != nil || f.ModifiedBerggrenDepth_m != nil || f.FreezingIndex_Cd != nil {
					t.Errorf("closed forms without a freezing season: %s", b)
				}
				for _, k := range []string{"stefan_depth_m", "modified_berggren_depth_m", "freezing_index_Cd"} {
					if f.NotComputed[k] == "" || !strings.Contains(b, `"`+k+`":null`) {
						t.Errorf("%s: want null with a reason, got %s", k, b)
					}
				}
				return
			}
			if f.FreezingIndex_Cd == nil || math.Abs(*f.FreezingIndex_Cd-tc.index) > 0.01*tc.index {
				t.Fatalf("freezing index %v, want %g degC day (%s)", f.FreezingIndex_Cd, tc.index, b)
			}
			if f.StefanDepth_m == nil || math.Abs(*f.StefanDepth_m-stefan(*f.FreezingIndex_Cd)) > 1e-9 {
				t.Errorf("Stefan %v, want %.4f m by hand", f.StefanDepth_m, stefan(*f.FreezingIndex_Cd))
			}
			if f.ModifiedBerggrenDepth_m == nil || !(*f.ModifiedBerggrenDepth_m < *f.StefanDepth_m) {
				t.Errorf("modified Berggren %v, want a depth below Stefan's", f.ModifiedBerggrenDepth_m)
			}
			if f.MaxFrostDepth_m == nil || *f.MaxFrostDepth_m <= 0 {
				t.Errorf("simulated headline %v (%v)", f.MaxFrostDepth_m, f.NotComputed)
			}
			if f.IndexSource.String() != "simulated period" {
				t.Errorf("index source %q", f.IndexSource.String())
			}
		})
	}
}

// A record with two complete winters: the closed forms use the coldest
// complete winter and say so (common practice of the frost manuals when
// fewer winters than a design index needs are at hand).
func TestShortRecordUsesColdestWinter(t *testing.T) {
	dir := t.TempDir()
	var b strings.Builder
	b.WriteString("# synthetic record, invented for this test: two winter years of one cosine each\ntime,air_C\n")
	amps := []float64{12, 16}
	for y, a := range amps {
		from := time.Date(2031+y, 7, 1, 0, 0, 0, 0, time.UTC)
		to := time.Date(2032+y, 7, 1, 0, 0, 0, 0, time.UTC)
		days := to.Sub(from).Hours() / 24
		for ts := from; ts.Before(to); ts = ts.Add(time.Hour) {
			ph := ts.Sub(from).Hours() / 24 / days
			fmt.Fprintf(&b, "%s,%.5f\n", ts.Format("2006-01-02T15:04"), 2+a*math.Cos(2*math.Pi*ph))
		}
	}
	os.WriteFile(filepath.Join(dir, "air.csv"), []byte(b.String()), 0o644)
	file := filepath.Join(dir, "short.yaml")
	os.WriteFile(file, []byte(`title: short record
kind: ground
layers:
  - {name: clay, thickness: 8, conductivity: 1.3, conductivity_frozen: 1.6, density: 1800, specific_heat: 1300, latent_heat: 100 MJ/m3}
surface:
  temperature: {file: air.csv, column: air_C}
`), 0o644)
	s, err := Load(file)
	if err != nil {
		t.Fatal(err)
	}
	r, err := Run(context.Background(), s, Options{})
	if err != nil {
		t.Fatal(err)
	}
	f := r.Frost
	// The colder winter (amplitude 16, mean 2): F = (1/pi) int over the
	// cold part of -(2 + 16 cos) d(day) [derived, as sineWinter].
	want, _ := sineWinter(2, 16, 365)
	if f.FreezingIndex_Cd == nil || math.Abs(*f.FreezingIndex_Cd/want-1) > 0.01 || f.StefanDepth_m == nil || f.ModifiedBerggrenDepth_m == nil {
		t.Fatalf("index %v (want %.1f), Stefan %v, Berggren %v; %v", f.FreezingIndex_Cd, want, f.StefanDepth_m, f.ModifiedBerggrenDepth_m, f.NotComputed)
	}
	if !strings.Contains(f.IndexSource.String(), "coldest of 2 complete winters") {
		t.Errorf("index source %q does not say it is the coldest of 2 winters", f.IndexSource.String())
	}
	said := false
	for _, w := range r.Warnings {
		said = said || strings.Contains(w, "fewer than 3 complete winters")
	}
	if !said {
		t.Errorf("no warning about the short record: %q", r.Warnings)
	}
}

// farm-frost: every winter whose probes froze reports a frost depth above
// 0, every winter is whole (the run starts at the warmest time), and the
// headline is the deepest complete, settled winter.
func TestFarmFrostWintersAreWhole(t *testing.T) {
	data, err := examplesFS.ReadFile("examples/farm-frost.yaml")
	if err != nil {
		t.Fatal(err)
	}
	r := mustRun(t, string(data))
	f := r.Frost
	if f.MaxFrostDepth_m == nil {
		t.Fatalf("no headline: %v", f.NotComputed)
	}
	deepest := 0.0
	for _, w := range f.Winters {
		frozen := false
		for _, d := range w.FrozenDays {
			frozen = frozen || d.Days > 0
		}
		if frozen && w.MaxFrostDepth_m <= 0 {
			t.Errorf("%s: probes frozen but frost depth %g m", w.Label, w.MaxFrostDepth_m)
		}
		if !w.Complete || !w.Settled {
			t.Errorf("%s: complete %v, settled %v", w.Label, w.Complete, w.Settled)
		}
		deepest = math.Max(deepest, w.MaxFrostDepth_m)
	}
	if *f.MaxFrostDepth_m != deepest || f.HeadlineWinter == "" {
		t.Errorf("headline %g m (%s), deepest winter %g m", *f.MaxFrostDepth_m, f.HeadlineWinter, deepest)
	}
}

// jsonOf encodes v as results.json does.
func jsonOf(t *testing.T, v any) (string, error) {
	t.Helper()
	b, err := json.Marshal(v)
	if err != nil {
		t.Fatal(err)
	}
	return string(b), nil
}

// A pavement through a whole ground run: 100 mm of asphalt (no latent
// heat) over clay. Layered Stefan equals the hand calculation of the
// frost manuals' multilayer procedure (US Army TM 5-852-6 / AFR 88-19
// Vol. 6, 1988 [memory]): the asphalt freezes at once and adds its
// resistance R = 0.1/0.75; the clay part x solves L x (R + x/(2 kf)) =
// F 86400 with F the surface index.
func TestPavementOverClayClosedForms(t *testing.T) {
	r := mustRun(t, `title: yard pavement
kind: ground
layers:
  - {name: asphalt, thickness: 100 mm, conductivity: 0.75, density: 2300, specific_heat: 900}
  - {name: clay, thickness: 8, conductivity: 1.3, conductivity_frozen: 1.6, density: 1800, specific_heat: 1300, latent_heat: 100 MJ/m3}
surface:
  temperature: {mean: 4, annual: {amplitude: 13, peak_day: 200}}
  n_factor: {freezing: 0.7, thawing: 1.4}
analysis:
  periods: [8760h]
`)
	f := r.Frost
	if f.SurfaceFreezingIndex_Cd == nil || f.StefanDepth_m == nil || f.ModifiedBerggrenDepth_m == nil {
		t.Fatalf("closed forms missing: %v", f.NotComputed)
	}
	F := *f.SurfaceFreezingIndex_Cd
	R, L, kf := 0.1/0.75, 100e6, 1.6
	// (L/(2 kf)) x^2 + L R x - F 86400 = 0.
	a, b, c := L/(2*kf), L*R, -F*86400
	x := (-b + math.Sqrt(b*b-4*a*c)) / (2 * a)
	if want := 0.1 + x; math.Abs(*f.StefanDepth_m-want) > 1e-9 {
		t.Errorf("layered Stefan %.6f m, hand %.6f m (F = %.1f degC day)", *f.StefanDepth_m, want, F)
	}
	if !(*f.ModifiedBerggrenDepth_m > 0.1 && *f.ModifiedBerggrenDepth_m < *f.StefanDepth_m) {
		t.Errorf("modified Berggren %.4f m, Stefan %.4f m", *f.ModifiedBerggrenDepth_m, *f.StefanDepth_m)
	}
	t.Logf("F = %.1f degC day: Stefan %.3f m, modified Berggren %.3f m", F, *f.StefanDepth_m, *f.ModifiedBerggrenDepth_m)
}

// A run that cannot settle within its limit says so and keeps its
// winters out of the headline.
func TestUnsettledRunHasNoHeadline(t *testing.T) {
	s := refSoil{ku: 1.5, kf: 1.5, cu: 2e6, cf: 2e6, latent: 100e6, mean: 0.5, amp: 8, peakDay: 200, depth: 20, flux: 0.065}
	y := strings.Replace(s.yaml(), "simulate: {}", "simulate: {spin_up_cycles: 1, duration: 1y}", 1)
	r := mustRun(t, y)
	f := r.Frost
	if r.Simulation.SpinUpConverged || f.MaxFrostDepth_m != nil || !strings.Contains(f.NotComputed["max_frost_depth_m"], "settled") {
		t.Errorf("converged %v, headline %v, reason %q", r.Simulation.SpinUpConverged, f.MaxFrostDepth_m, f.NotComputed["max_frost_depth_m"])
	}
	said := false
	for _, w := range r.Warnings {
		said = said || strings.HasPrefix(w, "not settled")
	}
	if !said {
		t.Errorf("no 'not settled' warning: %q", r.Warnings)
	}
	for _, w := range f.Winters {
		if w.Settled {
			t.Errorf("%s marked settled", w.Label)
		}
	}
}

// A start in mid-winter (start: 0, 1 January) gives the same settled
// frost as the default winter-year start, and the start state's missing
// relic ice keeps the spin-up short: the linear solution knows no latent
// heat, and a start that kept its sub-zero ground as ice needs nearly
// twice the coarse cycles (11 against 6 here) to thaw it.
func TestMidWinterStartSettlesQuickly(t *testing.T) {
	s := refSoil{ku: 1.5, kf: 1.5, cu: 2e6, cf: 2e6, latent: 100e6, mean: 0.5, amp: 8, peakDay: 200, depth: 20, flux: 0.065}
	def := mustRun(t, s.yaml())
	mid := mustRun(t, strings.Replace(s.yaml(), "simulate: {}", "simulate: {start: 0}", 1))
	a, b := def.Frost.MaxFrostDepth_m, mid.Frost.MaxFrostDepth_m
	if a == nil || b == nil {
		t.Fatalf("headlines %v and %v", a, b)
	}
	if math.Abs(*a-*b) > 0.001**a {
		t.Errorf("mid-winter start %.4f m, winter-year start %.4f m", *b, *a)
	}
	// The relic ice is thawed in the coarse first cycles (6 h steps):
	// measured 6 coarse cycles without it, 11 with it; then 2 at the
	// simulation's step, the second the simulation's own first cycle.
	sim := mid.Simulation
	if sim.SpinUpCoarseCycles == nil {
		t.Fatal("no coarse cycle count after a spin-up")
	}
	if c, f := *sim.SpinUpCoarseCycles, sim.SpinUpCycles; c > 8 || f > 3 {
		t.Errorf("mid-winter start needed %d coarse and %d spin-up cycles, want at most 8 and 3", c, f)
	}
}
