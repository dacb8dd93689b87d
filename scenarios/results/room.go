package results

import "strconv"

// RoomResult is the result of a room run (kind: room): the exact periodic
// solution of the air node (the admittance method of one room, with the
// ISO 13786 matrices of every element), the coupled transient simulation,
// and the same room with every element's heat capacity removed.
//
// Temperatures in degC, heat in kWh per day, areas in m2. The operative
// temperature is the mean of the air temperature and the area-weighted
// mean inside surface temperature of the elements and windows (a window's
// inside surface from the steady flux through its U value and Rsi 0.13).
type RoomResult struct {
	Volume_m3            float64   `json:"volume_m3"`
	AirHeatCapacity_kJ_K float64   `json:"air_heat_capacity_kJ_K"`
	VentilationDay_ach   float64   `json:"ventilation_day_ach"`             // air changes per hour by day (all day without a night rate)
	VentilationNight_ach *float64  `json:"ventilation_night_ach,omitempty"` // at night, when scheduled
	NightFrom_h          *float64  `json:"night_from_h,omitempty"`
	NightTo_h            *float64  `json:"night_to_h,omitempty"`
	MeanConductance_W_K  float64   `json:"mean_conductance_W_K"`  // ventilation (daily mean) + windows' U A, to the outdoor air
	GainsMean_W          float64   `json:"gains_mean_W"`          // internal gains and transmitted sun (wherever it is absorbed), daily mean
	OperativeTemperature string    `json:"operative_temperature"` // how it is defined
	Thresholds_C         []float64 `json:"thresholds_C"`

	Elements []RoomElement `json:"elements"`
	Windows  []RoomWindow  `json:"windows"`

	Periodic   RoomPeriodic    `json:"periodic"`
	Simulation *RoomSimulation `json:"simulation"`

	// MassRemoved is the same room with every element's heat capacity
	// removed (same U values, the air's capacity kept).
	MassRemoved *RoomMassRemoved `json:"mass_removed"`

	Notes []string `json:"notes,omitempty"`

	Series RoomSeries `json:"-"`
}

// RoomElement describes one element as the run used it.
type RoomElement struct {
	Name                     string  `json:"name"`
	Area_m2                  float64 `json:"area_m2"`
	Orientation              string  `json:"orientation"`
	Back                     string  `json:"back"` // outside | adiabatic
	Construction             string  `json:"construction,omitempty"`
	Sunlit                   bool    `json:"sunlit,omitempty"`
	Layers                   []Layer `json:"layers"`
	UValue_W_m2K             float64 `json:"u_value_W_m2K"` // 0 for an adiabatic back means no steady heat, the U of the layers is still given
	ArealHeatCapacity_kJ_m2K float64 `json:"areal_heat_capacity_kJ_m2K"`
	// InsideAdmittance_W_m2K is |Y| seen from the room air at the longest
	// period: |Y11| backed by the outside, |Z21/Z22| adiabatic.
	InsideAdmittance_W_m2K float64 `json:"inside_admittance_W_m2K"`
	// HeatToAir_kWh_day and HeatFromAir_kWh_day are the heat the element
	// gave to the room air and took from it over the simulated cycle, per
	// day; ShareOfHeatToAir is its part of all heat delivered to the air.
	HeatToAir_kWh_day   *float64 `json:"heat_to_air_kWh_day"`
	HeatFromAir_kWh_day *float64 `json:"heat_from_air_kWh_day"`
	ShareOfHeatToAir    *float64 `json:"share_of_heat_to_air"`
	ShareOfHeatFromAir  *float64 `json:"share_of_heat_from_air"`
	// WindowSunMean_W is the windows' transmitted sun absorbed at the
	// element's inside surface (sun_to), mean over the cycle, W; absent
	// when no window sends sun to it. That heat reaches the air through
	// the element, so it is part of HeatToAir_kWh_day.
	WindowSunMean_W *float64 `json:"window_sun_mean_W,omitempty"`
}

// RoomWindow describes one window.
type RoomWindow struct {
	Name         string  `json:"name"`
	Area_m2      float64 `json:"area_m2"`
	UValue_W_m2K float64 `json:"u_value_W_m2K"`
	GValue       float64 `json:"g_value"`
	SolarMean_W  float64 `json:"solar_gain_mean_W"` // g A I, daily mean of the clipped irradiance
	// SunTo are the parts of the transmitted sun absorbed at elements'
	// inside surfaces and SunToAirFraction the rest, delivered to the air;
	// both absent when the scenario gives no sun_to: all of it goes to
	// the air.
	SunTo            []RoomSunShare `json:"sun_to,omitempty"`
	SunToAirFraction *float64       `json:"sun_to_air_fraction,omitempty"`
}

// RoomSunShare is the part Fraction (0..1) of a window's transmitted sun
// absorbed at the inside surface of the element named Element.
type RoomSunShare struct {
	Element  string  `json:"element"`
	Fraction float64 `json:"fraction"`
}

// RoomPeriodic is the exact periodic solution over one cycle of the
// longest period of the forcing.
type RoomPeriodic struct {
	Period_h        float64 `json:"period_h"`
	Harmonics       int     `json:"harmonics"` // harmonics of the period solved (besides the mean)
	AirMean_C       float64 `json:"air_mean_C"`
	AirMax_C        float64 `json:"air_max_C"`
	AirMin_C        float64 `json:"air_min_C"`
	OperativeMean_C float64 `json:"operative_mean_C"`
	OperativeMax_C  float64 `json:"operative_max_C"`
	OperativeMin_C  float64 `json:"operative_min_C"`
	AirMaxHour_h    float64 `json:"air_max_hour_h"` // time of day (h) of the exact peak
}

// HoursAbove is the time a temperature spends above a threshold.
type HoursAbove struct {
	Threshold_C float64 `json:"threshold_C"`
	Hours       float64 `json:"hours"` // per day of the simulated cycle
}

// RoomPath is the heat one path (ventilation and windows, gains, an
// element) delivered to and took from the air over the simulated cycle.
type RoomPath struct {
	Name            string  `json:"name"`
	ToAir_kWh_day   float64 `json:"to_air_kWh_day"`
	FromAir_kWh_day float64 `json:"from_air_kWh_day"`
}

// RoomSimulation is the coupled transient simulation; values over the last
// simulated cycle.
type RoomSimulation struct {
	AirMax_C                   float64      `json:"air_max_C"`
	AirMin_C                   float64      `json:"air_min_C"`
	OperativeMax_C             float64      `json:"operative_max_C"`
	OperativeMin_C             float64      `json:"operative_min_C"`
	HoursAbove                 []HoursAbove `json:"hours_above"`
	HoursAboveBasis            string       `json:"hours_above_basis"` // operative temperature
	EnergyBalanceRelativeError float64      `json:"energy_balance_relative_error"`
	// ExactCheck_K is the largest difference between the exact periodic
	// air temperature and the simulated one over the cycle, the room
	// simulated as the exact method sees it (the ventilation at its daily
	// mean): the numerical error of the simulation, for a settled cycle.
	ExactCheck_K *float64 `json:"exact_check_K"`
	Step_h       float64  `json:"step_h"`
	WarmUp_h     float64  `json:"warm_up_h"` // simulated before the reported cycle
	// SettleCycles are the cycles repeated before the reported one
	// (warm_up: auto) until the room repeated itself within
	// SettleTolerance; SettleChange_K is the change of the last of them
	// (null for a fixed warm-up); Settled is false when the cycles ran out
	// first (true for a fixed warm-up: nothing was sought).
	SettleCycles   int      `json:"settle_cycles"`
	SettleChange_K *float64 `json:"settle_change_K"`
	Settled        bool     `json:"settled"`
	Cycle_h        float64  `json:"cycle_h"`
	Cells          int      `json:"cells"`
	// CycleChange_K is the largest change of the air or an inside surface
	// temperature between the start and the end of the reported cycle: 0
	// when the cycle repeats (the warm-up was long enough).
	CycleChange_K float64    `json:"cycle_change_K"`
	Paths         []RoomPath `json:"paths"`
}

// RoomMassRemoved compares the room with the same room without the heat
// capacity of its elements.
type RoomMassRemoved struct {
	Periodic   RoomPeriodic    `json:"periodic"`
	Simulation *RoomSimulation `json:"simulation"`
	// PeakReduction_K is the simulated peak operative temperature without
	// the mass minus with it: what the mass takes off the peak.
	PeakReduction_K    *float64     `json:"peak_reduction_K"`
	AirPeakReduction_K *float64     `json:"air_peak_reduction_K"`
	HoursSaved         []HoursAbove `json:"hours_saved"` // hours above each threshold without the mass minus with it, per day
	Statement          string       `json:"statement"`
}

// RoomSeries is the chart and CSV data of a room run.
type RoomSeries struct {
	// One cycle of the exact periodic solution.
	CycleTime_h            []float64
	CycleOutdoor_C         []float64
	CycleAir_C             []float64
	CycleOperative_C       []float64
	CycleAirNoMass_C       []float64
	CycleOperativeNoMass_C []float64

	// The simulation, every sample (warm-up included).
	Time_h            []float64
	Outdoor_C         []float64
	Air_C             []float64
	Operative_C       []float64
	AirNoMass_C       []float64
	OperativeNoMass_C []float64
	Surface_C         [][]float64 // per element
	Heat_W            [][]float64 // per element, into the air, mean over the interval ending at the sample
	CycleStart_h      float64     // where the reported cycle starts
}

// roomCSV returns room_cycle.csv and room_series.csv.
func roomCSV(r *Results) []CSVFile {
	rm := r.Room
	if rm == nil {
		return nil
	}
	s := &rm.Series
	var out []CSVFile
	if len(s.CycleTime_h) > 0 {
		out = append(out, table("room_cycle.csv",
			[]string{"time_h", "outdoor_C", "air_C", "operative_C", "air_no_mass_C", "operative_no_mass_C"},
			columns(s.CycleTime_h, s.CycleOutdoor_C, s.CycleAir_C, s.CycleOperative_C, s.CycleAirNoMass_C, s.CycleOperativeNoMass_C)))
	}
	if len(s.Time_h) > 0 {
		header := []string{"time_h", "outdoor_C", "air_C", "operative_C", "air_no_mass_C", "operative_no_mass_C"}
		cols := [][]float64{s.Time_h, s.Outdoor_C, s.Air_C, s.Operative_C, s.AirNoMass_C, s.OperativeNoMass_C}
		for k := range rm.Elements {
			if k < len(s.Surface_C) {
				header = append(header, "surface_"+strconv.Itoa(k+1)+"_C")
				cols = append(cols, s.Surface_C[k])
			}
		}
		for k := range rm.Elements {
			if k < len(s.Heat_W) {
				header = append(header, "heat_to_air_"+strconv.Itoa(k+1)+"_W")
				cols = append(cols, s.Heat_W[k])
			}
		}
		out = append(out, table("room_series.csv", header, columns(cols...)))
	}
	return out
}
