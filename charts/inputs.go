package charts

import (
	"fmt"
	"strings"

	"tempstack/scenarios/results"
)

// inputsTable is the "Assumptions and inputs" table: everything the
// results record about the conditions of the run (surface resistances,
// the forcing as far as the results carry it, the analysis and the
// simulation settings), so that a reader can see what the numbers rest
// on without the scenario file.
func inputsTable(r *results.Results) *block { return inputsBlocks(r)[0] }

// inputsBlocks is the inputs table followed, when a measured series had
// gaps, by the table of the gaps bridged. The rows come in a fixed order:
// surfaces, forcing, measured records, frost, analysis, simulation.
func inputsBlocks(r *results.Results) []*block {
	ground := r.Kind == results.Ground
	t := newTable("Assumptions and inputs of this run", []string{"Input", "Value"}, "text", "text")
	surfaceRows(t, r, ground)
	if ground {
		groundForcingRows(t, r)
	} else {
		wallForcingRows(t, r)
	}
	gaps := recordRows(t, r)
	frostInputRows(t, r)
	periodsRow(t, r, ground)
	probeRow(t, r, ground)
	simulationRows(t, r.Simulation)
	t.Notes = append(t.Notes, "Material properties and their sources are in the layer table; the methods are listed at the end of the report.")
	return []*block{{Table: t}, gaps}
}

// resistanceText is a surface resistance in m²·K/W; zero means the
// surface temperature is prescribed.
func resistanceText(v float64) string {
	if v == 0 {
		return "0 (surface temperature prescribed)"
	}
	return trimZeros(sig(v, 3)) + " m²·K/W"
}

// surfaceRows are the surface resistances (one for a ground column, the
// outside and inside ones with the component for a wall).
func surfaceRows(t *table, r *results.Results, ground bool) {
	s := r.Steady
	if ground {
		t.row("Surface resistance", resistanceText(s.OutsideSurfaceResistance))
		return
	}
	if r.Orientation != "" {
		t.row("Component", r.Orientation)
	}
	t.row("Outside surface resistance Rse", resistanceText(s.OutsideSurfaceResistance))
	t.row("Inside surface resistance Rsi", resistanceText(s.InsideSurfaceResistance))
}

// groundForcingRows are the forcing of a ground column as far as the
// results carry it: air and surface temperatures, n-factors, the bottom
// boundary and the depth.
func groundForcingRows(t *table, r *results.Results) {
	g := r.Ground
	if g == nil {
		return
	}
	if f := r.Frost; f != nil {
		if f.MeanAnnualAir_C != nil && f.IndexSource.Origin != results.FromSimulated {
			t.row("Mean annual air temperature", degC(*f.MeanAnnualAir_C))
		}
	}
	if g.NFactorFreezing > 0 || g.NFactorThawing > 0 {
		t.row("n-factors of the surface cover, freezing and thawing (surface / air)", trimZeros(sig(g.NFactorFreezing, 3))+" and "+trimZeros(sig(g.NFactorThawing, 3)))
	}
	t.row("Ground surface temperature", fmt.Sprintf("mean %s, annual swing ±%s K (n-factors applied)", degC(g.SurfaceMean_C), fixed(g.SurfaceAnnualAmplitude_K, 1)))
	if g.GeothermalFlux_W_m2 != nil {
		t.row("Bottom of the column", "geothermal heat flux "+trimZeros(sig(*g.GeothermalFlux_W_m2*1000, 3))+" mW/m² upward")
	} else {
		t.row("Bottom of the column", "fixed temperature")
	}
	t.row("Depth of the column", fixed(g.ColumnDepth_m, 2)+" m")
}

// wallForcingRows are the ranges of the outside and inside environment
// temperatures over the first periodic cycle.
func wallForcingRows(t *table, r *results.Results) {
	c := r.Series
	if len(c.Cycle.OutsideAir_C) > 0 && len(r.Periodic) > 0 {
		t.row("Outside environment temperature over the "+periodLabel(r.Periodic[0].Period_h)+" cycle",
			rangeText(c.Cycle.Time_h, c.Cycle.OutsideAir_C))
	}
	if len(c.Cycle.InsideAir_C) > 0 {
		t.row("Inside environment temperature over the same cycle", rangeText(c.Cycle.Time_h, c.Cycle.InsideAir_C))
	}
}

// frostInputRows are the design freezing index, the wall's freezing
// n-factor and the step-response setting.
func frostInputRows(t *table, r *results.Results) {
	if f := r.Frost; f != nil {
		if d := f.DesignFreezingIndex_Cd; d != nil {
			t.row("Design air freezing index", cd(*d)+" (used by Stefan and modified Berggren)")
		}
		if r.Ground == nil {
			t.row("Freezing n-factor", trimZeros(sig(f.NFactorFreezing, 3)))
		}
	}
	if st := r.StepResponse; st != nil {
		t.row("Surface heat uptake after a step", fmt.Sprintf("the %s surface temperature steps by %s K, followed for %s", st.Side, fixed(st.Change_K, 1), seconds(st.Duration_s)))
	}
}

// periodsRow lists the periods of the exact periodic analysis: the
// ground's when a ground column has them, else the wall's.
func periodsRow(t *table, r *results.Results, ground bool) {
	var periods []string
	if ground && r.Ground != nil {
		for _, p := range r.Ground.Periodic {
			periods = append(periods, periodLabel(p.Period_h))
		}
	}
	if len(periods) == 0 {
		for _, p := range r.Periodic {
			periods = append(periods, periodLabel(p.Period_h))
		}
	}
	if len(periods) > 0 {
		t.row("Periods of the exact periodic analysis", strings.Join(periods, ", "))
	}
}

// probeRow lists the probe positions: depths in m for a ground column,
// positions in mm from the outside surface for a wall.
func probeRow(t *table, r *results.Results, ground bool) {
	z := probeDepths(r)
	if len(z) == 0 {
		return
	}
	var ps []string
	for _, v := range z {
		if ground {
			ps = append(ps, fixed(v, 2)+" m")
		} else {
			ps = append(ps, trimZeros(sig(v*1000, 3))+" mm")
		}
	}
	what := "Probe positions from the outside surface"
	if ground {
		what = "Probe depths below the surface"
	}
	t.row(what, strings.Join(ps, ", "))
}

// simulationRows are the settings of the simulation, if one ran:
// duration, step, output interval, cells and spin-up.
func simulationRows(t *table, sim *results.Simulation) {
	if sim == nil {
		return
	}
	t.row("Simulated duration", hours(sim.Duration_h))
	t.row("Time step", trimZeros(sig(sim.Step_h, 3))+" h")
	if sim.OutputStep_h > 0 {
		t.row("Output interval", trimZeros(sig(sim.OutputStep_h, 3))+" h")
	}
	t.row("Finite-volume cells", fmt.Sprint(sim.Cells))
	if l := sim.SpinUpLastCycleSimulated; l != nil && *l {
		t.row("Spin-up", spinUpText(sim))
	} else {
		t.row("Spin-up before recording", spinUpText(sim))
	}
}

// spinUpText says how many cycles were run before recording and whether
// the last one met the tolerance.
func spinUpText(sim *results.Simulation) string {
	if sim.SpinUpCycles <= 0 {
		return "none"
	}
	v := fmt.Sprintf("%d cycles; the last changed the temperatures by at most %s K", sim.SpinUpCycles, sig(sim.SpinUpChange_K, 2))
	if l := sim.SpinUpLastCycleSimulated; l != nil && *l {
		v = fmt.Sprintf("%d cycles at the simulation's step, the last of them the simulation's own first cycle, which changed the temperatures by at most %s K", sim.SpinUpCycles, sig(sim.SpinUpChange_K, 2))
	}
	if c := sim.SpinUpCoarseCycles; c != nil && *c > 0 {
		v = fmt.Sprintf("%d coarse cycles, then ", *c) + v
	}
	if sim.SpinUpTolerance_K > 0 {
		if sim.SpinUpConverged {
			v += fmt.Sprintf(" (converged: within %s K)", sig(sim.SpinUpTolerance_K, 2))
		} else {
			v += fmt.Sprintf(" (NOT converged: the target is %s K; the first simulated cycle carries some start-up error)", sig(sim.SpinUpTolerance_K, 2))
		}
	}
	return v
}

// rangeText describes the range of a temperature series v sampled at
// times t: lowest, highest and the time-weighted (trapezoidal) mean, so
// that a cycle sampled at both ends is not biased by its end point.
func rangeText(t, v []float64) string {
	lo, hi := minOf(v), maxOf(v)
	if !finite(lo) || !finite(hi) {
		return dash
	}
	if hi-lo < 0.05 {
		return "constant " + degC(lo)
	}
	area, span := 0.0, 0.0
	for i := 1; i < min(len(t), len(v)); i++ {
		dt := t[i] - t[i-1]
		if finite(v[i]) && finite(v[i-1]) && finite(dt) && dt > 0 {
			area += dt * (v[i] + v[i-1]) / 2
			span += dt
		}
	}
	if !(span > 0) {
		return fmt.Sprintf("%s to %s", degC(lo), degC(hi))
	}
	return fmt.Sprintf("%s to %s (mean %s)", degC(lo), degC(hi), degC(area/span))
}

// seconds formats a duration given in seconds.
func seconds(s float64) string {
	switch {
	case !finite(s):
		return dash
	case s < 120:
		return trimZeros(sig(s, 3)) + " s"
	case s < 7200:
		return trimZeros(sig(s/60, 3)) + " min"
	default:
		return hours(s / 3600)
	}
}
