package solver

import (
	"errors"
	"fmt"
	"math"
)

// BoundaryKind selects the thermal condition at one surface of a column.
type BoundaryKind int

const (
	// Environment: the surface exchanges heat with an environment at
	// Boundary.Temperature(t) (degC) through the surface resistance
	// Boundary.Resistance (m2 K/W). Resistance 0 imposes the temperature
	// on the surface itself.
	Environment BoundaryKind = iota
	// PrescribedFlux: Boundary.Flux(t) W/m2 enters the column through the
	// surface. The sign is "into the column" on both sides: a geothermal
	// flux rising into a ground column from below is a positive inside
	// flux (65 mW/m2 continental mean, Pollack et al. 1993).
	PrescribedFlux
	// Adiabatic: no heat crosses the surface.
	Adiabatic
)

// String returns the name of the kind.
func (k BoundaryKind) String() string {
	switch k {
	case Environment:
		return "environment"
	case PrescribedFlux:
		return "flux"
	case Adiabatic:
		return "adiabatic"
	}
	return fmt.Sprintf("BoundaryKind(%d)", int(k))
}

// Boundary is the condition at one surface of a transient simulation.
//
// Simulate takes the surface resistance from Boundary.Resistance; the
// OutsideResistance and InsideResistance of the Column are not used by the
// transient solution (they serve the periodic one), so a caller sets both
// consistently. Massless resistance layers at a surface are part of the
// column and are added to Resistance.
type Boundary struct {
	Kind        BoundaryKind
	Resistance  float64                 // m2 K/W, Environment only; 0 = prescribed surface temperature
	Temperature func(t float64) float64 // degC at time t (s), Environment only
	Flux        func(t float64) float64 // W/m2 into the column at time t (s), PrescribedFlux only

	// ResistanceAt, when set, is the surface resistance (m2 K/W, finite,
	// not negative) at time t (s) of an Environment boundary whose
	// resistance varies in time (a snow cover, a shutter). Simulate holds
	// it over each time step at its value at the step's midpoint, which
	// keeps the scheme second order for a smooth resistance and is exact
	// for one that changes on step boundaries; the energy balance closes
	// as before. Resistance remains the representative value for what
	// looks at the boundary outside a step (Settle's steady deep profile),
	// and the start of the run until the first step.
	ResistanceAt func(t float64) float64
}

// ColumnBoundaries returns Environment boundaries for both surfaces of c
// with the column's own surface resistances (OutsideResistance,
// InsideResistance), the environment temperatures (degC) given by outside
// and inside as functions of time (s). For a HalfSpace column, whose
// InsideResistance is ignored, the inside boundary imposes inside(t) on
// the bottom face itself.
func ColumnBoundaries(c Column, outside, inside func(t float64) float64) (out, in Boundary) {
	out = Boundary{Kind: Environment, Resistance: c.OutsideResistance, Temperature: outside}
	in = Boundary{Kind: Environment, Resistance: c.InsideResistance, Temperature: inside}
	if c.HalfSpace {
		in.Resistance = 0
	}
	return out, in
}

// TimeScheme selects the time integration of Simulate.
type TimeScheme int

const (
	// TRBDF2 is the default: a trapezoidal stage over gamma*dt followed by
	// a BDF2 stage, gamma = 2 - sqrt(2) (Bank et al., IEEE Trans.
	// Electron Devices 32 (1985) 1992; Hosea and Shampine, Appl. Numer.
	// Math. 20 (1996) 21). Second order and L-stable: it does not ring
	// after a sudden change, and both stages share one matrix.
	TRBDF2 TimeScheme = iota
	// CrankNicolson is second order but only A-stable: after a step change
	// the fine cells near a surface oscillate from step to step. For
	// comparison only.
	CrankNicolson
	// BackwardEuler is first order and L-stable. For comparison only.
	BackwardEuler
)

// Problem is a transient heat-conduction problem on a layered column.
//
// Times are in seconds, temperatures in degC, positions in m from the
// outside surface.
type Problem struct {
	Column Column
	Mesh   *Mesh // nil: NewMesh(Column, MeshOptions{})

	Outside, Inside Boundary

	// Initial state, in order of precedence: InitialEnthalpy (as returned
	// in Result.FinalEnthalpy, to continue a run exactly), Initial (degC
	// per cell), InitialFunc(x) evaluated at the cell centres. A freezing
	// cell that starts exactly at its freezing point starts unfrozen.
	InitialEnthalpy []float64
	Initial         []float64
	InitialFunc     func(x float64) float64

	Start    float64 // s, time of the initial state (boundary functions see Start..Start+Duration)
	Duration float64 // s, > 0
	Step     float64 // s, time step, > 0; the last step is shortened to end at Start+Duration

	// Probes are positions (m, 0 to the column thickness) whose
	// temperature is recorded at every sample.
	Probes []float64
	// OutputStep is the spacing of the recorded samples, s: a whole
	// multiple of Step (rounded to the nearest). 0 means every step. The
	// end of the run is always sampled.
	OutputStep float64

	Scheme TimeScheme

	// Progress, when not nil, is called with the completed fraction of the
	// run (0 to 1) about a hundred times.
	Progress func(frac float64)

	// Observe, when not nil, is called by Simulate at every sample (the
	// start, every OutputStep and the end) with the values of that
	// sample, in time order, and the Result then holds no per-sample
	// series: Times, Probe, SurfaceOutside, SurfaceInside, FluxOutside,
	// FluxInside, MeanFluxOutside, MeanFluxInside, FrostDepth and
	// ThawDepth are nil (Min, Max and Mean are still filled). A long run
	// thus needs no memory per sample; the caller keeps what it needs.
	// The Sample and its Probe slice are reused from call to call.
	Observe func(*Sample)

	// CheckCycle, when not nil, is a spin-up that Settle left pending
	// (SettleOptions.DeferCheck), whose state this run starts from
	// (InitialEnthalpy must equal CheckCycle.Enthalpy; Start, Step and
	// Scheme must be those of the settled problem, and Duration at least
	// its period). Simulate runs the first period of the run as the cycle
	// that judges it, reading the fronts at the spin-up's sample times and
	// the change of every cell as Settle does, and returns the spin-up
	// with that cycle added in Result.Settled. When the cycle does not
	// settle, Simulate stops at its end: the Result then covers only that
	// cycle and serves to continue the spin-up from Result.Settled.
	CheckCycle *Settled

	// SpinUpDepth, when positive, limits the convergence test of SpinUp
	// and SpinUpEnthalpy to the cells whose centre lies at most this deep
	// (m): the periodic wave settles there long before the deep mean
	// temperature of a ground column does, which takes decades and does not
	// change what happens above.
	SpinUpDepth float64
}

// Sample is the state of a simulation at one sample time, as Result
// records it per sample (units and signs as the Result fields of the
// same names).
type Sample struct {
	Index, Count int     // this sample's index (0 = the start) and the number of samples of the run
	Time         float64 // s

	Probe []float64 // degC at Problem.Probes

	SurfaceOutside, SurfaceInside   float64 // degC
	FluxOutside, FluxInside         float64 // W/m2 in +x, instantaneous
	MeanFluxOutside, MeanFluxInside float64 // W/m2 in +x, mean over the interval ending here
	FrostDepth, ThawDepth           float64 // m
}

// Result is the outcome of Simulate.
//
// Series are sampled at Times (s); index 0 is the initial state at
// Problem.Start (its fluxes are those of the initial state against the
// boundary values at Start: after a step change at Start they show the
// jump, not a physical flux). Fluxes are W/m2, positive in +x (outside to inside, down
// into the ground). The per-cell envelope (Min, Max, Mean) runs over the
// samples; Mean averages the samples after the initial one, which for a
// run of whole periods sampled evenly is the period mean.
type Result struct {
	Mesh   *Mesh
	Times  []float64   // s
	Probes []float64   // m, copy of Problem.Probes
	Probe  [][]float64 // degC, Probe[j][k] at Probes[j] and Times[k]

	SurfaceOutside []float64 // degC, column side of the outside surface resistance
	SurfaceInside  []float64 // degC, column side of the inside surface resistance
	FluxOutside    []float64 // W/m2 in +x through the outside surface (positive = into the column)
	FluxInside     []float64 // W/m2 in +x through the inside surface (positive = out of the column)

	// MeanFluxOutside and MeanFluxInside are the surface heat fluxes
	// averaged over the interval that ends at each sample (W/m2, signs as
	// FluxOutside and FluxInside): the heat the time scheme let through,
	// the same sums as the energy balance, divided by the interval. They
	// do not show the spikes of an instantaneous flux into a surface cell
	// that is freezing, or the start-up of a sudden step. Index 0 holds
	// the instantaneous value.
	MeanFluxOutside, MeanFluxInside []float64

	Min, Max, Mean []float64 // degC per cell over the samples

	// FrostDepth is the deepest position (m) at or below the freezing
	// point (the layer's Freeze.Point, 0 degC in layers that do not
	// freeze) at each sample, interpolated between cell centres and, in a
	// partly frozen isothermal cell, placed by its frozen fraction; 0 if
	// nothing is frozen. ThawDepth is the depth (m) of the top of a frozen
	// zone lying under a thawed surface layer; 0 when the surface is
	// frozen or nothing is frozen.
	FrostDepth, ThawDepth []float64

	Energy EnergyBalance

	Final         []float64 // degC per cell at the end
	FinalEnthalpy []float64 // J/m3 per cell at the end (for Problem.InitialEnthalpy)

	// Settled is, for a run given Problem.CheckCycle, that spin-up with
	// the run's first period added as its last cycle: Converged tells
	// whether that cycle settled, and Enthalpy is the state at its end
	// (where the spin-up would continue). Nil otherwise.
	Settled *Settled

	Steps       int // time steps taken
	Iterations  int // enthalpy iterations (0 without freezing)
	Unconverged int // implicit stages that reached the iteration limit (energy is still conserved)
}

// ErrSpinUp is returned (wrapped) by SpinUp when the cycles do not repeat
// within the tolerance.
var ErrSpinUp = errors.New("solver: periodic spin-up did not converge")

// Simulate integrates the transient heat equation of p in time.
//
// Each cell i of width h_i holds the heat content h_i H_i(T_i), with the
// volumetric enthalpy H = C T for ordinary layers and the enthalpy of the
// freezing relation for layers with Freeze (see Freezing). The finite
// volume balance is
//
//	h_i dH_i/dt = G_{i-1} (T_{i-1} - T_i) - G_i (T_i - T_{i+1})
//	G_i = 1 / (h_i/(2 k_i) + R_face + h_{i+1}/(2 k_{i+1}))
//
// (series conductance between cell centres through any massless layer on
// the face), and at a surface the inflow is (T_env - T_0) / (R + R_face +
// h_0/(2 k_0)), a prescribed flux, or 0. Time integration is TR-BDF2 unless
// p.Scheme says otherwise. Without freezing both stages solve the same
// symmetric positive definite tridiagonal system, factorised once. With
// freezing each implicit stage is solved by an enthalpy iteration: Newton
// on H with the phase-aware slope dT/dH and the derivatives of the
// conductances, stopping on the kinks of T(H); the heat content is updated
// from the conservative fluxes after every linear solve, so the energy
// balance closes to round-off whether or not the iteration converged. In
// a cell partly frozen at an isothermal freezing point the conduction
// paths run from the front, located by the frozen fraction, to the cell
// faces, which keeps temperatures near the front second-order accurate
// instead of saw-toothing.
func Simulate(p Problem) (*Result, error) {
	r, err := newFvRun(&p, true)
	if err != nil {
		return nil, err
	}
	return r.run()
}

// SpinUp repeats one period of p (Duration is replaced by period, Start is
// kept) from p's initial state until the state at the end of a cycle
// differs from the state at its start by less than tol (K) in every cell,
// at most maxCycles times. It returns the periodic initial state (degC per
// cell, for Problem.Initial) and the number of cycles run. If the cycles
// do not converge it returns the last state, the cycles run and an error
// wrapping ErrSpinUp.
//
// The boundary functions must be periodic with the given period. For a
// column with freezing layers use SpinUpEnthalpy: a temperature cannot
// tell how much of a cell at its freezing point is frozen.
func SpinUp(p Problem, period, tol float64, maxCycles int) (initial []float64, cycles int, err error) {
	r, cycles, _, err := fvSpinUp(p, period, tol, maxCycles)
	if r == nil {
		return nil, cycles, err
	}
	return append([]float64(nil), r.T...), cycles, err
}

// SpinUpEnthalpy is SpinUp returning the periodic state as volumetric
// enthalpies (J/m3 per cell, for Problem.InitialEnthalpy), which keep the
// frozen fraction of cells at their freezing point. A cell's change over a
// cycle is the larger of its temperature change and its enthalpy change
// over its smaller sensible heat capacity plus its latent heat per kelvin,
// in K (see Problem.SpinUpDepth for the cells tested).
func SpinUpEnthalpy(p Problem, period, tol float64, maxCycles int) (enthalpy []float64, cycles int, err error) {
	enthalpy, cycles, _, err = SpinUpEnthalpyChange(p, period, tol, maxCycles)
	return enthalpy, cycles, err
}

// SpinUpEnthalpyChange is SpinUpEnthalpy that also returns the change of
// the last cycle, K, as the convergence test measures it.
func SpinUpEnthalpyChange(p Problem, period, tol float64, maxCycles int) (enthalpy []float64, cycles int, change float64, err error) {
	r, cycles, change, err := fvSpinUp(p, period, tol, maxCycles)
	if r == nil {
		return nil, cycles, change, err
	}
	return append([]float64(nil), r.H...), cycles, change, err
}

func fvSpinUp(p Problem, period, tol float64, maxCycles int) (*fvRun, int, float64, error) {
	if !(period > 0) || math.IsInf(period, 0) || !(tol > 0) || maxCycles < 1 {
		return nil, 0, 0, errors.New("solver: spin-up needs period > 0, tol > 0 and maxCycles >= 1")
	}
	p.Duration = period
	p.Probes = nil
	p.OutputStep = period
	p.Progress = nil
	r, err := newFvRun(&p, false)
	if err != nil {
		return nil, 0, 0, err
	}
	// A cell's change over a cycle, in K: the larger of its temperature
	// change and its enthalpy change over its smaller sensible heat
	// capacity plus its latent heat spread over 1 K (a cell held at its
	// freezing point that changes 1 % of its ice counts about 0.01 K).
	ceq := make([]float64, r.n)
	for i := range ceq {
		ceq[i] = r.cvol[i]
		if k := r.pidx[i]; k >= 0 {
			ceq[i] = math.Min(r.phases[k].cf, r.phases[k].cu) + r.phases[k].lat
		}
	}
	last := r.n
	if p.SpinUpDepth > 0 {
		last = 0
		for last < r.n && r.m.Centers[last] <= p.SpinUpDepth {
			last++
		}
		last = max(last, 1)
	}
	prev := make([]float64, r.n)
	prevT := make([]float64, r.n)
	diff := math.Inf(1)
	for cycles := 1; cycles <= maxCycles; cycles++ {
		if !r.nonlinear {
			for i := range r.H {
				r.H[i] = r.cvol[i] * r.T[i]
			}
		}
		copy(prev, r.H)
		copy(prevT, r.T)
		// Each run continues from the state (enthalpy) the last one left.
		if _, err := r.run(); err != nil {
			return nil, cycles, 0, err
		}
		diff = 0.0
		for i := 0; i < last; i++ {
			diff = math.Max(diff, math.Max(math.Abs(r.T[i]-prevT[i]), math.Abs(r.H[i]-prev[i])/ceq[i]))
		}
		if diff < tol {
			return r, cycles, diff, nil
		}
	}
	return r, maxCycles, diff, fmt.Errorf("%w after %d cycles (tolerance %g K)", ErrSpinUp, maxCycles, tol)
}
