package main

import (
	"fmt"
	"io"
	"math"
	"os"
	"strconv"
	"strings"
	"text/tabwriter"
	"time"

	"tempstack/scenarios"
	"tempstack/scenarios/results"
)

// printSummary prints the headline numbers of a run in plain words.
func printSummary(w io.Writer, r *results.Results) {
	fmt.Fprintf(w, "%s (%s)\n", r.Title, r.Kind)
	if r.Kind == results.Wall {
		fmt.Fprintf(w, "  U = %.3f W/(m2 K), R = %.3f m2 K/W (surface to surface)\n",
			r.Steady.UValue_W_m2K, r.Steady.ThermalResistance_m2K_W)
		if cm := r.Steady.CombinedMethod; cm != nil {
			fmt.Fprintf(w, "  mixed layer: combined method of ISO 6946, R'T = %.3f, R''T = %.3f, RT = %.3f m2 K/W, relative error %.1f %%\n",
				cm.UpperLimit_m2K_W, cm.LowerLimit_m2K_W, cm.Mean_m2K_W, 100*cm.RelativeError)
			fmt.Fprintf(w, "  periodic analysis and simulation: an equivalent homogeneous layer per mixed layer (conductivity giving RT; density and heat capacity area-weighted)\n")
		}
	}
	for _, p := range r.Periodic {
		if r.Kind != results.Wall {
			break
		}
		fmt.Fprintf(w, "  period %g h: decrement factor %.3f, time shift %.1f h, periodic transmittance %.3f W/(m2 K), admittance inside %.2f W/(m2 K)\n",
			p.Period_h, p.DecrementFactor, p.TimeShift_h, p.PeriodicTransmittance_W_m2K, p.InsideAdmittance_W_m2K)
	}
	printRoom(w, r.Room)
	if s := r.Simulation; s != nil {
		fmt.Fprintf(w, "  simulated %g h in steps of %g h on %d cells; energy balance error %.1e\n",
			s.Duration_h, s.Step_h, s.Cells, s.EnergyBalanceRelativeError)
	}
	if r.SimulationSkipped != "" {
		fmt.Fprintf(w, "  simulation skipped: %s\n", r.SimulationSkipped)
	}
	if f := r.Frost; f != nil {
		// A value that was not computed says so, with the reason.
		val := func(key string, v *float64, format string) string {
			if v == nil {
				why := f.NotComputed[key]
				if why == "" {
					return "not computed"
				}
				return "not computed (" + why + ")"
			}
			return fmt.Sprintf(format, *v)
		}
		sim := "not simulated"
		if r.Simulation != nil {
			sim = "simulated depth " + val("max_frost_depth_m", f.MaxFrostDepth_m, "%.2f m")
			if f.ActiveLayer_m != nil {
				sim += fmt.Sprintf(", active layer %.2f m over permafrost", *f.ActiveLayer_m)
			}
			if f.HeadlineWinter != "" {
				sim += " (" + f.HeadlineWinter + ")"
			}
		}
		src := ""
		if o := f.IndexSource.Origin; o != "" && o != results.FromForcing {
			src = " (" + f.IndexSource.String() + ")"
		}
		fmt.Fprintf(w, "  frost: air freezing index %s%s, %s, Stefan %s, modified Berggren %s (estimates; local codes govern)\n",
			val("freezing_index_Cd", f.FreezingIndex_Cd, "%.0f degC day"), src, sim,
			val("stefan_depth_m", f.StefanDepth_m, "%.2f m"), val("modified_berggren_depth_m", f.ModifiedBerggrenDepth_m, "%.2f m"))
	}
	printStudies(w, r)
	for _, warn := range r.Warnings {
		fmt.Fprintf(w, "  note: %s\n", warn)
	}
	for _, c := range results.Cautions(r) {
		fmt.Fprintf(w, "  caution: %s\n", c)
	}
}

// progressFor returns a progress printer for long runs when w is a
// terminal, and nil (silence) otherwise: logs and pipes stay clean.
func progressFor(w io.Writer) scenarios.Progress {
	f, ok := w.(*os.File)
	if !ok {
		return nil
	}
	fi, err := f.Stat()
	if err != nil || fi.Mode()&os.ModeCharDevice == 0 {
		return nil
	}
	start := time.Now()
	last := -1
	return func(stage string, frac float64) {
		if time.Since(start) < time.Second && frac < 1 {
			return
		}
		pct := int(frac * 100)
		if pct == last {
			return
		}
		last = pct
		fmt.Fprintf(f, "\r%s: %3d %%", stage, pct)
		if frac >= 1 {
			fmt.Fprint(f, "\r\033[K")
		}
	}
}

// printStudies prints the outcome of the scenario's design studies as short
// tables with units: the options compared, the sweep, the target and the
// spread of an uncertainty study. Periodic quantities are those of the
// first analysis period.
func printStudies(w io.Writer, r *results.Results) {
	keys := headlineKeys(r)
	if len(r.Variants) > 0 {
		fmt.Fprintln(w, "  options compared:")
		tw := newTable(w)
		fmt.Fprintln(tw, "    option\t"+quantityHeads(keys))
		for _, v := range r.Variants {
			fmt.Fprintln(tw, "    "+v.Name+"\t"+quantityCells(v.Quantities, keys))
		}
		tw.Flush()
	}
	if s := r.Sweep; s != nil && len(s.Points) > 0 {
		fmt.Fprintf(w, "  sweep of the %s:\n", words(s.ParameterLabel, s.Parameter))
		tw := newTable(w)
		fmt.Fprintln(tw, "    "+withUnit("value", s.Unit)+"\t"+quantityHeads(keys))
		for _, p := range s.Points {
			fmt.Fprintln(tw, "    "+strconv.FormatFloat(p.Value, 'g', 6, 64)+"\t"+quantityCells(p.Quantities, keys))
		}
		tw.Flush()
	}
	if t := r.Target; t != nil {
		q := results.Quantity(t.Quantity)
		rel := "at most"
		if t.AtLeast {
			rel = "at least"
		}
		label := words(t.ParameterLabel, t.Parameter)
		if t.Met {
			fmt.Fprintf(w, "  target met: %s at %s gives %s %s (goal %s %s; found to %s; %d runs)\n",
				label, joinUnit(strconv.FormatFloat(t.Value, 'f', -1, 64), t.Unit), q.Words, joinUnit(formatQuantity(t.Quantity, t.Achieved), q.Unit),
				rel, joinUnit(strconv.FormatFloat(t.Goal, 'g', -1, 64), q.Unit), joinUnit(strconv.FormatFloat(t.Tolerance, 'g', 3, 64), t.Unit), t.Evaluations)
		} else {
			fmt.Fprintf(w, "  target not met: no %s from %s to %s gives %s %s %s; the closest, %s, gives %s (%d runs)\n",
				label, joinUnit(strconv.FormatFloat(t.From, 'g', 6, 64), t.Unit), joinUnit(strconv.FormatFloat(t.To, 'g', 6, 64), t.Unit),
				q.Words, rel, joinUnit(strconv.FormatFloat(t.Goal, 'g', -1, 64), q.Unit),
				joinUnit(strconv.FormatFloat(results.RoundToTolerance(t.Value, t.Tolerance), 'f', -1, 64), t.Unit), joinUnit(formatQuantity(t.Quantity, t.Achieved), q.Unit), t.Evaluations)
		}
	}
	if u := r.Uncertainty; u != nil && len(u.Quantities) > 0 {
		var varied []string
		for _, p := range u.Parameters {
			varied = append(varied, words(p.ParameterLabel, p.Parameter))
		}
		fmt.Fprintf(w, "  uncertainty, %d samples (%d refused) varying the %s:\n", u.Samples, u.Rejected, strings.Join(varied, ", the "))
		tw := newTable(w)
		fmt.Fprintln(tw, "    quantity\tmean\tsd\t5 %\tmedian\t95 %")
		for _, s := range u.Quantities {
			q := results.Quantity(s.Quantity)
			f := func(v float64) string { return formatQuantity(s.Quantity, v) }
			fmt.Fprintf(tw, "    %s\t%s\t%s\t%s\t%s\t%s\n", withUnit(q.Words, q.Unit), f(s.Mean), sig3(s.SD), f(s.P5), f(s.P50), f(s.P95))
		}
		tw.Flush()
	}
}

// headlineKeys are the quantities the option and sweep tables show: the
// headline figures of the kind, and a target's quantity.
func headlineKeys(r *results.Results) []string {
	keys := []string{"u_value_W_m2K", "decrement_factor", "time_shift_h"}
	if r.Kind == results.Ground {
		keys = []string{"max_frost_depth_m", "stefan_depth_m", "modified_berggren_depth_m"}
	}
	if r.Kind == results.Room {
		keys = []string{"operative_max_C", "hours_above_h", "mass_peak_reduction_K"}
	}
	if t := r.Target; t != nil && !contains(keys, t.Quantity) {
		keys = append(keys, t.Quantity)
	}
	return keys
}

func newTable(w io.Writer) *tabwriter.Writer { return tabwriter.NewWriter(w, 0, 0, 2, ' ', 0) }

// quantityHeads names the quantities with their units, tab separated.
func quantityHeads(keys []string) string {
	var hs []string
	for _, k := range keys {
		q := results.Quantity(k)
		hs = append(hs, withUnit(q.Words, q.Unit))
	}
	return strings.Join(hs, "\t")
}

// quantityCells formats the quantities of s; "-" where one is not defined.
func quantityCells(s results.Summary, keys []string) string {
	var cs []string
	for _, k := range keys {
		v, ok := s[k]
		if !ok || math.IsNaN(v) {
			cs = append(cs, "-")
			continue
		}
		cs = append(cs, formatQuantity(k, v))
	}
	return strings.Join(cs, "\t")
}

// formatQuantity writes v with the digits results.Quantity gives its key.
func formatQuantity(key string, v float64) string { return results.Quantity(key).Format(v) }

// sig3 writes v with three significant digits in fixed notation (0.260,
// 75.9, 1230).
func sig3(v float64) string { return results.Sig3(v) }

// withUnit is "name (unit)", or the name alone for a ratio.
func withUnit(name, unit string) string {
	if unit == "" {
		return name
	}
	return name + " (" + unit + ")"
}

// joinUnit is "number unit", or the number alone for a ratio.
func joinUnit(num, unit string) string {
	if unit == "" {
		return num
	}
	return num + " " + unit
}

// words is a parameter's label in words, or its path when it has none.
func words(label, path string) string {
	if label != "" {
		return label
	}
	return path
}

// printRoom prints the headline of a room run; nothing for other kinds.
func printRoom(w io.Writer, rm *results.RoomResult) {
	if rm == nil {
		return
	}
	p := rm.Periodic
	mean := ""
	if rm.VentilationNight_ach != nil {
		mean = ", ventilation at its daily mean"
	}
	for _, win := range rm.Windows {
		if len(win.SunTo) == 0 {
			continue
		}
		var parts []string
		for _, s := range win.SunTo {
			parts = append(parts, fmt.Sprintf("%.0f %% on %s", 100*s.Fraction, s.Element))
		}
		if a := win.SunToAirFraction; a != nil {
			parts = append(parts, fmt.Sprintf("%.0f %% to the air", 100**a))
		}
		fmt.Fprintf(w, "  sun through %s: %s\n", win.Name, strings.Join(parts, ", "))
	}
	fmt.Fprintf(w, "  exact periodic (%g h cycle%s): air %.1f to %.1f degC (mean %.1f), operative %.1f to %.1f degC\n",
		p.Period_h, mean, p.AirMin_C, p.AirMax_C, p.AirMean_C, p.OperativeMin_C, p.OperativeMax_C)
	if s := rm.Simulation; s != nil {
		fmt.Fprintf(w, "  simulated (last cycle, %g h steps, %d cells): air %.1f to %.1f degC, operative %.1f to %.1f degC; energy balance error %.1e\n",
			s.Step_h, s.Cells, s.AirMin_C, s.AirMax_C, s.OperativeMin_C, s.OperativeMax_C, s.EnergyBalanceRelativeError)
		if c := s.ExactCheck_K; c != nil {
			fmt.Fprintf(w, "  cross-check: with the ventilation at its mean the simulated air is within %.3f K of the exact solution\n", *c)
		}
		var parts []string
		for _, h := range s.HoursAbove {
			parts = append(parts, fmt.Sprintf("%g degC %.1f h", h.Threshold_C, h.Hours))
		}
		fmt.Fprintf(w, "  hours a day above (operative): %s (comfort criteria are set by local guidance)\n", strings.Join(parts, ", "))
	}
	if m := rm.MassRemoved; m != nil && m.Statement != "" {
		fmt.Fprintf(w, "  %s\n", m.Statement)
	}
}
