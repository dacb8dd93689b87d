package scenarios

import (
	"errors"
	"fmt"
	"io"
	"math"
	"time"

	"tempstack/scenarios/results"
	"tempstack/solver"
)

// A run that streams series.csv (Options.Series) keeps in memory, for the
// report, every sample when it has at most chartSamples; a longer run
// keeps every stride-th sample and the last, stride the smallest whole
// number that brings the count within chartThinned. The charts draw at
// most about 2,000 points per line (the lowest and highest of each of
// 1,000 intervals), so the report shows nearly the same curves; the CSV
// keeps every sample. 2^15 samples are 3.7 years of hourly output.
const (
	chartSamples = 1 << 15
	chartThinned = 1 << 13
)

// seriesRecorder takes the samples of the simulation as it runs
// (solver.Problem.Observe). It writes each row of series.csv at once when
// the run streams it, keeps in full what the analyses after the run read
// (sample times, frost and thaw depth, a wall's inside heat flux) in the
// solver's Result, reduces each probe to its range and mean and a flag per
// sample at or below the freezing point there (run.probeFrozen, for the
// frozen days of each winter), and keeps the series for the charts,
// thinned when streaming a long run. The full-resolution memory is thus
// three (ground) or two (wall) numbers per sample, whatever the probes.
type seriesRecorder struct {
	s      *run
	ser    *results.SimulationSeries
	origin time.Time               // the record's start when the run follows one
	frost  bool                    // ground: frost and thaw depth columns
	wall   bool                    // a wall: the inside heat flux in full, for the periodic check
	inside bool                    // an inside environment column
	outEnv func(t float64) float64 // the outside environment, nil when none
	inEnv  func(t float64) float64 // the inside environment, nil when none

	csv    *results.SeriesWriter // nil when not streaming
	held   *heldWriter           // holds the CSV rows until the spin-up's last cycle is judged (hold); nil when not held
	row    []float64
	stamp  []byte // the sample's time stamp, reused
	stride int    // keep every stride-th sample for the charts (and the last)

	// full resolution, for the analyses after the run
	times, fluxIn, frostD, thawD []float64
	fz                           []float64     // freezing point at each probe, degC
	frozen                       []sampleFlags // per probe, samples at or below fz
	stats                        []results.Probe
	sums                         []float64 // per probe, the sum of the samples after the first

	badSurface, badProbe bool // a non-finite surface value or probe temperature
}

// newSeriesRecorder returns the recorder of a simulation of s on col for
// r. With holdUntil finite, the rows of series.csv wait in memory until a
// sample after that time (s) arrives or the run finishes: the samples up
// to it belong to a cycle that judges the spin-up
// (solver.Problem.CheckCycle), and when that cycle does not settle, the
// simulation stops there and the recorder is dropped with its rows
// unwritten.
func newSeriesRecorder(s *run, col solver.Column, r *results.Results, holdUntil float64) *seriesRecorder {
	rec := &seriesRecorder{s: s, ser: &r.Series.Simulation, frost: s.Kind == Ground, wall: s.Kind == Wall,
		inside: s.Inside.temperature() != nil, stride: 1}
	// Built once: a side's env() makes new closures at every call.
	rec.outEnv = s.Outside.env()
	if rec.inside {
		rec.inEnv = s.Inside.Boundary().Temperature
	}
	if m := s.Outside.Temperature.Measured; m != nil {
		rec.origin = m.Series.Start
	}
	rec.ser.ProbeDepth_m = append([]float64(nil), s.Analysis.Probes...)
	for _, z := range s.Analysis.Probes {
		fz := 0.0 // 0 degC in a layer that does not freeze
		if l := col.Layers[col.LayerAt(s.construction().SolverDepth(z))]; l.Freeze != nil {
			fz = l.Freeze.Point
		}
		rec.fz = append(rec.fz, fz)
		rec.stats = append(rec.stats, results.Probe{Depth_m: z, Min_C: math.Inf(1), Max_C: math.Inf(-1)})
	}
	rec.sums = make([]float64, len(rec.fz))
	if s.opts.Series != nil {
		var w io.Writer = s.opts.Series
		if !math.IsInf(holdUntil, 0) && !math.IsNaN(holdUntil) {
			rec.held = &heldWriter{w: w, until: holdUntil}
			w = rec.held
		}
		rec.csv = results.NewSeriesWriter(w, rec.layout())
		r.SeriesStreamed = true
	}
	return rec
}

// layout is the layout of the recorder's series.csv.
func (rec *seriesRecorder) layout() results.SeriesLayout {
	return results.SeriesLayout{Kind: rec.s.Kind, ProbeDepth_m: rec.s.Analysis.Probes,
		InsideEnvironment: rec.inside, Frost: rec.frost, Stamp: !rec.origin.IsZero()}
}

// heldWriter keeps what is written to it in memory until release, then
// writes that to w and passes later writes straight through.
type heldWriter struct {
	w        io.Writer
	until    float64 // s, the end of the held samples (seriesRecorder.hold)
	buf      []byte
	released bool
	err      error
}

func (h *heldWriter) Write(p []byte) (int, error) {
	if h.err != nil {
		return 0, h.err
	}
	if !h.released {
		h.buf = append(h.buf, p...)
		return len(p), nil
	}
	return h.w.Write(p)
}

// release writes the held bytes and lets later writes through.
func (h *heldWriter) release() {
	if h.released {
		return
	}
	h.released = true
	_, h.err = h.w.Write(h.buf)
	h.buf = nil
}

// observe takes one sample.
func (rec *seriesRecorder) observe(smp *solver.Sample) {
	k, t := smp.Index, smp.Time
	if rec.held != nil && t > rec.held.until {
		rec.held.release()
	}
	if k == 0 {
		rec.start(smp.Count, len(smp.Probe))
	}
	ser := rec.ser
	rec.times = append(rec.times, t)
	if rec.wall {
		rec.fluxIn = append(rec.fluxIn, smp.FluxInside)
	}
	rec.frostD = append(rec.frostD, smp.FrostDepth)
	rec.thawD = append(rec.thawD, smp.ThawDepth)
	for j, v := range smp.Probe {
		st := &rec.stats[j]
		st.Min_C = math.Min(st.Min_C, v)
		st.Max_C = math.Max(st.Max_C, v)
		if k > 0 {
			rec.sums[j] += v
		}
		if v <= rec.fz[j] {
			rec.frozen[j].set(k)
		}
		rec.badProbe = rec.badProbe || !finite(v)
	}
	if !finite(smp.SurfaceOutside) || !finite(smp.SurfaceInside) || !finite(smp.FluxOutside) || !finite(smp.FluxInside) {
		rec.badSurface = true
	}
	env, in := math.NaN(), math.NaN()
	if rec.outEnv != nil {
		env = rec.outEnv(t)
	}
	if rec.inEnv != nil {
		in = rec.inEnv(t)
	}
	stamp := rec.stamp[:0]
	if !rec.origin.IsZero() {
		stamp = rec.origin.Add(time.Duration(math.Round(t))*time.Second).AppendFormat(stamp, time.RFC3339)
		rec.stamp = stamp
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
	if !rec.origin.IsZero() {
		ser.Stamp = append(ser.Stamp, string(stamp))
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
		rec.stride = (count - 1 + chartThinned - 3) / (chartThinned - 2)
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
	if rec.wall {
		rec.fluxIn = make([]float64, 0, count)
	}
	rec.frostD = make([]float64, 0, count)
	rec.thawD = make([]float64, 0, count)
	rec.frozen = make([]sampleFlags, probes)
	rec.ser.Probes_C = make([][]float64, probes)
	for j := range rec.frozen {
		rec.frozen[j] = make(sampleFlags, (count+63)/64)
		rec.ser.Probes_C[j] = make([]float64, 0, kept)
	}
}

// finish completes the CSV, hands the full-resolution series to res and
// the frozen samples of each probe to the run, where the analyses after
// the run read them, and returns the range and mean of each probe (the
// mean over the samples after the start).
func (rec *seriesRecorder) finish(res *solver.Result) ([]results.Probe, error) {
	res.Times, res.FluxInside = rec.times, rec.fluxIn
	res.FrostDepth, res.ThawDepth = rec.frostD, rec.thawD
	rec.s.probeFrozen = rec.frozen
	for j := range rec.stats {
		rec.stats[j].Mean_C = rec.sums[j] / float64(max(1, len(rec.times)-1))
	}
	if rec.badSurface {
		return nil, errors.New("the simulation produced a non-finite temperature or flux; check that every property is physically possible")
	}
	if rec.badProbe {
		return nil, errors.New("the simulation produced a non-finite probe temperature; check that every property is physically possible")
	}
	if rec.csv != nil {
		err := rec.csv.Flush()
		if h := rec.held; h != nil {
			h.release()
			err = errors.Join(err, h.err)
		}
		if err != nil {
			return nil, fmt.Errorf("writing series.csv: %w", err)
		}
	}
	return rec.stats, nil
}

// sampleFlags is one bit per sample of a simulation.
type sampleFlags []uint64

func (f sampleFlags) set(k int)      { f[k/64] |= 1 << (k % 64) }
func (f sampleFlags) has(k int) bool { return f[k/64]&(1<<(k%64)) != 0 }

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
