package scenarios

import (
	"math"

	"tempstack/scenarios/results"
	"tempstack/solver"
)

// stepResponse simulates a step of Change K on the chosen surface (the
// environment on that side imposed on the surface, resistance 0) of a
// column that starts uniform, with the other side held at the starting
// temperature behind its surface resistance.
//
// Closed form [Incropera et al., Fundamentals of Heat and Mass Transfer,
// section 5.7, eq. 5.58]: q(t) = b dT / sqrt(pi t), b = sqrt(lambda rho c),
// so the heat taken up is Q(t) = 2 b dT sqrt(t / pi).
func stepResponse(s *run, col solver.Column, r *results.Results) error {
	st := s.Analysis.StepResponse
	c, first, mesh, err := stepMesh(s.Scenario, col)
	if err != nil {
		return err
	}
	fromInside := st.Side == "inside"
	a := first.Diffusivity()
	b := math.Sqrt(first.Conductivity * first.HeatCapacity)
	change := st.Change
	var far Side = s.Inside
	if fromInside {
		far = s.Outside
	}
	farB := solver.Boundary{Kind: solver.Environment, Resistance: far.SurfaceResistance(), Temperature: func(float64) float64 { return 0 }}
	if s.Kind == Ground || far.Boundary().Kind == solver.Adiabatic {
		farB = solver.Boundary{Kind: solver.Adiabatic}
	}
	// The flux after a sudden step falls like 1/sqrt(t) over many decades
	// of time: the run is chained over four decades of duration, each
	// with a time step a thousandth of its end time, so every decade is
	// resolved alike (log-spaced samples). Cells at the surface resolve
	// the diffusion length of the first step.
	D := st.Duration
	out := &results.StepResult{
		Side:                       st.Side,
		Change_K:                   change,
		Duration_s:                 D,
		SurfaceLayer:               first.Name,
		SurfaceEffusivity_Ws05_m2K: b,
		HalfSpaceValidFor_s:        solver.HalfSpaceTime(a, first.Thickness, 0.01),
		HeatAbsorbedHalfSpace_J_m2: 2 * b * change * math.Sqrt(D/math.Pi),
		FluxAtEndHalfSpace_W_m2:    b * change / math.Sqrt(math.Pi*D),
	}
	// Closed form: Q(t) = 2 b dT sqrt(t/pi); the mean flux over (t0, t1] is
	// (Q(t1) - Q(t0)) / (t1 - t0), set beside the simulated interval mean.
	Q := func(t float64) float64 { return 2 * b * change * math.Sqrt(t/math.Pi) }
	ser := &r.Series
	var H []float64
	start := 0.0
	for seg, end := range []float64{D / 1000, D / 100, D / 10, D} {
		p := solver.Problem{
			Column:   c,
			Mesh:     mesh,
			Outside:  solver.Boundary{Kind: solver.Environment, Resistance: 0, Temperature: func(float64) float64 { return change }},
			Inside:   farB,
			Start:    start,
			Duration: end - start,
			Step:     end / 1000,
		}
		if seg == 0 {
			p.Initial = make([]float64, mesh.Cells())
		} else {
			p.InitialEnthalpy = H
		}
		res, err := solver.Simulate(p)
		if err != nil {
			return &Error{File: s.File, Line: st.Line, Key: "analysis.step_response", Err: err}
		}
		out.HeatAbsorbed_J_m2 += res.Energy.InflowOutside
		for k := 1; k < len(res.Times); k++ {
			t0, t1 := res.Times[k-1], res.Times[k]
			ser.Step.Time_s = append(ser.Step.Time_s, t1)
			ser.Step.Flux_W_m2 = append(ser.Step.Flux_W_m2, res.MeanFluxOutside[k])
			ser.Step.FluxHalfSpace_W_m2 = append(ser.Step.FluxHalfSpace_W_m2, (Q(t1)-Q(t0))/(t1-t0))
		}
		H = res.FinalEnthalpy
		start = end
	}
	// Fluxes at 1 s and at the end, interpolated in log time between
	// interval means (each placed at its interval's end).
	out.FluxAt1s_W_m2 = logInterp(ser.Step.Time_s, ser.Step.Flux_W_m2, 1)
	out.FluxAtEnd_W_m2 = ser.Step.Flux_W_m2[len(ser.Step.Flux_W_m2)-1]
	if st.ContactTemperature != nil {
		// The surface's mean temperature from the steady state of the
		// scenario's mean forcings.
		ts, err := surfaceMean(s, col, fromInside)
		if err != nil {
			return &Error{File: s.File, Line: st.Line, Key: "analysis.step_response", Err: err}
		}
		bc := st.ContactEffusivity
		tc := (b*ts + bc**st.ContactTemperature) / (b + bc)
		out.SurfaceTemperature_C = ts
		out.ContactBodyTemperature_C = st.ContactTemperature
		out.ContactBodyEffusivity = bc
		out.ContactTemperature_C = &tc
	}
	r.StepResponse = out
	return nil
}

// reversed returns col seen from the inside: layers and surface
// resistances swapped.
// stepMesh returns the column of a step response seen from the stepped
// surface, its first layer with heat capacity, and the mesh: cells at the
// surface resolve the diffusion length of the first of the chained time
// steps (a millionth of the duration, see stepResponse).
func stepMesh(s *Scenario, col solver.Column) (solver.Column, solver.Layer, *solver.Mesh, error) {
	st := s.Analysis.StepResponse
	c := col
	if st.Side == "inside" {
		c = reversed(col)
	}
	c.HalfSpace = false
	first := c.Layers[0]
	for _, l := range c.Layers {
		if !l.Massless() {
			first = l
			break
		}
	}
	dt0 := st.Duration * 1e-6
	mesh, err := solver.NewMesh(c, solver.MeshOptions{SurfaceCell: 0.5 * math.Sqrt(first.Diffusivity()*dt0), Growth: 1.15, MaxCells: maxCells})
	if err != nil {
		return c, first, nil, &Error{File: s.File, Line: st.Line, Key: "analysis.step_response", Msg: meshMessage(err)}
	}
	return c, first, mesh, nil
}

func reversed(col solver.Column) solver.Column {
	c := col
	c.Layers = make([]solver.Layer, len(col.Layers))
	for i, l := range col.Layers {
		c.Layers[len(col.Layers)-1-i] = l
	}
	c.OutsideResistance, c.InsideResistance = col.InsideResistance, col.OutsideResistance
	return c
}

// surfaceMean is the mean temperature of the outside or inside surface
// (degC) in the steady state of the mean forcings.
func surfaceMean(s *run, col solver.Column, inside bool) (float64, error) {
	c := col
	c.HalfSpace = false
	x := 0.0
	if inside {
		x = c.Thickness()
	}
	out := forcingMean(s.surfaceForcing())
	if s.Inside.temperature() != nil {
		T, _, err := solver.Steady(c, out, forcingMean(s.Inside.temperature()), []float64{x})
		if err != nil {
			return 0, err
		}
		return T[0], nil
	}
	T, err := solver.SteadyWithBottomFlux(c, out, s.Inside.steadyFlux(), []float64{x})
	if err != nil {
		return 0, err
	}
	return T[0], nil
}

// logInterp interpolates y(x) linearly in log x; NaN outside the range.
func logInterp(x, y []float64, at float64) float64 {
	for k := 1; k < len(x); k++ {
		if x[k-1] <= at && at <= x[k] && x[k-1] > 0 {
			f := math.Log(at/x[k-1]) / math.Log(x[k]/x[k-1])
			return y[k-1] + f*(y[k]-y[k-1])
		}
	}
	return math.NaN()
}
