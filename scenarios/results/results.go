package results

// Kind is what a scenario describes and its results are about.
type Kind string

// The kinds.
const (
	Wall   Kind = "wall"   // a wall, roof or floor between outside and inside air
	Ground Kind = "ground" // a soil or rock column below a ground surface
	Room   Kind = "room"   // one room's air node and its layered elements
)

// Results is everything one run of a scenario produces. It is defined once
// here and passed unchanged to the JSON writer, the CSV writer and the
// report (package charts). JSON keys are an output contract (README,
// "Outputs"): core keys are never renamed; new keys may be added.
//
// Units are in the key names (…_m, …_h, …_C, …_W_m2K); inside Go the
// fields hold the same values in those same units, converted from SI at the
// end of a run.
type Results struct {
	Title string `json:"title"`
	TitleBlock
	Kind         Kind    `json:"kind"`
	ScenarioFile string  `json:"scenario_file,omitempty"` // as given on the command line, or "(embedded demo)"
	Orientation  string  `json:"orientation,omitempty"`   // wall kind: wall | roof | floor
	Layers       []Layer `json:"layers"`

	Steady   Steady           `json:"steady,omitzero"` // absent for a room
	Periodic []PeriodicResult `json:"periodic"`

	// Simulation is the transient simulation; nil (null in results.json)
	// when it was not run. SimulationSkipped says why a simulation that
	// the scenario asks for was not run (e.g. a wall of resistance layers
	// only, whose exact solution is the whole answer).
	Simulation        *Simulation `json:"simulation"`
	SimulationSkipped string      `json:"simulation_skipped,omitempty"`
	// Frost and Ground are filled for ground columns; nil otherwise.
	Frost  *Frost             `json:"frost,omitempty"`
	Ground *GroundTemperature `json:"ground,omitempty"`

	// Room is the room kind's result (room.go); nil for other kinds.
	Room *RoomResult `json:"room,omitempty"`

	// StepResponse is filled when analysis.step_response asks for it.
	StepResponse *StepResult `json:"step_response,omitempty"`

	// Study results (variants, sweep, target, uncertainty, fit); nil or
	// empty when the scenario asks for none.
	Variants    []VariantResult    `json:"variants,omitempty"`
	Sweep       *SweepResult       `json:"sweep,omitempty"`
	Target      *TargetResult      `json:"target,omitempty"`
	Uncertainty *UncertaintyResult `json:"uncertainty,omitempty"`
	Fit         *FitResult         `json:"fit,omitempty"`

	// Forcing describes the boundary conditions as given.
	Forcing *ForcingInfo `json:"forcing,omitempty"`

	// Records lists the measured series the run read, with every gap it
	// bridged: nothing is dropped silently.
	Records []RecordInfo `json:"records,omitempty"`

	Warnings []string `json:"warnings,omitempty"`

	// Cautions are the limits of the result in plain sentences (see
	// Cautions): for ground runs always the frost cautions, plus the
	// record's warnings; for walls the limits of the one-dimensional model.
	Cautions []string `json:"cautions"`

	// Series holds the chart data; large, so it is kept out of results.json.
	Series Series `json:"-"`
	// SeriesStreamed says that series.csv went to scenarios.Options.Series
	// while the simulation ran (CSVFiles then lists it without data) and
	// that Series.Simulation holds the samples thinned for the charts
	// (see scenarios.Options.Series).
	SeriesStreamed bool `json:"-"`
}

// Layer describes one layer as it was used in the run, outside (or surface)
// first.
type Layer struct {
	Name                     string  `json:"name"`
	Material                 string  `json:"material,omitempty"` // library key, empty for inline properties
	Source                   string  `json:"source,omitempty"`   // where the property values come from
	Family                   string  `json:"family,omitempty"`   // material family (concrete, masonry, insulation, soil, ...)
	Thickness_m              float64 `json:"thickness_m"`
	Conductivity_W_mK        float64 `json:"conductivity_W_mK,omitempty"`
	Density_kg_m3            float64 `json:"density_kg_m3,omitempty"`
	SpecificHeat_J_kgK       float64 `json:"specific_heat_J_kgK,omitempty"`
	Resistance_m2K_W         float64 `json:"resistance_m2K_W"`              // d/lambda, or the air-layer resistance
	PenetrationDepth_m       float64 `json:"penetration_depth_m,omitempty"` // at the first analysis period
	Diffusivity_m2_s         float64 `json:"diffusivity_m2_s,omitempty"`
	Effusivity_Ws05_m2K      float64 `json:"effusivity_W_s05_m2K,omitempty"`
	Freezing                 bool    `json:"freezing,omitempty"`
	ConductivityFrozen_W_mK  float64 `json:"conductivity_frozen_W_mK,omitempty"`
	HeatCapacityFrozen_J_m3K float64 `json:"heat_capacity_frozen_J_m3K,omitempty"`
	LatentHeat_J_m3          float64 `json:"latent_heat_J_m3,omitempty"`
	FreezingPoint_C          float64 `json:"freezing_point_C,omitempty"`
	// Mix lists the parts of a mixed layer; the values above are then its
	// equivalent homogeneous layer's. Absent for a homogeneous layer.
	Mix []MixPart `json:"fractions,omitempty"`
}

// MixPart is one part of a mixed layer.
type MixPart struct {
	Name               string  `json:"name"`
	Material           string  `json:"material,omitempty"` // library key, empty for inline properties
	Fraction           float64 `json:"fraction"`           // of the layer's face area, 0 to 1
	Conductivity_W_mK  float64 `json:"conductivity_W_mK,omitempty"`
	Density_kg_m3      float64 `json:"density_kg_m3,omitempty"`
	SpecificHeat_J_kgK float64 `json:"specific_heat_J_kgK,omitempty"`
	Resistance_m2K_W   float64 `json:"resistance_m2K_W"` // of the part across the layer's thickness
}

// Steady is the steady-state (ISO 6946) result.
type Steady struct {
	UValue_W_m2K             float64 `json:"u_value_W_m2K"`
	ThermalResistance_m2K_W  float64 `json:"thermal_resistance_m2K_W"` // surface to surface, layers only
	TotalResistance_m2K_W    float64 `json:"total_resistance_m2K_W"`   // including both surface resistances
	InsideSurfaceResistance  float64 `json:"inside_surface_resistance_m2K_W"`
	OutsideSurfaceResistance float64 `json:"outside_surface_resistance_m2K_W"`
	// CombinedMethod holds the limits of the combined method of ISO 6946
	// when a layer is mixed (studs in insulation); nil (absent) when every
	// layer is homogeneous. U-value and total resistance above are then
	// those of the method's mean R_T.
	CombinedMethod *CombinedMethod `json:"combined_method,omitempty"`
}

// CombinedMethod is the total thermal resistance of a construction with
// mixed layers by the combined method of ISO 6946 (clause 6.7 of the 2017
// edition), environment to environment.
type CombinedMethod struct {
	UpperLimit_m2K_W float64 `json:"upper_limit_total_resistance_m2K_W"` // R'_T, heat-flow paths side by side
	LowerLimit_m2K_W float64 `json:"lower_limit_total_resistance_m2K_W"` // R''_T, layers in series, mixed layers as parts side by side
	Mean_m2K_W       float64 `json:"total_resistance_m2K_W"`             // R_T = (R'_T + R''_T)/2, the value used
	RelativeError    float64 `json:"relative_error"`                     // e = (R'_T - R''_T)/(2 R_T), dimensionless
	Paths            int     `json:"paths"`                              // heat-flow paths of the upper limit
	// Equivalent says how the periodic analysis and the simulation
	// treat each mixed layer.
	Equivalent string `json:"equivalent_layer"`
}

// PeriodicResult holds the ISO 13786 properties for one period.
type PeriodicResult struct {
	Period_h                        float64 `json:"period_h"`
	DecrementFactor                 float64 `json:"decrement_factor"` // |Y12| / U
	TimeShift_h                     float64 `json:"time_shift_h"`     // inside lags outside, in [0, period) unless unwrapped
	TimeShiftUnwrapped_h            float64 `json:"time_shift_unwrapped_h"`
	PeriodicTransmittance_W_m2K     float64 `json:"periodic_transmittance_W_m2K"`
	InsideAdmittance_W_m2K          float64 `json:"inside_admittance_W_m2K"`
	InsideAdmittanceLead_h          float64 `json:"inside_admittance_lead_h"`
	OutsideAdmittance_W_m2K         float64 `json:"outside_admittance_W_m2K"`
	OutsideAdmittanceLead_h         float64 `json:"outside_admittance_lead_h"`
	InsideArealHeatCapacity_kJ_m2K  float64 `json:"inside_areal_heat_capacity_kJ_m2K"`
	OutsideArealHeatCapacity_kJ_m2K float64 `json:"outside_areal_heat_capacity_kJ_m2K"`
	// SurfaceFactor is |F|, F = 1 - Rsi Y11 (admittance method): of a
	// heat-flux swing absorbed at the inside surface, the part passed on
	// to the inside air, dimensionless; SurfaceFactorLag_h its lag behind
	// the absorbed heat, h, in [0, period).
	SurfaceFactor      float64 `json:"surface_factor"`
	SurfaceFactorLag_h float64 `json:"surface_factor_lag_h"`
}

// Simulation is the transient finite-volume result.
type Simulation struct {
	Start                      string          `json:"start,omitempty"` // calendar time of the first sample, ISO 8601, when the run follows a dated record
	StartDay                   float64         `json:"start_day"`       // days after 1 January 00:00 of year 1 on the simulation's axis
	Duration_h                 float64         `json:"duration_h"`
	Step_h                     float64         `json:"step_h"`
	Cells                      int             `json:"cells"`
	EnergyBalanceRelativeError float64         `json:"energy_balance_relative_error"`
	SpinUpCycles               int             `json:"spin_up_cycles"`
	SpinUpChange_K             float64         `json:"spin_up_change_K"`    // change of the last spin-up cycle, K, as the convergence test measures it
	SpinUpConverged            bool            `json:"spin_up_converged"`   // the last spin-up cycle repeated the one before within SpinUpTolerance_K
	SpinUpTolerance_K          float64         `json:"spin_up_tolerance_K"` // largest change of a cell over a cycle (where the wave reaches) that counts as periodic
	OutputStep_h               float64         `json:"output_step_h"`
	StoredHeat_J_m2            float64         `json:"stored_heat_J_m2"`     // change of heat content over the run
	HeatInOutside_J_m2         float64         `json:"heat_in_outside_J_m2"` // heat that entered through the outside surface
	HeatInInside_J_m2          float64         `json:"heat_in_inside_J_m2"`  // heat that entered through the inside surface
	Probes                     []Probe         `json:"probes"`
	PeriodicCheck              []PeriodicCheck `json:"periodic_check,omitempty"`

	// SpinUpLastCycleSimulated, present when there was a spin-up, tells
	// whether its last cycle (the one judged against SpinUpTolerance_K
	// and counted in SpinUpCycles) is the first cycle of the simulation
	// itself: the simulation then starts from the state the cycle before
	// left, and its own first cycle is the one shown to repeat.
	SpinUpLastCycleSimulated *bool `json:"spin_up_last_cycle_simulated,omitempty"`
	// SpinUpCoarseCycles, present after a spin-up, is the number of its
	// first, coarse cycles (steps of up to 6 h) run before the
	// SpinUpCycles at the simulation's step; 0 when it had none.
	SpinUpCoarseCycles *int `json:"spin_up_coarse_cycles,omitempty"`
}

// Probe summarises the simulated temperature at one depth.
type Probe struct {
	Depth_m float64 `json:"depth_m"`
	Min_C   float64 `json:"min_C"`
	Max_C   float64 `json:"max_C"`
	Mean_C  float64 `json:"mean_C"`
}

// PeriodicCheck sets the simulated (fitted) periodic properties beside the
// exact ones.
type PeriodicCheck struct {
	Period_h             float64 `json:"period_h"`
	DecrementFactor      float64 `json:"decrement_factor"`
	TimeShift_h          float64 `json:"time_shift_h"`
	ExactDecrementFactor float64 `json:"exact_decrement_factor"`
	ExactTimeShift_h     float64 `json:"exact_time_shift_h"`
}

// GroundTemperature is the exact periodic ground-temperature result.
type GroundTemperature struct {
	SurfaceMean_C            float64          `json:"surface_mean_C"`                  // mean surface temperature (n-factors applied)
	SurfaceAnnualAmplitude_K float64          `json:"surface_annual_amplitude_K"`      // half the annual surface swing
	AnnualSwingDepth_m       float64          `json:"annual_depth_swing_below_0_1K_m"` // depth where the annual swing falls below 0.1 K
	ColumnDepth_m            float64          `json:"column_depth_m"`
	DomainDeepEnough         bool             `json:"domain_deep_enough"`             // column deeper than AnnualSwingDepth_m
	GeothermalFlux_W_m2      *float64         `json:"geothermal_flux_W_m2,omitempty"` // upward into the column; nil with a fixed bottom temperature or an adiabatic bottom
	NFactorFreezing          float64          `json:"n_factor_freezing,omitempty"`
	NFactorThawing           float64          `json:"n_factor_thawing,omitempty"`
	Periodic                 []GroundPeriodic `json:"periodic"`
}

// GroundPeriodic is the exact periodic ground temperature for one period.
type GroundPeriodic struct {
	Period_h           float64 `json:"period_h"`
	SurfaceAmplitude_K float64 `json:"surface_amplitude_K"`
	// SwingDepth_m is the depth below which this period's swing stays
	// under 0.1 K, m (0, left out, when the surface swing is smaller).
	SwingDepth_m float64 `json:"depth_swing_below_0_1K_m,omitempty"`
	// DampingDepth_m is the textbook damping depth d = sqrt(2a/omega) =
	// sqrt(a P / pi) of the uppermost soil layer (unfrozen), m: in a
	// uniform half-space the swing falls to 1/e of the surface swing at d
	// and lags it there by P/(2 pi).
	DampingDepth_m float64       `json:"damping_depth_m"`
	Probes         []GroundProbe `json:"probes"`
}

// GroundProbe is the exact periodic temperature at one depth.
type GroundProbe struct {
	Depth_m     float64 `json:"depth_m"`
	Amplitude_K float64 `json:"amplitude_K"`
	Lag_h       float64 `json:"lag_h"` // behind the surface, unwrapped
	Lag_d       float64 `json:"lag_d"`
	Mean_C      float64 `json:"mean_C"`
	Min_C       float64 `json:"min_C"` // mean minus this period's amplitude
	Max_C       float64 `json:"max_C"`
}

// Frost is the frost-depth result of a ground scenario.
//
// A value that was not computed is nil (null in results.json), never 0,
// and NotComputed says why under the value's JSON key.
type Frost struct {
	// FreezingIndex_Cd is the air freezing index the closed forms use,
	// degC day.
	FreezingIndex_Cd *float64 `json:"freezing_index_Cd"`
	// MaxFrostDepth_m is the headline simulated frost depth: the deepest
	// frost of the complete, settled winters (HeadlineWinter names it), m.
	MaxFrostDepth_m         *float64 `json:"max_frost_depth_m"`
	StefanDepth_m           *float64 `json:"stefan_depth_m"`
	ModifiedBerggrenDepth_m *float64 `json:"modified_berggren_depth_m"`
	HeadlineWinter          string   `json:"headline_winter,omitempty"`
	// WinterYearStart is the day of the year (1 = 1 January, fractions
	// allowed) on which the winter years of Winters begin: the forcing's
	// warmest time for a harmonic ground run, 182 (1 July) otherwise;
	// absent without winters.
	WinterYearStart float64 `json:"winter_year_start_day,omitempty"`
	// WinterYearStartDate names WinterYearStart as a date ("18 Jul").
	WinterYearStartDate string `json:"winter_year_start_date,omitempty"`
	// ActiveLayer_m is the headline where the ground stays frozen all
	// year (permafrost): the deepest summer thaw of the complete, settled
	// winters, m; nil otherwise.
	ActiveLayer_m *float64 `json:"active_layer_m,omitempty"`

	SurfaceFreezingIndex_Cd *float64          `json:"surface_freezing_index_Cd"` // n-factor x air index
	NFactorFreezing         float64           `json:"freezing_n_factor"`
	SeasonLength_d          *float64          `json:"season_length_d"`
	MeanAnnualAir_C         *float64          `json:"mean_annual_air_C"`
	DesignFreezingIndex_Cd  *float64          `json:"design_freezing_index_Cd,omitempty"`
	ForcingFreezingIndex_Cd *float64          `json:"forcing_freezing_index_Cd,omitempty"` // with a design index: the forcing's own air index
	IndexSource             IndexSource       `json:"index_source"`                        // what the closed forms used: "forcing", "design", "simulated period", "record: ..."
	BerggrenLambda          *float64          `json:"berggren_lambda"`
	BerggrenAlpha           *float64          `json:"berggren_alpha"`
	BerggrenMu              *float64          `json:"berggren_mu"`
	NotComputed             map[string]string `json:"not_computed,omitempty"` // JSON key of a null value -> the reason
	Winters                 []FrostWinter     `json:"winters,omitempty"`

	// ReturnPeriod is the extreme-value view of a measured record's
	// winters: a Gumbel fit (method of moments) of the complete winters'
	// air freezing indices and the index of a 100-year return period.
	ReturnPeriod *ReturnPeriodIndex `json:"return_period,omitempty"`
}

// ReturnPeriodIndex is a Gumbel fit of annual freezing indices.
type ReturnPeriodIndex struct {
	Winters          int     `json:"winters"`
	Method           string  `json:"method"`
	Location_Cd      float64 `json:"location_Cd"`
	Scale_Cd         float64 `json:"scale_Cd"`
	Years            float64 `json:"years"`
	FreezingIndex_Cd float64 `json:"freezing_index_Cd"`
}

// FrostWinter is the simulated frost of one winter year (from the warmest
// time of a harmonic forcing, else 1 July, to the same time a year later,
// on the simulation's axis; t = 0 is 1 January of year 1).
type FrostWinter struct {
	Label                   string      `json:"label"`
	Start_d                 float64     `json:"start_d"`
	End_d                   float64     `json:"end_d"`
	Complete                bool        `json:"complete"` // the run covers the whole winter year
	Settled                 bool        `json:"settled"`  // the start state had settled (or the winter repeats the one before within 1 mm)
	AirFreezingIndex_Cd     float64     `json:"air_freezing_index_Cd"`
	AirThawingIndex_Cd      float64     `json:"air_thawing_index_Cd"`
	MaxFrostDepth_m         float64     `json:"max_frost_depth_m"`
	MaxFrostDay             float64     `json:"max_frost_day"` // days from the start of year 1
	MaxFrostDate            string      `json:"max_frost_date"`
	MaxThawDepth_m          float64     `json:"max_thaw_depth_m"`
	StefanDepth_m           float64     `json:"stefan_depth_m,omitempty"` // measured records: this winter's closed forms
	ModifiedBerggrenDepth_m float64     `json:"modified_berggren_depth_m,omitempty"`
	FrozenAllYear           bool        `json:"frozen_all_year"`
	ActiveLayer_m           float64     `json:"active_layer_m,omitempty"`
	FrozenDays              []ProbeDays `json:"frozen_days"`
}

// ProbeDays is the number of days a probe spent at or below its freezing
// point.
type ProbeDays struct {
	Depth_m float64 `json:"depth_m"`
	Days    float64 `json:"days"`
}

// Series is chart data, split by what it is: curves over time, over depth
// and over period. Every slice pair has equal lengths. Temperatures in
// degC, heat flux in W/m2 (positive from outside to inside), positions in
// m from the outside. A part whose analysis did not run is empty.
type Series struct {
	Cycle      CycleSeries      // one period (the first analysis period) of the exact periodic steady state
	Profile    ProfileSeries    // envelope of the exact periodic state across the construction
	Response   ResponseSeries   // frequency response
	Simulation SimulationSeries // the transient simulation, sampled at the output step
	SimProfile ProfileSeries    // envelope of the simulated temperatures (ground: the last simulated year)
	Step       StepSeries       // surface heat uptake after a step
	Fit        FitSeries        // the fit to logged temperatures
}

// CycleSeries is one period of the exact periodic steady state.
type CycleSeries struct {
	Time_h           []float64
	OutsideAir_C     []float64 // outside environment (air or sol-air) temperature
	OutsideSurface_C []float64
	InsideSurface_C  []float64
	InsideAir_C      []float64
	InsideFlux_W_m2  []float64 // heat flux into the room at the inside surface
}

// ProfileSeries is a temperature envelope against position.
type ProfileSeries struct {
	Position_m   []float64
	Min_C        []float64
	Mean_C       []float64
	Max_C        []float64
	Interfaces_m []float64 // layer boundaries, including 0 and the total thickness (exact profile only)
}

// ResponseSeries is the frequency response: decrement factor and time
// shift against period, from 1 h to 1 year by default.
type ResponseSeries struct {
	Period_h    []float64
	Decrement   []float64
	TimeShift_h []float64 // unwrapped lag
}

// SimulationSeries is the transient simulation sampled at the output step.
// Probes_C[i] belongs to ProbeDepth_m[i].
type SimulationSeries struct {
	Time_h           []float64
	Stamp            []string  // ISO 8601 time of each sample, when the run follows a dated record
	OutsideAir_C     []float64 // outside (surface) environment temperature
	OutsideSurface_C []float64
	InsideSurface_C  []float64
	InsideAir_C      []float64 // inside environment temperature (empty with a flux or adiabatic inside)
	OutsideFlux_W_m2 []float64 // at the outside surface, positive inward (+x)
	InsideFlux_W_m2  []float64 // at the inside surface, positive inward (+x)
	ProbeDepth_m     []float64
	Probes_C         [][]float64
	FrostDepth_m     []float64 // deepest frozen position at each sample, 0 when unfrozen (ground)
	ThawDepth_m      []float64 // depth thawed from the surface in a frozen column (ground), 0 when none
}

// StepSeries is the surface heat uptake after a step of the surface
// temperature: the numerical curve against the half-space closed form.
type StepSeries struct {
	Time_s             []float64
	Flux_W_m2          []float64 // simulated surface heat flux
	FluxHalfSpace_W_m2 []float64 // closed form, semi-infinite first layer
}

// FitSeries is the fit to logged temperatures: measured and modelled at
// each sensor.
type FitSeries struct {
	Time_h     []float64
	Depth_m    []float64
	Measured_C [][]float64
	Modelled_C [][]float64 // nil rows for sensors not modelled
}

// VariantResult is one variant of a study (the first is the base file).
// The curves are those of the variant's exact solution, for the charts
// that set the variants side by side.
type VariantResult struct {
	Name       string   `json:"name"`
	Changes    []string `json:"changes,omitempty"` // "path = value"
	Quantities Summary  `json:"quantities"`
	Layers     []Layer  `json:"layers"`

	Response ResponseSeries `json:"-"`
	Profile  ProfileSeries  `json:"-"` // Position_m, Min_C and Max_C
	Cycle    CycleSeries    `json:"-"` // Time_h and InsideFlux_W_m2
}

// SweepResult is a one-parameter sweep.
type SweepResult struct {
	Parameter      string       `json:"parameter"`
	ParameterLabel string       `json:"parameter_label"` // the path in words
	Unit           string       `json:"unit"`
	Points         []SweepPoint `json:"points"`
}

// SweepPoint is one value of a sweep with the quantities it gives.
type SweepPoint struct {
	Value      float64 `json:"value"`
	Text       string  `json:"text"` // as substituted, with its unit
	Quantities Summary `json:"quantities"`
}

// TargetResult is the outcome of a target search.
type TargetResult struct {
	Parameter      string        `json:"parameter"`
	ParameterLabel string        `json:"parameter_label"` // the path in words
	Unit           string        `json:"unit"`
	Quantity       string        `json:"quantity"`
	Goal           float64       `json:"goal"`
	AtLeast        bool          `json:"at_least"` // false: at most
	From           float64       `json:"from"`
	To             float64       `json:"to"`
	Met            bool          `json:"met"`
	Tolerance      float64       `json:"tolerance"` // in Unit; a met Value is a multiple of TargetStep(Tolerance)
	Value          float64       `json:"value"`     // the parameter value found, or the closest scan point when not met (printed rounded by RoundToTolerance)
	Achieved       float64       `json:"achieved"`  // the quantity there
	Margin         float64       `json:"margin"`    // on the good side of the goal when positive
	Message        string        `json:"message"`   // the outcome in one sentence, the quantity with its QuantityInfo.Format digits
	Evaluations    int           `json:"evaluations"`
	Scan           []TargetPoint `json:"scan"`
}

// TargetPoint is one evaluation of the grid scan of a target search.
type TargetPoint struct {
	Value    float64 `json:"value"`
	Quantity float64 `json:"quantity"`
	Meets    bool    `json:"meets"`
}

// UncertaintyResult is a Monte Carlo propagation of parameter
// distributions.
type UncertaintyResult struct {
	Samples        int                  `json:"samples"`
	Seed           uint64               `json:"seed"`
	Rejected       int                  `json:"rejected"` // samples the decoder refused
	FirstRejection string               `json:"first_rejection,omitempty"`
	Parameters     []UncertainParameter `json:"parameters"`
	Quantities     []Spread             `json:"quantities"`
}

// UncertainParameter is one varied parameter: normal (A mean, B sd) or
// uniform (A min, B max), in Unit.
type UncertainParameter struct {
	Parameter      string  `json:"parameter"`
	ParameterLabel string  `json:"parameter_label"` // the path in words
	Distribution   string  `json:"distribution"`
	A              float64 `json:"a"`
	B              float64 `json:"b"`
	Unit           string  `json:"unit"`
}

// Spread is the distribution of one quantity over the samples.
type Spread struct {
	Quantity string  `json:"quantity"`
	Unit     string  `json:"unit"` // of mean, sd and the percentiles; "" for a ratio
	N        int     `json:"n"`
	Mean     float64 `json:"mean"`
	SD       float64 `json:"sd"`
	Min      float64 `json:"min"`
	P5       float64 `json:"p5"`
	P50      float64 `json:"p50"`
	P95      float64 `json:"p95"`
	Max      float64 `json:"max"`
}

// FitResult is the thermal diffusivity fitted to logged temperatures.
type FitResult struct {
	File                   string    `json:"file"`
	Diffusivity_m2_s       float64   `json:"diffusivity_m2_s"` // recommended value
	Method                 string    `json:"method"`
	StdErr_m2_s            float64   `json:"std_err_m2_s"`
	Low_m2_s               float64   `json:"low_m2_s,omitempty"` // 95 % interval
	High_m2_s              float64   `json:"high_m2_s,omitempty"`
	InversionRMS_K         float64   `json:"inversion_rms_K,omitempty"`
	InversionEvaluations   int       `json:"inversion_evaluations,omitempty"`
	HarmonicCombined_m2_s  float64   `json:"harmonic_diffusivity_m2_s"`
	HarmonicStdErr_m2_s    float64   `json:"harmonic_std_err_m2_s"`
	Pairs                  []FitPair `json:"pairs"`
	HeatCapacityUsed_J_m3K float64   `json:"heat_capacity_used_J_m3K,omitempty"` // of layer 1, for the conductivity
	Conductivity_W_mK      float64   `json:"conductivity_W_mK,omitempty"`
}

// FitPair is the harmonic estimate from one pair of sensors and one period.
type FitPair struct {
	Period_h             float64 `json:"period_h"`
	UpperDepth_m         float64 `json:"upper_depth_m"`
	LowerDepth_m         float64 `json:"lower_depth_m"`
	AmplitudeMethod_m2_s float64 `json:"amplitude_method_m2_s"`
	PhaseMethod_m2_s     float64 `json:"phase_method_m2_s"`
	Usable               bool    `json:"usable"`
	Note                 string  `json:"note,omitempty"`
}

// RecordInfo describes one measured series a run read.
type RecordInfo struct {
	Use     string       `json:"use"` // e.g. "outside temperature", "solar irradiance", "sensors"
	File    string       `json:"file"`
	Columns []string     `json:"columns"`
	Rows    int          `json:"rows"`
	First   string       `json:"first"` // first and last stamps, ISO 8601
	Last    string       `json:"last"`
	Step_h  float64      `json:"step_h"` // typical spacing
	Bridged []BridgedGap `json:"bridged"`
	// The mean and harmonics fitted to the record (least squares), for
	// the exact analysis; amplitude K (or W/m2), peak in days from
	// 1 January (annual) or hours (daily).
	FitMean       float64 `json:"fit_mean"`
	FitAnnualAmp  float64 `json:"fit_annual_amplitude,omitempty"`
	FitAnnualPeak float64 `json:"fit_annual_peak_day,omitempty"`
	FitDailyAmp   float64 `json:"fit_daily_amplitude,omitempty"`
	FitDailyPeak  float64 `json:"fit_daily_peak_hour,omitempty"`
}

// BridgedGap is one hole in a record filled by linear interpolation.
type BridgedGap struct {
	Column string `json:"column,omitempty"` // "" when whole rows were missing
	Line   int    `json:"line"`             // line of the last record before the hole
	From   string `json:"from"`
	To     string `json:"to"`
	Filled int    `json:"filled"` // cells filled (0 for missing rows)
}

// ForcingInfo describes the boundary conditions of a run as given (ground:
// the surface air temperature before n-factors).
type ForcingInfo struct {
	Outside SideForcing  `json:"outside"`          // ground: the surface
	Inside  *SideForcing `json:"inside,omitempty"` // ground: the bottom
}

// SideForcing is the condition on one side.
type SideForcing struct {
	Kind             string  `json:"kind"` // harmonic, measured, step, heat_flux, adiabatic
	Resistance_m2K_W float64 `json:"resistance_m2K_W"`
	// ResistancePeriods are the times of each year with another
	// resistance (a snow cover); absent when the resistance is constant.
	ResistancePeriods []ResistancePeriod `json:"resistance_periods,omitempty"`
	Mean_C            float64            `json:"mean_C"` // measured: the fitted mean
	Harmonics         []HarmonicInfo     `json:"harmonics,omitempty"`
	Step              *StepInfo          `json:"step,omitempty"`
	HeatFlux_W_m2     *float64           `json:"heat_flux_W_m2,omitempty"` // entering the column
	Record            string             `json:"record,omitempty"`         // file of a measured series
	Cover             string             `json:"cover,omitempty"`
	NFactorFreezing   float64            `json:"n_factor_freezing,omitempty"`
	NFactorThawing    float64            `json:"n_factor_thawing,omitempty"`
	Solar             *SolarInfo         `json:"solar,omitempty"`
}

// ResistancePeriod is a time of each year when a surface resistance
// differs from its usual value: from the start of FromDay to the start of
// ToDay (days of the year, 1 = 1 January; ToDay < FromDay runs over the new
// year).
type ResistancePeriod struct {
	FromDay          float64 `json:"from_day"`
	ToDay            float64 `json:"to_day"`
	Resistance_m2K_W float64 `json:"resistance_m2K_W"`
}

// HarmonicInfo is one harmonic: amplitude in K (irradiance, heat flux:
// W/m2), peak in hours after 1 January 00:00.
type HarmonicInfo struct {
	Period_h  float64 `json:"period_h"`
	Amplitude float64 `json:"amplitude"`
	Peak_h    float64 `json:"peak_h"`
}

// StepInfo is a step change of temperature.
type StepInfo struct {
	From_C float64 `json:"from_C"`
	To_C   float64 `json:"to_C"`
	At_h   float64 `json:"at_h"`
}

// SolarInfo is the sol-air part of an outside side.
type SolarInfo struct {
	Absorptance         float64        `json:"absorptance"`
	AbsorptancePreset   string         `json:"absorptance_preset,omitempty"`
	SkyCorrection_K     float64        `json:"sky_correction_K"`
	IrradianceMean_W_m2 float64        `json:"irradiance_mean_W_m2"`
	IrradianceHarmonics []HarmonicInfo `json:"irradiance_harmonics,omitempty"`
	IrradianceRecord    string         `json:"irradiance_record,omitempty"`
}

// SetNotComputed records that the value under the JSON key was not
// computed, and why.
func (f *Frost) SetNotComputed(key, why string) {
	if f.NotComputed == nil {
		f.NotComputed = map[string]string{}
	}
	f.NotComputed[key] = why
}

// Summary holds the study quantities of one case (NaN when not defined).
type Summary map[string]float64

// StepResult is the response of one surface of a column to a sudden change
// of its temperature: the heat flux into the surface and the heat taken up
// over the first minutes, set beside the closed form for a semi-infinite
// body of the surface layer's material: the surface heat uptake after a
// step.
type StepResult struct {
	Side                       string  `json:"side"`
	Change_K                   float64 `json:"change_K"`
	Duration_s                 float64 `json:"duration_s"`
	SurfaceLayer               string  `json:"surface_layer"`
	SurfaceEffusivity_Ws05_m2K float64 `json:"surface_effusivity_W_s05_m2K"`  // sqrt(lambda rho c)
	HalfSpaceValidFor_s        float64 `json:"half_space_valid_for_s"`        // until the far face of the surface layer sees 1 % of the step
	HeatAbsorbed_J_m2          float64 `json:"heat_absorbed_J_m2"`            // simulated, over Duration
	HeatAbsorbedHalfSpace_J_m2 float64 `json:"heat_absorbed_half_space_J_m2"` // closed form, over Duration
	FluxAt1s_W_m2              float64 `json:"flux_at_1s_W_m2"`
	FluxAtEnd_W_m2             float64 `json:"flux_at_end_W_m2"`
	FluxAtEndHalfSpace_W_m2    float64 `json:"flux_at_end_half_space_W_m2"`

	// Contact of a second body with the surface (when asked): the
	// surface's mean temperature before, and the contact temperature of two
	// semi-infinite bodies Tc = (b1 T1 + b2 T2)/(b1 + b2) (Carslaw and
	// Jaeger, chapter II [memory]; [derived] from equal surface fluxes of
	// the two erf solutions of Incropera et al. section 5.7).
	SurfaceTemperature_C     float64  `json:"surface_temperature_C,omitempty"`
	ContactBodyTemperature_C *float64 `json:"contact_body_temperature_C,omitempty"`
	ContactBodyEffusivity    float64  `json:"contact_body_effusivity_W_s05_m2K,omitempty"`
	ContactTemperature_C     *float64 `json:"contact_temperature_C,omitempty"`
}

// TitleBlock holds the optional words of a report's title block, as the
// scenario gives them (results.json: top-level project, client,
// prepared_by and revision, absent when not given).
type TitleBlock struct {
	Project    string `json:"project,omitempty"`
	Client     string `json:"client,omitempty"`
	PreparedBy string `json:"prepared_by,omitempty"`
	Revision   string `json:"revision,omitempty"`
}
