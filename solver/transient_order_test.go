package solver

import (
	"math"
	"math/cmplx"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// fvtComposite is the first decay mode of a two-layer slab with both faces
// held at 0 (Carslaw and Jaeger, Conduction of Heat in Solids, section
// 3.13, composite slab; eigenvalue equation [derived]):
//
//	T = phi(x) exp(-mu t), phi = sin(b1 x) in layer 1,
//	phi = sin(b1 d1)/sin(b2 d2) sin(b2 (L - x)) in layer 2,
//	a1 b1^2 = a2 b2^2 = mu,
//	k1 b1 cos(b1 d1) sin(b2 d2) + k2 b2 cos(b2 d2) sin(b1 d1) = 0.
type fvtComposite struct {
	l1, l2 Layer
	mu     float64
}

func newFvtComposite(l1, l2 Layer) fvtComposite {
	f := func(mu float64) float64 {
		b1, b2 := math.Sqrt(mu/l1.Diffusivity()), math.Sqrt(mu/l2.Diffusivity())
		return l1.Conductivity*b1*math.Cos(b1*l1.Thickness)*math.Sin(b2*l2.Thickness) +
			l2.Conductivity*b2*math.Cos(b2*l2.Thickness)*math.Sin(b1*l1.Thickness)
	}
	// Scan up from 0 (f > 0 there) to the first sign change.
	lo := 1e-12
	step := 1e-9
	for f(lo+step) > 0 {
		lo += step
		step *= 1.05
	}
	return fvtComposite{l1, l2, fvBisect(f, lo, lo+step)}
}

func (c fvtComposite) phi(x float64) float64 {
	b1, b2 := math.Sqrt(c.mu/c.l1.Diffusivity()), math.Sqrt(c.mu/c.l2.Diffusivity())
	d1, L := c.l1.Thickness, c.l1.Thickness+c.l2.Thickness
	if x <= d1 {
		return math.Sin(b1 * x)
	}
	return math.Sin(b1*d1) / math.Sin(b2*c.l2.Thickness) * math.Sin(b2*(L-x))
}

func TestObservedOrderSpace(t *testing.T) {
	// Graded meshes refined 1, 2, 4, 8 times (same grading function) on a
	// two-layer slab whose exact solution is its first decay mode. Time
	// steps small enough that the time error is negligible.
	l1 := Layer{Name: "a", Thickness: 0.1, Conductivity: 1.0, HeatCapacity: 1e6}
	l2 := Layer{Name: "b", Thickness: 0.2, Conductivity: 0.2, HeatCapacity: 1.5e6}
	ex := newFvtComposite(l1, l2)
	col := Column{Layers: []Layer{l1, l2}}
	tEnd := math.Ln2 / ex.mu
	var errs []float64
	var cells []int
	for _, ref := range []int{1, 2, 4, 8} {
		mesh, err := NewMesh(col, MeshOptions{SurfaceCell: 0.01, Growth: 1.3, Refinement: ref})
		if err != nil {
			t.Fatal(err)
		}
		res, err := Simulate(Problem{
			Column: col, Mesh: mesh,
			Outside:     Boundary{Kind: Environment, Temperature: fvtConst(0)},
			Inside:      Boundary{Kind: Environment, Temperature: fvtConst(0)},
			InitialFunc: ex.phi,
			Duration:    tEnd, Step: tEnd / 4000, OutputStep: tEnd,
		})
		if err != nil {
			t.Fatal(err)
		}
		e := 0.0
		for i, x := range mesh.Centers {
			e = math.Max(e, math.Abs(res.Final[i]-0.5*ex.phi(x)))
		}
		errs = append(errs, e)
		cells = append(cells, mesh.Cells())
	}
	for j := 1; j < len(errs); j++ {
		p := math.Log2(errs[j-1] / errs[j])
		t.Logf("space: %3d -> %3d cells: max error %.3g -> %.3g, observed order %.3f", cells[j-1], cells[j], errs[j-1], errs[j], p)
		if p < 1.8 {
			t.Errorf("observed spatial order %.3f < 1.8", p)
		}
	}
}

func TestObservedOrderTime(t *testing.T) {
	// Fixed mesh; the exact solution of the semi-discrete system
	// M dT/dt = -A T + b(t) is built from the eigen-decomposition of
	// M^-1/2 A M^-1/2 (gonum mat.EigenSym, a general-purpose reference
	// library) with the surface forcing T_env = sin(w t) integrated mode by
	// mode: int_0^t exp(-l (t-s)) sin(w s) ds = (l sin wt - w cos wt +
	// w exp(-l t)) / (l^2 + w^2). Halving the step must divide the error by
	// about 4.
	l1 := Layer{Name: "a", Thickness: 0.1, Conductivity: 1.0, HeatCapacity: 1e6}
	l2 := Layer{Name: "b", Thickness: 0.2, Conductivity: 0.2, HeatCapacity: 1.5e6}
	ex := newFvtComposite(l1, l2)
	col := Column{Layers: []Layer{l1, l2}}
	mesh, err := NewMesh(col, MeshOptions{SurfaceCell: 0.01, Growth: 1.3})
	if err != nil {
		t.Fatal(err)
	}
	n := mesh.Cells()
	rout := 0.05
	// Independent assembly of M and A.
	capa := make([]float64, n)
	kAt := func(i int) float64 { return col.Layers[mesh.Layer[i]].Conductivity }
	for i := range capa {
		capa[i] = mesh.Width(i) * col.Layers[mesh.Layer[i]].HeatCapacity
	}
	A := mat.NewSymDense(n, nil)
	for i := 0; i+1 < n; i++ {
		g := 1 / (mesh.Width(i)/(2*kAt(i)) + mesh.Width(i+1)/(2*kAt(i+1)))
		A.SetSym(i, i, A.At(i, i)+g)
		A.SetSym(i+1, i+1, A.At(i+1, i+1)+g)
		A.SetSym(i, i+1, -g)
	}
	gOut := 1 / (rout + mesh.Width(0)/(2*kAt(0)))
	A.SetSym(0, 0, A.At(0, 0)+gOut)
	S := mat.NewSymDense(n, nil)
	for i := 0; i < n; i++ {
		for j := i; j < n; j++ {
			S.SetSym(i, j, A.At(i, j)/math.Sqrt(capa[i]*capa[j]))
		}
	}
	var eig mat.EigenSym
	if !eig.Factorize(S, true) {
		t.Fatal("eigen-decomposition failed")
	}
	lam := eig.Values(nil)
	var V mat.Dense
	eig.VectorsTo(&V)
	w := 2 * math.Pi / 40000
	tEnd := math.Ln2 / ex.mu
	exact := func(t float64) []float64 {
		// y = M^1/2 T; y' = -S y + M^-1/2 b(t), b = e0 gOut sin(w t).
		y0 := make([]float64, n)
		for i, x := range mesh.Centers {
			y0[i] = math.Sqrt(capa[i]) * ex.phi(x)
		}
		out := make([]float64, n)
		for k := 0; k < n; k++ {
			var c0 float64
			for i := 0; i < n; i++ {
				c0 += V.At(i, k) * y0[i]
			}
			l := lam[k]
			ck := c0*math.Exp(-l*t) + V.At(0, k)*gOut/math.Sqrt(capa[0])*
				(l*math.Sin(w*t)-w*math.Cos(w*t)+w*math.Exp(-l*t))/(l*l+w*w)
			for i := 0; i < n; i++ {
				out[i] += V.At(i, k) * ck
			}
		}
		for i := range out {
			out[i] /= math.Sqrt(capa[i])
		}
		return out
	}
	want := exact(tEnd)
	var errs []float64
	steps := []int{10, 20, 40, 80}
	for _, ns := range steps {
		res, err := Simulate(Problem{
			Column: col, Mesh: mesh,
			Outside:     Boundary{Kind: Environment, Resistance: rout, Temperature: func(t float64) float64 { return math.Sin(w * t) }},
			Inside:      Boundary{Kind: Adiabatic},
			InitialFunc: ex.phi,
			Duration:    tEnd, Step: tEnd / float64(ns),
		})
		if err != nil {
			t.Fatal(err)
		}
		e := 0.0
		for i := range want {
			e = math.Max(e, math.Abs(res.Final[i]-want[i]))
		}
		errs = append(errs, e)
	}
	for j := 1; j < len(errs); j++ {
		p := math.Log2(errs[j-1] / errs[j])
		t.Logf("time: %d -> %d steps: max error %.3g -> %.3g, observed order %.3f", steps[j-1], steps[j], errs[j-1], errs[j], p)
		if p < 1.8 {
			t.Errorf("observed time order %.3f < 1.8", p)
		}
	}
}

func TestSimulatePeriodicHalfSpace(t *testing.T) {
	// Periodic surface temperature on a homogeneous half-space: amplitude
	// ratio exp(-z/d) and lag z/d P/(2 pi), d = sqrt(a P/pi) (Kusuda
	// and Achenbach 1965 form [memory], checked against
	// the heat equation [derived]). Start from the exact periodic state,
	// default mesh, run two periods and fit the first harmonic of the last
	// period by least squares. Amplitudes within 0.5 %.
	soil := Layer{Name: "sand", Thickness: 1, Conductivity: 0.24, HeatCapacity: 0.24 / 0.19e-6} // Moene and van Dam Table 2.2 dry sand [2nd-hand]
	P := 86400.0
	a := soil.Diffusivity()
	d := math.Sqrt(a * P / math.Pi)
	soil.Thickness = 12 * d
	col := Column{Layers: []Layer{soil}, HalfSpace: true}
	w := 2 * math.Pi / P
	exact := func(z, t float64) float64 { return 5 + 8*math.Exp(-z/d)*math.Cos(w*t-z/d) }
	depths := []float64{0.5 * d, d, 2 * d}
	for _, step := range []float64{3600, 900} {
		res, err := Simulate(Problem{
			Column:      col,
			Outside:     Boundary{Kind: Environment, Temperature: func(t float64) float64 { return exact(0, t) }},
			Inside:      Boundary{Kind: Adiabatic},
			InitialFunc: func(z float64) float64 { return exact(z, 0) },
			Duration:    2 * P, Step: step, Probes: depths,
		})
		if err != nil {
			t.Fatal(err)
		}
		for j, z := range depths {
			amp, lag := fvtHarmonic(res.Times, res.Probe[j], P, P)
			wantAmp, wantLag := 8*math.Exp(-z/d), z/d*P/(2*math.Pi)
			t.Logf("step %4.0f s, z = %.2f d: amplitude ratio %.5f (exact %.5f, %+.3f %%), lag %.4f h (exact %.4f)",
				step, z/d, amp/8, wantAmp/8, 100*(amp/wantAmp-1), lag/3600, wantLag/3600)
			if math.Abs(amp/wantAmp-1) > 0.005 {
				t.Errorf("step %g s, z = %g m: amplitude %g, want %g", step, z, amp, wantAmp)
			}
			if math.Abs(lag-wantLag) > 0.05*3600 {
				t.Errorf("step %g s, z = %g m: lag %g h, want %g h", step, z, lag/3600, wantLag/3600)
			}
		}
	}
}

// fvtHarmonic fits mean + A cos(w t - phi) by least squares to the samples
// with from <= t <= from + period (dropping the duplicate end point) and
// returns A and the lag phi/w in [0, period).
func fvtHarmonic(times, v []float64, period, from float64) (amp, lag float64) {
	w := 2 * math.Pi / period
	var c, s float64
	var n int
	for k, t := range times {
		if t < from-1e-6 || t >= from+period-1e-6 {
			continue
		}
		c += v[k] * math.Cos(w*t)
		s += v[k] * math.Sin(w*t)
		n++
	}
	c, s = 2*c/float64(n), 2*s/float64(n)
	amp = math.Hypot(c, s)
	lag = math.Mod(math.Atan2(s, c)/w+period, period)
	return amp, lag
}

func TestSpinUpSlab(t *testing.T) {
	// A slab with an adiabatic back and a periodic surface temperature
	// spun up from a uniform state must reach the exact periodic solution
	// theta(x) = A cosh(k (D - x)) / cosh(k D), k = (1+i)/d, d = sqrt(a P/pi)
	// (Carslaw and Jaeger section 2.6 [derived from the heat equation]),
	// within 0.5 % of the amplitude.
	l := Layer{Name: "brick", Thickness: 0.2, Conductivity: 0.77, HeatCapacity: 1.7e6}
	P := 86400.0
	d := math.Sqrt(l.Diffusivity() * P / math.Pi)
	col := Column{Layers: []Layer{l}}
	mesh, err := NewMesh(col, MeshOptions{})
	if err != nil {
		t.Fatal(err)
	}
	w := 2 * math.Pi / P
	p := Problem{
		Column: col, Mesh: mesh,
		Outside:     Boundary{Kind: Environment, Temperature: func(t float64) float64 { return 20 + 10*math.Cos(w*t) }},
		Inside:      Boundary{Kind: Adiabatic},
		InitialFunc: func(float64) float64 { return 0 },
		Step:        900,
	}
	init, cycles, err := SpinUp(p, P, 1e-4, 100)
	if err != nil {
		t.Fatal(err)
	}
	k := complex(1, 1) / complex(d, 0)
	maxErr := 0.0
	for i, x := range mesh.Centers {
		th := cmplx.Cosh(k*complex(l.Thickness-x, 0)) / cmplx.Cosh(k*complex(l.Thickness, 0))
		want := 20 + 10*real(th)
		maxErr = math.Max(maxErr, math.Abs(init[i]-want))
	}
	t.Logf("spin-up: %d cycles, max deviation from the exact periodic state %.4f K (amplitude 10 K)", cycles, maxErr)
	if maxErr > 0.05 {
		t.Errorf("periodic state off by %g K", maxErr)
	}
	if cycles < 2 {
		t.Errorf("spin-up converged in %d cycle from a uniform state: tolerance not checked", cycles)
	}
	if _, _, err := SpinUp(p, P, 1e-12, 2); err == nil {
		t.Error("unreachable tolerance: no error")
	}
}
