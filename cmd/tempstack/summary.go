package main

import (
	"fmt"
	"io"
	"os"
	"time"

	"tempstack/scenarios"
)

// printSummary prints the headline numbers of a run in plain words.
func printSummary(w io.Writer, r *scenarios.Results) {
	fmt.Fprintf(w, "%s (%s)\n", r.Title, r.Kind)
	if r.Kind == "wall" {
		fmt.Fprintf(w, "  U = %.3f W/(m2 K), R = %.3f m2 K/W (surface to surface)\n",
			r.Steady.UValue_W_m2K, r.Steady.ThermalResistance_m2K_W)
	}
	for _, p := range r.Periodic {
		if r.Kind != "wall" {
			break
		}
		fmt.Fprintf(w, "  period %g h: decrement factor %.3f, time shift %.1f h, periodic transmittance %.3f W/(m2 K), admittance inside %.2f W/(m2 K)\n",
			p.Period_h, p.DecrementFactor, p.TimeShift_h, p.PeriodicTransmittance_W_m2K, p.InsideAdmittance_W_m2K)
	}
	if s := r.Simulation; s != nil {
		fmt.Fprintf(w, "  simulated %g h in steps of %g h on %d cells; energy balance error %.1e\n",
			s.Duration_h, s.Step_h, s.Cells, s.EnergyBalanceRelativeError)
	}
	if r.SimulationSkipped != "" {
		fmt.Fprintf(w, "  simulation skipped: %s\n", r.SimulationSkipped)
	}
	if f := r.Frost; f != nil {
		sim := "not simulated"
		if r.Simulation != nil {
			sim = fmt.Sprintf("simulated depth %.2f m", f.MaxFrostDepth_m)
		}
		src := ""
		if f.IndexSource != "" && f.IndexSource != "forcing" {
			src = " (" + f.IndexSource + ")"
		}
		fmt.Fprintf(w, "  frost: air freezing index %.0f degC day%s, %s, Stefan %.2f m, modified Berggren %.2f m (estimates; local codes govern)\n",
			f.FreezingIndex_Cd, src, sim, f.StefanDepth_m, f.ModifiedBerggrenDepth_m)
	}
	for _, warn := range r.Warnings {
		fmt.Fprintf(w, "  note: %s\n", warn)
	}
	for _, c := range scenarios.Cautions(r) {
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
