package charts

import (
	"fmt"
	"math"

	ec "github.com/go-echarts/go-echarts/v2/charts"
	"github.com/go-echarts/go-echarts/v2/opts"

	"tempstack/scenarios/results"
)

// Every chart below is built with go-echarts (ec.Line plus, where a
// min/max band is drawn, one custom series appended to it); none is built
// as a plain map.

// legendRows estimates how many rows the legend takes in a chart of
// chartWidth pixels (about 7 px per character plus the symbol).
func legendRows(c *ec.Line) int {
	w, rows := 0, 1
	for _, s := range c.MultiSeries {
		item := 6*len([]rune(s.Name)) + 40
		if w+item > chartWidth*86/100 {
			rows++
			w = 0
		}
		w += item
	}
	return rows
}

// finish validates the chart and packs it with its id and caption; the
// plot starts below the legend.
func finish(c *ec.Line, id, caption string, thinned bool) (*chartSpec, error) {
	if len(c.GridList) > 0 {
		c.GridList[0].Top = fmt.Sprint(50 + 22*legendRows(c))
	}
	o, err := chartOption(c)
	if err != nil {
		return nil, err
	}
	s := &chartSpec{ID: id, Caption: caption, option: o}
	if thinned {
		s.Note = fmt.Sprintf("Long series are drawn with at most %d points per line (the lowest and highest value of each interval are kept); the tables use every value.", maxPoints+2)
	}
	return s, nil
}

// labels names the two sides for the kind of results.
type sideNames struct {
	env, outSurf, inSurf, inAir, flux string
}

func sides(kind results.Kind) sideNames {
	if kind == results.Ground {
		return sideNames{"Surface environment", "Ground surface", "Bottom of the column", "Below the column", "Heat flux at the bottom (+ = downward)"}
	}
	return sideNames{"Outside environment", "Outside surface", "Inside surface", "Inside air", "Heat flux into the room"}
}

// cycleChart: one period of the exact periodic steady state, temperatures
// on the left axis and the inside heat flux on the right axis.
func cycleChart(r *results.Results) (*chartSpec, error) {
	s := r.Series
	if len(s.Cycle.Time_h) == 0 {
		return nil, nil
	}
	span := maxOf(s.Cycle.Time_h)
	f, xu, xl := timeAxis(span)
	period := span
	if len(r.Periodic) > 0 && finite(r.Periodic[0].Period_h) && r.Periodic[0].Period_h > 0 {
		period = r.Periodic[0].Period_h
	}
	n := sides(r.Kind)
	c := newChart(idCycle, "Periodic steady state over one period ("+periodLabel(period)+")", "tipX", 56)
	c.SetGlobalOptions(
		ec.WithXAxisOpts(valueAxisX("Time in the cycle ("+xl+")", " "+xl, 0, num(span*f), false)),
		ec.WithYAxisOpts(valueAxisY("Temperature (°C)", " °C", false)),
	)
	flux := valueAxisY("Heat flux (W/m²)", "", false)
	flux.SplitLine = &opts.SplitLine{Show: opts.Bool(false)}
	c.ExtendYAxis(flux)
	t := scaled(s.Cycle.Time_h, f)
	thinned := false
	for _, l := range []line{
		{name: n.env, y: s.Cycle.OutsideAir_C, color: colVermilion},
		{name: n.outSurf, y: s.Cycle.OutsideSurface_C, color: colOrange},
		{name: n.inSurf, y: s.Cycle.InsideSurface_C, color: colBlue},
		{name: n.inAir, y: s.Cycle.InsideAir_C, color: colSky, dash: "dashed"},
		{name: n.flux, y: s.Cycle.InsideFlux_W_m2, color: colPurple, dash: "dotted", yAxis: 1, yUnit: uFlux},
	} {
		if len(l.y) == 0 {
			continue
		}
		l.x, l.xUnit = t, xu
		if l.yUnit == "" {
			l.yUnit = uDegC
		}
		thinned = addLine(c, l) || thinned
	}
	caption := "Exact periodic solution over one cycle of the first analysis period. Temperatures on the left axis; the heat flux (dotted, right axis) is positive into the room."
	if r.Kind == results.Ground {
		caption = "Exact periodic solution over one period. Temperatures on the left axis; the heat flux at the bottom (dotted, right axis) is positive downward."
	}
	return finish(c, idCycle, caption, thinned)
}

// envelopeChart: minimum, mean and maximum temperature of the periodic
// state against position through a wall, layer boundaries marked.
func envelopeChart(r *results.Results) (*chartSpec, error) {
	s := r.Series
	if len(s.Profile.Position_m) == 0 {
		return nil, nil
	}
	x := scaled(s.Profile.Position_m, 1000)
	title := "Temperature range through the construction"
	if len(r.Periodic) > 0 {
		title += " (" + periodLabel(r.Periodic[0].Period_h) + " cycle)"
	}
	c := newChart(idEnvelope, title, "tipX", 56)
	c.SetGlobalOptions(
		ec.WithXAxisOpts(valueAxisX("Position from the outside surface (mm)", " mm", num(minOf(x)), num(maxOf(x)), false)),
		ec.WithYAxisOpts(valueAxisY("Temperature (°C)", " °C", false)),
	)
	addBand(c, "Range (min–max)", x, s.Profile.Min_C, s.Profile.Max_C, false)
	thinned := addLine(c, line{name: "Maximum", x: x, y: s.Profile.Max_C, xUnit: uMM, yUnit: uDegC, color: colVermilion})
	thinned = addLine(c, line{name: "Mean", x: x, y: s.Profile.Mean_C, xUnit: uMM, yUnit: uDegC, color: colBlack, width: 1.5, dash: "dashed",
		opts: layerMarks(r, false)}) || thinned
	thinned = addLine(c, line{name: "Minimum", x: x, y: s.Profile.Min_C, xUnit: uMM, yUnit: uDegC, color: colBlue}) || thinned
	return finish(c, idEnvelope, "Lowest, mean and highest temperature reached at each position during the cycle (exact periodic solution). Dashed vertical lines are layer boundaries; outside on the left, inside on the right.", thinned)
}

// layerMarks marks layer boundaries (markLines) and names the layers
// (markAreas) in a profile chart. depthDown selects horizontal lines in
// metres for a depth-down chart; otherwise vertical lines in millimetres.
func layerMarks(r *results.Results, depthDown bool) []ec.SeriesOpts {
	b := r.Series.Profile.Interfaces_m
	if len(b) == 0 {
		return nil
	}
	style := ec.WithMarkLineStyleOpts(opts.MarkLineStyle{
		Symbol:    []string{"none", "none"},
		LineStyle: &opts.LineStyle{Color: colGrey, Width: 1, Type: "dashed"},
		Label:     &opts.Label{Show: opts.Bool(false)},
	})
	var so []ec.SeriesOpts
	if depthDown {
		// Boundaries below the surface, each named by the layer below it.
		var items []opts.MarkLineNameYAxisItem
		for i, z := range b {
			v := num(z)
			if v == nil || z <= 0 {
				continue
			}
			name := "bottom of the column"
			if i < len(r.Layers) {
				name = "top of " + r.Layers[i].Name
			}
			items = append(items, opts.MarkLineNameYAxisItem{Name: name, YAxis: v})
		}
		style = ec.WithMarkLineStyleOpts(opts.MarkLineStyle{
			Symbol:    []string{"none", "none"},
			LineStyle: &opts.LineStyle{Color: colGrey, Width: 1, Type: "dashed"},
			Label:     &opts.Label{Show: opts.Bool(true), Formatter: "{b}", Position: "insideEndTop", Color: colGrey, FontSize: 11},
		})
		so = append(so, ec.WithMarkLineNameYAxisItemOpts(items...), style)
		return so
	}
	var items []opts.MarkLineNameXAxisItem
	for _, x := range b {
		if v := num(x * 1000); v != nil {
			items = append(items, opts.MarkLineNameXAxisItem{Name: "layer boundary", XAxis: v})
		}
	}
	so = append(so, ec.WithMarkLineNameXAxisItemOpts(items...), style)
	// Name the layers when the boundaries match them one to one.
	if len(b) == len(r.Layers)+1 {
		var areas [][]opts.MarkAreaData
		span := b[len(b)-1] - b[0]
		for i, l := range r.Layers {
			x0, x1 := num(b[i]*1000), num(b[i+1]*1000)
			if x0 == nil || x1 == nil {
				continue
			}
			// A name that cannot fit over its layer is left to the table.
			show := 7*float64(len([]rune(l.Name))) < 0.86*chartWidth*(b[i+1]-b[i])/span
			fill := "rgba(0,0,0,0)" // names only; the band stays visible
			areas = append(areas, []opts.MarkAreaData{
				{Name: l.Name, XAxis: x0, MarkAreaStyle: opts.MarkAreaStyle{
					ItemStyle: &opts.ItemStyle{Color: fill},
					Label:     &opts.Label{Show: opts.Bool(show), Position: "insideTop", Color: colGrey, FontSize: 11},
				}},
				{XAxis: x1},
			})
		}
		so = append(so, ec.WithMarkAreaData(areas...))
	}
	return so
}

// responseChart: decrement factor and time shift against period (log
// axis), with the day, week and year marked.
func responseChart(r *results.Results) (*chartSpec, error) {
	s := r.Series
	if len(s.Response.Period_h) == 0 {
		return nil, nil
	}
	p := make([]float64, len(s.Response.Period_h))
	for i, v := range s.Response.Period_h {
		p[i] = v
		if !(v > 0) {
			p[i] = nan // a log axis has no place for 0 or less
		}
	}
	c := newChart(idResponse, "Decrement factor and time shift against period", "tipX", 56)
	c.SetGlobalOptions(
		ec.WithXAxisOpts(valueAxisX("Period (h, logarithmic)", " h", num(minOf(p)), num(maxOf(p)), true)),
		ec.WithYAxisOpts(opts.YAxis{Type: "value", Name: "Decrement factor f", NameLocation: "middle", NameGap: 50,
			Min: 0, SplitLine: splitLine()}),
	)
	shift := valueAxisY("Time shift (h)", " h", false)
	shift.Scale = opts.Bool(false)
	shift.Min = 0
	shift.SplitLine = &opts.SplitLine{Show: opts.Bool(false)}
	c.ExtendYAxis(shift)
	var marks []opts.MarkLineNameXAxisItem
	lo, hi := minOf(p), maxOf(p)
	for _, m := range []struct {
		name string
		h    float64
	}{{"day", 24}, {"week", 168}, {"year", 8760}} {
		if m.h > lo*1.05 && m.h < hi/1.05 { // not on the edge of the plot
			marks = append(marks, opts.MarkLineNameXAxisItem{Name: m.name, XAxis: m.h})
		}
	}
	thinned := addLine(c, line{name: "Decrement factor f = |Y₁₂|/U", x: p, y: s.Response.Decrement, xUnit: uHour, yUnit: uRatio, color: colBlue,
		opts: []ec.SeriesOpts{
			ec.WithMarkLineNameXAxisItemOpts(marks...),
			ec.WithMarkLineStyleOpts(opts.MarkLineStyle{
				Symbol:    []string{"none", "none"},
				LineStyle: &opts.LineStyle{Color: colGrey, Width: 1, Type: "dotted"},
				Label:     &opts.Label{Show: opts.Bool(true), Formatter: "{b}", Color: colGrey, Position: "end"},
			}),
		}})
	thinned = addLine(c, line{name: "Time shift", x: p, y: s.Response.TimeShift_h, xUnit: uHour, yUnit: uHour, color: colVermilion, dash: "dashed", yAxis: 1}) || thinned
	return finish(c, idResponse, "Exact periodic solution for periods from one hour to one year. The decrement factor (left axis) is the heat-flux swing into the room relative to a massless wall with the same U-value; the time shift (dashed, right axis) is how long that swing lags the outside temperature, counted across whole periods.", thinned)
}

// probeName labels a probe by its position.
func probeName(kind results.Kind, z float64) string {
	if kind == results.Ground {
		return "At " + fixed(z, 2) + " m depth"
	}
	return "At " + trimZeros(sig(z*1000, 3)) + " mm"
}

// simTempChart: simulated temperatures against time at the surfaces and
// the probes, with a zoom slider.
func simTempChart(r *results.Results) (*chartSpec, error) {
	s := r.Series
	if len(s.Simulation.Time_h) == 0 {
		return nil, nil
	}
	f, xu, xl := timeAxis(maxOf(s.Simulation.Time_h) - minOf(s.Simulation.Time_h))
	t := scaled(s.Simulation.Time_h, f)
	n := sides(r.Kind)
	c := newChart(idSimTemp, "Simulated temperatures", "tipX", 96)
	c.SetGlobalOptions(
		ec.WithXAxisOpts(valueAxisX("Time ("+xl+")", " "+xl, num(minOf(t)), num(maxOf(t)), false)),
		ec.WithYAxisOpts(valueAxisY("Temperature (°C)", " °C", false)),
		ec.WithDataZoomOpts(opts.DataZoom{Type: "slider", XAxisIndex: 0, Start: 0, End: 100}, opts.DataZoom{Type: "inside", XAxisIndex: 0}),
	)
	ls := []line{
		{name: n.env, y: s.Simulation.OutsideAir_C, color: colVermilion, width: 1.2},
		{name: n.outSurf, y: s.Simulation.OutsideSurface_C, color: colOrange, width: 1.5},
	}
	caption := "Transient finite-volume simulation. Drag the slider or scroll inside the chart to zoom in time; click a legend entry to hide a line."
	if sameSeries(s.Simulation.OutsideAir_C, s.Simulation.OutsideSurface_C) {
		// No surface resistance: the environment is the surface; one line.
		ls = ls[1:]
		ls[0].name += " (= surface environment)"
		caption += " With no surface resistance the surface environment temperature is the surface temperature; one line shows both."
	}
	if maxOf(s.Simulation.Time_h)-minOf(s.Simulation.Time_h) > 60*24 {
		// Over months the daily swing of the surface lines fills a wide
		// ribbon: draw those two faint and thin so the probes stay legible.
		for i := range ls {
			ls[i].width = 0.8
			ls[i].opts = []ec.SeriesOpts{ec.WithLineStyleOpts(opts.LineStyle{Color: ls[i].color, Width: 0.8, Opacity: opts.Float(0.45)})}
		}
	}
	probeCols := []string{colGreen, colSky, colPurple, colBlack, colYellow, colGrey}
	for i, z := range s.Simulation.ProbeDepth_m {
		if i >= len(s.Simulation.Probes_C) {
			break
		}
		ls = append(ls, line{name: probeName(r.Kind, z), y: s.Simulation.Probes_C[i], color: probeCols[i%len(probeCols)], width: 1.5, dash: []string{"", "dashed"}[i/len(probeCols)%2]})
	}
	ls = append(ls, line{name: n.inSurf, y: s.Simulation.InsideSurface_C, color: colBlue, width: 1.5},
		line{name: n.inAir, y: s.Simulation.InsideAir_C, color: colSky, width: 1.2, dash: "dashed"})
	thinned := false
	for _, l := range ls {
		if len(l.y) == 0 {
			continue
		}
		l.x, l.xUnit, l.yUnit = t, xu, uDegC
		thinned = addLine(c, l) || thinned
	}
	return finish(c, idSimTemp, caption, thinned)
}

// sameSeries reports whether a and b are the same non-empty series to
// within 1 mK everywhere.
func sameSeries(a, b []float64) bool {
	if len(a) == 0 || len(a) != len(b) {
		return false
	}
	for i := range a {
		if !(math.Abs(a[i]-b[i]) <= 1e-3) {
			return false
		}
	}
	return true
}

// simFluxChart: simulated heat flux at both surfaces against time.
func simFluxChart(r *results.Results) (*chartSpec, error) {
	s := r.Series
	if len(s.Simulation.Time_h) == 0 || (len(s.Simulation.OutsideFlux_W_m2) == 0 && len(s.Simulation.InsideFlux_W_m2) == 0) {
		return nil, nil
	}
	f, xu, xl := timeAxis(maxOf(s.Simulation.Time_h) - minOf(s.Simulation.Time_h))
	t := scaled(s.Simulation.Time_h, f)
	n := sides(r.Kind)
	dir := "inward"
	if r.Kind == results.Ground {
		dir = "downward"
	}
	c := newChart(idSimFlux, "Simulated heat flux at both surfaces", "tipX", 96)
	c.SetGlobalOptions(
		ec.WithXAxisOpts(valueAxisX("Time ("+xl+")", " "+xl, num(minOf(t)), num(maxOf(t)), false)),
		ec.WithYAxisOpts(valueAxisY("Heat flux (W/m², + = "+dir+")", "", false)),
		ec.WithDataZoomOpts(opts.DataZoom{Type: "slider", XAxisIndex: 0, Start: 0, End: 100}, opts.DataZoom{Type: "inside", XAxisIndex: 0}),
	)
	thinned := false
	for _, l := range []line{
		{name: n.outSurf, y: s.Simulation.OutsideFlux_W_m2, color: colOrange, width: 1.5},
		{name: n.inSurf, y: s.Simulation.InsideFlux_W_m2, color: colBlue, width: 1.5},
	} {
		if len(l.y) == 0 {
			continue
		}
		l.x, l.xUnit, l.yUnit = t, xu, uFlux
		thinned = addLine(c, l) || thinned
	}
	return finish(c, idSimFlux, "Heat flux entering the construction at the outside surface and leaving it at the inside surface, both counted positive "+dir+". Their difference is the heat being stored.", thinned)
}

// groundEnvelopeChart: temperature envelope against depth, depth axis
// pointing down. The simulated envelope (last simulated year, with latent
// heat) is drawn when present; the exact periodic envelope otherwise, or
// as thin dashed lines beside it.
func groundEnvelopeChart(r *results.Results) (*chartSpec, error) {
	s := r.Series
	simOK := len(s.SimProfile.Position_m) > 0
	exactOK := len(s.Profile.Position_m) > 0
	if !simOK && !exactOK {
		return nil, nil
	}
	c := newChart(idGroundEnvelope, "Ground temperature envelope against depth", "tipY", 56)
	x := valueAxisX("Temperature (°C)", " °C", nil, nil, false)
	x.Scale = opts.Bool(true)
	y := valueAxisY("Depth (m)", " m", true)
	y.Scale = opts.Bool(false)
	y.Min = 0
	c.SetGlobalOptions(ec.WithXAxisOpts(x), ec.WithYAxisOpts(y),
		// Zoom in depth: the frost zone is a small part of a deep column.
		ec.WithDataZoomOpts(
			opts.DataZoom{Type: "slider", YAxisIndex: 0, Orient: "vertical", Start: 0, End: 100, FilterMode: "none"},
			opts.DataZoom{Type: "inside", YAxisIndex: 0, FilterMode: "none"}))
	pos, lo, mid, hi := s.Profile.Position_m, s.Profile.Min_C, s.Profile.Mean_C, s.Profile.Max_C
	what := "exact periodic solution"
	if simOK {
		pos, lo, mid, hi = s.SimProfile.Position_m, s.SimProfile.Min_C, s.SimProfile.Mean_C, s.SimProfile.Max_C
		what = "simulation, last simulated year, latent heat included"
	}
	addBand(c, "Range (min–max)", pos, lo, hi, true)
	// Layer boundaries on the mean line, 0 °C on the highest, the frost
	// depth on the lowest: one marker style per series.
	zero := []ec.SeriesOpts{
		ec.WithMarkLineNameXAxisItemOpts(opts.MarkLineNameXAxisItem{Name: "0 °C", XAxis: 0}),
		ec.WithMarkLineStyleOpts(opts.MarkLineStyle{
			Symbol:    []string{"none", "none"},
			LineStyle: &opts.LineStyle{Color: colBlack, Width: 1, Type: "dotted"},
			Label:     &opts.Label{Show: opts.Bool(true), Formatter: "{b}", Position: "start", Color: colText, FontSize: 11},
		}),
	}
	var frost []ec.SeriesOpts
	if r.Frost != nil && r.Frost.MaxFrostDepth_m != nil && finite(*r.Frost.MaxFrostDepth_m) && *r.Frost.MaxFrostDepth_m > 0 {
		d := *r.Frost.MaxFrostDepth_m
		frost = []ec.SeriesOpts{
			ec.WithMarkLineNameYAxisItemOpts(opts.MarkLineNameYAxisItem{
				Name: "simulated max frost depth " + fixed(d, 2) + " m", YAxis: num(d)}),
			ec.WithMarkLineStyleOpts(opts.MarkLineStyle{
				Symbol:    []string{"none", "none"},
				LineStyle: &opts.LineStyle{Color: colBlue, Width: 1.5, Type: "dashed"},
				Label:     &opts.Label{Show: opts.Bool(true), Formatter: "{b}", Position: "insideStartBottom", Color: colBlue, FontSize: 11},
			}),
		}
	}
	thinned := addLine(c, line{name: "Highest", x: hi, y: pos, xUnit: uDegC, yUnit: uM, color: colVermilion, opts: zero})
	thinned = addLine(c, line{name: "Mean", x: mid, y: pos, xUnit: uDegC, yUnit: uM, color: colBlack, width: 1.5, dash: "dashed", opts: layerMarks(r, true)}) || thinned
	thinned = addLine(c, line{name: "Lowest", x: lo, y: pos, xUnit: uDegC, yUnit: uM, color: colBlue, opts: frost}) || thinned
	if simOK && exactOK {
		thinned = addLine(c, line{name: "Highest, exact periodic", x: s.Profile.Max_C, y: s.Profile.Position_m, xUnit: uDegC, yUnit: uM, color: colVermilion, width: 1, dash: "dotted"}) || thinned
		thinned = addLine(c, line{name: "Lowest, exact periodic", x: s.Profile.Min_C, y: s.Profile.Position_m, xUnit: uDegC, yUnit: uM, color: colBlue, width: 1, dash: "dotted"}) || thinned
	}
	return finish(c, idGroundEnvelope, "Lowest, mean and highest ground temperature reached at each depth ("+what+"). Depth increases downward; drag the slider on the right or scroll inside the chart to zoom in depth. Grey dashed lines mark layer boundaries, the dotted line 0 °C and the blue dashed line the simulated maximum frost depth.", thinned)
}

// frostChart: the frozen ground against time (a band from the thaw depth
// down to the frost depth), the freezing and thaw fronts as lines, depth
// pointing down, with the start of each winter year marked.
func frostChart(r *results.Results) (*chartSpec, error) {
	s := r.Series
	if len(s.Simulation.Time_h) == 0 || (len(s.Simulation.FrostDepth_m) == 0 && len(s.Simulation.ThawDepth_m) == 0) {
		return nil, nil
	}
	f, xu, xl := timeAxis(maxOf(s.Simulation.Time_h) - minOf(s.Simulation.Time_h))
	t := scaled(s.Simulation.Time_h, f)
	c := newChart(idFrost, "Frozen ground against time", "tipX", 96)
	y := valueAxisY("Depth (m)", " m", true)
	y.Scale = opts.Bool(false)
	y.Min = 0
	xName := "Time (" + xl + ")"
	if r.Frost != nil && len(r.Frost.Winters) > 0 {
		xName = "Time (" + xl + " from 1 January of the first simulated year)"
	}
	c.SetGlobalOptions(
		ec.WithXAxisOpts(valueAxisX(xName, " "+xl, num(minOf(t)), num(maxOf(t)), false)),
		ec.WithYAxisOpts(y),
		ec.WithDataZoomOpts(opts.DataZoom{Type: "slider", XAxisIndex: 0, Start: 0, End: 100}, opts.DataZoom{Type: "inside", XAxisIndex: 0}),
	)
	// The frozen layer lies between the thaw depth (0 when nothing has
	// thawed from the surface) and the frost depth; no band where nothing
	// is frozen.
	if n := min(len(t), len(s.Simulation.FrostDepth_m)); n > 0 {
		lo, hi := make([]float64, n), make([]float64, n)
		for i := 0; i < n; i++ {
			lo[i], hi[i] = nan, nan
			if d := s.Simulation.FrostDepth_m[i]; d > 0 {
				th := 0.0
				if i < len(s.Simulation.ThawDepth_m) && s.Simulation.ThawDepth_m[i] > 0 && s.Simulation.ThawDepth_m[i] < d {
					th = s.Simulation.ThawDepth_m[i]
				}
				lo[i], hi[i] = th, d
			}
		}
		addBand(c, "Frozen ground", t[:n], lo, hi, false)
	}
	var marks []ec.SeriesOpts
	if fr := r.Frost; fr != nil {
		var items []opts.MarkLineNameXAxisItem
		for _, w := range fr.Winters {
			x := w.Start_d * 24 * f
			if x > minOf(t) && x < maxOf(t) {
				items = append(items, opts.MarkLineNameXAxisItem{Name: "winter year", XAxis: num(x)})
			}
		}
		if len(items) > 0 {
			marks = []ec.SeriesOpts{
				ec.WithMarkLineNameXAxisItemOpts(items...),
				ec.WithMarkLineStyleOpts(opts.MarkLineStyle{
					Symbol:    []string{"none", "none"},
					LineStyle: &opts.LineStyle{Color: colGrey, Width: 1, Type: "dotted"},
					Label:     &opts.Label{Show: opts.Bool(false)},
				}),
			}
		}
	}
	thinned := false
	for _, l := range []line{
		{name: "Frost depth (deepest frozen point)", y: s.Simulation.FrostDepth_m, color: colBlue, opts: marks},
		{name: "Thaw depth (thawed from the surface)", y: s.Simulation.ThawDepth_m, color: colOrange, width: 1.5, dash: "dashed"},
	} {
		if len(l.y) == 0 {
			continue
		}
		l.x, l.xUnit, l.yUnit = t, xu, uM
		thinned = addLine(c, l) || thinned
	}
	caption := "Simulated frozen ground (shaded) between the thaw front moving down from the surface (dashed) and the freezing front (solid, the deepest point at or below the freezing point). Depth increases downward."
	if len(marks) > 0 {
		caption += " Dotted vertical lines mark " + winterStart(r.Frost) + ", the start of each winter year of the winter table."
	}
	return finish(c, idFrost, caption, thinned)
}

// stepChart: surface heat flux after a step change of the surface
// temperature, numerical against the half-space closed form, log time.
func stepChart(r *results.Results) (*chartSpec, error) {
	s := r.Series
	if len(s.Step.Time_s) == 0 {
		return nil, nil
	}
	t := make([]float64, len(s.Step.Time_s))
	for i, v := range s.Step.Time_s {
		t[i] = v
		if !(v > 0) {
			t[i] = nan
		}
	}
	side, change := "outside", ""
	var marks []ec.SeriesOpts
	if st := r.StepResponse; st != nil {
		if st.Side == "inside" {
			side = "inside"
		}
		change = " of " + fixed(st.Change_K, 1) + " K"
		if v := st.HalfSpaceValidFor_s; finite(v) && v > minOf(t) && v < maxOf(t) {
			marks = []ec.SeriesOpts{
				ec.WithMarkLineNameXAxisItemOpts(opts.MarkLineNameXAxisItem{Name: "heat reaches the next layer", XAxis: num(v)}),
				ec.WithMarkLineStyleOpts(opts.MarkLineStyle{
					Symbol:    []string{"none", "none"},
					LineStyle: &opts.LineStyle{Color: colGrey, Width: 1, Type: "dashed"},
					Label:     &opts.Label{Show: opts.Bool(true), Formatter: "{b}", Position: "insideEndTop", Color: colGrey, FontSize: 11},
				}),
			}
		}
	}
	c := newChart(idStep, "Heat uptake of the "+side+" surface after a step", "tipX", 56)
	y := valueAxisY("Surface heat flux (W/m²)", "", false)
	if minOf(s.Step.Flux_W_m2) > 0 && !(minOf(s.Step.FluxHalfSpace_W_m2) <= 0) {
		// q ∝ 1/√t for the half-space: a straight line on log-log axes.
		y.Type, y.Name = "log", "Surface heat flux (W/m², logarithmic)"
	}
	c.SetGlobalOptions(
		ec.WithXAxisOpts(valueAxisX("Time after the step (s, logarithmic)", " s", num(minOf(t)), num(maxOf(t)), true)),
		ec.WithYAxisOpts(y),
	)
	thinned := addLine(c, line{name: "Simulated", x: t, y: s.Step.Flux_W_m2, xUnit: uSec, yUnit: uFlux, color: colBlue, opts: marks})
	if len(s.Step.FluxHalfSpace_W_m2) > 0 {
		thinned = addLine(c, line{name: "Half-space closed form", x: t, y: s.Step.FluxHalfSpace_W_m2, xUnit: uSec, yUnit: uFlux, color: colVermilion, dash: "dashed"}) || thinned
	}
	return finish(c, idStep, "Heat flux into the "+side+" surface after a sudden change"+change+" of its temperature. The closed form treats the surface layer as a semi-infinite solid, q = b ΔT / √(π t) with b = √(λρc); the two curves part once the heat reaches the next layer.", thinned)
}
