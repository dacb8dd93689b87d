package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"text/tabwriter"

	"github.com/urfave/cli/v2"

	"tempstack/charts"
	"tempstack/ground"
	"tempstack/layers"
	"tempstack/scenarios"
)

// load decodes the scenario named by the command line: a file, or the
// embedded demo (by --example, or the default demo when no file is given).
func load(c *cli.Context) (*scenarios.Scenario, error) {
	if c.NArg() > 1 {
		return nil, userErr("give one scenario file, got %d arguments", c.NArg())
	}
	file := c.Args().First()
	name := ""
	if c.IsSet("example") {
		name = c.String("example")
		if file != "" {
			return nil, userErr("give either a scenario file or --example, not both")
		}
	}
	if file == "" {
		if name == "" {
			name = scenarios.DefaultExample
		}
		ex, ok := scenarios.LookupExample(name)
		if !ok {
			return nil, userErr("no embedded example %q; `tempstack examples` lists them", name)
		}
		s, err := ex.Decode()
		if err != nil {
			return nil, userError{err}
		}
		return s, nil
	}
	s, err := scenarios.Load(file)
	if err != nil {
		return nil, userError{err}
	}
	return s, nil
}

// asUserError marks scenario errors (bad input) as user errors.
func asUserError(err error) error {
	var se *scenarios.Error
	if errors.As(err, &se) {
		return userError{err}
	}
	return err
}

func exampleFlag() cli.Flag {
	return &cli.StringFlag{Name: "example", Usage: "solve the embedded demo `NAME` (see `tempstack examples`)"}
}

func runCommand() *cli.Command {
	return &cli.Command{
		Name:      "run",
		Usage:     "solve a scenario and write report.html, results.json and CSV series",
		ArgsUsage: "[FILE]",
		Description: "Solves the scenario FILE (or, with no FILE, the embedded demo) and writes\n" +
			"report.html, results.json and CSV series into the --out folder.",
		Flags: []cli.Flag{
			&cli.StringFlag{Name: "out", Aliases: []string{"o"}, Value: "out", Usage: "output `DIR` (created if missing)"},
			exampleFlag(),
			&cli.BoolFlag{Name: "quiet", Aliases: []string{"q"}, Usage: "print nothing on success"},
		},
		OnUsageError: usageError,
		Action: func(c *cli.Context) error {
			s, err := load(c)
			if err != nil {
				return err
			}
			res, err := scenarios.Run(s, progressFor(c.App.ErrWriter))
			if err != nil {
				return asUserError(err)
			}
			dir := c.String("out")
			written, err := writeOutputs(dir, res)
			if err != nil {
				return err
			}
			if !c.Bool("quiet") {
				printSummary(c.App.Writer, res)
				for _, w := range written {
					fmt.Fprintf(c.App.Writer, "wrote %s\n", w)
				}
			}
			return nil
		},
	}
}

// writeOutputs writes every output file of a run into dir. Each file is
// written to a temporary file in dir and renamed into place only when
// complete, so a failure never leaves a half-written file.
func writeOutputs(dir string, res *scenarios.Results) ([]string, error) {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, userErr("cannot create output folder: %v", err)
	}
	var files []struct {
		name string
		data []byte
	}
	js, err := json.MarshalIndent(res, "", "  ")
	if err != nil {
		return nil, fmt.Errorf("encoding results.json: %w", err)
	}
	js = append(js, '\n')
	var html bytes.Buffer
	if err := charts.Write(&html, res, charts.Options{ToolVersion: version}); err != nil {
		return nil, fmt.Errorf("building report.html: %w", err)
	}
	files = append(files,
		struct {
			name string
			data []byte
		}{"results.json", js},
		struct {
			name string
			data []byte
		}{"report.html", html.Bytes()},
	)
	for _, extra := range scenarios.CSVFiles(res) {
		files = append(files, struct {
			name string
			data []byte
		}{extra.Name, extra.Data})
	}
	var written []string
	for _, f := range files {
		p := filepath.Join(dir, f.name)
		if err := writeFileAtomic(p, f.data); err != nil {
			return written, err
		}
		written = append(written, p)
	}
	return written, nil
}

// writeFileAtomic writes data to a temporary file beside path and renames
// it over path once it is complete and synced.
func writeFileAtomic(path string, data []byte) error {
	tmp, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".*.tmp")
	if err != nil {
		return userErr("cannot write in %s: %v", filepath.Dir(path), err)
	}
	name := tmp.Name()
	_, werr := tmp.Write(data)
	serr := tmp.Sync()
	cerr := tmp.Close()
	if err := errors.Join(werr, serr, cerr); err != nil {
		os.Remove(name)
		return userErr("cannot write %s: %v", path, err)
	}
	if err := os.Chmod(name, 0o644); err != nil {
		os.Remove(name)
		return userErr("cannot write %s: %v", path, err)
	}
	if err := os.Rename(name, path); err != nil {
		os.Remove(name)
		return userErr("cannot write %s: %v", path, err)
	}
	return nil
}

func checkCommand() *cli.Command {
	return &cli.Command{
		Name:         "check",
		Usage:        "validate a scenario file without solving it",
		ArgsUsage:    "FILE",
		OnUsageError: usageError,
		Flags:        []cli.Flag{exampleFlag()},
		Action: func(c *cli.Context) error {
			if c.NArg() == 0 && !c.IsSet("example") {
				return userErr("check needs a scenario FILE")
			}
			s, err := load(c)
			if err != nil {
				return err
			}
			fmt.Fprintf(c.App.Writer, "%s: ok: %s scenario %q, %d layers\n", s.File, s.Kind, s.Title, len(s.Layers))
			return nil
		},
	}
}

// materialRow is one line of `tempstack materials`: a building material of
// package layers or a soil or rock preset of package ground.
type materialRow struct {
	Key          string  `json:"key"`
	Name         string  `json:"name"`
	Family       string  `json:"family"`
	Conductivity float64 `json:"conductivity_W_mK,omitempty"`
	Density      float64 `json:"density_kg_m3,omitempty"`
	SpecificHeat float64 `json:"specific_heat_J_kgK,omitempty"`
	HeatCapacity float64 `json:"heat_capacity_J_m3K,omitempty"`
	Resistance   float64 `json:"resistance_m2K_W,omitempty"`
	Freezes      bool    `json:"freezes,omitempty"`
	Source       string  `json:"source"`
}

func materialRows(filter string) []materialRow {
	var rows []materialRow
	for _, m := range layers.Filter(filter) {
		rows = append(rows, materialRow{Key: m.Key, Name: m.Name, Family: m.Family, Conductivity: m.Conductivity,
			Density: m.Density, SpecificHeat: m.SpecificHeat, HeatCapacity: m.Density * m.SpecificHeat,
			Resistance: m.Resistance, Source: m.Source})
	}
	q := strings.ToLower(strings.TrimSpace(filter))
	for _, p := range ground.Presets() {
		if q != "" && !strings.Contains(strings.ToLower(p.Key+" "+p.Description+" soil"), q) {
			continue
		}
		row := materialRow{Key: p.Key, Name: p.Description, Family: "soil", Source: p.Source,
			Conductivity: p.Conductivity, HeatCapacity: p.HeatCapacity}
		if l, err := p.Layer(p.Key, 1); err == nil {
			row.Conductivity, row.HeatCapacity, row.Freezes = l.Conductivity, l.HeatCapacity, l.Freeze != nil
		}
		rows = append(rows, row)
	}
	return rows
}

func materialsCommand() *cli.Command {
	return &cli.Command{
		Name:      "materials",
		Usage:     "list the built-in materials, soils and rocks with sources",
		ArgsUsage: "[FILTER]",
		Description: "Lists the built-in building materials and the soil and rock presets;\n" +
			"FILTER keeps those whose key, name or family contains the words (case does not matter).",
		Flags:        []cli.Flag{&cli.BoolFlag{Name: "json", Usage: "print JSON instead of a table"}},
		OnUsageError: usageError,
		Action: func(c *cli.Context) error {
			filter := strings.Join(c.Args().Slice(), " ")
			rows := materialRows(filter)
			if len(rows) == 0 {
				return userErr("no material matches %q", filter)
			}
			if c.Bool("json") {
				enc := json.NewEncoder(c.App.Writer)
				enc.SetIndent("", "  ")
				return enc.Encode(rows)
			}
			tw := tabwriter.NewWriter(c.App.Writer, 0, 0, 2, ' ', 0)
			fmt.Fprintln(tw, "KEY\tFAMILY\tW/(m K)\tkJ/(m3 K)\tm2 K/W\tSOURCE")
			for _, m := range rows {
				cond, cap, res := "-", "-", "-"
				if m.Resistance > 0 {
					res = fmt.Sprintf("%.2f", m.Resistance)
				} else {
					cond = fmt.Sprintf("%.3g", m.Conductivity)
					cap = fmt.Sprintf("%.0f", m.HeatCapacity/1000)
				}
				fam := m.Family
				if m.Freezes {
					fam += " (freezes)"
				}
				fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\n", m.Key, fam, cond, cap, res, m.Source)
			}
			return tw.Flush()
		},
	}
}

func newCommand() *cli.Command {
	return &cli.Command{
		Name:      "new",
		Usage:     "write a commented starter scenario file",
		ArgsUsage: "wall|ground",
		Flags: []cli.Flag{
			&cli.StringFlag{Name: "out", Aliases: []string{"o"}, Usage: "write to `FILE` (default: KIND.yaml; - for standard output)"},
			&cli.BoolFlag{Name: "force", Usage: "overwrite an existing file"},
		},
		OnUsageError: usageError,
		Action: func(c *cli.Context) error {
			kind := c.Args().First()
			if c.NArg() != 1 {
				return userErr("new needs one kind: wall or ground")
			}
			data, ok := scenarios.Starter(kind)
			if !ok {
				return userErr("unknown kind %q; use wall or ground", kind)
			}
			out := c.String("out")
			if out == "" {
				out = kind + ".yaml"
			}
			if out == "-" {
				_, err := c.App.Writer.Write(data)
				return err
			}
			if _, err := os.Stat(out); err == nil && !c.Bool("force") {
				return userErr("%s exists; choose another --out or add --force", out)
			}
			if err := writeFileAtomic(out, data); err != nil {
				return err
			}
			fmt.Fprintf(c.App.Writer, "wrote %s; edit it, then `tempstack run %s`\n", out, out)
			return nil
		},
	}
}

func examplesCommand() *cli.Command {
	return &cli.Command{
		Name:         "examples",
		Usage:        "list the embedded demo scenarios (invented places)",
		ArgsUsage:    "[NAME]",
		OnUsageError: usageError,
		Description: "With NAME, prints that demo's YAML so it can be saved and edited;\n" +
			"`tempstack examples demo-station.csv` prints the invented station record the station demo reads.",
		Action: func(c *cli.Context) error {
			if name := c.Args().First(); name != "" {
				if name == scenarios.DemoSeriesFile {
					f, err := scenarios.ExampleFiles().Open(name)
					if err != nil {
						return err
					}
					defer f.Close()
					_, err = io.Copy(c.App.Writer, f)
					return err
				}
				ex, ok := scenarios.LookupExample(name)
				if !ok {
					return userErr("no embedded example %q", name)
				}
				_, err := c.App.Writer.Write(ex.Data)
				return err
			}
			tw := tabwriter.NewWriter(c.App.Writer, 0, 0, 2, ' ', 0)
			for _, ex := range scenarios.Examples() {
				def := ""
				if ex.Name == scenarios.DefaultExample {
					def = " (default)"
				}
				fmt.Fprintf(tw, "%s%s\t%s\n", ex.Name, def, ex.Title)
			}
			return tw.Flush()
		},
	}
}
