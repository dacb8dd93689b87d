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
	gains      func(float64) float64   // W to the air: gains and the part of the windows' sun that heats the air
	// surface[k] is the windows' sun absorbed at the inside surface of
	// element k, W; a nil entry: none; nil when no window sends sun to a
	// surface (sun_to absent everywhere).
	surface   []func(float64) float64
	cond      func(float64) float64 // W/K: ventilation and windows
	windowsUA float64               // W/K
	// windowsA is the windows' area, m2, and windowsK the sum of their
	// A Rsi U, m2: the windows' area-weighted inside surface temperature
	// is (windowsA theta_i - windowsK (theta_i - theta_o)) / windowsA
	// (see operative).
	windowsA, windowsK float64
	cells              int
}

// operative returns the operative temperature of the room (degC, or a
// complex amplitude of one harmonic, K) for the air temperature air, the
// outdoor air outdoor and the inside surface temperature of each element
// surf: the mean of the air temperature and the area-weighted mean
// inside surface temperature of the elements and windows (the operative
// temperature of ISO 7726:1998 taken as the simple mean of air and mean
// radiant temperature where the air moves slowly, below about 0.2 m/s
// [memory]; the surfaces' area-weighted mean stands for the mean radiant
// temperature, common practice). A window is massless glazing: its inside surface lies at
//
//	theta_w = theta_i - Rsi U (theta_i - theta_o)
//
// with Rsi = 0.13 m2 K/W (ISO 6946:2017 Table 7, horizontal heat flow
// [memory]) [derived: the steady flux U (theta_i - theta_o) through Rsi].
// Sun absorbed in the glass is left out.
func (p *plan) operative(r solver.Room, air, outdoor complex128, surf []complex128) complex128 {
	area := complex(p.windowsA, 0)
	s := area*air - complex(p.windowsK, 0)*(air-outdoor)
	for e, el := range r.Elements {
		a := complex(el.Area, 0)
		area += a
		s += a * surf[e]
	}
	return (air + s/area) / 2
}

// checkSunTo checks the sun_to of window i of rs: elements that exist,
// fractions in [0, 1] adding up to at most 1, each element once.
func checkSunTo(rs *Spec, i int) error {
	w := rs.Windows[i]
	key := fmt.Sprintf("windows[%d].sun_to", i+1)
	sum := 0.0
	seen := map[int]bool{}
	for _, sh := range w.SunTo {
		if sh.Element < 0 || sh.Element >= len(rs.Elements) {
			return &fileerr.Error{File: rs.File, Key: key, Msg: fmt.Sprintf("no element %d (the room has %d)", sh.Element+1, len(rs.Elements))}
		}
		if seen[sh.Element] {
			return &fileerr.Error{File: rs.File, Key: key, Msg: fmt.Sprintf("element %q is named twice", rs.Elements[sh.Element].Name)}
		}
		seen[sh.Element] = true
		if !(sh.Fraction >= 0 && sh.Fraction <= 1) {
			return &fileerr.Error{File: rs.File, Key: key, Msg: fmt.Sprintf("a fraction lies between 0 and 1, got %g", sh.Fraction)}
		}
		sum += sh.Fraction
	}
	if sum > 1+1e-9 {
		return &fileerr.Error{File: rs.File, Key: key, Msg: fmt.Sprintf("the fractions add up to %.4g; at most 1", sum)}
	}
	return nil
}

// Check checks that room s can be solved: its elements, that something
// joins it to the outdoors, its forcing periods and its number of steps.
// The error is a *fileerr.Error naming the key.
func Check(s *Spec) error {
	_, err := newPlan(s)
	return err
}

// newPlan checks the room and builds its plan: the room of solver
// elements with its mass and without (addElements), where the windows' sun
// goes (addSun), the cycle and its samples (setPeriod) and the meshes.
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
		p.windowsA += w.Area
		p.windowsK += w.Area * layers.RsiHorizontal * w.U
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
	if err := p.addElements(rs, &periods); err != nil {
		return nil, err
	}
	if err := p.addSun(rs, &periods); err != nil {
		return nil, err
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
	if err := p.setPeriod(rs, periods); err != nil {
		return nil, err
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

// addElements adds the solver element of each element of rs to the room
// and, with its layers reduced to their resistances, to the room without
// mass; it records each element's back environment and appends the
// periods of the sol-air forcing to periods.
func (p *plan) addElements(rs *Spec, periods *[]climate.Harmonic) error {
	for i, e := range rs.Elements {
		rsi, rse := layers.SurfaceResistances(e.Orientation)
		col := layers.Construction{Layers: e.Layers, Orientation: e.Orientation}.Column(rsi, rse)
		if e.Back == solver.BackAdiabatic {
			col.OutsideResistance = rsi // the neighbour's inside surface; no heat crosses it
		}
		if err := col.Validate(); err != nil {
			return &fileerr.Error{File: rs.File, Line: e.Line, Key: fmt.Sprintf("elements[%d]", i+1), Err: err}
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
			*periods = append(*periods, e.BackHarmonics...)
		}
		p.back = append(p.back, env)
	}
	return nil
}

// addSun checks each window's sun_to and sets the heat to the air (the
// gains and the part of the windows' sun that heats the air) and the sun
// absorbed at each element's inside surface; it appends the periods of
// the irradiance to periods.
func (p *plan) addSun(rs *Spec, periods *[]climate.Harmonic) error {
	type sun struct {
		ga  float64 // W per W/m2: g A, times the fraction it goes with
		irr *Forcing
	}
	var suns []sun
	onSurface := make([][]sun, len(rs.Elements))
	anySurface := false
	for i, w := range rs.Windows {
		if err := checkSunTo(rs, i); err != nil {
			return err
		}
		if w.Sun != nil && w.G > 0 {
			// The air takes what sun_to leaves (all of it without sun_to:
			// times 1, exactly).
			suns = append(suns, sun{w.G * w.Area * w.AirFraction(), w.Sun})
			*periods = append(*periods, w.Sun.Harmonics...)
			for _, sh := range w.SunTo {
				if sh.Fraction > 0 {
					onSurface[sh.Element] = append(onSurface[sh.Element], sun{w.G * w.Area * sh.Fraction, w.Sun})
					anySurface = true
				}
			}
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
	if anySurface {
		p.surface = make([]func(float64) float64, len(rs.Elements))
		for k, ss := range onSurface {
			if len(ss) == 0 {
				continue
			}
			p.surface[k] = func(t float64) float64 {
				v := 0.0
				for _, sn := range ss {
					v += math.Max(0, sn.irr.At(t)) * sn.ga
				}
				return v
			}
		}
	}
	return nil
}

// setPeriod sets the cycle (the longest forcing period, at least a day)
// and its Fourier samples, and checks that every period divides it, that
// it is at most two years and that the warm-up takes a sensible number of
// steps.
func (p *plan) setPeriod(rs *Spec, periods []climate.Harmonic) error {
	p.period = climate.Day
	for _, h := range periods {
		p.period = math.Max(p.period, h.Period)
	}
	for _, h := range periods {
		if n := p.period / h.Period; math.Abs(n-math.Round(n)) > 1e-6*n {
			return &fileerr.Error{File: rs.File, Key: "outside.temperature", Msg: fmt.Sprintf(
				"a room needs forcing periods that divide the longest one (%s): %s does not", layers.FormatDuration(p.period), layers.FormatDuration(h.Period))}
		}
	}
	if p.period > 2*climate.Year {
		return &fileerr.Error{File: rs.File, Key: "outside.temperature", Msg: "a room's forcing periods must not exceed two years"}
	}
	// Fourier samples of one cycle: every minute for a day or two, every
	// 15 minutes beyond.
	dtf := 60.0
	if p.period > 2*climate.Day {
		dtf = 900
	}
	p.samples = int(math.Round(p.period / dtf))
	if math.Abs(float64(p.samples)*dtf-p.period) > 1e-6*p.period {
		return &fileerr.Error{File: rs.File, Key: "outside.temperature", Msg: "the longest forcing period must be a whole number of minutes"}
	}
	if steps := (rs.WarmUp + p.period) / rs.Step; steps > 2e6 {
		return &fileerr.Error{File: rs.File, Line: rs.Line, Key: "room.step", Msg: fmt.Sprintf("%.0f time steps are too many; lengthen the step or shorten warm_up", steps)}
	}
	return nil
}
