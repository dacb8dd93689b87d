package solver

import (
	"errors"
	"fmt"
	"math"
)

// MeshOptions controls how NewMesh divides a column into finite-volume
// cells. The zero value gives the defaults documented on each field.
//
// Inside every massive layer the cells are smallest next to the two faces
// of the layer (the surfaces and the layer interfaces, where the
// temperature gradients are steepest) and grow geometrically by Growth
// away from them, up to MaxCell.
type MeshOptions struct {
	// SurfaceCell is the width of the cells touching a surface or a layer
	// interface, m (an upper bound: fitting a whole number of cells into a
	// layer makes them up to about 10 % narrower). 0 derives it from
	// ResolvePeriod in each layer.
	SurfaceCell float64

	// Growth is the ratio of the widths of neighbouring cells, 1 to 1.5.
	// 0 means 1.1. 1 gives a uniform mesh in each layer.
	Growth float64

	// MaxCell caps the width of any cell, m. 0 means a tenth of the total
	// thickness of the column.
	MaxCell float64

	// ResolvePeriod is the shortest period (or time scale) the mesh must
	// resolve, s. When SurfaceCell is 0 the cells at the faces of each
	// layer are CellsPerDepth times smaller than the periodic penetration
	// depth delta = sqrt(a P / pi) of that layer (ISO 13786), grow to at
	// most twice that size within 3 delta of the face (where the wave of
	// period P lives) and grow freely beyond. 0 means one day (86400 s).
	ResolvePeriod float64

	// CellsPerDepth is the number of surface cells per periodic penetration
	// depth, used with ResolvePeriod. 0 means 10.
	CellsPerDepth float64

	// MinCellsPerLayer is the least number of cells in a massive layer.
	// 0 means 3.
	MinCellsPerLayer int

	// MaxCells caps the number of cells; NewMesh returns an error (before
	// building anything) for a mesh that would be larger. 0 means
	// 1,000,000.
	MaxCells int

	// Refinement multiplies the number of cells of every layer while
	// keeping the same grading (the cells follow the same size function),
	// for convergence studies. 0 means 1.
	Refinement int
}

// Mesh is a one-dimensional finite-volume mesh of a Column.
//
// Cell i spans [Faces[i], Faces[i+1]] (m from the outside surface) and lies
// in the massive layer Layer[i] of the column. Every layer interface lies on
// a face. Massless resistance layers have no cells: their resistances sit
// on the face where they are, in FaceResistance (FaceResistance[0] on the
// outside surface, FaceResistance[Cells()] on the inside surface).
type Mesh struct {
	Faces          []float64 // m, len Cells()+1, increasing, Faces[0] = 0
	Centers        []float64 // m, cell mid-points, len Cells()
	Layer          []int     // index into Column.Layers of each cell
	FaceResistance []float64 // m2 K/W of massless layers on each face, len Cells()+1
}

// Cells returns the number of cells.
func (m *Mesh) Cells() int { return len(m.Centers) }

// Width returns the width of cell i, m.
func (m *Mesh) Width(i int) float64 { return m.Faces[i+1] - m.Faces[i] }

// Thickness is the total thickness of the meshed column, m.
func (m *Mesh) Thickness() float64 { return m.Faces[len(m.Faces)-1] }

// CellAt returns the index of the cell containing x (m); a position on a
// face belongs to the deeper cell, positions outside the mesh to the
// nearest end cell.
func (m *Mesh) CellAt(x float64) int {
	n := m.Cells()
	lo, hi := 0, n-1
	if x <= m.Faces[0] {
		return 0
	}
	if x >= m.Faces[n] {
		return n - 1
	}
	for lo < hi {
		mid := (lo + hi + 1) / 2
		if m.Faces[mid] <= x {
			lo = mid
		} else {
			hi = mid - 1
		}
	}
	return lo
}

// NewMesh divides the massive layers of c into cells as o describes.
//
// For a HalfSpace column the given thickness of the last layer is meshed:
// the caller makes the column deep enough for the time scale simulated
// (HalfSpaceTime gives the time at which a finite slab stops behaving as a
// half-space).
func NewMesh(c Column, o MeshOptions) (*Mesh, error) {
	if err := c.Validate(); err != nil {
		return nil, err
	}
	total := c.Thickness()
	if total <= 0 {
		return nil, errors.New("solver: column has no massive layer to mesh")
	}
	bad := func(v float64) bool { return math.IsNaN(v) || math.IsInf(v, 0) || v < 0 }
	if bad(o.SurfaceCell) || bad(o.Growth) || bad(o.MaxCell) || bad(o.ResolvePeriod) || bad(o.CellsPerDepth) ||
		o.MinCellsPerLayer < 0 || o.Refinement < 0 {
		return nil, errors.New("solver: mesh options must be finite and not negative")
	}
	if o.Growth == 0 {
		o.Growth = 1.1
	}
	if o.Growth < 1 || o.Growth > 1.5 {
		return nil, fmt.Errorf("solver: mesh growth ratio %g outside [1, 1.5]", o.Growth)
	}
	if o.MaxCell == 0 {
		o.MaxCell = total / 10
	}
	if o.ResolvePeriod == 0 {
		o.ResolvePeriod = 86400
	}
	if o.CellsPerDepth == 0 {
		o.CellsPerDepth = 10
	}
	if o.MinCellsPerLayer == 0 {
		o.MinCellsPerLayer = 3
	}
	if o.Refinement == 0 {
		o.Refinement = 1
	}
	if o.MaxCells <= 0 {
		o.MaxCells = 1000000
	}

	m := &Mesh{Faces: []float64{0}, FaceResistance: []float64{0}}
	top := 0.0
	for li, l := range c.Layers {
		if l.Massless() {
			m.FaceResistance[len(m.FaceResistance)-1] += l.Resistance
			continue
		}
		h0 := o.SurfaceCell
		var hplat, yB float64
		if h0 == 0 {
			// Periodic penetration depth delta = sqrt(a P / pi), ISO 13786.
			a := l.Diffusivity()
			if f := l.Freeze; f != nil {
				a = math.Min(a, f.ConductivityFrozen/f.HeatCapacityFrozen)
			}
			delta := math.Sqrt(a * o.ResolvePeriod / math.Pi)
			h0 = delta / o.CellsPerDepth
			// Keep cells of 2 delta/CellsPerDepth down to 3 delta, where
			// the resolved wave has decayed to exp(-3) = 5 %.
			hplat, yB = h0, 3*delta
		}
		hmax := math.Min(o.MaxCell, l.Thickness/float64(o.MinCellsPerLayer))
		h0 = math.Min(h0, hmax)
		xs, err := fvGradedFaces(l.Thickness, h0, o.Growth, hmax, hplat, yB, o.MinCellsPerLayer, o.Refinement, o.MaxCells-len(m.Layer))
		if err != nil {
			return nil, fmt.Errorf("solver: layer %q: %w", l.Name, err)
		}
		for j := 1; j < len(xs); j++ {
			x := top + xs[j]
			if j == len(xs)-1 {
				x = top + l.Thickness
			}
			m.Faces = append(m.Faces, x)
			m.FaceResistance = append(m.FaceResistance, 0)
			m.Layer = append(m.Layer, li)
		}
		top += l.Thickness
	}
	m.Centers = make([]float64, len(m.Layer))
	for i := range m.Centers {
		m.Centers[i] = 0.5 * (m.Faces[i] + m.Faces[i+1])
	}
	return m, nil
}

// fvGradedFaces returns the faces 0 = x0 < ... < xN = d of a layer of
// thickness d whose cells are h0 wide at both ends and grow by the ratio r
// away from them, up to hmax. The faces equidistribute a target size
// function h(y) of the distance y to the nearer end: F(x_j) = j F(d)/N with
// F(x) the integral of dx/h. With a = h0 ln(r)/(r-1) and c = ln(r), the
// size function
//
//	h(y) = a + c y                     (unit steps of F give h0, h0 r, h0 r^2, ... exactly)
//	h(y) = hplat                       for yA <= y <= yB (a plateau, hplat >= a)
//	h(y) = hplat + c (y - yB)          beyond
//
// capped at hmax. With yB = 0 there is no plateau.
// ErrTooManyCells is returned (wrapped) by NewMesh for a mesh larger than
// MeshOptions.MaxCells.
var ErrTooManyCells = errors.New("the mesh would have more cells than the limit")

func fvGradedFaces(d, h0, r, hmax, hplat, yB float64, minCells, refine, limit int) ([]float64, error) {
	c := math.Log(r)
	a := h0
	if c > 1e-12 {
		a = h0 * c / (r - 1)
	} else {
		c = 0
	}
	type seg struct{ y0, y1, h, s float64 }
	var segs []seg
	if c == 0 || yB <= 0 || hplat <= a {
		segs = []seg{{0, math.Inf(1), a, c}}
	} else {
		yA := math.Min((hplat-a)/c, yB)
		segs = []seg{{0, yA, a, c}, {yA, yB, a + c*yA, 0}, {yB, math.Inf(1), a + c*yA, c}}
	}
	// half(y): integral of 1/min(hmax, h) from 0 to y.
	half := func(y float64) float64 {
		var F float64
		for _, sg := range segs {
			if y <= sg.y0 {
				break
			}
			y1 := math.Min(y, sg.y1)
			if sg.s == 0 {
				F += (y1 - sg.y0) / math.Min(sg.h, hmax)
				continue
			}
			// h reaches hmax at yc.
			yc := sg.y0 + math.Max(0, (hmax-sg.h)/sg.s)
			if y1 <= yc {
				F += math.Log1p(sg.s*(y1-sg.y0)/sg.h) / sg.s
			} else {
				F += math.Log1p(sg.s*(yc-sg.y0)/sg.h)/sg.s + (y1-yc)/hmax
			}
		}
		return F
	}
	F := func(x float64) float64 {
		if x <= d/2 {
			return half(x)
		}
		return 2*half(d/2) - half(d-x)
	}
	total := F(d)
	if !(total*float64(refine) <= float64(limit)) { // also catches NaN and Inf
		return nil, fmt.Errorf("%w of %d cells (about %.3g here); use larger cells", ErrTooManyCells, limit, total*float64(refine))
	}
	n := int(math.Ceil(total - 1e-9))
	if n < minCells {
		n = minCells
	}
	n *= refine
	xs := make([]float64, n+1)
	xs[n] = d
	for j := 1; j < n; j++ {
		target := total * float64(j) / float64(n)
		lo, hi := xs[j-1], d
		for it := 0; it < 200 && hi-lo > 1e-15*d; it++ {
			mid := 0.5 * (lo + hi)
			if F(mid) < target {
				lo = mid
			} else {
				hi = mid
			}
		}
		xs[j] = 0.5 * (lo + hi)
	}
	return xs, nil
}
