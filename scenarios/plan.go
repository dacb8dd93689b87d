package scenarios

import (
	"fmt"
	"math"

	"tempstack/fileerr"
	"tempstack/ground"
	"tempstack/layers"
	"tempstack/solver"
)

// maxSteps is the largest number of time steps a simulation may take: far
// beyond any sensible run (10 years hourly is 87,600), small enough to
// refuse a mistyped step or duration before it runs for days.
const maxSteps = 5e7

// runPlan is what Run settles before it solves anything.
type runPlan struct {
	col solver.Column // the solver column (ground: no inside resistance)
	// simulate is true when the transient simulation runs; skipped says
	// why a simulation that the scenario asks for is not run.
	simulate bool
	skipped  string
}

// Check validates a decoded scenario as Run does before it solves
// anything, and returns every problem it finds (up to 20; an *Error with
// file, line and key for one, a fileerr.List for several): the column, the simulation's time step and duration (against the
// record, a step change and the limit of 5e7 steps), the probe depths, the
// mesh (its cell limit) of the simulation and of the step response, the
// sensor record of a fit, and the same for every variant, sweep value and
// both ends of a target range of a study (the samples of an uncertainty
// study are only decoded: Run counts a refused sample and goes on). Run
// calls the same checks first, so a scenario that Check accepts does not
// fail them in Run.
func Check(s *Scenario) error {
	var errs problems
	_, err := s.plan()
	errs.add(s, err)
	errs.add(s, planStudy(s, fileerr.All(err)...))
	return errs.err()
}

// problems collects the mistakes the plan finds, up to maxErrors.
type problems fileerr.List

// add adds the mistakes err holds (an error that holds no *Error is one
// mistake of the file s).
func (p *problems) add(s *Scenario, err error) {
	if err == nil {
		return
	}
	all := fileerr.All(err)
	if all == nil {
		all = []*Error{{File: s.File, Err: err}}
	}
	for _, e := range all {
		if len(*p) < maxErrors {
			*p = append(*p, e)
		}
	}
}

// err is nil without a mistake, the *Error of one, a fileerr.List of
// several.
func (p problems) err() error { return fileerr.List(p).Err() }

// plan runs every check that Run needs before solving and says what runs,
// and returns every problem it finds (a column that cannot be solved stops
// it). It changes nothing in s (the decoder resolved the defaults).
func (s *Scenario) plan() (*runPlan, error) {
	if s.Kind == Room {
		err := s.checkRoom() // roomrun.go
		return &runPlan{}, err
	}
	p := &runPlan{col: s.column()}
	if s.Kind == Ground {
		p.col.InsideResistance = 0
		if n := len(p.col.Layers); n > 0 && p.col.Layers[n-1].Massless() {
			return nil, &Error{File: s.File, Line: s.layerLine(n - 1), Key: fmt.Sprintf("layers[%d]", n),
				Msg: "the deepest layer of a ground column continues downward and needs heat capacity: give it conductivity, density and specific_heat (or a soil), not only a resistance"}
		}
	}
	if err := p.col.Validate(); err != nil {
		return nil, &Error{File: s.File, Key: "layers", Err: err}
	}
	massless := true
	for _, l := range p.col.Layers {
		if !l.Massless() {
			massless = false
		}
	}
	var errs problems
	if s.Analysis.Simulate != nil {
		if massless {
			// Nothing stores heat: the exact solution is the whole answer
			// (U, decrement factor 1, no time shift), and there is nothing
			// to mesh.
			p.skipped = "the construction has only resistance layers (no heat capacity): the exact periodic solution is the whole answer (U, decrement factor 1, no time shift), so the transient simulation is skipped"
		} else {
			_, _, err := planSimulation(s, p.col)
			errs.add(s, err)
			p.simulate = true
		}
	}
	if st := s.Analysis.StepResponse; st != nil {
		if massless {
			errs.add(s, &Error{File: s.File, Line: st.Line, Key: "analysis.step_response",
				Msg: "the construction has only resistance layers: a surface without heat capacity has no step response to compare with the half-space; remove step_response"})
		} else {
			_, _, _, err := stepMesh(s, p.col)
			errs.add(s, err)
		}
	}
	if spec := s.Analysis.Fit; spec != nil {
		if _, err := ground.RecordFromSeries(spec.Measured.Series, spec.Columns, spec.Depths); err != nil {
			errs.add(s, &Error{File: s.File, Line: spec.Line, Key: "analysis.fit", Err: err})
		}
	}
	if err := errs.err(); err != nil {
		return nil, err
	}
	return p, nil
}

// layerLine is the line of layer i (0-based) in the scenario file, 0 when
// unknown.
func (s *Scenario) layerLine(i int) int {
	if i < len(s.LayerLines) {
		return s.LayerLines[i]
	}
	return 0
}

// planSimulation checks the simulation settings (their defaults resolved
// by the decoder) before anything is solved: the step against the
// duration, the duration against a record, a step change inside the run,
// the number of steps, the probe depths and the mesh. It returns the mesh
// and the probe positions on the solver axis, or every problem it found.
func planSimulation(s *Scenario, col solver.Column) (*solver.Mesh, []float64, error) {
	sim := s.Analysis.Simulate
	line := sim.Line
	if line == 0 {
		line = s.Analysis.Line
	}
	var errs problems
	if sim.Step > sim.Duration {
		errs.add(s, &Error{File: s.File, Line: line, Key: "analysis.simulate.step",
			Msg: fmt.Sprintf("the time step (%s) is longer than the simulated duration (%s)", layers.FormatDuration(sim.Step), layers.FormatDuration(sim.Duration))})
	}
	if m := s.Outside.Temperature.Measured; m != nil {
		if _, t1 := m.Span(); sim.Start+sim.Duration > t1+1 {
			errs.add(s, &Error{File: s.File, Line: line, Key: "analysis.simulate.duration",
				Msg: fmt.Sprintf("the series covers %s; the simulation cannot run for %s", layers.FormatDuration(t1-sim.Start), layers.FormatDuration(sim.Duration))})
		}
	}
	if st := s.Outside.Temperature.Step; st != nil && st.At >= sim.Start+sim.Duration {
		errs.add(s, &Error{File: s.File, Line: s.Outside.Temperature.Line, Key: "step.at",
			Msg: fmt.Sprintf("the step comes at %s, after the end of the simulation (%s)", layers.FormatDuration(st.At), layers.FormatDuration(sim.Duration))})
	}
	if n := sim.Duration / sim.Step; n > maxSteps || math.IsNaN(n) {
		errs.add(s, &Error{File: s.File, Line: line, Key: "analysis.simulate",
			Msg: fmt.Sprintf("%.3g time steps is more than the limit of 5e7; use a longer step or a shorter duration", n)})
	}
	probes, err := s.solverProbes(col)
	errs.add(s, err)
	mo := sim.Mesh // a copy: the scenario stays as decoded
	mo.MaxCells = maxCells
	mesh, err := solver.NewMesh(col, mo)
	if err != nil {
		errs.add(s, &Error{File: s.File, Line: line, Key: "analysis.simulate.mesh", Msg: meshMessage(err)})
	}
	if err := errs.err(); err != nil {
		return nil, nil, err
	}
	return mesh, probes, nil
}

// planStudy checks the cases of a study that Run must solve without
// failing: every variant, every sweep value and both ends of a target
// range, each decoded and planned. It returns the problems of every case
// that fails, each pointed at the case, except those of the base scenario
// (known: a case that inherits a mistake of the base does not report it
// again).
func planStudy(s *Scenario, known ...*Error) error {
	st := s.Study
	if st == nil {
		return nil
	}
	type named struct {
		what string
		line int // where the case is written
		c    studyCase
	}
	var cases []named
	for _, v := range st.Variants {
		cases = append(cases, named{"variant " + v.Name, v.Line, v.Sets})
	}
	at := func(what, path string, line int, text string) named {
		return named{fmt.Sprintf("%s %s = %s", what, path, text), line, studyCase{{Path: path, Value: scalarAt(text, line, 1), Line: line}}}
	}
	if sw := st.Sweep; sw != nil {
		for _, v := range sw.Values {
			cases = append(cases, at("sweep", sw.Parameter, sw.Line, v))
		}
	}
	if tg := st.Target; tg != nil {
		cases = append(cases, at("target", tg.Parameter, tg.Line, joinNumber(tg.From, tg.Unit)), at("target", tg.Parameter, tg.Line, joinNumber(tg.To, tg.Unit)))
	}
	var errs problems
	for _, c := range cases {
		cs, err := decodeCase(s, c.c)
		if err != nil {
			errs.add(s, err)
			continue
		}
		_, err = cs.plan()
		for _, e := range fileerr.All(err) {
			if isKnown(e, known) {
				continue
			}
			// Point at the study case, which makes the problem.
			e2 := *e
			e2.Line = c.line
			e2.Msg = fmt.Sprintf("%s (in the %s)", e.Msg, c.what)
			errs.add(s, &e2)
		}
		if err != nil && fileerr.All(err) == nil {
			errs.add(s, err)
		}
	}
	return errs.err()
}

// isKnown reports whether known holds the mistake e (same key and
// message).
func isKnown(e *Error, known []*Error) bool {
	for _, k := range known {
		if k.Key == e.Key && k.Msg == e.Msg {
			return true
		}
	}
	return false
}
