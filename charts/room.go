package charts

import (
	"fmt"
	"html"
	"html/template"
	"strconv"
	"strings"

	ec "github.com/go-echarts/go-echarts/v2/charts"
	"github.com/go-echarts/go-echarts/v2/opts"

	"tempstack/scenarios/results"
)

// Chart ids of the room report.
const (
	idRoomDay     = "chart-room-day"
	idRoomSurface = "chart-room-surface"
)

// buildRoom assembles the report of a room run (kind: room): the
// elements drawn by area and tabled, the room temperature over the day
// (exact and simulated, with and without the elements' mass), the hours
// above the thresholds and each path's share of the heat.
func buildRoom(p *page, r *results.Results) ([]*chartSpec, error) {
	rm := r.Room
	p.KindLabel = "room"
	if rm == nil {
		p.Summary = []string{"These results hold no room."}
		return nil, nil
	}
	p.Summary = roomSummary(rm)
	var specs []*chartSpec

	els := section{ID: "room", Heading: "Room and elements"}
	els.Blocks = append(els.Blocks, block{Figure: roomFigure(rm)}, block{Table: roomElementTable(rm)})
	if t := roomWindowTable(rm); t != nil {
		els.Blocks = append(els.Blocks, block{Table: t})
	}

	temp := section{ID: "temperature", Heading: "Room temperature"}
	c, err := roomDayChart(rm)
	if err != nil {
		return nil, err
	}
	if c != nil {
		specs = append(specs, c)
		temp.Blocks = append(temp.Blocks, block{Chart: c})
	}
	cs, err := roomSurfaceChart(rm)
	if err != nil {
		return nil, err
	}
	if cs != nil {
		specs = append(specs, cs)
		temp.Blocks = append(temp.Blocks, block{Chart: cs})
	}
	temp.Blocks = append(temp.Blocks, block{Table: roomPeakTable(rm)}, block{Table: roomHoursTable(rm)})

	heat := section{ID: "heat", Heading: "Where the heat goes"}
	if t := roomPathTable(rm); t != nil {
		heat.Blocks = append(heat.Blocks, block{Table: t})
	}

	study := section{ID: "study", Heading: "Options and studies"}
	add := func(b ...*block) {
		for _, x := range b {
			if x != nil {
				study.Blocks = append(study.Blocks, *x)
			}
		}
	}
	if f := variantsFigure(r); f != nil {
		add(&block{Figure: f})
	}
	add(variantsTable(r), sweepTable(r))
	add(targetBlock(r)...)
	add(uncertaintyTables(r)...)
	for _, s := range []section{els, temp, study, heat} {
		if len(s.Blocks) > 0 {
			p.Sections = append(p.Sections, s)
		}
	}
	p.Methods = roomMethods(rm)
	p.Cautions = results.Cautions(r)
	return specs, nil
}

// roomSummary is the plain-words summary of a room run.
func roomSummary(rm *results.RoomResult) []string {
	var out []string
	if s := rm.Simulation; s != nil {
		out = append(out, fmt.Sprintf("Simulated over the last cycle, the room air ranges from %s to %s and the operative temperature from %s to %s.",
			degC(s.AirMin_C), degC(s.AirMax_C), degC(s.OperativeMin_C), degC(s.OperativeMax_C)))
	}
	pe := rm.Periodic
	mean := ""
	if rm.VentilationNight_ach != nil {
		mean = " with the ventilation at its daily mean (the exact method is linear and periodic; the night rate is in the simulation only)"
	}
	out = append(out, fmt.Sprintf("The exact periodic solution (ISO 13786 matrices of every element, one air node)%s gives a mean air temperature of %s, from %s to %s.",
		mean, degC(pe.AirMean_C), degC(pe.AirMin_C), degC(pe.AirMax_C)))
	if m := rm.MassRemoved; m != nil && m.Statement != "" {
		out = append(out, strings.ReplaceAll(m.Statement, "degC", "°C"))
	}
	out = append(out, "Comfort criteria (which temperature, which thresholds, how many hours) are set by local guidance; the hours above the thresholds here compare designs, they are not a compliance check.")
	return out
}

// roomFigure draws the elements as bars whose length is their area,
// tinted by what lies behind them, with the windows.
func roomFigure(rm *results.RoomResult) *figure {
	type bar struct {
		name, kind string
		area       float64
	}
	var bars []bar
	maxA := 0.0
	for _, e := range rm.Elements {
		k := e.Orientation + ", back " + e.Back
		if e.Sunlit {
			k += ", in the sun"
		}
		bars = append(bars, bar{e.Name, k, e.Area_m2})
		maxA = max(maxA, e.Area_m2)
	}
	for _, w := range rm.Windows {
		bars = append(bars, bar{w.Name, "window", w.Area_m2})
		maxA = max(maxA, w.Area_m2)
	}
	if len(bars) == 0 || !(maxA > 0) {
		return nil
	}
	const rowH, left, barMax = 30.0, 250.0, 380.0
	h := rowH*float64(len(bars)) + 20
	var b strings.Builder
	fmt.Fprintf(&b, `<svg class="xsec" viewBox="0 0 %d %s" role="img" aria-label="Elements of the room by area">`, svgWidth, fixed(h, 0))
	for i, x := range bars {
		y := 10 + rowH*float64(i)
		fill, ink := "#D6EBF8", "#0072B2" // outside
		switch {
		case x.kind == "window":
			fill, ink = "#EAF6FC", "#56B4E9"
		case strings.Contains(x.kind, "adiabatic"):
			fill, ink = "#EAEDEF", "#506D7D"
		case strings.Contains(x.kind, "sun"):
			fill, ink = "#F3CDB3", "#A34700"
		}
		w := barMax * x.area / maxA
		name := x.name
		if r := []rune(name); len(r) > 32 {
			name = string(r[:31]) + "…"
		}
		fmt.Fprintf(&b, `<text x="%s" y="%s" text-anchor="end">%s</text>`, fixed(left-8, 0), fixed(y+15, 1), html.EscapeString(name))
		fmt.Fprintf(&b, `<rect x="%s" y="%s" width="%s" height="%s" fill="%s" stroke="%s"><title>%s</title></rect>`,
			fixed(left, 0), fixed(y+2, 1), fixed(w, 1), fixed(rowH-8, 1), fill, ink, html.EscapeString(x.name+": "+x.kind))
		fmt.Fprintf(&b, `<text x="%s" y="%s">%s m² · %s</text>`, fixed(left+w+6, 1), fixed(y+15, 1), fixed(x.area, 1), html.EscapeString(x.kind))
	}
	b.WriteString(`</svg>`)
	return &figure{
		SVG:     template.HTML(b.String()),
		Caption: "The room's elements and windows, each bar as long as its area. Blue: backed by the outside; orange: backed by the outside and in the sun; grey: adiabatic back (a neighbour at the same temperature); pale blue: windows.",
	}
}

// roomElementTable lists the elements.
func roomElementTable(rm *results.RoomResult) *table {
	t := newTable("Elements (layers listed from the back to the room in results.json)",
		[]string{"Element", "Orientation", "Back", "Area (m²)", "U (W/(m²·K))", "κ (kJ/(m²·K))", "|Y| room side, 24 h (W/(m²·K))", "Heat to the air (kWh/day)", "Heat from the air (kWh/day)", "Share of the heat to the air"},
		"text", "text", "text")
	for _, e := range rm.Elements {
		back := e.Back
		if e.Sunlit {
			back += ", sun"
		}
		if e.Construction != "" {
			back += " (" + e.Construction + ")"
		}
		t.row(e.Name, e.Orientation, back, fixed(e.Area_m2, 1), sig(e.UValue_W_m2K, 3), fixed(e.ArealHeatCapacity_kJ_m2K, 0), sig(e.InsideAdmittance_W_m2K, 3),
			ptrFixed(e.HeatToAir_kWh_day, 2), ptrFixed(e.HeatFromAir_kWh_day, 2), ptrPercent(e.ShareOfHeatToAir))
	}
	t.Notes = append(t.Notes, "U of an element with an adiabatic back is that of its layers between the two surface resistances; no steady heat crosses it. κ is the areal heat capacity of the layers. |Y| is the admittance seen from the room air (|Y₁₁| backed by the outside, |Z₂₁/Z₂₂| adiabatic, ISO 13786).",
		"Heat to and from the air is summed over the simulated cycle (each 15-minute interval by its mean); the share is the element's part of all heat delivered to the air, gains and ventilation included.")
	var sun []string
	for _, e := range rm.Elements {
		if e.WindowSunMean_W != nil {
			sun = append(sun, fmt.Sprintf("%s %s W", e.Name, fixed(*e.WindowSunMean_W, 0)))
		}
	}
	if len(sun) > 0 {
		t.Notes = append(t.Notes, "Window sun absorbed at the inside surfaces (mean over the cycle): "+strings.Join(sun, ", ")+". An element's heat to the air includes it, given back at once through Rsi or later from its mass.")
	}
	return t
}

// roomWindowTable lists the windows.
func roomWindowTable(rm *results.RoomResult) *table {
	if len(rm.Windows) == 0 {
		return nil
	}
	t := newTable("Windows (massless: U·A to the outdoor air, g·A·I of sun into the room)", []string{"Window", "Area (m²)", "U (W/(m²·K))", "g", "Mean solar gain (W)"}, "text")
	for _, w := range rm.Windows {
		t.row(w.Name, fixed(w.Area_m2, 1), sig(w.UValue_W_m2K, 3), fixed(w.GValue, 2), fixed(w.SolarMean_W, 0))
		if len(w.SunTo) > 0 {
			t.Notes = append(t.Notes, "Where the sun of "+w.Name+" goes: "+sunSplit(w)+" (sun_to).")
		}
	}
	return t
}

// sunSplit says where a window's transmitted sun is absorbed, in words:
// "60 % on floor slab, 15 % on partitions, 25 % to the air".
func sunSplit(w results.RoomWindow) string {
	var parts []string
	for _, s := range w.SunTo {
		parts = append(parts, percent(s.Fraction)+" on "+s.Element)
	}
	if a := w.SunToAirFraction; a != nil {
		parts = append(parts, percent(*a)+" to the air")
	}
	return strings.Join(parts, ", ")
}

// roomPeakTable compares the peaks.
func roomPeakTable(rm *results.RoomResult) *table {
	t := newTable("Highest and lowest temperatures over the cycle", []string{"", "Air max (°C)", "Air min (°C)", "Operative max (°C)", "Operative min (°C)"}, "text")
	pe := rm.Periodic
	t.row("Exact periodic solution", fixed(pe.AirMax_C, 2), fixed(pe.AirMin_C, 2), fixed(pe.OperativeMax_C, 2), fixed(pe.OperativeMin_C, 2))
	if s := rm.Simulation; s != nil {
		t.row("Simulation, last cycle", fixed(s.AirMax_C, 2), fixed(s.AirMin_C, 2), fixed(s.OperativeMax_C, 2), fixed(s.OperativeMin_C, 2))
	}
	if m := rm.MassRemoved; m != nil {
		t.row("Without the mass, exact", fixed(m.Periodic.AirMax_C, 2), fixed(m.Periodic.AirMin_C, 2), fixed(m.Periodic.OperativeMax_C, 2), fixed(m.Periodic.OperativeMin_C, 2))
		if s := m.Simulation; s != nil {
			t.row("Without the mass, simulated", fixed(s.AirMax_C, 2), fixed(s.AirMin_C, 2), fixed(s.OperativeMax_C, 2), fixed(s.OperativeMin_C, 2))
		}
	}
	if s := rm.Simulation; s != nil && s.ExactCheck_K != nil {
		t.Notes = append(t.Notes, fmt.Sprintf("Cross-check: simulated with the ventilation at its daily mean, as the exact method takes it, the room air departs from the exact periodic solution by at most %s K over the cycle.", sig(*s.ExactCheck_K, 2)))
	}
	t.Notes = append(t.Notes, "Operative temperature: "+rm.OperativeTemperature+".",
		"Without the mass: every element keeps its U value but holds no heat; the air keeps its own heat capacity.")
	if len(rm.Notes) > 0 {
		t.Notes = append(t.Notes, rm.Notes...)
	}
	return t
}

// roomHoursTable gives the hours above each threshold.
func roomHoursTable(rm *results.RoomResult) *table {
	s := rm.Simulation
	if s == nil {
		return nil
	}
	t := newTable("Hours a day above each threshold (operative temperature, simulated)", []string{"Threshold (°C)", "With the mass (h)", "Without the mass (h)"})
	for i, h := range s.HoursAbove {
		without := dash
		if m := rm.MassRemoved; m != nil && m.Simulation != nil && i < len(m.Simulation.HoursAbove) {
			without = fixed(m.Simulation.HoursAbove[i].Hours, 1)
		}
		t.row(fixed(h.Threshold_C, 1), fixed(h.Hours, 1), without)
	}
	t.Notes = append(t.Notes, "The thresholds are inputs of the scenario (thresholds). Comfort criteria are set by local guidance; these hours compare designs and are not a compliance check.")
	return t
}

// roomPathTable lists the heat delivered to and taken from the air by
// each path.
func roomPathTable(rm *results.RoomResult) *table {
	s := rm.Simulation
	if s == nil || len(s.Paths) == 0 {
		return nil
	}
	to := 0.0
	for _, ph := range s.Paths {
		to += ph.ToAir_kWh_day
	}
	t := newTable("Heat delivered to and taken from the room air over the simulated cycle", []string{"Path", "To the air (kWh/day)", "From the air (kWh/day)", "Share of the heat to the air"}, "text")
	for _, ph := range s.Paths {
		share := dash
		if to > 0 {
			share = percent(ph.ToAir_kWh_day / to)
		}
		t.row(ph.Name, fixed(ph.ToAir_kWh_day, 2), fixed(ph.FromAir_kWh_day, 2), share)
	}
	t.Notes = append(t.Notes, fmt.Sprintf("Energy balance of the simulated room (elements and air): relative error %s.", sig(s.EnergyBalanceRelativeError, 2)))
	return t
}

// roomCycleChart opens a chart of temperatures over one cycle of span
// hours: time in the cycle across, degC up. It returns the chart, the
// factor from hours to the axis unit and that unit.
func roomCycleChart(id, title string, span float64) (*ec.Line, float64, string) {
	f, xu, xl := timeAxis(span)
	c := newChart(id, title, "tipX", 56)
	c.SetGlobalOptions(
		ec.WithXAxisOpts(valueAxisX("Time in the cycle ("+xl+")", " "+xl, 0, num(span*f), false)),
		ec.WithYAxisOpts(valueAxisY("Temperature (°C)", " °C", false)),
	)
	return c, f, xu
}

// roomDayChart draws the room temperature over the cycle.
func roomDayChart(rm *results.RoomResult) (*chartSpec, error) {
	s := rm.Series
	if len(s.CycleTime_h) == 0 {
		return nil, nil
	}
	span := rm.Periodic.Period_h
	c, f, xu := roomCycleChart(idRoomDay, "Room temperature over the cycle ("+periodLabel(span)+")", span)
	// The last simulated cycle.
	var st, sa, so, sn []float64
	for j, t := range s.Time_h {
		if t >= s.CycleStart_h-1e-9 {
			st = append(st, (t-s.CycleStart_h)*f)
			sa = append(sa, s.Air_C[j])
			so = append(so, s.Operative_C[j])
			sn = append(sn, s.OperativeNoMass_C[j])
		}
	}
	ct := scaled(s.CycleTime_h, f)
	thinned := false
	var marks []ec.SeriesOpts
	if len(rm.Thresholds_C) > 0 {
		// One label for all the lines, on the highest: thresholds a degree
		// apart would print over each other.
		var items []opts.MarkLineNameYAxisItem
		var words []string
		top, topValue := 0, 0.0
		for _, th := range rm.Thresholds_C {
			if v := num(th); v != nil {
				if len(items) == 0 || th > topValue {
					top, topValue = len(items), th
				}
				items = append(items, opts.MarkLineNameYAxisItem{YAxis: v})
				words = append(words, strconv.FormatFloat(th, 'f', -1, 64))
			}
		}
		if len(items) > 0 {
			items[top].Name = "thresholds " + strings.Join(words, ", ") + " °C"
		}
		marks = append(marks, ec.WithMarkLineNameYAxisItemOpts(items...), ec.WithMarkLineStyleOpts(opts.MarkLineStyle{
			Symbol:    []string{"none", "none"},
			LineStyle: &opts.LineStyle{Color: colGrey, Width: 1, Type: "dashed"},
			Label:     &opts.Label{Show: opts.Bool(true), Formatter: "{b}", Position: "insideEndTop", Color: colGrey, FontSize: 11},
		}))
	}
	for _, l := range []line{
		{name: "Outdoor air", x: ct, y: s.CycleOutdoor_C, color: colVermilion, width: 1.5, opts: marks},
		{name: "Room air, exact", x: ct, y: s.CycleAir_C, color: colSky, dash: "dashed"},
		{name: "Room air, simulated", x: st, y: sa, color: colBlue},
		{name: "Operative, exact", x: ct, y: s.CycleOperative_C, color: colOrange, dash: "dashed"},
		{name: "Operative, simulated", x: st, y: so, color: colBlack, width: 1.5},
		{name: "Operative without the mass, simulated", x: st, y: sn, color: colPurple, dash: "dotted"},
	} {
		if len(l.y) == 0 {
			continue
		}
		l.xUnit, l.yUnit = xu, uDegC
		thinned = addLine(c, l) || thinned
	}
	caption := "Room temperatures over one cycle: the exact periodic solution (dashed; it takes the ventilation's daily mean) and the last cycle of the coupled simulation (solid), with the operative temperature of the same room without the elements' heat capacity (dotted). Grey dashed lines: the thresholds."
	return finish(c, idRoomDay, caption, thinned)
}

// roomSurfaceChart draws the simulated inside surface temperature of each
// element over the last cycle, with the room air.
func roomSurfaceChart(rm *results.RoomResult) (*chartSpec, error) {
	s := rm.Series
	if len(s.Time_h) == 0 || len(s.Surface_C) == 0 {
		return nil, nil
	}
	span := rm.Periodic.Period_h
	c, f, xu := roomCycleChart(idRoomSurface, "Inside surface temperatures, simulated ("+periodLabel(span)+" cycle)", span)
	var idx []int
	var st []float64
	for j, t := range s.Time_h {
		if t >= s.CycleStart_h-1e-9 {
			idx = append(idx, j)
			st = append(st, (t-s.CycleStart_h)*f)
		}
	}
	pick := func(v []float64) []float64 {
		out := make([]float64, len(idx))
		for i, j := range idx {
			out[i] = v[j]
		}
		return out
	}
	colours := []string{colBlue, colOrange, colGreen, colPurple, colSky, colVermilion, colYellow}
	thinned := addLine(c, line{name: "Room air", x: st, y: pick(s.Air_C), color: colBlack, width: 1.5, dash: "dashed", xUnit: xu, yUnit: uDegC})
	for k, e := range rm.Elements {
		if k >= len(s.Surface_C) {
			break
		}
		thinned = addLine(c, line{name: e.Name, x: st, y: pick(s.Surface_C[k]), color: colours[k%len(colours)], xUnit: xu, yUnit: uDegC}) || thinned
	}
	return finish(c, idRoomSurface, "Inside surface temperature of each element (the wall side of its inside surface resistance) over the last simulated cycle, with the room air (dashed). A warm surface radiates to the occupants: the operative temperature averages these by area with the air.", thinned)
}

// roomMethods lists the methods of a room run.
func roomMethods(rm *results.RoomResult) []string {
	m := []string{
		"One air node of heat capacity 1200 J/(m³·K) × volume (the volumetric heat capacity of air of ISO 13789); ventilation H = 1200 × volume × air changes per hour / 3600 W/K to the outdoor air; windows massless (U·A to the outdoor air, g·A·I of the sun to the air); internal gains to the air.",
		"Each element is a layered construction of area A with the surface resistances of its orientation (ISO 6946); its room side joins the air node through Rsi, its back the outdoor air (or its sol-air temperature, as in the wall kind) or nothing (adiabatic: a neighbour at the same temperature).",
		"Exact periodic solution per harmonic, exp(+iωt): iωC θᵢ = Φ + H (θₑ − θᵢ) + Σ A (Y₁₂ θ_back − Y₁₁ θᵢ) + Σ_adiabatic A (Z₂₁/Z₂₂) θᵢ with the ISO 13786 heat transfer matrices of every element (side 1 the room); the forcing is split into its Fourier series over the longest period (clipped sun included), and the ventilation enters with its daily mean.",
		"Simulation: every element's finite-volume column and the air node advanced together by TR-BDF2 (second order, L-stable); in each stage each element is eliminated to its coupling with the air (Schur complement on the one air unknown), so the coupled system is solved exactly. It starts from the exact periodic state, runs the warm-up, and reports the last cycle; night ventilation and the clipped sun act as they are.",
		"Operative temperature: " + rm.OperativeTemperature + ".",
		"Without the mass: the same room with every layer replaced by its thermal resistance (same U values, no heat capacity), the air keeping its own.",
	}
	for _, w := range rm.Windows {
		if len(w.SunTo) > 0 {
			m = append(m, "Window sun on the surfaces (sun_to): a heat source at the wall side of each element's inside surface resistance. The surface node's balance sends 1 − Rsi·Y of it (per harmonic, Y the element's admittance seen from the air; 1 − Rsi·U for the mean, all of it for an adiabatic element's mean) to the air and the rest into the element; the simulation splits it at the surface between Rsi and the half of the room-side cell. Without the mass the same sun lands on the massless surfaces.")
			break
		}
	}
	return m
}

// ptrFixed formats a value that may be absent.
func ptrFixed(v *float64, d int) string {
	if v == nil {
		return dash
	}
	return fixed(*v, d)
}

// ptrPercent formats a fraction that may be absent.
func ptrPercent(v *float64) string {
	if v == nil {
		return dash
	}
	return percent(*v)
}
