package climate

import (
	"math"
	"strconv"
	"strings"
	"testing"
	"time"
)

func TestDegreeDays(t *testing.T) {
	// Synthetic values; sums by hand.
	tests := []struct {
		name         string
		v            []float64
		step, thr    float64
		below, above float64
	}{
		{"daily, 0 degC", []float64{-3, -1, 0, 2, 5}, Day, 0, 4, 7},
		{"hourly, 0 degC", []float64{-3, -1, 0, 2, 5}, 3600, 0, 4.0 / 24, 7.0 / 24},
		{"daily, -1.5 degC", []float64{-3, -1, 0, 2, 5}, Day, -1.5, 1.5, 0.5 + 1.5 + 3.5 + 6.5},
		{"empty", nil, Day, 0, 0, 0},
	}
	for _, tc := range tests {
		b, a := DegreeDays(tc.v, tc.step, tc.thr)
		if math.Abs(b-tc.below) > 1e-12 || math.Abs(a-tc.above) > 1e-12 {
			t.Errorf("%s: got %v below, %v above; want %v, %v", tc.name, b, a, tc.below, tc.above)
		}
	}
}

func TestDailyMeans(t *testing.T) {
	// Synthetic: linear between samples, so a day's mean is the mean of
	// the interpolant: samples at 06:00 and 18:00 of a line T = t/3600 h
	// give exact hourly-clock means.
	var tt, vv []float64
	for h := 6.0; h <= 24*3+18; h += 12 {
		tt = append(tt, h*3600)
		vv = append(vv, h) // T = hour on the axis
	}
	first, m, err := DailyMeans(tt, vv)
	if err != nil {
		t.Fatal(err)
	}
	// Whole days inside [06:00 day 0, 18:00 day 3]: days 1 and 2; the
	// mean of T = h over day k is 24k + 12.
	if first != 1 || len(m) != 2 || math.Abs(m[0]-36) > 1e-9 || math.Abs(m[1]-60) > 1e-9 {
		t.Errorf("first %d means %v, want 1 and [36 60]", first, m)
	}
	if _, _, err := DailyMeans([]float64{0, 0}, []float64{1, 2}); err == nil {
		t.Error("repeated time: no error")
	}
}

// boxWinter builds one winter year of daily-boundary samples (synthetic):
// u_j at t = (181 + j) Day, j = 0..365: +5 up to j = 120, -10 for j in
// 121..240, +5 after. The linear interpolant's daily means are
// m_d = (u_d + u_{d+1})/2: 5 (d 0..119), -2.5 (d 120), -10 (d 121..239),
// -2.5 (d 240), 5 (d 241..364).
func boxWinter(offsetDays, warm, cold float64) (t, v []float64) {
	for j := 0; j <= 365; j++ {
		u := warm
		if j >= 121 && j <= 240 {
			u = cold
		}
		t = append(t, (offsetDays+float64(j))*Day)
		v = append(v, u)
	}
	return t, v
}

func TestWintersHandChecked(t *testing.T) {
	tt, vv := boxWinter(181, 5, -10)
	ws, err := Winters(tt, vv, WinterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(ws) != 1 {
		t.Fatalf("%d winters, want 1: %+v", len(ws), ws)
	}
	w := ws[0]
	// By hand: the cumulative curve peaks at the start of day 120
	// (C = 600) and bottoms at the start of day 241 (C = 600 - 2.5 - 1190
	// - 2.5 = -595): freezing index 1195 degC day over 121 days. The
	// thaw after it: 124 days at +5 = 620. Mean: (600 - 5 - 1190 + 620)/365.
	want := Winter{Label: "winter 1", Start: (181 + 120) * Day, End: (181 + 241) * Day, Days: 121,
		FreezingIndex: 1195, ThawingIndex: 620, MeanTemperature: 25.0 / 365, Complete: true}
	if w.Label != want.Label || w.Start != want.Start || w.End != want.End || w.Days != want.Days ||
		math.Abs(w.FreezingIndex-want.FreezingIndex) > 1e-9 || math.Abs(w.ThawingIndex-want.ThawingIndex) > 1e-9 ||
		math.Abs(w.MeanTemperature-want.MeanTemperature) > 1e-12 || w.Complete != want.Complete || w.ThawComplete {
		t.Errorf("got  %+v\nwant %+v", w, want)
	}
	// The same index from the plain degree-day sum of the daily means.
	_, m, _ := DailyMeans(tt, vv)
	if below, _ := DegreeDays(m, Day, 0); math.Abs(below-w.FreezingIndex) > 1e-9 {
		t.Errorf("degree-day sum %v != freezing index %v", below, w.FreezingIndex)
	}
}

func TestWintersSeveralYearsAndCalendar(t *testing.T) {
	// Synthetic: three box winters (cold -10, -5, -20 degC) one after
	// another, written as a daily CSV from 1 July 2021 with real dates, so
	// that 29 Feb 2024 lies in the third winter year.
	start := time.Date(2021, 7, 1, 0, 0, 0, 0, time.UTC)
	var b strings.Builder
	b.WriteString("# invented test data\ndate,t\n")
	colds := []float64{-10, -5, -20}
	d := start
	for y, c := range colds {
		end := start.AddDate(y+1, 0, 0)
		j := 0
		for ; d.Before(end); d = d.AddDate(0, 0, 1) {
			u := 5.0
			if j >= 121 && j <= 240 {
				u = c
			}
			b.WriteString(d.Format("2006-01-02") + "," + ftoa(u) + "\n")
			j++
		}
	}
	// No closing row: the row of 30 June 2024 stands for its whole day
	// (Series.Covered), so the third winter year is complete.
	s, err := ReadCSV(strings.NewReader(b.String()), "winters.csv", CSVOptions{TimeColumn: "date", Columns: []string{"t"}, MaxGap: 25 * time.Hour})
	if err != nil {
		t.Fatal(err)
	}
	ws, err := s.Winters("t", WinterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(ws) != 3 {
		t.Fatalf("%d winters, want 3", len(ws))
	}
	for i, c := range colds {
		// By hand as in TestWintersHandChecked: 2 ramp days of (5 + c)/2
		// and 119 days at c below zero.
		fi := -(119*c + (5 + c))
		days := 121.0
		if c == -5 {
			// The ramp days average exactly 0 degC and leave C flat;
			// ties go to the earliest peak and the earliest trough.
			days = 120
		}
		w := ws[i]
		if math.Abs(w.FreezingIndex-fi) > 1e-9 || w.Days != days || !w.Complete {
			t.Errorf("winter %d: %+v, want index %v over %v days", i, w, fi, days)
		}
		wantStart := start.AddDate(i, 0, 120)
		if !w.StartTime.Equal(wantStart) {
			t.Errorf("winter %d starts %v, want %v", i, w.StartTime, wantStart)
		}
		wantLabel := []string{"2021/22", "2022/23", "2023/24"}[i]
		if w.Label != wantLabel {
			t.Errorf("label %q, want %q", w.Label, wantLabel)
		}
	}
	// Thaw between winters 1 and 2: from the end of winter 1 (start of
	// day 241 of the 365-day year 2021/22, so 124 days of +5 left) through
	// the 120 days of +5 before the next winter: 244 days at +5.
	if got := ws[0].ThawingIndex; math.Abs(got-244*5) > 1e-9 || !ws[0].ThawComplete {
		t.Errorf("thaw after winter 1 = %v (complete %v), want 1220", got, ws[0].ThawComplete)
	}
	if got, err := DesignFreezingIndex(FreezingIndices(ws)); err != nil || math.Abs(got-(1195+595+2395)/3.0) > 1e-9 {
		t.Errorf("design index %v, %v; want mean of the three", got, err)
	}
}

func ftoa(x float64) string { return strconv.FormatFloat(x, 'f', -1, 64) }

func TestDesignFreezingIndex(t *testing.T) {
	// Synthetic indices (degC day), chronological.
	tests := []struct {
		name string
		in   []float64
		want float64
		err  bool
	}{
		{"three", []float64{100, 300, 200}, 200, false},
		{"five", []float64{100, 900, 200, 800, 700}, 800, false},
		// 32 winters: the two oldest (very cold) fall outside the latest 30.
		{"latest 30 only", append([]float64{5000, 4000}, seq(30, 10, 10)...), (300 + 290 + 280) / 3.0, false},
		{"too few", []float64{1, 2}, 0, true},
		{"negative", []float64{1, -2, 3}, 0, true},
	}
	for _, tc := range tests {
		got, err := DesignFreezingIndex(tc.in)
		if (err != nil) != tc.err || math.Abs(got-tc.want) > 1e-9 {
			t.Errorf("%s: got %v, %v; want %v (error %v)", tc.name, got, err, tc.want, tc.err)
		}
	}
}

func seq(n int, a, d float64) []float64 {
	s := make([]float64, n)
	for i := range s {
		s[i] = a + float64(i)*d
	}
	return s
}

func TestWintersThawSpellAndSouthern(t *testing.T) {
	// Synthetic box winter (see boxWinter) with a mild spell: u_j = +5 for
	// j = 170..179. By hand the daily means change on days 169 and 179
	// (-10 -> -2.5) and 170..178 (-10 -> +5): the fall of the cumulative
	// curve shrinks by 7.5 + 9*15 + 7.5 = 150 to 1045 degC day, and the
	// season still runs from day 120 to day 241 (the spell is netted out).
	tt, vv := boxWinter(181, 5, -10)
	for j := 170; j <= 179; j++ {
		vv[j] = 5
	}
	ws, err := Winters(tt, vv, WinterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if w := ws[0]; math.Abs(w.FreezingIndex-1045) > 1e-9 || w.Days != 121 || w.Start != 301*Day {
		t.Errorf("thaw spell: %+v, want 1045 degC day over 121 days from day 301", w)
	}
	// Southern: winter years split at 1 January; the same box placed at
	// day 0 is one complete winter year with the same index.
	tt, vv = boxWinter(0, 5, -10)
	ws, err = Winters(tt, vv, WinterOptions{Southern: true})
	if err != nil {
		t.Fatal(err)
	}
	if len(ws) != 1 || math.Abs(ws[0].FreezingIndex-1195) > 1e-9 || !ws[0].Complete || ws[0].Start != 120*Day {
		t.Errorf("southern: %+v", ws)
	}
	// Threshold -10 degC: the cold days sit exactly on it and every other
	// day is above it, so there is no freezing season.
	ws, err = Winters(tt, vv, WinterOptions{Southern: true, Threshold: -10})
	if err != nil {
		t.Fatal(err)
	}
	if ws[0].FreezingIndex != 0 || ws[0].Days != 0 {
		t.Errorf("threshold -10: %+v, want no season", ws[0])
	}
}

// hourlyCSV writes an invented hourly record from start (inclusive) to end
// (inclusive): +5 degC, with -10 degC from 1 November to 28 February.
func hourlyCSV(start, end time.Time) string {
	var b strings.Builder
	b.WriteString("# invented test data\ntime,t\n")
	for d := start; !d.After(end); d = d.Add(time.Hour) {
		u := 5.0
		if m := d.Month(); m >= time.November || m <= time.February {
			u = -10
		}
		b.WriteString(d.Format("2006-01-02T15:04") + "," + ftoa(u) + "\n")
	}
	return b.String()
}

// TestWinterCoverage checks the coverage rule of Series.Covered: the last
// sample of an hourly or daily record stands for the step it begins, so a
// record whose last sample is 30 June 23:00 (hourly) or 30 June (daily)
// covers the winter year to its end, and one that stops an hour (a day)
// earlier does not. [derived: the rule as documented on Series.Covered]
func TestWinterCoverage(t *testing.T) {
	utc := func(y int, m time.Month, d, h int) time.Time { return time.Date(y, m, d, h, 0, 0, 0, time.UTC) }
	start := utc(2022, time.July, 1, 0)
	tests := []struct {
		name     string
		end      time.Time
		daily    bool
		complete bool
	}{
		{"hourly to 30 June 23:00", utc(2023, time.June, 30, 23), false, true},
		{"hourly to 30 June 22:00", utc(2023, time.June, 30, 22), false, false},
		{"hourly to 1 July 00:00", utc(2023, time.July, 1, 0), false, true},
		{"daily to 30 June", utc(2023, time.June, 30, 0), true, true},
		{"daily to 29 June", utc(2023, time.June, 29, 0), true, false},
	}
	var reference float64 // freezing index of the first complete case
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			text := hourlyCSV(start, tc.end)
			if tc.daily {
				var b strings.Builder
				for i, line := range strings.Split(text, "\n") {
					if i < 2 || strings.Contains(line, "T00:00") {
						b.WriteString(strings.Replace(line, "T00:00", "", 1) + "\n")
					}
				}
				text = b.String()
			}
			s, err := ReadCSV(strings.NewReader(text), "c.csv", CSVOptions{TimeColumn: "time", Columns: []string{"t"}, MaxGap: 25 * time.Hour})
			if err != nil {
				t.Fatal(err)
			}
			_, to := s.Covered()
			if want := s.T[len(s.T)-1] + s.Step; to != want {
				t.Errorf("covered to %v s, want the last sample plus one step %v s", to, want)
			}
			ws, err := s.Winters("t", WinterOptions{})
			if err != nil {
				t.Fatal(err)
			}
			if len(ws) != 1 || ws[0].Label != "2022/23" {
				t.Fatalf("winters %+v, want 2022/23 only", ws)
			}
			if ws[0].Complete != tc.complete {
				t.Errorf("complete = %v, want %v", ws[0].Complete, tc.complete)
			}
			if !tc.daily && tc.complete {
				// The held last hour changes nothing in the winter: the
				// index equals that of the record one hour longer.
				if reference == 0 {
					reference = ws[0].FreezingIndex
				} else if math.Abs(ws[0].FreezingIndex-reference) > 1e-9 {
					t.Errorf("freezing index %v, want %v as for the other complete record", ws[0].FreezingIndex, reference)
				}
			}
		})
	}
	// A record sparser than daily ends at its last sample.
	s := &Series{T: []float64{0, 10 * Day, 20 * Day}, Step: 10 * Day}
	if _, to := s.Covered(); to != 20*Day {
		t.Errorf("sparse record covered to %v s, want its last sample %v s", to, 20*Day)
	}
}
