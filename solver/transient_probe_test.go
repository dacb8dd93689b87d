package solver

import (
	"math"
	"testing"
)

// TestProbesInsideSurfaceCells puts probes between each surface and the
// centre of the cell next to it, where the reconstruction must use the
// surface flux (the face temperature T_cell + q R_half), and checks the
// steady, piecewise-linear profile of a two-layer wall with unequal surface
// resistances, T(x) = T_o - q (R_se + R(0..x)), q = (T_o - T_i) / R_total
// (Fourier's law in series, [derived]; surface resistances 0.04 and 0.17 of
// ISO 6946 Table 7 [memory]). The mean temperature profile of the run is
// the same steady profile at the cell centres.
func TestProbesInsideSurfaceCells(t *testing.T) {
	col := Column{Layers: []Layer{
		{Name: "render", Thickness: 0.03, Conductivity: 0.9, HeatCapacity: 1.7e6},
		{Name: "block", Thickness: 0.2, Conductivity: 0.25, HeatCapacity: 1.1e6},
	}, OutsideResistance: 0.04, InsideResistance: 0.17}
	to, ti := -8.0, 21.0
	rtot := 0.04 + 0.03/0.9 + 0.2/0.25 + 0.17
	q := (to - ti) / rtot
	exact := func(x float64) float64 {
		r := 0.04 + math.Min(x, 0.03)/0.9
		if x > 0.03 {
			r += (x - 0.03) / 0.25
		}
		return to - q*r
	}
	mesh, err := NewMesh(col, MeshOptions{})
	if err != nil {
		t.Fatal(err)
	}
	n := mesh.Cells()
	xa := mesh.Centers[0] / 3                                    // between the outside face and the first centre
	xb := mesh.Faces[n] - (mesh.Faces[n]-mesh.Centers[n-1])/3    // between the last centre and the inside face
	xc := mesh.Faces[n] - 0.99*(mesh.Faces[n]-mesh.Centers[n-1]) // just inside the last centre
	out, in := ColumnBoundaries(col, fvtConst(to), fvtConst(ti))
	res, err := Simulate(Problem{
		Column: col, Mesh: mesh, Outside: out, Inside: in,
		InitialFunc: exact, Duration: 86400, Step: 3600,
		Probes: []float64{xa, xb, xc},
	})
	if err != nil {
		t.Fatal(err)
	}
	k := len(res.Times) - 1
	for j, x := range res.Probes {
		if got, want := res.Probe[j][k], exact(x); math.Abs(got-want) > 1e-9 {
			t.Errorf("probe at %.5f m: %.10f degC, exact %.10f", x, got, want)
		}
	}
	if d := exact(xa) - exact(mesh.Centers[0]); math.Abs(d) < 0.01 {
		t.Fatalf("test set-up: the probe in the surface cell is only %.4f K from the centre value", d)
	}
	for i, x := range mesh.Centers {
		if got, want := res.Mean[i], exact(x); math.Abs(got-want) > 1e-9 {
			t.Errorf("mean at %.4f m: %.10f degC, steady %.10f", x, got, want)
		}
	}
}
