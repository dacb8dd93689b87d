// Package charts turns the finished results of one tempstack run
// (scenarios.Results) into a single self-contained HTML report: title block,
// plain-words summary, tables, interactive charts, methods and cautions.
//
// The report never loads anything from the network. The charting library
// (npm echarts 5.6.0, full build, Apache-2.0; licence and notice in
// assets/) is embedded with go:embed and inlined into the page.
//
// # How a chart is built
//
// Every chart is built the same way: go-echarts (imported as ec) assembles
// the chart option from typed structs (ec.NewLine, SetGlobalOptions,
// AddSeries), Validate() fills it in and JSON() returns it as a Go value.
// The option is then marshalled here with encoding/json's default HTML
// escaping, so every user string (title, layer names, warnings, ...) ends
// up as an inert JSON string in which <, > and & are \u-escaped and which
// cannot close the surrounding <script>. JavaScript functions (tooltip
// formatters, the renderItem of the min/max band) are never taken from the
// option text: a formatter field holds a placeholder "__tsfn_NAME__", and
// only placeholders naming one of the functions in trustedFuncs, sitting as
// the whole value of a formatter, valueFormatter or renderItem key, are
// turned into references to functions defined in assets/page.js. The
// function marker of go-echarts ("__f__") is never stripped, so a user
// string shaped like one stays text. Extra option keys go-echarts has no
// struct for (global text style, hiding the band from tooltips) are added
// through go-echarts' own ConfigurationVisitor hook.
//
// Line data are set on the go-echarts series as bare [x, y] pairs (not
// {"value": [x, y]} objects), which keeps the data about 40 % smaller; the
// min/max band is one custom series per chart whose items are
// [xLow, yLow, xHigh, yHigh] and whose trusted renderItem joins them into
// one polygon. No chart is built as a plain map.
//
// The page carries a Content-Security-Policy that allows only its own
// three inline scripts (by SHA-256 hash) and no network access at all, a
// second line of defence behind the escaping. A tool that rewrites the
// page (minifies it, say) must drop or recompute that policy.
//
// The charts render into fixed 880 × 420 px boxes; the print stylesheet
// (A4) zooms them to the text width and keeps each chart on one page.
//
// NaN and ±Inf never reach a chart: every number passes through num, which
// maps them to JSON null (a gap in the line). Long series are thinned for
// display only (each bucket keeps its minimum and maximum); the tables and
// the CSV output keep full precision.
//
// Output is deterministic: chart ids are fixed, map keys are sorted by
// encoding/json, and the only time stamp is Options.GeneratedAt, which is
// empty unless the caller sets it.
package charts
