package solver

import (
	"crypto/sha256"
	"encoding/binary"
	"encoding/hex"
	"errors"
	"math"
)

// SettleKey returns a key of everything Settle(p, o) depends on, so that
// callers can share one settled state between problems that settle alike
// (the cases of a study that differ only in what happens after the
// spin-up: the probes, the output, the years simulated). Two calls with
// equal keys settle to the same state, bit for bit.
//
// The key is a hash of the numbers Settle reads: the column's layers,
// their freezing relations and surface resistances, the mesh, the initial
// state (InitialEnthalpy, Initial, or InitialFunc at the cell centres),
// Start, Step, Scheme and SpinUpDepth, the options except Progress, and
// each boundary's kind and resistance with its environment temperature,
// flux and varying resistance evaluated at every time at which a cycle
// can evaluate them (the start, and each step's midpoint, TR-BDF2 stage
// and end; settleTimes), for the coarse step too. It names no scenario key, so it cannot drift
// from what the solver reads: a new input reaches the key only through
// these numbers (a new field of Problem, Column, Layer, Freezing or
// Boundary that Settle reads must be added here; TestSettleKeySeesEveryInput
// and TestSettleKeyCoversTheEvaluatedTimes hold it to that).
//
// Names (Layer.Name) and Duration, Probes, OutputStep, Progress, Observe
// and CheckCycle of p,
// which Settle replaces or ignores, do not enter the key.
func SettleKey(p Problem, o SettleOptions) (string, error) {
	if p.Mesh == nil {
		m, err := NewMesh(p.Column, MeshOptions{})
		if err != nil {
			return "", err
		}
		p.Mesh = m
	}
	if !(o.Period > 0) || math.IsInf(o.Period, 0) || !(p.Step > 0) {
		return "", errors.New("solver: settle key needs Period > 0 and Step > 0")
	}
	h := sha256.New()
	var buf [8]byte
	num := func(v float64) {
		binary.LittleEndian.PutUint64(buf[:], math.Float64bits(v))
		h.Write(buf[:])
	}
	integer := func(v int) { num(float64(v)) }
	flag := func(b bool) {
		if b {
			integer(1)
		} else {
			integer(0)
		}
	}
	nums := func(vs []float64) {
		integer(len(vs))
		for _, v := range vs {
			num(v)
		}
	}
	// Options.
	num(o.Period)
	integer(o.MaxCycles)
	num(o.Tolerance)
	num(o.FrontTolerance)
	flag(o.ConstantInside)
	num(o.OutputStep)
	num(o.CoarseStep)
	flag(o.DeferCheck)
	// Timing and scheme.
	num(p.Start)
	num(p.Step)
	integer(int(p.Scheme))
	num(p.SpinUpDepth)
	// Column.
	c := p.Column
	integer(len(c.Layers))
	for _, l := range c.Layers {
		num(l.Thickness)
		num(l.Conductivity)
		num(l.HeatCapacity)
		num(l.Resistance)
		flag(l.Freeze != nil)
		if f := l.Freeze; f != nil {
			num(f.Point)
			num(f.Range)
			num(f.LatentHeat)
			num(f.ConductivityFrozen)
			num(f.HeatCapacityFrozen)
		}
	}
	num(c.OutsideResistance)
	num(c.InsideResistance)
	flag(c.HalfSpace)
	// Mesh.
	m := p.Mesh
	nums(m.Faces)
	nums(m.Centers)
	integer(len(m.Layer))
	for _, l := range m.Layer {
		integer(l)
	}
	nums(m.FaceResistance)
	// Initial state, in Simulate's order of precedence.
	switch {
	case p.InitialEnthalpy != nil:
		integer(1)
		nums(p.InitialEnthalpy)
	case p.Initial != nil:
		integer(2)
		nums(p.Initial)
	case p.InitialFunc != nil:
		integer(3)
		for _, x := range m.Centers {
			num(p.InitialFunc(x))
		}
	default:
		integer(0)
	}
	// Boundaries, at every time a cycle evaluates them.
	times := keyTimes(p, o)
	for _, b := range []Boundary{p.Outside, p.Inside} {
		integer(int(b.Kind))
		num(b.Resistance)
		fns := []func(float64) float64{b.Temperature, b.Flux, b.ResistanceAt}
		for _, f := range fns {
			flag(f != nil)
			if f == nil {
				continue
			}
			for _, t := range times {
				num(f(t))
			}
		}
	}
	return hex.EncodeToString(h.Sum(nil)), nil
}

// keyTimes lists the times at which SettleKey evaluates the boundaries:
// those of a cycle with the problem's step and, with a coarse phase, with
// the coarse step.
func keyTimes(p Problem, o SettleOptions) []float64 {
	times := settleTimes(p.Start, o.Period, p.Step)
	if o.CoarseStep > p.Step && !math.IsInf(o.CoarseStep, 0) {
		times = append(times, settleTimes(p.Start, o.Period, o.CoarseStep)...)
	}
	return times
}

// settleTimes lists every time at which one cycle of Settle (a run of
// Duration period from start) evaluates the boundary functions: the
// start, and for each step from t to t1 its midpoint t+dt/2 (a varying
// resistance), t+fvGamma*dt (the TR-BDF2 stage) and t1, computed as run
// computes them.
func settleTimes(start, period, step float64) []float64 {
	steps := max(int(math.Ceil(period/step-1e-9)), 1)
	out := make([]float64, 0, 1+3*steps)
	out = append(out, start)
	t := start
	for s := 1; s <= steps; s++ {
		t1 := start + float64(s)*step
		if s == steps {
			t1 = start + period
		}
		dt := t1 - t
		out = append(out, t+dt/2, t+fvGamma*dt, t+dt)
		t = t1
	}
	return out
}
