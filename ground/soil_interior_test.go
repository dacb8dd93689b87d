package ground

import (
	"math"
	"testing"

	"tempstack/climate"
	"tempstack/solver"
)

// TestKerstenInteriorHandValues checks Kersten's (1949) regressions at
// water contents and densities inside the fitted range, away from the
// table rows, against values worked by hand from the equations (Kersten
// 1949 as given by Farouki 1981, CRREL Monograph 81-1 [memory]; k in
// Btu in/(ft2 h degF), gd in lb/ft3, w in percent; 1 Btu in/(ft2 h degF) =
// 0.144228 W/(m K), 1 lb/ft3 = 16.0185 kg/m3 [derived]):
//
//	sand 1760 kg/m3 (gd 109.873), w 8 %:
//	  unfrozen (0.7 log10 8 + 0.4) 10^1.09873 = 12.956 -> 1.8687 W/(m K)
//	  frozen 0.076 10^1.42835 + 0.032 10^1.60415 8 = 12.327 -> 1.7779
//	silt-clay 1500 kg/m3 (gd 93.642), w 22 %:
//	  unfrozen (0.9 log10 22 - 0.2) 10^0.93642 = 8.709 -> 1.2560
//	  frozen 0.01 10^2.06012 + 0.085 10^0.74914 22 = 11.643 -> 1.6793
//
// [derived]. Tolerance 0.2 %: a slope, logarithm base or water unit
// mistaken in any of the four equations moves the value by far more.
func TestKerstenInteriorHandValues(t *testing.T) {
	for _, c := range []struct {
		tex      Texture
		rd, w    float64
		ku, kf   float64
		describe string
	}{
		{Sand, 1760, 0.08, 1.8687, 1.7779, "sand"},
		{SiltClay, 1500, 0.22, 1.2560, 1.6793, "silt-clay"},
	} {
		ku, err := KerstenUnfrozen(c.tex, c.rd, c.w)
		if err != nil {
			t.Fatal(err)
		}
		kf, err := KerstenFrozen(c.tex, c.rd, c.w)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(ku/c.ku-1) > 0.002 || math.Abs(kf/c.kf-1) > 0.002 {
			t.Errorf("%s %g kg/m3 w %g: unfrozen %.4f frozen %.4f W/(m K), hand values %.4f %.4f",
				c.describe, c.rd, c.w, ku, kf, c.ku, c.kf)
		}
		// The same numbers through a Soil (default model Kersten).
		s := Soil{Texture: c.tex, DryDensity: c.rd, WaterContent: c.w}
		f, u, err := s.Conductivity()
		if err != nil || f != kf || u != ku {
			t.Errorf("%s: Soil.Conductivity %g %g (%v), want %g %g", c.describe, f, u, err, kf, ku)
		}
	}
}

// TestJohansenInteriorHandValues checks Johansen's (1975) method (as given
// by Farouki 1981 [memory]) at degrees of saturation between 0 and 1,
// where the coarse, fine and frozen Kersten numbers differ (at 0 and 1
// every form agrees), and runs both branches of the coarse solids
// conductivity: quartz 0.1 (<= 0.2, other minerals 3.0) and 0.6 (2.0).
// Hand values from the equations with solids density 2650 kg/m3 [derived]:
//
//	sand 1600 kg/m3, w 10 %: n = 0.396226, Sr = 0.403810,
//	  Ke = 0.7 log10 Sr + 1 = 0.724324, k_dry = 0.236918
//	  quartz 0.1: ks = 7.7^0.1 3^0.9 = 3.296539, k_sat = 1.644603 (water),
//	    2.808450 (ice): unfrozen 1.256537, frozen 1.275327 W/(m K)
//	  quartz 0.6: ks = 7.7^0.6 2^0.4 = 4.490621: unfrozen 1.500965,
//	    frozen 1.508029
//	silt-clay 1500 kg/m3, w 15 %, quartz 0.3: n = 0.433962, Sr = 0.518478,
//	  Ke = log10 Sr + 1 = 0.714731, k_dry = 0.208832, ks = 2.996872:
//	  unfrozen 1.101923, frozen 1.459312
func TestJohansenInteriorHandValues(t *testing.T) {
	for _, c := range []struct {
		name     string
		tex      Texture
		rd, w, q float64
		ku, kf   float64
	}{
		{"sand, low quartz", Sand, 1600, 0.10, 0.1, 1.256537, 1.275327},
		{"sand, quartz 0.6", Sand, 1600, 0.10, 0.6, 1.500965, 1.508029},
		{"silt-clay", SiltClay, 1500, 0.15, 0.3, 1.101923, 1.459312},
	} {
		s := Soil{Texture: c.tex, DryDensity: c.rd, WaterContent: c.w, Quartz: c.q, Model: ModelJohansen}
		if sr := s.Saturation(); sr < 0.3 || sr > 0.7 {
			t.Fatalf("test set-up: %s saturation %g is not interior", c.name, sr)
		}
		kf, ku, err := s.Conductivity()
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(ku-c.ku) > 2e-6 || math.Abs(kf-c.kf) > 2e-6 {
			t.Errorf("%s: unfrozen %.6f frozen %.6f W/(m K), hand values %.6f %.6f", c.name, ku, kf, c.ku, c.kf)
		}
	}
}

// TestSoilHeatCapacityFrozenUnfrozen: the volumetric heat capacities of a
// moist soil, C = rho_d (c_s + w c_w) unfrozen and rho_d (c_s + w c_i)
// frozen (US Army frost manuals form, gd (0.17 + w) and gd (0.17 + 0.5 w)
// Btu/(ft3 degF) [memory]; c_w 4190, c_i 2000 J/(kg K)): for 1600 kg/m3
// and w 20 %: c_s = 0.17 x 4186.8 = 711.756 J/(kg K), unfrozen
// 1600 (711.756 + 838) = 2.47961e6, frozen 1600 (711.756 + 400) =
// 1.77881e6 J/(m3 K) [derived]. The frozen value is the smaller one.
func TestSoilHeatCapacityFrozenUnfrozen(t *testing.T) {
	s := Soil{Texture: SiltClay, DryDensity: 1600, WaterContent: 0.20}
	cf, cu := s.HeatCapacity()
	if math.Abs(cu-2.4796096e6) > 1 || math.Abs(cf-1.7788096e6) > 1 {
		t.Errorf("heat capacities frozen %.1f unfrozen %.1f J/(m3 K), hand values 1778809.6 2479609.6", cf, cu)
	}
}

// TestStefanLayeredFrozenConductivity runs the layered Stefan solution
// with frozen and unfrozen conductivities that differ: only the frozen
// one may enter, since the frozen zone carries the heat (Stefan's
// quasi-steady solution, X = sqrt(2 k_f F / L); layered form after
// Aldrich and Paynter 1953 / UFC 3-130-06 [memory], [derived] below).
//
// One layer, k_f 2.0, k_u 1.2 W/(m K), L 1.0e8 J/m3, F 800 K day:
// X = sqrt(2 x 2.0 x 800 x 86400 / 1e8) = 1.66277 m.
// Two layers, 0.4 m of k_f 1.5 (k_u 0.9), L 0.6e8 over k_f 2.2 (k_u 1.4),
// L 1.2e8: the first layer takes F1 = L1 d1^2 / (2 k1f) = 53.333e5 K s
// (61.728 K day), then x in layer 2 solves
// L2 x^2 / (2 k2f) + L2 (d1 / k1f) x = F - F1, giving the depth 0.4 + x.
func TestStefanLayeredFrozenConductivity(t *testing.T) {
	soil := func(d, kf, ku, lat float64) solver.Layer {
		return solver.Layer{Name: "soil", Thickness: d, Conductivity: ku, HeatCapacity: 2e6,
			Freeze: &solver.Freezing{LatentHeat: lat, ConductivityFrozen: kf, HeatCapacityFrozen: 1.8e6}}
	}
	F := 800.0
	got, _, err := StefanLayered([]solver.Layer{soil(10, 2.0, 1.2, 1e8)}, F)
	if err != nil {
		t.Fatal(err)
	}
	want := math.Sqrt(2 * 2.0 * F * 86400 / 1e8)
	if math.Abs(want-1.66277) > 1e-5 || math.Abs(got-want) > 1e-9 {
		t.Errorf("one layer: %.6f m, Stefan with k_f %.6f m", got, want)
	}

	d1, k1, l1, k2, l2 := 0.4, 1.5, 0.6e8, 2.2, 1.2e8
	got, needed, err := StefanLayered([]solver.Layer{soil(d1, k1, 0.9, l1), soil(10, k2, 1.4, l2)}, F)
	if err != nil {
		t.Fatal(err)
	}
	F1 := l1 * d1 * d1 / (2 * k1)
	a, b, c := l2/(2*k2), l2*d1/k1, -(F*86400 - F1)
	x := (-b + math.Sqrt(b*b-4*a*c)) / (2 * a)
	if math.Abs(got-(d1+x)) > 1e-9 {
		t.Errorf("two layers: %.6f m, hand solution %.6f m", got, d1+x)
	}
	if len(needed) == 0 || math.Abs(needed[0]-F1/86400) > 1e-9 {
		t.Errorf("index to freeze the first layer %v K day, want %.4f", needed, F1/86400)
	}
}

// TestFrostClimateFromWinterNFactor: a winter's surface freezing index is
// the n-factor times its air index (UFC 3-130-04 Table 4-1, "ratio of
// surface index to air index" [read]); season and mean pass through.
func TestFrostClimateFromWinterNFactor(t *testing.T) {
	w := climate.Winter{Label: "test", FreezingIndex: 850, Days: 120, MeanTemperature: 3.5}
	fc, err := FrostClimateFromWinter(w, 0.7)
	if err != nil {
		t.Fatal(err)
	}
	if fc.AirIndex != 850 || math.Abs(fc.SurfaceIndex-595) > 1e-9 || fc.NFactorFreezing != 0.7 || fc.SeasonDays != 120 || fc.MeanAnnual != 3.5 {
		t.Errorf("frost climate %+v: want surface index 0.7 x 850 = 595, 120 days, mean 3.5", fc)
	}
}
