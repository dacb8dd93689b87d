package ground

import (
	"math"
	"strings"
	"testing"
)

// lbPerFt3 converts a dry unit weight in lb/ft3 to kg/m3.
const lbPerFt3 = 16.018463373960138

func TestKerstenTable(t *testing.T) {
	// Handy and Spangler, Geotechnical Engineering, 5th ed. 2007, Table 11.1
	// (from Kersten's charts) [read]:
	// frozen / unfrozen conductivity, W/(m K), at dry density (pcf) and
	// water content (%). Kersten's equations reproduce them within
	// 0.1 W/(m K) [derived].
	cases := []struct {
		tex              Texture
		pcf, w           float64
		frozen, unfrozen float64
	}{
		{SiltClay, 100, 20, 1.8, 1.4},
		{SiltClay, 110, 10, 1.3, 1.3},
		{Sand, 130, 5, 2.3, 2.6},
		{Sand, 130, 10, 4.2, 3.1},
	}
	for _, c := range cases {
		rho, w := c.pcf*lbPerFt3, c.w/100
		kf, err := KerstenFrozen(c.tex, rho, w)
		if err != nil {
			t.Fatal(err)
		}
		ku, err := KerstenUnfrozen(c.tex, rho, w)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(kf-c.frozen) > 0.1 || math.Abs(ku-c.unfrozen) > 0.1 {
			t.Errorf("%v %g pcf w %g %%: frozen/unfrozen %.3f/%.3f, table %.1f/%.1f",
				c.tex, c.pcf, c.w, kf, ku, c.frozen, c.unfrozen)
		}
		t.Logf("%v %g pcf w %g %%: frozen %.3f (table %.1f), unfrozen %.3f (table %.1f)",
			c.tex, c.pcf, c.w, kf, c.frozen, ku, c.unfrozen)
	}
}

func TestKerstenTableException(t *testing.T) {
	// The one entry of Handy and Spangler Table 11.1 the equations miss:
	// frozen sand 120 pcf, w 15 %: equation 4.31, table 4.0 W/(m K)
	// [derived from Kersten's frozen-sand equation]. Hand computation of the frozen sand
	// equation: 0.076 10^1.56 + 0.032 10^1.752 15 = 29.88 Btu in/(ft2 h F)
	// = 4.309 W/(m K).
	kf, err := KerstenFrozen(Sand, 120*lbPerFt3, 0.15)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(kf-4.31) > 0.005 {
		t.Errorf("frozen sand 120 pcf 15 %%: %.4f, want 4.31", kf)
	}
}

func TestKerstenRange(t *testing.T) {
	// Below Kersten's fitted water contents (sand 1 %, silt-clay 7 %, as
	// quoted with the equations, from memory) the equations refuse.
	if _, err := KerstenUnfrozen(SiltClay, 1600, 0.05); err == nil || !strings.Contains(err.Error(), "Johansen") {
		t.Errorf("silt-clay at 5 %%: want an error pointing to Johansen, got %v", err)
	}
	if _, err := KerstenFrozen(Sand, 1800, 0.005); err == nil {
		t.Error("sand at 0.5 %: want an error")
	}
	if _, err := KerstenFrozen(Texture(9), 1800, 0.1); err == nil {
		t.Error("unknown texture: want an error")
	}
}

func TestUnitConversions(t *testing.T) {
	// 1 Btu in/(ft2 h degF) = 0.1442 W/(m K); 1 lb/ft3 = 16.018 kg/m3
	// (conversion tables, e.g. ASHRAE Fundamentals, from memory).
	if math.Abs(btuIn-0.144228) > 1e-6 {
		t.Errorf("btuIn = %g", btuIn)
	}
	if math.Abs(pcf-lbPerFt3) > 1e-9 {
		t.Errorf("pcf = %g", pcf)
	}
}

func TestJohansenLimits(t *testing.T) {
	// Johansen's method [derived from its definition, Farouki 1981]:
	// Sr = 0 gives k_dry for both states; Sr = 1 gives the geometric means
	// k_s^(1-n) 0.57^n (unfrozen) and k_s^(1-n) 2.2^n (frozen).
	const n, q, rho = 0.4, 0.5, 1590.0
	ks := math.Pow(7.7, q) * math.Pow(2.0, 1-q) // 3.924 W/(m K)
	kdry := (0.135*rho + 64.7) / (2700 - 0.947*rho)
	for _, tex := range []Texture{Sand, SiltClay} {
		if got := JohansenUnfrozen(tex, n, 0, q, rho); math.Abs(got-kdry) > 1e-12 {
			t.Errorf("%v dry unfrozen %g, want %g", tex, got, kdry)
		}
		if got := JohansenFrozen(tex, n, 0, q, rho); math.Abs(got-kdry) > 1e-12 {
			t.Errorf("%v dry frozen %g, want %g", tex, got, kdry)
		}
		want := math.Pow(ks, 1-n) * math.Pow(0.57, n)
		if got := JohansenUnfrozen(tex, n, 1, q, rho); math.Abs(got-want) > 1e-12 {
			t.Errorf("%v saturated unfrozen %g, want %g", tex, got, want)
		}
		want = math.Pow(ks, 1-n) * math.Pow(2.2, n)
		if got := JohansenFrozen(tex, n, 1, q, rho); math.Abs(got-want) > 1e-12 {
			t.Errorf("%v saturated frozen %g, want %g", tex, got, want)
		}
	}
	// Kersten number at half saturation: coarse 0.7 log10(0.5) + 1 = 0.7893,
	// fine log10(0.5) + 1 = 0.6990 [derived].
	ksatU := math.Pow(ks, 1-n) * math.Pow(0.57, n)
	for _, c := range []struct {
		tex Texture
		ke  float64
	}{{Sand, 0.78928}, {SiltClay, 0.69897}} {
		want := (ksatU-kdry)*c.ke + kdry
		if got := JohansenUnfrozen(c.tex, n, 0.5, q, rho); math.Abs(got-want) > 1e-4 {
			t.Errorf("%v half saturated: %g, want %g", c.tex, got, want)
		}
	}
}

func TestJohansenDryPublished(t *testing.T) {
	// Johansen's dry-soil formula at rho_d = 1600 kg/m3: (0.135 1600 + 64.7)
	// / (2700 - 0.947 1600) = 280.7 / 1184.8 = 0.2369 W/(m K) [derived by
	// hand]; it lies inside the dry-sand value 0.24 W/(m K) of Moene and van
	// Dam (2014) Table 2.2 after de Vries (1963) [2nd-hand] with Johansen's
	// stated +-20 % accuracy.
	got := JohansenDry(1600)
	if math.Abs(got-0.23692) > 1e-4 {
		t.Errorf("JohansenDry(1600) = %g, want 0.2369", got)
	}
	if math.Abs(got-0.24)/0.24 > 0.2 {
		t.Errorf("JohansenDry(1600) = %g, more than 20 %% from 0.24", got)
	}
}

func TestJohansenMonotone(t *testing.T) {
	// Property: conductivity grows with saturation, frozen >= unfrozen at
	// full saturation (ice conducts about 4 times better than water).
	s := Soil{Texture: Sand, DryDensity: 1700, Quartz: 0.6, Model: ModelJohansen}
	prev := 0.0
	for w := 0.01; w <= s.SaturatedWaterContent(); w += 0.01 {
		s.WaterContent = w
		_, ku, err := s.Conductivity()
		if err != nil {
			t.Fatal(err)
		}
		if ku <= prev {
			t.Errorf("w %g: unfrozen %g not above %g", w, ku, prev)
		}
		prev = ku
	}
	s.WaterContent = s.SaturatedWaterContent()
	kf, ku, err := s.Conductivity()
	if err != nil {
		t.Fatal(err)
	}
	if kf <= ku {
		t.Errorf("saturated: frozen %g not above unfrozen %g", kf, ku)
	}
}

func TestSoilPhaseRelations(t *testing.T) {
	// Phase relations [derived, standard definitions]: rho_d 1590 with
	// rho_s 2650 gives n = 0.4, e = 0.6667; w_sat = 1000 0.4 / 1590 = 0.2516.
	s := Soil{Texture: Sand, DryDensity: 1590, WaterContent: 0.1258}
	checks := []struct {
		name      string
		got, want float64
	}{
		{"porosity", s.Porosity(), 0.4},
		{"void ratio", s.VoidRatio(), 2.0 / 3},
		{"saturated water content", s.SaturatedWaterContent(), 0.4 * 1000 / 1590},
		{"saturation", s.Saturation(), 0.1258 * 1590 / 400},
		{"volumetric water", s.VolumetricWater(), 0.1258 * 1.590},
	}
	for _, c := range checks {
		if math.Abs(c.got-c.want) > 1e-12 {
			t.Errorf("%s = %g, want %g", c.name, c.got, c.want)
		}
	}
}

func TestSoilOverSaturated(t *testing.T) {
	s := Soil{Texture: SiltClay, DryDensity: 1590, WaterContent: 0.30}
	err := s.Validate()
	if err == nil {
		t.Fatal("w 30 % at 1590 kg/m3 (w_sat 25.2 %): want an error")
	}
	if !strings.Contains(err.Error(), "25.2 %") {
		t.Errorf("error should name the maximum 25.2 %%: %v", err)
	}
	if _, err := s.Layer("x", 1); err == nil {
		t.Error("Layer of an over-saturated soil: want an error")
	}
	// Exactly saturated passes.
	s.WaterContent = s.SaturatedWaterContent()
	if err := s.Validate(); err != nil {
		t.Errorf("saturated soil: %v", err)
	}
}

func TestSoilBadInputs(t *testing.T) {
	good := Soil{Texture: Sand, DryDensity: 1800, WaterContent: 0.1}
	bad := []Soil{
		{DryDensity: 1800, WaterContent: 0.1},
		{Texture: Sand, DryDensity: 0, WaterContent: 0.1},
		{Texture: Sand, DryDensity: 2700, WaterContent: 0.1},
		{Texture: Sand, DryDensity: math.NaN(), WaterContent: 0.1},
		{Texture: Sand, DryDensity: 1800, WaterContent: -0.1},
		{Texture: Sand, DryDensity: 1800, WaterContent: 0.1, Quartz: 1.5},
		{Texture: Sand, DryDensity: 1800, WaterContent: 0.1, FreezingRange: -1},
		{Texture: Sand, DryDensity: 1800, WaterContent: 0.1, Model: Model(7)},
	}
	if err := good.Validate(); err != nil {
		t.Fatalf("good soil: %v", err)
	}
	for i, s := range bad {
		if err := s.Validate(); err == nil {
			t.Errorf("case %d: want an error for %+v", i, s)
		}
	}
}

func TestSoilHeatAndLatent(t *testing.T) {
	// Handy and Spangler (2007) Example 11.7 [read]: dry unit
	// weight 18.9 kN/m3, w 12 %: L about 77,000 kJ/m3. rho_d = 18900/9.81.
	s := Soil{Texture: Sand, DryDensity: 18900 / 9.81, WaterContent: 0.12}
	if L := s.LatentHeat(); math.Abs(L-77e6)/77e6 > 0.01 {
		t.Errorf("latent heat %g J/m3, want about 7.7e7", L)
	}
	// C = rho_d (c_s + w c) [derived from the definition].
	cf, cu := s.HeatCapacity()
	if want := s.DryDensity * (DefaultSolidsHeat + 0.12*4190); math.Abs(cu-want) > 1e-6 {
		t.Errorf("unfrozen C %g, want %g", cu, want)
	}
	if want := s.DryDensity * (DefaultSolidsHeat + 0.12*2000); math.Abs(cf-want) > 1e-6 {
		t.Errorf("frozen C %g, want %g", cf, want)
	}
	// The US Army manuals' 0.17 Btu/(lb F) (from memory) is 712 J/(kg K).
	if math.Abs(DefaultSolidsHeat-711.76) > 0.01 {
		t.Errorf("DefaultSolidsHeat %g", DefaultSolidsHeat)
	}
}

func TestSoilLayer(t *testing.T) {
	s := Soil{Texture: SiltClay, DryDensity: 100 * lbPerFt3, WaterContent: 0.20, FreezingPoint: -0.1, FreezingRange: 0.5}
	l, err := s.Layer("clay", 0.5)
	if err != nil {
		t.Fatal(err)
	}
	p, _ := s.Properties()
	if l.Thickness != 0.5 || l.Conductivity != p.ConductivityUnfrozen || l.HeatCapacity != p.HeatCapacityUnfrozen {
		t.Errorf("layer %+v does not carry the unfrozen properties %+v", l, p)
	}
	f := l.Freeze
	if f == nil || f.Point != -0.1 || f.Range != 0.5 || f.LatentHeat != s.LatentHeat() ||
		f.ConductivityFrozen != p.ConductivityFrozen || f.HeatCapacityFrozen != p.HeatCapacityFrozen {
		t.Errorf("freeze %+v does not match %+v", f, p)
	}
	// A dry soil (Johansen) has no latent heat and no Freeze.
	d := Soil{Texture: Sand, DryDensity: 1600, Model: ModelJohansen}
	l, err = d.Layer("dry", 1)
	if err != nil {
		t.Fatal(err)
	}
	if l.Freeze != nil {
		t.Error("dry soil layer should not freeze")
	}
	if _, err := s.Layer("zero", 0); err == nil {
		t.Error("zero thickness: want an error")
	}
}

func TestParse(t *testing.T) {
	for in, want := range map[string]Texture{"sand": Sand, " Gravel": Sand, "silt-clay": SiltClay, "CLAY": SiltClay} {
		got, err := ParseTexture(in)
		if err != nil || got != want {
			t.Errorf("ParseTexture(%q) = %v, %v", in, got, err)
		}
	}
	if _, err := ParseTexture("peat"); err == nil {
		t.Error("peat: want an error (no sourced model)")
	}
	if m, err := ParseModel("Johansen"); err != nil || m != ModelJohansen {
		t.Errorf("ParseModel: %v %v", m, err)
	}
	if _, err := ParseModel("x"); err == nil {
		t.Error("ParseModel(x): want an error")
	}
	if Sand.String() != "sand" || SiltClay.String() != "silt-clay" || ModelJohansen.String() != "johansen" {
		t.Error("String keys")
	}
}
