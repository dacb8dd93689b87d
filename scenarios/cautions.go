package scenarios

import (
	"tempstack/climate"
	"tempstack/scenarios/results"
)

// recordWarnings returns the short-record warnings of a run that follows a
// measured air-temperature record, worded as the indices command prints
// them; nil for other forcings.
func recordWarnings(s *Scenario, r *results.Results) []string {
	if s.Kind != Ground || s.Outside.Temperature == nil || s.Outside.Temperature.Measured == nil {
		return nil
	}
	ws, err := recordWinters(s.Outside.Temperature.Measured)
	if err != nil {
		return []string{"the record holds no winter that can be read: " + err.Error()}
	}
	years := 100.0 // the return period of Frost.ReturnPeriod
	if r.Frost != nil && r.Frost.ReturnPeriod != nil {
		years = r.Frost.ReturnPeriod.Years
	}
	return climate.RecordWarnings(ws, years)
}
