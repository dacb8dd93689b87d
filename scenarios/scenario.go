// Package scenarios reads a tempstack scenario file (YAML), validates it
// with errors that name file, line and key, turns it into solver inputs,
// runs the exact periodic analysis (and, where asked, the transient
// simulation), and collects the Results that the JSON, CSV and HTML writers
// share.
//
// All values inside a Scenario are SI: metres, seconds, degrees Celsius,
// W/(m K), J/(kg K), kg/m3, m2 K/W, W/m2. The file may give other units as
// strings ("105 mm", "3y"); a bare number is in the default unit of its key
// (see README.md, "Scenario file").
package scenarios

import (
	"io/fs"

	"gopkg.in/yaml.v3"

	"tempstack/climate"
	"tempstack/layers"
	"tempstack/scenarios/results"
	"tempstack/solver"
)

// Kind is what a scenario describes; its results carry the same kind.
type Kind = results.Kind

// The scenario kinds.
const (
	Wall   = results.Wall   // a wall, roof or floor between outside and inside air
	Ground = results.Ground // a soil or rock column below a ground surface
	Room   = results.Room   // one room: air node, layered elements, windows (room.go)
)

// Scenario is a decoded, validated scenario file in SI units.
type Scenario struct {
	File        string // as given (for messages)
	Title       string
	Description string
	TitleBlock  results.TitleBlock // project, client, prepared_by, revision: for the report's title block
	Kind        Kind
	Orientation layers.Orientation // wall kind: heat-flow direction for Rsi
	Layers      []layers.Layer     // outside (ground: surface) first
	LayerLines  []int              // line of each layer in the file, for messages

	Outside Environment // wall: outside; ground: the surface
	Inside  Side        // wall: inside; ground: the bottom

	Analysis Analysis

	// Room is the room of kind: room; nil for other kinds.
	Room *RoomSpec

	// Study holds variants, a sweep, a target or uncertainty; nil: none.
	Study *StudySpec

	root  *yaml.Node   // the decoded file, for the study's cases
	fsys  fs.FS        // where the file's series are read
	cache *seriesCache // records read, shared with the study's cases

}

// DefaultGeothermalFlux is the heat flux entering a ground column from
// below when the scenario gives no bottom condition: the continental mean
// of Pollack, Hurter and Johnson (1993), Reviews of Geophysics 31:267,
// 65 mW/m2 (abstract [read]).
const DefaultGeothermalFlux = 0.065

// Forcing is an environment temperature over time: a mean plus harmonics,
// optionally replaced by a step change.
type Forcing struct {
	climate.Periodic           // mean and harmonics (for a series: fitted by least squares)
	Step             *Step     // non-nil: a step change, Periodic ignored
	Measured         *Measured // non-nil: a measured series; Periodic is its fit
	Line             int       // line of the key, for messages
}

// Step is a sudden change of the environment temperature.
type Step struct {
	From, To float64 // degC
	At       float64 // s after the start of the simulation
}

// At returns the forcing temperature at time t (s), degC.
func (f *Forcing) At(t float64) float64 {
	if f.Measured != nil {
		return f.Measured.at(t)
	}
	if f.Step != nil {
		if t < f.Step.At {
			return f.Step.From
		}
		return f.Step.To
	}
	return f.Periodic.At(t)
}

// Analysis says what to compute.
type Analysis struct {
	Periods    []float64 // s, for the exact periodic analysis; default one day
	Response   Response
	Probes     []float64 // m from the outside (surface), as drawn (air layers count)
	ProbeLines []int     // line of each probe, for messages
	Line       int       // line of the analysis key (0 when absent)

	// Simulate is the transient simulation; nil when switched off.
	Simulate *Simulate
	// StepResponse asks for the response of one surface to a sudden
	// temperature change; nil when not asked.
	StepResponse *StepResponse

	// DesignFreezingIndex (air, degC day), when set, drives the closed-form
	// frost depths instead of the index of the forcing; DesignSeason is its
	// freezing-season length (s; 0 = the forcing's).
	// Fit asks for the diffusivity from logged temperatures; nil: none.
	Fit *FitSpec

	DesignFreezingIndex *float64
	DesignSeason        float64
	DesignLine          int
}

// Simulate controls the transient finite-volume simulation.
type Simulate struct {
	Start           float64  // s after 1 January 00:00 of year 1 (measured series: the first record)
	Duration        float64  // s
	Step            float64  // s
	OutputStep      float64  // s, spacing of the recorded series (key output_step); 0 = automatic
	Initial         *float64 // degC, uniform start; nil = the periodic (or spun-up) solution
	Mesh            solver.MeshOptions
	MaxSpinUpCycles int            // for non-linear (freezing) runs without an initial temperature
	Line            int            // line of the simulate key, for messages
	set             map[string]int // keys given explicitly, with their lines
}

// StepResponse is a sudden change of one surface temperature of a column
// that starts uniform: the surface heat uptake after a step (how much heat
// a floor or wall surface draws in its first minutes).
type StepResponse struct {
	Side     string  // "outside" or "inside" (ground: "surface")
	Change   float64 // K, the step of the surface temperature
	Duration float64 // s
	Line     int

	// ContactTemperature (degC) and ContactEffusivity (W s^0.5/(m2 K)) of
	// a second body laid against the surface (a warm screed poured on
	// cold stone, a slab on a board), for the contact temperature of the
	// two; nil/0: not asked.
	ContactTemperature *float64
	ContactEffusivity  float64
}

// Response is the frequency sweep of the periodic analysis.
type Response struct {
	From, To float64 // s
	Points   int
}
