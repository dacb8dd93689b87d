package main

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"os/signal"
	"path/filepath"
	"strings"
	"syscall"
	"text/tabwriter"
	"time"

	"github.com/urfave/cli/v2"

	"tempstack/charts"
	"tempstack/ground"
	"tempstack/layers"
	"tempstack/scenarios"
	"tempstack/scenarios/results"
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
		// A demo's name given as a file: say how to run the demo.
		if _, ok := scenarios.LookupExample(file); ok && errors.Is(err, fs.ErrNotExist) {
			return nil, userErr("%s: no such file; to solve the embedded demo of that name, use --example %s", file, file)
		}
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

// signalsWatched, when set (by tests), is called once the run command
// watches for Ctrl-C.
var signalsWatched func()

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
			&cli.BoolFlag{Name: "force", Usage: "write into a non-empty --out folder that holds no earlier results.json"},
			&cli.BoolFlag{Name: "date", Usage: "print today's date in the report (off by default, so the same input gives a byte-identical report)"},
			&cli.IntFlag{Name: "workers", Usage: "run at most `N` cases of a study at once (default: one per core)"},
		},
		OnUsageError: usageError,
		Action: func(c *cli.Context) error {
			if w := c.Int("workers"); w < 0 {
				return userErr("--workers: want a whole number of at least 1 (0 or none: one per core), got %d", w)
			}
			s, err := load(c)
			if err != nil {
				return err
			}
			dir := c.String("out")
			// Refuse an unusable folder before a long run, not after it.
			if err := checkOutDir(dir, c.Bool("force")); err != nil {
				return err
			}
			// Ctrl-C (or a termination request) cancels the run: a study
			// stops at its next case and nothing is written.
			ctx, stop := signal.NotifyContext(c.Context, os.Interrupt, syscall.SIGTERM)
			defer stop()
			if signalsWatched != nil {
				signalsWatched()
			}
			// series.csv is written while the simulation runs, into a
			// temporary file that is renamed with the other outputs.
			series, err := newStreamed(filepath.Join(dir, "series.csv"))
			if err != nil {
				return err
			}
			defer series.discard()
			res, err := scenarios.Run(ctx, s, scenarios.Options{Progress: progressFor(c.App.ErrWriter), Workers: c.Int("workers"), Series: series.f})
			if errors.Is(err, context.Canceled) {
				return cli.Exit("interrupted: the run was stopped and nothing was written", 130)
			}
			if err != nil {
				return asUserError(err)
			}
			opt := charts.Options{ToolVersion: version}
			if c.Bool("date") {
				opt.GeneratedAt = time.Now().Format("2 January 2006")
			}
			written, err := writeOutputs(dir, res, opt, series)
			if err != nil {
				return err
			}
			if !c.Bool("quiet") {
				printSummary(c.App.Writer, res)
				for _, w := range written {
					fmt.Fprintf(c.App.Writer, "wrote %s\n", w)
				}
				for _, old := range leftovers(dir, written) {
					fmt.Fprintf(c.App.Writer, "kept %s from an earlier run (this run does not produce it)\n", old)
				}
			}
			return nil
		},
	}
}

// checkOutDir applies the safety rule of the output folder: it is created
// when missing; an existing folder must be empty, or hold a results.json
// of an earlier run (whose files are then replaced one by one), unless
// force is set. It never deletes anything. A path that is a file, or a
// folder that cannot be created or written, is a user error.
func checkOutDir(dir string, force bool) error {
	if dir == "" {
		return userErr("--out needs a folder name")
	}
	fi, err := os.Stat(dir)
	switch {
	case err == nil && !fi.IsDir():
		return userErr("output folder %s is a file; give --out a folder", dir)
	case err != nil && !errors.Is(err, fs.ErrNotExist):
		return userErr("cannot use output folder %s: %v", dir, cleanPathError(err))
	case err != nil:
		if err := os.MkdirAll(dir, 0o755); err != nil {
			return userErr("cannot create output folder %s: %v", dir, cleanPathError(err))
		}
		return probeWritable(dir)
	}
	entries, err := os.ReadDir(dir)
	if err != nil {
		return userErr("cannot read output folder %s: %v", dir, cleanPathError(err))
	}
	var others int
	previous := false
	for _, e := range entries {
		switch {
		case e.Name() == "results.json" && e.Type().IsRegular():
			previous = true
		case isTempName(e.Name()):
			// A temporary file of an interrupted earlier run.
		default:
			others++
		}
	}
	if others > 0 && !previous && !force {
		return userErr("output folder %s is not empty and holds no results.json of an earlier run; "+
			"choose a new or empty folder, or add --force to write beside its files", dir)
	}
	return probeWritable(dir)
}

// probeWritable checks that a file can be created in dir, so that a long
// run does not end in a folder it cannot write.
func probeWritable(dir string) error {
	f, err := os.CreateTemp(dir, ".tempstack-probe.*.tmp")
	if err != nil {
		return userErr("cannot write in output folder %s: %v", dir, cleanPathError(err))
	}
	name := f.Name()
	f.Close()
	os.Remove(name) // our own empty probe file
	return nil
}

// cleanPathError drops the operation and path that os errors repeat, since
// messages already name the folder.
func cleanPathError(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// isTempName reports whether name is a temporary file that writeFileAtomic
// or probeWritable creates (".NAME.RANDOM.tmp").
func isTempName(name string) bool {
	return strings.HasPrefix(name, ".") && strings.HasSuffix(name, ".tmp")
}

// leftovers lists output-like files (.csv, .json, .html) in dir that this
// run did not write: files of an earlier run that are kept (never deleted)
// but no longer match the new results.
func leftovers(dir string, written []string) []string {
	entries, err := os.ReadDir(dir)
	if err != nil {
		return nil
	}
	done := map[string]bool{}
	for _, w := range written {
		done[filepath.Base(w)] = true
	}
	var out []string
	for _, e := range entries {
		n := e.Name()
		if done[n] || strings.HasPrefix(n, ".") || !e.Type().IsRegular() {
			continue
		}
		switch filepath.Ext(n) {
		case ".csv", ".json", ".html":
			out = append(out, filepath.Join(dir, n))
		}
	}
	return out
}

// streamed is an output file written while the run goes on (series.csv):
// a temporary file beside its final path, renamed by writeOutputs with
// the other outputs, or removed by discard.
type streamed struct {
	path string   // the final path
	f    *os.File // the temporary file, nil once renamed or removed
}

// newStreamed creates the temporary file of path (".BASE.RANDOM.tmp").
func newStreamed(path string) (*streamed, error) {
	f, err := createTemp(filepath.Dir(path), "."+filepath.Base(path)+".*.tmp")
	if err != nil {
		return nil, userErr("cannot write in %s: %v", filepath.Dir(path), cleanPathError(err))
	}
	return &streamed{path: path, f: f}, nil
}

// stage syncs and closes the temporary file and returns its name.
func (s *streamed) stage() (string, error) {
	name := s.f.Name()
	serr := s.f.Sync()
	cerr := s.f.Close()
	s.f = nil
	if err := errors.Join(serr, cerr, os.Chmod(name, 0o644)); err != nil {
		os.Remove(name)
		return "", userErr("cannot write %s: %v", s.path, err)
	}
	return name, nil
}

// discard removes the temporary file unless it was staged.
func (s *streamed) discard() {
	if s != nil && s.f != nil {
		s.f.Close()
		os.Remove(s.f.Name())
		s.f = nil
	}
}

// writeOutputs writes every output file of a run into dir. Every file is
// first built in memory (or, series.csv, written while the run went on,
// into the temporary file of series), then written in full to a temporary
// file in dir (".NAME.RANDOM.tmp") and synced; only when all of them are
// on disk are they renamed over the final names. A failure before that
// point removes the temporary files and leaves every earlier file in dir
// untouched; a process killed before it leaves the earlier files intact
// too (at worst with a hidden temporary file beside them, never a
// half-written output).
func writeOutputs(dir string, res *results.Results, opt charts.Options, series ...*streamed) ([]string, error) {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, userErr("cannot create output folder %s: %v", dir, cleanPathError(err))
	}
	type file struct {
		name     string
		data     []byte
		streamed *streamed // written while the run went on
	}
	var files []file
	if at := results.NonFinite(res); at != "" {
		// results.json cannot hold NaN or infinity, and a chart of one is
		// blank: refuse, naming the value, and write nothing.
		return nil, cli.Exit(fmt.Sprintf("internal error: the result %s is not a finite number (NaN or infinity); "+
			"nothing was written (please report this with the scenario file)", at), 2)
	}
	var js bytes.Buffer
	if err := results.WriteJSON(&js, res); err != nil {
		return nil, fmt.Errorf("encoding results.json: %w", err)
	}
	var html bytes.Buffer
	if err := charts.Write(&html, res, opt); err != nil {
		return nil, fmt.Errorf("building report.html: %w", err)
	}
	files = append(files, file{name: "results.json", data: js.Bytes()}, file{name: "report.html", data: html.Bytes()})
	for _, extra := range results.CSVFiles(res) {
		f := file{name: extra.Name, data: extra.Data}
		if extra.Streamed {
			for _, st := range series {
				if st != nil && st.f != nil && filepath.Base(st.path) == extra.Name {
					f.streamed = st
				}
			}
			if f.streamed == nil {
				return nil, fmt.Errorf("internal error: %s was streamed to no file", extra.Name)
			}
		}
		files = append(files, f)
	}
	for _, f := range files {
		// A folder in the way would fail the renames half-way: refuse first.
		p := filepath.Join(dir, f.name)
		if fi, err := os.Lstat(p); err == nil && !fi.Mode().IsRegular() {
			return nil, userErr("cannot write %s: something other than a file has that name", p)
		}
	}
	var staged []string
	cleanup := func() {
		for _, tmp := range staged {
			os.Remove(tmp)
		}
	}
	for _, f := range files {
		var tmp string
		var err error
		if f.streamed != nil {
			tmp, err = f.streamed.stage()
		} else {
			tmp, err = writeTemp(filepath.Join(dir, f.name), f.data)
		}
		if err != nil {
			cleanup()
			return nil, err
		}
		staged = append(staged, tmp)
	}
	var written []string
	for i, f := range files {
		p := filepath.Join(dir, f.name)
		if err := os.Rename(staged[i], p); err != nil {
			staged = staged[i:]
			cleanup()
			return written, userErr("cannot write %s: %v", p, cleanPathError(err))
		}
		written = append(written, p)
	}
	syncDir(dir)
	return written, nil
}

// writeFileAtomic writes data to a temporary file beside path and renames
// it over path once it is complete and synced.
func writeFileAtomic(path string, data []byte) error {
	tmp, err := writeTemp(path, data)
	if err != nil {
		return err
	}
	if err := os.Rename(tmp, path); err != nil {
		os.Remove(tmp)
		return userErr("cannot write %s: %v", path, cleanPathError(err))
	}
	syncDir(filepath.Dir(path))
	return nil
}

// createTemp creates the temporary files of writeTemp; tests replace it to
// make a write fail part-way.
var createTemp = os.CreateTemp

// writeTemp writes data in full to a new temporary file beside path
// (".BASE.RANDOM.tmp", mode 0644), syncs and closes it, and returns its
// name. On failure nothing is left behind.
func writeTemp(path string, data []byte) (string, error) {
	tmp, err := createTemp(filepath.Dir(path), "."+filepath.Base(path)+".*.tmp")
	if err != nil {
		return "", userErr("cannot write in %s: %v", filepath.Dir(path), cleanPathError(err))
	}
	name := tmp.Name()
	_, werr := tmp.Write(data)
	serr := tmp.Sync()
	cerr := tmp.Close()
	if err := errors.Join(werr, serr, cerr); err != nil {
		os.Remove(name)
		return "", userErr("cannot write %s: %v", path, err)
	}
	if err := os.Chmod(name, 0o644); err != nil {
		os.Remove(name)
		return "", userErr("cannot write %s: %v", path, cleanPathError(err))
	}
	return name, nil
}

// syncDir flushes the folder entry of renamed files to disk where the
// system allows it (best effort: not every platform can sync a folder).
func syncDir(dir string) {
	if d, err := os.Open(dir); err == nil {
		d.Sync()
		d.Close()
	}
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
			// Every check that run makes before solving (scenarios.Check).
			if err := scenarios.Check(s); err != nil {
				return asUserError(err)
			}
			// Values that are valid but most likely a unit slip.
			for _, w := range scenarios.Warnings(s) {
				fmt.Fprintf(c.App.ErrWriter, "tempstack: warning: %s\n", w)
			}
			if s.Room != nil {
				fmt.Fprintf(c.App.Writer, "%s: ok: %s scenario %q, %d elements, %d windows\n", s.File, s.Kind, s.Title, len(s.Room.Elements), len(s.Room.Windows))
				return nil
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
		ArgsUsage: "wall|ground|room",
		Flags: []cli.Flag{
			&cli.StringFlag{Name: "out", Aliases: []string{"o"}, Usage: "write to `FILE` (default: KIND.yaml; - for standard output)"},
			&cli.BoolFlag{Name: "force", Usage: "overwrite an existing file"},
		},
		OnUsageError: usageError,
		Action: func(c *cli.Context) error {
			kind := c.Args().First()
			if c.NArg() != 1 {
				return userErr("new needs one kind: wall, ground or room")
			}
			data, ok := scenarios.Starter(kind)
			if !ok {
				return userErr("unknown kind %q; use wall, ground or room", kind)
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
			// The starter's first line points editors at the schema beside it.
			schemaPath := filepath.Join(filepath.Dir(out), scenarios.SchemaFile)
			schema, err := scenarios.Schema()
			if err != nil {
				return err
			}
			if old, err := os.ReadFile(schemaPath); err == nil && bytes.Equal(old, schema) {
				return nil
			}
			if err := writeFileAtomic(schemaPath, schema); err != nil {
				return err
			}
			fmt.Fprintf(c.App.Writer, "wrote %s (for editors that read the starter's schema line)\n", schemaPath)
			return nil
		},
	}
}

func schemaCommand() *cli.Command {
	return &cli.Command{
		Name:  "schema",
		Usage: "print the JSON Schema of the scenario file (for editors)",
		Flags: []cli.Flag{
			&cli.StringFlag{Name: "out", Aliases: []string{"o"}, Usage: "write to `FILE` instead of standard output"},
		},
		OnUsageError: usageError,
		Description: "The schema is made from the decoder's own key tables; it checks keys and the shapes of\n" +
			"values. A starter from `tempstack new` names it on its first line (" + scenarios.SchemaFile + ").",
		Action: func(c *cli.Context) error {
			if c.NArg() > 0 {
				return userErr("schema takes no arguments")
			}
			data, err := scenarios.Schema()
			if err != nil {
				return err
			}
			if out := c.String("out"); out != "" && out != "-" {
				return writeFileAtomic(out, data)
			}
			_, err = c.App.Writer.Write(data)
			return err
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
