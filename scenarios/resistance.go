package scenarios

import (
	"fmt"
	"math"
	"strconv"

	"gopkg.in/yaml.v3"

	"tempstack/climate"
	"tempstack/layers"
	"tempstack/scenarios/results"
)

// ResistancePeriod is a time of each year when the surface resistance of a
// side is not its usual value: a snow cover on the ground in winter, a
// shutter closed over a window in summer.
type ResistancePeriod struct {
	From, To float64 // s after 1 January 00:00 of each year; To < From runs over the new year
	Value    float64 // m2 K/W
	Line     int     // line of the period, for messages
}

// contains reports whether the time of year y (s, 0 to a year) lies in p.
func (p ResistancePeriod) contains(y float64) bool {
	if p.From <= p.To {
		return y >= p.From && y < p.To
	}
	return y >= p.From || y < p.To
}

// decodeResistance reads the resistance of a side: a number (m2 K/W), or
// {value, periods: [{from_day, to_day, value}, ...]} for a resistance that
// changes with the time of year.
func (d *decoder) decodeResistance(o *object, value *float64, periods *[]ResistancePeriod) {
	if !o.has("resistance") {
		return
	}
	if o.values["resistance"].Kind == yaml.ScalarNode {
		o.nonNegative("resistance", layers.Resistance, value)
		return
	}
	ro := o.child("resistance", sideResistanceKeys)
	if ro == nil {
		return
	}
	if !ro.nonNegative("value", layers.Resistance, value) && !ro.has("value") {
		ro.missing("value", "the resistance outside the periods, m2 K/W")
	}
	items, ok := ro.list("periods")
	if !ok && !ro.has("periods") {
		ro.missing("periods", "a list of {from_day, to_day, value}; a constant resistance is a plain number")
	}
	for i, n := range items {
		po := d.object(n, fmt.Sprintf("%s.periods[%d]", ro.path, i+1), resistancePeriodKeys)
		if po == nil {
			continue
		}
		p := ResistancePeriod{Line: n.Line}
		p.From = po.dayOfYear("from_day")
		p.To = po.dayOfYear("to_day")
		if !po.nonNegative("value", layers.Resistance, &p.Value) && !po.has("value") {
			po.missing("value", "the resistance during the period, m2 K/W")
		}
		if !po.clean() {
			continue
		}
		if p.From == p.To {
			po.failf("to_day", "the period is empty (to_day equals from_day)")
			continue
		}
		for _, q := range *periods {
			if overlaps(p, q) {
				po.failf("from_day", "the period overlaps the one on line %d", q.Line)
				break
			}
		}
		*periods = append(*periods, p)
	}
}

// dayOfYear reads a required day of the year, 1 (1 January, 00:00) to 366
// (the end of the year), and returns it as s after 1 January 00:00.
func (o *object) dayOfYear(key string) float64 {
	var s string
	if !o.str(key, &s) {
		if !o.has(key) {
			o.missing(key, "a day of the year, 1 = 1 January")
		}
		return math.NaN()
	}
	x, err := strconv.ParseFloat(s, 64)
	if err != nil || !(x >= 1 && x <= 366) {
		o.failf(key, "a day of the year lies from 1 (1 January) to 366 (the end of the year), got %q", s)
		return math.NaN()
	}
	return (x - 1) * climate.Day
}

// overlaps reports whether two periods share a time of year: two arcs of
// the year overlap when one holds the other's start.
func overlaps(a, b ResistancePeriod) bool { return a.contains(b.From) || b.contains(a.From) }

// resistanceAt is the surface resistance of the side at time t (s), nil
// when it does not vary.
func (sd Environment) resistanceAt() func(t float64) float64 {
	if len(sd.ResistancePeriods) == 0 {
		return nil
	}
	base, periods := sd.Resistance, sd.ResistancePeriods
	return func(t float64) float64 {
		y := math.Mod(t, climate.Year)
		if y < 0 {
			y += climate.Year
		}
		for _, p := range periods {
			if p.contains(y) {
				return p.Value
			}
		}
		return base
	}
}

// resistanceVaries reports whether the resistance of a side changes in the
// course of a year.
func (sd Environment) resistanceVaries() bool {
	for _, p := range sd.ResistancePeriods {
		if p.Value != sd.Resistance {
			return true
		}
	}
	return false
}

// resistanceInfo is the periods of a side for results.json.
func resistanceInfo(sd Environment) []results.ResistancePeriod {
	var out []results.ResistancePeriod
	for _, p := range sd.ResistancePeriods {
		out = append(out, results.ResistancePeriod{FromDay: p.From/climate.Day + 1, ToDay: p.To/climate.Day + 1, Resistance_m2K_W: p.Value})
	}
	return out
}

// resistanceNote says what a resistance that varies in time changes on
// the side called name: only the simulation follows it.
func resistanceNote(name string, usual float64) string {
	return fmt.Sprintf("the %s resistance changes in the course of the year: the simulation follows it; the exact periodic analysis and the closed forms use its value outside the periods, %g m2 K/W", name, usual)
}
