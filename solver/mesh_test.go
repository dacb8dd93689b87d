package solver

import (
	"math"
	"testing"
)

func TestNewMeshGrading(t *testing.T) {
	col := Column{Layers: []Layer{
		{Name: "render", Thickness: 0.02, Conductivity: 0.8, HeatCapacity: 1.6e6},
		{Name: "membrane", Resistance: 0.05},
		{Name: "block", Thickness: 0.3, Conductivity: 1.1, HeatCapacity: 1.9e6},
		{Name: "foil", Resistance: 0.2},
	}}
	for _, o := range []MeshOptions{{}, {SurfaceCell: 0.001, Growth: 1.2}, {Growth: 1, MaxCell: 0.01}, {Refinement: 3}} {
		m, err := NewMesh(col, o)
		if err != nil {
			t.Fatal(err)
		}
		n := m.Cells()
		r := o.Growth
		if r == 0 {
			r = 1.1
		}
		// Interfaces on faces, cells in the right layer, centres mid-cell.
		fi := map[float64]bool{}
		for _, x := range m.Faces {
			fi[x] = true
		}
		if !fi[0] || !fi[0.02] || !fi[0.32] {
			t.Errorf("%+v: interfaces not on faces: %v", o, m.Faces)
		}
		for i := 0; i < n; i++ {
			if want := col.LayerAt(m.Centers[i]); m.Layer[i] != want {
				t.Errorf("%+v: cell %d in layer %d, want %d", o, i, m.Layer[i], want)
			}
			if math.Abs(m.Centers[i]-(m.Faces[i]+m.Faces[i+1])/2) > 1e-15 {
				t.Errorf("centre %d off", i)
			}
			// Neighbouring cells of one layer differ at most by the growth ratio.
			if i > 0 && m.Layer[i] == m.Layer[i-1] {
				q := m.Width(i) / m.Width(i-1)
				if q > r*(1+1e-6) || q < 1/(r*(1+1e-6)) {
					t.Errorf("%+v: cells %d/%d ratio %g > %g", o, i, i-1, q, r)
				}
			}
		}
		if m.FaceResistance[0] != 0 || m.FaceResistance[n] != 0.2 {
			t.Errorf("surface face resistances %g %g", m.FaceResistance[0], m.FaceResistance[n])
		}
		var rsum float64
		for _, v := range m.FaceResistance {
			rsum += v
		}
		if math.Abs(rsum-0.25) > 1e-15 {
			t.Errorf("face resistances sum to %g, want 0.25", rsum)
		}
		if o.SurfaceCell > 0 && (m.Width(0) > o.SurfaceCell*(1+1e-9) || m.Width(0) < 0.8*o.SurfaceCell) {
			t.Errorf("surface cell %g, want at most and about %g", m.Width(0), o.SurfaceCell)
		}
		if o.Refinement == 0 {
			for i := 0; i < n; i++ {
				if max := math.Max(o.MaxCell, 0); max > 0 && m.Width(i) > max*(1+1e-9) {
					t.Errorf("cell %d wider than MaxCell", i)
				}
			}
		}
	}
	// Default sizing: surface cell a tenth of the daily penetration depth
	// sqrt(a P/pi) (ISO 13786) of the block.
	m, _ := NewMesh(Column{Layers: []Layer{col.Layers[2]}}, MeshOptions{})
	d := math.Sqrt(1.1 / 1.9e6 * 86400 / math.Pi)
	if w := m.Width(0); w > d/10 || w < 0.8*d/10 {
		t.Errorf("default surface cell %g, want about %g", w, d/10)
	}
	// Refinement multiplies the cell count.
	m1, _ := NewMesh(col, MeshOptions{})
	m2, _ := NewMesh(col, MeshOptions{Refinement: 2})
	if m2.Cells() != 2*m1.Cells() {
		t.Errorf("refined %d cells, want %d", m2.Cells(), 2*m1.Cells())
	}
	if c := m1.CellAt(0.02); m1.Faces[c] != 0.02 {
		t.Errorf("CellAt on an interface returned cell %d", c)
	}
}

func TestNewMeshErrors(t *testing.T) {
	good := Column{Layers: []Layer{{Thickness: 1, Conductivity: 1, HeatCapacity: 1e6}}}
	for _, c := range []struct {
		col Column
		o   MeshOptions
	}{
		{Column{}, MeshOptions{}},
		{Column{Layers: []Layer{{Resistance: 0.1}}}, MeshOptions{}},
		{good, MeshOptions{Growth: 2}},
		{good, MeshOptions{SurfaceCell: -1}},
		{good, MeshOptions{MaxCell: math.NaN()}},
	} {
		if _, err := NewMesh(c.col, c.o); err == nil {
			t.Errorf("%+v %+v: no error", c.col, c.o)
		}
	}
}
