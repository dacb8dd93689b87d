// Package charts turns the finished results of one tempstack run
// (results.Results) into a single self-contained HTML report: title block,
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
// # What the report holds
//
// Warnings from the run (counted, before everything else), a plain-words
// summary, then: the construction or soil column as a drawn cross-section
// and its tables; the assumptions and inputs the results record (surface
// resistances, forcing as far as Results carries it, analysis periods,
// probes, simulation settings, design freezing index); for a ground
// column the frost depth three ways (simulation, Stefan, modified
// Berggren) with the freezing index each used, the simulated frost winter
// by winter and the exact periodic ground temperature at each probe; the
// options and studies (options drawn side by side to one scale and
// compared in a table, sweep, target search, uncertainty, diffusivity
// fit); the ISO 13786 properties; the transient simulation; the surface heat uptake after a step;
// methods with their sources; cautions.
//
// # The cross-section drawing
//
// The layers are drawn as one inline SVG generated here (section.go), not
// as a chart: to scale, every layer at least 8 px thick (a thinner one is
// widened and marked *), tinted and hatched by material family so colour
// is never the only cue. A wall is drawn horizontally, outside on the
// left; a roof, a floor and a ground column vertically, the ground with
// its depth axis pointing down, the depth of every boundary, the probes
// and the simulated maximum frost depth; a deep last ground layer is
// shortened with a break mark. Every string from the results is escaped
// with html.EscapeString before it enters the SVG, in text and attributes
// alike; the SVG has no scripts, links or event attributes, and its
// pattern fills refer only to its own ids (url(#ts-fam-…) in the
// cross-section, url(#ts-opt-…) in the options drawing).
//
// Output is deterministic: chart ids are fixed, map keys are sorted by
// encoding/json, and the only time stamp is Options.GeneratedAt, which is
// empty unless the caller sets it.
package charts
