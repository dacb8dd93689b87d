package scenarios

import (
	"fmt"
	"io/fs"
	"path"
	"strconv"
	"strings"

	"gopkg.in/yaml.v3"

	"tempstack/climate"
	"tempstack/layers"
	"tempstack/scenarios/room"
	"tempstack/solver"
)

// AirHeatCapacity is the volumetric heat capacity of air, J/(m3 K), of
// the air node and the ventilation (room.AirHeatCapacity).
const AirHeatCapacity = room.AirHeatCapacity

// RoomSettleTolerance is the largest change (K) of the air or any cell
// over one cycle at which a room counts as settled (room.SettleTolerance).
const RoomSettleTolerance = room.SettleTolerance

// RoomSpec is a room scenario (kind: room): one air node, its layered
// elements, windows, ventilation and gains, in SI units.
type RoomSpec struct {
	Outdoor     *Forcing         // outdoor air temperature, degC: a mean and harmonics
	Volume      float64          // m3
	Ventilation Ventilation      // air changes
	Gains       climate.Periodic // W delivered to the air: mean and harmonics
	Elements    []RoomElement
	Windows     []Window
	Thresholds  []float64 // degC, for the hours above
	Step        float64   // s, time step of the simulation
	WarmUp      float64   // s simulated before the reported cycle, when not WarmUpAuto
	// WarmUpAuto (the default, warm_up: auto) repeats the cycle from the
	// exact periodic state until it repeats itself within
	// RoomSettleTolerance before the reported cycle.
	WarmUpAuto bool
	Line       int // line of the room key
	// elementsOK: every item of elements decoded to an element, so a
	// name that matches none is a mistake of the name.
	elementsOK bool
}

// Ventilation is the outdoor air supply of a room (room.Ventilation).
type Ventilation = room.Ventilation

// RoomElement is one layered element of a room.
type RoomElement struct {
	Name         string
	Area         float64 // m2
	Orientation  layers.Orientation
	Layers       []layers.Layer // back (outside) first, the room last
	Construction string         // the wall file the layers came from, if any
	Back         solver.RoomBack
	Solar        *Solar // sun on the back face (back: outside); nil: none
	Line         int
}

// Window is a massless glazed opening: U A between outdoor and room air,
// g A I of transmitted sun, to the air or, by SunTo, absorbed at the
// elements' inside surfaces.
type Window struct {
	Name       string
	Area       float64  // m2
	U          float64  // W/(m2 K)
	G          float64  // total solar energy transmittance, 0..1
	Irradiance *Forcing // W/m2 on the window; nil: no sun
	// SunTo are the parts of the transmitted sun absorbed at elements'
	// inside surfaces (key sun_to); the rest goes to the air. Empty: all
	// to the air.
	SunTo []SunShare
	Line  int
}

// SunShare is the part Fraction (0..1) of a window's transmitted sun
// absorbed at the inside surface of element Element (0-based index in
// RoomSpec.Elements).
type SunShare struct {
	Element  int
	Fraction float64
}

// wallOnlyKeys are top keys of the wall and ground kinds that a room does
// not take (the room's own keys are in roomTopKeys, keys.go).
var wallOnlyKeys = []string{"orientation", "layers", "inside", "surface", "bottom", "analysis"}

// DefaultThresholds are the temperatures (degC) whose hours above a room
// run counts when the scenario gives none: round values often met in
// overheating checks; the criteria that apply are set by local guidance.
var DefaultThresholds = []float64{25, 26, 28}

// rejectRoomKeys reports the room's keys in a wall or ground scenario.
func rejectRoomKeys(top *object, s *Scenario) {
	for _, k := range roomTopKeys.names() {
		if top.has(k) {
			top.failf(k, "applies to kind: room only (this is kind: %s)", s.Kind)
		}
	}
}

// decodeRoom reads the keys of a room scenario.
func (d *decoder) decodeRoom(top *object, s *Scenario) {
	for _, k := range wallOnlyKeys {
		if top.has(k) {
			msg := "does not apply to kind: room"
			switch k {
			case "layers", "orientation":
				msg += "; each element has its own (elements[i].layers, elements[i].orientation)"
			}
			top.failf(k, "%s", msg)
		}
	}
	rs := &RoomSpec{Thresholds: append([]float64(nil), DefaultThresholds...), Step: 900, WarmUpAuto: true,
		Ventilation: Ventilation{Day: 0.5}}
	s.Room = rs
	// outside: the outdoor air
	if !top.has("outside") {
		top.missing("outside", "the outdoor air, e.g. temperature: {mean: 22, daily: {amplitude: 7, peak_hour: 15}}")
	} else if o := top.child("outside", roomOutsideKeys); o != nil {
		if o.has("temperature") {
			rs.Outdoor = d.decodeForcing(o, "temperature", forcingTemperature)
			if f := rs.Outdoor; f != nil && (f.Measured != nil || f.Step != nil) {
				o.failf("temperature", "a room takes a mean and harmonics (daily, annual, harmonics) in this version")
				rs.Outdoor = nil
			}
		} else {
			o.missing("temperature", "the outdoor air temperature")
		}
	}
	if !top.has("room") {
		top.missing("room", "volume, ventilation and gains of the room")
	} else if ro := top.child("room", roomKeys); ro != nil {
		rs.Line = top.line("room")
		if !ro.number("volume", 1e-3, 1e7, "expected the air volume in m3 (a plain number)", &rs.Volume) && !ro.has("volume") {
			ro.missing("volume", "the air volume of the room, m3")
		}
		d.decodeVentilation(ro, rs)
		d.decodeGains(ro, rs)
		if ro.positive("step", layers.Duration, &rs.Step) && (rs.Step > 3600 || rs.Step < 60 || 3600/rs.Step != float64(int(3600/rs.Step+0.5))) {
			ro.failf("step", "the time step must be at least a minute and divide one hour (e.g. 15 min, 30 min, 1 h)")
		}
		if w, ok := ro.values["warm_up"]; !ok || w.Kind != yaml.ScalarNode || w.Value != "auto" {
			if ro.nonNegative("warm_up", layers.Duration, &rs.WarmUp) {
				rs.WarmUpAuto = false
			}
			if rs.WarmUp > 400*climate.Day {
				ro.failf("warm_up", "a warm-up of more than 400 days is not needed")
			}
		}
	}
	d.decodeRoomElements(top, rs)
	d.decodeWindows(top, rs)
	if items, ok := top.list("thresholds"); ok {
		rs.Thresholds = nil
		for i, n := range items {
			if v, ok := d.scalarQuantity(n, fmt.Sprintf("thresholds[%d]", i+1), layers.Temperature); ok {
				rs.Thresholds = append(rs.Thresholds, v)
			}
		}
		if len(items) == 0 {
			top.failf("thresholds", "the list is empty; give at least one temperature, e.g. [25, 26, 28]")
		}
	}
}

// decodeVentilation reads a number of air changes per hour, or
// {day, night, night_from, night_to}.
func (d *decoder) decodeVentilation(ro *object, rs *RoomSpec) {
	if !ro.has("ventilation") {
		return
	}
	const msg = "expected air changes per hour, a number from 0 to 100"
	if ro.values["ventilation"].Kind == yaml.ScalarNode {
		ro.number("ventilation", 0, 100, msg, &rs.Ventilation.Day)
		return
	}
	vo := ro.child("ventilation", ventilationKeys)
	if vo == nil {
		return
	}
	v := Ventilation{Scheduled: true, NightFrom: 22, NightTo: 7}
	if !vo.number("day", 0, 100, msg, &v.Day) && !vo.has("day") {
		vo.missing("day", "air changes per hour by day")
	}
	if !vo.number("night", 0, 100, msg, &v.Night) && !vo.has("night") {
		vo.missing("night", "air changes per hour at night")
	}
	vo.number("night_from", 0, 24, "expected an hour of the day from 0 to 24", &v.NightFrom)
	vo.number("night_to", 0, 24, "expected an hour of the day from 0 to 24", &v.NightTo)
	if vo.clean() && v.NightFrom == v.NightTo {
		vo.failf("night_to", "the night must not be empty: night_from and night_to are both %g", v.NightFrom)
	}
	rs.Ventilation = v
}

// decodeGains reads the heat gains to the air, W: a number, or
// {mean, daily: {amplitude, peak_hour}}.
func (d *decoder) decodeGains(ro *object, rs *RoomSpec) {
	if !ro.has("gains") {
		return
	}
	const msg = "expected a heat flow in W (a plain number)"
	if ro.values["gains"].Kind == yaml.ScalarNode {
		ro.number("gains", -1e7, 1e7, msg, &rs.Gains.Mean)
		return
	}
	g := ro.child("gains", gainsKeys)
	if g == nil {
		return
	}
	if !g.number("mean", -1e7, 1e7, msg, &rs.Gains.Mean) && !g.has("mean") {
		g.missing("mean", "the mean gains, W")
	}
	if c := g.child("daily", gainsDailyKeys); c != nil {
		h := climate.Harmonic{Period: climate.Day}
		if !c.number("amplitude", 0, 1e7, "expected half the peak-to-peak swing in W", &h.Amplitude) && !c.has("amplitude") {
			c.missing("amplitude", "half the peak-to-peak swing, W")
		}
		var peak float64
		if c.number("peak_hour", 0, 24, "expected an hour of the day from 0 to 24", &peak) {
			h.Peak = peak * 3600
		}
		rs.Gains.Harmonics = append(rs.Gains.Harmonics, h)
	}
}

// decodeRoomElements reads the elements list.
func (d *decoder) decodeRoomElements(top *object, rs *RoomSpec) {
	items, ok := top.list("elements")
	switch {
	case !ok && !top.has("elements"):
		top.missing("elements", "a list of the room's walls, roof, floor and partitions, each with area and layers")
		return
	case !ok:
		return
	case len(items) == 0:
		top.failf("elements", "the list is empty; give at least one element")
		return
	case len(items) > 100:
		top.failf("elements", "%d elements is more than the limit of 100", len(items))
		return
	}
	rs.elementsOK = true
	for i, n := range items {
		eo := d.object(n, fmt.Sprintf("elements[%d]", i+1), roomElementKeys)
		if eo == nil {
			rs.elementsOK = false
			continue
		}
		e := RoomElement{Name: fmt.Sprintf("element %d", i+1), Line: n.Line, Orientation: layers.Wall}
		eo.str("name", &e.Name)
		if !eo.number("area", 1e-6, 1e6, "expected the area in m2 (a plain number)", &e.Area) && !eo.has("area") {
			eo.missing("area", "the element's area, m2")
		}
		word := ""
		orientGiven := eo.choice("orientation", orientationWords, &word)
		back := "outside"
		eo.choice("back", backWords, &back)
		if back == "adiabatic" {
			e.Back = solver.BackAdiabatic
		}
		switch {
		case eo.has("layers") && eo.has("construction"):
			eo.failf("construction", "give either layers or construction, not both")
		case eo.has("layers"):
			e.Layers = d.elementLayers(eo)
		case eo.has("construction"):
			var lo layers.Orientation
			e.Layers, lo = d.constructionLayers(eo, &e.Construction)
			if !orientGiven {
				e.Orientation = lo
			}
		default:
			eo.missing("layers", "the element's layers, back (outside) first, or construction: a wall scenario file")
		}
		if orientGiven {
			o, err := layers.ParseOrientation(word)
			if err != nil {
				eo.fail("orientation", err)
			}
			e.Orientation = o
		}
		if eo.has("solar") {
			if e.Back == solver.BackAdiabatic {
				eo.failf("solar", "an adiabatic back sees no sun; remove solar or make the back outside")
			} else {
				sol := d.decodeSolar(eo, &Scenario{Kind: Wall, Orientation: e.Orientation})
				if sol != nil && sol.Irradiance != nil && sol.Irradiance.Measured != nil {
					eo.failf("solar", "a room takes an irradiance of mean and harmonics in this version")
				}
				e.Solar = sol
			}
		}
		rs.Elements = append(rs.Elements, e)
	}
}

// elementLayers reads an element's layers with the wall kind's layer decoder.
func (d *decoder) elementLayers(eo *object) []layers.Layer {
	items, ok := eo.list("layers")
	if !ok {
		return nil
	}
	if len(items) == 0 {
		eo.failf("layers", "the list is empty; give at least one layer")
		return nil
	}
	if len(items) > maxLayers {
		eo.failf("layers", "%d layers is more than the limit of %d", len(items), maxLayers)
		return nil
	}
	var ls []layers.Layer
	for i, n := range items {
		if lo := d.object(n, fmt.Sprintf("%s.layers[%d]", eo.path, i+1), layerKeys); lo != nil {
			l := d.decodeLayer(lo, len(ls))
			if l.Freeze != nil && lo.clean() {
				lo.failf("latent_heat", "a room element does not freeze in this version")
			}
			ls = append(ls, l)
		}
	}
	return ls
}

// constructionLayers reads the layers (and orientation) of the wall
// scenario file that construction names, relative to this file's folder.
func (d *decoder) constructionLayers(eo *object, name *string) ([]layers.Layer, layers.Orientation) {
	var p string
	if !eo.str("construction", &p) {
		return nil, layers.Wall
	}
	*name = p
	if d.fsys == nil || !fs.ValidPath(p) {
		eo.failf("construction", "cannot read %q: give a path inside this file's folder (no leading / or ..)", p)
		return nil, layers.Wall
	}
	data, err := fs.ReadFile(d.fsys, p)
	if err != nil {
		eo.failf("construction", "cannot read %q: %v", p, cleanOSError(err))
		return nil, layers.Wall
	}
	sub, err := fs.Sub(d.fsys, path.Dir(p))
	if err != nil {
		sub = d.fsys
	}
	ws, err := DecodeFS(p, data, sub)
	if err != nil {
		eo.failf("construction", "%s does not decode: %v", strconv.Quote(p), err)
		return nil, layers.Wall
	}
	if ws.Kind != Wall {
		eo.failf("construction", "%s is kind: %s; a construction is a wall scenario", strconv.Quote(p), ws.Kind)
		return nil, layers.Wall
	}
	for _, l := range ws.Layers {
		if l.Freeze != nil {
			eo.failf("construction", "%s has a freezing layer; a room element does not freeze in this version", strconv.Quote(p))
			return nil, ws.Orientation
		}
	}
	return ws.Layers, ws.Orientation
}

// decodeWindows reads the windows list.
func (d *decoder) decodeWindows(top *object, rs *RoomSpec) {
	items, ok := top.list("windows")
	if !ok {
		return
	}
	for i, n := range items {
		wo := d.object(n, fmt.Sprintf("windows[%d]", i+1), windowKeys)
		if wo == nil {
			continue
		}
		w := Window{Name: fmt.Sprintf("window %d", i+1), Line: n.Line}
		wo.str("name", &w.Name)
		if !wo.number("area", 1e-6, 1e5, "expected the area in m2 (a plain number)", &w.Area) && !wo.has("area") {
			wo.missing("area", "the window's area, m2")
		}
		if !wo.positive("u_value", layers.HeatTransferCoefficient, &w.U) && !wo.has("u_value") {
			wo.missing("u_value", "the window's U value, W/(m2 K)")
		}
		if wo.quantity("g_value", layers.Fraction, &w.G) && (w.G < 0 || w.G > 1) {
			wo.failf("g_value", "a total solar energy transmittance lies between 0 and 1, got %g", w.G)
		}
		if wo.has("irradiance") {
			w.Irradiance = d.decodeForcing(wo, "irradiance", forcingIrradiance)
			if f := w.Irradiance; f != nil && f.Measured != nil {
				wo.failf("irradiance", "a room takes an irradiance of mean and harmonics in this version")
				w.Irradiance = nil
			}
			if !wo.has("g_value") {
				wo.missing("g_value", "the total solar energy transmittance of the glazing, 0 to 1")
			}
		}
		if wo.has("sun_to") {
			w.SunTo = d.decodeSunTo(wo, rs)
		}
		rs.Windows = append(rs.Windows, w)
	}
}

// decodeSunTo reads a window's sun_to: a list of {element, fraction}, the
// parts of its transmitted sun absorbed at the named elements' inside
// surfaces. The fractions lie in [0, 1] and add up to at most 1 (the rest
// heats the air); an element is named once per window.
func (d *decoder) decodeSunTo(wo *object, rs *RoomSpec) []SunShare {
	items, ok := wo.list("sun_to")
	if !ok {
		return nil
	}
	names := make([]string, len(rs.Elements))
	count := map[string]int{}
	for i, e := range rs.Elements {
		names[i] = e.Name
		count[e.Name]++
	}
	var out []SunShare
	seen := map[int]int{} // element -> line
	sum := 0.0
	for i, n := range items {
		so := d.object(n, fmt.Sprintf("%s.sun_to[%d]", wo.path, i+1), sunToKeys)
		if so == nil {
			continue
		}
		sh := SunShare{Element: -1}
		var name string
		if so.str("element", &name) {
			switch {
			case count[name] > 1:
				so.failf("element", "%q names %d elements; give the elements distinct names", name, count[name])
			case count[name] == 1:
				for k, e := range names {
					if e == name {
						sh.Element = k
					}
				}
				if prev, dup := seen[sh.Element]; dup {
					so.failf("element", "%q is named twice in this window's sun_to (first on line %d); give its whole fraction once", name, prev)
					sh.Element = -1
				} else {
					seen[sh.Element] = so.line("element")
				}
			case rs.elementsOK:
				msg := fmt.Sprintf("no element is named %q", name)
				if c := layers.Closest(name, names, 1); len(c) > 0 {
					msg += fmt.Sprintf("; did you mean %q?", c[0])
				} else if len(names) > 0 {
					msg += "; the elements are " + quotedList(names)
				}
				so.failf("element", "%s", msg)
			}
		} else if !so.has("element") {
			so.missing("element", "the name of the element whose inside surface absorbs this part of the sun")
		}
		if so.fraction("fraction", &sh.Fraction) {
			if sh.Fraction > 1 {
				so.failf("fraction", "a fraction of the window's sun lies between 0 and 1, got %g", sh.Fraction)
				continue
			}
			sum += sh.Fraction
		} else if !so.has("fraction") {
			so.missing("fraction", "the part of the window's transmitted sun absorbed there, 0 to 1")
		}
		if sh.Element >= 0 && so.clean() {
			out = append(out, sh)
		}
	}
	if wo.clean() && sum > 1+1e-9 {
		wo.failf("sun_to", "the fractions add up to %.4g; at most 1 (the rest of the sun heats the air)", sum)
		return nil
	}
	return out
}

// quotedList writes names as "a", "b", "c".
func quotedList(names []string) string {
	q := make([]string, len(names))
	for i, s := range names {
		q[i] = strconv.Quote(s)
	}
	return strings.Join(q, ", ")
}
