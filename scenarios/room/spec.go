// Package room runs a room scenario: one well-mixed air node joined to
// layered elements (walls, floor, roof), massless windows, ventilation and
// internal gains. It solves the room two ways, the exact periodic solution
// (ISO 13786 matrices per Fourier harmonic of the forcing) and the coupled
// time-step simulation (solver.RoomSimulate), and both again with the
// elements' mass removed, and reports the result as a results.RoomResult.
//
// The package takes a plain description of the room (Spec): layers,
// areas, the environment behind each element as a function of time and
// the forcing harmonics the exact method needs. Decoding a scenario file
// into a Spec is the job of package scenarios. Temperatures are in degC,
// times in s, heat flows in W, positive into the room air.
package room

import (
	"tempstack/climate"
	"tempstack/layers"
	"tempstack/scenarios/results"
	"tempstack/solver"
)

// AirHeatCapacity is the volumetric heat capacity of air used for the air
// node and the ventilation, 1200 J/(m3 K) (ISO 13789, rho c of air
// [2nd-hand]).
const AirHeatCapacity = 1200.0

// SettleTolerance is the largest change (K) of the air or any cell over
// one cycle at which a room counts as settled (warm_up: auto).
const SettleTolerance = 0.002

// Spec is a room as the runner takes it, in SI units.
type Spec struct {
	File        string  // the scenario file, for messages
	Line        int     // line of the room key, for messages; 0: unknown
	Outdoor     Forcing // outdoor air temperature, degC
	Volume      float64 // m3
	Ventilation Ventilation
	Gains       Forcing // W delivered to the air (without the windows' sun)
	Elements    []Element
	Windows     []Window
	Thresholds  []float64 // degC, for the hours above
	Step        float64   // s, time step of the simulation
	WarmUp      float64   // s simulated before the reported cycle, when not WarmUpAuto
	// WarmUpAuto repeats the cycle from the exact periodic state until it
	// repeats itself within SettleTolerance before the reported cycle.
	WarmUpAuto bool
}

// Forcing is a periodic quantity of time: its value and the harmonics it
// is made of (their periods set the cycle of the exact method).
type Forcing struct {
	At        func(t float64) float64 // t in s
	Harmonics []climate.Harmonic
}

// Element is one layered element of a room.
type Element struct {
	Name         string
	Area         float64 // m2
	Orientation  layers.Orientation
	Layers       []layers.Layer // back (outside) first, the room last
	Construction string         // the wall file the layers came from, if any
	Back         solver.RoomBack
	// Environment is the temperature (degC) behind the back's surface
	// resistance at time t (s) when Back is solver.BackOutside: the
	// outdoor air or its sol-air temperature; nil for other backs.
	Environment func(t float64) float64
	// BackHarmonics are the harmonics of the back's forcing other than
	// the outdoor air (the sun on it), for the cycle of the exact method.
	BackHarmonics []climate.Harmonic
	Sunlit        bool            // the sun falls on the back face
	Report        []results.Layer // the layers as the results show them
	Line          int             // line of the element, for messages
}

// Window is a massless glazed opening: U A between outdoor and room air,
// g A I of transmitted sun (the irradiance clipped at 0), absorbed at the
// inside surfaces of the elements SunTo names and the rest delivered to
// the air.
type Window struct {
	Name  string
	Area  float64  // m2
	U     float64  // W/(m2 K)
	G     float64  // total solar energy transmittance, 0..1
	Sun   *Forcing // irradiance on the window, W/m2; nil: no sun
	SunTo []SunShare
}

// SunShare is the part Fraction (0..1) of a window's transmitted sun
// absorbed at the inside surface (the wall side of Rsi) of element
// Element, an index in Spec.Elements. The fractions of a window add up to
// at most 1; the rest goes to the air.
type SunShare struct {
	Element  int
	Fraction float64
}

// AirFraction is the part of w's transmitted sun delivered to the air:
// 1 less the fractions of SunTo (not below 0).
func (w Window) AirFraction() float64 {
	f := 1.0
	for _, s := range w.SunTo {
		f -= s.Fraction
	}
	return max(f, 0)
}

// Ventilation is the outdoor air supply of a room, in air changes per
// hour: Day all day, or Night from NightFrom to NightTo (hours of the
// day, wrapping past midnight) when Scheduled.
type Ventilation struct {
	Day, Night         float64 // 1/h
	NightFrom, NightTo float64 // h of the day, 0 to 24
	Scheduled          bool
}

// At returns the air changes per hour at time t (s).
func (v Ventilation) At(t float64) float64 {
	if !v.Scheduled {
		return v.Day
	}
	h := t / 3600
	h -= 24 * float64(int64(h/24))
	if h < 0 {
		h += 24
	}
	night := h >= v.NightFrom && h < v.NightTo
	if v.NightFrom > v.NightTo {
		night = h >= v.NightFrom || h < v.NightTo
	}
	if night {
		return v.Night
	}
	return v.Day
}

// Mean returns the daily mean air changes per hour.
func (v Ventilation) Mean() float64 {
	if !v.Scheduled {
		return v.Day
	}
	n := v.NightTo - v.NightFrom
	if n < 0 {
		n += 24
	}
	return (n*v.Night + (24-n)*v.Day) / 24
}
