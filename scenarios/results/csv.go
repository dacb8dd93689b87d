package results

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"io"
	"math"
	"strconv"
)

// CSVFile is one CSV output of a run: UTF-8, comma separated, dot decimal,
// a header row whose names carry the units. A file the run already wrote
// while it ran (series.csv, see Results.SeriesStreamed) has Streamed set
// and no Data.
type CSVFile struct {
	Name     string
	Data     []byte
	Streamed bool
}

// CSVFiles returns the CSV outputs of a run, in a fixed order:
// periodic.csv (ISO 13786 properties per period), response.csv (frequency
// response), profile.csv (temperature envelope through the column) and
// series.csv (the transient simulation: time, environment and surface
// temperatures, probe temperatures, surface heat fluxes and, for ground,
// frost and thaw depth), step_response.csv and cycle.csv (one period of
// the exact periodic state), each only when its data exist.
func CSVFiles(r *Results) []CSVFile {
	var out []CSVFile
	if len(r.Periodic) > 0 {
		rows := [][]float64{}
		for _, p := range r.Periodic {
			rows = append(rows, []float64{p.Period_h, p.DecrementFactor, p.TimeShift_h, p.TimeShiftUnwrapped_h,
				p.PeriodicTransmittance_W_m2K, p.InsideAdmittance_W_m2K, p.InsideAdmittanceLead_h,
				p.OutsideAdmittance_W_m2K, p.OutsideAdmittanceLead_h,
				p.InsideArealHeatCapacity_kJ_m2K, p.OutsideArealHeatCapacity_kJ_m2K,
				p.SurfaceFactor, p.SurfaceFactorLag_h})
		}
		out = append(out, table("periodic.csv", []string{"period_h", "decrement_factor", "time_shift_h", "time_shift_unwrapped_h",
			"periodic_transmittance_W_m2K", "inside_admittance_W_m2K", "inside_admittance_lead_h",
			"outside_admittance_W_m2K", "outside_admittance_lead_h",
			"inside_areal_heat_capacity_kJ_m2K", "outside_areal_heat_capacity_kJ_m2K",
			"surface_factor", "surface_factor_lag_h"}, rows))
	}
	s := &r.Series
	if len(s.Response.Period_h) > 0 {
		out = append(out, table("response.csv", []string{"period_h", "decrement_factor", "time_shift_unwrapped_h"},
			columns(s.Response.Period_h, s.Response.Decrement, s.Response.TimeShift_h)))
	}
	if len(s.Profile.Position_m) > 0 {
		out = append(out, table("profile.csv", []string{"position_m", "min_C", "mean_C", "max_C"},
			columns(s.Profile.Position_m, s.Profile.Min_C, s.Profile.Mean_C, s.Profile.Max_C)))
	}
	if r.SeriesStreamed {
		out = append(out, CSVFile{Name: "series.csv", Streamed: true})
	} else if len(s.Simulation.Time_h) > 0 {
		out = append(out, seriesCSV(r))
	}
	if len(s.Step.Time_s) > 0 {
		out = append(out, table("step_response.csv", []string{"time_s", "surface_heat_flux_W_m2", "half_space_heat_flux_W_m2"},
			columns(s.Step.Time_s, s.Step.Flux_W_m2, s.Step.FluxHalfSpace_W_m2)))
	}
	if len(s.Cycle.Time_h) > 0 {
		out = append(out, table("cycle.csv", []string{"time_h", "outside_air_C", "outside_surface_C", "inside_surface_C", "inside_air_C", "inside_heat_flux_W_m2"},
			columns(s.Cycle.Time_h, s.Cycle.OutsideAir_C, s.Cycle.OutsideSurface_C, s.Cycle.InsideSurface_C, s.Cycle.InsideAir_C, s.Cycle.InsideFlux_W_m2)))
	}
	return append(out, roomCSV(r)...)
}

// columns turns equal-length column slices into rows.
func columns(cols ...[]float64) [][]float64 {
	if len(cols) == 0 {
		return nil
	}
	rows := make([][]float64, len(cols[0]))
	for i := range rows {
		row := make([]float64, len(cols))
		for j, c := range cols {
			if i < len(c) {
				row[j] = c[i]
			} else {
				row[j] = math.NaN()
			}
		}
		rows[i] = row
	}
	return rows
}

// table renders a CSV file; NaN and Inf are written as empty cells.
func table(name string, header []string, rows [][]float64) CSVFile {
	var b bytes.Buffer
	w := csv.NewWriter(&b)
	w.Write(header)
	rec := make([]string, len(header))
	for _, row := range rows {
		for j, v := range row {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				rec[j] = ""
			} else {
				rec[j] = strconv.FormatFloat(v, 'g', 10, 64)
			}
		}
		w.Write(rec)
	}
	w.Flush()
	return CSVFile{Name: name, Data: b.Bytes()}
}

// seriesCSV is the simulated time series, from the samples kept in
// memory, in the same bytes as a SeriesWriter writes while the simulation
// runs.
func seriesCSV(r *Results) CSVFile {
	s := &r.Series.Simulation
	stamps := len(s.Stamp) == len(s.Time_h) && len(s.Stamp) > 0
	var b bytes.Buffer
	w := NewSeriesWriter(&b, SeriesLayout{Kind: r.Kind, ProbeDepth_m: s.ProbeDepth_m,
		InsideEnvironment: len(s.InsideAir_C) > 0, Frost: len(s.FrostDepth_m) > 0, Stamp: stamps})
	cols := [][]float64{s.Time_h, s.OutsideAir_C, s.OutsideSurface_C}
	for j := range s.ProbeDepth_m {
		cols = append(cols, s.Probes_C[j])
	}
	cols = append(cols, s.InsideSurface_C)
	if len(s.InsideAir_C) > 0 {
		cols = append(cols, s.InsideAir_C)
	}
	cols = append(cols, s.OutsideFlux_W_m2, s.InsideFlux_W_m2)
	if len(s.FrostDepth_m) > 0 {
		cols = append(cols, s.FrostDepth_m, s.ThawDepth_m)
	}
	row := make([]float64, len(cols))
	for k := range s.Time_h {
		for j, c := range cols {
			row[j] = math.NaN() // a short column: empty cells
			if k < len(c) {
				row[j] = c[k]
			}
		}
		var stamp []byte
		if stamps {
			stamp = []byte(s.Stamp[k])
		}
		w.Row(stamp, row)
	}
	w.Flush()
	return CSVFile{Name: "series.csv", Data: b.Bytes()}
}

// SeriesLayout says which columns series.csv has: time_h, the outside
// (surface) environment and surface temperatures, a temperature per probe,
// the inside (bottom) surface temperature, the inside (bottom) environment
// when there is one, the heat fluxes at both surfaces (positive in +x,
// from outside to inside; downward in the ground) and, with Frost, frost
// and thaw depth; with Stamp a first column "time" holds each sample's
// ISO 8601 time.
type SeriesLayout struct {
	Kind              Kind
	ProbeDepth_m      []float64
	InsideEnvironment bool
	Frost             bool
	Stamp             bool
}

// Header returns the column names after the optional time stamp.
func (l SeriesLayout) Header() []string {
	out, in := "outside", "inside"
	envName, surfName, inSurf := "outside_environment_C", "outside_surface_C", "inside_surface_C"
	if l.Kind == Ground {
		out, in = "surface", "bottom"
		envName, surfName, inSurf = "surface_forcing_C", "ground_surface_C", "bottom_C"
	}
	header := []string{"time_h", envName, surfName}
	for _, z := range l.ProbeDepth_m {
		header = append(header, "probe_"+strconv.FormatFloat(z, 'g', 6, 64)+"m_C")
	}
	header = append(header, inSurf)
	if l.InsideEnvironment {
		header = append(header, in+"_environment_C")
	}
	header = append(header, out+"_heat_flux_W_m2", in+"_heat_flux_W_m2")
	if l.Frost {
		header = append(header, "frost_depth_m", "thaw_depth_m")
	}
	return header
}

// SeriesWriter writes series.csv one sample at a time, so a simulation of
// any length can write it as it runs with no memory per sample. It
// buffers; Flush writes out the rest and returns the first write error.
type SeriesWriter struct {
	w     *bufio.Writer
	stamp bool
	buf   []byte
	err   error
}

// NewSeriesWriter writes the header row of the layout to w and returns the
// writer of the rows.
func NewSeriesWriter(w io.Writer, l SeriesLayout) *SeriesWriter {
	sw := &SeriesWriter{w: bufio.NewWriterSize(w, 64<<10), stamp: l.Stamp}
	if l.Stamp {
		sw.buf = append(sw.buf, "time,"...)
	}
	for j, h := range l.Header() {
		if j > 0 {
			sw.buf = append(sw.buf, ',')
		}
		sw.buf = append(sw.buf, h...)
	}
	sw.line()
	return sw
}

// Row writes one sample: the time stamp (used only when the layout has
// one) and the values in the order of the header; NaN and Inf are written
// as empty cells, numbers with 10 significant digits.
func (sw *SeriesWriter) Row(stamp []byte, values []float64) {
	if sw.stamp {
		sw.buf = append(sw.buf, stamp...)
		sw.buf = append(sw.buf, ',')
	}
	for j, v := range values {
		if j > 0 {
			sw.buf = append(sw.buf, ',')
		}
		if !math.IsNaN(v) && !math.IsInf(v, 0) {
			sw.buf = strconv.AppendFloat(sw.buf, v, 'g', 10, 64)
		}
	}
	sw.line()
}

func (sw *SeriesWriter) line() {
	sw.buf = append(sw.buf, '\n')
	if sw.err == nil {
		_, sw.err = sw.w.Write(sw.buf)
	}
	sw.buf = sw.buf[:0]
}

// Flush writes what is buffered and returns the first error of any write.
func (sw *SeriesWriter) Flush() error {
	if sw.err == nil {
		sw.err = sw.w.Flush()
	}
	return sw.err
}
