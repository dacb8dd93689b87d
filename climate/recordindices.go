package climate

import (
	"fmt"
	"math"
	"strings"
	"time"
)

// IndicesOptions are the choices of AnalyzeRecord.
type IndicesOptions struct {
	Threshold    float64   // degC from which degree-days are counted
	Southern     bool      // split winter years at 1 January
	ReturnPeriod float64   // years (> 1) of the Gumbel return-period index
	Method       FitMethod // of the Gumbel fit
}

// RecordIndices is what AnalyzeRecord reads from a temperature record (the
// `tempstack indices` command prints it as a table or as JSON). Keys carry their units like results.json: _C degC, _K kelvin
// (temperature differences), _Cd degC day, _h hours. Values that cannot be
// computed from the record are null, with the reason in notes.
type RecordIndices struct {
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

	Winters         []IndicesWinter `json:"winters"`
	CompleteWinters int             `json:"complete_winters"`

	MeanAnnualTemperature_C *float64 `json:"mean_annual_temperature_C"`
	MeanAnnualYears         float64  `json:"mean_annual_years"`
	MeanAnnualFrom          string   `json:"mean_annual_from,omitempty"`
	MeanAnnualTo            string   `json:"mean_annual_to,omitempty"`

	DesignFreezingIndex_Cd *float64 `json:"design_freezing_index_Cd"`
	DesignWinters          int      `json:"design_winters"`

	Gumbel *IndicesGumbel `json:"gumbel"`

	AnnualHarmonic *IndicesHarmonic `json:"annual_harmonic"`

	BridgedGaps     int     `json:"bridged_gaps"`
	LongestBridge_h float64 `json:"longest_bridged_gap_h"`
	MaxGap_h        float64 `json:"max_gap_h"`

	Notes []string `json:"notes"`
}

// IndicesWinter is one row of the winter table (see climate.Winter).
type IndicesWinter struct {
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

// IndicesGumbel is the Gumbel fit to the complete winters' indices.
type IndicesGumbel struct {
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

// IndicesHarmonic is the least-squares annual harmonic of the record.
type IndicesHarmonic struct {
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

// AnalyzeRecord reads the freezing and thawing indices of each winter
// year of the temperature column col of s, the mean annual temperature
// over the complete winter years, the design freezing index, a Gumbel fit
// with its return-period index, the annual harmonic and the bridged holes.
// File, Column, Unit and MaxGap_h describe how the record was read and are
// left to the caller. Errors come from splitting the record into winters.
func AnalyzeRecord(s *Series, col string, o IndicesOptions) (*RecordIndices, error) {
	records, first, last := len(s.T), s.Times[0], s.Times[len(s.Times)-1]
	daily := isDailyRecord(s)
	if daily {
		s = asDayMeans(s, col)
	}
	rep := &RecordIndices{
		Column:      col,
		Records:     records,
		First:       first.Format(time.RFC3339),
		Last:        last.Format(time.RFC3339),
		Step_h:      s.Step / 3600,
		Threshold_C: o.Threshold,
		Southern:    o.Southern,
		DailyMeans:  daily,
		Winters:     []IndicesWinter{},
		Notes:       []string{},
	}
	if daily {
		rep.note("one row per day at 00:00: each value is taken as the mean of its day")
	}
	// Winters and indices: Series.Winters (cumulative-curve definition
	// documented on Winter).
	ws, err := s.Winters(col, WinterOptions{Threshold: o.Threshold, Southern: o.Southern})
	if err != nil {
		return nil, err
	}
	for _, w := range ws {
		rep.Winters = append(rep.Winters, IndicesWinter{
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
	fi := FreezingIndices(ws)
	rep.CompleteWinters = len(fi)
	// The short-record warnings, worded as in the report of a run that
	// follows a record (RecordWarnings).
	rep.Notes = append(rep.Notes, RecordWarnings(ws, o.ReturnPeriod)...)
	rep.meanAnnual(s, col, ws)
	rep.design(fi)
	rep.gumbel(fi, o)
	rep.harmonic(s, col)
	rep.BridgedGaps = len(s.Bridged)
	for _, g := range s.Bridged {
		rep.LongestBridge_h = math.Max(rep.LongestBridge_h, g.To.Sub(g.From).Hours())
	}
	return rep, nil
}

func (rep *RecordIndices) note(format string, a ...any) {
	rep.Notes = append(rep.Notes, fmt.Sprintf(format, a...))
}

// meanAnnual sets the mean annual temperature over the whole winter years
// covered.
func (rep *RecordIndices) meanAnnual(s *Series, col string, ws []Winter) {
	m, from, to, years, ok := meanOverWholeYears(s, col, ws, rep.Southern)
	if !ok {
		rep.note("no whole winter year in the record: no mean annual temperature")
		return
	}
	rep.MeanAnnualTemperature_C = &m
	rep.MeanAnnualYears = years
	rep.MeanAnnualFrom, rep.MeanAnnualTo = from.Format(time.DateOnly), to.Format(time.DateOnly)
}

// design sets the design freezing index: mean of the 3 coldest of the
// latest 30 winters, the pavement criterion named in UFC 3-130-04
// (TM 5-852-4), chapter 4 [read]; rule as set out in TM 5-852-6 /
// AFR 88-19 Vol. 6, 1988 [memory].
func (rep *RecordIndices) design(fi []float64) {
	if d, err := DesignFreezingIndex(fi); err == nil {
		rep.DesignFreezingIndex_Cd = &d
		rep.DesignWinters = min(len(fi), 30)
	}
}

// gumbel sets the Gumbel fit and its return-period index (ASCE 32-01 uses
// the 100-year air freezing index, ASCE 32-01 [2nd-hand]).
func (rep *RecordIndices) gumbel(fi []float64, o IndicesOptions) {
	g, err := GumbelFit(fi, o.Method)
	if err != nil {
		rep.note("no Gumbel fit: %s", strings.TrimPrefix(err.Error(), "climate: "))
		return
	}
	T := o.ReturnPeriod
	key, _ := o.Method.MarshalText()
	rep.Gumbel = &IndicesGumbel{
		Method: string(key), Winters: g.N,
		Location_Cd: g.Location, Scale_Cd: g.Scale,
		ReturnPeriod_y: T, ReturnLevel_Cd: g.ReturnLevel(T),
		ByMethod_Cd:   map[string]float64{},
		SampleMean_Cd: g.SampleMean, SampleStdDev_Cd: g.SampleStdDev,
	}
	for _, m := range []FitMethod{Moments, MaxLikelihood, ReducedVariate} {
		if gm, err := GumbelFit(fi, m); err == nil {
			k, _ := m.MarshalText()
			rep.Gumbel.ByMethod_Cd[string(k)] = gm.ReturnLevel(T)
		}
	}
}

// harmonic sets the annual harmonic by least squares (FitHarmonics). Least
// squares weights every sample alike; when rows are missing, the fit uses
// the record resampled at its typical spacing (the bridged holes by linear
// interpolation) so that every stretch of time counts by its length.
func (rep *RecordIndices) harmonic(s *Series, col string) {
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
	p, fit, err := FitHarmonics(ft, fv, []float64{Year})
	if err != nil {
		rep.note("no annual harmonic: %s", err)
		return
	}
	h := p.Harmonics[0]
	// Scenario convention: day 1 is 1 January, the peak at noon.
	day := h.Peak/Day + 0.5
	if day > 365 {
		day -= 365
	}
	peak := time.Date(2001, time.January, 1, 0, 0, 0, 0, time.UTC).Add(time.Duration(h.Peak * float64(time.Second)))
	rep.AnnualHarmonic = &IndicesHarmonic{
		Mean_C: p.Mean, Amplitude_K: h.Amplitude, PeakDay: day,
		PeakDate: peak.Format("2 January"), FitRMS_K: fit.RMS, FitR2: fit.R2, Samples: fit.N,
	}
}

// isDailyRecord reports whether a series has one row per day: every stamp
// at 00:00 (in its own UTC offset) and a typical spacing of one day.
func isDailyRecord(s *Series) bool {
	if s.Step != Day {
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
// asDayMeans, s. It must stay below the 1e-9 day that DailyMeans
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
func asDayMeans(s *Series, col string) *Series {
	v := s.Values[col]
	n := len(s.T)
	out := &Series{
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
		out.T = append(out.T, t+Day-dayMeanEps)
		out.Times = append(out.Times, s.Times[i].Add(time.Duration((Day-dayMeanEps)*float64(time.Second))))
		out.Lines = append(out.Lines, s.Lines[i])
		vv = append(vv, v[i])
	}
	out.Values[col] = vv
	return out
}

// meanOverWholeYears returns the time mean of the linear interpolant of
// the record over the winter years that it covers completely (from the
// start of the first complete winter year to the end of the last one), by
// MeanTemperature. Over whole years this is the mean annual
// temperature.
func meanOverWholeYears(s *Series, col string, ws []Winter, southern bool) (m float64, from, to time.Time, years float64, ok bool) {
	loc := s.Start.Location()
	yearStart := func(w Winter) time.Time {
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
	m, err = MeanTemperature(t, v)
	if err != nil {
		return 0, from, to, 0, false
	}
	return m, from, to, float64(n), true
}
