package room

import (
	"fmt"
	"math"

	"tempstack/climate"
	"tempstack/fileerr"
	"tempstack/layers"
	"tempstack/solver"
)

// plan is what a room run solves: the room with its elements' mass
// and without it, and the forcing as functions of time.
type plan struct {
	room, bare solver.Room
	meshes     []*solver.Mesh
	period     float64 // s, the longest period of the forcing (at least a day)
	samples    int     // samples of a cycle for the Fourier series of the forcing
	outdoor    func(float64) float64
	back       []func(float64) float64 // per element; nil for adiabatic backs
	gains      func(float64) float64   // W to the air: gains and sun through the windows
	cond       func(float64) float64   // W/K: ventilation and windows
	windowsUA  float64                 // W/K
	cells      int
}

// Check checks that room s can be solved: its elements, that something
// joins it to the outdoors, its forcing periods and its number of steps.
// The error is a *fileerr.Error naming the key.
func Check(s *Spec) error {
	_, err := newPlan(s)
	return err
}

// newPlan checks the room and builds its plan.
func newPlan(rs *Spec) (*plan, error) {
	if rs == nil || rs.Outdoor.At == nil {
		file := ""
		if rs != nil {
			file = rs.File
		}
		return nil, &fileerr.Error{File: file, Key: "room", Msg: "the room or its outdoor temperature is missing"}
	}
	p := &plan{}
	ca := AirHeatCapacity * rs.Volume
	for _, w := range rs.Windows {
		p.windowsUA += w.U * w.Area
	}
	vent := rs.Ventilation
	vol := rs.Volume
	p.cond = func(t float64) float64 { return AirHeatCapacity*vol*vent.At(t)/3600 + p.windowsUA }
	hMean := AirHeatCapacity*vol*vent.Mean()/3600 + p.windowsUA
	p.room = solver.Room{AirCapacity: ca, Conductance: hMean}
	p.bare = p.room
	p.outdoor = rs.Outdoor.At
	periods := append([]climate.Harmonic(nil), rs.Outdoor.Harmonics...)
	periods = append(periods, rs.Gains.Harmonics...)
	for i, e := range rs.Elements {
		rsi, rse := layers.SurfaceResistances(e.Orientation)
		col := layers.Construction{Layers: e.Layers, Orientation: e.Orientation}.Column(rsi, rse)
		if e.Back == solver.BackAdiabatic {
			col.OutsideResistance = rsi // the neighbour's inside surface; no heat crosses it
		}
		if err := col.Validate(); err != nil {
			return nil, &fileerr.Error{File: rs.File, Line: e.Line, Key: fmt.Sprintf("elements[%d]", i+1), Err: err}
		}
		el := solver.RoomElement{Name: e.Name, Area: e.Area, Column: col, Back: e.Back}
		p.room.Elements = append(p.room.Elements, el)
		bare := el
		bare.Column.Layers = nil
		for _, l := range col.Layers {
			bare.Column.Layers = append(bare.Column.Layers, solver.Layer{Name: l.Name, Resistance: l.ThermalResistance()})
		}
		p.bare.Elements = append(p.bare.Elements, bare)
		var env func(float64) float64
		if e.Back == solver.BackOutside {
			// The back's environment is the wall kind's outside: the
			// outdoor air, or its sol-air temperature in the sun.
			env = e.Environment
			periods = append(periods, e.BackHarmonics...)
		}
		p.back = append(p.back, env)
	}
	type sun struct {
		ga  float64
		irr *Forcing
	}
	var suns []sun
	for _, w := range rs.Windows {
		if w.Sun != nil && w.G > 0 {
			suns = append(suns, sun{w.G * w.Area, w.Sun})
			periods = append(periods, w.Sun.Harmonics...)
		}
	}
	gains := rs.Gains.At
	p.gains = func(t float64) float64 {
		v := gains(t)
		for _, sn := range suns {
			v += sn.ga * math.Max(0, sn.irr.At(t))
		}
		return v
	}
	if err := p.room.Validate(); err != nil {
		return nil, &fileerr.Error{File: rs.File, Key: "elements", Err: err}
	}
	hold := hMean
	for _, e := range p.room.Elements {
		if e.Back == solver.BackOutside {
			hold += e.Area * e.U()
		}
	}
	if !(hold > 0) {
		return nil, &fileerr.Error{File: rs.File, Line: rs.Line, Key: "room", Msg: "nothing joins the room to the outdoors, so its mean temperature is not defined: give ventilation, a window or an element backed by the outside"}
	}
	p.period = climate.Day
	for _, h := range periods {
		p.period = math.Max(p.period, h.Period)
	}
	for _, h := range periods {
		if n := p.period / h.Period; math.Abs(n-math.Round(n)) > 1e-6*n {
			return nil, &fileerr.Error{File: rs.File, Key: "outside.temperature", Msg: fmt.Sprintf(
				"a room needs forcing periods that divide the longest one (%s): %s does not", layers.FormatDuration(p.period), layers.FormatDuration(h.Period))}
		}
	}
	if p.period > 2*climate.Year {
		return nil, &fileerr.Error{File: rs.File, Key: "outside.temperature", Msg: "a room's forcing periods must not exceed two years"}
	}
	// Fourier samples of one cycle: every minute for a day or two, every
	// 15 minutes beyond.
	dtf := 60.0
	if p.period > 2*climate.Day {
		dtf = 900
	}
	p.samples = int(math.Round(p.period / dtf))
	if math.Abs(float64(p.samples)*dtf-p.period) > 1e-6*p.period {
		return nil, &fileerr.Error{File: rs.File, Key: "outside.temperature", Msg: "the longest forcing period must be a whole number of minutes"}
	}
	if steps := (rs.WarmUp + p.period) / rs.Step; steps > 2e6 {
		return nil, &fileerr.Error{File: rs.File, Line: rs.Line, Key: "room.step", Msg: fmt.Sprintf("%.0f time steps are too many; lengthen the step or shorten warm_up", steps)}
	}
	var err error
	if p.meshes, err = solver.RoomMeshes(p.room, solver.MeshOptions{}); err != nil {
		return nil, &fileerr.Error{File: rs.File, Key: "elements", Err: err}
	}
	for _, m := range p.meshes {
		if m != nil {
			p.cells += m.Cells()
		}
	}
	return p, nil
}
