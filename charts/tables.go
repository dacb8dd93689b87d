package charts

import (
	"fmt"
	"math"
	"strings"

	"tempstack/scenarios/results"
)

// newTable returns a table whose first column is text and the rest
// numbers, unless align says otherwise.
func newTable(caption string, head []string, align ...string) *table {
	a := make([]string, len(head))
	for i := range a {
		a[i] = "num"
		if i < len(align) && align[i] != "" {
			a[i] = align[i]
		}
	}
	return &table{Caption: caption, Head: head, Align: a}
}

// row appends a row, padded or cut to the number of columns.
func (t *table) row(cells ...string) {
	r := make([]string, len(t.Head))
	copy(r, cells)
	t.Rows = append(t.Rows, r)
}

// pos formats a positive material property; zero or less means "not
// given" and prints a dash.
func pos(v float64, n int) string {
	if !(v > 0) || !finite(v) {
		return dash
	}
	return trimZeros(sig(v, n))
}

// component names what the results describe, for sentences.
func component(r *results.Results) string {
	switch r.Orientation {
	case "roof", "floor", "wall":
		return r.Orientation
	}
	return "wall"
}

// summary writes the plain-words summary at the top of the report.
func summary(r *results.Results) []string {
	var out []string
	if r.Kind == results.Ground {
		if f := r.Frost; f != nil {
			out = append(out, frostSummary(f, r.Simulation != nil))
		}
		if g := r.Ground; g != nil && !g.DomainDeepEnough {
			out = append(out, fmt.Sprintf("The %s m column is shallower than the depth the annual swing reaches (%s m): the deepest temperatures are disturbed by the bottom boundary.",
				fixed(g.ColumnDepth_m, 1), fixed(g.AnnualSwingDepth_m, 1)))
		}
		if sim := r.Simulation; sim != nil {
			for i, p := range sim.Probes {
				if i == 3 {
					break
				}
				out = append(out, fmt.Sprintf("At %s m depth the simulated ground temperature ranges from %s to %s (mean %s).",
					fixed(p.Depth_m, 2), degC(p.Min_C), degC(p.Max_C), degC(p.Mean_C)))
			}
		}
		out = append(out, "These are estimates for planning only: the design frost depth is set by local codes and a licensed geotechnical engineer, and measured local frost depths govern.")
		return out
	}
	if len(r.Periodic) == 0 {
		return []string{"These results hold no periodic analysis."}
	}
	p := r.Periodic[0]
	comp := component(r)
	out = append(out, fmt.Sprintf("Over a %s cycle, the swing of the heat flow into the room is %s of the swing that a %s with the same U-value but no thermal mass would pass (decrement factor f = |Y₁₂|/U = %s, ISO 13786), and it peaks %s after the outside temperature (time shift).",
		periodLabel(p.Period_h), percent(p.DecrementFactor), comp, sig(p.DecrementFactor, 3), hours(p.TimeShift_h)))
	if u := p.TimeShiftUnwrapped_h; finite(u) && finite(p.Period_h) && u >= p.Period_h {
		out[0] += fmt.Sprintf(" The temperature wave takes %s to cross the %s, more than one period.", hours(u), comp)
	}
	out = append(out, fmt.Sprintf("Steady U-value %s W/(m²·K); thermal resistance %s m²·K/W surface to surface.",
		sig(r.Steady.UValue_W_m2K, 3), sig(r.Steady.ThermalResistance_m2K_W, 3)))
	s := r.Series
	if len(s.Cycle.OutsideAir_C) > 0 && len(s.Cycle.InsideSurface_C) > 0 {
		out_ := maxOf(s.Cycle.OutsideAir_C) - minOf(s.Cycle.OutsideAir_C)
		in := maxOf(s.Cycle.InsideSurface_C) - minOf(s.Cycle.InsideSurface_C)
		if finite(out_) && finite(in) {
			out = append(out, fmt.Sprintf("In the cycle shown below the outside environment temperature ranges over %s K and the inside surface temperature over %s K; that ratio of temperature swings is a different quantity from the decrement factor.",
				fixed(out_, 1), fixed(in, 1)))
		}
	}
	return out
}

// layerTable lists the layers, outside (or surface) first.
func layerTable(r *results.Results) *table {
	ground := r.Kind == results.Ground
	thick, depth := "Thickness (mm)", "Penetration depth δ (mm)"
	f := 1000.0
	if ground {
		thick, depth, f = "Thickness (m)", "Penetration depth δ (m)", 1
	}
	caption := "Layers, outside first"
	if ground {
		caption = "Layers, from the surface down"
	}
	if len(r.Periodic) > 0 {
		depth += " at " + periodLabel(r.Periodic[0].Period_h)
	}
	t := newTable(caption, []string{"#", "Layer", "Material", thick, "λ (W/(m·K))", "ρ (kg/m³)", "c (J/(kg·K))", "R (m²·K/W)", depth, "Source"},
		"num", "text", "text", "", "", "", "", "", "", "")
	// Sources are numbered and listed once under the table: layers from
	// the same library or soil model share one long citation.
	var sources []string
	sourceNo := func(src string) string {
		if strings.TrimSpace(src) == "" {
			return dash
		}
		for i, s := range sources {
			if s == src {
				return fmt.Sprintf("[%d]", i+1)
			}
		}
		sources = append(sources, src)
		return fmt.Sprintf("[%d]", len(sources))
	}
	total := 0.0
	for i, l := range r.Layers {
		th := dash
		if l.Thickness_m > 0 && finite(l.Thickness_m) {
			th = trimZeros(sig(l.Thickness_m*f, 4))
			total += l.Thickness_m
		}
		name, mat := l.Name, l.Material
		if name == "" {
			name = l.Material
		}
		if mat == "" {
			mat = dash
		}
		pd := dash
		if l.PenetrationDepth_m > 0 && finite(l.PenetrationDepth_m) {
			pd = trimZeros(sig(l.PenetrationDepth_m*f, 3))
		}
		t.row(fmt.Sprint(i+1), name, mat, th, pos(l.Conductivity_W_mK, 3), pos(l.Density_kg_m3, 4),
			pos(l.SpecificHeat_J_kgK, 4), pos(l.Resistance_m2K_W, 3), pd, sourceNo(l.Source))
	}
	if len(r.Layers) > 1 {
		t.row("", "Total", "", trimZeros(sig(total*f, 4)), "", "", "", pos(r.Steady.ThermalResistance_m2K_W, 3), "", "")
	}
	t.Notes = append(t.Notes, "λ thermal conductivity, ρ density, c specific heat capacity, R = d/λ thermal resistance, δ = √(λT/(πρc)) periodic penetration depth. A dash means the value is not given or does not apply (an air layer given by its resistance, a half-space).")
	for i, src := range sources {
		t.Notes = append(t.Notes, fmt.Sprintf("[%d] %s", i+1, src))
	}
	return t
}

// frozenTable lists the frozen-state properties of freezing layers.
func frozenTable(r *results.Results) *block {
	t := newTable("Freezing layers", []string{"#", "Layer", "λ frozen (W/(m·K))", "C frozen (MJ/(m³·K))", "Latent heat L (MJ/m³)", "Freezing point (°C)"}, "num", "text")
	for i, l := range r.Layers {
		if !l.Freezing {
			continue
		}
		t.row(fmt.Sprint(i+1), l.Name, pos(l.ConductivityFrozen_W_mK, 3), pos(l.HeatCapacityFrozen_J_m3K/1e6, 3),
			pos(l.LatentHeat_J_m3/1e6, 3), fixed(l.FreezingPoint_C, 1))
	}
	if len(t.Rows) == 0 {
		return nil
	}
	return &block{Table: t}
}

// steadyTable gives the steady-state U-value and resistances.
func steadyTable(r *results.Results) *block {
	s := r.Steady
	if r.Kind == results.Ground {
		if !(s.ThermalResistance_m2K_W > 0) {
			return nil
		}
		t := newTable("Steady state", []string{"Quantity", "Value", "Unit"}, "text", "", "text")
		t.row("Thermal resistance of the column", sig(s.ThermalResistance_m2K_W, 3), "m²·K/W")
		if s.OutsideSurfaceResistance > 0 {
			t.row("Surface resistance", sig(s.OutsideSurfaceResistance, 3), "m²·K/W")
		}
		return &block{Table: t}
	}
	t := newTable("Steady state (ISO 6946)", []string{"Quantity", "Value", "Unit"}, "text", "", "text")
	t.row("U-value", sig(s.UValue_W_m2K, 3), "W/(m²·K)")
	t.row("Thermal resistance, surface to surface", sig(s.ThermalResistance_m2K_W, 3), "m²·K/W")
	t.row("Inside surface resistance Rsi", sig(s.InsideSurfaceResistance, 3), "m²·K/W")
	t.row("Outside surface resistance Rse", sig(s.OutsideSurfaceResistance, 3), "m²·K/W")
	t.row("Total resistance, environment to environment", sig(s.TotalResistance_m2K_W, 3), "m²·K/W")
	if cm := s.CombinedMethod; cm != nil {
		t.row("Upper limit R′T (heat-flow paths side by side)", sig(cm.UpperLimit_m2K_W, 4), "m²·K/W")
		t.row("Lower limit R″T (layers in series, mixed layers averaged)", sig(cm.LowerLimit_m2K_W, 4), "m²·K/W")
		t.row("Combined method RT = (R′T + R″T)/2", sig(cm.Mean_m2K_W, 4), "m²·K/W")
		t.row("Relative error e = (R′T − R″T)/(2 RT)", sig(100*cm.RelativeError, 2), "%")
		t.Notes = append(t.Notes, "A layer is mixed: U and the total resistance are those of the combined method of ISO 6946. For the periodic analysis and the simulation "+cm.Equivalent+".")
	}
	return &block{Table: t}
}

// periodicTable lists the ISO 13786 properties per period.
func periodicTable(r *results.Results) *block {
	if len(r.Periodic) == 0 {
		return nil
	}
	in, out := "inside", "outside"
	if r.Kind == results.Ground {
		in, out = "bottom", "surface"
	}
	t := newTable("Periodic properties per period", []string{
		"Period", "Decrement factor f", "Time shift (h)", "|Y₁₂| (W/(m²·K))",
		"|Y₁₁| " + in + " (W/(m²·K))", "Lead " + in + " (h)", "|Y₂₂| " + out + " (W/(m²·K))", "Lead " + out + " (h)",
		"κ₁ " + in + " (kJ/(m²·K))", "κ₂ " + out + " (kJ/(m²·K))"}, "text")
	var wrapped bool
	for _, p := range r.Periodic {
		shift := fixed(p.TimeShift_h, 1)
		if u := p.TimeShiftUnwrapped_h; finite(u) && math.Abs(u-p.TimeShift_h) > 0.05 {
			shift += " (" + fixed(u, 1) + ")"
			wrapped = true
		}
		t.row(periodLabel(p.Period_h), sig(p.DecrementFactor, 3), shift, sig(p.PeriodicTransmittance_W_m2K, 3),
			sig(p.InsideAdmittance_W_m2K, 3), fixed(p.InsideAdmittanceLead_h, 1),
			sig(p.OutsideAdmittance_W_m2K, 3), fixed(p.OutsideAdmittanceLead_h, 1),
			sig(p.InsideArealHeatCapacity_kJ_m2K, 3), sig(p.OutsideArealHeatCapacity_kJ_m2K, 3))
	}
	if r.Kind == results.Ground {
		t.Notes = append(t.Notes,
			"Side 1 is the bottom of the column, side 2 the ground surface. f = |Y₁₂|/U is the ratio of the periodic to the steady thermal transmittance of the column; for a deep column the temperature swing at depth is read more directly from the ground temperature chart.",
			"Time shift: how long the heat-flow swing at the bottom lags the surface forcing, in [0, period). Y₁₁ and Y₂₂ are the admittances with how far they lead the temperature; κ₁ and κ₂ are the areal heat capacities.")
	} else {
		t.Notes = append(t.Notes,
			"f = |Y₁₂|/U is the ratio of the periodic to the steady thermal transmittance: the swing of heat flow into the room relative to a massless "+component(r)+" with the same U-value. It is not a ratio of surface temperatures.",
			"Time shift: how long the heat-flow swing into the room lags the outside temperature, in [0, period). Y₁₁ and Y₂₂ are the admittances (heat-flux swing per kelvin of temperature swing on the same side) with how far they lead the temperature; κ₁ and κ₂ are the areal heat capacities, surface resistances included.")
	}
	if wrapped {
		t.Notes = append(t.Notes, "A time shift in brackets counts whole periods: it is the full travel time of the wave through the construction.")
	}
	return &block{Table: t}
}

// surfaceFactorTable lists the surface factor of the admittance method
// per period (walls only).
func surfaceFactorTable(r *results.Results) *block {
	if len(r.Periodic) == 0 || r.Kind == results.Ground {
		return nil
	}
	t := newTable("Surface factor (admittance method)", []string{"Period", "Surface factor F", "Lag behind the absorbed heat (h)"}, "text")
	for _, p := range r.Periodic {
		t.row(periodLabel(p.Period_h), sig(p.SurfaceFactor, 3), fixed(p.SurfaceFactorLag_h, 1))
	}
	t.Notes = append(t.Notes, "F = |1 − Rsi·Y₁₁|: of a heat-flux swing absorbed at the inside surface (sun through a window, lights), the part passed on to the room air, lagging the absorbed heat by the time given; the rest is taken up by the "+component(r)+". A massless "+component(r)+" passes on (R + Rse)/(Rsi + R + Rse). Here Rsi = "+sig(r.Steady.InsideSurfaceResistance, 3)+" m²·K/W of ISO 6946, as in the rest of the analysis (published surface-factor tables assume about 0.12).")
	return &block{Table: t}
}

// energyTable sets the heat that entered through each surface beside the
// change of heat stored in the construction over the simulated run.
func energyTable(r *results.Results) *block {
	s := r.Simulation
	if s == nil {
		return nil
	}
	in, out := "inside", "outside"
	if r.Kind == results.Ground {
		in, out = "bottom", "ground surface"
	}
	t := newTable("Energy balance of the simulation", []string{"Quantity", "Value", "Unit"}, "text", "", "text")
	kJ := func(v float64) string { return sig(v/1000, 4) }
	total := s.HeatInOutside_J_m2 + s.HeatInInside_J_m2
	if s.HeatInOutside_J_m2 != 0 || s.HeatInInside_J_m2 != 0 || s.StoredHeat_J_m2 != 0 {
		t.row("Heat that entered through the "+out, kJ(s.HeatInOutside_J_m2), "kJ/m²")
		t.row("Heat that entered through the "+in, kJ(s.HeatInInside_J_m2), "kJ/m²")
		t.row("Total heat that entered", kJ(total), "kJ/m²")
		t.row("Change of heat stored (sensible and latent)", kJ(s.StoredHeat_J_m2), "kJ/m²")
		t.row("Difference", kJ(total-s.StoredHeat_J_m2), "kJ/m²")
	}
	t.row("Relative error of the balance", sig(s.EnergyBalanceRelativeError, 2), "")
	t.Notes = append(t.Notes, "Heat counts positive into the construction. The heat that entered through both surfaces must equal the change of heat stored; a relative error at round-off level (about 10⁻¹² or smaller) means the simulation conserves energy.")
	return &block{Table: t}
}

// stepTable summarises the step-response run.
func stepTable(r *results.Results) *block {
	st := r.StepResponse
	if st == nil {
		return nil
	}
	t := newTable("Surface heat uptake after a step", []string{"Quantity", "Simulated", "Half-space closed form", "Unit"}, "text", "", "", "text")
	t.row("Step of the "+st.Side+" surface temperature", fixed(st.Change_K, 1), "", "K")
	t.row("Duration", trimZeros(sig(st.Duration_s, 4)), "", "s")
	t.row("Surface layer", st.SurfaceLayer, "", "")
	t.row("Thermal effusivity b = √(λρc) of the surface layer", "", trimZeros(sig(st.SurfaceEffusivity_Ws05_m2K, 4)), "W·s^½/(m²·K)")
	t.row("Closed form valid until (far face of the surface layer reached)", "", trimZeros(sig(st.HalfSpaceValidFor_s, 3)), "s")
	t.row("Heat flux 1 s after the step", sig(st.FluxAt1s_W_m2, 4), sig(st.HalfSpaceFluxAt(1), 4), "W/m²")
	t.row("Heat flux at the end", sig(st.FluxAtEnd_W_m2, 4), sig(st.FluxAtEndHalfSpace_W_m2, 4), "W/m²")
	t.row("Heat taken up over the duration", sig(st.HeatAbsorbed_J_m2/1000, 4), sig(st.HeatAbsorbedHalfSpace_J_m2/1000, 4), "kJ/m²")
	for i := range t.Rows {
		if t.Rows[i][1] == "" {
			t.Rows[i][1] = dash
		}
		if t.Rows[i][2] == "" {
			t.Rows[i][2] = dash
		}
	}
	t.Notes = append(t.Notes, "Closed form: q = b ΔT / √(π t) and Q = 2 b ΔT √(t/π) for a semi-infinite solid (Incropera et al., Fundamentals of Heat and Mass Transfer, §5.7). It holds until the heat reaches the far face of the surface layer; after that the two columns are expected to differ.")
	return &block{Table: t}
}

// checkTable sets the periodic properties fitted from the simulation
// beside the exact ones.
func checkTable(r *results.Results) *block {
	if r.Simulation == nil || len(r.Simulation.PeriodicCheck) == 0 {
		return nil
	}
	t := newTable("Simulation against the exact periodic solution", []string{
		"Period", "f simulated", "f exact", "Difference", "Time shift simulated (h)", "Time shift exact (h)", "Difference (h)"}, "text")
	for _, c := range r.Simulation.PeriodicCheck {
		d := c.DecrementFactor - c.ExactDecrementFactor
		rel := dash
		if c.ExactDecrementFactor != 0 && finite(d/c.ExactDecrementFactor) {
			rel = percent(d / c.ExactDecrementFactor)
		}
		t.row(periodLabel(c.Period_h), sig(c.DecrementFactor, 4), sig(c.ExactDecrementFactor, 4),
			sig(d, 2)+" ("+rel+")", fixed(c.TimeShift_h, 2), fixed(c.ExactTimeShift_h, 2), fixed(c.TimeShift_h-c.ExactTimeShift_h, 2))
	}
	t.Notes = append(t.Notes, "The simulated values are fitted to the simulated series; the two methods are independent, so small differences measure the numerical error of the simulation.")
	return &block{Table: t}
}

// probeTable lists the simulated temperature statistics at each probe.
func probeTable(r *results.Results) *block {
	if r.Simulation == nil || len(r.Simulation.Probes) == 0 {
		return nil
	}
	head := "Position from the outside (mm)"
	f, n := 1000.0, 3
	if r.Kind == results.Ground {
		head, f, n = "Depth (m)", 1, 3
	}
	t := newTable("Simulated temperatures at the probes", []string{head, "Lowest", "Mean", "Highest"})
	for _, p := range r.Simulation.Probes {
		t.row(sig(p.Depth_m*f, n), degC(p.Min_C), degC(p.Mean_C), degC(p.Max_C))
	}
	return &block{Table: t}
}

// methods lists the methods used and their sources.
func methods(r *results.Results) []string {
	s := r.Steady
	var m []string
	if r.Kind == results.Ground {
		m = append(m, "Soil column: horizontal layers from the surface down, ending in a semi-infinite half-space (or a deep layer); surface forcing through the surface resistance given in the scenario.")
	} else {
		m = append(m, fmt.Sprintf("Steady state: layers in series with the surface resistances of ISO 6946 (here Rsi = %s and Rse = %s m²·K/W); U = 1 / (Rsi + ΣR + Rse).",
			sig(s.InsideSurfaceResistance, 3), sig(s.OutsideSurfaceResistance, 3)))
		if cm := s.CombinedMethod; cm != nil {
			m = append(m, fmt.Sprintf("Mixed layers (studs in insulation, mortar joints): the combined method of ISO 6946 (clause 6.7 of ISO 6946:2017). Upper limit R′T: the %d heat-flow paths side by side, each path in series from environment to environment, 1/R′T = Σ fp/RTp (the parts of different mixed layers taken as laid out independently, path fraction = product of the parts' fractions). Lower limit R″T: the layers in series, each mixed layer as its parts side by side, 1/R″j = Σ fm/Rmj. RT = (R′T + R″T)/2, relative error e = (R′T − R″T)/(2 RT). For the periodic analysis and the simulation %s.",
				cm.Paths, cm.Equivalent))
		}
	}
	if r.Kind != results.Ground {
		m = append(m, "Periodic properties: heat transfer matrices of ISO 13786 for each period, layers in series with the surface resistances. Decrement factor f = |Y₁₂|/U (periodic over steady thermal transmittance); time shift from the argument of Y₁₂; admittances Y₁₁ and Y₂₂; areal heat capacities κ₁ and κ₂.")
	}
	if r.Kind == results.Ground {
		m = append(m, "Periodic penetration depth δ = √(λT/(πρc)) (ISO 13786), the damping depth d of the ground: in a uniform soil the swing has fallen to 1/e of the surface swing at d.")
	} else {
		m = append(m, "Periodic penetration depth δ = √(λT/(πρc)) (ISO 13786).")
	}
	if len(r.Periodic) > 0 && r.Kind != results.Ground {
		m = append(m, "Surface factor of the admittance method (CIBSE Guide A, section 5): F = 1 − Rsi·Y₁₁, the part of a heat-flux swing absorbed at the inside surface that is passed on to the room air, with its lag.")
	}
	if r.Kind == results.Ground {
		m = append(m, "Exact periodic ground temperatures: the heat transfer matrices of ISO 13786 for each period, layers in series from the surface down, ending in a half-space; in a uniform soil they reduce to T(z, t) = Tm − As·exp(−z/d)·cos(2πt/P − z/d) with d = √(aP/π). Linear: no latent heat, unfrozen properties.")
	}
	if sim := r.Simulation; sim != nil {
		m = append(m, fmt.Sprintf("Transient simulation: one-dimensional finite volumes (%d cells, layer interfaces on cell faces), an L-stable second-order time scheme (TR-BDF2) with a time step of %s h and a tridiagonal solve per step; latent heat by an enthalpy formulation. Relative energy-balance error %s.",
			sim.Cells, sig(sim.Step_h, 3), sig(sim.EnergyBalanceRelativeError, 2)))
	}
	if r.Frost != nil {
		m = append(m,
			"Stefan frost depth X = √(2 k F / L): k frozen conductivity, F surface freezing index (converted to °C·s), L latent heat per volume of soil.",
			"Modified Berggren frost depth (Aldrich and Paynter, 1953; US Army TM 5-852-6 / UFC 3-130-06): the Stefan form with the mean of frozen and unfrozen conductivity, multiplied by a coefficient λ that depends on the thermal ratio α and the fusion parameter μ.")
	}
	if len(r.Series.Step.Time_s) > 0 || r.StepResponse != nil {
		m = append(m, "Surface heat uptake after a step, closed form: a semi-infinite solid whose surface temperature changes by ΔT, q = λ ΔT / √(π a t) (Carslaw and Jaeger, Conduction of Heat in Solids, §2.4; Incropera et al., Fundamentals of Heat and Mass Transfer, §5.7).")
	}
	m = append(m, "Charts: Apache ECharts 5.6.0, embedded in this file. Long time series are thinned for display only.")
	return m
}
