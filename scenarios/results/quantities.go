package results

import (
	"math"
	"strings"
)

// QuantityInfo is a figure a study can compare, seek and spread, declared
// once: its key (in Summary and results.json, with its unit), the kind of
// scenario that has it, how it is named and printed, and how it is read
// from a run's Results.
type QuantityInfo struct {
	Key   string // e.g. "u_value_W_m2K"
	Kind  Kind   // the scenario kind that has it
	Words string // in plain language, for sentences and the terminal
	// Label is the report's column heading, with the unit in typographic
	// form ("U-value (W/(m²·K))").
	Label string
	// Unit is the unit as written in results.json and on the terminal
	// ("" for a ratio).
	Unit string
	// Decimals is the number of decimals in fixed notation; -1: three
	// significant digits.
	Decimals int
	// Read reads the quantity from a run's results, false when it was not
	// computed (or the run is of another kind).
	Read func(r *Results) (float64, bool)
}

// quantities are the study quantities of both kinds, in display order. A
// new output quantity a study can use is one row here.
var quantities = []QuantityInfo{
	{"u_value_W_m2K", Wall, "U-value", "U-value (W/(m²·K))", "W/(m2 K)", -1,
		func(r *Results) (float64, bool) { return r.Steady.UValue_W_m2K, r.Kind == Wall }},
	{"decrement_factor", Wall, "decrement factor", "Decrement factor f", "", -1,
		firstPeriodic(func(p PeriodicResult) float64 { return p.DecrementFactor })},
	// time_shift_h is the same as periodic[].time_shift_h, in [0, period);
	// the whole lag (the one a target should seek) is time_shift_unwrapped_h.
	{"time_shift_h", Wall, "time shift", "Time shift (h)", "h", 1,
		firstPeriodic(func(p PeriodicResult) float64 { return p.TimeShift_h })},
	{"time_shift_unwrapped_h", Wall, "whole time shift", "Whole time shift (h)", "h", 1,
		firstPeriodic(func(p PeriodicResult) float64 { return p.TimeShiftUnwrapped_h })},
	{"surface_factor", Wall, "surface factor", "Surface factor F", "", -1,
		firstPeriodic(func(p PeriodicResult) float64 { return p.SurfaceFactor })},
	{"periodic_transmittance_W_m2K", Wall, "periodic transmittance", "|Y₁₂| (W/(m²·K))", "W/(m2 K)", -1,
		firstPeriodic(func(p PeriodicResult) float64 { return p.PeriodicTransmittance_W_m2K })},
	{"inside_admittance_W_m2K", Wall, "inside admittance", "|Y₁₁| inside (W/(m²·K))", "W/(m2 K)", -1,
		firstPeriodic(func(p PeriodicResult) float64 { return p.InsideAdmittance_W_m2K })},
	{"inside_areal_heat_capacity_kJ_m2K", Wall, "inside areal heat capacity", "κ₁ inside (kJ/(m²·K))", "kJ/(m2 K)", -1,
		firstPeriodic(func(p PeriodicResult) float64 { return p.InsideArealHeatCapacity_kJ_m2K })},
	{"max_frost_depth_m", Ground, "simulated frost depth", "Simulated max frost depth (m)", "m", 2,
		func(r *Results) (float64, bool) {
			return frostValue(r, func(f *Frost) *float64 { return f.MaxFrostDepth_m }, r.Simulation != nil)
		}},
	{"stefan_depth_m", Ground, "Stefan depth", "Stefan depth (m)", "m", 2,
		func(r *Results) (float64, bool) {
			return frostValue(r, func(f *Frost) *float64 { return f.StefanDepth_m }, true)
		}},
	{"modified_berggren_depth_m", Ground, "modified Berggren depth", "Modified Berggren depth (m)", "m", 2,
		func(r *Results) (float64, bool) {
			return frostValue(r, func(f *Frost) *float64 { return f.ModifiedBerggrenDepth_m }, true)
		}},
	{"freezing_index_Cd", Ground, "air freezing index", "Air freezing index (°C·d)", "degC day", 0,
		func(r *Results) (float64, bool) {
			return frostValue(r, func(f *Frost) *float64 { return f.FreezingIndex_Cd }, true)
		}},
	// Room quantities: the simulated last cycle, the exact periodic peak,
	// the hours above the first threshold and what the elements' mass
	// takes off the peak.
	{"operative_max_C", Room, "peak operative temperature", "Peak operative temperature (°C)", "degC", 2,
		roomValue(func(rm *RoomResult) *float64 { return &rm.Simulation.OperativeMax_C })},
	{"air_max_C", Room, "peak room air temperature", "Peak room air temperature (°C)", "degC", 2,
		roomValue(func(rm *RoomResult) *float64 { return &rm.Simulation.AirMax_C })},
	{"exact_air_max_C", Room, "exact periodic peak air temperature", "Exact peak air temperature (°C)", "degC", 2,
		roomValue(func(rm *RoomResult) *float64 { return &rm.Periodic.AirMax_C })},
	{"hours_above_h", Room, "hours a day above the first threshold", "Hours a day above the first threshold (h)", "h", 1,
		roomValue(func(rm *RoomResult) *float64 {
			if len(rm.Simulation.HoursAbove) == 0 {
				return nil
			}
			return &rm.Simulation.HoursAbove[0].Hours
		})},
	{"mass_peak_reduction_K", Room, "peak lowered by the mass", "Peak lowered by the mass (K)", "K", 2,
		roomValue(func(rm *RoomResult) *float64 {
			if rm.MassRemoved == nil {
				return nil
			}
			return rm.MassRemoved.PeakReduction_K
		})},
}

// roomValue reads a room quantity; not computed without a room simulation.
func roomValue(f func(*RoomResult) *float64) func(*Results) (float64, bool) {
	return func(r *Results) (float64, bool) {
		if r.Room == nil || r.Room.Simulation == nil {
			return math.NaN(), false
		}
		v := f(r.Room)
		if v == nil {
			return math.NaN(), false
		}
		return *v, true
	}
}

// firstPeriodic reads a quantity of the first analysis period.
func firstPeriodic(f func(PeriodicResult) float64) func(*Results) (float64, bool) {
	return func(r *Results) (float64, bool) {
		if len(r.Periodic) == 0 {
			return math.NaN(), false
		}
		return f(r.Periodic[0]), true
	}
}

// frostValue reads a frost quantity; a value that was not computed is not
// defined (NaN, false).
func frostValue(r *Results, f func(*Frost) *float64, ok bool) (float64, bool) {
	if r.Frost == nil || !ok || f(r.Frost) == nil {
		return math.NaN(), false
	}
	return *f(r.Frost), true
}

// Quantities returns the study quantities of both kinds, in display order.
func Quantities() []QuantityInfo { return append([]QuantityInfo(nil), quantities...) }

// LookupQuantity returns the study quantity with the given key, and
// whether there is one.
func LookupQuantity(key string) (QuantityInfo, bool) {
	for _, q := range quantities {
		if q.Key == key {
			return q, true
		}
	}
	return QuantityInfo{}, false
}

// Quantity returns how the study quantity key is named and printed. An
// unknown key is named by itself, with the unit its suffix spells (and no
// Kind, Label or Read).
func Quantity(key string) QuantityInfo {
	if q, ok := LookupQuantity(key); ok {
		return q
	}
	q := QuantityInfo{Key: key, Words: strings.ReplaceAll(key, "_", " "), Decimals: -1}
	for _, s := range []struct{ suffix, unit string }{
		{"_W_m2K", "W/(m2 K)"}, {"_kJ_m2K", "kJ/(m2 K)"}, {"_Cd", "degC day"}, {"_m", "m"}, {"_h", "h"}, {"_C", "degC"}, {"_K", "K"},
	} {
		if strings.HasSuffix(key, s.suffix) {
			q.Words, q.Unit = strings.ReplaceAll(strings.TrimSuffix(key, s.suffix), "_", " "), s.unit
			break
		}
	}
	return q
}
