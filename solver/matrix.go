package solver

import (
	"math"
	"math/cmplx"
)

// Matrix is a 2x2 complex heat transfer matrix of ISO 13786 (clause 6),
// for one harmonic of period T and the time dependence exp(+i omega t).
//
// State vector and sides. A matrix Z of a slab (or of a whole column)
// links the complex amplitudes of temperature theta (K) and heat flux
// density q (W/m2) on its two faces:
//
//	[theta_a]     [theta_b]
//	[  q_a  ] = Z [  q_b  ]
//
// where side a is the face nearer the outside (smaller x) and side b the
// face nearer the inside (larger x). In the standard's numbering side b is
// "side 1" (inside) and side a is "side 2" (outside). The flux q in the
// state vector follows ISO 13786: it is positive from side b towards side
// a, that is in the -x direction, opposite to the package-wide flux
// convention of doc.go (q_package = -q_matrix). With this convention a
// massless resistance R is [[1, -R], [0, 1]] and det Z = 1.
//
// Matrices of layers in series multiply in the order of the layers from
// the outside: Z = Z_se Z_layer0 Z_layer1 ... Z_si.
type Matrix [2][2]complex128

// IdentityMatrix is the transfer matrix of nothing (a zero-thickness slab).
var IdentityMatrix = Matrix{{1, 0}, {0, 1}}

// Mul returns the product z*w (z on the outside of w).
func (z Matrix) Mul(w Matrix) Matrix {
	return Matrix{
		{z[0][0]*w[0][0] + z[0][1]*w[1][0], z[0][0]*w[0][1] + z[0][1]*w[1][1]},
		{z[1][0]*w[0][0] + z[1][1]*w[1][0], z[1][0]*w[0][1] + z[1][1]*w[1][1]},
	}
}

// Det returns the determinant of z; it is 1 for every physical transfer
// matrix (ISO 13786).
func (z Matrix) Det() complex128 { return z[0][0]*z[1][1] - z[0][1]*z[1][0] }

// Inverse returns z^-1 assuming det z = 1 (true for transfer matrices):
// [[z22, -z12], [-z21, z11]]. It maps the state on the outside face to
// the state on the inside face.
func (z Matrix) Inverse() Matrix {
	return Matrix{{z[1][1], -z[0][1]}, {-z[1][0], z[0][0]}}
}

// maxAbs is the largest modulus of the entries of z.
func (z Matrix) maxAbs() float64 {
	m := 0.0
	for i := range z {
		for j := range z[i] {
			if a := cmplx.Abs(z[i][j]); a > m {
				m = a
			}
		}
	}
	return m
}

// ScaledMatrix is a transfer matrix stored as exp(LogScale) * M, so that
// slabs many penetration depths thick (entries growing like exp(d/delta)/2,
// beyond the float64 range for d/delta > about 709) can be multiplied and
// used without overflow. LogScale is real; M is kept with its largest entry
// of order 1.
type ScaledMatrix struct {
	M        Matrix
	LogScale float64
}

// Mul returns the product z*w, renormalised.
func (z ScaledMatrix) Mul(w ScaledMatrix) ScaledMatrix {
	return ScaledMatrix{M: z.M.Mul(w.M), LogScale: z.LogScale + w.LogScale}.normalized()
}

// normalized rescales M so that its largest entry has modulus 1.
func (z ScaledMatrix) normalized() ScaledMatrix {
	m := z.M.maxAbs()
	if m == 0 || math.IsInf(m, 0) || math.IsNaN(m) {
		return z
	}
	for i := range z.M {
		for j := range z.M[i] {
			z.M[i][j] /= complex(m, 0)
		}
	}
	z.LogScale += math.Log(m)
	return z
}

// Value returns exp(LogScale) * M. Entries overflow to infinity when
// LogScale exceeds about 709 (never NaN: zero real or imaginary parts stay
// zero); use the scaled form for such matrices.
func (z ScaledMatrix) Value() Matrix {
	s := math.Exp(z.LogScale)
	mul := func(v float64) float64 {
		if v == 0 {
			return 0
		}
		return v * s
	}
	var v Matrix
	for i := range z.M {
		for j := range z.M[i] {
			v[i][j] = complex(mul(real(z.M[i][j])), mul(imag(z.M[i][j])))
		}
	}
	return v
}

// ResistanceMatrix is the transfer matrix [[1, -R], [0, 1]] of a massless
// thermal resistance R (m2 K/W): a surface resistance or an air layer
// (ISO 13786, clause 6.2).
func ResistanceMatrix(r float64) Matrix { return Matrix{{1, complex(-r, 0)}, {0, 1}} }

// LayerPenetrationDepth is the periodic penetration depth of a massive
// layer for the period T (s), delta = sqrt(lambda T / (pi rho c)) in m
// (ISO 13786, clause 3.1.13 / Annex A). It is 0 for a massless layer and
// for a non-positive period.
func LayerPenetrationDepth(l Layer, period float64) float64 {
	if l.Massless() || period <= 0 || l.HeatCapacity <= 0 {
		return 0
	}
	return math.Sqrt(l.Conductivity * period / (math.Pi * l.HeatCapacity))
}

// LayerMatrix returns the ISO 13786 transfer matrix of one layer for the
// period T (s), in the state-vector convention documented on Matrix.
//
// A massless layer gives [[1, -R], [0, 1]]. A massive layer of thickness d,
// conductivity lambda and penetration depth delta, with xi = d/delta and
// z = (1+i) xi, gives (ISO 13786, clause 6.3 and Annex A):
//
//	Z11 = Z22 = cosh(z)
//	Z12 = -delta sinh(z) / (lambda (1+i))
//	Z21 = -lambda (1+i) sinh(z) / delta
//
// The entries grow like exp(xi)/2: for xi beyond about 709 they overflow
// to infinity (never NaN). Code that must handle such layers uses
// LayerMatrixScaled, as Periodic, Harmonic and Response do.
func LayerMatrix(l Layer, period float64) Matrix {
	return LayerMatrixScaled(l, period).Value()
}

// LayerMatrixScaled returns the transfer matrix of LayerMatrix as
// exp(LogScale) * M with M of order 1, computed without overflow for any
// thickness. For xi = d/delta > 1 the exponential is factored out:
//
//	cosh(z) = exp(xi)/2 (exp(i xi) + exp(-2 xi) exp(-i xi))
//	sinh(z) = exp(xi)/2 (exp(i xi) - exp(-2 xi) exp(-i xi))
//
// (exact identities for z = (1+i) xi).
func LayerMatrixScaled(l Layer, period float64) ScaledMatrix {
	if l.Massless() {
		return ScaledMatrix{M: ResistanceMatrix(l.Resistance)}
	}
	delta := LayerPenetrationDepth(l, period)
	xi := l.Thickness / delta
	ch, sh, logScale := tmCoshSinh(xi)
	k := complex(1, 1) / complex(delta, 0) // k = (1+i)/delta = sqrt(i omega / a)
	lam := complex(l.Conductivity, 0)
	m := Matrix{
		{ch, -sh / (lam * k)},
		{-lam * k * sh, ch},
	}
	return ScaledMatrix{M: m, LogScale: logScale}.normalized()
}

// tmCoshSinh returns cosh((1+i)xi) and sinh((1+i)xi) as
// exp(logScale) * (ch, sh), with logScale = 0 for xi <= 1 and xi above.
func tmCoshSinh(xi float64) (ch, sh complex128, logScale float64) {
	z := complex(xi, xi)
	if xi <= 1 {
		return cmplx.Cosh(z), cmplx.Sinh(z), 0
	}
	w := cmplx.Rect(1, xi)                // exp(i xi)
	e := cmplx.Rect(math.Exp(-2*xi), -xi) // exp(-2 xi) exp(-i xi)
	return (w + e) / 2, (w - e) / 2, xi
}
