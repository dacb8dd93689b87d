package climate

import (
	"math"
	"testing"
)

// TestWinterColdestAtRecordEnd: a record that stops in the middle of a
// cold spell, its coldest point (the lowest point of the cumulative
// degree-day curve) on its very last day. The air falls linearly from
// +10 degC on day 181 to -10 degC on day 381, sampled hourly, and ends
// there. The daily means are the values at mid-day (the mean of a linear
// function), -0.05, -0.15, ..., -9.95 degC on days 281 to 380, so the
// freezing season runs from day 281 to the end of the record, 100 days,
// and the freezing index is 0.1 x (0.5 + 1.5 + ... + 99.5) = 500 degC day
// (cumulative-curve definition of the freezing index, UFC 3-130-01
// [memory]; [derived]).
func TestWinterColdestAtRecordEnd(t *testing.T) {
	var ts, vs []float64
	for h := 181 * 24; h <= 381*24; h++ {
		x := float64(h) * 3600
		ts = append(ts, x)
		vs = append(vs, 10-20*(x/Day-181)/200)
	}
	ws, err := Winters(ts, vs, WinterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(ws) != 1 {
		t.Fatalf("%d winters, want 1", len(ws))
	}
	w := ws[0]
	if math.Abs(w.FreezingIndex-500) > 1e-6 || w.Days != 100 ||
		math.Abs(w.Start/Day-281) > 1e-9 || math.Abs(w.End/Day-381) > 1e-9 {
		t.Errorf("winter %+v: want index 500 degC day, 100 days from day 281 to 381", w)
	}
	if w.Complete {
		t.Error("a winter cut by the end of the record counts as complete")
	}
}
