package layers

import (
	"math"
	"testing"
)

// TestDegreeDays: a freezing index in degC day, K h or degF day. ISO 13793
// writes F in K h = 24 x the sum of daily degrees below 0 degC
// [2nd-hand]; a degF interval is exactly 5/9 K (NIST SP 811).
func TestDegreeDays(t *testing.T) {
	cases := []struct {
		in   string
		want float64
	}{
		{"1200", 1200},
		{"1200 Cd", 1200},
		{"1200 degC day", 1200},
		{"1200 K d", 1200},
		{"28800 K h", 1200},
		{"1800 degF day", 1000},
	}
	for _, c := range cases {
		got, err := ParseQuantity(c.in, DegreeDays)
		if err != nil || math.Abs(got-c.want) > 1e-9 {
			t.Errorf("%q: %v, %v; want %v", c.in, got, err, c.want)
		}
	}
	if _, err := ParseQuantity("12 kg", DegreeDays); err == nil {
		t.Error("a mass unit was accepted as degree-days")
	}
}
