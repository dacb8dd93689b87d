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

// TestMasslessSurfaceLayers puts massless layers (a cladding air gap and a
// foil, R 0.18 and 0.05 m2 K/W) on both surfaces of a massive layer: in
// the steady state the flux is (T_o - T_i) / sum R and each surface sits
// behind its surface resistance (Fourier's law in series [derived]). A
// simulation started from that state must keep it; a surface conductance
// that forgets the massless layers on its face lets too much heat through.
func TestMasslessSurfaceLayers(t *testing.T) {
	col := Column{Layers: []Layer{
		{Name: "air gap", Resistance: 0.18},
		{Name: "block", Thickness: 0.2, Conductivity: 0.5, HeatCapacity: 1.2e6},
		{Name: "foil", Resistance: 0.05},
	}, OutsideResistance: 0.04, InsideResistance: 0.13}
	to, ti := -5.0, 20.0
	q := (to - ti) / (0.04 + 0.18 + 0.2/0.5 + 0.05 + 0.13)
	exact := func(x float64) float64 { return to - q*(0.04+0.18+x/0.5) }
	mesh, err := NewMesh(col, MeshOptions{})
	if err != nil {
		t.Fatal(err)
	}
	out, in := ColumnBoundaries(col, fvtConst(to), fvtConst(ti))
	res, err := Simulate(Problem{
		Column: col, Mesh: mesh, Outside: out, Inside: in,
		InitialFunc: exact, Duration: 10 * 86400, Step: 3600,
		Probes: []float64{0.1},
	})
	if err != nil {
		t.Fatal(err)
	}
	k := len(res.Times) - 1
	if math.Abs(res.FluxOutside[k]-q) > 1e-9 || math.Abs(res.FluxInside[k]-q) > 1e-9 {
		t.Errorf("fluxes %.6f %.6f W/m2, want %.6f", res.FluxOutside[k], res.FluxInside[k], q)
	}
	if got := res.Probe[0][k]; math.Abs(got-exact(0.1)) > 1e-9 {
		t.Errorf("mid-block %.6f degC, want %.6f", got, exact(0.1))
	}
	if math.Abs(res.SurfaceOutside[k]-(to-q*0.04)) > 1e-9 || math.Abs(res.SurfaceInside[k]-(ti+q*0.13)) > 1e-9 {
		t.Errorf("surface temperatures %.6f %.6f, want %.6f %.6f", res.SurfaceOutside[k], res.SurfaceInside[k], to-q*0.04, ti+q*0.13)
	}
}
