package results

import (
	"bytes"
	"encoding/csv"
	"math"
	"strconv"
)

// CSVFile is one CSV output of a run: UTF-8, comma separated, dot decimal,
// a header row whose names carry the units.
type CSVFile struct {
	Name string
	Data []byte
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
	if len(s.Simulation.Time_h) > 0 {
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

// seriesCSV is the simulated time series. Heat fluxes are positive in the
// +x direction (from outside to inside; downward in the ground).
func seriesCSV(r *Results) CSVFile {
	s := &r.Series
	out, in := "outside", "inside"
	envName, surfName, inSurf := "outside_environment_C", "outside_surface_C", "inside_surface_C"
	if r.Kind == Ground {
		out, in = "surface", "bottom"
		envName, surfName, inSurf = "surface_forcing_C", "ground_surface_C", "bottom_C"
	}
	header := []string{"time_h", envName, surfName}
	cols := [][]float64{s.Simulation.Time_h, s.Simulation.OutsideAir_C, s.Simulation.OutsideSurface_C}
	for j, z := range s.Simulation.ProbeDepth_m {
		header = append(header, "probe_"+strconv.FormatFloat(z, 'g', 6, 64)+"m_C")
		cols = append(cols, s.Simulation.Probes_C[j])
	}
	header = append(header, inSurf)
	cols = append(cols, s.Simulation.InsideSurface_C)
	if len(s.Simulation.InsideAir_C) > 0 {
		header = append(header, in+"_environment_C")
		cols = append(cols, s.Simulation.InsideAir_C)
	}
	header = append(header, out+"_heat_flux_W_m2", in+"_heat_flux_W_m2")
	cols = append(cols, s.Simulation.OutsideFlux_W_m2, s.Simulation.InsideFlux_W_m2)
	if len(s.Simulation.FrostDepth_m) > 0 {
		header = append(header, "frost_depth_m", "thaw_depth_m")
		cols = append(cols, s.Simulation.FrostDepth_m, s.Simulation.ThawDepth_m)
	}
	f := table("series.csv", header, columns(cols...))
	if len(s.Simulation.Stamp) == len(s.Simulation.Time_h) && len(s.Simulation.Stamp) > 0 {
		f.Data = prependColumn(f.Data, "time", s.Simulation.Stamp)
	}
	return f
}

// prependColumn adds a text column in front of a rendered CSV table.
func prependColumn(data []byte, name string, values []string) []byte {
	lines := bytes.Split(bytes.TrimRight(data, "\n"), []byte("\n"))
	var b bytes.Buffer
	for i, l := range lines {
		if i == 0 {
			b.WriteString(name)
		} else if i-1 < len(values) {
			b.WriteString(values[i-1])
		}
		b.WriteByte(',')
		b.Write(l)
		b.WriteByte('\n')
	}
	return b.Bytes()
}
