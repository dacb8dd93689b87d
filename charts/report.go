package charts

import (
	"bytes"
	"crypto/sha256"
	"embed"
	"encoding/base64"
	"encoding/json"
	"errors"
	"fmt"
	"html/template"
	"io"
	"strings"

	"tempstack/scenarios/results"
)

//go:embed assets/echarts.min.js
var echartsJS string

//go:embed assets/page.js assets/page.css assets/page.tmpl
var assets embed.FS

// Options controls the parts of the report that do not come from the
// results. The zero value is valid and gives deterministic output.
type Options struct {
	// GeneratedAt is printed verbatim as the generation time, for example
	// "2026-12-02 01:15 UTC". Empty (the default) leaves it out, so that
	// the same results always give byte-identical HTML.
	GeneratedAt string
	// ToolVersion is printed in the title block and the footer when set.
	ToolVersion string
}

// page is the data of the HTML template.
type page struct {
	Title, KindLabel, ScenarioFile, Orientation string
	GeneratedAt, ToolVersion                    string
	TitleBlock                                  results.TitleBlock
	Summary, Warnings                           []string
	Sections                                    []section
	Methods, Cautions                           []string
	CSP                                         string
	CSS                                         template.CSS
	ECharts, PageJS, Data                       template.JS
}

// section is one numbered part of the report; blocks appear in order.
type section struct {
	ID, Heading string
	Blocks      []block
}

// block is a paragraph group, a table, a chart or a drawn figure.
type block struct {
	Text   []string
	Table  *table
	Chart  *chartSpec
	Figure *figure
}

// table is a plain data table; Align holds the CSS class of each column
// ("num" right-aligns numbers, "text" wraps long words).
type table struct {
	Caption string
	Head    []string
	Align   []string
	Rows    [][]string
	Notes   []string
}

var pageTemplate = template.Must(template.ParseFS(assets, "assets/page.tmpl"))

// Write writes the report for r to w as one self-contained HTML page:
// title block, summary, warnings, tables and charts for every part of the
// results that holds data, methods with their sources, and cautions. The
// page embeds the charting script and loads nothing from the network.
//
// Every string from the results is escaped, both in the HTML and inside
// the chart options; NaN and ±Inf values are drawn as gaps and printed as
// a dash. The same r and o always give the same bytes.
func Write(w io.Writer, r *results.Results, o Options) error {
	if r == nil {
		return errors.New("charts: no results to report")
	}
	p, specs, err := build(r, o)
	if err != nil {
		return err
	}
	js, err := assets.ReadFile("assets/page.js")
	if err != nil {
		return err
	}
	css, err := assets.ReadFile("assets/page.css")
	if err != nil {
		return err
	}
	var data strings.Builder
	data.WriteString("tsStart([")
	for i, s := range specs {
		if i > 0 {
			data.WriteString(",\n")
		}
		id, _ := json.Marshal(s.ID)
		fmt.Fprintf(&data, "{\"id\":%s,\"option\":%s}", id, s.option)
	}
	data.WriteString("]);")
	p.CSS = template.CSS(css)
	p.ECharts = template.JS(echartsJS)
	p.PageJS = template.JS(js)
	p.Data = template.JS(data.String())
	p.CSP = contentPolicy(echartsJS, string(js), data.String())

	var buf bytes.Buffer
	if err := pageTemplate.Execute(&buf, p); err != nil {
		return fmt.Errorf("charts: rendering report: %w", err)
	}
	_, err = w.Write(buf.Bytes())
	return err
}

// contentPolicy returns a Content-Security-Policy that lets only the
// page's own three scripts run (by their SHA-256 hashes) and forbids every
// network load, as a second line of defence behind the escaping.
func contentPolicy(scripts ...string) string {
	var b strings.Builder
	b.WriteString("default-src 'none'; script-src")
	for _, s := range scripts {
		h := sha256.Sum256([]byte(s))
		b.WriteString(" 'sha256-" + base64.StdEncoding.EncodeToString(h[:]) + "'")
	}
	b.WriteString("; style-src 'unsafe-inline'; img-src data: blob:; base-uri 'none'; form-action 'none'")
	return b.String()
}

// build assembles the page and the chart options.
func build(r *results.Results, o Options) (*page, []*chartSpec, error) {
	p := &page{
		Title:        r.Title,
		ScenarioFile: r.ScenarioFile,
		Orientation:  r.Orientation,
		GeneratedAt:  o.GeneratedAt,
		ToolVersion:  o.ToolVersion,
		TitleBlock:   r.TitleBlock,
	}
	// Warnings are printed as sentences, with the degree sign.
	for _, w := range r.Warnings {
		p.Warnings = append(p.Warnings, capitalise(strings.ReplaceAll(w, "degC", "°C")))
	}
	if strings.TrimSpace(p.Title) == "" {
		p.Title = "Untitled scenario"
	}
	if r.Kind == results.Room {
		specs, err := buildRoom(p, r)
		if err != nil {
			return nil, nil, err
		}
		return p, specs, nil
	}
	ground := r.Kind == results.Ground
	p.KindLabel = "building component"
	if ground {
		p.KindLabel = "ground and frost"
	}
	var specs []*chartSpec
	var firstErr error
	chart := func(f func(*results.Results) (*chartSpec, error)) *block {
		s, err := f(r)
		if err != nil && firstErr == nil {
			firstErr = err
		}
		if s == nil {
			return nil
		}
		specs = append(specs, s)
		return &block{Chart: s}
	}
	add := func(sec *section, b ...*block) {
		for _, x := range b {
			if x != nil {
				sec.Blocks = append(sec.Blocks, *x)
			}
		}
	}

	p.Summary = summary(r)

	// Construction or soil column: the drawing, then the tables.
	cons := section{ID: "construction", Heading: "Construction"}
	if ground {
		cons.Heading = "Soil column"
	}
	if f := crossSection(r); f != nil {
		add(&cons, &block{Figure: f})
	}
	add(&cons, &block{Table: layerTable(r)}, frozenTable(r), steadyTable(r))

	inputs := section{ID: "inputs", Heading: "Assumptions and inputs"}
	add(&inputs, inputsBlocks(r)...)

	study := section{ID: "study", Heading: "Options and studies"}
	if f := variantsFigure(r); f != nil {
		add(&study, &block{Figure: f})
	}
	add(&study, variantsTable(r), sweepTable(r))
	add(&study, targetBlock(r)...)
	add(&study, uncertaintyTables(r)...)
	add(&study, fitTables(r)...)

	// Frost and ground temperatures come first for a ground column.
	var frost, groundT *section
	if ground {
		frost = &section{ID: "frost", Heading: "Frost"}
		add(frost, frostCompareTable(r), freezingIndexTable(r), winterTable(r), chart(frostChart))
		groundT = &section{ID: "ground", Heading: "Ground temperature"}
		add(groundT, groundSummaryTable(r))
		add(groundT, groundPeriodTables(r)...)
		add(groundT, chart(groundEnvelopeChart))
	}

	per := section{ID: "periodic", Heading: "Periodic properties (ISO 13786)"}
	add(&per, periodicTable(r), surfaceFactorTable(r), chart(cycleChart))
	if !ground {
		add(&per, chart(envelopeChart))
	}
	add(&per, chart(responseChart))

	var sim *section
	if r.Simulation != nil || len(r.Series.Simulation.Time_h) > 0 {
		sim = &section{ID: "simulation", Heading: "Transient simulation"}
		add(sim, energyTable(r), checkTable(r), probeTable(r), chart(simTempChart), chart(simFluxChart))
	} else if r.SimulationSkipped != "" {
		sim = &section{ID: "simulation", Heading: "Transient simulation"}
		add(sim, &block{Text: []string{"Not run: " + r.SimulationSkipped + "."}})
	}

	var step *section
	if len(r.Series.Step.Time_s) > 0 || r.StepResponse != nil {
		step = &section{ID: "step", Heading: "Surface heat uptake after a step"}
		add(step, stepTable(r), chart(stepChart))
	}
	if firstErr != nil {
		return nil, nil, firstErr
	}

	for _, s := range []*section{&cons, &inputs, &study, frost, groundT, &per, sim, step} {
		if s != nil && len(s.Blocks) > 0 {
			p.Sections = append(p.Sections, *s)
		}
	}
	p.Methods = methods(r)
	p.Cautions = results.Cautions(r) // the same list as results.json and the terminal
	return p, specs, nil
}
