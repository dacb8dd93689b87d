package main

import (
	"fmt"
	"io"
	"os"
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
	}
	for _, p := range r.Periodic {
		if r.Kind != results.Wall {
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
