package climate

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"time"
)

// DegreeDays sums a regularly sampled temperature series against a
// threshold (degC): below = sum of max(threshold - v, 0) step/Day and
// above = sum of max(v - threshold, 0) step/Day, both in degC day (K day)
// and both >= 0. Each sample stands for one step (s) of time.
//
// With daily means (step = Day) and threshold 0 this is the usual air
// freezing and thawing degree-day sum; ISO 13793 writes the freezing index
// in K h, that is 24 times the sum of daily mean degrees below 0 degC
// [2nd-hand]. With hourly samples it is
// the time integral, which is larger on days that cross the threshold.
func DegreeDays(values []float64, step, threshold float64) (below, above float64) {
	for _, v := range values {
		d := v - threshold
		if d < 0 {
			below -= d
		} else {
			above += d
		}
	}
	f := step / Day
	return below * f, above * f
}

// integral returns the cumulative trapezoid integral of the piecewise
// linear curve through (t[i], v[i]): I[i] = integral from t[0] to t[i] of
// v dt (unit of v times s).
func integral(t, v []float64) []float64 {
	I := make([]float64, len(t))
	for i := 1; i < len(t); i++ {
		I[i] = I[i-1] + 0.5*(v[i]+v[i-1])*(t[i]-t[i-1])
	}
	return I
}

// integralTo returns the integral from t[0] to x (t[0] <= x <= t[n-1]),
// searching from hint j (t[j] <= x); it returns the new hint.
func integralTo(t, v, I []float64, x float64, j int) (float64, int) {
	for j < len(t)-2 && t[j+1] <= x {
		j++
	}
	if x <= t[0] {
		return 0, 0
	}
	if x >= t[len(t)-1] {
		return I[len(I)-1], j
	}
	vx := lerpAt(t, v, j, x)
	return I[j] + 0.5*(v[j]+vx)*(x-t[j]), j
}

// DailyMeans averages a series over whole days of the time axis: day k
// covers [k Day, (k+1) Day) s, midnight to midnight when the axis origin is
// a midnight (as for Series). Each mean is the time integral of the linear
// interpolant over the day divided by Day, so irregular sampling is
// weighted by time. Only days wholly inside [t[0], t[n-1]] are returned:
// means[i] belongs to day first+i. t must be strictly increasing.
func DailyMeans(t, v []float64) (first int, means []float64, err error) {
	if err := checkTV(t, v, 2); err != nil {
		return 0, nil, err
	}
	first = int(math.Ceil(t[0]/Day - 1e-9))
	last := int(math.Floor(t[len(t)-1]/Day+1e-9)) - 1 // last whole day
	if last < first {
		return first, nil, nil
	}
	I := integral(t, v)
	means = make([]float64, last-first+1)
	j := 0
	a, j := integralTo(t, v, I, float64(first)*Day, j)
	for k := range means {
		b, jj := integralTo(t, v, I, float64(first+k+1)*Day, j)
		j = jj
		means[k] = (b - a) / Day
		a = b
	}
	return first, means, nil
}

func checkTV(t, v []float64, minN int) error {
	if len(t) != len(v) {
		return fmt.Errorf("climate: %d times but %d values", len(t), len(v))
	}
	if len(t) < minN {
		return fmt.Errorf("climate: need at least %d samples, have %d", minN, len(t))
	}
	for i := range t {
		if math.IsNaN(v[i]) || math.IsInf(v[i], 0) || math.IsNaN(t[i]) || math.IsInf(t[i], 0) {
			return fmt.Errorf("climate: sample %d is not a finite number", i)
		}
		if i > 0 && !(t[i] > t[i-1]) {
			return fmt.Errorf("climate: times must increase (sample %d at %g s follows %g s)", i, t[i], t[i-1])
		}
	}
	return nil
}

// MeanTemperature returns the time-weighted mean of the linear interpolant
// of (t, v) over [t[0], t[n-1]] (degC). Over a whole number of years it is
// the mean annual temperature.
func MeanTemperature(t, v []float64) (float64, error) {
	if err := checkTV(t, v, 2); err != nil {
		return 0, err
	}
	I := integral(t, v)
	return I[len(I)-1] / (t[len(t)-1] - t[0]), nil
}

// WinterOptions controls how Winters splits a record into freezing seasons.
type WinterOptions struct {
	// Threshold is the temperature the degree-days are counted from,
	// degC; 0 (the default) is the freezing point of water.
	Threshold float64
	// Southern splits the record into winter years at 1 January instead
	// of 1 July, for places where winter is in mid-year.
	Southern bool
	// Origin is the calendar time of t = 0 (Series.Start). When set, the
	// winter years are split at real calendar dates and Winter carries
	// dates and a label; when zero, years are 365 days from t = 0.
	Origin time.Time
	// End is the end of the time the record covers, s on the axis (see
	// Series.Covered, which Series.Winters uses). Between the last sample
	// and End the last value is held. Zero, or a time not after the last
	// sample, ends the record at its last sample.
	End float64
}

// Covered returns the span of time the record covers, s on the series
// axis: [T[0], T[n-1]+Step). Each sample stands for the interval of one
// typical step (Step) that it begins: an hourly value stamped 23:00 stands
// for 23:00 to 24:00, a daily value stamped 00:00 for its day. So an
// hourly record whose last sample is 30 June 23:00 covers its winter year
// (1 July to 30 June) to the end (common practice for hourly and daily
// climate records, whose values are means or samples of the interval they
// begin). The record's value is held over that last step. Records
// sparser than one value a day are read as points of a curve and end at
// their last sample. Winters, and with it every caller of Series.Winters
// (the indices command and the runs that follow a record), use this one
// rule to call a winter year complete (see WinterYearCovered).
func (s *Series) Covered() (from, to float64) {
	n := len(s.T)
	if n == 0 {
		return 0, 0
	}
	to = s.T[n-1]
	if s.Step > 0 && s.Step <= Day*(1+1e-9) {
		to += s.Step
	}
	return s.T[0], to
}

// WinterYearCovered reports whether data covering [from, to) (s) covers
// the whole winter year [a, b) (s), within 1 s of round-off: the rule by
// which a winter is Complete. For a record, [from, to) is Series.Covered.
func WinterYearCovered(from, to, a, b float64) bool {
	return from <= a+1 && to >= b-1
}

// Winter is one freezing season, read from the cumulative degree-day curve.
//
// Definition (common practice; the cumulative-curve procedure of the US
// Army frost-design manuals TM 5-852-6 / UFC 3-130-01 [memory]): with daily
// mean air temperatures m_k, the curve C_k = sum_{j<=k} (m_j - Threshold)
// (degC day) rises in the warm season and falls in the cold one. Within one
// winter year (1 July to 30 June; 1 January to 31 December with Southern),
// the freezing season runs from a highest point of C to the following
// lowest point, chosen so that the fall of C between them is largest; that
// fall is the freezing index. Mild spells inside the winter stay inside the
// season; their thaw is netted out, as on the plotted curve. The thawing index is the rise of C from this season's end to
// the start of the next freezing season (or to the highest point left in
// the record).
type Winter struct {
	Label      string    // "2019/20" (calendar years spanned) or "winter 1"
	Start, End float64   // freezing season bounds, s on the time axis
	StartTime  time.Time // Start and End as dates, when Origin is set
	EndTime    time.Time
	Days       float64 // freezing-season length, days
	// FreezingIndex is the air freezing index of the season, degC day (>= 0).
	FreezingIndex float64
	// ThawingIndex is the thawing index of the warm season after this
	// winter, degC day (>= 0).
	ThawingIndex float64
	// MeanTemperature is the mean of the daily means over the winter year
	// (1 July to 30 June), degC: the mean annual temperature for that year.
	MeanTemperature float64
	// Complete is true when the record covers the whole winter year
	// (WinterYearCovered; a record's last sample stands for one step, see
	// Series.Covered); the first and last winters of a record are often
	// partial and then understate the index.
	Complete bool
	// ThawComplete is true when the record reaches the next freezing
	// season, so that ThawingIndex covers the whole warm season.
	ThawComplete bool
}

// Winters splits a record (t in s on the series axis, v in degC) into
// winter years and reads each freezing season from the cumulative daily
// degree-day curve (see Winter for the definition). It needs at least two
// whole days. The record covers [t[0], o.End) (to t[n-1] when End is not
// after it); winters that it covers only partly are returned with Complete
// false (WinterYearCovered).
func Winters(t, v []float64, o WinterOptions) ([]Winter, error) {
	if n := len(t); n > 0 && n == len(v) && o.End > t[n-1] {
		// The last value holds to the end of the covered span.
		t = append(t[:n:n], o.End)
		v = append(v[:n:n], v[n-1])
	}
	first, m, err := DailyMeans(t, v)
	if err != nil {
		return nil, err
	}
	if len(m) < 2 {
		return nil, errors.New("climate: the record holds fewer than two whole days")
	}
	// Cumulative curve: C[i] at the start of day first+i (C[0] = 0).
	C := make([]float64, len(m)+1)
	for i, x := range m {
		C[i+1] = C[i] + (x - o.Threshold)
	}
	dayStart := func(i int) float64 { return float64(first+i) * Day }
	// Winter-year boundaries, in whole days on the axis.
	boundary := func(y int) int { // day index of the split that starts winter year y
		if !o.Origin.IsZero() {
			y0 := o.Origin.Year()
			mo := time.July
			if o.Southern {
				mo = time.January
			}
			b := time.Date(y0+y, mo, 1, 0, 0, 0, 0, o.Origin.Location())
			return int(math.Round(b.Sub(o.Origin).Seconds() / Day))
		}
		d := y * 365
		if !o.Southern {
			d += 181
		}
		return d
	}
	lastDay := first + len(m) // exclusive
	y := 0
	for boundary(y+1) <= first {
		y++
	}
	for boundary(y) > first {
		y--
	}
	var ws []Winter
	for ; boundary(y) < lastDay; y++ {
		a, b := boundary(y), boundary(y+1)
		complete := WinterYearCovered(t[0], t[len(t)-1], float64(a)*Day, float64(b)*Day)
		ia, ib := max(a, first)-first, min(b, lastDay)-first // indices into C
		if ib-ia < 1 {
			continue
		}
		// Largest fall of C within the window (peak to following trough).
		start, end, peak := ia, ia, ia
		for i := ia; i <= ib; i++ {
			if C[i] > C[peak] {
				peak = i
			}
			if C[peak]-C[i] > C[start]-C[end] {
				start, end = peak, i
			}
		}
		w := Winter{
			Start:         dayStart(start),
			End:           dayStart(end),
			Days:          float64(end - start),
			FreezingIndex: C[start] - C[end],
			Complete:      complete,
		}
		var sum float64
		for i := ia; i < ib; i++ {
			sum += m[i]
		}
		w.MeanTemperature = sum / float64(ib-ia)
		if !o.Origin.IsZero() {
			w.StartTime = o.Origin.Add(time.Duration(w.Start) * time.Second)
			w.EndTime = o.Origin.Add(time.Duration(w.End) * time.Second)
			y0 := o.Origin.Year() + y
			if o.Southern {
				w.Label = fmt.Sprintf("%d", y0)
			} else {
				w.Label = fmt.Sprintf("%d/%02d", y0, (y0+1)%100)
			}
		}
		ws = append(ws, w)
	}
	// Thawing index: from this winter's end to the next winter's start.
	for i := range ws {
		if ws[i].Label == "" {
			ws[i].Label = fmt.Sprintf("winter %d", i+1)
		}
		e := int(math.Round(ws[i].End/Day)) - first
		if i+1 < len(ws) {
			s := int(math.Round(ws[i+1].Start/Day)) - first
			ws[i].ThawingIndex = C[s] - C[e]
			ws[i].ThawComplete = ws[i+1].Complete
			continue
		}
		hi := e
		for k := e; k < len(C); k++ {
			if C[k] > C[hi] {
				hi = k
			}
		}
		ws[i].ThawingIndex = C[hi] - C[e]
	}
	return ws, nil
}

// Winters reads the freezing seasons of a temperature column; the
// options' Origin is set to the series start so that winters are split at
// real calendar dates, and End to the end of the span the record covers
// (Covered: the last sample stands for one step). See the package function
// Winters.
func (s *Series) Winters(column string, o WinterOptions) ([]Winter, error) {
	v, err := s.Value(column)
	if err != nil {
		return nil, err
	}
	o.Origin = s.Start
	_, o.End = s.Covered()
	ws, err := Winters(s.T, v, o)
	if err != nil {
		return nil, fmt.Errorf("%s: column %q: %w", s.Name, column, err)
	}
	return ws, nil
}

// FreezingIndices returns the freezing indices (degC day) of the complete
// winters, in order.
func FreezingIndices(ws []Winter) []float64 {
	var f []float64
	for _, w := range ws {
		if w.Complete {
			f = append(f, w.FreezingIndex)
		}
	}
	return f
}

// DesignFreezingIndex returns the mean of the three largest freezing
// indices (degC day) among the latest 30 of indices, which are in
// chronological order: the design air freezing index "average of the three
// coldest winters in 30 years" used for pavements (the criterion named in
// UFC 3-130-04 (TM 5-852-4 / AFM 88-19 Chap. 4), chapter 4, beside Table
// 4-1 [read]; the rule as set
// out in TM 5-852-6 / AFR 88-19 Vol. 6, 1988, "Calculation methods for
// determination of depths of freeze and thaw in soils" [memory]). Records shorter than 30 winters use all they have; fewer than
// three winters is an error. The caller should say how many winters were
// used: a short record understates the design value. Design frost depths
// are set by local codes and a licensed engineer; this index is an input
// to their methods, not a substitute.
func DesignFreezingIndex(indices []float64) (float64, error) {
	if len(indices) < 3 {
		return 0, fmt.Errorf("climate: the design freezing index needs at least 3 winters, have %d", len(indices))
	}
	for i, x := range indices {
		if math.IsNaN(x) || math.IsInf(x, 0) || x < 0 {
			return 0, fmt.Errorf("climate: freezing index %d is %g, want a finite value >= 0", i+1, x)
		}
	}
	if len(indices) > 30 {
		indices = indices[len(indices)-30:]
	}
	s := append([]float64(nil), indices...)
	sort.Sort(sort.Reverse(sort.Float64Slice(s)))
	return (s[0] + s[1] + s[2]) / 3, nil
}

// RecordWarnings returns the warnings that a record's winters call for
// before their indices are used for design, in plain words: winter years
// the record covers only partly (left out of the design index and the
// return-period fit), too few complete winters for a design index (it
// needs 3), fewer than the 30 winters the design index asks for (it then
// likely understates the design value), and a return period of
// returnPeriod years (0: none) longer than the record. The indices command
// and the report of a run that follows a record print the same warnings.
func RecordWarnings(ws []Winter, returnPeriod float64) []string {
	n := len(FreezingIndices(ws))
	var out []string
	if n < len(ws) {
		out = append(out, fmt.Sprintf("%d of %d winter years are only partly covered by the record; their indices are shown but not used for the design index or the return-period fit", len(ws)-n, len(ws)))
	}
	switch {
	case n < 3:
		out = append(out, fmt.Sprintf("no design freezing index: it needs at least 3 complete winters, the record has %d", n))
	case n < 30:
		out = append(out, fmt.Sprintf("design freezing index from %d winters, fewer than the 30 the rule asks for: it likely understates the design value", n))
	}
	if n >= 3 && returnPeriod > float64(n) {
		out = append(out, fmt.Sprintf("the %g-year index extrapolates from %d winters: its uncertainty is wide; compare the methods and local code values", returnPeriod, n))
	}
	return out
}
