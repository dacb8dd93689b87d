package scenarios

import (
	"tempstack/scenarios/results"
	"tempstack/solver"
)

// Environment is a side that exchanges heat with an environment: the
// temperature Temperature (degC) behind the surface resistance Resistance
// (m2 K/W; 0 imposes the temperature on the surface), which may change
// with the time of year (ResistancePeriods, a snow cover). On a ground
// surface n-factors may turn the air temperature into the surface
// temperature; on the outside of a wall the sun may make it the sol-air
// temperature. The outside (ground: surface) of every scenario is one.
type Environment struct {
	// Temperature is the environment temperature (degC), never nil in a
	// decoded scenario.
	Temperature *Forcing
	// Resistance is the surface resistance in m2 K/W between the surface
	// and the environment temperature; 0 imposes the temperature on the
	// surface. With ResistancePeriods it is the value outside the periods.
	Resistance float64
	// ResistancePeriods are the times of each year when the resistance is
	// another (a snow cover in winter); nil: Resistance all year.
	ResistancePeriods []ResistancePeriod
	// NFactors turn the air temperature into the surface temperature of a
	// ground surface; nil: the air temperature is the surface temperature.
	NFactors *NFactors
	// Solar makes a wall's outside environment the sol-air temperature;
	// nil: the air temperature.
	Solar *Solar
}

// NFactors are the n-factors of a ground surface: the surface temperature
// is Freezing x the air temperature below 0 degC and Thawing x it above.
type NFactors struct {
	Freezing float64
	Thawing  float64 // 0: the cover's table gives none (taken as 1, with a warning)
	Cover    string  // the surface preset they came from, if any
}

func decodeEnvironment(d *decoder, o *object, at sideAt) Side {
	sd := Environment{Resistance: at.r, ResistancePeriods: at.periods}
	sd.NFactors = d.decodeNFactors(o)
	sd.Temperature = d.decodeForcing(o, "temperature", forcingTemperature)
	if at.sunlit && o.has("solar") {
		sd.Solar = d.decodeSolar(o, at.s)
	}
	if sd.Temperature == nil || !o.clean() {
		return nil
	}
	if at.bottom && len(sd.Temperature.Harmonics) > 0 {
		o.failf("temperature", "the bottom temperature must be constant: give only a mean")
		return nil
	}
	return sd
}

// Boundary is a solver.Environment boundary: the environment temperature
// with the sun and the n-factors applied at every instant, behind the
// surface resistance (varying in time when it has periods).
func (sd Environment) Boundary() solver.Boundary {
	return solver.Boundary{Kind: solver.Environment, Resistance: sd.Resistance, Temperature: sd.env(), ResistanceAt: sd.resistanceAt()}
}

// Info describes the side: kind harmonic, measured or step, with its
// resistance, n-factors and sun.
func (sd Environment) Info() results.SideForcing {
	out := results.SideForcing{Resistance_m2K_W: sd.Resistance, ResistancePeriods: resistanceInfo(sd)}
	if n := sd.NFactors; n != nil {
		out.Cover = n.Cover
	}
	if sd.hasNFactors() {
		out.NFactorFreezing, out.NFactorThawing = sd.nFactors()
	}
	switch f := sd.Temperature; {
	case f == nil:
		out.Kind = "none"
	case f.Measured != nil:
		out.Kind, out.Record, out.Mean_C = "measured", f.Measured.File, f.Mean
		out.Harmonics = harmonicsInfo(f.Harmonics)
	case f.Step != nil:
		out.Kind, out.Mean_C = "step", f.Step.From
		out.Step = &results.StepInfo{From_C: f.Step.From, To_C: f.Step.To, At_h: f.Step.At / 3600}
	default:
		out.Kind, out.Mean_C = "harmonic", f.Mean
		out.Harmonics = harmonicsInfo(f.Harmonics)
	}
	if sol := sd.Solar; sol != nil {
		si := &results.SolarInfo{Absorptance: sol.Absorptance, AbsorptancePreset: sol.AbsorptanceOf, SkyCorrection_K: sol.SkyCorrection,
			IrradianceMean_W_m2: sol.Irradiance.Mean, IrradianceHarmonics: harmonicsInfo(sol.Irradiance.Harmonics)}
		if m := sol.Irradiance.Measured; m != nil {
			si.IrradianceRecord = m.File
		}
		out.Solar = si
	}
	return out
}

// SurfaceResistance is Resistance (outside the periods).
func (sd Environment) SurfaceResistance() float64 { return sd.Resistance }

func (sd Environment) temperature() *Forcing { return sd.Temperature }
func (sd Environment) drive() *Forcing       { return sd.Temperature }
func (sd Environment) steadyFlux() float64   { return 0 }
func (sd Environment) varies() bool          { return sd.resistanceVaries() }

func (sd Environment) notes(name string) []string {
	if sd.resistanceVaries() {
		return []string{resistanceNote(name, sd.Resistance)}
	}
	return nil
}
