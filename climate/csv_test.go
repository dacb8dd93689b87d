package climate

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"
	"time"

	"tempstack/fileerr"
)

// All CSV inputs in this file are small synthetic texts written for the
// tests; expected values follow from the input by hand.

func read(t *testing.T, text string, o CSVOptions) (*Series, error) {
	t.Helper()
	return ReadCSV(strings.NewReader(text), "obs.csv", o)
}

func TestReadCSVBadInput(t *testing.T) {
	base := CSVOptions{TimeColumn: "time", Columns: []string{"temp"}}
	day := func(text string) string { return "time,temp\n" + text }
	tests := []struct {
		name   string
		text   string
		opt    CSVOptions
		line   int
		column string
		want   []string // substrings of the message
	}{
		{"empty file", "", base, 0, "", []string{"obs.csv: ", "empty"}},
		{"only comments", "# nothing here\n", base, 0, "", []string{"empty"}},
		{"header only", "time,temp\n", base, 1, "", []string{"obs.csv:1:", "header only"}},
		{"header only after comments", "# station X\n# invented\ntime,temp\r\n", base, 3, "", []string{"obs.csv:3:", "header only"}},
		{"missing column with suggestion", "time,tmep\n2020-01-01T00:00,1\n", base, 1, "temp",
			[]string{`no column "temp"`, `did you mean "tmep"?`, `header: "time", "tmep"`}},
		{"missing column case", "Time,Temp\n2020-01-01T00:00,1\n", base, 1, "time", []string{`did you mean "Time"?`}},
		{"missing column no suggestion", "time,pressure\n2020-01-01T00:00,1\n", base, 1, "temp", []string{`no column "temp"`, `header: "time", "pressure"`}},
		{"unparsable time", day("2020-01-01T00:00,1\n2020-13-01T00:00,2\n"), base, 3, "time", []string{"obs.csv:3:", `cannot read time "2020-13-01T00:00"`}},
		{"time not ISO", day("01/02/2020 00:00,1\n"), base, 2, "time", []string{"ISO 8601"}},
		{"bad clock", day("2020-01-01T25:00,1\n"), base, 2, "time", []string{"out of range"}},
		{"time backward", day("2020-01-01T02:00,1\n2020-01-01T03:00,1\n2020-01-01T01:00,1\n"), base, 4, "time",
			[]string{"obs.csv:4:", "backward", "line 3"}},
		{"duplicate stamp", day("2020-01-01T00:00,1\n2020-01-01T01:00,1\n2020-01-01T01:00,2\n"), base, 4, "time",
			[]string{"repeats the stamp of line 3"}},
		{"duplicate stamp other zone", day("2020-01-01T01:00Z,1\n2020-01-01T02:00+01:00,2\n"), base, 3, "time",
			[]string{"repeats"}},
		{"three-day gap in rows", day("2020-01-01T00:00,1\n2020-01-01T01:00,1\n2020-01-04T01:00,1\n"), base, 4, "time",
			[]string{"obs.csv:4:", "gap of 72 h", "line 3", "maximum gap 6 h"}},
		{"long gap in cells", day("2020-01-01T00:00,1\n2020-01-01T01:00,\n2020-01-01T02:00,NA\n2020-01-01T03:00,\n2020-01-01T04:00,\n2020-01-01T05:00,\n2020-01-01T06:00,\n2020-01-01T07:00,3\n"),
			base, 3, "temp", []string{"from line 3 to line 8", "gap of 7 h", "maximum gap 6 h"}},
		{"missing at start", day("2020-01-01T00:00,\n2020-01-01T01:00,2\n"), base, 2, "temp", []string{"at the start"}},
		{"missing at end", day("2020-01-01T00:00,1\n2020-01-01T01:00,\n"), base, 3, "temp", []string{"at the end"}},
		{"text in number cell", day("2020-01-01T00:00,1\n2020-01-01T01:00,warm\n"), base, 3, "temp",
			[]string{"obs.csv:3:", `column "temp"`, `"warm" is not a number`}},
		{"decimal comma not declared", "time;temp\n2020-01-01T00:00;1,5\n", base, 2, "temp", []string{"decimal comma? set the decimal mark to ','"}},
		{"decimal comma, the caller's flag", "time;temp\n2020-01-01T00:00;1,5\n", CSVOptions{TimeColumn: "time", Columns: []string{"temp"}, DecimalHint: "--decimal ,"}, 2, "temp",
			[]string{`"1,5" is not a number (decimal comma? use --decimal ,)`}},
		{"point with decimal comma", "time;temp\n2020-01-01T00:00;1.5\n", CSVOptions{TimeColumn: "time", Columns: []string{"temp"}, Decimal: ','}, 2, "temp", []string{"not a number"}},
		{"short row", day("2020-01-01T00:00\n"), base, 2, "", []string{"row has 1 fields"}},
		{"bad hour", "date,hour,temp\n2020-01-01,7,1\n2020-01-01,25,1\n", CSVOptions{DateColumn: "date", HourColumn: "hour", Columns: []string{"temp"}}, 3, "hour", []string{"cannot read hour"}},
		{"datetime in date column", "date,hour,temp\n2020-01-01T00:00,7,1\n", CSVOptions{DateColumn: "date", HourColumn: "hour", Columns: []string{"temp"}}, 2, "date", []string{"want a date"}},
		{"unknown unit", day("2020-01-01T00:00,1\n"), CSVOptions{TimeColumn: "time", Columns: []string{"temp"}, Unit: "R"}, 0, "temp", []string{`unknown unit "R"`}},
		{"column twice", day("2020-01-01T00:00,1\n"), CSVOptions{TimeColumn: "time", Columns: []string{"temp", "temp"}}, 0, "temp", []string{"requested twice"}},
		{"no columns", day("2020-01-01T00:00,1\n"), CSVOptions{TimeColumn: "time"}, 0, "", []string{"no value columns"}},
		{"unbalanced quote", "time,temp\n\"2020-01-01T00:00,1\n", base, 2, "", []string{"obs.csv:"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s, err := read(t, tc.text, tc.opt)
			if err == nil {
				t.Fatalf("no error; read %d records", len(s.T))
			}
			var ce *fileerr.Error
			if !errors.As(err, &ce) {
				t.Fatalf("error %v is %T, want *fileerr.Error", err, err)
			}
			wantKey := ""
			if tc.column != "" {
				wantKey = fmt.Sprintf("column %q", tc.column)
			}
			if ce.File != "obs.csv" || ce.Line != tc.line || ce.Key != wantKey {
				t.Errorf("located at file %q line %d key %q, want obs.csv line %d key %q (%v)", ce.File, ce.Line, ce.Key, tc.line, wantKey, err)
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("message %q lacks %q", err, w)
				}
			}
		})
	}
}

func TestReadCSVFormats(t *testing.T) {
	tests := []struct {
		name  string
		text  string
		opt   CSVOptions
		times []string // RFC 3339
		temp  []float64
	}{
		{"BOM, CRLF, comments", "\uFEFF# invented test data\r\ntime,temp\r\n2021-03-01T00:00,1.5\r\n2021-03-01T01:00,-2\r\n",
			CSVOptions{TimeColumn: "time", Columns: []string{"temp"}},
			[]string{"2021-03-01T00:00:00Z", "2021-03-01T01:00:00Z"}, []float64{1.5, -2}},
		{"semicolons and decimal comma", "time;temp;rh\n2021-03-01 00:00;1,5;80\n2021-03-01 01:00;-2,25;81\n",
			CSVOptions{TimeColumn: "time", Columns: []string{"temp"}, Decimal: ','},
			[]string{"2021-03-01T00:00:00Z", "2021-03-01T01:00:00Z"}, []float64{1.5, -2.25}},
		{"tabs, seconds, zone", "temp\ttime\n3\t2021-03-01T00:00:00+02:00\n4\t2021-03-01T01:00:00.5+02:00\n",
			CSVOptions{TimeColumn: "time", Columns: []string{"temp"}},
			[]string{"2021-02-28T22:00:00Z", "2021-02-28T23:00:00.5Z"}, []float64{3, 4}},
		{"quoted fields, hour-only stamps", "\"time\",\"temp\"\n\"2021-03-01T05\",\"7\"\n\"2021-03-01T06\",\"8\"\n",
			CSVOptions{TimeColumn: "time", Columns: []string{"temp"}},
			[]string{"2021-03-01T05:00:00Z", "2021-03-01T06:00:00Z"}, []float64{7, 8}},
		{"dates only", "time,temp\n2021-03-01,1\n2021-03-02,2\n",
			CSVOptions{TimeColumn: "time", Columns: []string{"temp"}, MaxGap: 48 * time.Hour},
			[]string{"2021-03-01T00:00:00Z", "2021-03-02T00:00:00Z"}, []float64{1, 2}},
		{"date plus hour 1..24", "date,hour,temp\n2021-03-01,23,1\n2021-03-01,24,2\n2021-03-02,1,3\n",
			CSVOptions{DateColumn: "date", HourColumn: "hour", Columns: []string{"temp"}},
			[]string{"2021-03-01T23:00:00Z", "2021-03-02T00:00:00Z", "2021-03-02T01:00:00Z"}, []float64{1, 2, 3}},
		{"date plus h:mm", "date,hour,temp\n2021-03-01,0:30,1\n2021-03-01,1:30,2\n",
			CSVOptions{DateColumn: "date", HourColumn: "hour", Columns: []string{"temp"}},
			[]string{"2021-03-01T00:30:00Z", "2021-03-01T01:30:00Z"}, []float64{1, 2}},
		// degF to degC: (F - 32) 5/9, definition of the scale: 32 F = 0 C,
		// 212 F = 100 C, -40 F = -40 C.
		{"Fahrenheit", "time,temp\n2021-01-01T00:00,32\n2021-01-01T01:00,212\n2021-01-01T02:00,-40\n",
			CSVOptions{TimeColumn: "time", Columns: []string{"temp"}, Unit: "F"},
			[]string{"2021-01-01T00:00:00Z", "2021-01-01T01:00:00Z", "2021-01-01T02:00:00Z"}, []float64{0, 100, -40}},
		// K to degC: T - 273.15 (SI).
		{"Kelvin", "time,temp\n2021-01-01T00:00,273.15\n2021-01-01T01:00,300\n",
			CSVOptions{TimeColumn: "time", Columns: []string{"temp"}, Unit: "K"},
			[]string{"2021-01-01T00:00:00Z", "2021-01-01T01:00:00Z"}, []float64{0, 26.85}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s, err := read(t, tc.text, tc.opt)
			if err != nil {
				t.Fatal(err)
			}
			if len(s.Times) != len(tc.times) {
				t.Fatalf("%d records, want %d", len(s.Times), len(tc.times))
			}
			for i, want := range tc.times {
				if got := s.Times[i].UTC().Format(time.RFC3339Nano); got != want {
					t.Errorf("time %d = %s, want %s", i, got, want)
				}
				if got := s.Values["temp"][i]; math.Abs(got-tc.temp[i]) > 1e-12 {
					t.Errorf("temp %d = %v, want %v", i, got, tc.temp[i])
				}
			}
		})
	}
}

func TestReadCSVAxisAndBridging(t *testing.T) {
	// Synthetic: 2020 is a leap year; the axis keeps real elapsed time.
	text := "# invented\ntime,temp,sun\n" +
		"2020-02-28T23:00,1,0\n" +
		"2020-02-29T00:00,,10\n" + // missing temp cell, bridged
		"2020-02-29T01:00,3,NA\n" +
		"2020-02-29T02:00,5,30\n" +
		// 03:00 and 04:00 rows missing: bridged
		"2020-02-29T05:00,11,40\n"
	s, err := read(t, text, CSVOptions{TimeColumn: "time", Columns: []string{"temp", "sun"}, ColumnUnits: map[string]string{"sun": "W/m2"}})
	if err != nil {
		t.Fatal(err)
	}
	wantT0 := (31+27)*Day + 23*3600 // 28 Feb 23:00 from 1 Jan 00:00
	if s.T[0] != wantT0 || !s.Start.Equal(time.Date(2020, 1, 1, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("axis start %v, T[0] = %v, want 2020-01-01 and %v", s.Start, s.T[0], wantT0)
	}
	if s.Step != 3600 {
		t.Errorf("step %v, want 3600", s.Step)
	}
	if got := s.Values["temp"][1]; got != 2 {
		t.Errorf("bridged temp %v, want 2 (midway between 1 and 3)", got)
	}
	if got := s.Values["sun"][2]; got != 20 {
		t.Errorf("bridged sun %v, want 20", got)
	}
	if len(s.Bridged) != 3 {
		t.Fatalf("bridged %+v, want 3 holes", s.Bridged)
	}
	var rows, cells int
	for _, g := range s.Bridged {
		if g.Column == "" {
			rows++
			if g.Line != 6 || g.To.Sub(g.From) != 3*time.Hour {
				t.Errorf("row gap %+v, want after line 6, 3 h", g)
			}
		} else {
			cells += g.Filled
		}
	}
	if rows != 1 || cells != 2 {
		t.Errorf("%d row gaps and %d filled cells, want 1 and 2", rows, cells)
	}

	// Resample to half-hour steps across the missing rows.
	v, err := s.Resample(s.T[3], 1800, 7, "temp")
	if err != nil {
		t.Fatal(err)
	}
	want := []float64{5, 6, 7, 8, 9, 10, 11}
	for i := range want {
		if math.Abs(v[i]-want[i]) > 1e-12 {
			t.Errorf("resampled %v, want %v", v, want)
			break
		}
	}
	if _, err := s.Resample(s.T[0]-1, 3600, 2, "temp"); err == nil {
		t.Error("resampling before the record: no error")
	}
	if _, err := s.Resample(s.T[0], 3600, 2, "tmp"); err == nil || !strings.Contains(err.Error(), `"tmp"`) {
		t.Errorf("unknown column: %v", err)
	}
	f, err := s.At("temp")
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct{ t, want float64 }{
		{s.T[0] - 1e6, 1}, {s.T[0], 1}, {s.T[0] + 1800, 1.5}, {s.T[3] + 1.5*3600, 8}, {s.T[4], 11}, {s.T[4] + 1e6, 11},
	} {
		if got := f(c.t); math.Abs(got-c.want) > 1e-12 {
			t.Errorf("At(%v) = %v, want %v", c.t, got, c.want)
		}
	}
}

// csvRows writes n hourly synthetic rows.
func csvRows(n int) string {
	var b strings.Builder
	b.WriteString("time,temp\n")
	t0 := time.Date(1990, 1, 1, 0, 0, 0, 0, time.UTC)
	for i := range n {
		fmt.Fprintf(&b, "%s,%.1f\n", t0.Add(time.Duration(i)*time.Hour).Format("2006-01-02T15:04"), 10*math.Sin(float64(i)/500))
	}
	return b.String()
}

// BenchmarkReadCSV30Years reads 30 years of hourly rows (262,800), generated
// in memory.
func BenchmarkReadCSV30Years(b *testing.B) {
	text := csvRows(30 * 8760)
	b.SetBytes(int64(len(text)))
	o := CSVOptions{TimeColumn: "time", Columns: []string{"temp"}}
	for b.Loop() {
		if _, err := ReadCSV(strings.NewReader(text), "bench.csv", o); err != nil {
			b.Fatal(err)
		}
	}
}
