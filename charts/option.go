package charts

import (
	"bytes"
	"encoding/json"
	"fmt"
	"regexp"

	ec "github.com/go-echarts/go-echarts/v2/charts"
	"github.com/go-echarts/go-echarts/v2/opts"
)

// trustedFuncs lists the JavaScript functions a chart option may refer to.
// Each is defined in assets/page.js under the same name in the TSFN table;
// a test checks that every name here is defined there. Nothing else is ever
// turned from option text into code.
var trustedFuncs = map[string]bool{
	"band": true, // renderItem of the min/max band (custom series)
	"tipX": true, // axis tooltip following the x axis
	"tipY": true, // axis tooltip following the y axis (depth pointing down)
}

// fn returns the placeholder for trusted function name. It panics on a
// name that is not in trustedFuncs: that is a programming error in this
// package, caught by the tests.
func fn(name string) string {
	if !trustedFuncs[name] {
		panic("charts: untrusted function " + name)
	}
	return "__tsfn_" + name + "__"
}

// funcPlaceholder matches a placeholder only as the complete value of a
// formatter, valueFormatter or renderItem key. Inside a JSON string every
// quote is escaped (\"), so this byte pattern cannot be produced by any
// string value, whatever it contains; it can only come from an option key
// set by this package.
var funcPlaceholder = regexp.MustCompile(`"(formatter|valueFormatter|renderItem)":"__tsfn_([A-Za-z0-9]+)__"`)

// optionJS marshals a go-echarts chart option into a JavaScript object
// literal safe to place inside a <script> element: json.Marshal escapes <,
// > and & (and U+2028/U+2029), so no string can end the script, and only
// placeholders for trusted functions become code.
func optionJS(option map[string]any) (string, error) {
	b, err := json.Marshal(option)
	if err != nil {
		return "", fmt.Errorf("charts: encoding chart option: %w", err)
	}
	var failed error
	b = funcPlaceholder.ReplaceAllFunc(b, func(m []byte) []byte {
		sub := funcPlaceholder.FindSubmatch(m)
		name := string(sub[2])
		if !trustedFuncs[name] {
			failed = fmt.Errorf("charts: option refers to unknown function %q", name)
			return m
		}
		return []byte(`"` + string(sub[1]) + `":TSFN.` + name)
	})
	if failed != nil {
		return "", failed
	}
	if bytes.ContainsAny(b, "<>") {
		// Cannot happen with encoding/json's HTML escaping; kept as a
		// last line of defence for the page.
		return "", fmt.Errorf("charts: unescaped markup in chart option")
	}
	return string(b), nil
}

// visitor adds option keys that go-echarts has no struct for, through the
// ConfigurationVisitor hook go-echarts provides for that purpose.
type visitor struct {
	ec.BaseConfigurationVisitor
}

// fontStack is the system font stack of the page, repeated for the charts
// (which draw on a canvas and do not inherit CSS).
const fontStack = `system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif`

// Visit sets the chart-wide text style.
func (visitor) Visit(chart map[string]any) {
	chart["textStyle"] = map[string]any{"fontFamily": fontStack, "color": colText}
}

// bandSeries is a custom (min/max band) series with its tooltip switched
// off and mouse events ignored, so the axis tooltip lists only the lines.
type bandSeries struct {
	ec.SingleSeries
	Tooltip map[string]bool `json:"tooltip"`
	Silent  bool            `json:"silent"`
	Z       int             `json:"z"`
}

// VisitSeriesOpt wraps custom series as bandSeries.
func (visitor) VisitSeriesOpt(series ec.MultiSeries) any {
	out := make([]any, len(series))
	for i, s := range series {
		if s.Type == "custom" {
			out[i] = bandSeries{SingleSeries: s, Tooltip: map[string]bool{"show": false}, Silent: true, Z: 1}
			continue
		}
		out[i] = s
	}
	return out
}

// chartOption validates a go-echarts line chart and returns its option as
// safe JavaScript.
func chartOption(c *ec.Line) (string, error) {
	c.Accept(visitor{})
	c.Validate()
	return optionJS(c.JSON())
}

// Okabe–Ito palette (colour-blind safe), with fixed roles so that the same
// quantity has the same colour in every chart.
const (
	colBlack     = "#000000"
	colOrange    = "#E69F00"
	colSky       = "#56B4E9"
	colGreen     = "#009E73"
	colYellow    = "#F0E442"
	colBlue      = "#0072B2"
	colVermilion = "#D55E00"
	colPurple    = "#CC79A7"
	colGrey      = "#6B6B6B"
	colText      = "#182126"               // page text, derived: see palette.go
	colBand      = "rgba(86,180,233,0.28)" // sky blue, translucent
)

// palette is the series colour cycle (probes and other open-ended lists).
var palette = opts.Colors{colBlue, colOrange, colGreen, colVermilion, colPurple, colSky, colBlack, colYellow}
