package scenarios

import (
	"fmt"
	"math"
	"math/cmplx"

	"tempstack/climate"
	"tempstack/ground"
	"tempstack/solver"
)

// hasNFactors reports whether the side turns air into surface temperature
// with n-factors other than 1.
func (sd Side) hasNFactors() bool {
	return sd.Temperature != nil && (sd.NFreezing != 1 || sd.nThawing() != 1)
}

// nThawing is the thawing n-factor, 1 when the cover's table gives none.
func (sd Side) nThawing() float64 {
	if sd.NThawing == 0 {
		return 1
	}
	return sd.NThawing
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
func runGround(s *Scenario, p *runPlan, progress Progress) (*Results, error) {
	col := p.col // no inside resistance: the column ends at the bottom condition
	c := s.construction()
	r := &Results{Title: s.Title, Kind: string(s.Kind), ScenarioFile: s.File}
	r.Layers = layerResults(s.Layers, climate.Year)
	r.Steady = Steady{
		ThermalResistance_m2K_W:  c.ThermalResistance(),
		OutsideSurfaceResistance: s.Outside.Resistance,
		TotalResistance_m2K_W:    c.ThermalResistance() + s.Outside.Resistance,
	}
	if s.Outside.Cover != "" && s.Outside.NThawing == 0 {
		r.Warnings = append(r.Warnings, fmt.Sprintf(
			"UFC 3-130-04 Table 4-1 gives no single thawing n-factor for cover %q; the thawing n-factor is taken as 1 (surface = air temperature above 0 degC): give n_factor: {thawing: ...} to change it",
			s.Outside.Cover))
	}
	if err := groundPeriodic(s, col, r); err != nil {
		return nil, err
	}
	if p.simulate {
		res, err := simulate(s, col, r, progress)
		if err != nil {
			return nil, err
		}
		r.Series.FrostDepth_m = res.FrostDepth
		r.Series.ThawDepth_m = res.ThawDepth
		if err := frostAnalysis(s, col, r, res); err != nil {
			return nil, err
		}
	} else if err := frostClosedForms(s, col, r); err != nil {
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
func groundPeriodic(s *Scenario, col solver.Column, r *Results) error {
	hs := col
	hs.HalfSpace = true
	f := s.surfaceForcing()
	g := &GroundTemperature{SurfaceMean_C: f.Mean, ColumnDepth_m: col.Thickness()}
	if s.Inside.Flux {
		q := s.Inside.HeatFlux
		g.GeothermalFlux_W_m2 = &q
	}
	if s.Outside.hasNFactors() {
		g.NFactorFreezing, g.NFactorThawing = s.Outside.NFreezing, s.Outside.nThawing()
	}
	probes := append([]float64(nil), s.Analysis.Probes...)
	mean, err := solver.SteadyWithBottomFlux(nonHalf(col), f.Mean, math.Max(0, s.Inside.HeatFlux), probes)
	if err != nil {
		return &Error{File: s.File, Msg: err.Error()}
	}
	for _, P := range s.Analysis.Periods {
		z := phasorAt(f, P)
		resp, err := solver.GroundPeriodic(hs, P, probes)
		if err != nil {
			return &Error{File: s.File, Key: "analysis.periods", Msg: err.Error()}
		}
		gp := GroundPeriodic{Period_h: P / 3600, SurfaceAmplitude_K: cmplx.Abs(z)}
		for j, d := range probes {
			amp := cmplx.Abs(z) * resp.AmplitudeRatio[j]
			gp.Probes = append(gp.Probes, GroundProbe{
				Depth_m: d, Amplitude_K: amp, Lag_h: resp.Lag[j] / 3600, Lag_d: resp.Lag[j] / climate.Day,
				Mean_C: mean[j], Min_C: mean[j] - amp, Max_C: mean[j] + amp,
			})
		}
		if cmplx.Abs(z) > 0.1 {
			if dd, err := solver.DampingDepth(hs, P, cmplx.Abs(z), 0.1); err == nil {
				gp.DampingDepth_m = dd
			}
		}
		g.Periodic = append(g.Periodic, gp)
		s.waveDepth = math.Max(s.waveDepth, gp.DampingDepth_m)
		if math.Abs(P-climate.Year) < 1 {
			g.SurfaceAnnualAmplitude_K = cmplx.Abs(z)
			g.AnnualDampingDepth_m = gp.DampingDepth_m
		}
	}
	if g.AnnualDampingDepth_m > col.Thickness() {
		r.Warnings = append(r.Warnings, fmt.Sprintf(
			"the column is %.1f m deep but the annual swing only falls below 0.1 K at %.1f m: the simulated bottom boundary disturbs the deepest temperatures; make the last layer thicker",
			col.Thickness(), g.AnnualDampingDepth_m))
		g.DomainDeepEnough = false
	} else {
		g.DomainDeepEnough = true
	}
	r.Ground = g
	// Exact envelope against depth for the chart.
	xs := profilePositions(nonHalf(col), 200)
	meanX, err := solver.SteadyWithBottomFlux(nonHalf(col), f.Mean, math.Max(0, s.Inside.HeatFlux), xs)
	if err != nil {
		return &Error{File: s.File, Msg: err.Error()}
	}
	var periods []float64
	var amps [][]complex128
	for _, h := range f.Harmonics {
		resp, err := solver.GroundPeriodic(hs, h.Period, xs)
		if err != nil {
			return &Error{File: s.File, Msg: err.Error()}
		}
		row := make([]complex128, len(xs))
		for j := range xs {
			row[j] = h.Phasor() * resp.Ratio[j]
		}
		periods = append(periods, h.Period)
		amps = append(amps, row)
	}
	r.Series.ProfilePosition_m = xs
	r.Series.ProfileMean_C = meanX
	r.Series.ProfileMin_C, r.Series.ProfileMax_C = envelope(meanX, periods, amps)
	r.Series.Interfaces_m = col.Interfaces()
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
// annual temperature of the forcing (periodic forcings: one year sampled
// daily, cumulative-curve season; REFERENCES section 4).
func frostClimate(s *Scenario) (ground.FrostClimate, string, bool) {
	f := s.Outside.Temperature
	if f == nil || f.Step != nil {
		return ground.FrostClimate{}, "", false
	}
	if m := f.Measured; m != nil {
		// A record: the design freezing index, the mean of the three
		// coldest complete winters of the latest 30 (REFERENCES section 4
		// [read]), with the mean season length of those winters.
		ws, err := recordWinters(m)
		if err != nil {
			return ground.FrostClimate{}, "", false
		}
		var complete []climate.Winter
		for _, w := range ws {
			if w.Complete {
				complete = append(complete, w)
			}
		}
		design, err := climate.DesignFreezingIndex(climate.FreezingIndices(ws))
		if err != nil || len(complete) < 3 {
			return ground.FrostClimate{}, "", false
		}
		sortWinters(complete)
		var days float64
		for _, w := range complete[:3] {
			days += w.Days / 3
		}
		v, _ := m.Series.Value(m.Column)
		if g, err := climate.GumbelFit(climate.FreezingIndices(ws), climate.Moments); err == nil {
			s.returnPeriod = &ReturnPeriodIndex{Winters: len(complete), Method: "Gumbel, method of moments",
				Location_Cd: g.Location, Scale_Cd: g.Scale, Years: 100, FreezingIndex_Cd: g.ReturnLevel(100)}
		}
		fc := ground.FrostClimate{AirIndex: design, NFactor: s.Outside.NFreezing, SurfaceIndex: s.Outside.NFreezing * design,
			SeasonDays: days, MeanAnnual: mean(v)}
		return fc, fmt.Sprintf("record: mean of the 3 coldest of %d complete winters", len(complete)), true
	}
	if _, ok := annualHarmonic(f); !ok {
		return ground.FrostClimate{}, "", false
	}
	// Freezing indices are sums of daily mean temperatures (REFERENCES
	// section 4; ISO 13793): components shorter than two days average out
	// of daily means, and sampling them once a day would alias them.
	slow := climate.Periodic{Mean: f.Mean}
	for _, h := range f.Harmonics {
		if h.Period >= 2*climate.Day {
			slow.Harmonics = append(slow.Harmonics, h)
		}
	}
	fc, err := ground.PeriodicFrostClimate(slow, climate.Year, climate.Day, s.Outside.NFreezing)
	if err != nil {
		return ground.FrostClimate{}, "", false
	}
	return fc, "forcing", true
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
// r.Frost from the forcing's (or the design) freezing index.
func frostClosedForms(s *Scenario, col solver.Column, r *Results) error {
	fc, source, ok := frostClimate(s)
	if r.Frost == nil {
		r.Frost = &Frost{}
	}
	fr := r.Frost
	if ok {
		fr.FreezingIndex_Cd = fc.AirIndex
		fr.SurfaceFreezingIndex_Cd = fc.SurfaceIndex
		fr.SeasonLength_d = fc.SeasonDays
		fr.MeanAnnualAir_C = fc.MeanAnnual
		fr.IndexSource = source
		fr.ReturnPeriod = s.returnPeriod
	}
	fr.FreezingNFactor = s.Outside.NFreezing
	if d := s.Analysis.DesignFreezingIndex; d != nil {
		if !ok {
			fc = ground.FrostClimate{MeanAnnual: s.Outside.Temperature.Mean}
		}
		fc.AirIndex = *d
		fc.NFactor = s.Outside.NFreezing
		fc.SurfaceIndex = s.Outside.NFreezing * *d
		if s.Analysis.DesignSeason > 0 {
			fc.SeasonDays = s.Analysis.DesignSeason / climate.Day
		}
		if fc.SeasonDays == 0 {
			return &Error{File: s.File, Line: s.Analysis.DesignLine, Key: "analysis.design_season_length",
				Msg: "the forcing has no freezing season to take the season length from; give design_season_length"}
		}
		v := *d
		fr.DesignFreezingIndex_Cd = &v
		fr.IndexSource = "design"
		// The headline index is the one the closed forms use; the
		// forcing's own index stays beside it.
		if fr.FreezingIndex_Cd > 0 {
			fi := fr.FreezingIndex_Cd
			fr.ForcingFreezingIndex_Cd = &fi
		}
		fr.FreezingIndex_Cd = fc.AirIndex
		fr.SurfaceFreezingIndex_Cd = fc.SurfaceIndex
		fr.SeasonLength_d = fc.SeasonDays
		ok = true
	}
	if !ok || fc.SurfaceIndex <= 0 {
		fr.StefanDepth_m, fr.ModifiedBerggrenDepth_m = 0, 0
		return nil
	}
	depth, b, err := closedForms(col, fc)
	if err != nil {
		r.Warnings = append(r.Warnings, "no closed-form frost depth: "+err.Error())
		return nil
	}
	fr.StefanDepth_m = depth
	fr.ModifiedBerggrenDepth_m = b.Depth
	fr.BerggrenLambda, fr.BerggrenAlpha, fr.BerggrenMu = b.Lambda, b.Alpha, b.Mu
	if fc.MeanAnnual < 0 {
		r.Warnings = append(r.Warnings, "the mean annual temperature is below 0 degC (permafrost conditions): modified Berggren is used with alpha = 0 and does not describe the active layer")
	}
	if math.Max(depth, b.Depth) > col.Thickness() {
		r.Warnings = append(r.Warnings, fmt.Sprintf("the closed-form frost depth (%.2f m) exceeds the column depth (%.2f m): make the last layer thicker", math.Max(depth, b.Depth), col.Thickness()))
	}
	return nil
}

// frostAnalysis reads the simulated frost per winter (winter years from
// 1 July to 30 June on the simulation's time axis, t = 0 on 1 January),
// frozen days at each probe, and the closed forms.
func frostAnalysis(s *Scenario, col solver.Column, r *Results, res *solver.Result) error {
	if err := frostClosedForms(s, col, r); err != nil {
		return err
	}
	fr := r.Frost
	times := res.Times
	dt := 0.0
	if len(times) > 1 {
		dt = times[1] - times[0]
	}
	end := times[len(times)-1]
	// Winter-year windows. A winter is complete when the forcing covers
	// its whole winter year, by the rule the indices command uses
	// (climate.WinterYearCovered; a record covers its last sample's step,
	// climate.Series.Covered).
	coverFrom, coverTo := times[0], end
	if m := s.Outside.Temperature.Measured; m != nil {
		coverFrom, coverTo = m.Series.Covered()
	}
	type window struct {
		from, to float64
		complete bool
	}
	var wins []window
	for y := -1; ; y++ {
		from := 181*climate.Day + float64(y)*climate.Year
		to := from + climate.Year
		if from >= end {
			break
		}
		if to <= times[0] {
			continue
		}
		w := window{math.Max(from, times[0]), math.Min(to, end), climate.WinterYearCovered(coverFrom, coverTo, from, to)}
		if w.to-w.from >= 30*climate.Day {
			wins = append(wins, w)
		}
	}
	if len(wins) == 0 || s.Outside.Temperature.Step != nil {
		wins = []window{{times[0], end, end-times[0] > climate.Year-1}}
	}
	// Air indices per winter from the forcing, sampled hourly.
	var winters []climate.Winter
	if m := s.Outside.Temperature.Measured; m != nil {
		winters, _ = recordWinters(m)
	} else {
		airT, airV := sampleForcing(s.Outside.Temperature, times[0], end)
		winters, _ = climate.Winters(airT, airV, climate.WinterOptions{})
	}
	freezePoint := func(z float64) float64 {
		l := col.Layers[col.LayerAt(z)]
		if l.Freeze != nil {
			return l.Freeze.Point
		}
		return 0
	}
	for wi, w := range wins {
		fw := FrostWinter{Label: fmt.Sprintf("winter %d", wi+1), Start_d: w.from / climate.Day, End_d: w.to / climate.Day,
			Complete: w.complete}
		// Frost left over from the last winter (deep frost still thawing
		// in July) belongs to that winter: a winter's frost counts from the
		// first time the ground is free of frost in its window. Ground that
		// never thaws (permafrost) counts throughout.
		thawed := minIn(res.FrostDepth, times, w.from, w.to) > 0
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
		fw.FrozenAllYear = fw.Complete && minIn(res.FrostDepth, times, w.from, w.to) > 0
		if fw.FrozenAllYear {
			fw.ActiveLayer_m = fw.MaxThawDepth_m
		}
		fw.MaxFrostDate = dayLabel(fw.MaxFrostDay)
		for j, z := range s.Analysis.Probes {
			fz := freezePoint(r.constructionDepth(s, z))
			n := 0
			for k, t := range times {
				if k > 0 && t >= w.from && t < w.to && res.Probe[j][k] <= fz {
					n++
				}
			}
			fw.FrozenDays = append(fw.FrozenDays, ProbeDays{Depth_m: z, Days: float64(n) * dt / climate.Day})
		}
		for _, cw := range winters {
			mid := (cw.Start + cw.End) / 2
			if mid >= w.from && mid < w.to {
				fw.AirFreezingIndex_Cd = cw.FreezingIndex
				fw.AirThawingIndex_Cd = cw.ThawingIndex
				if s.Outside.Temperature.Measured != nil && cw.Label != "" {
					fw.Label = cw.Label
					fw.Complete = cw.Complete // the record's winter, as `indices` calls it
				}
				if s.Outside.Temperature.Measured != nil && cw.Complete && cw.FreezingIndex > 0 {
					if fc, err := ground.FrostClimateFromWinter(cw, s.Outside.NFreezing); err == nil {
						if st, b, err := closedForms(col, fc); err == nil {
							fw.StefanDepth_m, fw.ModifiedBerggrenDepth_m = st, b.Depth
						}
					}
				}
			}
		}
		fr.Winters = append(fr.Winters, fw)
		fr.MaxFrostDepth_m = math.Max(fr.MaxFrostDepth_m, fw.MaxFrostDepth_m)
	}
	if fr.MaxFrostDepth_m >= 0.95*col.Thickness() {
		r.Warnings = append(r.Warnings, fmt.Sprintf("frost reaches %.2f m, the bottom of the %.2f m column: the column is too shallow for this winter; make the last layer thicker", fr.MaxFrostDepth_m, col.Thickness()))
	}
	if s.Outside.Temperature.Measured != nil && fr.IndexSource != "design" {
		r.Warnings = append(r.Warnings, "the headline Stefan and modified Berggren depths use the record's design freezing index (mean of the 3 coldest complete winters); each winter's own closed-form depths are in the winter table")
	}
	if fr.IndexSource == "design" {
		r.Warnings = append(r.Warnings, "the Stefan and modified Berggren depths use the design freezing index; the simulated depth follows the surface temperature of the scenario")
	}
	return nil
}

// constructionDepth maps a probe depth (as drawn) to the solver position.
func (r *Results) constructionDepth(s *Scenario, z float64) float64 {
	return s.construction().SolverDepth(z)
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
