package main

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"tempstack/climate"
)

// indicesJSON runs `tempstack indices ... --json` and decodes the output.
func indicesJSON(t *testing.T, args ...string) climate.RecordIndices {
	t.Helper()
	code, out, stderr := runCLI(t, append([]string{"indices"}, append(args, "--json")...)...)
	if code != 0 {
		t.Fatalf("indices %v: exit %d: %s", args, code, stderr)
	}
	var r climate.RecordIndices
	if err := json.Unmarshal([]byte(out), &r); err != nil {
		t.Fatalf("indices %v: output is not JSON: %v\n%s", args, err, out)
	}
	return r
}

func near(a, b, tol float64) bool { return math.Abs(a-b) <= tol }

// TestIndicesDemoAgreesWithClimate runs the command on the committed demo
// record (invented data, 10 whole winter years from 1 July 2914) and sets
// every printed figure beside the climate package called directly. The
// design index 1672 degC day is a regression figure of the invented record
// (climate.GenerateDemo), not an outside check; the outside checks of the
// definitions live in package climate and in TestIndicesHandMade.
func TestIndicesDemoAgreesWithClimate(t *testing.T) {
	path := filepath.Join("..", "..", "testdata", "climate", "demo-station.csv")
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	s, err := climate.ReadCSV(f, path, climate.CSVOptions{TimeColumn: "time", Columns: []string{climate.DemoColumn}})
	if err != nil {
		t.Fatal(err)
	}
	ws, err := s.Winters(climate.DemoColumn, climate.WinterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	fi := climate.FreezingIndices(ws)
	design, err := climate.DesignFreezingIndex(fi)
	if err != nil {
		t.Fatal(err)
	}
	v := s.Values[climate.DemoColumn]
	// The record holds exactly 10 winter years, so the record mean is the
	// mean annual temperature.
	mat, err := climate.MeanTemperature(s.T, v)
	if err != nil {
		t.Fatal(err)
	}
	ph, _, err := s.FitHarmonics(climate.DemoColumn, []float64{climate.Year})
	if err != nil {
		t.Fatal(err)
	}

	for _, tc := range []struct {
		method string
		m      climate.FitMethod
		T      float64
	}{
		{"moments", climate.Moments, 100},
		{"reduced-variate", climate.ReducedVariate, 50},
		{"max-likelihood", climate.MaxLikelihood, 100},
	} {
		t.Run(tc.method, func(t *testing.T) {
			// Default columns: "time" and the only other column.
			r := indicesJSON(t, path, "--method", tc.method, "--return-period", fmt.Sprint(tc.T))
			if r.Column != climate.DemoColumn || r.Records != len(s.T) || r.BridgedGaps != 0 {
				t.Errorf("column %q, %d records, %d gaps; want %q, %d, 0", r.Column, r.Records, r.BridgedGaps, climate.DemoColumn, len(s.T))
			}
			if len(r.Winters) != len(ws) || r.CompleteWinters != 10 || len(fi) != 10 {
				t.Fatalf("%d winters (%d complete), climate %d (%d complete); want 10 complete", len(r.Winters), r.CompleteWinters, len(ws), len(fi))
			}
			for i, w := range ws {
				g := r.Winters[i]
				if g.Label != w.Label || g.Start != w.StartTime.Format("2006-01-02") || g.End != w.EndTime.Format("2006-01-02") ||
					g.SeasonDays != w.Days || g.FreezingIndex_Cd != w.FreezingIndex || g.ThawingIndex_Cd != w.ThawingIndex ||
					g.MeanTemperature != w.MeanTemperature || g.Complete != w.Complete || g.ThawComplete != w.ThawComplete {
					t.Errorf("winter %d: command %+v, climate %+v", i, g, w)
				}
			}
			if r.DesignFreezingIndex_Cd == nil || *r.DesignFreezingIndex_Cd != design || r.DesignWinters != 10 {
				t.Errorf("design index %v from %d winters, climate %v", r.DesignFreezingIndex_Cd, r.DesignWinters, design)
			}
			if math.Round(design) != 1672 {
				t.Errorf("design index %.1f, demo regression value 1672 degC day", design)
			}
			if r.MeanAnnualTemperature_C == nil || !near(*r.MeanAnnualTemperature_C, mat, 1e-12) || r.MeanAnnualYears != 10 {
				t.Errorf("mean annual temperature %v over %g years, climate %v", r.MeanAnnualTemperature_C, r.MeanAnnualYears, mat)
			}
			g, err := climate.GumbelFit(fi, tc.m)
			if err != nil {
				t.Fatal(err)
			}
			if r.Gumbel == nil || r.Gumbel.Method != tc.method || r.Gumbel.Location_Cd != g.Location || r.Gumbel.Scale_Cd != g.Scale ||
				r.Gumbel.ReturnLevel_Cd != g.ReturnLevel(tc.T) || r.Gumbel.ReturnPeriod_y != tc.T || r.Gumbel.Winters != 10 {
				t.Errorf("Gumbel %+v, climate %+v with %g-year level %v", r.Gumbel, g, tc.T, g.ReturnLevel(tc.T))
			}
			h := ph.Harmonics[0]
			if a := r.AnnualHarmonic; a == nil || a.Mean_C != ph.Mean || a.Amplitude_K != h.Amplitude || !near(a.PeakDay, h.Peak/climate.Day+0.5, 1e-9) {
				t.Errorf("annual harmonic %+v, climate mean %v amplitude %v peak %v s", a, ph.Mean, h.Amplitude, h.Peak)
			}
		})
	}

	// The table prints the same figures.
	code, out, stderr := runCLI(t, "indices", path)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	for _, w := range ws {
		row := ""
		for _, l := range strings.Split(out, "\n") {
			if strings.HasPrefix(strings.TrimSpace(l), w.Label+" ") {
				row = l
			}
		}
		want := []string{w.StartTime.Format("2006-01-02"), w.EndTime.Format("2006-01-02"),
			fmt.Sprintf(" %.0f ", w.Days), fmt.Sprintf(" %.1f ", w.FreezingIndex), fmt.Sprintf(" %.1f", w.ThawingIndex), fmt.Sprintf(" %.2f ", w.MeanTemperature)}
		for _, x := range want {
			if !strings.Contains(row, x) {
				t.Errorf("row of %s %q lacks %q", w.Label, row, x)
			}
		}
	}
	g, _ := climate.GumbelFit(fi, climate.Moments)
	for _, x := range []string{
		fmt.Sprintf("mean annual temperature: %.2f degC (10 whole years", mat),
		fmt.Sprintf("design freezing index: %.1f degC day", design),
		fmt.Sprintf("location %.1f degC day, scale %.1f degC day", g.Location, g.Scale),
		fmt.Sprintf("100-year freezing index: %.1f degC day", g.ReturnLevel(100)),
		fmt.Sprintf("amplitude %.2f K", ph.Harmonics[0].Amplitude),
		"bridged gaps: 0",
		"licensed engineer",
	} {
		if !strings.Contains(out, x) {
			t.Errorf("table lacks %q:\n%s", x, out)
		}
	}
}

// tinyRecord is an invented record of two short winters, piecewise linear
// between the rows (ReadCSV interpolates linearly; every row is at 00:00,
// so each day's mean is exact and the indices are areas of triangles and
// trapezoids). Sums by hand [derived]:
//
//	winter 2022/23: 0 -> -6 -> 0 degC over 30 Nov to 20 Dec 2022:
//	  freezing index 6 x 20 / 2 = 60 degC day, 20 days;
//	winter 2023/24: 0 -> -10 -> -5 -> 0 over 5 Jan to 4 Feb 2024:
//	  50 + 75 + 25 = 150 degC day, 30 days;
//	thaw after winter 1 (20 Dec 2022 to 5 Jan 2024): 20 + 4 x 361 + 20 =
//	  1484 degC day; after winter 2 (4 Feb to 1 Jul 2024, the record's
//	  end): 20 + 4 x 138 = 572 degC day (incomplete);
//	winter year 1 (365 days): 4 x 142 + 20 - 60 + 20 + 4 x 183 = 1280
//	  degC day, mean 1280/365 = 3.506849 degC;
//	winter year 2 (366 days): 4 x 178 + 20 - 150 + 20 + 4 x 138 = 1154,
//	  mean 1154/366 = 3.153005 degC;
//	mean annual temperature (731 days): 2434/731 = 3.329685 degC.
//
// With --southern the winter years are the calendar years 2022 (partial),
// 2023 and 2024 (partial): indices 60, 0 and 150 degC day; 2023 is the only
// whole year: 4 x 359 + (4 x 6 - 0.2 x 6^2) = 1452.8 degC day, mean
// 1452.8/365 = 3.980274 degC.
var tinyRecord = [][2]string{
	{"2022-07-01", "4"}, {"2022-11-20", "4"}, {"2022-11-30", "0"}, {"2022-12-10", "-6"},
	{"2022-12-20", "0"}, {"2022-12-30", "4"}, {"2023-12-26", "4"}, {"2024-01-05", "0"},
	{"2024-01-15", "-10"}, {"2024-01-25", "-5"}, {"2024-02-04", "0"}, {"2024-02-14", "4"},
	{"2024-07-01", "4"},
}

// writeTiny writes tinyRecord with the given separator, decimal mark and
// temperature conversion; it returns the path.
func writeTiny(t *testing.T, name, sep string, conv func(float64) float64, decimalComma bool) string {
	t.Helper()
	var b strings.Builder
	b.WriteString("# invented record for a test\n")
	b.WriteString("day" + sep + "air\n")
	for _, r := range tinyRecord {
		var c float64
		fmt.Sscan(r[1], &c)
		v := fmt.Sprintf("%.4f", conv(c))
		if decimalComma {
			v = strings.ReplaceAll(v, ".", ",")
		}
		b.WriteString(r[0] + sep + v + "\n")
	}
	path := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func TestIndicesHandMade(t *testing.T) {
	celsius := func(c float64) float64 { return c }
	fahrenheit := func(c float64) float64 { return c*9/5 + 32 }
	cases := []struct {
		name string
		path string
		args []string
	}{
		{"degC", writeTiny(t, "tiny.csv", ",", celsius, false), nil},
		{"degF, semicolons, decimal comma", writeTiny(t, "tiny-f.csv", ";", fahrenheit, true), []string{"--unit", "F", "--decimal", ","}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			// The rows are up to 361 days apart: the holes must be allowed.
			args := append([]string{tc.path, "--time-column", "day", "--max-gap", "400d"}, tc.args...)
			r := indicesJSON(t, args...)
			const tol = 1e-9
			want := []climate.IndicesWinter{
				{Label: "2022/23", Start: "2022-11-30", End: "2022-12-20", SeasonDays: 20, FreezingIndex_Cd: 60, ThawingIndex_Cd: 1484,
					MeanTemperature: 1280.0 / 365, Complete: true, ThawComplete: true},
				{Label: "2023/24", Start: "2024-01-05", End: "2024-02-04", SeasonDays: 30, FreezingIndex_Cd: 150, ThawingIndex_Cd: 572,
					MeanTemperature: 1154.0 / 366, Complete: true, ThawComplete: false},
			}
			if len(r.Winters) != len(want) {
				t.Fatalf("%d winters, want %d: %+v", len(r.Winters), len(want), r.Winters)
			}
			for i, w := range want {
				g := r.Winters[i]
				if g.Label != w.Label || g.Start != w.Start || g.End != w.End || g.SeasonDays != w.SeasonDays ||
					!near(g.FreezingIndex_Cd, w.FreezingIndex_Cd, tol) || !near(g.ThawingIndex_Cd, w.ThawingIndex_Cd, tol) ||
					!near(g.MeanTemperature, w.MeanTemperature, tol) || g.Complete != w.Complete || g.ThawComplete != w.ThawComplete {
					t.Errorf("winter %d:\n got %+v\nwant %+v", i, g, w)
				}
			}
			if m := r.MeanAnnualTemperature_C; m == nil || !near(*m, 2434.0/731, tol) || r.MeanAnnualYears != 2 {
				t.Errorf("mean annual temperature %v over %g years, want %v over 2", m, r.MeanAnnualYears, 2434.0/731)
			}
			// Two winters: no design index and no Gumbel fit, with the reason.
			if r.DesignFreezingIndex_Cd != nil || r.Gumbel != nil || !strings.Contains(strings.Join(r.Notes, "|"), "at least 3 complete winters") {
				t.Errorf("design %v, Gumbel %v, notes %q", r.DesignFreezingIndex_Cd, r.Gumbel, r.Notes)
			}
			// Rows missing from the regular 10-day spacing: after 1 Jul
			// 2022, 30 Dec 2022 and 14 Feb 2024 (longest 361 days).
			if r.BridgedGaps != 3 || r.LongestBridge_h != 361*24 {
				t.Errorf("%d bridged gaps, longest %g h; want 3, %d h", r.BridgedGaps, r.LongestBridge_h, 361*24)
			}
		})
	}

	path := cases[0].path
	// The table.
	code, out, stderr := runCLI(t, "indices", path, "--time-column", "day", "--max-gap", "400d")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	for _, x := range []string{"2022/23  2022-11-30  2022-12-20    20", " 60.0 ", " 1484.0 ", " 150.0 ", " 572.0*",
		"mean annual temperature: 3.33 degC (2 whole years, 2022-07-01 to 2024-07-01)", "bridged gaps: 3"} {
		if !strings.Contains(out, x) {
			t.Errorf("table lacks %q:\n%s", x, out)
		}
	}

	// Southern hemisphere: calendar winter years.
	r := indicesJSON(t, path, "--time-column", "day", "--max-gap", "400d", "--southern")
	type row struct {
		label    string
		fi       float64
		complete bool
	}
	wantS := []row{{"2022", 60, false}, {"2023", 0, true}, {"2024", 150, false}}
	if len(r.Winters) != len(wantS) {
		t.Fatalf("southern: %d winters, want 3: %+v", len(r.Winters), r.Winters)
	}
	for i, w := range wantS {
		g := r.Winters[i]
		if g.Label != w.label || !near(g.FreezingIndex_Cd, w.fi, 1e-9) || g.Complete != w.complete {
			t.Errorf("southern winter %d: %+v, want %+v", i, g, w)
		}
	}
	if m := r.MeanAnnualTemperature_C; m == nil || !near(*m, 1452.8/365, 1e-9) || r.MeanAnnualYears != 1 || r.MeanAnnualFrom != "2023-01-01" {
		t.Errorf("southern mean annual %v over %g years from %s, want %v over 1 from 2023-01-01", m, r.MeanAnnualYears, r.MeanAnnualFrom, 1452.8/365)
	}

	// A threshold shifts the curve: counted from +4 degC, every day of
	// the record is at or below it, and each winter year's fall is its
	// whole sum of (4 - T): 4 x 365 - 1280 = 180 and 4 x 366 - 1154 =
	// 310 degC day [derived].
	r = indicesJSON(t, path, "--time-column", "day", "--max-gap", "400d", "--threshold", "4")
	if len(r.Winters) != 2 || !near(r.Winters[0].FreezingIndex_Cd, 180, 1e-9) || !near(r.Winters[1].FreezingIndex_Cd, 310, 1e-9) {
		t.Errorf("threshold 4: %+v, want indices 180 and 310", r.Winters)
	}
}

// TestIndicesBadFiles: broken files and command lines give exit 1 and one
// line naming the file (and the line where there is one).
func TestIndicesBadFiles(t *testing.T) {
	dir := t.TempDir()
	write := func(name, body string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	good := "# comment\ntime,air\n2024-01-01T00:00,1\n2024-01-01T01:00,2\n2024-01-01T02:00,3\n"
	backward := write("backward.csv", "# comment\ntime,air\n2024-01-01T00:00,1\n2024-01-01T02:00,2\n2024-01-01T01:00,3\n")
	text := write("text.csv", "time,air\n2024-01-01T00:00,1\n2024-01-01T01:00,warm\n")
	hole := write("hole.csv", "time,air\n2024-01-01T00:00,1\n2024-01-01T01:00,2\n2024-01-01T02:00,2\n2024-01-01T12:00,2\n")
	short := write("short.csv", good)
	comma := write("comma.csv", "time;air\n2024-01-01T00:00;1\n2024-01-01T01:00;1,5\n")
	two := write("two.csv", "time,air,wind\n2024-01-01T00:00,1,3\n")
	notime := write("notime.csv", "stamp,air\n2024-01-01T00:00,1\n")
	empty := write("empty.csv", "# only a comment\n\n")
	cases := []struct {
		args []string
		want string // substring of the one-line message
	}{
		{[]string{short, "--column", "aire"}, short + `:2: column "aire": no column "aire" in the header; did you mean "air"?`},
		{[]string{backward}, backward + `:5: column "time": time goes backward`},
		{[]string{text}, text + `:3: column "air": "warm" is not a number`},
		{[]string{hole}, hole + `:5: column "time": gap of 10 h between line 4`},
		{[]string{comma}, comma + `:3: column "air": "1,5" is not a number (decimal comma? use --decimal ,)`},
		{[]string{two}, two + `: 2 value columns ("air", "wind"): choose the temperature with --column`},
		{[]string{notime}, notime + `: no column "time"`},
		{[]string{short}, "fewer than two whole days"},
		{[]string{empty}, empty + ": no header line"},
		{[]string{filepath.Join(dir, "absent.csv")}, "cannot read " + filepath.Join(dir, "absent.csv")},
		{[]string{short, "--method", "momentz"}, `did you mean "moments"`},
		{[]string{short, "--decimal", ";"}, "--decimal must be . or ,"},
		{[]string{short, "--max-gap", "-2h"}, "must be positive"},
		{[]string{short, "--return-period", "0.5"}, "above 1"},
		{[]string{short, "--unit", "R"}, `unknown unit "R"`},
		{[]string{short, "--nope"}, "unknown flag --nope"},
		{nil, "needs one CSV file"},
	}
	for _, c := range cases {
		code, out, stderr := runCLI(t, append([]string{"indices"}, c.args...)...)
		if code != 1 {
			t.Errorf("%v: exit %d, want 1 (stderr %q)", c.args, code, stderr)
		}
		if strings.Count(stderr, "\n") != 1 || !strings.HasPrefix(stderr, "tempstack: ") {
			t.Errorf("%v: stderr is not one line: %q", c.args, stderr)
		}
		if !strings.Contains(stderr, c.want) {
			t.Errorf("%v: stderr %q does not say %q", c.args, stderr, c.want)
		}
		if out != "" || strings.Contains(stderr, "goroutine") {
			t.Errorf("%v: stdout %q, stderr %q", c.args, out, stderr)
		}
	}
}

func TestParseGap(t *testing.T) {
	for _, c := range []struct {
		in   string
		want float64 // hours; 0 = error
	}{{"6", 6}, {"1.5", 1.5}, {"2d", 48}, {"90m", 1.5}, {"36h", 36}, {"0", 0}, {"-1", 0}, {"x", 0}, {"d", 0}, {"NaN", 0}} {
		d, err := parseGap(c.in)
		if (err != nil) != (c.want == 0) || (err == nil && d.Hours() != c.want) {
			t.Errorf("parseGap(%q) = %v, %v; want %g h", c.in, d, err, c.want)
		}
	}
}

// TestIndicesDailyMeans: a file with one row per day reads each value as
// the mean of its day, so the indices are plain sums of the values and the
// last row's day counts. Invented record, built by a rule: 1 July 2022 to
// 30 June 2024, +3 degC every day except -5 degC on 1 to 10 December 2022
// and -4 degC on 10 to 29 January 2024; the row of 15 August 2023 is
// missing (bridged). Sums by hand [derived]: freezing indices 10 x 5 = 50
// and 20 x 4 = 80 degC day; thaw after winter 1 (11 Dec 2022 to 10 Jan
// 2024, 395 days) 3 x 395 = 1185, after winter 2 (30 Jan to 1 Jul 2024,
// 153 days) 459 degC day; winter-year means (3 x 355 - 50)/365 and
// (3 x 346 - 80)/366; mean annual temperature (1015 + 958)/731 degC.
func TestIndicesDailyMeans(t *testing.T) {
	var b strings.Builder
	b.WriteString("date,air\n")
	for d := time.Date(2022, 7, 1, 0, 0, 0, 0, time.UTC); d.Before(time.Date(2024, 7, 1, 0, 0, 0, 0, time.UTC)); d = d.AddDate(0, 0, 1) {
		v := 3
		switch {
		case d.Year() == 2022 && d.Month() == 12 && d.Day() <= 10:
			v = -5
		case d.Year() == 2024 && d.Month() == 1 && d.Day() >= 10 && d.Day() <= 29:
			v = -4
		case d.Equal(time.Date(2023, 8, 15, 0, 0, 0, 0, time.UTC)):
			continue
		}
		fmt.Fprintf(&b, "%s,%d\n", d.Format(time.DateOnly), v)
	}
	path := filepath.Join(t.TempDir(), "daily.csv")
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	r := indicesJSON(t, path, "--date-column", "date")
	if !r.DailyMeans || r.BridgedGaps != 1 || r.MaxGap_h != 48 {
		t.Errorf("daily means %v, %d bridged gaps, max gap %g h; want true, 1, 48", r.DailyMeans, r.BridgedGaps, r.MaxGap_h)
	}
	want := []climate.IndicesWinter{
		{Label: "2022/23", Start: "2022-12-01", End: "2022-12-11", SeasonDays: 10, FreezingIndex_Cd: 50, ThawingIndex_Cd: 1185,
			MeanTemperature: 1015.0 / 365, Complete: true, ThawComplete: true},
		{Label: "2023/24", Start: "2024-01-10", End: "2024-01-30", SeasonDays: 20, FreezingIndex_Cd: 80, ThawingIndex_Cd: 459,
			MeanTemperature: 958.0 / 366, Complete: true, ThawComplete: false},
	}
	if len(r.Winters) != len(want) {
		t.Fatalf("%d winters, want 2: %+v", len(r.Winters), r.Winters)
	}
	// Tolerance: each day's value ends 1e-5 s before midnight.
	const tol = 1e-6
	for i, w := range want {
		g := r.Winters[i]
		if g.Label != w.Label || g.Start != w.Start || g.End != w.End || g.SeasonDays != w.SeasonDays ||
			!near(g.FreezingIndex_Cd, w.FreezingIndex_Cd, tol) || !near(g.ThawingIndex_Cd, w.ThawingIndex_Cd, tol) ||
			!near(g.MeanTemperature, w.MeanTemperature, tol) || g.Complete != w.Complete || g.ThawComplete != w.ThawComplete {
			t.Errorf("winter %d:\n got %+v\nwant %+v", i, g, w)
		}
	}
	if m := r.MeanAnnualTemperature_C; m == nil || !near(*m, 1973.0/731, tol) || r.MeanAnnualYears != 2 {
		t.Errorf("mean annual temperature %v over %g years, want %v over 2", m, r.MeanAnnualYears, 1973.0/731)
	}
}
