package scenarios

import (
	"context"
	"fmt"
	"io"
	"math"
	"math/cmplx"
	"sort"

	"tempstack/climate"
	"tempstack/layers"
	"tempstack/scenarios/results"
	"tempstack/solver"
)

// Options are the choices of a run that are not part of the scenario.
type Options struct {
	// Workers caps the goroutines a study uses (0: one per core). The
	// results do not depend on it.
	Workers int
	// Progress, when not nil, is told how far a long simulation has come.
	Progress Progress
	// Series, when not nil, receives series.csv (the simulated time
	// series; see results.CSVFiles) while the simulation runs, one row per
	// sample, so that a run of any length needs no memory per sample for
	// it; Results.SeriesStreamed then says it was written, and
	// Results.Series.Simulation keeps for the charts every sample up to
	// 32,768 samples and, beyond that, every k-th sample and the last (k
	// the smallest whole number that keeps it within 8,192). Only the
	// base run writes it, not the cases of a study; nothing is written
	// when the scenario has no simulation. Without Series every sample
	// stays in memory.
	Series io.Writer

	// settled shares settled starts with the cases of a study (set by
	// Run; see settleCache).
	settled *settleCache
}

// run is one run of a scenario: the scenario, which the run only reads,
// and what the run learns on the way (the fitted surface forcing, the
// depth the periodic wave reaches, a record's return-period fit).
type run struct {
	*Scenario
	ctx  context.Context
	opts Options

	surface        *Forcing // effective surface forcing, fitted once (see surfaceForcing)
	surfaceInexact bool     // the fit leaves a residual: the periodic start is only a guess
	waveDepth      float64  // ground: deepest depth a periodic swing of 0.1 K reaches, m
	returnPeriod   *results.ReturnPeriodIndex
	probeFrozen    []sampleFlags // per probe: the simulation's samples at or below the freezing point there
}

// Run solves a decoded scenario: the steady and exact periodic analyses
// (and, in later stages, the transient simulation and the frost analysis)
// and returns the collected results in the units of the output contract.
//
// Run first makes every check that Check makes (the plan), so a scenario
// is refused before anything is solved. It does not change s: one decoded
// scenario may be run any number of times, also at once. When ctx is
// cancelled, Run stops at the next case of a study or before the next
// simulation and returns ctx.Err().
func Run(ctx context.Context, sc *Scenario, opts Options) (*results.Results, error) {
	if opts.settled == nil {
		opts.settled = newSettleCache()
	}
	s := &run{Scenario: sc, ctx: ctx, opts: opts}
	progress := opts.Progress
	if s.Kind == Room {
		return runRoomStudy(s)
	}
	if s.Kind != Wall && s.Kind != Ground {
		return nil, &Error{File: s.File, Key: "kind", Msg: fmt.Sprintf("kind %q is not supported by this version", s.Kind)}
	}
	p, err := s.plan()
	if err != nil {
		return nil, err
	}
	if err := planStudy(s.Scenario); err != nil {
		return nil, err
	}
	var r *results.Results
	if s.Kind == Wall {
		r, err = runWall(s, p, progress)
	} else {
		r, err = runGround(s, p, progress)
	}
	if err != nil {
		return nil, err
	}
	r.SimulationSkipped = p.skipped
	r.Warnings = append(r.Warnings, sideNotes(s.Scenario)...)
	r.Warnings = append(WarningTexts(Warnings(s.Scenario)), r.Warnings...)
	r.TitleBlock = s.TitleBlock
	r.Cautions = results.CautionsWith(r, recordWarnings(s.Scenario, r))
	r.Records = s.records()
	r.Forcing = s.forcingInfo()
	if s.Analysis.Fit != nil {
		if err := runFit(s, r); err != nil {
			return nil, err
		}
	}
	if s.Study == nil {
		return r, nil
	}
	if err := runStudy(s, r); err != nil {
		return nil, err
	}
	return r, nil
}

// construction returns the scenario's layers as a construction.
func (s *Scenario) construction() layers.Construction {
	return layers.Construction{Layers: s.Layers, Orientation: s.Orientation}
}

// column returns the solver column of the scenario.
func (s *Scenario) column() solver.Column {
	return s.construction().Column(s.Inside.SurfaceResistance(), s.Outside.Resistance)
}

func runWall(s *run, p *runPlan, progress Progress) (*results.Results, error) {
	col := p.col
	c := s.construction()
	r := &results.Results{
		Title:        s.Title,
		Kind:         s.Kind,
		ScenarioFile: s.File,
		Orientation:  s.Orientation.String(),
	}
	rsi, rse := s.Inside.SurfaceResistance(), s.Outside.Resistance
	r.Steady = results.Steady{
		UValue_W_m2K:             c.UValue(rsi, rse),
		ThermalResistance_m2K_W:  c.ThermalResistance(),
		TotalResistance_m2K_W:    c.TotalResistance(rsi, rse),
		InsideSurfaceResistance:  rsi,
		OutsideSurfaceResistance: rse,
	}
	if c.HasMix() {
		cm, err := combinedMethod(c, rsi, rse)
		if err != nil {
			return nil, &Error{File: s.File, Key: "layers", Err: err}
		}
		r.Steady.CombinedMethod = cm
	}
	r.Layers = layerResults(s.Layers, s.Analysis.Periods[0])

	for _, per := range s.Analysis.Periods {
		pp, err := solver.Periodic(col, per)
		if err != nil {
			return nil, &Error{File: s.File, Key: "analysis.periods", Err: err}
		}
		r.Periodic = append(r.Periodic, periodicResult(pp))
	}
	if err := wallSeries(s, col, r); err != nil {
		return nil, err
	}
	if p.simulate {
		res, err := simulate(s, col, r, progress)
		if err != nil {
			return nil, err
		}
		periodicChecks(s.Scenario, r, res)
	}
	if s.Analysis.StepResponse != nil {
		if err := stepResponse(s, col, r); err != nil {
			return nil, err
		}
	}
	return r, nil
}

// EquivalentLayerNote says how the periodic analysis and the simulation
// treat a mixed layer (layers.Construction.Homogenised).
const EquivalentLayerNote = "each mixed layer is replaced by an equivalent homogeneous layer: conductivity chosen so that the layers in series give the combined method's R_T (the layer's lower-limit resistance plus its share, in proportion to that resistance, of the difference between R_T and the lower limit), density and volumetric heat capacity weighted by area fraction"

// combinedMethod is the combined method of ISO 6946 for construction c
// with mixed layers, for results.json.
func combinedMethod(c layers.Construction, rsi, rse float64) (*results.CombinedMethod, error) {
	cr, err := c.Combined(rsi, rse)
	if err != nil {
		return nil, err
	}
	return &results.CombinedMethod{
		UpperLimit_m2K_W: cr.Upper,
		LowerLimit_m2K_W: cr.Lower,
		Mean_m2K_W:       cr.Total,
		RelativeError:    cr.RelativeError,
		Paths:            cr.Paths,
		Equivalent:       EquivalentLayerNote,
	}, nil
}

func layerResults(ls []layers.Layer, period float64) []results.Layer {
	out := make([]results.Layer, len(ls))
	for i, l := range ls {
		out[i] = results.Layer{
			Name:               l.Name,
			Material:           l.MaterialKey,
			Source:             l.Source,
			Family:             l.Family,
			Thickness_m:        l.Thickness,
			Conductivity_W_mK:  l.Conductivity,
			Density_kg_m3:      l.Density,
			SpecificHeat_J_kgK: l.SpecificHeat,
			Resistance_m2K_W:   l.ThermalResistance(),
		}
		if l.Conductivity > 0 && l.Density > 0 && l.SpecificHeat > 0 {
			out[i].PenetrationDepth_m = l.PenetrationDepth(period)
			out[i].Diffusivity_m2_s = l.Diffusivity()
			out[i].Effusivity_Ws05_m2K = l.Effusivity()
		}
		for _, p := range l.Mix {
			out[i].Mix = append(out[i].Mix, results.MixPart{
				Name:               p.Layer.Name,
				Material:           p.Layer.MaterialKey,
				Fraction:           p.Fraction,
				Conductivity_W_mK:  p.Layer.Conductivity,
				Density_kg_m3:      p.Layer.Density,
				SpecificHeat_J_kgK: p.Layer.SpecificHeat,
				Resistance_m2K_W:   p.Layer.ThermalResistance(),
			})
		}
		if f := l.Freeze; f != nil {
			out[i].Freezing = true
			out[i].ConductivityFrozen_W_mK = f.ConductivityFrozen
			out[i].HeatCapacityFrozen_J_m3K = f.HeatCapacityFrozen
			out[i].LatentHeat_J_m3 = f.LatentHeat
			out[i].FreezingPoint_C = f.Point
		}
	}
	return out
}

func periodicResult(p solver.PeriodicProperties) results.PeriodicResult {
	return results.PeriodicResult{
		Period_h:                        p.Period / 3600,
		DecrementFactor:                 p.DecrementFactor,
		TimeShift_h:                     p.TimeShift / 3600,
		TimeShiftUnwrapped_h:            p.TimeShiftUnwrapped / 3600,
		PeriodicTransmittance_W_m2K:     p.PeriodicTransmittance,
		InsideAdmittance_W_m2K:          p.InsideAdmittance,
		InsideAdmittanceLead_h:          p.InsideAdmittanceLead / 3600,
		OutsideAdmittance_W_m2K:         p.OutsideAdmittance,
		OutsideAdmittanceLead_h:         p.OutsideAdmittanceLead / 3600,
		InsideArealHeatCapacity_kJ_m2K:  p.InsideArealHeatCapacity / 1000,
		OutsideArealHeatCapacity_kJ_m2K: p.OutsideArealHeatCapacity / 1000,
		SurfaceFactor:                   p.SurfaceFactorMagnitude,
		SurfaceFactorLag_h:              p.SurfaceFactorLag / 3600,
	}
}

// phasorAt returns the complex amplitude of the forcing's component of
// period p (s), 0 when it has none.
func phasorAt(f *Forcing, p float64) complex128 {
	if f == nil || f.Step != nil {
		return 0
	}
	var z complex128
	for _, h := range f.Harmonics {
		if math.Abs(h.Period-p) <= 1e-9*p {
			z += h.Phasor()
		}
	}
	return z
}

// meanOf returns the mean of a temperature forcing (degC), or def when the
// side has none.
func meanOf(f *Forcing, def float64) float64 {
	if f == nil {
		return def
	}
	return f.Mean
}

// harmonicSet is the set of distinct periods of both forcings, with their
// complex amplitudes on each side.
type harmonicSet struct {
	periods         []float64
	outside, inside []complex128
}

func forcingHarmonics(out, in *Forcing) harmonicSet {
	var hs harmonicSet
	add := func(p float64) {
		for _, q := range hs.periods {
			if math.Abs(q-p) <= 1e-9*p {
				return
			}
		}
		hs.periods = append(hs.periods, p)
	}
	for _, f := range []*Forcing{out, in} {
		if f == nil || f.Step != nil {
			continue
		}
		for _, h := range f.Harmonics {
			add(h.Period)
		}
	}
	for _, p := range hs.periods {
		hs.outside = append(hs.outside, phasorAt(out, p))
		hs.inside = append(hs.inside, phasorAt(in, p))
	}
	return hs
}

// wallSeries fills the chart series of a wall: one cycle of the first
// analysis period, the temperature envelope across the construction and
// the frequency response.
func wallSeries(s *run, col solver.Column, r *results.Results) error {
	ser := &r.Series
	P := s.Analysis.Periods[0]
	out := s.surfaceForcing()
	tOutMean := meanOf(out, 0)
	tInMean := meanOf(s.Inside.temperature(), 20)
	L := col.Thickness()

	// Mean (steady) state.
	ends := []float64{0, L}
	steadyT, steadyQ, err := solver.Steady(col, tOutMean, tInMean, ends)
	if err != nil {
		return &Error{File: s.File, Err: err}
	}

	// One cycle of the first analysis period.
	zo, zi := phasorAt(out, P), phasorAt(s.Inside.temperature(), P)
	if s.surface != nil { // the forcing was fitted
		why := "the sol-air temperature (the irradiance counts as zero when its harmonics go negative at night)"
		if s.Outside.Temperature.Measured != nil {
			why = "the measured outside temperature"
		}
		r.Warnings = append(r.Warnings, why+" is not a pure sum of harmonics: the exact one-period chart and temperature range use its least-squares fit of mean and harmonics; the simulation follows it exactly")
	}
	if zo == 0 && zi == 0 {
		zo = 1
		r.Warnings = append(r.Warnings, fmt.Sprintf(
			"the outside temperature has no %s swing; the one-period chart shows the response to a 1 K outside swing peaking at t = 0",
			fmtHours(P)))
	}
	th, q, err := solver.Harmonic(col, P, zo, zi, ends)
	if err != nil {
		return &Error{File: s.File, Err: err}
	}
	const n = 97
	w := 2 * math.Pi / P
	for k := 0; k < n; k++ {
		t := P * float64(k) / float64(n-1)
		e := cmplx.Exp(complex(0, w*t))
		ser.Cycle.Time_h = append(ser.Cycle.Time_h, t/3600)
		ser.Cycle.OutsideAir_C = append(ser.Cycle.OutsideAir_C, tOutMean+real(zo*e))
		ser.Cycle.InsideAir_C = append(ser.Cycle.InsideAir_C, tInMean+real(zi*e))
		ser.Cycle.OutsideSurface_C = append(ser.Cycle.OutsideSurface_C, steadyT[0]+real(th[0]*e))
		ser.Cycle.InsideSurface_C = append(ser.Cycle.InsideSurface_C, steadyT[1]+real(th[1]*e))
		ser.Cycle.InsideFlux_W_m2 = append(ser.Cycle.InsideFlux_W_m2, steadyQ+real(q[1]*e))
	}

	// Envelope across the construction, all forcing harmonics superposed.
	xs := profilePositions(col, 160)
	meanT, _, err := solver.Steady(col, tOutMean, tInMean, xs)
	if err != nil {
		return &Error{File: s.File, Err: err}
	}
	hs := forcingHarmonics(out, s.Inside.temperature())
	amps := make([][]complex128, len(hs.periods))
	for i, p := range hs.periods {
		amps[i], _, err = solver.Harmonic(col, p, hs.outside[i], hs.inside[i], xs)
		if err != nil {
			return &Error{File: s.File, Err: err}
		}
	}
	ser.Profile.Position_m = xs
	ser.Profile.Mean_C = meanT
	ser.Profile.Min_C, ser.Profile.Max_C = envelope(meanT, hs.periods, amps)
	ser.Profile.Interfaces_m = col.Interfaces()

	// Frequency response.
	ps := solver.LogPeriods(s.Analysis.Response.From, s.Analysis.Response.To, s.Analysis.Response.Points)
	resp, err := solver.Response(col, ps)
	if err != nil {
		return &Error{File: s.File, Err: err}
	}
	for _, p := range resp {
		ser.Response.Period_h = append(ser.Response.Period_h, p.Period/3600)
		ser.Response.Decrement = append(ser.Response.Decrement, p.DecrementFactor)
		ser.Response.TimeShift_h = append(ser.Response.TimeShift_h, p.TimeShiftUnwrapped/3600)
	}
	return nil
}

// profilePositions returns about n positions across the column, including
// every layer interface (twice where a resistance layer makes a jump is not
// needed: positions are geometric).
func profilePositions(col solver.Column, n int) []float64 {
	L := col.Thickness()
	var xs []float64
	for k := 0; k <= n; k++ {
		xs = append(xs, L*float64(k)/float64(n))
	}
	xs = append(xs, col.Interfaces()...)
	return sortUnique(xs, L*1e-9)
}

// envelope samples the superposed harmonics over the longest period and
// returns the minimum and maximum temperature at each position.
func envelope(mean []float64, periods []float64, amps [][]complex128) (lo, hi []float64) {
	lo = append([]float64(nil), mean...)
	hi = append([]float64(nil), mean...)
	if len(periods) == 0 {
		return lo, hi
	}
	longest, shortest := periods[0], periods[0]
	for _, p := range periods {
		longest = math.Max(longest, p)
		shortest = math.Min(shortest, p)
	}
	steps := int(math.Min(24*longest/shortest, 20000))
	if steps < 48 {
		steps = 48
	}
	rot := make([]complex128, len(periods))
	for k := 0; k < steps; k++ {
		t := longest * float64(k) / float64(steps)
		for i, p := range periods {
			rot[i] = cmplx.Exp(complex(0, 2*math.Pi*t/p))
		}
		for j := range mean {
			v := mean[j]
			for i := range periods {
				v += real(amps[i][j] * rot[i])
			}
			lo[j] = math.Min(lo[j], v)
			hi[j] = math.Max(hi[j], v)
		}
	}
	return lo, hi
}

func sortUnique(xs []float64, tol float64) []float64 {
	s := append([]float64(nil), xs...)
	sort.Float64s(s)
	out := s[:0]
	for i, x := range s {
		if i == 0 || x-out[len(out)-1] > tol {
			out = append(out, x)
		}
	}
	return out
}

func fmtHours(p float64) string {
	switch {
	case math.Abs(p-climate.Day) < 1:
		return "daily"
	case math.Abs(p-climate.Year) < 1:
		return "annual"
	}
	return fmt.Sprintf("%g h", p/3600)
}

// ptr returns a pointer to a copy of v.
func ptr(v float64) *float64 { return &v }
