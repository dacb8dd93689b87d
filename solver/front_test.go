package solver

import (
	"math"
	"testing"
)

// The reported frost front follows the ice: from one step to the next the
// deepest frost can move down by no more than the ice that formed in the
// step (sum over cells of the growth of ice thickness (1 - phi) h), since
// frost deepens only by freezing water [derived: the front position of the
// enthalpy method is a function of the ice content], apart from a frozen
// skin above the first cell centre before that cell holds ice, which the
// surface temperature places. The case is a coarse
// mesh (cells of about 0.13 m, as the default ground mesh gives for this
// soil) under an annual wave whose spring thaw works from above and below
// at once, where placing a cell's last ice at its lower face read a thin
// lens at 0.67 m as frost at 0.80 m in June.
func TestFrontDeepensOnlyWithIce(t *testing.T) {
	const year = 365 * 86400.0
	col := Column{Layers: []Layer{{Name: "soil", Thickness: 20, Conductivity: 1.3, HeatCapacity: 1.8e6,
		Freeze: &Freezing{LatentHeat: 1.25e8, ConductivityFrozen: 1.3, HeatCapacityFrozen: 1.8e6}}}}
	mesh, err := NewMesh(col, MeshOptions{ResolvePeriod: year, MaxCell: 0.134})
	if err != nil {
		t.Fatal(err)
	}
	peak := 222.5 * 86400
	surf := func(t float64) float64 { return 3.2 + 7.5*math.Cos(2*math.Pi*(t-peak)/year) }
	p := Problem{Column: col, Mesh: mesh, Start: peak, Step: 3600, Duration: 3600,
		Outside:     Boundary{Kind: Environment, Temperature: surf},
		Inside:      Boundary{Kind: PrescribedFlux, Flux: func(float64) float64 { return 0.065 }},
		InitialFunc: func(x float64) float64 { return 3.2 + 0.065*x/1.3 },
	}
	r, err := newFvRun(&p, false)
	if err != nil {
		t.Fatal(err)
	}
	ice := func() []float64 {
		out := make([]float64, r.n)
		for i := range out {
			out[i] = (1 - r.phi[i]) * r.h[i]
		}
		return out
	}
	_, _, tso, _ := r.surfaces()
	prevFront, _ := r.frost(tso)
	prevIce := ice()
	worst, maxFront, maxDay := 0.0, 0.0, 0.0
	steps := int(2 * year / 3600)
	for k := 0; k < steps; k++ {
		r.p.Start = peak + float64(k)*3600
		if _, err := r.run(); err != nil {
			t.Fatal(err)
		}
		_, _, tso, _ = r.surfaces()
		front, _ := r.frost(tso)
		now := ice()
		grown := 0.0
		for i := range now {
			grown += math.Max(0, now[i]-prevIce[i])
		}
		total := 0.0
		for _, v := range now {
			total += v
		}
		// A frozen skin above the first cell centre, before that cell
		// holds ice, is read from the temperature profile (the surface is
		// below freezing): no ice to follow there.
		skin := total == 0 && front <= mesh.Centers[0]
		if d := front - prevFront - grown; d > worst && !skin {
			worst = d
		}
		if k*3600 >= int(year) && front > maxFront {
			maxFront, maxDay = front, math.Mod((r.p.Start+3600)/86400, 365)
		}
		prevFront, prevIce = front, now
	}
	t.Logf("largest deepening beyond the ice formed: %.3g m; second winter deepest %.4f m on day %.0f", worst, maxFront, maxDay)
	if worst > 1e-9 {
		t.Errorf("the front deepened %.4f m more than the ice that formed in one step", worst)
	}
	// The deepest frost comes in early spring (day 60-120), not in June.
	if maxDay < 60 || maxDay > 120 {
		t.Errorf("deepest frost on day %.0f, want March or April", maxDay)
	}
}
