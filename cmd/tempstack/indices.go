package main

import (
	"bufio"
	"bytes"
	"encoding/csv"
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

// indicesReport is the result of `tempstack indices`, printed as a table or
// as JSON. Keys carry their units like results.json: _C degC, _K kelvin
// (temperature differences), _Cd degC day, _h hours. Values that cannot be
// computed from the record are null, with the reason in notes.
type indicesReport struct {
	File    string  `json:"file"`
	Column  string  `json:"column"`
	Unit    string  `json:"unit_read"`
	Records int     `json:"records"`
	First   string  `json:"first_time"`
	Last    string  `json:"last_time"`
	Step_h  float64 `json:"step_h"`
	// DailyMeans is true when the rows are one per day at 00:00 and each
	// value was taken as the mean of its day (see asDayMeans).
	DailyMeans  bool    `json:"daily_means"`
	Threshold_C float64 `json:"threshold_C"`
	Southern    bool    `json:"southern"`

	Winters         []indicesWinter `json:"winters"`
	CompleteWinters int             `json:"complete_winters"`

	MeanAnnualTemperature_C *float64 `json:"mean_annual_temperature_C"`
	MeanAnnualYears         float64  `json:"mean_annual_years"`
	MeanAnnualFrom          string   `json:"mean_annual_from,omitempty"`
	MeanAnnualTo            string   `json:"mean_annual_to,omitempty"`

	DesignFreezingIndex_Cd *float64 `json:"design_freezing_index_Cd"`
	DesignWinters          int      `json:"design_winters"`

	Gumbel *indicesGumbel `json:"gumbel"`

	AnnualHarmonic *indicesHarmonic `json:"annual_harmonic"`

	BridgedGaps     int     `json:"bridged_gaps"`
	LongestBridge_h float64 `json:"longest_bridged_gap_h"`
	MaxGap_h        float64 `json:"max_gap_h"`

	Notes []string `json:"notes"`
}

// indicesWinter is one row of the winter table (see climate.Winter).
type indicesWinter struct {
	Label            string  `json:"label"`
	Start            string  `json:"start"` // date the freezing season starts (00:00)
	End              string  `json:"end"`   // date it ends (00:00)
	SeasonDays       float64 `json:"season_days"`
	FreezingIndex_Cd float64 `json:"freezing_index_Cd"`
	ThawingIndex_Cd  float64 `json:"thawing_index_Cd"`
	MeanTemperature  float64 `json:"mean_temperature_C"`
	Complete         bool    `json:"complete"`
	ThawComplete     bool    `json:"thaw_complete"`
}

// indicesGumbel is the Gumbel fit to the complete winters' indices.
type indicesGumbel struct {
	Method          string             `json:"method"`
	Winters         int                `json:"winters"`
	Location_Cd     float64            `json:"location_Cd"`
	Scale_Cd        float64            `json:"scale_Cd"`
	ReturnPeriod_y  float64            `json:"return_period_years"`
	ReturnLevel_Cd  float64            `json:"return_level_Cd"`
	ByMethod_Cd     map[string]float64 `json:"return_level_by_method_Cd"`
	SampleMean_Cd   float64            `json:"sample_mean_Cd"`
	SampleStdDev_Cd float64            `json:"sample_std_dev_Cd"`
}

// indicesHarmonic is the least-squares annual harmonic of the record.
type indicesHarmonic struct {
	Mean_C      float64 `json:"mean_C"`
	Amplitude_K float64 `json:"amplitude_K"`
	// PeakDay counts 1 January as day 1 with the peak at noon of that day,
	// as the annual.peak_day key of a scenario file does.
	PeakDay  float64 `json:"peak_day"`
	PeakDate string  `json:"peak_date"`
	FitRMS_K float64 `json:"fit_rms_K"`
	FitR2    float64 `json:"fit_r2"`
	Samples  int     `json:"samples"` // samples the fit used
}

// computeIndices reads the file named by the command line and computes the
// report. Input problems are user errors.
func computeIndices(file string, c *cli.Context) (*indicesReport, error) {
	data, err := os.ReadFile(file)
	if err != nil {
		var pe *fs.PathError
		if errors.As(err, &pe) {
			err = pe.Err
		}
		return nil, userErr("cannot read %s: %v", file, err)
	}
	var dec rune
	switch d := c.String("decimal"); d {
	case ".":
		dec = '.'
	case ",":
		dec = ','
	default:
		return nil, userErr("--decimal must be . or , (got %q)", d)
	}
	method, err := climate.ParseFitMethod(c.String("method"))
	if err != nil {
		return nil, userErr("--method: %s", strings.TrimPrefix(err.Error(), "climate: "))
	}
	T := c.Float64("return-period")
	if !(T > 1) || math.IsInf(T, 0) {
		return nil, userErr("--return-period must be a number of years above 1, got %g", T)
	}
	thr := c.Float64("threshold")
	if math.IsNaN(thr) || math.IsInf(thr, 0) {
		return nil, userErr("--threshold must be a finite temperature in degC")
	}
	var maxGap time.Duration
	if c.IsSet("max-gap") {
		if maxGap, err = parseGap(c.String("max-gap")); err != nil {
			return nil, userErr("--max-gap: %v", err)
		}
	}

	header := csvHeader(data, dec)
	if header == nil {
		return nil, userErr("%s: no header line (the file is empty or holds only comments)", file)
	}
	o := climate.CSVOptions{
		TimeColumn: c.String("time-column"),
		DateColumn: c.String("date-column"),
		HourColumn: c.String("hour-column"),
		Decimal:    dec,
		Unit:       c.String("unit"),
	}
	if o.TimeColumn != "" && o.DateColumn != "" {
		return nil, userErr("give either --time-column or --date-column, not both")
	}
	if o.TimeColumn == "" && o.DateColumn == "" {
		if !contains(header, "time") {
			return nil, userErr("%s: no column \"time\"; name the time column with --time-column (or --date-column) (header: %s)", file, quoteNames(header))
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
			return nil, userErr("%s: %d value columns (%s): choose the temperature with --column", file, len(cand), quoteNames(cand))
		}
		col = cand[0]
	}
	o.Columns = []string{col}

	// Read. Without --max-gap, a permissive first pass learns the record
	// spacing; the limit is then 6 h (climate.DefaultMaxGap) or twice the
	// typical spacing, whichever is longer, so that a file of daily
	// values reads and one missing record is bridged. A record without
	// any hole reads the same under every limit and is not read again.
	read := func(gap time.Duration) (*climate.Series, error) {
		o.MaxGap = gap
		s, err := climate.ReadCSV(bytes.NewReader(data), file, o)
		if err != nil {
			var ce *climate.CSVError
			if errors.As(err, &ce) {
				return nil, userError{err}
			}
			return nil, userErr("%s: %v", file, err)
		}
		return s, nil
	}
	var s *climate.Series
	if maxGap > 0 {
		if s, err = read(maxGap); err != nil {
			return nil, err
		}
	} else {
		if s, err = read(time.Duration(math.MaxInt64)); err != nil {
			return nil, err
		}
		maxGap = max(climate.DefaultMaxGap, 2*time.Duration(s.Step*float64(time.Second)))
		if len(s.Bridged) > 0 {
			if s, err = read(maxGap); err != nil {
				return nil, err
			}
		}
	}

	records, first, last := len(s.T), s.Times[0], s.Times[len(s.Times)-1]
	daily := isDailyRecord(s)
	if daily {
		s = asDayMeans(s, col)
	}

	rep := &indicesReport{
		File: file, Column: col, Unit: o.Unit,
		Records:     records,
		First:       first.Format(time.RFC3339),
		Last:        last.Format(time.RFC3339),
		Step_h:      s.Step / 3600,
		Threshold_C: thr,
		Southern:    c.Bool("southern"),
		MaxGap_h:    maxGap.Hours(),
		Winters:     []indicesWinter{},
		Notes:       []string{},
	}
	note := func(format string, a ...any) { rep.Notes = append(rep.Notes, fmt.Sprintf(format, a...)) }
	rep.DailyMeans = daily
	if daily {
		note("one row per day at 00:00: each value is taken as the mean of its day")
	}

	// Winters and indices: climate.Series.Winters (cumulative-curve
	// definition documented on climate.Winter).
	ws, err := s.Winters(col, climate.WinterOptions{Threshold: thr, Southern: rep.Southern})
	if err != nil {
		return nil, userError{err}
	}
	for _, w := range ws {
		rep.Winters = append(rep.Winters, indicesWinter{
			Label:            w.Label,
			Start:            w.StartTime.Format(time.DateOnly),
			End:              w.EndTime.Format(time.DateOnly),
			SeasonDays:       w.Days,
			FreezingIndex_Cd: w.FreezingIndex,
			ThawingIndex_Cd:  w.ThawingIndex,
			MeanTemperature:  w.MeanTemperature,
			Complete:         w.Complete,
			ThawComplete:     w.ThawComplete,
		})
	}
	fi := climate.FreezingIndices(ws)
	rep.CompleteWinters = len(fi)
	// The short-record warnings, worded as in the report of a run that
	// follows a record (climate.RecordWarnings).
	rep.Notes = append(rep.Notes, climate.RecordWarnings(ws, T)...)

	// Mean annual temperature over the whole winter years covered.
	if m, from, to, years, ok := meanOverWholeYears(s, col, ws, rep.Southern); ok {
		rep.MeanAnnualTemperature_C = &m
		rep.MeanAnnualYears = years
		rep.MeanAnnualFrom, rep.MeanAnnualTo = from.Format(time.DateOnly), to.Format(time.DateOnly)
	} else {
		note("no whole winter year in the record: no mean annual temperature")
	}

	// Design freezing index: mean of the 3 coldest of the latest 30
	// winters, the pavement criterion named in UFC 3-130-04 (TM 5-852-4),
	// chapter 4 [read]; rule as set out in TM 5-852-6 / AFR 88-19 Vol. 6,
	// 1988 [memory].
	if d, err := climate.DesignFreezingIndex(fi); err == nil {
		rep.DesignFreezingIndex_Cd = &d
		rep.DesignWinters = min(len(fi), 30)
	}

	// Gumbel fit and return-period index (ASCE 32-01 uses the 100-year
	// air freezing index, ASCE 32-01 [2nd-hand]).
	if g, err := climate.GumbelFit(fi, method); err == nil {
		key, _ := method.MarshalText()
		rep.Gumbel = &indicesGumbel{
			Method: string(key), Winters: g.N,
			Location_Cd: g.Location, Scale_Cd: g.Scale,
			ReturnPeriod_y: T, ReturnLevel_Cd: g.ReturnLevel(T),
			ByMethod_Cd:   map[string]float64{},
			SampleMean_Cd: g.SampleMean, SampleStdDev_Cd: g.SampleStdDev,
		}
		for _, m := range []climate.FitMethod{climate.Moments, climate.MaxLikelihood, climate.ReducedVariate} {
			if gm, err := climate.GumbelFit(fi, m); err == nil {
				k, _ := m.MarshalText()
				rep.Gumbel.ByMethod_Cd[string(k)] = gm.ReturnLevel(T)
			}
		}
	} else {
		note("no Gumbel fit: %s", strings.TrimPrefix(err.Error(), "climate: "))
	}

	// Annual harmonic by least squares (climate.FitHarmonics). Least
	// squares weights every sample alike; when rows are missing, the fit
	// uses the record resampled at its typical spacing (the bridged holes
	// by linear interpolation) so that every stretch of time counts by
	// its length.
	ft, fv := s.T, s.Values[col]
	for _, g := range s.Bridged {
		if g.Column == "" && s.Step > 0 {
			n := int(math.Floor((s.T[len(s.T)-1]-s.T[0])/s.Step+1e-9)) + 1
			if rv, err := s.Resample(s.T[0], s.Step, n, col); err == nil {
				ft, fv = make([]float64, n), rv
				for i := range ft {
					ft[i] = s.T[0] + float64(i)*s.Step
				}
			}
			break
		}
	}
	if p, fit, err := climate.FitHarmonics(ft, fv, []float64{climate.Year}); err == nil {
		h := p.Harmonics[0]
		// Scenario convention: day 1 is 1 January, the peak at noon.
		day := h.Peak/climate.Day + 0.5
		if day > 365 {
			day -= 365
		}
		peak := time.Date(2001, time.January, 1, 0, 0, 0, 0, time.UTC).Add(time.Duration(h.Peak * float64(time.Second)))
		rep.AnnualHarmonic = &indicesHarmonic{
			Mean_C: p.Mean, Amplitude_K: h.Amplitude, PeakDay: day,
			PeakDate: peak.Format("2 January"), FitRMS_K: fit.RMS, FitR2: fit.R2, Samples: fit.N,
		}
	} else {
		note("no annual harmonic: %s", err)
	}

	rep.BridgedGaps = len(s.Bridged)
	for _, g := range s.Bridged {
		rep.LongestBridge_h = math.Max(rep.LongestBridge_h, g.To.Sub(g.From).Hours())
	}
	return rep, nil
}

// isDailyRecord reports whether a series has one row per day: every stamp
// at 00:00 (in its own UTC offset) and a typical spacing of one day.
func isDailyRecord(s *climate.Series) bool {
	if s.Step != climate.Day {
		return false
	}
	for _, ts := range s.Times {
		if h, m, sec := ts.Clock(); h != 0 || m != 0 || sec != 0 || ts.Nanosecond() != 0 {
			return false
		}
	}
	return true
}

// dayMeanEps is how long before the next midnight a day's value ends in
// asDayMeans, s. It must stay below the 1e-9 day that climate.DailyMeans
// allows for round-off when it decides whether the last day is whole.
const dayMeanEps = 1e-5

// asDayMeans returns a copy of a daily series (isDailyRecord) in which each
// row holds its value through its whole day: a point at 00:00 and another
// dayMeanEps s before the next midnight, both with the row's value. The
// linear interpolant, which climate integrates for daily means, degree-days
// and means, then reproduces each day's value (to about 1e-10 of the day),
// so a file of daily mean temperatures gives the usual sums of daily means.
// The last row keeps only its 00:00 point: climate's coverage rule
// (Series.Covered: a sample stands for the step it begins, here one day)
// holds it through its day, so the last day counts as a whole day, as it
// does for the same record in a scenario. Read as instantaneous midnight
// samples instead, each day would be the mean of two neighbouring rows.
func asDayMeans(s *climate.Series, col string) *climate.Series {
	v := s.Values[col]
	n := len(s.T)
	out := &climate.Series{
		Name: s.Name, Start: s.Start, Columns: []string{col},
		Times: make([]time.Time, 0, 2*n), T: make([]float64, 0, 2*n),
		Lines: make([]int, 0, 2*n), Values: map[string][]float64{},
		Bridged: s.Bridged, Step: s.Step,
	}
	vv := make([]float64, 0, 2*n)
	for i, t := range s.T {
		out.T = append(out.T, t)
		out.Times = append(out.Times, s.Times[i])
		out.Lines = append(out.Lines, s.Lines[i])
		vv = append(vv, v[i])
		if i == n-1 {
			break // held through its day by Series.Covered
		}
		out.T = append(out.T, t+climate.Day-dayMeanEps)
		out.Times = append(out.Times, s.Times[i].Add(time.Duration((climate.Day-dayMeanEps)*float64(time.Second))))
		out.Lines = append(out.Lines, s.Lines[i])
		vv = append(vv, v[i])
	}
	out.Values[col] = vv
	return out
}

// meanOverWholeYears returns the time mean of the linear interpolant of
// the record over the winter years that it covers completely (from the
// start of the first complete winter year to the end of the last one), by
// climate.MeanTemperature. Over whole years this is the mean annual
// temperature.
func meanOverWholeYears(s *climate.Series, col string, ws []climate.Winter, southern bool) (m float64, from, to time.Time, years float64, ok bool) {
	loc := s.Start.Location()
	yearStart := func(w climate.Winter) time.Time {
		// The freezing season starts inside its winter year.
		st := w.StartTime
		if southern {
			return time.Date(st.Year(), time.January, 1, 0, 0, 0, 0, loc)
		}
		y := st.Year()
		if st.Month() < time.July {
			y--
		}
		return time.Date(y, time.July, 1, 0, 0, 0, 0, loc)
	}
	n := 0
	for _, w := range ws {
		if !w.Complete {
			continue
		}
		ys := yearStart(w)
		if n == 0 {
			from = ys
		}
		to = ys.AddDate(1, 0, 0)
		n++
	}
	if n == 0 {
		return 0, from, to, 0, false
	}
	at, err := s.At(col)
	if err != nil {
		return 0, from, to, 0, false
	}
	a, b := from.Sub(s.Start).Seconds(), to.Sub(s.Start).Seconds()
	t := []float64{a}
	v := []float64{at(a)}
	for i, x := range s.T {
		if x > a && x < b {
			t = append(t, x)
			v = append(v, s.Values[col][i])
		}
	}
	t = append(t, b)
	v = append(v, at(b))
	m, err = climate.MeanTemperature(t, v)
	if err != nil {
		return 0, from, to, 0, false
	}
	return m, from, to, float64(n), true
}

// printIndices prints the report as a table and summary lines.
func printIndices(w io.Writer, r *indicesReport) error {
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

// csvHeader returns the trimmed header names of a CSV file: the first line
// that is neither blank nor a '#' comment, split at the separator that
// climate.ReadCSV would detect (the most frequent of ';', tab and ',' outside
// quotes; with a decimal comma a comma does not count). It returns nil
// when the file has no such line.
func csvHeader(data []byte, dec rune) []string {
	data = bytes.TrimPrefix(data, []byte{0xEF, 0xBB, 0xBF})
	sc := bufio.NewScanner(bytes.NewReader(data))
	sc.Buffer(make([]byte, 0, 64<<10), 1<<20)
	for sc.Scan() {
		line := strings.TrimRight(sc.Text(), "\r")
		t := strings.TrimSpace(line)
		if t == "" || t[0] == '#' {
			continue
		}
		var comma, semi, tab int
		inq := false
		for _, ch := range line {
			switch {
			case ch == '"':
				inq = !inq
			case inq:
			case ch == ',':
				comma++
			case ch == ';':
				semi++
			case ch == '\t':
				tab++
			}
		}
		if dec == ',' {
			comma = 0
		}
		sep := ','
		switch {
		case semi > 0 && semi >= comma && semi >= tab:
			sep = ';'
		case tab > 0 && tab >= comma:
			sep = '\t'
		case comma == 0 && dec == ',':
			sep = ';'
		}
		r := csv.NewReader(strings.NewReader(line))
		r.Comma = sep
		rec, err := r.Read()
		if err != nil {
			// A quoting error: split plainly; ReadCSV reports the error.
			rec = strings.Split(line, string(sep))
		}
		names := make([]string, len(rec))
		for i, h := range rec {
			names[i] = strings.TrimSpace(h)
		}
		return names
	}
	return nil
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
