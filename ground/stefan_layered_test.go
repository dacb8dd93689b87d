package ground

import (
	"math"
	"testing"

	"tempstack/solver"
)

func frozenLayer(d, k, L float64) solver.Layer {
	return solver.Layer{Name: "soil", Thickness: d, Conductivity: k, HeatCapacity: 2e6,
		Freeze: &solver.Freezing{LatentHeat: L, ConductivityFrozen: k, HeatCapacityFrozen: 1.8e6}}
}

// TestStefanLayeredHomogeneous: one layer, and the same soil cut into many
// thin layers, give Stefan's formula X = sqrt(2 k F 86400 / L); Handy and
// Spangler Example 11.7 [read]: k 3.3, L about 77,000 kJ/m3, 50 degC day
// freeze 0.6 m (0.609 m [derived]).
func TestStefanLayeredHomogeneous(t *testing.T) {
	const k, L, F = 3.3, 77.0e6, 50.0
	want, _ := Stefan(k, L, F)
	for _, n := range []int{1, 7, 100} {
		var ls []solver.Layer
		for i := 0; i < n; i++ {
			ls = append(ls, frozenLayer(1.0/float64(n), k, L))
		}
		got, _, err := StefanLayered(ls, F)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(got-want) > 1e-9 {
			t.Errorf("%d layers: %.9f m, want %.9f m", n, got, want)
		}
	}
	if math.Abs(want-0.609) > 0.001 {
		t.Errorf("Handy and Spangler Example 11.7: %.4f m, want 0.609 m [derived]", want)
	}
}

// TestStefanLayeredTwoLayers checks the partial second layer by hand
// [derived]: a 0.3 m layer (k 2, L 50e6) over k 1, L 100e6, F 80 K day.
// First layer needs 50e6*0.3*(0.3/4)/86400 = 13.02 K day; the rest,
// 66.98 K day = 5.787e6 K s, freezes x of the second layer from
// 50e6 x^2 + 100e6*0.15 x = 5.787e6 -> x = 0.2143 m.
func TestStefanLayeredTwoLayers(t *testing.T) {
	ls := []solver.Layer{frozenLayer(0.3, 2, 50e6), frozenLayer(5, 1, 100e6)}
	got, needed, err := StefanLayered(ls, 80)
	if err != nil {
		t.Fatal(err)
	}
	first := 50e6 * 0.3 * (0.3 / 4) / 86400
	rest := (80 - first) * 86400
	x := (-100e6*0.15 + math.Sqrt(100e6*0.15*100e6*0.15+4*50e6*rest)) / (2 * 50e6)
	if math.Abs(got-(0.3+x)) > 1e-12 || math.Abs(needed[0]-first) > 1e-9 {
		t.Errorf("got %.6f m (needed %v), want %.6f m", got, needed, 0.3+x)
	}
	if _, _, err := StefanLayered([]solver.Layer{{Name: "rock", Thickness: 1, Conductivity: 3, HeatCapacity: 2e6}}, 10); err == nil {
		t.Error("a layer without latent heat was accepted")
	}
	if _, _, err := StefanLayered(ls, -1); err == nil {
		t.Error("a negative index was accepted")
	}
}
