package scenarios

import (
	"fmt"
	"strconv"

	"gopkg.in/yaml.v3"

	"tempstack/climate"
	"tempstack/layers"
)

// decodeAnalysis reads the analysis block, or sets its defaults when there
// is none. layersClean says whether the layers were read without a
// mistake (the probes are checked against their thickness only then).
func (d *decoder) decodeAnalysis(top *object, s *Scenario, layersClean bool) {
	a := &s.Analysis
	a.Periods = []float64{climate.Day}
	a.Response = Response{From: 3600, To: climate.Year, Points: 61}
	if s.Kind == Ground {
		a.Periods = []float64{climate.Year, climate.Day}
	}
	a.Simulate = &Simulate{}
	if !top.has("analysis") {
		return
	}
	o := top.child("analysis", analysisKeys)
	if o == nil {
		return
	}
	a.Line = top.line("analysis")
	d.decodeSimulate(o, s)
	d.decodeStepResponse(o, s)
	d.decodeFit(o, s)
	d.decodePeriods(o, a)
	d.decodeDesign(o, s)
	d.decodeResponse(o, a)
	d.decodeProbes(o, s, layersClean)
}

// decodePeriods reads the periods of the exact analysis.
func (d *decoder) decodePeriods(o *object, a *Analysis) {
	items, ok := o.list("periods")
	if !ok {
		return
	}
	if len(items) == 0 {
		o.failf("periods", "the list is empty; give at least one period, e.g. [24h]")
		return
	}
	a.Periods = nil
	for i, n := range items {
		key := fmt.Sprintf("analysis.periods[%d]", i+1)
		if p, ok := d.scalarQuantity(n, key, layers.Period); ok && !(p > 0) {
			d.failf(n, key, "a period must be positive")
		} else if ok {
			a.Periods = append(a.Periods, p)
		}
	}
}

// decodeDesign reads the design freezing index and its season length.
func (d *decoder) decodeDesign(o *object, s *Scenario) {
	a := &s.Analysis
	var v float64
	if o.quantity("design_freezing_index", layers.DegreeDays, &v) {
		switch {
		case s.Kind != Ground:
			o.failf("design_freezing_index", "applies to kind: ground only")
		case v < 0:
			o.failf("design_freezing_index", "a freezing index is a sum of degree-days below 0 degC and cannot be negative, got %g", v)
		default:
			a.DesignFreezingIndex = &v
			a.DesignLine = o.line("design_freezing_index")
		}
	}
	var season float64
	if o.positive("design_season_length", layers.Duration, &season) {
		switch {
		case !o.has("design_freezing_index"):
			o.failf("design_season_length", "goes with design_freezing_index")
		case season > climate.Year:
			o.failf("design_season_length", "a freezing season cannot be longer than a year")
		default:
			a.DesignSeason = season
		}
	}
}

// decodeResponse reads the range of the frequency response.
func (d *decoder) decodeResponse(o *object, a *Analysis) {
	r := o.child("response", responseKeys)
	if r == nil {
		return
	}
	r.positive("from", layers.Period, &a.Response.From)
	r.positive("to", layers.Period, &a.Response.To)
	r.integer("points", 2, 1000, &a.Response.Points)
	if r.clean() && a.Response.To <= a.Response.From {
		r.failf("to", "must be longer than from")
	}
}

// decodeProbes reads the probe depths; a wall's probes must lie inside its
// column (checked when the layers were read without a mistake).
func (d *decoder) decodeProbes(o *object, s *Scenario, layersClean bool) {
	a := &s.Analysis
	items, _ := o.list("probes")
	for i, n := range items {
		key := fmt.Sprintf("analysis.probes[%d]", i+1)
		z, ok := d.scalarQuantity(n, key, layers.Length)
		if !ok {
			continue
		}
		if z < 0 {
			d.failf(n, key, "a probe depth must not be negative")
			continue
		}
		if layersClean && s.Kind == Wall {
			if total := s.construction().Thickness(); z > total*(1+1e-12) {
				d.failf(n, key, "probe at %g m lies outside the column, which is %g m thick", z, total)
				continue
			}
		}
		a.Probes = append(a.Probes, z)
		a.ProbeLines = append(a.ProbeLines, n.Line)
	}
}

// scalarQuantity reads a list item as a quantity; it reports a mistake.
func (d *decoder) scalarQuantity(n *yaml.Node, key string, kind layers.Kind) (float64, bool) {
	if n.Kind != yaml.ScalarNode {
		d.failf(n, key, "expected a single value, found %s", kindName(n))
		return 0, false
	}
	v, err := layers.ParseQuantity(n.Value, kind)
	if err != nil {
		d.fail(n, key, err)
		return 0, false
	}
	return v, true
}

// decodeSimulate reads analysis.simulate: false switches the simulation
// off, a mapping sets its start, duration, steps, initial state and mesh.
func (d *decoder) decodeSimulate(o *object, s *Scenario) {
	if !o.has("simulate") {
		return
	}
	if v := o.values["simulate"]; v.Kind == yaml.ScalarNode && v.Tag == "!!bool" {
		on := true
		if o.boolean("simulate", &on) && !on {
			s.Analysis.Simulate = nil
		}
		return
	}
	so := o.child("simulate", simulateKeys)
	if so == nil {
		return
	}
	sim := s.Analysis.Simulate
	sim.Line = o.line("simulate")
	sim.set = map[string]int{}
	for k := range so.keys {
		sim.set[k] = so.line(k)
	}
	so.positive("duration", layers.Duration, &sim.Duration)
	var start float64
	if so.nonNegative("start", layers.Duration, &start) {
		if m := s.Outside.Temperature; m != nil && m.Measured != nil {
			so.failf("start", "a measured series sets its own start; cut the file instead")
		}
		sim.Start = start
	}
	so.positive("step", layers.Duration, &sim.Step)
	so.positive("output_step", layers.Duration, &sim.OutputStep)
	if so.clean() && sim.Duration > 0 && sim.Step > sim.Duration {
		so.failf("step", "the time step (%s) is longer than the simulated duration (%s)", layers.FormatDuration(sim.Step), layers.FormatDuration(sim.Duration))
	}
	var initial float64
	if so.quantity("initial_temperature", layers.Temperature, &initial) {
		sim.Initial = &initial
	}
	so.integer("spin_up_cycles", 1, 1000, &sim.MaxSpinUpCycles)
	if mo := so.child("mesh", meshKeys); mo != nil {
		decodeMesh(mo, sim)
	}
}

// decodeMesh reads the mesh options of a simulation.
func decodeMesh(mo *object, sim *Simulate) {
	m := &sim.Mesh
	mo.positive("surface_cell", layers.Length, &m.SurfaceCell)
	mo.positive("max_cell", layers.Length, &m.MaxCell)
	mo.number("growth", 1, 1.5, "must be a number from 1 (uniform cells) to 1.5", &m.Growth)
	mo.number("cells_per_depth", 1, 1000, "must be a number from 1 to 1000", &m.CellsPerDepth)
	mo.integer("min_cells_per_layer", 1, 10000, &m.MinCellsPerLayer)
}

// number reads a plain number from lo to hi; msg says what is wanted.
func (o *object) number(key string, lo, hi float64, msg string, dst *float64) bool {
	var s string
	if !o.str(key, &s) {
		return false
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || v < lo || v > hi {
		o.failf(key, "%s, got %q", msg, s)
		return false
	}
	*dst = v
	return true
}

// decodeStepResponse reads analysis.step_response.
func (d *decoder) decodeStepResponse(o *object, s *Scenario) {
	so := o.child("step_response", stepResponseKeys)
	if so == nil {
		return
	}
	sides := []string{"outside", "inside"}
	if s.Kind == Ground {
		sides = []string{"surface"}
	}
	st := &StepResponse{Side: sides[0], Change: 10, Duration: 600, Line: o.line("step_response")}
	if s.Kind == Wall && (s.Orientation == layers.Floor) {
		st.Side = "inside"
	}
	so.choice("side", sides, &st.Side)
	var change float64
	if so.quantity("change", layers.TemperatureDifference, &change) {
		if change == 0 {
			so.failf("change", "a step of 0 K shows nothing; give e.g. 10 K")
		} else {
			st.Change = change
		}
	}
	so.positive("duration", layers.Duration, &st.Duration)
	var contact float64
	if so.quantity("contact_temperature", layers.Temperature, &contact) {
		st.ContactTemperature = &contact
	}
	so.positive("contact_effusivity", layers.Effusivity, &st.ContactEffusivity)
	if so.clean() && (st.ContactTemperature == nil) != (st.ContactEffusivity == 0) {
		so.failf("contact_effusivity", "give contact_temperature and contact_effusivity together")
	}
	s.Analysis.StepResponse = st
}
