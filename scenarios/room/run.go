package room

import (
	"context"
	"fmt"
	"math"
	"math/cmplx"

	"gonum.org/v1/gonum/dsp/fourier"

	"tempstack/climate"
	"tempstack/fileerr"
	"tempstack/layers"
	"tempstack/scenarios/results"
	"tempstack/solver"
)

// Cautions are the room run's cautions, after the general ones, when the
// windows' sun all goes to the air (CautionsFor says which apply).
var Cautions = []string{
	"One air node: the room is taken as well mixed; radiant exchange between surfaces is lumped into the inside surface resistances (ISO 6946), and the sun through the windows is delivered to the air.",
	"Comfort criteria are set by local guidance; hours above a threshold here are a comparison between designs, not a compliance check.",
}

// sunToCaution replaces the first caution when a window sends its sun to
// the elements' surfaces.
const sunToCaution = "One air node: the room is taken as well mixed; radiant exchange between surfaces is lumped into the inside surface resistances (ISO 6946); the sun through the windows is absorbed where sun_to puts it (the fractions are inputs: where the sun patch falls moves through the day) and the rest is delivered to the air."

// CautionsFor returns the room run's cautions for rs.
func CautionsFor(rs *Spec) []string {
	for _, w := range rs.Windows {
		if len(w.SunTo) > 0 {
			return append([]string{sunToCaution}, Cautions[1:]...)
		}
	}
	return Cautions
}

// Run solves room rs: the exact periodic solution, the coupled simulation,
// and both again without the elements' mass. It returns the room's
// results and the warnings of the run (a cycle that does not repeat, a
// room that did not settle). Errors are *fileerr.Error naming the key.
func Run(ctx context.Context, rs *Spec) (*results.RoomResult, []string, error) {
	p, err := newPlan(rs)
	if err != nil {
		return nil, nil, err
	}
	wrap := func(err error) error { return &fileerr.Error{File: rs.File, Key: "room", Err: err} }
	x, err := p.exact(p.room)
	if err != nil {
		return nil, nil, wrap(err)
	}
	xb, err := p.exact(p.bare)
	if err != nil {
		return nil, nil, wrap(err)
	}
	sim, err := p.simulate(ctx, rs, p.room, p.meshes, x)
	if err != nil {
		return nil, nil, wrap(err)
	}
	bareMeshes := make([]*solver.Mesh, len(p.bare.Elements))
	simb, err := p.simulate(ctx, rs, p.bare, bareMeshes, xb)
	if err != nil {
		return nil, nil, wrap(err)
	}
	// The cross-check: the simulation of the linear room (the ventilation
	// at its daily mean, as the exact method takes it) against the exact
	// air temperature over the cycle.
	lin := sim
	if rs.Ventilation.Scheduled {
		lp := *p
		lp.cond = func(float64) float64 { return p.room.Conductance }
		if lin, err = lp.simulate(ctx, rs, p.room, p.meshes, x); err != nil {
			return nil, nil, wrap(err)
		}
	}
	check := exactCheck(p, x, lin.res)
	sim.summary.ExactCheck_K = &check
	var warnings []string
	rm := &results.RoomResult{
		Volume_m3: rs.Volume, AirHeatCapacity_kJ_K: p.room.AirCapacity / 1000,
		VentilationDay_ach: rs.Ventilation.Day, MeanConductance_W_K: p.room.Conductance,
		OperativeTemperature: "mean of the room air temperature and the area-weighted mean inside surface temperature of the elements and windows (a window's inside surface from the steady flux through its U value and an Rsi of 0.13 m2 K/W)",
		Thresholds_C:         rs.Thresholds,
	}
	if v := rs.Ventilation; v.Scheduled {
		rm.VentilationNight_ach, rm.NightFrom_h, rm.NightTo_h = &v.Night, &v.NightFrom, &v.NightTo
		rm.Notes = append(rm.Notes, fmt.Sprintf("The exact periodic solution is linear: it takes the daily mean ventilation (%.2f air changes per hour); the simulation switches between the day and night rates.", v.Mean()))
	}
	rm.GainsMean_W = real(x.meanF.Gains)
	for _, q := range x.meanF.Surface {
		rm.GainsMean_W += real(q)
	}
	rm.Periodic = periodicSummary(p, x)
	rm.Simulation = &sim.summary
	ydaily, err := solver.RoomHarmonic(p.room, climate.Day, solver.RoomForcing{})
	if err != nil {
		return nil, nil, wrap(err)
	}
	var toAll, fromAll float64
	for _, ph := range sim.summary.Paths {
		toAll += ph.ToAir_kWh_day
		fromAll += ph.FromAir_kWh_day
	}
	for e, el := range rs.Elements {
		sel := p.room.Elements[e]
		c := layers.Construction{Layers: el.Layers, Orientation: el.Orientation}
		re := results.RoomElement{
			Name: el.Name, Area_m2: el.Area, Orientation: el.Orientation.String(), Back: el.Back.String(),
			Construction: el.Construction, Sunlit: el.Sunlit,
			Layers:                   el.Report,
			UValue_W_m2K:             sel.U(),
			ArealHeatCapacity_kJ_m2K: c.ArealHeatCapacity() / 1000,
			InsideAdmittance_W_m2K:   cmplx.Abs(ydaily.Admittance[e]) / el.Area,
		}
		if x.meanF.Surface != nil && p.surface[e] != nil {
			v := real(x.meanF.Surface[e])
			re.WindowSunMean_W = &v
		}
		ph := sim.summary.Paths[2+e]
		to, from := ph.ToAir_kWh_day, ph.FromAir_kWh_day
		re.HeatToAir_kWh_day, re.HeatFromAir_kWh_day = &to, &from
		if toAll > 0 {
			v := to / toAll
			re.ShareOfHeatToAir = &v
		}
		if fromAll > 0 {
			v := from / fromAll
			re.ShareOfHeatFromAir = &v
		}
		rm.Elements = append(rm.Elements, re)
	}
	for _, w := range rs.Windows {
		rw := results.RoomWindow{Name: w.Name, Area_m2: w.Area, UValue_W_m2K: w.U, GValue: w.G}
		if w.Sun != nil {
			irr := w.Sun
			m, _ := fourierOf(fourier.NewFFT(p.samples), func(t float64) float64 { return math.Max(0, irr.At(t)) }, p.period, p.samples)
			rw.SolarMean_W = w.G * w.Area * m
		}
		if len(w.SunTo) > 0 {
			for _, sh := range w.SunTo {
				rw.SunTo = append(rw.SunTo, results.RoomSunShare{Element: rs.Elements[sh.Element].Name, Fraction: sh.Fraction})
			}
			a := w.AirFraction()
			rw.SunToAirFraction = &a
		}
		rm.Windows = append(rm.Windows, rw)
	}
	if p.surface != nil {
		rm.Notes = append(rm.Notes, "Window sun on the surfaces (sun_to): it is absorbed at the wall side of each element's inside surface resistance; part reaches the air through Rsi at once, the rest enters the element and comes back later (its mass delays it). Each element's heat to the air includes what it gives back. Without the mass the same sun lands on the same, now massless, surfaces: it reaches the air through Rsi at once, save the part Rsi·U of it that leaves through an element backed by the outside.")
	}
	mr := &results.RoomMassRemoved{Periodic: periodicSummary(p, xb), Simulation: &simb.summary}
	dp := simb.summary.OperativeMax_C - sim.summary.OperativeMax_C
	da := simb.summary.AirMax_C - sim.summary.AirMax_C
	mr.PeakReduction_K, mr.AirPeakReduction_K = &dp, &da
	for i, h := range sim.summary.HoursAbove {
		mr.HoursSaved = append(mr.HoursSaved, results.HoursAbove{Threshold_C: h.Threshold_C, Hours: simb.summary.HoursAbove[i].Hours - h.Hours})
	}
	mr.Statement = massStatement(sim.summary, simb.summary, dp)
	if c := sim.summary.CycleChange_K; c > 0.05 {
		warnings = append(warnings, fmt.Sprintf("the simulated cycle does not yet repeat: the room changes by %.2f K from its start to its end; lengthen room.warm_up (or leave it to auto)", c))
	}
	if !sim.summary.Settled {
		warnings = append(warnings, fmt.Sprintf("the room did not settle within %d cycles (last change %.3f K); the reported cycle may still drift", sim.summary.SettleCycles, *sim.summary.SettleChange_K))
	}
	if w := implausibleAir(sim.summary, p.room.Conductance); w != "" {
		warnings = append(warnings, w)
	}
	rm.MassRemoved = mr
	rm.Notes = append(rm.Notes, "Comfort criteria (which temperature, which thresholds, how many hours) are set by local guidance; the thresholds here are inputs, not a verdict.")
	roomSeries(rm, p, x, xb, sim, simb)
	return rm, warnings, nil
}

// The range of room air temperatures a building can plausibly reach, degC:
// beyond it an input is most likely wrong (gains in kW written as W, a
// window area in cm2, a room sealed from the outdoor air). Common practice:
// the hottest attics stay below about 70 degC, and outdoor air has not been
// recorded below about -90 degC.
const (
	plausibleAirMax = 80.0
	plausibleAirMin = -90.0
)

// implausibleAir returns a warning when the simulated room air leaves the
// range a building can reach, naming the outdoor conductance h (W/K); ""
// otherwise.
func implausibleAir(s results.RoomSimulation, h float64) string {
	if s.AirMax_C <= plausibleAirMax && s.AirMin_C >= plausibleAirMin {
		return ""
	}
	return fmt.Sprintf("the room air ranges from %.3g to %.3g degC, outside what a building reaches: check the gains (W), the window areas and irradiance, the element areas and the ventilation (the room exchanges %.3g W/K with the outdoor air)",
		s.AirMin_C, s.AirMax_C, h)
}

// periodicSummary reads the exact cycle.
func periodicSummary(p *plan, x *cycle) results.RoomPeriodic {
	out := results.RoomPeriodic{Period_h: p.period / 3600, Harmonics: len(x.harm), AirMean_C: real(x.mean.Air),
		AirMax_C: math.Inf(-1), AirMin_C: math.Inf(1), OperativeMax_C: math.Inf(-1), OperativeMin_C: math.Inf(1)}
	sumOp := 0.0
	for j := range x.air {
		if x.air[j] > out.AirMax_C {
			out.AirMax_C = x.air[j]
			out.AirMaxHour_h = math.Mod(p.period*float64(j)/float64(len(x.air))/3600, 24)
		}
		out.AirMin_C = math.Min(out.AirMin_C, x.air[j])
		out.OperativeMax_C = math.Max(out.OperativeMax_C, x.oper[j])
		out.OperativeMin_C = math.Min(out.OperativeMin_C, x.oper[j])
		sumOp += x.oper[j]
	}
	out.OperativeMean_C = sumOp / float64(len(x.oper))
	return out
}

// massStatement says in one sentence what the mass does to the peak.
func massStatement(with, without results.RoomSimulation, dp float64) string {
	verb := "takes"
	if dp < 0 {
		verb = "adds"
	}
	s := fmt.Sprintf("The mass %s %.1f K %s the peak operative temperature (%.1f degC without it, %.1f degC with it)",
		verb, math.Abs(dp), map[bool]string{true: "off", false: "to"}[dp >= 0], without.OperativeMax_C, with.OperativeMax_C)
	for i, h := range with.HoursAbove {
		if i == 0 || h.Hours > 0 || without.HoursAbove[i].Hours > 0 {
			s += fmt.Sprintf("; above %g degC: %.1f h a day without it, %.1f h with it", h.Threshold_C, without.HoursAbove[i].Hours, h.Hours)
		}
	}
	return s + "."
}

// roomSeries fills the chart and CSV series.
func roomSeries(rm *results.RoomResult, p *plan, x, xb *cycle, sim, simb *simulation) {
	s := &rm.Series
	n := len(x.air)
	stride := max(n/1440, 1)
	for j := 0; j < n; j += stride {
		s.CycleTime_h = append(s.CycleTime_h, p.period*float64(j)/float64(n)/3600)
		s.CycleOutdoor_C = append(s.CycleOutdoor_C, x.outdoor[j])
		s.CycleAir_C = append(s.CycleAir_C, x.air[j])
		s.CycleOperative_C = append(s.CycleOperative_C, x.oper[j])
		s.CycleAirNoMass_C = append(s.CycleAirNoMass_C, xb.air[j])
		s.CycleOperativeNoMass_C = append(s.CycleOperativeNoMass_C, xb.oper[j])
	}
	res := sim.res
	for j, t := range res.Times {
		s.Time_h = append(s.Time_h, t/3600)
		s.Outdoor_C = append(s.Outdoor_C, p.outdoor(t))
		s.Air_C = append(s.Air_C, res.Air[j])
		s.Operative_C = append(s.Operative_C, sim.operative[j])
		s.AirNoMass_C = append(s.AirNoMass_C, simb.res.Air[j])
		s.OperativeNoMass_C = append(s.OperativeNoMass_C, simb.operative[j])
	}
	s.Surface_C = res.Surface
	s.Heat_W = res.MeanFlow
	s.CycleStart_h = 0
}
