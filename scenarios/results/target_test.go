package results

import "testing"

// TestRoundToTolerance: a target value is printed on the grid of the
// largest 1, 2 or 5 times a power of ten not above its tolerance, with
// that grid's decimals. Expected values worked by hand [derived].
func TestRoundToTolerance(t *testing.T) {
	for _, c := range []struct {
		v, tol, step, want float64
	}{
		{99.87, 0.2, 0.2, 99.8},    // 99.87/0.2 = 499.35 -> 499
		{99.87, 0.5, 0.5, 100},     // 199.74 -> 200
		{142.37, 0.25, 0.2, 142.4}, // a tolerance of 0.25 gives the grid 0.2
		{0.2333, 0.001, 0.001, 0.233},
		{0.2337, 0.003, 0.002, 0.234}, // 116.85 -> 117
		{1234.5, 70, 50, 1250},        // 24.69 -> 25
		{-3.14159, 0.01, 0.01, -3.14},
		{12.5, 0.08, 0.05, 12.5},
	} {
		if s := TargetStep(c.tol); s != c.step {
			t.Errorf("TargetStep(%g) = %g, want %g", c.tol, s, c.step)
		}
		if got := RoundToTolerance(c.v, c.tol); got != c.want {
			t.Errorf("RoundToTolerance(%g, %g) = %v, want %v", c.v, c.tol, got, c.want)
		}
	}
	// Nothing to round to: the value comes back unchanged.
	for _, tol := range []float64{0, -1} {
		if got := RoundToTolerance(99.87, tol); got != 99.87 {
			t.Errorf("RoundToTolerance(99.87, %g) = %v, want it unchanged", tol, got)
		}
	}
}

// TestQuantityFormat: a quantity is written with the decimals its row
// declares, or three significant digits (common practice for a derived
// figure of a few per cent uncertainty).
func TestQuantityFormat(t *testing.T) {
	for _, c := range []struct {
		key  string
		v    float64
		want string
	}{
		{"time_shift_unwrapped_h", 10.0081, "10.0"}, // one decimal
		{"time_shift_h", 7.1234, "7.1"},             // one decimal
		{"max_frost_depth_m", 1.23456, "1.23"},      // two decimals
		{"u_value_W_m2K", 0.25962, "0.260"},         // three significant digits
		{"decrement_factor", 0.012345, "0.0123"},    // three significant digits
		{"not_a_quantity_K", 1234.5, "1230"},        // unknown key: three significant digits
		{"u_value_W_m2K", 0, "0"},
	} {
		if got := Quantity(c.key).Format(c.v); got != c.want {
			t.Errorf("%s: Format(%g) = %q, want %q", c.key, c.v, got, c.want)
		}
	}
}
