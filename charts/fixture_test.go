package charts

import (
	"math"

	"tempstack/scenarios/results"
)

// The fixtures below are INVENTED data for rendering tests only: the
// numbers are shaped like real results (smooth daily and annual waves,
// damped with depth) but come from no calculation and check no physics.

func linspace(a, b float64, n int) []float64 {
	v := make([]float64, n)
	for i := range v {
		v[i] = a + (b-a)*float64(i)/float64(n-1)
	}
	return v
}

func wave(t []float64, mean, amp, period, peak float64) []float64 {
	v := make([]float64, len(t))
	for i, x := range t {
		v[i] = mean + amp*math.Cos(2*math.Pi*(x-peak)/period)
	}
	return v
}

// wallFixture is an invented four-layer wall with every wall section
// filled: periodic, simulation and step response.
func wallFixture() *results.Results {
	r := &results.Results{
		Title:        "Invented test wall: brick, mineral wool, block, plaster",
		Kind:         "wall",
		ScenarioFile: "fixtures/invented-wall.yaml",
		Orientation:  "wall",
		Layers: []results.Layer{
			{Name: "facing brick", Material: "clay-brick", Source: "invented for tests", Thickness_m: 0.105, Conductivity_W_mK: 0.77, Density_kg_m3: 1750, SpecificHeat_J_kgK: 1000, Resistance_m2K_W: 0.136, PenetrationDepth_m: 0.109},
			{Name: "mineral wool", Material: "mineral-wool", Source: "invented for tests", Thickness_m: 0.1, Conductivity_W_mK: 0.035, Density_kg_m3: 30, SpecificHeat_J_kgK: 1030, Resistance_m2K_W: 2.857, PenetrationDepth_m: 0.177},
			{Name: "concrete block", Material: "dense-block", Source: "invented for tests", Thickness_m: 0.1, Conductivity_W_mK: 1.13, Density_kg_m3: 2000, SpecificHeat_J_kgK: 1000, Resistance_m2K_W: 0.088, PenetrationDepth_m: 0.125},
			{Name: "gypsum plaster", Source: "invented for tests", Thickness_m: 0.015, Conductivity_W_mK: 0.4, Density_kg_m3: 1000, SpecificHeat_J_kgK: 1000, Resistance_m2K_W: 0.0375, PenetrationDepth_m: 0.105},
		},
		Steady: results.Steady{UValue_W_m2K: 0.303, ThermalResistance_m2K_W: 3.12, TotalResistance_m2K_W: 3.29, InsideSurfaceResistance: 0.13, OutsideSurfaceResistance: 0.04},
		Periodic: []results.PeriodicResult{
			{Period_h: 24, DecrementFactor: 0.214, TimeShift_h: 9.4, TimeShiftUnwrapped_h: 9.4, PeriodicTransmittance_W_m2K: 0.0648, InsideAdmittance_W_m2K: 4.1, InsideAdmittanceLead_h: 2.3, OutsideAdmittance_W_m2K: 5.2, OutsideAdmittanceLead_h: 2.0, InsideArealHeatCapacity_kJ_m2K: 58, OutsideArealHeatCapacity_kJ_m2K: 72},
			{Period_h: 168, DecrementFactor: 0.71, TimeShift_h: 14.2, TimeShiftUnwrapped_h: 14.2, PeriodicTransmittance_W_m2K: 0.215, InsideAdmittance_W_m2K: 1.9, InsideAdmittanceLead_h: 20.5, OutsideAdmittance_W_m2K: 2.4, OutsideAdmittanceLead_h: 18.1, InsideArealHeatCapacity_kJ_m2K: 110, OutsideArealHeatCapacity_kJ_m2K: 140},
		},
		Simulation: &results.Simulation{
			Duration_h: 168, Step_h: 0.25, Cells: 84, EnergyBalanceRelativeError: 3.1e-13, SpinUpCycles: 0, OutputStep_h: 0.25,
			HeatInOutside_J_m2: -1.52e6, HeatInInside_J_m2: 1.49e6, StoredHeat_J_m2: -3.0e4,
			Probes:        []results.Probe{{Depth_m: 0.05, Min_C: 6.2, Max_C: 18.9, Mean_C: 12.4}, {Depth_m: 0.2, Min_C: 17.1, Max_C: 17.6, Mean_C: 17.3}},
			PeriodicCheck: []results.PeriodicCheck{{Period_h: 24, DecrementFactor: 0.2138, TimeShift_h: 9.41, ExactDecrementFactor: 0.214, ExactTimeShift_h: 9.4}},
		},
		StepResponse: &results.StepResult{Side: "outside", Change_K: 10, Duration_s: 1e5, SurfaceLayer: "facing brick",
			SurfaceEffusivity_Ws05_m2K: 1161, HalfSpaceValidFor_s: 2.2e4, HeatAbsorbed_J_m2: 3.9e6, HeatAbsorbedHalfSpace_J_m2: 4.1e6,
			FluxAt1s_W_m2: 6540, FluxAtEnd_W_m2: 15.1, FluxAtEndHalfSpace_W_m2: 20.7},
		Warnings: []string{"invented data: this report is a rendering test"},
	}
	s := &r.Series
	s.Cycle.Time_h = linspace(0, 24, 97)
	s.Cycle.OutsideAir_C = wave(s.Cycle.Time_h, 12, 8, 24, 15)
	s.Cycle.OutsideSurface_C = wave(s.Cycle.Time_h, 12.3, 7.2, 24, 15.3)
	s.Cycle.InsideSurface_C = wave(s.Cycle.Time_h, 19.4, 0.25, 24, 24.4)
	s.Cycle.InsideAir_C = wave(s.Cycle.Time_h, 20, 0, 24, 0)
	s.Cycle.InsideFlux_W_m2 = wave(s.Cycle.Time_h, -2.4, 0.52, 24, 24.4)
	s.Profile.Position_m = linspace(0, 0.32, 65)
	s.Profile.Interfaces_m = []float64{0, 0.105, 0.205, 0.305, 0.32}
	for _, x := range s.Profile.Position_m {
		mean := 12 + 7.5*x/0.32
		amp := 8 * math.Exp(-x/0.06)
		s.Profile.Min_C = append(s.Profile.Min_C, mean-amp-0.2)
		s.Profile.Mean_C = append(s.Profile.Mean_C, mean)
		s.Profile.Max_C = append(s.Profile.Max_C, mean+amp+0.2)
	}
	for i := 0; i <= 60; i++ {
		p := math.Pow(10, float64(i)*math.Log10(8760)/60)
		s.Response.Period_h = append(s.Response.Period_h, p)
		s.Response.Decrement = append(s.Response.Decrement, math.Exp(-7.5/math.Sqrt(p)))
		s.Response.TimeShift_h = append(s.Response.TimeShift_h, 1.9*math.Sqrt(p))
	}
	s.Simulation.Time_h = linspace(0, 168, 673)
	s.Simulation.OutsideAir_C = wave(s.Simulation.Time_h, 12, 8, 24, 15)
	s.Simulation.OutsideSurface_C = wave(s.Simulation.Time_h, 12.3, 7.2, 24, 15.3)
	s.Simulation.InsideSurface_C = wave(s.Simulation.Time_h, 19.4, 0.25, 24, 24.4)
	s.Simulation.InsideAir_C = wave(s.Simulation.Time_h, 20, 0, 24, 0)
	s.Simulation.OutsideFlux_W_m2 = wave(s.Simulation.Time_h, -2.4, 30, 24, 13)
	s.Simulation.InsideFlux_W_m2 = wave(s.Simulation.Time_h, -2.4, 0.52, 24, 24.4)
	s.Simulation.ProbeDepth_m = []float64{0.05, 0.2}
	s.Simulation.Probes_C = [][]float64{wave(s.Simulation.Time_h, 12.4, 6.3, 24, 17), wave(s.Simulation.Time_h, 17.3, 0.25, 24, 22)}
	s.Step.Time_s = []float64{}
	for i := 0; i <= 50; i++ {
		t := math.Pow(10, float64(i)/10)
		s.Step.Time_s = append(s.Step.Time_s, t)
		hs := 0.77 * 10 / math.Sqrt(math.Pi*4.4e-7*t)
		s.Step.FluxHalfSpace_W_m2 = append(s.Step.FluxHalfSpace_W_m2, hs)
		s.Step.Flux_W_m2 = append(s.Step.Flux_W_m2, hs*(1-0.5*(1-math.Exp(-t/2e4))))
	}
	return r
}

// groundFixture is an invented two-layer soil column over a half-space
// with a two-year hourly simulation (long enough to be thinned).
func groundFixture() *results.Results {
	r := &results.Results{
		Title:        "Invented test ground column: silt over clay",
		Kind:         "ground",
		ScenarioFile: "fixtures/invented-ground.yaml",
		Layers: []results.Layer{
			{Name: "sandy silt", Source: "invented for tests", Thickness_m: 0.6, Conductivity_W_mK: 1.4, Density_kg_m3: 1800, SpecificHeat_J_kgK: 1300, Resistance_m2K_W: 0.43, PenetrationDepth_m: 2.1,
				Freezing: true, ConductivityFrozen_W_mK: 1.9, HeatCapacityFrozen_J_m3K: 1.9e6, LatentHeat_J_m3: 6.0e7},
			{Name: "silty clay", Source: "invented for tests", Thickness_m: 2.4, Conductivity_W_mK: 1.2, Density_kg_m3: 1900, SpecificHeat_J_kgK: 1400, Resistance_m2K_W: 2, PenetrationDepth_m: 1.9,
				Freezing: true, ConductivityFrozen_W_mK: 1.6, HeatCapacityFrozen_J_m3K: 2.1e6, LatentHeat_J_m3: 9.0e7},
			{Name: "half-space", Source: "invented for tests", Conductivity_W_mK: 2, Density_kg_m3: 2200, SpecificHeat_J_kgK: 900, PenetrationDepth_m: 2.9},
		},
		Steady:   results.Steady{ThermalResistance_m2K_W: 2.43, OutsideSurfaceResistance: 0.04},
		Periodic: []results.PeriodicResult{{Period_h: 8760, DecrementFactor: 0.35, TimeShift_h: 1100, TimeShiftUnwrapped_h: 1100, PeriodicTransmittance_W_m2K: 0.14, InsideAdmittance_W_m2K: 0.9, OutsideAdmittance_W_m2K: 0.8, InsideArealHeatCapacity_kJ_m2K: 2500, OutsideArealHeatCapacity_kJ_m2K: 2300}},
		Simulation: &results.Simulation{Duration_h: 17520, Step_h: 1, Cells: 120, EnergyBalanceRelativeError: 4e-12,
			Probes: []results.Probe{{Depth_m: 0.5, Min_C: -3.1, Max_C: 15.2, Mean_C: 6.3}, {Depth_m: 2, Min_C: 2.9, Max_C: 10.1, Mean_C: 6.4}}},
		Frost: &results.Frost{FreezingIndex_Cd: ptr(420), MaxFrostDepth_m: ptr(0.82), StefanDepth_m: ptr(1.21), ModifiedBerggrenDepth_m: ptr(1.02),
			HeadlineWinter:          "winter 2",
			SurfaceFreezingIndex_Cd: ptr(294), NFactorFreezing: 0.7, SeasonLength_d: ptr(120), MeanAnnualAir_C: ptr(6), IndexSource: results.IndexSource{Origin: results.FromForcing},
			BerggrenLambda: ptr(0.84), BerggrenAlpha: ptr(0.9), BerggrenMu: ptr(0.1),
			Winters: []results.FrostWinter{
				{Label: "winter 1", Start_d: 0, End_d: 181, AirFreezingIndex_Cd: 300, AirThawingIndex_Cd: 900, MaxFrostDepth_m: 0.71, MaxFrostDay: 40, MaxFrostDate: "year 1, 10 Feb",
					MaxThawDepth_m: 0.3, FrozenDays: []results.ProbeDays{{Depth_m: 0.5, Days: 41}, {Depth_m: 2, Days: 0}}},
				{Label: "winter 2", Start_d: 181, End_d: 546, Complete: true, Settled: true, AirFreezingIndex_Cd: 420, AirThawingIndex_Cd: 2100, MaxFrostDepth_m: 0.82, MaxFrostDay: 405, MaxFrostDate: "year 2, 10 Feb",
					MaxThawDepth_m: 0.4, FrozenDays: []results.ProbeDays{{Depth_m: 0.5, Days: 63}, {Depth_m: 2, Days: 0}}},
			}},
		Ground: &results.GroundTemperature{SurfaceMean_C: 6.2, SurfaceAnnualAmplitude_K: 11, AnnualSwingDepth_m: 10.4, ColumnDepth_m: 3,
			DomainDeepEnough: false, GeothermalFlux_W_m2: ptr(0.065), NFactorFreezing: 0.7, NFactorThawing: 1.1,
			Periodic: []results.GroundPeriodic{
				{Period_h: 8760, SurfaceAmplitude_K: 11, SwingDepth_m: 10.4, Probes: []results.GroundProbe{
					{Depth_m: 0.5, Amplitude_K: 9.1, Lag_h: 300, Lag_d: 12.5, Mean_C: 6.2, Min_C: -2.9, Max_C: 15.3},
					{Depth_m: 2, Amplitude_K: 5.0, Lag_h: 1100, Lag_d: 45.8, Mean_C: 6.3, Min_C: 1.3, Max_C: 11.3}}},
				{Period_h: 24, SurfaceAmplitude_K: 3, SwingDepth_m: 0.5, Probes: []results.GroundProbe{
					{Depth_m: 0.5, Amplitude_K: 0.05, Lag_h: 14, Mean_C: 6.2, Min_C: 6.15, Max_C: 6.25},
					{Depth_m: 2, Amplitude_K: 1e-9, Lag_h: 48, Mean_C: 6.3, Min_C: 6.3, Max_C: 6.3}}},
			}},
	}
	r.Simulation.SpinUpCycles, r.Simulation.SpinUpChange_K, r.Simulation.OutputStep_h = 3, 0.004, 2
	s := &r.Series
	s.Profile.Interfaces_m = []float64{0, 0.6, 3.0}
	s.Cycle.Time_h = linspace(0, 8760, 366)
	s.Cycle.OutsideAir_C = wave(s.Cycle.Time_h, 6, 12, 8760, 4900)
	s.Cycle.OutsideSurface_C = wave(s.Cycle.Time_h, 6.2, 11, 8760, 4900)
	s.Cycle.InsideSurface_C = wave(s.Cycle.Time_h, 6.5, 1, 8760, 6900)
	s.Cycle.InsideFlux_W_m2 = wave(s.Cycle.Time_h, 0.06, 0.4, 8760, 6900)
	s.Profile.Position_m = linspace(0, 10, 101)
	s.SimProfile.Position_m = linspace(0, 10, 101)
	for _, z := range s.Profile.Position_m {
		a := 11 * math.Exp(-z/2.5)
		s.Profile.Min_C = append(s.Profile.Min_C, 6.2-a)
		s.Profile.Mean_C = append(s.Profile.Mean_C, 6.2)
		s.Profile.Max_C = append(s.Profile.Max_C, 6.2+a)
		s.SimProfile.Min_C = append(s.SimProfile.Min_C, 6.3-0.85*a)
		s.SimProfile.Mean_C = append(s.SimProfile.Mean_C, 6.3)
		s.SimProfile.Max_C = append(s.SimProfile.Max_C, 6.3+a)
	}
	s.Simulation.Time_h = linspace(0, 17520, 17521)
	s.Simulation.OutsideAir_C = wave(s.Simulation.Time_h, 6, 12, 8760, 4900)
	s.Simulation.OutsideSurface_C = wave(s.Simulation.Time_h, 6.2, 11, 8760, 4900)
	s.Simulation.InsideSurface_C = wave(s.Simulation.Time_h, 6.5, 0.2, 8760, 7900)
	s.Simulation.OutsideFlux_W_m2 = wave(s.Simulation.Time_h, 0, 8, 8760, 4000)
	s.Simulation.InsideFlux_W_m2 = wave(s.Simulation.Time_h, 0.065, 0.02, 8760, 7900)
	s.Simulation.ProbeDepth_m = []float64{0.5, 2}
	s.Simulation.Probes_C = [][]float64{wave(s.Simulation.Time_h, 6.3, 9, 8760, 5400), wave(s.Simulation.Time_h, 6.4, 3.6, 8760, 6300)}
	for _, t := range s.Simulation.Time_h {
		d := 0.0
		if x := math.Cos(2 * math.Pi * (t - 500) / 8760); x > 0.3 {
			d = 0.82 * (x - 0.3) / 0.7
		}
		s.Simulation.FrostDepth_m = append(s.Simulation.FrostDepth_m, d)
		th := 0.0
		if x := math.Cos(2 * math.Pi * (t - 1600) / 8760); d > 0 && x < 0.85 && x > 0.3 {
			th = 0.4 * (0.85 - x)
		}
		s.Simulation.ThawDepth_m = append(s.Simulation.ThawDepth_m, th)
	}
	return r
}

func ptr(v float64) *float64 { return &v }
