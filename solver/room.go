package solver

import (
	"errors"
	"fmt"
	"math"
)

// This file holds the numerics of a room: one air node joined to the
// inside surfaces of its elements (walls, roof, floor, partitions), to the
// outdoor air through a conductance (ventilation and windows) and fed by
// heat gains. RoomHarmonic is the exact periodic solution of one harmonic
// (the admittance method of a single room, with the ISO 13786 matrices of
// every element); RoomSimulate advances the finite volumes of every
// element and the air node together in time.

// RoomBack says what lies behind an element's back face (x = 0 of its
// column).
type RoomBack int

const (
	// BackOutside: the back face exchanges heat with an outside
	// environment (outdoor air, or a sol-air temperature) through the
	// column's OutsideResistance.
	BackOutside RoomBack = iota
	// BackAdiabatic: no heat crosses the back face (a partition or a slab
	// to an identical neighbouring room, the plane of symmetry).
	BackAdiabatic
)

// String returns the name of the back condition.
func (b RoomBack) String() string {
	switch b {
	case BackOutside:
		return "outside"
	case BackAdiabatic:
		return "adiabatic"
	}
	return fmt.Sprintf("RoomBack(%d)", int(b))
}

// RoomElement is one layered element of a room, of area Area (m2).
//
// Its Column runs from the back (Layers[0], x = 0, behind
// OutsideResistance) to the room (the last layer, whose inside surface
// meets the room air through InsideResistance, Rsi). In ISO 13786 terms
// the room side is side 1. An element without massive layers is massless:
// a conductance Area U between its back environment and the air (none if
// its back is adiabatic). Layers must not freeze.
type RoomElement struct {
	Name   string
	Area   float64 // m2, > 0
	Column Column  // back first; OutsideResistance = back surface resistance, InsideResistance = Rsi, m2 K/W
	Back   RoomBack
	Mesh   *Mesh // for RoomSimulate; nil: NewMesh(Column, MeshOptions{})
}

// massless reports whether e has no massive layer.
func (e RoomElement) massless() bool { return e.Column.Thickness() == 0 }

// U is the steady transmittance of the element between its back
// environment and the room air, 1/(Rse + sum R + Rsi), W/(m2 K) (ISO 6946).
func (e RoomElement) U() float64 {
	r := e.Column.OutsideResistance + e.Column.InsideResistance
	for _, l := range e.Column.Layers {
		r += l.ThermalResistance()
	}
	return 1 / r
}

// Room is one air node with its elements.
//
// AirCapacity is the heat capacity of the air node, J/K (0 allowed: the
// air then follows its balance instantly). Conductance is the heat
// transfer coefficient between the outdoor air and the room air, W/K:
// ventilation (rho c V n / 3600) plus the U A of the windows; RoomHarmonic
// uses it as is, RoomSimulate unless RoomProblem.Conductance is set.
type Room struct {
	Elements    []RoomElement
	AirCapacity float64 // J/K
	Conductance float64 // W/K
}

// Validate reports the first impossible value of r.
func (r Room) Validate() error {
	if !(r.AirCapacity >= 0) || math.IsInf(r.AirCapacity, 0) {
		return fmt.Errorf("solver: air heat capacity must be finite and not negative, got %g J/K", r.AirCapacity)
	}
	if !(r.Conductance >= 0) || math.IsInf(r.Conductance, 0) {
		return fmt.Errorf("solver: outdoor conductance must be finite and not negative, got %g W/K", r.Conductance)
	}
	coupled := r.AirCapacity > 0 || r.Conductance > 0
	for i, e := range r.Elements {
		if !(e.Area > 0) || math.IsInf(e.Area, 0) {
			return fmt.Errorf("solver: element %d (%s): area must be finite and positive, got %g m2", i+1, e.Name, e.Area)
		}
		if e.Back != BackOutside && e.Back != BackAdiabatic {
			return fmt.Errorf("solver: element %d (%s): unknown back condition %d", i+1, e.Name, int(e.Back))
		}
		if e.Column.HalfSpace {
			return fmt.Errorf("solver: element %d (%s): a room element cannot be a half-space", i+1, e.Name)
		}
		if err := tmCheckColumn(e.Column); err != nil {
			return fmt.Errorf("element %d (%s): %w", i+1, e.Name, err)
		}
		for _, l := range e.Column.Layers {
			if l.Freeze != nil {
				return fmt.Errorf("solver: element %d (%s): layer %q freezes; room elements do not", i+1, e.Name, l.Name)
			}
		}
		if !e.massless() || e.Back == BackOutside {
			coupled = true
		}
	}
	if !coupled {
		return errors.New("solver: the room air has no heat capacity and no connection to anything")
	}
	return nil
}

// RoomForcing is the forcing of a room for one harmonic: complex
// amplitudes in the convention exp(+i omega t) (for the mean, period 0,
// the mean values as real numbers).
type RoomForcing struct {
	Outdoor complex128   // outdoor air temperature, K (degC for the mean)
	Gains   complex128   // heat delivered to the air: internal gains and transmitted sun, W
	Back    []complex128 // environment temperature behind each element (sol-air where the sun falls), K; ignored for adiabatic backs; nil: Outdoor for every element
	// Surface[k] is the heat released at the inside surface node of
	// element k (the wall side of its Rsi), W, positive into the room
	// (window sun absorbed by the floor, say); nil: none on any element.
	Surface []complex128
}

// RoomResponse is the periodic response of a room to one harmonic
// (complex amplitudes, exp(+i omega t); real mean values for period 0).
type RoomResponse struct {
	Air     complex128   // room air temperature, K
	Surface []complex128 // inside surface temperature of each element (wall side of Rsi), K
	Flow    []complex128 // heat from each element into the air, W
	Outdoor complex128   // heat from the outdoor air through Room.Conductance, W
	// Admittance[k] is A_k Y_k, W/K: the heat the element takes from the
	// air per unit air temperature amplitude with its back held at zero
	// amplitude (A Y11 backed by the outside, -A Z21/Z22 adiabatic).
	Admittance []complex128
	// SurfaceToAir[k] is F_k = 1 - Rsi Y_k, the part of a heat source at
	// the inside surface of element k that reaches the air (the rest goes
	// into the element); 1 for an adiabatic element's mean.
	SurfaceToAir []complex128
}

// RoomHarmonic returns the exact periodic response of room r to the
// forcing f of period T (s); period 0 gives the steady mean.
//
// The balance of the air node for one harmonic, exp(+i omega t), is
//
//	i omega C theta_i = Phi + H (theta_e - theta_i)
//	                    + sum_k A_k (Y12,k theta_b,k - Y11,k theta_i)   (back outside)
//	                    + sum_k A_k (Z21/Z22)_k theta_i                 (back adiabatic)
//
// with the ISO 13786 transfer matrix Z of each element from its back
// environment to the room air (Z = Z_se Z_layers Z_si, side 1 the room),
// Y11 = -Z11/Z12 and Y12 = -1/Z12 (ISO 13786, clause 7; in the terms of
// Matrix, side b is the room and side a the back); an adiabatic back (q_a = 0
// in [theta_a, q_a] = Z [theta_i, q_i]) leaves q_i = -(Z21/Z22) theta_i
// flowing from the air into the element [derived]. For the mean,
// Y11 = Y12 = U and an adiabatic element carries no heat. The inside
// surface temperature is theta_s = theta_i - Rsi q_i, q_i = Y11 theta_i -
// Y12 theta_b the flux from the air into the element.
//
// A heat source Q_k (W, f.Surface) at the inside surface node s of element
// k (the wall side of Rsi) enters the balance of that node, per m2 with
// q_k = Q_k/A_k:
//
//	q_k + (theta_i - theta_s)/Rsi = Y'11 theta_s - Y'12 theta_b
//
// where the right side is the heat from the surface node into the wall,
// with Y' of the element's matrix without Rsi, Z' = Z_se Z_layers (ISO
// 13786 matrices; the surface node balance [derived]); an adiabatic back
// gives -(Z'21/Z'22) theta_s. Eliminating theta_s, with Y11 = Y'11/(1 +
// Rsi Y'11) and Y12 = Y'12/(1 + Rsi Y'11) (Z = Z' Z_si), the flux from the
// air into the element becomes [derived]
//
//	q_i = Y11 theta_i - Y12 theta_b - F_k q_k,   F_k = 1 - Rsi Y11 = 1/(1 + Rsi Y'11)
//
// so the air receives F_k Q_k of the source (the surface factor F_k; for
// the mean 1 - Rsi U backed by the outside, 1 adiabatic) and the element
// the rest. A massless element takes the same formula with Y11 = U (its
// source leaves partly through the element to its back).
func RoomHarmonic(r Room, period float64, f RoomForcing) (RoomResponse, error) {
	if err := r.Validate(); err != nil {
		return RoomResponse{}, err
	}
	if period != 0 {
		if err := tmCheckPeriod(period); err != nil {
			return RoomResponse{}, err
		}
	}
	if f.Back != nil && len(f.Back) != len(r.Elements) {
		return RoomResponse{}, fmt.Errorf("solver: %d back temperatures for %d elements", len(f.Back), len(r.Elements))
	}
	if f.Surface != nil && len(f.Surface) != len(r.Elements) {
		return RoomResponse{}, fmt.Errorf("solver: %d surface sources for %d elements", len(f.Surface), len(r.Elements))
	}
	n := len(r.Elements)
	y := make([]complex128, n) // flux density from the air into the element per unit theta_i, W/(m2 K)
	b := make([]complex128, n) // flux density into the air per unit theta_b, W/(m2 K)
	back := make([]complex128, n)
	omega := 0.0
	if period != 0 {
		omega = 2 * math.Pi / period
	}
	for k, e := range r.Elements {
		back[k] = f.Outdoor
		if f.Back != nil {
			back[k] = f.Back[k]
		}
		switch {
		case period == 0 && e.Back == BackOutside:
			y[k], b[k] = complex(e.U(), 0), complex(e.U(), 0)
		case period == 0:
			// adiabatic: no mean heat
		default:
			z, _ := tmWallMatrix(tmWallElements(e.Column), period)
			m := z.M
			if e.Back == BackOutside {
				y[k] = -m[0][0] / m[0][1]
				b[k] = -1 / m[0][1] * complex(math.Exp(-z.LogScale), 0)
			} else {
				y[k] = -m[1][0] / m[1][1]
			}
		}
	}
	h := complex(r.Conductance, 0)
	num := f.Gains + h*f.Outdoor
	den := complex(0, omega*r.AirCapacity) + h
	src := make([]complex128, n) // F_k Q_k, W: the part of each surface source that reaches the air
	for k, e := range r.Elements {
		a := complex(e.Area, 0)
		num += a * b[k] * back[k]
		den += a * y[k]
		if f.Surface != nil && f.Surface[k] != 0 {
			src[k] = (1 - complex(e.Column.InsideResistance, 0)*y[k]) * f.Surface[k]
			num += src[k]
		}
	}
	if den == 0 {
		return RoomResponse{}, errors.New("solver: the room air balance is singular (nothing holds the mean air temperature)")
	}
	res := RoomResponse{Air: num / den, Surface: make([]complex128, n), Flow: make([]complex128, n), Admittance: make([]complex128, n), SurfaceToAir: make([]complex128, n)}
	for k, e := range r.Elements {
		a := complex(e.Area, 0)
		rsi := complex(e.Column.InsideResistance, 0)
		q := y[k]*res.Air - b[k]*back[k] - src[k]/a // flux from the air into the element through Rsi, W/m2
		res.Flow[k] = -a * q
		res.Surface[k] = res.Air - rsi*q
		res.Admittance[k] = a * y[k]
		res.SurfaceToAir[k] = 1 - rsi*y[k]
	}
	res.Outdoor = h * (f.Outdoor - res.Air)
	return res, nil
}

// RoomCellAmplitudes returns the temperature amplitudes (K; real means
// for period 0) at the cell centres of every element's mesh (nil for a
// massless element) for the periodic response resp of RoomHarmonic with
// the forcing f: the state a simulation starts from. meshes are those of
// RoomMeshes. An element with a surface source (f.Surface) is solved
// from its inside surface temperature resp.Surface (Rsi taken out), the
// source having already set it.
func RoomCellAmplitudes(r Room, meshes []*Mesh, period float64, f RoomForcing, resp RoomResponse) ([][]complex128, error) {
	if len(meshes) != len(r.Elements) {
		return nil, fmt.Errorf("solver: %d meshes for %d elements", len(meshes), len(r.Elements))
	}
	out := make([][]complex128, len(r.Elements))
	for k, e := range r.Elements {
		m := meshes[k]
		if m == nil {
			continue
		}
		back := f.Outdoor
		if f.Back != nil {
			back = f.Back[k]
		}
		c := e.Column
		inside := resp.Air
		if f.Surface != nil && f.Surface[k] != 0 {
			// The profile behind the surface node: its temperature
			// prescribed, no Rsi.
			c.InsideResistance = 0
			inside = resp.Surface[k]
		}
		out[k] = make([]complex128, m.Cells())
		switch {
		case e.Back == BackAdiabatic && period == 0:
			for i := range out[k] {
				out[k][i] = inside
			}
		case period == 0:
			t, _, err := Steady(c, real(back), real(inside), m.Centers)
			if err != nil {
				return nil, err
			}
			for i, v := range t {
				out[k][i] = complex(v, 0)
			}
		case e.Back == BackOutside:
			t, _, err := Harmonic(c, period, back, inside, m.Centers)
			if err != nil {
				return nil, err
			}
			copy(out[k], t)
		default:
			// Adiabatic back: the column reversed, forced from the room
			// side through Rsi and insulated at its back.
			rc := Column{OutsideResistance: c.InsideResistance}
			for i := len(c.Layers) - 1; i >= 0; i-- {
				rc.Layers = append(rc.Layers, c.Layers[i])
			}
			d := c.Thickness()
			x := make([]float64, m.Cells())
			for i, v := range m.Centers {
				x[i] = math.Max(0, math.Min(d, d-v))
			}
			t, _, err := HarmonicInsulated(rc, period, inside, x)
			if err != nil {
				return nil, err
			}
			copy(out[k], t)
		}
	}
	return out, nil
}

// RoomMeshes returns the mesh of every element of r: its own Mesh, or
// NewMesh(Column, o) when nil; nil for a massless element.
func RoomMeshes(r Room, o MeshOptions) ([]*Mesh, error) {
	ms := make([]*Mesh, len(r.Elements))
	for k, e := range r.Elements {
		if e.massless() {
			continue
		}
		if e.Mesh != nil {
			if err := fvCheckMesh(e.Column, e.Mesh); err != nil {
				return nil, fmt.Errorf("element %d (%s): %w", k+1, e.Name, err)
			}
			ms[k] = e.Mesh
			continue
		}
		m, err := NewMesh(e.Column, o)
		if err != nil {
			return nil, fmt.Errorf("element %d (%s): %w", k+1, e.Name, err)
		}
		ms[k] = m
	}
	return ms, nil
}
