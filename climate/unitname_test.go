package climate

import "testing"

func TestLooksFahrenheit(t *testing.T) {
	yes := []string{"temp_F", "air-f", "T (F)", "T [°F]", "degF", "Temp degF", "temp_deg_F", "°F", "tempF", "airTempF", "Fahrenheit", "F"}
	no := []string{"", "temp", "air_temperature", "temp_C", "degC", "flow", "RH", "feet", "tempf2", "SURFACE", "OF", "wind_dir"}
	for _, s := range yes {
		if !LooksFahrenheit(s) {
			t.Errorf("LooksFahrenheit(%q) = false, want true", s)
		}
	}
	for _, s := range no {
		if LooksFahrenheit(s) {
			t.Errorf("LooksFahrenheit(%q) = true, want false", s)
		}
	}
}
