package results

import (
	"strings"
	"testing"
)

// TestQuantitiesDeclaredOnce: every study quantity carries its kind, words,
// report label and reader, its unit agrees with the unit its key spells,
// and its label shows a unit exactly when it has one.
func TestQuantitiesDeclaredOnce(t *testing.T) {
	seen := map[string]bool{}
	for _, q := range Quantities() {
		if q.Key == "" || q.Words == "" || q.Label == "" || q.Read == nil || (q.Kind != Wall && q.Kind != Ground && q.Kind != Room) {
			t.Errorf("%q: incomplete row %+v", q.Key, q)
		}
		if seen[q.Key] {
			t.Errorf("%q declared twice", q.Key)
		}
		seen[q.Key] = true
		bare := QuantityInfo{Key: q.Key}
		for _, s := range []struct{ suffix, unit string }{{"_W_m2K", "W/(m2 K)"}, {"_kJ_m2K", "kJ/(m2 K)"}, {"_Cd", "degC day"}, {"_m", "m"}, {"_h", "h"}, {"_C", "degC"}, {"_K", "K"}} {
			if strings.HasSuffix(q.Key, s.suffix) {
				bare.Unit = s.unit
				break
			}
		}
		if bare.Unit != q.Unit {
			t.Errorf("%q: unit %q, the key spells %q", q.Key, q.Unit, bare.Unit)
		}
		if hasUnit := strings.HasSuffix(q.Label, ")") && strings.Contains(q.Label, " ("); hasUnit != (q.Unit != "") {
			t.Errorf("%q: label %q and unit %q disagree", q.Key, q.Label, q.Unit)
		}
		if got, ok := q.Read(&Results{Kind: other(q.Kind)}); ok {
			t.Errorf("%q read %g from a run of the other kind", q.Key, got)
		}
	}
	if q := Quantity("u_value_W_m2K"); q.Label == "" || q.Read == nil {
		t.Error("Quantity does not return the declared row")
	}
}

// other returns a kind that is not k.
func other(k Kind) Kind {
	if k == Wall {
		return Ground
	}
	return Wall
}
