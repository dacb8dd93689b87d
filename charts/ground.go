package charts

import (
	"fmt"
	"strings"

	"tempstack/scenarios/results"
)

// Tables of the ground report: the frost depth three ways, the freezing
// index behind them, the simulated frost of each winter and the exact
// periodic ground temperature at each probe.

// capitalise upper-cases the first letter of s.
func capitalise(s string) string {
	if s == "" {
		return s
	}
	r := []rune(s)
	return strings.ToUpper(string(r[0])) + string(r[1:])
}

// indexUsed returns the surface freezing index (°C·d) the closed forms
// used (nil when there is none) and a phrase naming where it came from.
func indexUsed(f *results.Frost) (*float64, string) {
	idx := f.SurfaceIndexUsed()
	switch {
	case f.IndexSource.Origin == results.FromDesign && f.DesignFreezingIndex_Cd != nil:
		return idx, "design air index"
	case f.IndexSource.Origin == results.FromRecord:
		return idx, "air index of the record, " + f.IndexSource.Detail()
	case f.IndexSource.Origin == results.FromSimulated:
		return idx, "air index of the simulated cold period"
	}
	return idx, "air index of the forcing"
}

// notComputed is the text shown for a frost value under the JSON key
// that was not computed.
func notComputed(f *results.Frost, key string) string {
	if why := f.NotComputed[key]; why != "" {
		return "not computed: " + why
	}
	return "not computed"
}

// optText formats *v with format, or says why it was not computed.
func optText(f *results.Frost, key string, v *float64, format func(float64) string) string {
	if v == nil || !finite(*v) {
		return notComputed(f, key)
	}
	return format(*v)
}

// depth2 formats a depth in m with two decimals.
func depth2(v float64) string { return fixed(v, 2) }

// airIndexLabel names the air freezing index f.FreezingIndex_Cd holds.
func airIndexLabel(f *results.Frost) string {
	if f.IndexSource.Origin == results.FromDesign {
		return "Design air freezing index (given in the scenario)"
	}
	if f.IndexSource.Origin == results.FromSimulated {
		return "Air freezing index of the simulated cold period"
	}
	if f.IndexSource.Origin == results.FromRecord {
		return "Air freezing index of the record (" + f.IndexSource.Detail() + ")"
	}
	return "Air freezing index of the forcing (one winter)"
}

// cd formats a freezing or thawing index in °C·d.
func cd(v float64) string { return fixed(v, 0) + " °C·d" }

// frostCompareTable sets the simulated frost depth beside the Stefan and
// modified Berggren estimates, each with the freezing index it used.
func frostCompareTable(r *results.Results) *block {
	f := r.Frost
	if f == nil {
		return nil
	}
	t := newTable("Frost depth, three ways", []string{"Method", "Frost depth (m)", "Driven by"}, "text", "", "text")
	sim := dash
	driver := "the surface temperature of the scenario, hour by hour"
	if r.Simulation == nil {
		driver = "no simulation was run"
	} else {
		sim = optText(f, "max_frost_depth_m", f.MaxFrostDepth_m, depth2)
		if k := headlineWinter(f); k >= 0 {
			w := f.Winters[k]
			driver += fmt.Sprintf("; deepest in %s (%s), of %d complete and settled winters", w.Label, w.MaxFrostDate, countHeadline(f))
		}
	}
	t.row("Simulation (finite volumes, latent heat)", sim, driver)
	if f.ActiveLayer_m != nil {
		t.row("Simulation: active layer over permafrost", fixed(*f.ActiveLayer_m, 2),
			"the deepest summer thaw of the complete, settled winters; the ground below stays frozen all year")
	}
	idx, from := indexUsed(f)
	by := "no surface freezing index"
	if idx != nil {
		by = fmt.Sprintf("surface freezing index %s (freezing n-factor %s × %s)", cd(*idx), trimZeros(sig(f.NFactorFreezing, 3)), from)
	}
	stefan := optText(f, "stefan_depth_m", f.StefanDepth_m, depth2)
	berg := optText(f, "modified_berggren_depth_m", f.ModifiedBerggrenDepth_m, depth2)
	t.row("Stefan (closed form)", stefan, by)
	bb := by
	if f.BerggrenLambda != nil && f.BerggrenAlpha != nil && f.BerggrenMu != nil {
		bb += fmt.Sprintf("; coefficient λ = %s from α = %s and μ = %s", sig(*f.BerggrenLambda, 3), sig(*f.BerggrenAlpha, 3), sig(*f.BerggrenMu, 3))
	}
	t.row("Modified Berggren (closed form)", berg, bb)
	t.Notes = append(t.Notes,
		"Stefan neglects the heat stored in the soil above freezing and so gives a deeper front than modified Berggren, which reduces the Stefan depth by the coefficient λ for that heat. The simulation follows the whole temperature history through the layers. All three are estimates for planning only, and none is a safe upper bound; see the cautions.")
	if f.IndexSource.Origin == results.FromDesign {
		t.Notes = append(t.Notes, "The closed forms use the design freezing index; the simulation follows the surface temperature of the scenario, so the two need not agree.")
	}
	return &block{Table: t}
}

// headlineWinter returns the index of the winter that gives the headline
// frost depth (the deepest of the complete, settled winters), or -1.
func headlineWinter(f *results.Frost) int {
	if f.MaxFrostDepth_m == nil || f.HeadlineWinter == "" {
		return -1
	}
	for i, w := range f.Winters {
		if w.Label == f.HeadlineWinter {
			return i
		}
	}
	return -1
}

// countHeadline counts the complete, settled winters.
func countHeadline(f *results.Frost) int {
	n := 0
	for _, w := range f.Winters {
		if w.Complete && w.Settled {
			n++
		}
	}
	return n
}

// freezingIndexTable lists the freezing index and the quantities the
// closed forms take from the climate.
func freezingIndexTable(r *results.Results) *block {
	f := r.Frost
	if f == nil {
		return nil
	}
	t := newTable("Freezing index and frost climate", []string{"Quantity", "Value"}, "text", "text")
	t.row(airIndexLabel(f), optText(f, "freezing_index_Cd", f.FreezingIndex_Cd, cd))
	if rp := f.ReturnPeriod; rp != nil {
		t.row(fmt.Sprintf("Air freezing index with a %s-year return period", fixed(rp.Years, 0)),
			fmt.Sprintf("%s (%s fitted to %d complete winters: location %s, scale %s)", cd(rp.FreezingIndex_Cd), rp.Method, rp.Winters, cd(rp.Location_Cd), cd(rp.Scale_Cd)))
	}
	t.row("Freezing n-factor (surface / air freezing index)", trimZeros(sig(f.NFactorFreezing, 3)))
	if f.SurfaceFreezingIndex_Cd != nil {
		t.row("Surface freezing index (n × air)", cd(*f.SurfaceFreezingIndex_Cd))
	}
	if fi := f.ForcingFreezingIndex_Cd; fi != nil {
		t.row("Air freezing index of the forcing (one winter; not used by the closed forms)", cd(*fi))
	}
	if idx, from := indexUsed(f); idx != nil {
		t.row("Index used by Stefan and modified Berggren", cd(*idx)+" (from the "+from+")")
	}
	t.row("Length of the freezing season", optText(f, "season_length_d", f.SeasonLength_d, func(v float64) string { return fixed(v, 0) + " d" }))
	meanLabel := "Mean annual air temperature"
	if f.IndexSource.Origin == results.FromSimulated {
		meanLabel = "Initial temperature (the mean of modified Berggren)"
	}
	t.row(meanLabel, optText(f, "mean_annual_air_C", f.MeanAnnualAir_C, degC))
	t.Notes = append(t.Notes, "A freezing index is the sum over the freezing season of the degrees below 0 °C times the days (°C·d). The n-factor converts the air index to the ground surface (cover, snow, vegetation).")
	return &block{Table: t}
}

// winterTable lists the simulated frost of each winter year.
func winterTable(r *results.Results) *block {
	f := r.Frost
	if f == nil || len(f.Winters) == 0 {
		return nil
	}
	var depths []float64
	for _, w := range f.Winters {
		for _, p := range w.FrozenDays {
			if !containsDepth(depths, p.Depth_m) {
				depths = append(depths, p.Depth_m)
			}
		}
	}
	closed := false
	for _, w := range f.Winters {
		closed = closed || w.StefanDepth_m > 0 || w.ModifiedBerggrenDepth_m > 0
	}
	head := []string{"Winter", "Days (from–to)", "Air freezing index (°C·d)", "Air thawing index (°C·d)", "Max frost depth (m)", "Reached on", "Max thaw depth (m)", "Active layer (m)"}
	align := []string{"text", "text", "", "", "", "text"}
	if closed {
		head = append(head, "Stefan (m)", "Modified Berggren (m)")
	}
	for _, z := range depths {
		head = append(head, "Frozen days at "+fixed(z, 2)+" m")
	}
	t := newTable("Simulated frost, winter by winter", head, align...)
	partial := false
	for _, w := range f.Winters {
		label := capitalise(w.Label)
		if !w.Complete {
			label += " (partial)"
			partial = true
		}
		on := dash
		if w.MaxFrostDepth_m > 0 {
			on = w.MaxFrostDate
		}
		active := dash
		if w.FrozenAllYear {
			active = fixed(w.ActiveLayer_m, 2)
		}
		cells := []string{label, fixed(w.Start_d, 0) + "–" + fixed(w.End_d, 0), fixed(w.AirFreezingIndex_Cd, 0), fixed(w.AirThawingIndex_Cd, 0),
			fixed(w.MaxFrostDepth_m, 2), on, fixed(w.MaxThawDepth_m, 2), active}
		if closed {
			cells = append(cells, posFixed(w.StefanDepth_m, 2), posFixed(w.ModifiedBerggrenDepth_m, 2))
		}
		for _, z := range depths {
			d := dash
			for _, p := range w.FrozenDays {
				if p.Depth_m == z {
					d = fixed(p.Days, 0)
				}
			}
			cells = append(cells, d)
		}
		t.row(cells...)
	}
	t.Notes = append(t.Notes,
		"A winter year runs from "+winterStart(f)+" to the same day a year later; days count from 1 January of the first simulated year. Frozen days: time the probe spent at or below its freezing point. Max thaw depth: deepest thaw from the surface while frost remained below. Active layer: the depth that thaws each summer, given only when frost outlasts the whole winter year (permafrost).")
	if closed {
		t.Notes = append(t.Notes, "Stefan and modified Berggren: the closed forms from that winter's own surface freezing index, beside the simulated depth.")
	}
	if partial {
		t.Notes = append(t.Notes, "A partial winter is cut by the start or the end of the run: its indices, depths and frozen days cover only part of the season and are not comparable with a whole winter.")
	}
	return &block{Table: t}
}

// posFixed formats a positive value with d decimals; zero or less is a
// dash (not computed).
func posFixed(v float64, d int) string {
	if !(v > 0) || !finite(v) {
		return dash
	}
	return fixed(v, d)
}

func containsDepth(v []float64, z float64) bool {
	for _, x := range v {
		if x == z {
			return true
		}
	}
	return false
}

// groundSummaryTable gives the exact periodic ground-temperature summary:
// surface mean and swing, damping depth, whether the column is deep enough.
func groundSummaryTable(r *results.Results) *block {
	g := r.Ground
	if g == nil {
		return nil
	}
	t := newTable("Ground temperature, exact periodic solution", []string{"Quantity", "Value"}, "text", "text")
	t.row("Mean ground surface temperature (n-factors applied)", degC(g.SurfaceMean_C))
	t.row("Annual swing at the surface (amplitude, half the range)", fixed(g.SurfaceAnnualAmplitude_K, 1)+" K")
	if g.AnnualSwingDepth_m > 0 {
		t.row("Depth where the annual swing falls below 0.1 K", fixed(g.AnnualSwingDepth_m, 1)+" m")
	}
	t.row("Depth of the column", fixed(g.ColumnDepth_m, 1)+" m")
	if g.DomainDeepEnough {
		t.row("Column deep enough for the annual wave", "yes")
	} else {
		t.row("Column deep enough for the annual wave", "NO: the bottom boundary disturbs the deepest temperatures; make the last layer thicker")
	}
	return &block{Table: t}
}

// groundPeriodTables lists, for each period, the exact periodic
// temperature at each probe: amplitude, lag behind the surface and range.
func groundPeriodTables(r *results.Results) []*block {
	g := r.Ground
	if g == nil {
		return nil
	}
	var out []*block
	freezes := false
	for _, l := range r.Layers {
		freezes = freezes || l.Freezing
	}
	// The simulated range at each probe depth, set beside the exact
	// values of the longest period (a freezing column's exact solution
	// knows no latent heat).
	simAt := map[float64]results.Probe{}
	if r.Simulation != nil {
		for _, q := range r.Simulation.Probes {
			simAt[q.Depth_m] = q
		}
	}
	longest := -1
	var unforced []string
	for i, p := range g.Periodic {
		if len(p.Probes) > 0 && p.SurfaceAmplitude_K >= 0.005 && (longest < 0 || p.Period_h > g.Periodic[longest].Period_h) {
			longest = i
		}
	}
	for i, p := range g.Periodic {
		if len(p.Probes) == 0 {
			continue
		}
		if p.SurfaceAmplitude_K < 0.005 {
			unforced = append(unforced, periodLabel(p.Period_h))
			continue
		}
		withSim := i == longest && len(simAt) > 0
		lagUnit, lagF := "h", 1.0
		if p.Period_h > 240 {
			lagUnit, lagF = "d", 1.0/24
		}
		caption := fmt.Sprintf("Period %s: surface swing ±%s K", periodLabel(p.Period_h), fixed(p.SurfaceAmplitude_K, 1))
		if p.SwingDepth_m > 0 {
			caption += fmt.Sprintf(", below 0.1 K from %s m down", fixed(p.SwingDepth_m, 2))
		}
		if p.DampingDepth_m > 0 {
			caption += fmt.Sprintf("; damping depth √(aP/π) of the top layer %s m", fixed(p.DampingDepth_m, 2))
		}
		if freezes {
			caption += " (exact, without latent heat)"
		}
		head := []string{"Depth (m)", "Swing, amplitude (K)", "Lag behind the surface (" + lagUnit + ")", "Lowest", "Mean", "Highest"}
		if withSim {
			head = append(head, "Simulated lowest", "Simulated highest")
		}
		t := newTable(caption, head)
		tiny := false
		for _, q := range p.Probes {
			amp, lag := sig(q.Amplitude_K, 2), fixed(q.Lag_h*lagF, 1)
			if q.Amplitude_K < 0.001 {
				amp, lag = "< 0.001", dash
				tiny = true
			}
			cells := []string{fixed(q.Depth_m, 2), amp, lag, degC(q.Min_C), degC(q.Mean_C), degC(q.Max_C)}
			if withSim {
				if s, ok := simAt[q.Depth_m]; ok {
					cells = append(cells, degC(s.Min_C), degC(s.Max_C))
				} else {
					cells = append(cells, dash, dash)
				}
			}
			t.row(cells...)
		}
		if freezes {
			t.Notes = append(t.Notes, "These exact periodic values ignore latent heat: they treat the soil as if it never froze, with its unfrozen properties. Where the ground freezes the real swing is smaller and later; the simulated range (latent heat included) is the one to use there.")
		}
		t.Notes = append(t.Notes, "Lowest and highest are the mean minus and plus this period's swing alone; the other periods add to it.")
		if withSim {
			t.Notes = append(t.Notes, "Simulated lowest and highest: the whole range of the transient simulation at that depth, every period of the forcing together"+map[bool]string{true: ", latent heat included", false: ""}[freezes]+".")
		}
		if tiny {
			t.Notes = append(t.Notes, "A swing below 0.001 K has died out; its lag is not given.")
		}
		out = append(out, &block{Table: t})
	}
	if len(unforced) > 0 {
		out = append(out, &block{Text: []string{"No exact periodic table for the period of " + strings.Join(unforced, " and ") + ": the surface forcing has no swing at that period."}})
	}
	return out
}

// frostSummary is the frost sentence of the report summary; sim tells
// whether a transient simulation ran.
func frostSummary(f *results.Frost, sim bool) string {
	idx, from := indexUsed(f)
	var s string
	switch {
	case !sim:
		s = "No transient simulation was run, so there is no simulated frost depth"
	case f.MaxFrostDepth_m == nil:
		s = "There is no headline simulated frost depth (" + notComputed(f, "max_frost_depth_m") + ")"
	case *f.MaxFrostDepth_m > 0:
		s = fmt.Sprintf("The simulated frost reaches %s m below the surface", fixed(*f.MaxFrostDepth_m, 2))
		if k := headlineWinter(f); k >= 0 && len(f.Winters) > 1 {
			s += fmt.Sprintf(" at its deepest (%s, %s, of %d complete and settled winters)", f.Winters[k].Label, f.Winters[k].MaxFrostDate, countHeadline(f))
		}
	default:
		s = "The simulated ground does not freeze"
	}
	if f.FreezingIndex_Cd != nil {
		per := " per winter"
		if f.IndexSource.Origin == results.FromSimulated {
			per = " over the simulated cold period"
		} else if f.IndexSource.Origin == results.FromRecord {
			per = " (" + f.IndexSource.Detail() + ")"
		}
		s += fmt.Sprintf(", with an air freezing index of %s%s.", cd(*f.FreezingIndex_Cd), per)
	} else {
		s += "; the air freezing index was " + notComputed(f, "freezing_index_Cd") + "."
	}
	switch {
	case f.StefanDepth_m != nil || f.ModifiedBerggrenDepth_m != nil:
		s += fmt.Sprintf(" From a surface freezing index of %s (n-factor %s × %s), the Stefan estimate is %s and the modified Berggren estimate %s.",
			cd(*idx), trimZeros(sig(f.NFactorFreezing, 3)), from,
			optText(f, "stefan_depth_m", f.StefanDepth_m, func(v float64) string { return fixed(v, 2) + " m" }),
			optText(f, "modified_berggren_depth_m", f.ModifiedBerggrenDepth_m, func(v float64) string { return fixed(v, 2) + " m" }))
	default:
		s += " There is no Stefan or modified Berggren estimate (" + notComputed(f, "stefan_depth_m") + ")."
	}
	if f.IndexSource.Origin == results.FromDesign && f.DesignFreezingIndex_Cd != nil {
		s += fmt.Sprintf(" The closed forms use the design air freezing index of %s.", cd(*f.DesignFreezingIndex_Cd))
	}
	return s
}

// winterStart names the day the winter years of f begin.
func winterStart(f *results.Frost) string {
	if f.WinterYearStartDate == "" {
		return "1 July"
	}
	if f.WinterYearStartDate == "1 Jul" {
		return "1 July"
	}
	return f.WinterYearStartDate + " (the warmest time of the forcing)"
}
