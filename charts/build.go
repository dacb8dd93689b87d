package charts

import (
	"fmt"
	"math"
	"strings"

	ec "github.com/go-echarts/go-echarts/v2/charts"
	"github.com/go-echarts/go-echarts/v2/opts"
	"github.com/go-echarts/go-echarts/v2/types"
)

// Chart ids are fixed so that the same results give byte-identical HTML.
const (
	idCycle          = "chart-cycle"
	idEnvelope       = "chart-envelope"
	idResponse       = "chart-response"
	idSimTemp        = "chart-sim-temperature"
	idSimFlux        = "chart-sim-flux"
	idGroundEnvelope = "chart-ground-envelope"
	idFrost          = "chart-frost"
	idStep           = "chart-step"
)

// Chart size in CSS pixels; the charts render into fixed-size boxes.
const (
	chartWidth  = 880
	chartHeight = 420
)

// maxPoints is about the most points a line in a chart carries (two per
// pixel column of a chart). Longer series are thinned for display by
// keeping the minimum and maximum of each bucket, so peaks survive; the
// tables and the CSV keep every value.
const maxPoints = 2000

// chartSpec is one rendered chart: its div id, a caption under it and its
// option as safe JavaScript.
type chartSpec struct {
	ID      string
	Caption string
	Note    string // thinning note, empty when every point is drawn
	option  string
}

// Display units for tooltips (keys of the unit table in assets/page.js).
const (
	uDegC  = "degC"
	uFlux  = "wm2"
	uRatio = "ratio"
	uHour  = "h"
	uDay   = "d"
	uMM    = "mm"
	uM     = "m"
	uSec   = "s"
)

// line is one line series in display units.
type line struct {
	name         string
	x, y         []float64
	xUnit, yUnit string
	color        string
	width        float32
	dash         string // "", "dashed" or "dotted"
	yAxis        int
	area         bool // fill between the line and the axis
	opts         []ec.SeriesOpts
}

// newChart returns a line chart with the settings every report chart
// shares: no animation, the palette, title, legend, save-as-image toolbox
// and an axis tooltip using the trusted formatter tip.
func newChart(id, title, tip string, gridBottom int) *ec.Line {
	c := ec.NewLine()
	c.SetGlobalOptions(
		ec.WithAnimation(false),
		ec.WithColorsOpts(palette),
		ec.WithTitleOpts(opts.Title{
			Title: title, Left: "center", Top: "4",
			TitleStyle: &opts.TextStyle{FontSize: 15, FontWeight: "600", Color: colText},
		}),
		ec.WithLegendOpts(opts.Legend{Type: "plain", Top: "30", Left: "center", Width: "86%"}),
		ec.WithToolboxOpts(opts.Toolbox{Right: "12", Top: "2", Feature: &opts.ToolBoxFeature{
			SaveAsImage: &opts.ToolBoxFeatureSaveAsImage{Type: "png", Name: "tempstack-" + strings.TrimPrefix(id, "chart-"), Title: "Save as image"},
		}}),
		ec.WithGridOpts(opts.Grid{Left: "70", Right: "76", Top: "70", Bottom: fmt.Sprint(gridBottom)}),
		ec.WithTooltipOpts(opts.Tooltip{Trigger: "axis", Formatter: types.FuncStr(fn(tip)),
			AxisPointer: tooltipPointer(tip)}),
	)
	return c
}

// tooltipPointer makes the axis tooltip of a depth-down chart follow the
// vertical (depth) axis.
func tooltipPointer(tip string) *opts.AxisPointer {
	if tip == "tipY" {
		return &opts.AxisPointer{Type: "line", Axis: "y"}
	}
	return &opts.AxisPointer{Type: "line"}
}

func splitLine() *opts.SplitLine {
	return &opts.SplitLine{Show: opts.Bool(true), LineStyle: &opts.LineStyle{Color: colGrid}}
}

func valueAxisX(name, unitLabel string, min, max any, log bool) opts.XAxis {
	t := "value"
	if log {
		t = "log"
	}
	return opts.XAxis{
		Type: t, Name: name, NameLocation: "middle", NameGap: 30, Min: min, Max: max,
		AxisLabel: &opts.AxisLabel{Formatter: types.FuncStr("{value}" + unitLabel), HideOverlap: opts.Bool(true)},
		AxisLine:  axisLine(),
		SplitLine: splitLine(),
	}
}

// axisLine keeps every axis at the edge of the plot: by default echarts
// draws an axis through the other axis' zero, which would pass for a data
// line (the 0 °C line of a ground chart).
func axisLine() *opts.AxisLine {
	return &opts.AxisLine{Show: opts.Bool(true), OnZero: opts.Bool(false), LineStyle: &opts.LineStyle{Color: colAxis}}
}

func valueAxisY(name, unitLabel string, inverse bool) opts.YAxis {
	return opts.YAxis{
		Type: "value", Name: name, NameLocation: "middle", NameGap: 50, Scale: opts.Bool(true),
		Inverse:   opts.Bool(inverse),
		AxisLabel: &opts.AxisLabel{Formatter: types.FuncStr("{value}" + unitLabel)},
		AxisLine:  axisLine(),
		SplitLine: splitLine(),
	}
}

// addLine adds one line series; it returns true when the series had to be
// thinned for display.
func addLine(c *ec.Line, l line) bool {
	data, thinned := points(l.x, l.y)
	width := l.width
	if width == 0 {
		width = 2
	}
	so := []ec.SeriesOpts{
		ec.WithSeriesId(fmt.Sprintf("%s;%s;%d", l.xUnit, l.yUnit, len(c.MultiSeries))),
		ec.WithLineChartOpts(opts.LineChart{ShowSymbol: opts.Bool(false), Symbol: "none", YAxisIndex: l.yAxis}),
		ec.WithLineStyleOpts(opts.LineStyle{Color: l.color, Width: width, Type: l.dash}),
		ec.WithItemStyleOpts(opts.ItemStyle{Color: l.color}),
	}
	if l.area {
		so = append(so, ec.WithAreaStyleOpts(opts.AreaStyle{Color: l.color, Opacity: opts.Float(0.18)}))
	}
	c.AddSeries(l.name, nil, append(so, l.opts...)...)
	// Bare [x, y] pairs instead of {"value": [x, y]} objects: the same
	// chart in about 40 % fewer bytes.
	c.MultiSeries[len(c.MultiSeries)-1].Data = data
	return thinned
}

// points pairs x and y into chart data, each point a bare [x, y] array
// (NaN and ±Inf become null), thinning series longer than maxPoints.
func points(x, y []float64) ([][2]any, bool) {
	n := min(len(x), len(y))
	idx := thin(y[:n], maxPoints)
	data := make([][2]any, len(idx))
	for k, i := range idx {
		data[k] = [2]any{num(x[i]), num(y[i])}
	}
	return data, len(idx) < n
}

// thin returns the indices of y to draw: all of them when there are at
// most limit, otherwise the first and last point and, for each of about
// limit/2 buckets, the index of its smallest and its largest finite value
// in time order.
func thin(y []float64, limit int) []int {
	n := len(y)
	if n <= limit {
		idx := make([]int, n)
		for i := range idx {
			idx[i] = i
		}
		return idx
	}
	buckets := limit / 2
	idx := make([]int, 0, limit+2)
	idx = append(idx, 0)
	for b := 0; b < buckets; b++ {
		lo, hi := 1+b*(n-2)/buckets, 1+(b+1)*(n-2)/buckets
		imin, imax := -1, -1
		for i := lo; i < hi; i++ {
			if !finite(y[i]) {
				continue
			}
			if imin < 0 || y[i] < y[imin] {
				imin = i
			}
			if imax < 0 || y[i] > y[imax] {
				imax = i
			}
		}
		switch {
		case imin < 0:
			idx = append(idx, lo) // keeps the gap visible (null)
		case imin == imax:
			idx = append(idx, imin)
		case imin < imax:
			idx = append(idx, imin, imax)
		default:
			idx = append(idx, imax, imin)
		}
	}
	return append(idx, n-1)
}

// addBand adds a filled band between two curves as a custom series drawn
// by the trusted renderItem "band". Each data item is one position: the
// low point (x, y) and the high point (x, y); the renderItem joins all of
// them into one polygon per run of finite values, so the band has no
// seams. With vertical false the band spans lo..hi in y over x (a profile
// across a wall); with vertical true it spans lo..hi in x over y (depth
// down).
func addBand(c *ec.Line, name string, pos, lo, hi []float64, vertical bool) {
	n := min(len(pos), len(lo), len(hi))
	step := 1
	if n > maxPoints {
		step = (n + maxPoints - 1) / maxPoints
	}
	var data []opts.CustomData
	for i := 0; i < n; i += step {
		q := [4]float64{pos[i], lo[i], pos[i], hi[i]}
		if vertical {
			q = [4]float64{lo[i], pos[i], hi[i], pos[i]}
		}
		v := make([]any, 4)
		for k := range q {
			v[k] = num(q[k])
		}
		data = append(data, opts.CustomData{Value: v})
	}
	c.MultiSeries = append(c.MultiSeries, ec.SingleSeries{
		Name: name, Type: "custom", RenderItem: types.FuncStr(fn("band")), Data: data,
		Encode:    &opts.Encode{X: []int{0, 2}, Y: []int{1, 3}},
		ItemStyle: &opts.ItemStyle{Color: colBand},
	})
}

// scaled returns v multiplied by f (unit conversion for display).
func scaled(v []float64, f float64) []float64 {
	out := make([]float64, len(v))
	for i, x := range v {
		out[i] = x * f
	}
	return out
}

// timeAxis picks hours or days for a time axis spanning span hours and
// returns the factor from hours, the unit key and the axis label.
func timeAxis(span float64) (float64, string, string) {
	if span > 240 {
		return 1.0 / 24, uDay, "d"
	}
	return 1, uHour, "h"
}

// maxOf returns the largest finite value of v, or NaN.
func maxOf(v []float64) float64 {
	m := math.NaN()
	for _, x := range v {
		if finite(x) && (math.IsNaN(m) || x > m) {
			m = x
		}
	}
	return m
}

// minOf returns the smallest finite value of v, or NaN.
func minOf(v []float64) float64 {
	m := math.NaN()
	for _, x := range v {
		if finite(x) && (math.IsNaN(m) || x < m) {
			m = x
		}
	}
	return m
}
