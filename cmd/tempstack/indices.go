package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"strconv"
	"strings"
	"text/tabwriter"
	"time"

	"github.com/urfave/cli/v2"

	"tempstack/climate"
	"tempstack/fileerr"
)

// indicesCommand reads a measured temperature series and prints its
// freezing and thawing indices per winter, the mean annual temperature,
// the design freezing index, a Gumbel return-period index and the fitted
// annual harmonic. It runs no simulation.
func indicesCommand() *cli.Command {
	return &cli.Command{
		Name:      "indices",
		Usage:     "freezing and thawing indices of a measured temperature series (CSV)",
		ArgsUsage: "FILE.csv",
		Description: "Reads an air-temperature record from FILE.csv and prints, for every winter year\n" +
			"(1 July to 30 June; calendar years with --southern), the freezing season read from\n" +
			"the cumulative curve of daily mean degrees, its air freezing index and the thawing\n" +
			"index of the warm season after it (degC day; x 24 gives the K h of ISO 13793).\n" +
			"Then: the mean annual temperature over the complete winter years; the design\n" +
			"freezing index, the mean of the 3 coldest of the latest (up to) 30 complete\n" +
			"winters (common practice for pavement frost design); a Gumbel fit to the\n" +
			"complete winters and its return-period index (the 100-year air freezing index\n" +
			"is used for frost-protected shallow foundations, ASCE 32-01); the fitted annual\n" +
			"harmonic (mean, amplitude, peak day, ready for a scenario file); and the holes\n" +
			"bridged by linear interpolation.\n\n" +
			"The file: comment lines start with '#', the first other line is the header;\n" +
			"separator ',', ';' or tab (detected); times ISO 8601 (2024-01-15T06:00, with an\n" +
			"optional UTC offset) in one column, or a date column plus an hour column.\n\n" +
			"These are air indices: the surface index is about n x the air index (n-factor\n" +
			"of the surface cover). A short record understates the design values. Design\n" +
			"frost depths are set by local codes and a licensed engineer; these indices are\n" +
			"inputs to their methods, not a substitute.",
		Flags: []cli.Flag{
			&cli.StringFlag{Name: "time-column", Usage: "ISO 8601 time `NAME` (default: \"time\" if the header has it)"},
			&cli.StringFlag{Name: "date-column", Usage: "date `NAME` (YYYY-MM-DD), instead of a time column"},
			&cli.StringFlag{Name: "hour-column", Usage: "hour-of-day `NAME` (0..24 or h:mm), with --date-column"},
			&cli.StringFlag{Name: "column", Usage: "temperature column `NAME` (default: the only value column)"},
			&cli.StringFlag{Name: "decimal", Value: ".", Usage: "decimal `MARK` of the numbers: . or ,"},
			&cli.StringFlag{Name: "unit", Value: "C", Usage: "temperature `UNIT` of the file: C, F or K"},
			&cli.Float64Flag{Name: "threshold", Value: 0, Usage: "count degree-days from this `TEMPERATURE`, degC (whatever --unit says)"},
			&cli.BoolFlag{Name: "southern", Usage: "split winter years at 1 January (winter in mid-year)"},
			&cli.Float64Flag{Name: "return-period", Value: 100, Usage: "return period of the Gumbel index, `YEARS` (> 1)"},
			&cli.StringFlag{Name: "method", Value: "moments", Usage: "Gumbel fit `METHOD`: moments, max-likelihood or reduced-variate"},
			&cli.StringFlag{Name: "max-gap", Usage: "longest hole bridged by interpolation, `DURATION` (6h, 2d; bare number = hours; default 6 h, or twice the record spacing when longer)"},
			&cli.BoolFlag{Name: "json", Usage: "print JSON instead of a table"},
		},
		OnUsageError: usageError,
		Action: func(c *cli.Context) error {
			if c.NArg() != 1 {
				return userErr("indices needs one CSV file, got %d arguments", c.NArg())
			}
			rep, err := computeIndices(c.Args().First(), c)
			if err != nil {
				return err
			}
			if c.Bool("json") {
				enc := json.NewEncoder(c.App.Writer)
				enc.SetIndent("", "  ")
				return enc.Encode(rep)
			}
			return printIndices(c.App.Writer, rep)
		},
	}
}

// computeIndices reads the file named by the command line and computes the
// report. Input problems are user errors.
func computeIndices(file string, c *cli.Context) (*climate.RecordIndices, error) {
	data, err := os.ReadFile(file)
	if err != nil {
		var pe *fs.PathError
		if errors.As(err, &pe) {
			err = pe.Err
		}
		return nil, userErr("cannot read %s: %v", file, err)
	}
	opt, dec, maxGap, err := indicesFlags(c)
	if err != nil {
		return nil, err
	}
	o, col, err := indicesColumns(c, file, data, dec)
	if err != nil {
		return nil, err
	}
	if (o.Unit == "C" || o.Unit == "") && climate.LooksFahrenheit(col) {
		// A plausibility warning, not an error: the name is not proof.
		fmt.Fprintf(c.App.ErrWriter, "tempstack: warning: %s: column %q is named like degrees Fahrenheit but is read in degC (--unit C); if it holds degF, give --unit F\n", file, col)
	}
	s, maxGap, err := readIndicesRecord(data, file, o, maxGap)
	if err != nil {
		return nil, err
	}
	rep, err := climate.AnalyzeRecord(s, col, opt)
	if err != nil {
		return nil, userError{err}
	}
	rep.File, rep.Unit, rep.MaxGap_h = file, o.Unit, maxGap.Hours()
	return rep, nil
}

// indicesFlags checks the numeric flags of `indices`: the analysis
// options, the decimal mark and the maximum gap (0: not given).
func indicesFlags(c *cli.Context) (opt climate.IndicesOptions, dec rune, maxGap time.Duration, err error) {
	switch d := c.String("decimal"); d {
	case ".":
		dec = '.'
	case ",":
		dec = ','
	default:
		return opt, 0, 0, userErr("--decimal must be . or , (got %q)", d)
	}
	method, err := climate.ParseFitMethod(c.String("method"))
	if err != nil {
		return opt, 0, 0, userErr("--method: %s", strings.TrimPrefix(err.Error(), "climate: "))
	}
	T := c.Float64("return-period")
	if !(T > 1) || math.IsInf(T, 0) {
		return opt, 0, 0, userErr("--return-period must be a number of years above 1, got %g", T)
	}
	thr := c.Float64("threshold")
	if math.IsNaN(thr) || math.IsInf(thr, 0) {
		return opt, 0, 0, userErr("--threshold must be a finite temperature in degC")
	}
	if c.IsSet("max-gap") {
		if maxGap, err = parseGap(c.String("max-gap")); err != nil {
			return opt, 0, 0, userErr("--max-gap: %v", err)
		}
	}
	return climate.IndicesOptions{Threshold: thr, Southern: c.Bool("southern"), ReturnPeriod: T, Method: method}, dec, maxGap, nil
}

// indicesColumns chooses the time and temperature columns from the flags
// and the file's header.
func indicesColumns(c *cli.Context, file string, data []byte, dec rune) (climate.CSVOptions, string, error) {
	header := climate.CSVHeader(data, dec)
	if header == nil {
		return climate.CSVOptions{}, "", userErr("%s: no header line (the file is empty or holds only comments)", file)
	}
	o := climate.CSVOptions{
		TimeColumn:  c.String("time-column"),
		DateColumn:  c.String("date-column"),
		HourColumn:  c.String("hour-column"),
		Decimal:     dec,
		DecimalHint: "--decimal ,",
		Unit:        c.String("unit"),
	}
	if o.TimeColumn != "" && o.DateColumn != "" {
		return o, "", userErr("give either --time-column or --date-column, not both")
	}
	if o.TimeColumn == "" && o.DateColumn == "" {
		if !contains(header, "time") {
			return o, "", userErr("%s: no column \"time\"; name the time column with --time-column (or --date-column) (header: %s)", file, quoteNames(header))
		}
		o.TimeColumn = "time"
	}
	col := c.String("column")
	if col == "" {
		var cand []string
		for _, h := range header {
			if h != "" && h != o.TimeColumn && h != o.DateColumn && h != o.HourColumn {
				cand = append(cand, h)
			}
		}
		if len(cand) != 1 {
			return o, "", userErr("%s: %d value columns (%s): choose the temperature with --column", file, len(cand), quoteNames(cand))
		}
		col = cand[0]
	}
	o.Columns = []string{col}
	return o, col, nil
}

// readIndicesRecord reads the record. Without a maximum gap (0), a
// permissive first pass learns the record spacing; the limit is then 6 h
// (climate.DefaultMaxGap) or twice the typical spacing, whichever is
// longer, so that a file of daily values reads and one missing record is
// bridged. A record without any hole reads the same under every limit and
// is not read again. It returns the series and the limit used.
func readIndicesRecord(data []byte, file string, o climate.CSVOptions, maxGap time.Duration) (*climate.Series, time.Duration, error) {
	read := func(gap time.Duration) (*climate.Series, error) {
		o.MaxGap = gap
		s, err := climate.ReadCSV(bytes.NewReader(data), file, o)
		if err != nil {
			var ce *fileerr.Error
			if errors.As(err, &ce) {
				return nil, userError{err}
			}
			return nil, userErr("%s: %v", file, err)
		}
		return s, nil
	}
	if maxGap > 0 {
		s, err := read(maxGap)
		return s, maxGap, err
	}
	s, err := read(time.Duration(math.MaxInt64))
	if err != nil {
		return nil, 0, err
	}
	maxGap = max(climate.DefaultMaxGap, 2*time.Duration(s.Step*float64(time.Second)))
	if len(s.Bridged) > 0 {
		s, err = read(maxGap)
	}
	return s, maxGap, err
}

// printIndices prints the report as a table and summary lines.
func printIndices(w io.Writer, r *climate.RecordIndices) error {
	fmt.Fprintf(w, "%s, column %q: %d records from %s to %s, every %s\n",
		r.File, r.Column, r.Records, r.First, r.Last, fmtHours(r.Step_h))
	if r.Threshold_C != 0 {
		fmt.Fprintf(w, "degree-days counted from %g degC\n", r.Threshold_C)
	}
	fmt.Fprintln(w)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "winter\tstart\tend\tdays\tfreezing degC day\tthawing degC day\tmean degC\tcomplete\t")
	partialThaw := false
	for _, x := range r.Winters {
		thaw := fmt.Sprintf("%.1f", x.ThawingIndex_Cd)
		if !x.ThawComplete {
			thaw += "*"
			partialThaw = true
		} else {
			thaw += " "
		}
		comp := "yes"
		if !x.Complete {
			comp = "no"
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%.0f\t%.1f\t%s\t%.2f\t%s\t\n",
			x.Label, x.Start, x.End, x.SeasonDays, x.FreezingIndex_Cd, thaw, x.MeanTemperature, comp)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	if partialThaw {
		fmt.Fprintln(w, "* thawing season not complete in the record (index up to the warmest point left)")
	}
	fmt.Fprintln(w)
	if m := r.MeanAnnualTemperature_C; m != nil {
		years := "years"
		if r.MeanAnnualYears == 1 {
			years = "year"
		}
		fmt.Fprintf(w, "mean annual temperature: %.2f degC (%g whole %s, %s to %s)\n", *m, r.MeanAnnualYears, years, r.MeanAnnualFrom, r.MeanAnnualTo)
	}
	if d := r.DesignFreezingIndex_Cd; d != nil {
		fmt.Fprintf(w, "design freezing index: %.1f degC day (mean of the 3 coldest of %d winters; pavement practice)\n", *d, r.DesignWinters)
	}
	if g := r.Gumbel; g != nil {
		fmt.Fprintf(w, "Gumbel fit (%s, %d winters): location %.1f degC day, scale %.1f degC day\n", g.Method, g.Winters, g.Location_Cd, g.Scale_Cd)
		fmt.Fprintf(w, "%g-year freezing index: %.1f degC day", g.ReturnPeriod_y, g.ReturnLevel_Cd)
		var other []string
		for _, k := range []string{"moments", "max-likelihood", "reduced-variate"} {
			if v, ok := g.ByMethod_Cd[k]; ok && k != g.Method {
				other = append(other, fmt.Sprintf("%s %.1f", k, v))
			}
		}
		if len(other) > 0 {
			fmt.Fprintf(w, " (%s)", strings.Join(other, ", "))
		}
		fmt.Fprintln(w)
	}
	if h := r.AnnualHarmonic; h != nil {
		fmt.Fprintf(w, "annual harmonic: mean %.2f degC, amplitude %.2f K, peak day %.1f (%s); residual RMS %.2f K\n",
			h.Mean_C, h.Amplitude_K, h.PeakDay, h.PeakDate, h.FitRMS_K)
	}
	fmt.Fprintf(w, "bridged gaps: %d", r.BridgedGaps)
	if r.BridgedGaps > 0 {
		fmt.Fprintf(w, " (linear interpolation; longest %s)", fmtHours(r.LongestBridge_h))
	}
	fmt.Fprintf(w, "; holes over %s are refused\n", fmtHours(r.MaxGap_h))
	for _, n := range r.Notes {
		fmt.Fprintf(w, "note: %s\n", n)
	}
	fmt.Fprintln(w, "note: air indices; the surface index is about n x the air index. Frost design depths are set by local codes and a licensed engineer.")
	return nil
}

// fmtHours writes a duration given in hours in plain words.
func fmtHours(h float64) string {
	switch {
	case h >= 48 && math.Mod(h, 24) == 0:
		return fmt.Sprintf("%g days", h/24)
	case h == 24:
		return "1 day"
	case h >= 1:
		return fmt.Sprintf("%g h", math.Round(h*100)/100)
	}
	return fmt.Sprintf("%g min", math.Round(h*60*100)/100)
}

// parseGap reads a duration: a bare number in hours, a number of days
// with "d", or a Go duration such as "6h" or "90m". It must be positive.
func parseGap(s string) (time.Duration, error) {
	s = strings.TrimSpace(s)
	var d time.Duration
	if v, err := strconv.ParseFloat(s, 64); err == nil {
		d = time.Duration(v * float64(time.Hour))
		if math.IsNaN(v) || math.IsInf(v, 0) || v > 1e6 {
			return 0, fmt.Errorf("%q is not a usable duration", s)
		}
	} else if n := strings.TrimSuffix(s, "d"); n != s {
		v, err := strconv.ParseFloat(n, 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) || v > 1e5 {
			return 0, fmt.Errorf("%q is not a duration (use 6h, 2d or a number of hours)", s)
		}
		d = time.Duration(v * 24 * float64(time.Hour))
	} else {
		var err error
		if d, err = time.ParseDuration(s); err != nil {
			return 0, fmt.Errorf("%q is not a duration (use 6h, 2d or a number of hours)", s)
		}
	}
	if d <= 0 {
		return 0, fmt.Errorf("%q: the maximum gap must be positive", s)
	}
	return d, nil
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

func quoteNames(list []string) string {
	if len(list) == 0 {
		return "none"
	}
	q := make([]string, len(list))
	for i, x := range list {
		q[i] = strconv.Quote(x)
	}
	return strings.Join(q, ", ")
}
