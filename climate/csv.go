package climate

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"sort"
	"strconv"
	"strings"
	"time"

	"tempstack/fileerr"
)

// DefaultMaxGap is the longest stretch without a value that ReadCSV bridges
// by linear interpolation when CSVOptions.MaxGap is zero: 6 hours. Six hours
// keeps one daily cycle mostly intact; a longer hole would invent the
// afternoon peak or the night minimum. This is a choice of tempstack, not a
// published limit.
const DefaultMaxGap = 6 * time.Hour

// CSVOptions tells ReadCSV which columns to read and how to read them.
//
// Time is given either by TimeColumn (ISO 8601 date or date-time) or by
// DateColumn (ISO 8601 date) plus HourColumn (hour of the day 0..24 as an
// integer, or H:MM / H:MM:SS; 24 means 00:00 of the next day).
type CSVOptions struct {
	TimeColumn string // ISO 8601 timestamp column; empty when DateColumn is used
	DateColumn string // ISO 8601 date column (YYYY-MM-DD)
	HourColumn string // hour of the day for DateColumn; empty means 00:00

	// Columns are the value columns to read (header names, matched exactly
	// after trimming spaces). At least one is required.
	Columns []string

	// Decimal is the decimal mark of the numbers: '.' (default) or ','.
	Decimal rune
	// DecimalHint is how the caller's user declares a decimal comma, named
	// in the message for a number written with one while the mark is '.':
	// "--decimal ," (a command-line flag) or `decimal: ","` (a scenario
	// key). Empty names the option: "set the decimal mark to ','".
	DecimalHint string
	// Separator is the field separator; 0 detects ',', ';' or tab from the
	// header line.
	Separator rune

	// Unit is the temperature unit of the value columns: "C" (default,
	// also "degC", "°C"), "F" ("degF", "°F") or "K". Values are converted
	// to degC. ColumnUnits overrides it per column; the unit "1" (or "-",
	// "W/m2") marks a column that is not a temperature and is kept as read.
	Unit        string
	ColumnUnits map[string]string

	// Missing lists the cell texts that mean "no value" (after trimming).
	// Nil means "", "NA", "NaN", "nan", "null" and "-".
	Missing []string

	// MaxGap is the longest time without a value that is bridged by linear
	// interpolation (between the last value before and the first value after
	// the hole); a longer gap is an error. Zero means DefaultMaxGap.
	MaxGap time.Duration
}

// Gap records one hole that ReadCSV bridged by linear interpolation.
type Gap struct {
	Column string    // value column, or "" for missing rows (all columns)
	Line   int       // line in the file of the last record before the hole
	From   time.Time // time of the last value before the hole
	To     time.Time // time of the first value after the hole
	Filled int       // cells filled by interpolation (0 for missing rows)
}

// Series is a measured time series read from a file.
//
// Time axis: Start is 00:00 on 1 January of the year of the first record, in
// the time zone (UTC offset) of the first record; stamps without a zone are
// taken as UTC clock time. T[i] is the true elapsed time in seconds from Start
// to Times[i]. Real timestamps are kept: a leap day in the record is a real
// day on the axis, so the axis drifts by one day per leap year against the
// 365-day Year of the harmonic model. That drift (about 0.1 % of a year)
// is negligible for annual harmonics and degree-days; calendar-based
// splitting (Winters via Series.Winters) uses the real dates.
type Series struct {
	Name    string      // file name, for messages
	Start   time.Time   // origin of the time axis
	Times   []time.Time // record stamps, strictly increasing
	T       []float64   // s since Start, strictly increasing
	Columns []string    // value column names, in the order requested
	// Values holds one slice per column, aligned with T. Temperatures are
	// in degC; other columns are in their file unit.
	Values  map[string][]float64
	Lines   []int   // line in the file of each record (1-based)
	Bridged []Gap   // holes bridged by linear interpolation
	Step    float64 // typical (median) record spacing, s
}

// csvErr is a mistake in a CSV file: at line (0: the whole file), in the
// column col ("" when not tied to one column), with its cause.
func csvErr(file string, line int, col, msg string, cause error) *fileerr.Error {
	e := &fileerr.Error{File: file, Line: line, Msg: msg, Err: cause}
	if col != "" {
		e.Key = fmt.Sprintf("column %q", col)
	}
	return e
}

var defaultMissing = []string{"", "NA", "NaN", "nan", "null", "-"}

// unitConv returns the conversion to degC (or identity) for a unit name.
func unitConv(u string) (func(float64) float64, error) {
	switch strings.TrimSpace(u) {
	case "", "C", "degC", "°C", "celsius", "Celsius":
		return func(v float64) float64 { return v }, nil
	case "F", "degF", "°F", "fahrenheit", "Fahrenheit":
		// t_C = (t_F - 32) * 5/9 (definition of the Fahrenheit scale).
		return func(v float64) float64 { return (v - 32) * 5 / 9 }, nil
	case "K", "kelvin", "Kelvin":
		// t_C = T - 273.15 (SI definition of the Celsius scale).
		return func(v float64) float64 { return v - 273.15 }, nil
	case "1", "-", "W/m2", "W/m²", "none":
		return nil, nil
	}
	return nil, fmt.Errorf("unknown unit %q (use C, F or K for temperatures, or 1 for other quantities)", u)
}

// ReadCSV reads a time series from r. name is used in error messages (the
// file name). Lines starting with '#' are comments. A UTF-8 byte order mark
// is skipped; CRLF line ends are accepted. The first non-comment line is the
// header.
//
// Every error is a *fileerr.Error naming the file, the line and the column
// (its Key is `column "name"`): an
// empty file, a header without data, a missing column (with the closest
// header name), an unparsable time, time going backward, a repeated stamp,
// a hole longer than MaxGap, or text in a number cell. Holes up to MaxGap
// (missing cells, or rows missing from an otherwise regular record) are
// bridged by linear interpolation and listed in Series.Bridged.
//
// The work is done in four steps: the options are checked (csvSettings),
// the header is matched to the requested columns (readHeader), the rows are
// read (readRows, with readStamp and parseValue), and the holes are bridged
// (finish: bridgeRows, bridgeCells).
func ReadCSV(r io.Reader, name string, o CSVOptions) (*Series, error) {
	set, err := newCSVSettings(name, o)
	if err != nil {
		return nil, err
	}
	br := bufio.NewReaderSize(r, 64<<10)
	if b, err := br.Peek(3); err == nil && bytes.Equal(b, []byte{0xEF, 0xBB, 0xBF}) {
		br.Discard(3)
	}
	if set.sep == 0 {
		if set.sep, err = detectSeparator(br, set.dec); err != nil {
			return nil, csvErr(name, 0, "", "", err)
		}
	}
	if set.sep == set.dec {
		return nil, set.fail(0, "", "separator and decimal mark are both %q", set.sep)
	}
	cr := csv.NewReader(br)
	cr.Comma = set.sep
	cr.Comment = '#'
	cr.FieldsPerRecord = -1
	cr.ReuseRecord = true

	cols, err := set.readHeader(cr)
	if err != nil {
		return nil, err
	}
	s := &Series{Name: name, Columns: append([]string(nil), o.Columns...), Values: map[string][]float64{}}
	vals, err := set.readRows(cr, cols, s)
	if err != nil {
		return nil, err
	}
	if err := set.finish(s, vals); err != nil {
		return nil, err
	}
	return s, nil
}

// csvSettings are the checked options of one ReadCSV call.
type csvSettings struct {
	CSVOptions
	name    string                  // file name, for messages
	dec     rune                    // decimal mark, '.' or ','
	sep     rune                    // field separator; 0 until detected
	maxGap  time.Duration           // longest hole bridged
	missing []string                // cell texts that mean "no value"
	convs   []func(float64) float64 // per value column: to degC, or nil
	numBuf  []byte                  // scratch for decimal-comma numbers
}

// fail returns a *fileerr.Error of the file at line (0: the whole file),
// in column col ("" when not tied to one column).
func (st *csvSettings) fail(line int, col, format string, a ...any) error {
	return csvErr(st.name, line, col, fmt.Sprintf(format, a...), nil)
}

// newCSVSettings checks o and fills in its defaults.
func newCSVSettings(name string, o CSVOptions) (*csvSettings, error) {
	st := &csvSettings{CSVOptions: o, name: name, dec: o.Decimal, sep: o.Separator, maxGap: o.MaxGap, missing: o.Missing}
	if len(o.Columns) == 0 {
		return nil, st.fail(0, "", "no value columns requested")
	}
	if (o.TimeColumn == "") == (o.DateColumn == "") {
		return nil, st.fail(0, "", "give either a time column or a date column (not both)")
	}
	if o.HourColumn != "" && o.DateColumn == "" {
		return nil, st.fail(0, "", "an hour column needs a date column")
	}
	if st.dec == 0 {
		st.dec = '.'
	}
	if st.dec != '.' && st.dec != ',' {
		return nil, st.fail(0, "", "decimal mark must be '.' or ',', not %q", st.dec)
	}
	if st.maxGap == 0 {
		st.maxGap = DefaultMaxGap
	}
	if st.maxGap < 0 {
		return nil, st.fail(0, "", "negative maximum gap %v", o.MaxGap)
	}
	if st.missing == nil {
		st.missing = defaultMissing
	}
	st.convs = make([]func(float64) float64, len(o.Columns))
	for i, c := range o.Columns {
		for _, d := range o.Columns[:i] {
			if d == c {
				return nil, st.fail(0, c, "column requested twice")
			}
		}
		u := o.Unit
		if cu, ok := o.ColumnUnits[c]; ok {
			u = cu
		}
		f, err := unitConv(u)
		if err != nil {
			return nil, csvErr(name, 0, c, "", err)
		}
		st.convs[i] = f
	}
	return st, nil
}

// csvColumns are the positions in a row of the columns ReadCSV reads.
type csvColumns struct {
	names    []string // trimmed header names
	hline    int      // line of the header
	time     int      // time (or date) column
	hour     int      // hour column, or -1
	timeName string   // name of the time (or date) column, for messages
	values   []int    // value columns, in the order requested
	need     int      // the largest of these positions
}

// readHeader reads the header line and finds the requested columns in it.
func (st *csvSettings) readHeader(cr *csv.Reader) (*csvColumns, error) {
	header, err := cr.Read()
	if err == io.EOF {
		return nil, st.fail(0, "", "file is empty (no header line)")
	}
	if err != nil {
		return nil, csvReadError(st.name, err)
	}
	c := &csvColumns{hour: -1, timeName: st.TimeColumn}
	c.hline, _ = cr.FieldPos(0)
	c.names = make([]string, len(header))
	for i, h := range header {
		c.names[i] = strings.TrimSpace(h)
	}
	if st.TimeColumn != "" {
		if c.time, err = st.find(c, st.TimeColumn); err != nil {
			return nil, err
		}
	} else {
		c.timeName = st.DateColumn
		if c.time, err = st.find(c, st.DateColumn); err != nil {
			return nil, err
		}
		if st.HourColumn != "" {
			if c.hour, err = st.find(c, st.HourColumn); err != nil {
				return nil, err
			}
		}
	}
	c.values = make([]int, len(st.Columns))
	for i, col := range st.Columns {
		if c.values[i], err = st.find(c, col); err != nil {
			return nil, err
		}
	}
	c.need = max(c.time, c.hour)
	for _, j := range c.values {
		c.need = max(c.need, j)
	}
	return c, nil
}

// find returns the position of col in the header, or an error naming the
// closest header name.
func (st *csvSettings) find(c *csvColumns, col string) (int, error) {
	for i, h := range c.names {
		if h == col {
			return i, nil
		}
	}
	msg := fmt.Sprintf("no column %q in the header", col)
	if s := closest(col, c.names); s != "" {
		msg += fmt.Sprintf("; did you mean %q?", s)
	}
	msg += fmt.Sprintf(" (header: %s)", quoteList(c.names))
	return 0, st.fail(c.hline, col, "%s", msg)
}

// readRows reads the data rows into s.Times and s.Lines and returns the
// values of each requested column (NaN for a missing cell), converted to
// degC where the column is a temperature.
func (st *csvSettings) readRows(cr *csv.Reader, c *csvColumns, s *Series) ([][]float64, error) {
	vals := make([][]float64, len(st.Columns))
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, csvReadError(st.name, err)
		}
		line, _ := cr.FieldPos(0)
		if len(rec) == 1 && strings.TrimSpace(rec[0]) == "" {
			continue // blank line
		}
		if len(rec) <= c.need {
			return nil, st.fail(line, "", "row has %d fields, the header has %d", len(rec), len(c.names))
		}
		ts, err := st.readStamp(rec, line, c)
		if err != nil {
			return nil, err
		}
		if n := len(s.Times); n > 0 {
			prev := s.Times[n-1]
			if ts.Equal(prev) {
				return nil, st.fail(line, c.timeName, "time %s repeats the stamp of line %d", rec[c.time], s.Lines[n-1])
			}
			if ts.Before(prev) {
				return nil, st.fail(line, c.timeName, "time goes backward: %s comes after %s on line %d", rec[c.time], prev.Format(time.RFC3339), s.Lines[n-1])
			}
		}
		for k, j := range c.values {
			v, err := st.parseValue(k, strings.TrimSpace(rec[j]), line)
			if err != nil {
				return nil, err
			}
			vals[k] = append(vals[k], v)
		}
		s.Times = append(s.Times, ts)
		s.Lines = append(s.Lines, line)
	}
	if len(s.Times) == 0 {
		return nil, st.fail(c.hline, "", "header only: no data rows")
	}
	return vals, nil
}

// readStamp reads the time of row rec (at line): a date-time, or a date
// plus an hour.
func (st *csvSettings) readStamp(rec []string, line int, c *csvColumns) (time.Time, error) {
	cell := strings.TrimSpace(rec[c.time])
	ts, err := parseISO(cell)
	if st.TimeColumn == "" {
		if err == nil && len(cell) != 10 {
			err = errors.New("want a date YYYY-MM-DD")
		}
		if err == nil && c.hour >= 0 {
			h, herr := parseHour(strings.TrimSpace(rec[c.hour]))
			if herr != nil {
				return ts, csvErr(st.name, line, st.HourColumn, fmt.Sprintf("cannot read hour %q", rec[c.hour]), herr)
			}
			ts = ts.Add(h)
		}
	}
	if err != nil {
		return ts, csvErr(st.name, line, c.timeName, fmt.Sprintf("cannot read time %q", rec[c.time]), err)
	}
	return ts, nil
}

// parseValue reads the trimmed cell f of value column k (at line): NaN
// for a missing value, otherwise the number in degC (or the file unit).
func (st *csvSettings) parseValue(k int, f string, line int) (float64, error) {
	for _, m := range st.missing {
		if f == m {
			return math.NaN(), nil
		}
	}
	num := f
	if st.dec == ',' {
		st.numBuf = append(st.numBuf[:0], f...)
		for i, c := range st.numBuf {
			switch c {
			case ',':
				st.numBuf[i] = '.'
			case '.':
				st.numBuf[i] = 'x' // a point is not a decimal mark here
			}
		}
		num = string(st.numBuf)
	}
	v, err := strconv.ParseFloat(num, 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		hint := ""
		if st.dec == '.' && strings.Count(f, ",") == 1 {
			hint = " (decimal comma? set the decimal mark to ',')"
			if st.DecimalHint != "" {
				hint = " (decimal comma? use " + st.DecimalHint + ")"
			}
		}
		return 0, st.fail(line, st.Columns[k], "%q is not a number%s", f, hint)
	}
	if st.convs[k] != nil {
		v = st.convs[k](v)
	}
	return v, nil
}

// finish sets the time axis of s, bridges its holes and stores the values.
func (st *csvSettings) finish(s *Series, vals [][]float64) error {
	first := s.Times[0]
	s.Start = time.Date(first.Year(), time.January, 1, 0, 0, 0, 0, first.Location())
	s.T = make([]float64, len(s.Times))
	for i, ts := range s.Times {
		s.T[i] = ts.Sub(s.Start).Seconds()
	}
	s.Step = medianStep(s.T)
	timeName := st.TimeColumn
	if timeName == "" {
		timeName = st.DateColumn
	}
	if err := st.bridgeRows(s, timeName); err != nil {
		return err
	}
	for k, col := range st.Columns {
		if err := st.bridgeCells(s, col, vals[k]); err != nil {
			return err
		}
		s.Values[col] = vals[k]
	}
	sort.SliceStable(s.Bridged, func(a, b int) bool { return s.Bridged[a].From.Before(s.Bridged[b].From) })
	return nil
}

// bridgeRows checks the spacing of the records: a spacing above the
// maximum gap is an error; one well above the typical step (rows missing
// from a regular record) is listed in s.Bridged.
func (st *csvSettings) bridgeRows(s *Series, timeName string) error {
	gapLim := st.maxGap.Seconds()
	for i := 1; i < len(s.T); i++ {
		dt := s.T[i] - s.T[i-1]
		if dt > gapLim {
			return st.fail(s.Lines[i], timeName, "gap of %s between line %d (%s) and line %d (%s) is longer than the maximum gap %s",
				fmtDur(dt), s.Lines[i-1], s.Times[i-1].Format(time.RFC3339), s.Lines[i], s.Times[i].Format(time.RFC3339), fmtDur(st.maxGap.Seconds()))
		}
		if s.Step > 0 && dt > 1.5*s.Step {
			s.Bridged = append(s.Bridged, Gap{Line: s.Lines[i-1], From: s.Times[i-1], To: s.Times[i]})
		}
	}
	return nil
}

// bridgeCells fills the missing cells (NaN) of column col in v by linear
// interpolation in time and lists each hole in s.Bridged. A hole at either
// end of the record, or one whose values lie further apart than the
// maximum gap, is an error.
func (st *csvSettings) bridgeCells(s *Series, col string, v []float64) error {
	gapLim := st.maxGap.Seconds()
	for i := 0; i < len(v); i++ {
		if !math.IsNaN(v[i]) {
			continue
		}
		j := i
		for j < len(v) && math.IsNaN(v[j]) {
			j++
		}
		if i == 0 || j == len(v) {
			where := "at the start"
			if i > 0 {
				where = "at the end"
			}
			return st.fail(s.Lines[i], col, "no value %s of the record (lines %d to %d): nothing to interpolate from; trim the record", where, s.Lines[i], s.Lines[j-1])
		}
		if dt := s.T[j] - s.T[i-1]; dt > gapLim {
			return st.fail(s.Lines[i], col, "no value from line %d to line %d: a gap of %s between values is longer than the maximum gap %s",
				s.Lines[i], s.Lines[j-1], fmtDur(dt), fmtDur(st.maxGap.Seconds()))
		}
		// Linear interpolation in time between (T[i-1], v[i-1]) and (T[j], v[j]).
		for m := i; m < j; m++ {
			w := (s.T[m] - s.T[i-1]) / (s.T[j] - s.T[i-1])
			v[m] = v[i-1] + w*(v[j]-v[i-1])
		}
		s.Bridged = append(s.Bridged, Gap{Column: col, Line: s.Lines[i-1], From: s.Times[i-1], To: s.Times[j], Filled: j - i})
		i = j
	}
	return nil
}

func csvReadError(name string, err error) error {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		return &fileerr.Error{File: name, Line: pe.Line, Err: pe.Err}
	}
	return &fileerr.Error{File: name, Err: err}
}

// detectSeparator looks at the first non-comment line and picks the most
// frequent of ',', ';' and tab outside double quotes. With a decimal comma
// a comma is not counted (it would be inside numbers).
func detectSeparator(br *bufio.Reader, dec rune) (rune, error) {
	b, _ := br.Peek(br.Size())
	for _, l := range bytes.Split(b, []byte("\n")) {
		t := bytes.TrimSpace(l)
		if len(t) == 0 || t[0] == '#' {
			continue
		}
		var comma, semi, tab int
		inq := false
		for _, c := range l {
			switch {
			case c == '"':
				inq = !inq
			case inq:
			case c == ',':
				comma++
			case c == ';':
				semi++
			case c == '\t':
				tab++
			}
		}
		if dec == ',' {
			comma = 0
		}
		switch {
		case semi > 0 && semi >= comma && semi >= tab:
			return ';', nil
		case tab > 0 && tab >= comma:
			return '\t', nil
		case comma == 0 && dec == ',':
			return ';', nil
		}
		return ',', nil
	}
	return ',', nil // empty file: reported by the reader
}

// parseISO reads an ISO 8601 calendar date or date-time (no week or
// ordinal dates): YYYY-MM-DD, optionally
// followed by 'T' or a space and hh, hh:mm, hh:mm:ss or hh:mm:ss.fff, then
// optionally Z or a UTC offset ±hh, ±hh:mm or ±hhmm. Without a zone the
// clock time is taken as UTC. Hour 24:00 is accepted as 00:00 of the next
// day.
func parseISO(s string) (time.Time, error) {
	y, mo, d, err := parseDate(s)
	if err != nil {
		return time.Time{}, err
	}
	rest := s[10:]
	if rest == "" {
		return time.Date(y, time.Month(mo), d, 0, 0, 0, 0, time.UTC), nil
	}
	if rest[0] != 'T' && rest[0] != ' ' {
		return time.Time{}, errors.New("want 'T' or a space between date and time")
	}
	clock, loc, err := splitZone(strings.TrimLeft(rest[1:], " "))
	if err != nil {
		return time.Time{}, err
	}
	h, mi, sec, nsec, err := parseClock(strings.TrimSpace(clock))
	if err != nil {
		return time.Time{}, err
	}
	return time.Date(y, time.Month(mo), d, h, mi, sec, nsec, loc), nil
}

// parseDate reads the date YYYY-MM-DD at the start of s.
func parseDate(s string) (y, mo, d int, err error) {
	errForm := errors.New("want an ISO 8601 date YYYY-MM-DD or date-time YYYY-MM-DDThh:mm")
	if len(s) < 10 || s[4] != '-' || s[7] != '-' {
		return 0, 0, 0, errForm
	}
	y, ok1 := atoiN(s[0:4])
	mo, ok2 := atoiN(s[5:7])
	d, ok3 := atoiN(s[8:10])
	if !ok1 || !ok2 || !ok3 {
		return 0, 0, 0, errForm
	}
	if mo < 1 || mo > 12 || d < 1 || d > daysIn(y, mo) {
		return 0, 0, 0, errors.New("no such date")
	}
	return y, mo, d, nil
}

// splitZone splits a clock time from its zone suffix: Z, or a UTC offset
// ±hh, ±hhmm or ±hh:mm. Without a suffix the zone is UTC.
func splitZone(s string) (clock string, loc *time.Location, err error) {
	if n := len(s); n > 0 && (s[n-1] == 'Z' || s[n-1] == 'z') {
		return s[:n-1], time.UTC, nil
	}
	k := strings.LastIndexAny(s, "+-")
	if k <= 0 {
		return s, time.UTC, nil
	}
	zh, zm, ok := parseOffset(s[k+1:])
	if !ok || zh > 23 || zm > 59 {
		return "", nil, errors.New("cannot read the UTC offset")
	}
	off := zh*3600 + zm*60
	if s[k] == '-' {
		off = -off
	}
	if off == 0 {
		return s[:k], time.UTC, nil
	}
	return s[:k], time.FixedZone("", off), nil
}

// parseOffset reads the hours and minutes of a UTC offset without its
// sign: hh, hhmm or hh:mm.
func parseOffset(z string) (zh, zm int, ok bool) {
	switch {
	case len(z) == 2:
		zh, ok = atoiN(z)
	case len(z) == 4:
		zh, ok = atoiN(z[:2])
		if ok {
			zm, ok = atoiN(z[2:])
		}
	case len(z) == 5 && z[2] == ':':
		zh, ok = atoiN(z[:2])
		if ok {
			zm, ok = atoiN(z[3:])
		}
	}
	return zh, zm, ok
}

// parseClock reads a clock time hh, hh:mm, hh:mm:ss or hh:mm:ss.fff (a
// decimal point or comma, 1 to 9 digits). 24:00 is the end of the day
// (ISO 8601).
func parseClock(s string) (h, mi, sec, nsec int, err error) {
	var ok bool
	switch {
	case len(s) == 2:
		h, ok = atoiN(s)
	case len(s) == 5 && s[2] == ':':
		h, ok = atoiN(s[:2])
		if ok {
			mi, ok = atoiN(s[3:5])
		}
	case len(s) >= 8 && s[2] == ':' && s[5] == ':':
		h, ok = atoiN(s[:2])
		if ok {
			mi, ok = atoiN(s[3:5])
		}
		if ok {
			sec, ok = atoiN(s[6:8])
		}
		if ok && len(s) > 8 {
			nsec, ok = parseFraction(s[8:])
		}
	}
	if !ok {
		return 0, 0, 0, 0, errors.New("cannot read the clock time (want hh:mm or hh:mm:ss)")
	}
	if h == 24 && mi == 0 && sec == 0 && nsec == 0 {
		return h, mi, sec, nsec, nil // 24:00 is the end of the day (ISO 8601)
	}
	if h > 23 || mi > 59 || sec > 59 {
		return 0, 0, 0, 0, errors.New("clock time out of range")
	}
	return h, mi, sec, nsec, nil
}

// parseFraction reads the decimal fraction of a second, ".fff" or ",fff"
// with 1 to 9 digits, as nanoseconds.
func parseFraction(s string) (int, bool) {
	frac := s[1:]
	if (s[0] != '.' && s[0] != ',') || len(frac) == 0 || len(frac) > 9 {
		return 0, false
	}
	f, ok := atoiN(frac)
	for i := len(frac); i < 9; i++ {
		f *= 10
	}
	return f, ok
}

// parseHour reads an hour of the day: an integer 0..24, or h:mm[:ss].
func parseHour(s string) (time.Duration, error) {
	if s == "" {
		return 0, errors.New("empty")
	}
	parts := strings.Split(s, ":")
	if len(parts) > 3 {
		return 0, errors.New("want an hour 0..24 or h:mm")
	}
	var n [3]int
	for i, p := range parts {
		v, ok := atoiN(p)
		if !ok || (i > 0 && len(p) != 2) {
			return 0, errors.New("want an hour 0..24 or h:mm")
		}
		n[i] = v
	}
	if n[1] > 59 || n[2] > 59 || n[0] > 24 || (n[0] == 24 && (n[1] != 0 || n[2] != 0)) {
		return 0, errors.New("hour out of range 0..24")
	}
	return time.Duration(n[0])*time.Hour + time.Duration(n[1])*time.Minute + time.Duration(n[2])*time.Second, nil
}

// atoiN parses a string of ASCII digits.
func atoiN(s string) (int, bool) {
	if s == "" || len(s) > 9 {
		return 0, false
	}
	n := 0
	for i := 0; i < len(s); i++ {
		c := s[i]
		if c < '0' || c > '9' {
			return 0, false
		}
		n = n*10 + int(c-'0')
	}
	return n, true
}

func daysIn(y, m int) int {
	return time.Date(y, time.Month(m)+1, 0, 0, 0, 0, 0, time.UTC).Day()
}

func medianStep(t []float64) float64 {
	if len(t) < 2 {
		return 0
	}
	d := make([]float64, len(t)-1)
	for i := range d {
		d[i] = t[i+1] - t[i]
	}
	sort.Float64s(d)
	return d[len(d)/2]
}

// fmtDur writes a time span of sec seconds for messages, in hours from
// 1 h up ("49 h", "6 h", "1.5 h"), else in minutes or seconds.
func fmtDur(sec float64) string {
	switch h := sec / 3600; {
	case h >= 1:
		return strconv.FormatFloat(math.Round(h*100)/100, 'f', -1, 64) + " h"
	case sec >= 60:
		return strconv.FormatFloat(math.Round(sec/60*100)/100, 'f', -1, 64) + " min"
	}
	return strconv.FormatFloat(math.Round(sec*1000)/1000, 'f', -1, 64) + " s"
}

func quoteList(s []string) string {
	q := make([]string, len(s))
	for i, x := range s {
		q[i] = strconv.Quote(x)
	}
	return strings.Join(q, ", ")
}

// closest returns the header name nearest to want (case-insensitive edit
// distance), or "" when none is reasonably close.
func closest(want string, names []string) string {
	best, bestD := "", math.MaxInt
	w := strings.ToLower(want)
	for _, n := range names {
		d := editDistance(w, strings.ToLower(n))
		if d < bestD {
			best, bestD = n, d
		}
	}
	lim := len([]rune(want))/3 + 1
	if lim < 2 {
		lim = 2
	}
	if bestD <= lim {
		return best
	}
	return ""
}

// editDistance is the optimal-string-alignment distance: insertions,
// deletions, substitutions and swaps of neighbours each cost 1.
func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	d := make([][]int, len(ra)+1)
	for i := range d {
		d[i] = make([]int, len(rb)+1)
		d[i][0] = i
	}
	for j := range d[0] {
		d[0][j] = j
	}
	for i := 1; i <= len(ra); i++ {
		for j := 1; j <= len(rb); j++ {
			c := 1
			if ra[i-1] == rb[j-1] {
				c = 0
			}
			d[i][j] = min(d[i-1][j]+1, d[i][j-1]+1, d[i-1][j-1]+c)
			if i > 1 && j > 1 && ra[i-1] == rb[j-2] && ra[i-2] == rb[j-1] {
				d[i][j] = min(d[i][j], d[i-2][j-2]+1)
			}
		}
	}
	return d[len(ra)][len(rb)]
}

// Value returns the values of a column, or an error naming the column.
func (s *Series) Value(column string) ([]float64, error) {
	v, ok := s.Values[column]
	if !ok {
		return nil, fmt.Errorf("%s: no column %q in the series (have %s)", s.Name, column, quoteList(s.Columns))
	}
	return v, nil
}

// Resample returns n values of column at times start + i*step (s on the
// series axis, i = 0..n-1) by linear interpolation between records. A time
// outside the record is an error: the series is not extrapolated.
func (s *Series) Resample(start, step float64, n int, column string) ([]float64, error) {
	v, err := s.Value(column)
	if err != nil {
		return nil, err
	}
	if n < 0 || (n > 1 && !(step > 0)) {
		return nil, fmt.Errorf("%s: resample needs n >= 0 and a positive step (n %d, step %g s)", s.Name, n, step)
	}
	if n == 0 {
		return nil, nil
	}
	t0, t1 := s.T[0], s.T[len(s.T)-1]
	end := start + float64(n-1)*step
	const eps = 1e-6 // s, round-off in start + i*step
	if start < t0-eps || end > t1+eps {
		return nil, fmt.Errorf("%s: resampling %s to %s lies outside the record %s to %s",
			s.Name, s.timeAt(start), s.timeAt(end), s.Times[0].Format(time.RFC3339), s.Times[len(s.Times)-1].Format(time.RFC3339))
	}
	out := make([]float64, n)
	j := 0
	for i := range out {
		x := start + float64(i)*step
		for j < len(s.T)-2 && s.T[j+1] <= x {
			j++
		}
		out[i] = lerpAt(s.T, v, j, x)
	}
	return out, nil
}

func (s *Series) timeAt(sec float64) string {
	return s.Start.Add(time.Duration(sec * float64(time.Second))).Format(time.RFC3339)
}

// lerpAt interpolates linearly on segment [t[j], t[j+1]], clamping outside
// the record.
func lerpAt(t, v []float64, j int, x float64) float64 {
	if len(t) == 1 || x <= t[0] {
		return v[0]
	}
	if x >= t[len(t)-1] {
		return v[len(v)-1]
	}
	w := (x - t[j]) / (t[j+1] - t[j])
	return v[j] + w*(v[j+1]-v[j])
}

// At returns an interpolator for column: f(t) is the value at t (s on the
// series axis) by linear interpolation between records, held constant at
// the first or last value outside the record. f is safe for concurrent use.
func (s *Series) At(column string) (func(t float64) float64, error) {
	v, err := s.Value(column)
	if err != nil {
		return nil, err
	}
	t := s.T
	return func(x float64) float64 {
		// Largest j with t[j] <= x, within [0, len-2].
		j := sort.SearchFloat64s(t, x)
		if j >= len(t) || t[j] > x {
			j--
		}
		j = max(0, min(j, len(t)-2))
		return lerpAt(t, v, j, x)
	}, nil
}

// CSVHeader returns the trimmed header names of CSV data as ReadCSV reads
// them: the first line that is neither blank nor a '#' comment, split at
// the separator ReadCSV detects. It returns nil when there is no such
// line.
func CSVHeader(data []byte, dec rune) []string {
	data = bytes.TrimPrefix(data, []byte{0xEF, 0xBB, 0xBF})
	sep, _ := detectSeparator(bufio.NewReaderSize(bytes.NewReader(data), 64<<10), dec)
	for _, l := range bytes.Split(data, []byte("\n")) {
		line := strings.TrimRight(string(l), "\r")
		if t := strings.TrimSpace(line); t == "" || t[0] == '#' {
			continue
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
