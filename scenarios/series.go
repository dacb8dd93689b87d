package scenarios

import (
	"errors"
	"fmt"
	"math"
	"time"

	"tempstack/scenarios/results"
	"tempstack/solver"
)

// chartSamples is the most samples the simulated series keeps in memory
// for the report when series.csv is streamed (Options.Series): a longer
// run keeps every stride-th sample and the last, stride the smallest
// whole number that brings the count within it. The charts draw at most
// about 2,000 points per line, so the report shows the same curves; the
// CSV keeps every sample. 2^15 samples are 3.7 years of hourly output.
const chartSamples = 1 << 15

// seriesRecorder takes the samples of the simulation as it runs
// (solver.Problem.Observe). It writes each row of series.csv at once when
// the run streams it, keeps in full what the analyses after the run read
// (sample times, probes, frost and thaw depth, the inside heat flux) in
// the solver's Result, and keeps the series for the charts, thinned when
// streaming a long run.
type seriesRecorder struct {
	s      *run
	ser    *results.SimulationSeries
	origin time.Time // the record's start when the run follows one
	frost  bool      // ground: frost and thaw depth columns
	inside bool      // an inside environment column

	csv    *results.SeriesWriter // nil when not streaming
	row    []float64
	stride int // keep every stride-th sample for the charts (and the last)

	// full resolution, for the analyses after the run
	times, fluxIn, frostD, thawD []float64
	probe                        [][]float64

	badSurface, badProbe bool // a non-finite surface value or probe temperature
}

func newSeriesRecorder(s *run, r *results.Results) *seriesRecorder {
	rec := &seriesRecorder{s: s, ser: &r.Series.Simulation, frost: s.Kind == Ground,
		inside: s.Inside.Temperature != nil, stride: 1}
	if m := s.Outside.Temperature.Measured; m != nil {
		rec.origin = m.Series.Start
	}
	rec.ser.ProbeDepth_m = append([]float64(nil), s.Analysis.Probes...)
	if s.opts.Series != nil {
		rec.csv = results.NewSeriesWriter(s.opts.Series, results.SeriesLayout{Kind: s.Kind, ProbeDepth_m: s.Analysis.Probes,
			InsideEnvironment: rec.inside, Frost: rec.frost, Stamp: !rec.origin.IsZero()})
		r.SeriesStreamed = true
	}
	return rec
}

// observe takes one sample.
func (rec *seriesRecorder) observe(smp *solver.Sample) {
	k, t := smp.Index, smp.Time
	if k == 0 {
		rec.start(smp.Count, len(smp.Probe))
	}
	ser := rec.ser
	rec.times = append(rec.times, t)
	rec.fluxIn = append(rec.fluxIn, smp.FluxInside)
	rec.frostD = append(rec.frostD, smp.FrostDepth)
	rec.thawD = append(rec.thawD, smp.ThawDepth)
	for j, v := range smp.Probe {
		rec.probe[j] = append(rec.probe[j], v)
		rec.badProbe = rec.badProbe || !finite(v)
	}
	for _, v := range []float64{smp.SurfaceOutside, smp.SurfaceInside, smp.FluxOutside, smp.FluxInside} {
		rec.badSurface = rec.badSurface || !finite(v)
	}
	env, in := envAt(rec.s.Outside, t), math.NaN()
	if rec.inside {
		in = envAt(rec.s.Inside, t)
	}
	stamp := ""
	if !rec.origin.IsZero() {
		stamp = rec.origin.Add(time.Duration(math.Round(t)) * time.Second).Format(time.RFC3339)
	}
	if rec.csv != nil {
		row := append(rec.row[:0], t/3600, env, smp.SurfaceOutside)
		row = append(row, smp.Probe...)
		row = append(row, smp.SurfaceInside)
		if rec.inside {
			row = append(row, in)
		}
		row = append(row, smp.MeanFluxOutside, smp.MeanFluxInside)
		if rec.frost {
			row = append(row, smp.FrostDepth, smp.ThawDepth)
		}
		rec.row = row
		rec.csv.Row(stamp, row)
	}
	if k%rec.stride != 0 && k != smp.Count-1 {
		return
	}
	ser.Time_h = append(ser.Time_h, t/3600)
	if stamp != "" {
		ser.Stamp = append(ser.Stamp, stamp)
	}
	ser.OutsideAir_C = append(ser.OutsideAir_C, env)
	if rec.inside {
		ser.InsideAir_C = append(ser.InsideAir_C, in)
	}
	ser.OutsideSurface_C = append(ser.OutsideSurface_C, smp.SurfaceOutside)
	ser.InsideSurface_C = append(ser.InsideSurface_C, smp.SurfaceInside)
	// Charts and CSV show the flux averaged over each output interval (the
	// heat that went through, as in the energy balance): an instantaneous
	// flux into a freezing surface cell spikes between samples.
	ser.OutsideFlux_W_m2 = append(ser.OutsideFlux_W_m2, smp.MeanFluxOutside)
	ser.InsideFlux_W_m2 = append(ser.InsideFlux_W_m2, smp.MeanFluxInside)
	for j, v := range smp.Probe {
		ser.Probes_C[j] = append(ser.Probes_C[j], v)
	}
	if rec.frost {
		ser.FrostDepth_m = append(ser.FrostDepth_m, smp.FrostDepth)
		ser.ThawDepth_m = append(ser.ThawDepth_m, smp.ThawDepth)
	}
}

// start sizes the stores for a run of count samples.
func (rec *seriesRecorder) start(count, probes int) {
	if rec.csv != nil && count > chartSamples {
		rec.stride = (count - 1 + chartSamples - 3) / (chartSamples - 2)
	}
	kept := (count-1)/rec.stride + 2
	ser := rec.ser
	ser.Time_h = make([]float64, 0, kept)
	if !rec.origin.IsZero() {
		ser.Stamp = make([]string, 0, kept)
	}
	ser.OutsideAir_C = make([]float64, 0, kept)
	if rec.inside {
		ser.InsideAir_C = make([]float64, 0, kept)
	}
	ser.OutsideSurface_C = make([]float64, 0, kept)
	ser.InsideSurface_C = make([]float64, 0, kept)
	ser.OutsideFlux_W_m2 = make([]float64, 0, kept)
	ser.InsideFlux_W_m2 = make([]float64, 0, kept)
	if rec.frost {
		ser.FrostDepth_m = make([]float64, 0, kept)
		ser.ThawDepth_m = make([]float64, 0, kept)
	}
	rec.times = make([]float64, 0, count)
	rec.fluxIn = make([]float64, 0, count)
	rec.frostD = make([]float64, 0, count)
	rec.thawD = make([]float64, 0, count)
	rec.probe = make([][]float64, probes)
	rec.ser.Probes_C = make([][]float64, probes)
	for j := range rec.probe {
		rec.probe[j] = make([]float64, 0, count)
		rec.ser.Probes_C[j] = make([]float64, 0, kept)
	}
}

// finish completes the CSV and hands the full-resolution series to res,
// where the analyses after the run read them.
func (rec *seriesRecorder) finish(res *solver.Result) error {
	res.Times, res.FluxInside, res.Probe = rec.times, rec.fluxIn, rec.probe
	res.FrostDepth, res.ThawDepth = rec.frostD, rec.thawD
	if rec.badSurface {
		return errors.New("the simulation produced a non-finite temperature or flux; check that every property is physically possible")
	}
	if rec.badProbe {
		return errors.New("the simulation produced a non-finite probe temperature; check that every property is physically possible")
	}
	if rec.csv != nil {
		if err := rec.csv.Flush(); err != nil {
			return fmt.Errorf("writing series.csv: %w", err)
		}
	}
	return nil
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
