package climate

import (
	"errors"
	"math"
	"strings"
	"testing"

	"tempstack/fileerr"
)

// FuzzReadCSV feeds arbitrary bytes to ReadCSV under option sets picked by
// mode. ReadCSV must never panic; an error must be a *fileerr.Error naming the
// file on one line; a series it accepts must have a strictly increasing
// time axis and finite values, one per record, in every requested column.
// The seeds (testdata/fuzz/FuzzReadCSV) are small invented records.
func FuzzReadCSV(f *testing.F) {
	f.Add([]byte("time,temp\n2020-01-01T00:00,1.5\n2020-01-01T01:00,2\n"), uint8(0))
	f.Add([]byte("time;temp\n2020-01-01T00:00;1,5\n2020-01-01T01:00;2,0\n"), uint8(1))
	f.Add([]byte("date,hour,temp\n2020-01-01,0,1\n2020-01-01,1:30,2\n2020-01-01,24,3\n"), uint8(2))
	f.Add([]byte("\xef\xbb\xbf# comment\ntime\ttemp\r\n2020-01-01 00:00Z\t-3\r\n2020-01-01 01:00+01:00\t4\r\n"), uint8(3))
	f.Add([]byte("time,temp\n2020-01-01T00:00,1\n2020-01-01T01:00,\n2020-01-01T02:00,NA\n2020-01-01T03:00,3\n"), uint8(4))
	f.Add([]byte("time,temp\n\"2020-01-01T00:00\",\"1\"\n\"2020-01-01T01:00,2\n"), uint8(5))
	f.Fuzz(func(t *testing.T, data []byte, mode uint8) {
		const name = "fuzz.csv"
		o := CSVOptions{TimeColumn: "time", Columns: []string{"temp"}}
		switch mode % 4 {
		case 1:
			o.Decimal = ','
		case 2:
			o.TimeColumn, o.DateColumn, o.HourColumn = "", "date", "hour"
		case 3:
			o.Columns = []string{"temp", "sun"}
			o.ColumnUnits = map[string]string{"sun": "W/m2"}
		}
		switch mode / 4 % 4 {
		case 1:
			o.Separator = ';'
		case 2:
			o.Separator = '\t'
		case 3:
			o.Unit = "F"
		}
		if mode&16 != 0 {
			o.MaxGap = 1
		}
		s, err := ReadCSV(strings.NewReader(string(data)), name, o)
		if err != nil {
			var ce *fileerr.Error
			if !errors.As(err, &ce) {
				t.Fatalf("error is %T, not *fileerr.Error: %v", err, err)
			}
			if ce.File != name || !strings.HasPrefix(err.Error(), name) {
				t.Fatalf("error does not name the file: %q", err)
			}
			if strings.ContainsAny(err.Error(), "\n\r") {
				t.Fatalf("error is not one line: %q", err)
			}
			if s != nil {
				t.Fatalf("a series came with an error")
			}
			return
		}
		if len(s.T) == 0 || len(s.T) != len(s.Times) || len(s.T) != len(s.Lines) {
			t.Fatalf("inconsistent series: %d times, %d stamps, %d lines", len(s.T), len(s.Times), len(s.Lines))
		}
		for i := range s.T {
			if math.IsNaN(s.T[i]) || math.IsInf(s.T[i], 0) {
				t.Fatalf("time %d is %g", i, s.T[i])
			}
			if i > 0 && !(s.T[i] > s.T[i-1]) {
				t.Fatalf("time axis not increasing at %d: %g after %g", i, s.T[i], s.T[i-1])
			}
			if i > 0 && s.Lines[i] <= s.Lines[i-1] {
				t.Fatalf("record lines not increasing at %d", i)
			}
		}
		for _, c := range o.Columns {
			v := s.Values[c]
			if len(v) != len(s.T) {
				t.Fatalf("column %s has %d values for %d records", c, len(v), len(s.T))
			}
			for i, x := range v {
				if math.IsNaN(x) || math.IsInf(x, 0) {
					t.Fatalf("column %s value %d is %g", c, i, x)
				}
			}
		}
	})
}
