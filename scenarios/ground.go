package scenarios

import (
	"fmt"
	"math"
	"math/cmplx"
	"strings"

	"tempstack/climate"
	"tempstack/ground"
	"tempstack/scenarios/results"
	"tempstack/solver"
)

// hasNFactors reports whether the side turns air into surface temperature
// with n-factors other than 1.
func (sd Environment) hasNFactors() bool {
	nf, nt := sd.nFactors()
	return sd.Temperature != nil && (nf != 1 || nt != 1)
}

// nFactors are the freezing and thawing n-factors of the side: 1 and 1
// without n-factors, a thawing n-factor of 1 when the cover's table gives
// none.
func (sd Environment) nFactors() (freezing, thawing float64) {
	n := sd.NFactors
	if n == nil {
		return 1, 1
	}
	if n.Thawing == 0 {
		return n.Freezing, 1
	}
	return n.Freezing, n.Thawing
}

// nFactored is the surface temperature for air temperature t (degC):
// n_f t below 0 degC, n_t t above. Applying the n-factors of UFC
// 3-130-04 Table 4-1 to each instant rather than to the seasonal indices is
// common practice in numerical frost models; summed over a season it gives
// exactly surface index = n x air index for a season that stays on one
// side of 0 degC.
func nFactored(t, nf, nt float64) float64 {
	if t < 0 {
		return nf * t
	}
	return nt * t
}

// annualHarmonic returns the forcing's component of one year, if any.
func annualHarmonic(f *Forcing) (climate.Harmonic, bool) {
	if f == nil {
		return climate.Harmonic{}, false
	}
	for _, h := range f.Harmonics {
		if math.Abs(h.Period-climate.Year) < 1 {
			return h, true
		}
	}
	return climate.Harmonic{}, false
}

// runGround solves a ground column: exact periodic ground temperatures,
// the transient simulation with freezing, and the frost analysis.
func runGround(s *run, p *runPlan, progress Progress) (*results.Results, error) {
	col := p.col // no inside resistance: the column ends at the bottom condition
	c := s.construction()
	r := &results.Results{Title: s.Title, Kind: s.Kind, ScenarioFile: s.File}
	r.Layers = layerResults(s.Layers, climate.Year)
	r.Steady = results.Steady{
		ThermalResistance_m2K_W:  c.ThermalResistance(),
		OutsideSurfaceResistance: s.Outside.Resistance,
		TotalResistance_m2K_W:    c.ThermalResistance() + s.Outside.Resistance,
	}
	if n := s.Outside.NFactors; n != nil && n.Cover != "" && n.Thawing == 0 {
		r.Warnings = append(r.Warnings, fmt.Sprintf(
			"UFC 3-130-04 Table 4-1 gives no single thawing n-factor for cover %q; the thawing n-factor is taken as 1 (surface = air temperature above 0 degC): give n_factor: {thawing: ...} to change it",
			n.Cover))
	}
	if err := groundPeriodic(s, col, r); err != nil {
		return nil, err
	}
	if p.simulate {
		res, err := simulate(s, col, r, progress)
		if err != nil {
			return nil, err
		}
		if err := frostAnalysis(s, col, r, res); err != nil {
			return nil, err
		}
	} else if err := frostClosedForms(s, col, r, 0, 0); err != nil {
		return nil, err
	}
	if s.Analysis.StepResponse != nil {
		if err := stepResponse(s, col, r); err != nil {
			return nil, err
		}
	}
	return r, nil
}

// groundPeriodic fills r.Ground: the exact periodic ground temperature of
// each analysis period at the probes (transfer matrices ending in a
// half-space), and the depth where the annual swing falls below 0.1 K.
func groundPeriodic(s *run, col solver.Column, r *results.Results) error {
	hs := col
	hs.HalfSpace = true
	f := s.surfaceForcing()
	g := &results.GroundTemperature{SurfaceMean_C: f.Mean, ColumnDepth_m: col.Thickness()}
	if hf, ok := s.Inside.(HeatFlux); ok {
		q := hf.Flux
		g.GeothermalFlux_W_m2 = &q
	}
	if s.Outside.hasNFactors() {
		g.NFactorFreezing, g.NFactorThawing = s.Outside.nFactors()
	}
	probes := append([]float64(nil), s.Analysis.Probes...)
	mean, err := solver.SteadyWithBottomFlux(nonHalf(col), f.Mean, math.Max(0, s.Inside.steadyFlux()), probes)
	if err != nil {
		return &Error{File: s.File, Err: err}
	}
	for _, P := range s.Analysis.Periods {
		z := phasorAt(f, P)
		resp, err := solver.GroundPeriodic(hs, P, probes)
		if err != nil {
			return &Error{File: s.File, Key: "analysis.periods", Err: err}
		}
		gp := results.GroundPeriodic{Period_h: P / 3600, SurfaceAmplitude_K: cmplx.Abs(z)}
		for j, d := range probes {
			amp := cmplx.Abs(z) * resp.AmplitudeRatio[j]
			gp.Probes = append(gp.Probes, results.GroundProbe{
				Depth_m: d, Amplitude_K: amp, Lag_h: resp.Lag[j] / 3600, Lag_d: resp.Lag[j] / climate.Day,
				Mean_C: mean[j], Min_C: mean[j] - amp, Max_C: mean[j] + amp,
			})
		}
		if cmplx.Abs(z) > 0.1 {
			if dd, err := solver.SwingDepth(hs, P, cmplx.Abs(z), 0.1); err == nil {
				gp.SwingDepth_m = dd
			}
		}
		gp.DampingDepth_m = surfaceDampingDepth(hs, P)
		g.Periodic = append(g.Periodic, gp)
		s.waveDepth = math.Max(s.waveDepth, gp.SwingDepth_m)
		if math.Abs(P-climate.Year) < 1 {
			g.SurfaceAnnualAmplitude_K = cmplx.Abs(z)
			g.AnnualSwingDepth_m = gp.SwingDepth_m
		}
	}
	if g.AnnualSwingDepth_m > col.Thickness() {
		r.Warnings = append(r.Warnings, fmt.Sprintf(
			"the column is %.1f m deep but the annual swing only falls below 0.1 K at %.1f m: the simulated bottom boundary disturbs the deepest temperatures; make the last layer thicker",
			col.Thickness(), g.AnnualSwingDepth_m))
		g.DomainDeepEnough = false
	} else {
		g.DomainDeepEnough = true
	}
	r.Ground = g
	// Exact envelope against depth for the chart.
	xs := profilePositions(nonHalf(col), 200)
	meanX, err := solver.SteadyWithBottomFlux(nonHalf(col), f.Mean, math.Max(0, s.Inside.steadyFlux()), xs)
	if err != nil {
		return &Error{File: s.File, Err: err}
	}
	var periods []float64
	var amps [][]complex128
	for _, h := range f.Harmonics {
		resp, err := solver.GroundPeriodic(hs, h.Period, xs)
		if err != nil {
			return &Error{File: s.File, Err: err}
		}
		row := make([]complex128, len(xs))
		for j := range xs {
			row[j] = h.Phasor() * resp.Ratio[j]
		}
		periods = append(periods, h.Period)
		amps = append(amps, row)
	}
	r.Series.Profile.Position_m = xs
	r.Series.Profile.Mean_C = meanX
	r.Series.Profile.Min_C, r.Series.Profile.Max_C = envelope(meanX, periods, amps)
	r.Series.Profile.Interfaces_m = col.Interfaces()
	return nil
}

func nonHalf(col solver.Column) solver.Column {
	c := col
	c.HalfSpace = false
	return c
}

// frostLayers returns the solver layers for the closed forms.
func frostLayers(col solver.Column) []solver.Layer {
	return append([]solver.Layer(nil), col.Layers...)
}

// frostClimate reads the air freezing index, season length and mean
// annual temperature of the forcing for the closed forms, with a label of
// where they come from, or the reason why there are none.
//
//   - A record: the design freezing index, the mean of the three coldest
//     complete winters of the latest 30 (the pavement criterion named in
//     UFC 3-130-04 (TM 5-852-4) chapter 4 [read]; the rule as set out in
//     TM 5-852-6 / AFR 88-19 Vol. 6, 1988 [memory]), with the mean season length of
//     those winters; with one or two complete winters, the coldest one, as
//     the frost manuals do when fewer winters are at hand (common
//     practice), said so in the label.
//   - A periodic forcing with an annual component: one year sampled daily,
//     the season from the cumulative degree-day curve.
//   - A step, a constant or only short periods: the simulated period
//     (from to), the index of its cold time and the initial temperature
//     as the mean (the ground's starting excess over freezing of the
//     Neumann problem behind modified Berggren).
func frostClimate(s *run, from, to float64) (fc ground.FrostClimate, source results.IndexSource, why string) {
	f := s.Outside.Temperature
	if f == nil {
		return fc, source, "the surface has no temperature"
	}
	nf, _ := s.Outside.nFactors()
	if m := f.Measured; m != nil {
		ws, err := recordWinters(m)
		if err != nil {
			return fc, source, "the record could not be split into winters: " + err.Error()
		}
		var complete []climate.Winter
		for _, w := range ws {
			if w.Complete {
				complete = append(complete, w)
			}
		}
		if len(complete) == 0 {
			return fc, source, "the record holds no complete winter year (1 July to 30 June)"
		}
		v, _ := m.Series.Value(m.Column)
		if g, err := climate.GumbelFit(climate.FreezingIndices(complete), climate.Moments); err == nil && len(complete) >= 3 {
			s.returnPeriod = &results.ReturnPeriodIndex{Winters: len(complete), Method: "Gumbel, method of moments",
				Location_Cd: g.Location, Scale_Cd: g.Scale, Years: 100, FreezingIndex_Cd: g.ReturnLevel(100)}
		}
		if len(complete) > 30 {
			complete = complete[len(complete)-30:]
		}
		byIndex := append([]climate.Winter(nil), complete...)
		sortWinters(byIndex)
		use := 3
		if len(complete) < 3 {
			use = 1
		}
		source = results.IndexSource{Origin: results.FromRecord, Coldest: use, Winters: len(complete), ColdestLabel: byIndex[0].Label}
		var idx, days float64
		for _, w := range byIndex[:use] {
			idx += w.FreezingIndex / float64(use)
			days += w.Days / float64(use)
		}
		if idx <= 0 {
			return fc, source, "no complete winter of the record falls below 0 degC"
		}
		return ground.FrostClimate{AirIndex: idx, NFactorFreezing: nf, SurfaceIndex: nf * idx, SeasonDays: days, MeanAnnual: mean(v)}, source, ""
	}
	if _, ok := annualHarmonic(f); ok && f.Step == nil {
		// Freezing indices are sums of daily mean temperatures (ISO 13793
		// [2nd-hand]; TM 5-852-6 [memory]): components shorter than two days average out of
		// daily means, and sampling them once a day would alias them.
		slow := climate.Periodic{Mean: f.Mean}
		for _, h := range f.Harmonics {
			if h.Period >= 2*climate.Day {
				slow.Harmonics = append(slow.Harmonics, h)
			}
		}
		fc, err := ground.PeriodicFrostClimate(slow, climate.Year, climate.Day, nf)
		if err != nil {
			return fc, source, "no freezing season in the forcing: " + err.Error()
		}
		if fc.AirIndex <= 0 {
			return fc, source, "the surface temperature never falls below 0 degC"
		}
		return fc, results.IndexSource{Origin: results.FromForcing}, ""
	}
	// A step, a constant or only short periods: the simulated cold period.
	if !(to > from) {
		return fc, source, "a step or constant surface temperature has no freezing season of its own; give analysis.simulate (its duration is the cold period) or analysis.design_freezing_index"
	}
	idx, _, cold := degreeDays(f, from, to)
	if idx <= 0 {
		return fc, source, "the surface temperature never falls below 0 degC in the simulated period"
	}
	initial := forcingMean(f)
	if v := s.Analysis.Simulate; v != nil && v.Initial != nil {
		initial = *v.Initial
	}
	return ground.FrostClimate{AirIndex: idx, NFactorFreezing: nf, SurfaceIndex: nf * idx, SeasonDays: cold, MeanAnnual: initial},
		results.IndexSource{Origin: results.FromSimulated}, ""
}

// recordWinters splits a measured air-temperature record into winters.
func recordWinters(m *Measured) ([]climate.Winter, error) {
	return m.Series.Winters(m.Column, climate.WinterOptions{Origin: m.Series.Start})
}

// sortWinters orders winters by freezing index, coldest first.
func sortWinters(ws []climate.Winter) {
	for i := 1; i < len(ws); i++ {
		for j := i; j > 0 && ws[j].FreezingIndex > ws[j-1].FreezingIndex; j-- {
			ws[j], ws[j-1] = ws[j-1], ws[j]
		}
	}
}

// closedForms returns the layered Stefan and modified Berggren depths for
// a frost climate.
func closedForms(col solver.Column, fc ground.FrostClimate) (stefan float64, b ground.BerggrenResult, err error) {
	ls := frostLayers(col)
	stefan, _, err = ground.StefanLayered(ls, fc.SurfaceIndex)
	if err != nil {
		return 0, b, err
	}
	in := fc.Berggren(ls)
	in.MeanAnnual = math.Max(0, in.MeanAnnual)
	b, err = ground.ModifiedBerggren(in)
	return stefan, b, err
}

// frostClosedForms fills the Stefan and modified Berggren depths of
// r.Frost from the forcing's (or the design) freezing index over the
// simulated period [from, to] (to <= from: not simulated). Values it
// cannot compute stay nil, with the reason in NotComputed.
func frostClosedForms(s *run, col solver.Column, r *results.Results, from, to float64) error {
	fc, source, why := frostClimate(s, from, to)
	ok := why == ""
	if r.Frost == nil {
		r.Frost = &results.Frost{}
	}
	fr := r.Frost
	if ok {
		fr.FreezingIndex_Cd = ptr(fc.AirIndex)
		fr.SurfaceFreezingIndex_Cd = ptr(fc.SurfaceIndex)
		fr.SeasonLength_d = ptr(fc.SeasonDays)
		fr.MeanAnnualAir_C = ptr(fc.MeanAnnual)
		fr.IndexSource = source
		fr.ReturnPeriod = s.returnPeriod
		if source.Origin == results.FromRecord && source.Coldest < 3 {
			r.Warnings = append(r.Warnings, "the record has fewer than 3 complete winters: the closed forms use its coldest complete winter, which understates a design freezing index (the mean of the 3 coldest of 30 winters)")
		}
	}
	nf, _ := s.Outside.nFactors()
	fr.NFactorFreezing = nf
	if d := s.Analysis.DesignFreezingIndex; d != nil {
		if !ok {
			fc = ground.FrostClimate{MeanAnnual: forcingMean(s.Outside.Temperature)}
		}
		fc.AirIndex = *d
		fc.NFactorFreezing = nf
		fc.SurfaceIndex = nf * *d
		if s.Analysis.DesignSeason > 0 {
			fc.SeasonDays = s.Analysis.DesignSeason / climate.Day
		}
		if fc.SeasonDays == 0 {
			return &Error{File: s.File, Line: s.Analysis.DesignLine, Key: "analysis.design_season_length",
				Msg: "the forcing has no freezing season to take the season length from; give design_season_length"}
		}
		fr.DesignFreezingIndex_Cd = ptr(*d)
		fr.IndexSource = results.IndexSource{Origin: results.FromDesign}
		// The headline index is the one the closed forms use; the
		// forcing's own index stays beside it.
		if fr.FreezingIndex_Cd != nil {
			fr.ForcingFreezingIndex_Cd = ptr(*fr.FreezingIndex_Cd)
		}
		fr.FreezingIndex_Cd = ptr(fc.AirIndex)
		fr.SurfaceFreezingIndex_Cd = ptr(fc.SurfaceIndex)
		fr.SeasonLength_d = ptr(fc.SeasonDays)
		fr.MeanAnnualAir_C = ptr(fc.MeanAnnual)
		ok, why = true, ""
	}
	if !ok {
		for _, k := range []string{"freezing_index_Cd", "surface_freezing_index_Cd", "season_length_d", "mean_annual_air_C"} {
			fr.SetNotComputed(k, why)
		}
	}
	if ok && fc.SurfaceIndex <= 0 {
		ok, why = false, "the surface freezing index is 0 (an n-factor of 0)"
	}
	if !ok {
		for _, k := range []string{"stefan_depth_m", "modified_berggren_depth_m", "berggren_lambda", "berggren_alpha", "berggren_mu"} {
			fr.SetNotComputed(k, why)
		}
		return nil
	}
	ls := frostLayers(col)
	if depth, _, err := ground.StefanLayered(ls, fc.SurfaceIndex); err != nil {
		fr.SetNotComputed("stefan_depth_m", err.Error())
	} else {
		fr.StefanDepth_m = ptr(depth)
	}
	in := fc.Berggren(ls)
	in.MeanAnnual = math.Max(0, in.MeanAnnual)
	if b, err := ground.ModifiedBerggren(in); err != nil {
		for _, k := range []string{"modified_berggren_depth_m", "berggren_lambda", "berggren_alpha", "berggren_mu"} {
			fr.SetNotComputed(k, err.Error())
		}
	} else {
		fr.ModifiedBerggrenDepth_m = ptr(b.Depth)
		fr.BerggrenLambda, fr.BerggrenAlpha, fr.BerggrenMu = ptr(b.Lambda), ptr(b.Alpha), ptr(b.Mu)
	}
	if fc.MeanAnnual < 0 {
		r.Warnings = append(r.Warnings, "the mean annual temperature is below 0 degC (permafrost conditions): modified Berggren is used with alpha = 0 and does not describe the active layer")
	}
	deepest := 0.0
	for _, v := range []*float64{fr.StefanDepth_m, fr.ModifiedBerggrenDepth_m} {
		if v != nil {
			deepest = math.Max(deepest, *v)
		}
	}
	if deepest > col.Thickness() {
		r.Warnings = append(r.Warnings, fmt.Sprintf("the closed-form frost depth (%.2f m) exceeds the column depth (%.2f m): make the last layer thicker", deepest, col.Thickness()))
	}
	return nil
}

// frostAnalysis reads the simulated frost per winter (winter years from
// 1 July to 30 June on the simulation's time axis, t = 0 on 1 January),
// frozen days at each probe, and the closed forms.
func frostAnalysis(s *run, col solver.Column, r *results.Results, res *solver.Result) error {
	times := res.Times
	if err := frostClosedForms(s, col, r, times[0], times[len(times)-1]); err != nil {
		return err
	}
	fr := r.Frost
	anchor := winterAnchor(s.Scenario)
	fr.WinterYearStart = anchor/climate.Day + 1
	fr.WinterYearStartDate = dayOfYear(anchor / climate.Day)
	wins, whole := winterWindows(s.Outside.Temperature, times, anchor)
	fa := frostReader{s: s.Scenario, col: col, res: res, whole: whole, probeFrozen: s.probeFrozen}
	fa.nFreezing, _ = s.Outside.nFactors()
	if m := s.Outside.Temperature.Measured; m != nil {
		fa.recordWinters, _ = recordWinters(m)
	}
	for wi, w := range wins {
		fr.Winters = append(fr.Winters, fa.winter(wi, w))
	}
	f := s.Outside.Temperature
	markSettled(fr.Winters, r.Simulation == nil || r.Simulation.SpinUpConverged, f.Measured == nil && f.Step == nil)
	frostHeadline(fr, r, col)
	if f.Measured != nil && fr.IndexSource.Origin == results.FromRecord && fr.IndexSource.Coldest >= 3 {
		r.Warnings = append(r.Warnings, "the headline Stefan and modified Berggren depths use the record's design freezing index (mean of the 3 coldest complete winters); each winter's own closed-form depths are in the winter table")
	}
	if fr.IndexSource.Origin == results.FromDesign {
		r.Warnings = append(r.Warnings, "the Stefan and modified Berggren depths use the design freezing index; the simulated depth follows the surface temperature of the scenario")
	}
	return nil
}

// winterAnchor is the time of year (s after 1 January 00:00) at which the
// winter years of a run start: the warmest time of the forcing when the run
// starts there (a harmonic ground run does by default), else 1 July, as
// the freezing-index tables count winters.
func winterAnchor(s *Scenario) float64 {
	anchor := 181 * climate.Day
	f := s.Outside.Temperature
	if f.Measured == nil && f.Step == nil && s.Analysis.Simulate.set["start"] == 0 {
		if t, ok := warmestTime(f); ok {
			anchor = t
		}
	}
	return anchor
}

// winterWindow is one winter year of a run, cut to the simulated time.
type winterWindow struct {
	from, to float64 // s
	complete bool    // the forcing covers the whole winter year
}

// winterWindows cuts the simulated times into winter years from anchor (s
// after 1 January 00:00), keeping those of 30 days or more. A winter is
// complete when the forcing covers its whole winter year, by the rule the
// indices command uses (climate.WinterYearCovered; a record covers its
// last sample's step, climate.Series.Covered). Without an annual cycle (a
// step, a constant or only short periods) the whole run is the one cold
// period, and whole is true.
func winterWindows(f *Forcing, times []float64, anchor float64) (wins []winterWindow, whole bool) {
	start, end := times[0], times[len(times)-1]
	coverFrom, coverTo := start, end
	if m := f.Measured; m != nil {
		coverFrom, coverTo = m.Series.Covered()
	}
	first := math.Floor((start-anchor)/climate.Year) * climate.Year
	for from := anchor + first; from < end; from += climate.Year {
		to := from + climate.Year
		if to <= start {
			continue
		}
		w := winterWindow{math.Max(from, start), math.Min(to, end), climate.WinterYearCovered(coverFrom, coverTo, from, to)}
		if w.to-w.from >= 30*climate.Day {
			wins = append(wins, w)
		}
	}
	if _, annual := annualHarmonic(f); len(wins) == 0 || f.Step != nil || (f.Measured == nil && !annual) {
		return []winterWindow{{start, end, true}}, true
	}
	return wins, false
}

// frostReader reads each winter of a simulated ground run.
type frostReader struct {
	s             *Scenario
	probeFrozen   []sampleFlags // per probe: the samples at or below the freezing point there (the recorder's)
	col           solver.Column
	res           *solver.Result
	whole         bool             // the one window is the whole run
	nFreezing     float64          // the surface's freezing n-factor
	recordWinters []climate.Winter // a record's own winters; nil for a forcing given as a function
}

// winter reads the winter window w (the i-th): the simulated frost and
// thaw, the frozen days at each probe, the air indices and, for a record's
// complete winter, its own closed-form depths.
func (fa *frostReader) winter(i int, w winterWindow) results.FrostWinter {
	fw := results.FrostWinter{Label: fmt.Sprintf("winter %d", i+1), Start_d: w.from / climate.Day, End_d: w.to / climate.Day,
		Complete: w.complete}
	if fa.whole {
		fw.Label = "whole run"
	}
	fa.simulatedFrost(&fw, w)
	fw.MaxFrostDate = dayLabel(fw.MaxFrostDay)
	fw.FrozenDays = fa.frozenDays(w)
	fa.airIndices(&fw, w)
	return fw
}

// simulatedFrost sets the deepest frost and thaw of the window, and
// whether the ground stays frozen all year (the active layer).
func (fa *frostReader) simulatedFrost(fw *results.FrostWinter, w winterWindow) {
	res, times := fa.res, fa.res.Times
	// Frost left over from the last winter (deep frost still thawing in
	// July) belongs to that winter: a winter's frost counts from the first
	// time the ground is free of frost in its window. Ground that never
	// thaws (permafrost) counts throughout, and so does the frost of the
	// window the run starts in (a partial winter keeps its true maximum).
	thawed := w.from <= times[0] || minIn(res.FrostDepth, times, w.from, w.to) > 0
	for k, t := range times {
		if t < w.from || t >= w.to {
			continue
		}
		if res.FrostDepth[k] == 0 {
			thawed = true
		}
		if thawed && res.FrostDepth[k] > fw.MaxFrostDepth_m {
			fw.MaxFrostDepth_m = res.FrostDepth[k]
			fw.MaxFrostDay = t / climate.Day
		}
		fw.MaxThawDepth_m = math.Max(fw.MaxThawDepth_m, res.ThawDepth[k])
	}
	// Frost that outlasts the whole winter year: permafrost below an
	// active layer.
	fw.FrozenAllYear = fw.Complete && !fa.whole && minIn(res.FrostDepth, times, w.from, w.to) > 0
	if fw.FrozenAllYear {
		fw.ActiveLayer_m = fw.MaxThawDepth_m
	}
}

// frozenDays counts the days of the window each probe spends at or below
// the freezing point of its layer.
func (fa *frostReader) frozenDays(w winterWindow) []results.ProbeDays {
	times := fa.res.Times
	dt := 0.0
	if len(times) > 1 {
		dt = times[1] - times[0]
	}
	var out []results.ProbeDays
	for j, z := range fa.s.Analysis.Probes {
		n := 0
		for k, t := range times {
			if k > 0 && t >= w.from && t < w.to && fa.probeFrozen[j].has(k) {
				n++
			}
		}
		out = append(out, results.ProbeDays{Depth_m: z, Days: float64(n) * dt / climate.Day})
	}
	return out
}

// airIndices sets the air freezing and thawing indices of the window: a
// forcing given as a function gives its own; a record's winter whose
// middle lies in the window gives its indices, its label and, when
// complete, its own closed-form depths.
func (fa *frostReader) airIndices(fw *results.FrostWinter, w winterWindow) {
	f := fa.s.Outside.Temperature
	if f.Measured == nil {
		if cw, ok := windowIndices(f, w, fa.whole); ok {
			fw.AirFreezingIndex_Cd = cw.FreezingIndex
			fw.AirThawingIndex_Cd = cw.ThawingIndex
		}
	}
	for _, cw := range fa.recordWinters {
		if mid := (cw.Start + cw.End) / 2; mid < w.from || mid >= w.to {
			continue
		}
		fw.AirFreezingIndex_Cd = cw.FreezingIndex
		fw.AirThawingIndex_Cd = cw.ThawingIndex
		if cw.Label != "" {
			fw.Label = cw.Label
			fw.Complete = cw.Complete // the record's winter, as `indices` calls it
		}
		if !cw.Complete || cw.FreezingIndex <= 0 {
			continue
		}
		if fc, err := ground.FrostClimateFromWinter(cw, fa.nFreezing); err == nil {
			if st, b, err := closedForms(fa.col, fc); err == nil {
				fw.StefanDepth_m, fw.ModifiedBerggrenDepth_m = st, b.Depth
			}
		}
	}
}

// windowIndices are the air indices of the window of a forcing given as a
// function: without an annual cycle (whole) the degree-days of the whole
// run; else the window's own winter, sampled hourly from its start over two
// years, so that the thawing season after the winter is whole too (a
// function forcing is defined beyond the run).
func windowIndices(f *Forcing, w winterWindow, whole bool) (climate.Winter, bool) {
	if whole {
		var cw climate.Winter
		cw.FreezingIndex, cw.ThawingIndex, _ = degreeDays(f, w.from, w.to)
		return cw, true
	}
	ts, vs := sampleForcing(f, w.from, w.from+2*climate.Year)
	// climate.Winters splits winter years at 1 July (day 181 of its axis):
	// put the window's start there.
	july := 181 * climate.Day
	for k := range ts {
		ts[k] += july - w.from
	}
	ws, err := climate.Winters(ts, vs, climate.WinterOptions{})
	if err != nil {
		return climate.Winter{}, false
	}
	for _, cw := range ws {
		if cw.Start >= july && cw.Start < july+climate.Year {
			return cw, true
		}
	}
	return climate.Winter{}, false
}

// markSettled marks the settled winters: all when the start had settled;
// otherwise, for a periodic forcing, a complete winter whose deepest frost
// repeats the complete winter before it within the spin-up's front
// tolerance, and every winter after it.
func markSettled(winters []results.FrostWinter, settled, periodic bool) {
	for i := range winters {
		w := &winters[i]
		w.Settled = settled
		if !settled && periodic && i > 0 && w.Complete && winters[i-1].Complete &&
			math.Abs(w.MaxFrostDepth_m-winters[i-1].MaxFrostDepth_m) < spinUpFrontTolerance {
			w.Settled = true
			settled = true
		}
	}
}

// frostHeadline sets the headline: the deepest frost of the complete,
// settled winters. Where the ground stays frozen all year (permafrost) the
// deepest ice is the permafrost base, not a seasonal frost depth: the
// headline is then the active layer (the deepest summer thaw).
func frostHeadline(fr *results.Frost, r *results.Results, col solver.Column) {
	permafrost := false
	for _, w := range fr.Winters {
		if !w.Complete || !w.Settled {
			continue
		}
		if w.FrozenAllYear {
			permafrost = true
			if fr.ActiveLayer_m == nil || w.ActiveLayer_m > *fr.ActiveLayer_m {
				fr.ActiveLayer_m = ptr(w.ActiveLayer_m)
				fr.HeadlineWinter = w.Label
			}
			continue
		}
		if fr.MaxFrostDepth_m == nil || w.MaxFrostDepth_m > *fr.MaxFrostDepth_m {
			fr.MaxFrostDepth_m = ptr(w.MaxFrostDepth_m)
			fr.HeadlineWinter = w.Label
		}
	}
	switch {
	case permafrost:
		fr.MaxFrostDepth_m = nil
		fr.SetNotComputed("max_frost_depth_m", fmt.Sprintf("permafrost: the ground below the active layer (%.2f m) stays frozen all year, so the deepest ice is the permafrost base, not a seasonal frost depth", *fr.ActiveLayer_m))
		r.Warnings = append(r.Warnings, fmt.Sprintf("permafrost: the ground stays frozen all year below an active layer of %.2f m; the headline is the active layer, and the permafrost base depends on the column depth and the deep heat flow", *fr.ActiveLayer_m))
	case fr.MaxFrostDepth_m == nil:
		why := "no complete winter year was simulated; simulate at least one whole year (analysis.simulate.duration)"
		for _, w := range fr.Winters {
			if w.Complete {
				why = "no simulated winter had settled (the spin-up did not converge); raise analysis.simulate.spin_up_cycles"
			}
		}
		fr.SetNotComputed("max_frost_depth_m", why)
	case *fr.MaxFrostDepth_m >= 0.95*col.Thickness():
		r.Warnings = append(r.Warnings, fmt.Sprintf("frost reaches %.2f m, the bottom of the %.2f m column: the column is too shallow for this winter; make the last layer thicker", *fr.MaxFrostDepth_m, col.Thickness()))
	}
}

func minIn(v, t []float64, from, to float64) float64 {
	m := math.Inf(1)
	for k := range v {
		if t[k] >= from && t[k] < to {
			m = math.Min(m, v[k])
		}
	}
	return m
}

// degreeDays integrates a forcing sampled hourly over [from, to] by the
// trapezoidal rule: the degrees below 0 degC times the days (freezing, degC
// day), the degrees above (thawing), and the days below 0 degC (cold).
func degreeDays(f *Forcing, from, to float64) (freezing, thawing, cold float64) {
	ts, vs := sampleForcing(f, from, to)
	for k := 1; k < len(ts); k++ {
		days := (ts[k] - ts[k-1]) / climate.Day
		v := 0.5 * (vs[k] + vs[k-1])
		if v < 0 {
			freezing -= v * days
			cold += days
		} else {
			thawing += v * days
		}
	}
	return freezing, thawing, cold
}

// sampleForcing samples a forcing hourly over [from, to].
func sampleForcing(f *Forcing, from, to float64) ([]float64, []float64) {
	var ts, vs []float64
	for t := from; t <= to; t += 3600 {
		ts = append(ts, t)
		vs = append(vs, f.At(t))
	}
	return ts, vs
}

// dayLabel names a day on the simulation's time axis (t = 0 on 1 January
// of year 1, years of 365 days) as "year N, D Mon".
func dayLabel(d float64) string {
	months := []struct {
		name string
		days int
	}{{"Jan", 31}, {"Feb", 28}, {"Mar", 31}, {"Apr", 30}, {"May", 31}, {"Jun", 30}, {"Jul", 31}, {"Aug", 31}, {"Sep", 30}, {"Oct", 31}, {"Nov", 30}, {"Dec", 31}}
	year := int(math.Floor(d / 365))
	doy := int(math.Floor(d - 365*float64(year)))
	for _, m := range months {
		if doy < m.days {
			return fmt.Sprintf("year %d, %d %s", year+1, doy+1, m.name)
		}
		doy -= m.days
	}
	return fmt.Sprintf("year %d", year+1)
}

// dayOfYear names a day of the year (days after 1 January 00:00, years of
// 365 days) as "18 Jul".
func dayOfYear(d float64) string {
	label := dayLabel(math.Mod(d, 365))
	if i := strings.Index(label, ", "); i >= 0 {
		return label[i+2:]
	}
	return label
}

// surfaceDampingDepth returns the textbook damping depth
// d = sqrt(2a/omega) = sqrt(a P / pi) (m; Carslaw and Jaeger, section 2.6)
// of the uppermost massive layer of c with its unfrozen properties, the
// ISO 13786 periodic penetration depth of that layer; 0 when c has none.
func surfaceDampingDepth(c solver.Column, period float64) float64 {
	for _, l := range c.Layers {
		if !l.Massless() {
			return solver.LayerPenetrationDepth(l, period)
		}
	}
	return 0
}
