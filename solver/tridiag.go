package solver

import "errors"

// errNotPositiveDefinite is returned when a symmetric tridiagonal matrix
// loses positive definiteness during factorisation.
var errNotPositiveDefinite = errors.New("solver: tridiagonal matrix is not positive definite")

// fvSymTridiag is the L D L^T factorisation of a symmetric positive
// definite tridiagonal matrix (the algorithm of LAPACK dpttrf/dpttrs,
// Golub and Van Loan, Matrix Computations, section 4.3.6), stored so that
// each solve is one forward and one backward sweep without allocation.
type fvSymTridiag struct {
	dinv []float64 // 1/D_i, len n
	l    []float64 // subdiagonal of the unit lower factor L, len n-1
}

// factor factorises the matrix with diagonal d (len n) and off-diagonal e
// (len n-1). It reuses the storage of f when it is large enough.
//
//	D_0 = d_0;  l_{i-1} = e_{i-1} / D_{i-1};  D_i = d_i - l_{i-1} e_{i-1}
func (f *fvSymTridiag) factor(d, e []float64) error {
	n := len(d)
	if cap(f.dinv) < n {
		f.dinv = make([]float64, n)
		f.l = make([]float64, n)
	}
	f.dinv = f.dinv[:n]
	f.l = f.l[:max(n-1, 0)]
	if n == 0 {
		return nil
	}
	di := d[0]
	for i := 0; ; i++ {
		if !(di > 0) {
			return errNotPositiveDefinite
		}
		f.dinv[i] = 1 / di
		if i == n-1 {
			break
		}
		li := e[i] / di
		f.l[i] = li
		di = d[i+1] - li*e[i]
	}
	return nil
}

// solve overwrites b with the solution x of A x = b.
//
//	y_i = b_i - l_{i-1} y_{i-1};  x_{n-1} = y_{n-1}/D_{n-1};  x_i = y_i/D_i - l_i x_{i+1}
func (f *fvSymTridiag) solve(b []float64) {
	n := len(f.dinv)
	b = b[:n]
	l := f.l[:max(n-1, 0)]
	for i := 1; i < n; i++ {
		b[i] -= l[i-1] * b[i-1]
	}
	dinv := f.dinv[:n]
	b[n-1] *= dinv[n-1]
	for i := n - 2; i >= 0; i-- {
		b[i] = b[i]*dinv[i] - l[i]*b[i+1]
	}
}

// fvSymTridiagUp is the U D U^T factorisation of the same kind of matrix
// (U unit upper bidiagonal): its solve sweeps from the last unknown to
// the first and back, the mirror of fvSymTridiag, so that a solve can
// start while another one is still sweeping upward.
type fvSymTridiagUp struct {
	dinv []float64 // 1/D_i, len n
	u    []float64 // superdiagonal of U, len n-1
}

// factor factorises the matrix with diagonal d and off-diagonal e.
//
//	D_{n-1} = d_{n-1};  u_i = e_i / D_{i+1};  D_i = d_i - u_i e_i
func (f *fvSymTridiagUp) factor(d, e []float64) error {
	n := len(d)
	if cap(f.dinv) < n {
		f.dinv = make([]float64, n)
		f.u = make([]float64, n)
	}
	f.dinv = f.dinv[:n]
	f.u = f.u[:max(n-1, 0)]
	if n == 0 {
		return nil
	}
	di := d[n-1]
	for i := n - 1; ; i-- {
		if !(di > 0) {
			return errNotPositiveDefinite
		}
		f.dinv[i] = 1 / di
		if i == 0 {
			break
		}
		ui := e[i-1] / di
		f.u[i-1] = ui
		di = d[i-1] - ui*e[i-1]
	}
	return nil
}

// solve overwrites b with the solution x of A x = b.
//
//	z_i = b_i - u_i z_{i+1};  x_0 = z_0/D_0;  x_i = z_i/D_i - u_{i-1} x_{i-1}
func (f *fvSymTridiagUp) solve(b []float64) {
	n := len(f.dinv)
	b = b[:n]
	u := f.u[:max(n-1, 0)]
	for i := n - 2; i >= 0; i-- {
		b[i] -= u[i] * b[i+1]
	}
	dinv := f.dinv[:n]
	b[0] *= dinv[0]
	for i := 1; i < n; i++ {
		b[i] = b[i]*dinv[i] - u[i-1]*b[i-1]
	}
}

// fvThomas solves the general tridiagonal system
//
//	lo_i x_{i-1} + di_i x_i + up_i x_{i+1} = r_i
//
// by the Thomas algorithm (Gaussian elimination without pivoting), which
// is stable for the column diagonally dominant matrices of the enthalpy
// iteration. lo[0] and up[n-1] are ignored. The solution overwrites r; w
// (len >= n) is scratch. It allocates nothing.
func fvThomas(lo, di, up, r, w []float64) {
	n := len(di)
	lo, up, r, w = lo[:n], up[:n], r[:n], w[:n]
	inv := 1 / di[0]
	w[0] = up[0] * inv
	r[0] *= inv
	for i := 1; i < n; i++ {
		inv = 1 / (di[i] - lo[i]*w[i-1])
		w[i] = up[i] * inv
		r[i] = (r[i] - lo[i]*r[i-1]) * inv
	}
	for i := n - 2; i >= 0; i-- {
		r[i] -= w[i] * r[i+1]
	}
}
