package ground

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/gonum/interp"

	"tempstack/climate"
	"tempstack/solver"
)

// nominalHeatCapacity is the volumetric heat capacity given to the model
// column of the inversion, J/(m3 K). With a temperature (or no flux) on
// both ends only the diffusivity k/C matters, so any value will do.
const nominalHeatCapacity = 2e6

// Search limits of the inversion, m2/s. Solids conduct heat with
// diffusivities from about 1e-7 (dry peat, insulation) to 1.2e-4 (copper)
// [memory]; the limits lie beyond both.
const (
	minFitDiffusivity = 1e-9
	maxFitDiffusivity = 1e-3
)

// lerpSeries returns the linear interpolation of v(t) (t increasing),
// held constant outside the record.
func lerpSeries(t, v []float64) func(float64) float64 {
	n := len(t)
	return func(x float64) float64 {
		if x <= t[0] {
			return v[0]
		}
		if x >= t[n-1] {
			return v[n-1]
		}
		j := sort.SearchFloat64s(t, x) // t[j-1] < x <= t[j]
		w := (x - t[j-1]) / (t[j] - t[j-1])
		return v[j-1] + w*(v[j]-v[j-1])
	}
}

// splineSeries returns the natural cubic spline through v(t) (t strictly
// increasing, at least 3 points), held constant outside the record.
// Linear interpolation would damp a sampled harmonic by sinc^2(omega dt/2),
// about (omega dt)^2 / 12: 0.6 % for a daily wave read hourly [derived],
// enough to bias the diffusivity by about 1 %; the spline's error is of
// fourth order in omega dt.
func splineSeries(t, v []float64) (func(float64) float64, error) {
	var s interp.NaturalCubic
	if err := s.Fit(t, v); err != nil {
		return nil, fmt.Errorf("diffusivity fit: interpolating a boundary series: %w", err)
	}
	return s.Predict, nil
}

// invModel is the forward model of the inversion for one mesh.
type invModel struct {
	rec    SensorRecord
	fits   []climate.Periodic
	bottom BottomCondition
	xs     []float64 // sensor positions below the shallowest sensor, m
	fitted []bool
	first  int     // first record index in the misfit
	step   float64 // s, time step
	every  float64 // s, sample spacing, a whole number of steps
	length float64 // distance between the outer sensors, m
	total  float64 // column thickness, m
	mesh   *solver.Mesh
	top    func(float64) float64
	bot    func(float64) float64
	evals  int

	bestU     float64
	bestS     float64
	bestRes   []float64
	bestModel [][]float64
}

// newInvModel builds the model column and mesh for the design diffusivity
// ad (m2/s).
func newInvModel(rec SensorRecord, o FitOptions, fits []climate.Periodic, ad float64) (*invModel, error) {
	n := len(rec.Depths)
	m := &invModel{rec: rec, fits: fits, bottom: o.Bottom, bestS: math.Inf(1)}
	if m.bottom == BottomAuto {
		m.bottom = BottomSensor
		if n < 3 {
			m.bottom = BottomAdiabatic
		}
	}
	m.xs = make([]float64, n)
	m.fitted = make([]bool, n)
	minGap := math.Inf(1)
	for i, z := range rec.Depths {
		m.xs[i] = z - rec.Depths[0]
		m.fitted[i] = i > 0 && (i < n-1 || m.bottom == BottomAdiabatic)
		if i > 0 {
			minGap = math.Min(minGap, m.xs[i]-m.xs[i-1])
		}
	}
	m.length = m.xs[n-1]
	pmin, pmax := math.Inf(1), 0.0
	for _, p := range o.Periods {
		pmin, pmax = math.Min(pmin, p), math.Max(pmax, p)
	}
	// Time step: the record's spacing, divided evenly into steps of at
	// most a 48th of the shortest period. TR-BDF2 is second order: on the
	// noise-free synthetic records of fit_test.go hourly steps biased a
	// daily fit by about 0.4 %, quarter-hour steps by 0.1 %. The model is
	// sampled at the record's spacing (a whole number of steps).
	spacing := medianStep(rec.Times)
	m.step = o.Step
	if m.step == 0 {
		m.step = spacing / math.Ceil(spacing/(pmin/48)-1e-9)
	}
	m.every = m.step * math.Max(1, math.Round(spacing/m.step))

	// Spin-up window: six decay times of the slowest mode of the column
	// between the outer sensors. A slab of thickness L with fixed end
	// temperatures forgets its start profile as the Fourier modes
	// sin(k pi x / L) exp(-k^2 pi^2 a t / L^2) decay [derived from the heat
	// equation]: tau = L^2 / (pi^2 a), exp(-6) = 0.25 % after 6 tau.
	t0 := rec.Times[0]
	cover := rec.coverage()
	discard := o.Discard
	if discard == 0 {
		discard = 6 * m.length * m.length / (math.Pi * math.Pi * ad)
		if discard > cover/2 {
			return nil, fmt.Errorf("diffusivity fit: the record (%.4g days) is too short for the inversion: the start-up error of the model takes about %.3g days to die out; log longer, or set a shorter Discard",
				cover/climate.Day, discard/climate.Day)
		}
	}
	if discard >= cover-2*m.step {
		return nil, fmt.Errorf("diffusivity fit: the spin-up window of %.4g days leaves nothing of the %.4g-day record to fit", discard/climate.Day, cover/climate.Day)
	}
	m.first = sort.SearchFloat64s(rec.Times, t0+discard)

	// Uniform cells between the outer sensors: CellsPerDepth per periodic
	// penetration depth sqrt(a P / pi) of the shortest period (the periodic
	// penetration depth of ISO 13786 [memory]), at most L/40 and a quarter of the closest
	// sensor spacing.
	cpd := o.CellsPerDepth
	if cpd == 0 {
		cpd = 10
	}
	h := math.Min(math.Sqrt(ad*pmin/math.Pi)/cpd, math.Min(m.length/40, minGap/4))
	nc := int(math.Ceil(m.length/h - 1e-9))
	faces := make([]float64, nc+1)
	for i := range faces {
		faces[i] = m.length * float64(i) / float64(nc)
	}
	faces[nc] = m.length
	m.total = m.length
	if m.bottom == BottomAdiabatic {
		// Below the deepest sensor cells grow by 15 % per cell down to
		// DeepFactor damping depths of the longest period or of the
		// record, whichever is longer (a record shorter than a year still
		// carries the annual wave as a trend).
		deep := o.DeepFactor
		if deep == 0 {
			deep = 5
		}
		m.total = m.length + deep*math.Sqrt(ad*math.Max(pmax, cover)/math.Pi)
		w := m.length / float64(nc)
		x := m.length
		for {
			w *= 1.15
			if x+1.5*w >= m.total {
				break
			}
			x += w
			faces = append(faces, x)
		}
		faces = append(faces, m.total)
	}
	mesh := &solver.Mesh{Faces: faces, Centers: make([]float64, len(faces)-1), Layer: make([]int, len(faces)-1), FaceResistance: make([]float64, len(faces))}
	for i := range mesh.Centers {
		mesh.Centers[i] = 0.5 * (faces[i] + faces[i+1])
	}
	m.mesh = mesh
	var err error
	if m.top, err = splineSeries(rec.Times, rec.Temps[0]); err != nil {
		return nil, err
	}
	if m.bot, err = splineSeries(rec.Times, rec.Temps[n-1]); err != nil {
		return nil, err
	}
	return m, nil
}

// initial returns the starting profile for diffusivity a: the sensors
// interpolated linearly at the first record time, and below the deepest
// sensor (adiabatic bottom) its fitted mean and harmonics continued
// downward as damped, lagging waves (Wave), with the part of its
// first reading that the harmonics miss damped over the shortest
// penetration depth.
func (m *invModel) initial(a float64) func(x float64) float64 {
	rec := m.rec
	n := len(rec.Depths)
	t0 := rec.Times[0]
	v := make([]float64, n)
	for i := range v {
		v[i] = rec.Temps[i][0]
	}
	inner := lerpSeries(m.xs, v)
	deep := m.fits[n-1]
	miss := v[n-1] - deep.At(t0)
	dmin := math.Inf(1)
	for _, h := range deep.Harmonics {
		dmin = math.Min(dmin, math.Sqrt(a*h.Period/math.Pi))
	}
	return func(x float64) float64 {
		if x <= m.length {
			return inner(x)
		}
		xi := x - m.length
		t := deep.Mean + miss*math.Exp(-xi/dmin)
		for _, h := range deep.Harmonics {
			// T = Mean + A exp(-xi/d) cos(omega (t - peak) - xi/d),
			// Kusuda and Achenbach (1965) form [memory].
			d := math.Sqrt(a * h.Period / math.Pi)
			t += h.Amplitude * math.Exp(-xi/d) * math.Cos(2*math.Pi*(t0-h.Peak)/h.Period-xi/d)
		}
		return t
	}
}

// simulate runs the model for diffusivity a and returns the modelled
// temperature of every sensor at the record times.
func (m *invModel) simulate(a float64) ([][]float64, error) {
	m.evals++
	rec := m.rec
	t0, t1 := rec.Times[0], rec.Times[len(rec.Times)-1]
	p := solver.Problem{
		Column: solver.Column{Layers: []solver.Layer{{
			Name: "fitted soil", Thickness: m.total,
			Conductivity: a * nominalHeatCapacity, HeatCapacity: nominalHeatCapacity,
		}}},
		Mesh:        m.mesh,
		Outside:     solver.Boundary{Kind: solver.Environment, Temperature: m.top},
		Inside:      solver.Boundary{Kind: solver.Adiabatic},
		InitialFunc: m.initial(a),
		Start:       t0,
		Duration:    t1 - t0,
		Step:        m.step,
		OutputStep:  m.every,
		Probes:      m.xs,
	}
	if m.bottom == BottomSensor {
		p.Inside = solver.Boundary{Kind: solver.Environment, Temperature: m.bot}
	}
	r, err := solver.Simulate(p)
	if err != nil {
		return nil, fmt.Errorf("diffusivity fit: simulation at a = %g m2/s: %w", a, err)
	}
	out := make([][]float64, len(m.xs))
	for j := range out {
		out[j] = make([]float64, len(rec.Times))
		f := lerpSeries(r.Times, r.Probe[j])
		for k, t := range rec.Times {
			out[j][k] = f(t)
		}
	}
	return out, nil
}

// residuals returns modelled minus measured temperatures of the fitted
// sensors after the spin-up window, and the modelled series.
func (m *invModel) residuals(a float64) ([]float64, [][]float64, error) {
	mod, err := m.simulate(a)
	if err != nil {
		return nil, nil, err
	}
	var r []float64
	for j, ok := range m.fitted {
		if !ok {
			continue
		}
		for k := m.first; k < len(m.rec.Times); k++ {
			r = append(r, mod[j][k]-m.rec.Temps[j][k])
		}
	}
	return r, mod, nil
}

// misfit is the sum of squared residuals at a = exp(u); it keeps the best
// model seen.
func (m *invModel) misfit(u float64) (float64, error) {
	r, mod, err := m.residuals(math.Exp(u))
	if err != nil {
		return 0, err
	}
	s := 0.0
	for _, v := range r {
		s += v * v
	}
	if s < m.bestS {
		m.bestU, m.bestS, m.bestRes, m.bestModel = u, s, r, mod
	}
	return s, nil
}

// search brackets the minimum of the misfit over u = ln a by a scan in
// steps of ln 2 around ln ad, then refines it by Brent's method to
// an absolute tolerance tol in u.
func (m *invModel) search(ad, tol float64) (float64, error) {
	var ferr error
	f := func(u float64) float64 {
		if ferr != nil {
			return math.Inf(1)
		}
		s, err := m.misfit(u)
		if err != nil {
			ferr = err
			return math.Inf(1)
		}
		return s
	}
	lo, hi := math.Log(minFitDiffusivity), math.Log(maxFitDiffusivity)
	step := math.Ln2
	u0 := math.Min(math.Max(math.Log(ad), lo+2*step), hi-2*step)
	us := []float64{u0 - 2*step, u0 - step, u0, u0 + step, u0 + 2*step}
	fs := make([]float64, len(us))
	for i, u := range us {
		fs[i] = f(u)
	}
	for ferr == nil {
		ib := 0
		for i := range fs {
			if fs[i] < fs[ib] {
				ib = i
			}
		}
		switch {
		case ib == 0 && us[0]-step >= lo:
			u := us[0] - step
			us = append([]float64{u}, us...)
			fs = append([]float64{f(u)}, fs...)
		case ib == len(us)-1 && us[ib]+step <= hi:
			u := us[ib] + step
			us = append(us, u)
			fs = append(fs, f(u))
		case ib == 0 || ib == len(us)-1:
			return 0, fmt.Errorf("diffusivity fit: the best fit lies at the search limit %.3g m2/s: the data do not look like heat conduction in one homogeneous material",
				math.Exp(us[ib]))
		default:
			u, _ := brentMin(f, us[ib-1], us[ib+1], tol, 100)
			if ferr != nil {
				return 0, ferr
			}
			return u, nil
		}
	}
	return 0, ferr
}

// invert runs the numerical inversion of FitDiffusivity.
func invert(rec SensorRecord, o FitOptions, hres FitResult) (InversionEstimate, error) {
	tol := o.Tolerance
	if tol == 0 {
		tol = 1e-4
	}
	utol := math.Log1p(tol)
	ad := hres.HarmonicCombined
	evals := 0
	var m *invModel
	var u float64
	for pass := 0; pass < 3; pass++ {
		var err error
		if m, err = newInvModel(rec, o, hres.Sensors, ad); err != nil {
			return InversionEstimate{}, err
		}
		u, err = m.search(ad, utol)
		evals += m.evals
		if err != nil {
			return InversionEstimate{}, err
		}
		u = m.bestU
		// Rebuild the mesh for the result when it is far from the design value.
		if math.Abs(u-math.Log(ad)) <= math.Log(1.25) {
			break
		}
		ad = math.Exp(u)
	}

	// Gauss-Newton standard error: J = dr/du by central differences.
	m.evals = 0
	const du = 1e-3
	rp, _, err := m.residuals(math.Exp(u + du))
	if err != nil {
		return InversionEstimate{}, err
	}
	rm, _, err := m.residuals(math.Exp(u - du))
	if err != nil {
		return InversionEstimate{}, err
	}
	evals += m.evals
	var jtj float64
	jac := make([]float64, len(rp))
	for i := range rp {
		jac[i] = (rp[i] - rm[i]) / (2 * du)
		jtj += jac[i] * jac[i]
	}
	nres := len(rp)
	a := math.Exp(u)
	est := InversionEstimate{
		Diffusivity: a,
		RMS:         math.Sqrt(m.bestS / float64(nres)),
		Modelled:    m.bestModel,
		Fitted:      m.fitted,
		FirstFitted: m.first,
		Samples:     nres,
		Discard:     rec.Times[m.first] - rec.Times[0],
		Bottom:      m.bottom,
		ColumnDepth: rec.Depths[0] + m.total,
		Cells:       m.mesh.Cells(),
		Step:        m.step,
		Evaluations: evals,
	}
	if !(jtj > 0) || nres < 2 {
		return est, errors.New("diffusivity fit: the modelled series do not depend on the diffusivity: nothing to fit")
	}
	est.StdErr = a * math.Sqrt(m.bestS/float64(nres-1)/jtj)
	// AR(1) misfit: rho is the lag-1 autocorrelation of the residuals
	// over pairs of readings within each sensor's series. For errors with
	// covariance s^2 rho^|k| at lag k the least-squares variance is the
	// sandwich (J^T J)^-1 J^T Sigma J (J^T J)^-1
	//   = s^2 / (J^T J) [1 + 2 sum_k rho^k sum_t J_t J_(t+k) / (J^T J)]
	// (generalised least-squares algebra [derived]).
	per := len(rec.Times) - m.first
	lagSum := func(u, v []float64, k int) float64 {
		var c float64
		for s := 0; s+per <= len(u); s += per { // each fitted sensor
			for t := s; t+k < s+per; t++ {
				c += u[t] * v[t+k]
			}
		}
		return c
	}
	rho := 0.0
	if m.bestS > 0 {
		rho = math.Min(lagSum(m.bestRes, m.bestRes, 1)/m.bestS, 0.99)
	}
	est.Autocorrelation = rho
	est.StdErrAR1 = est.StdErr
	if rho > 0 {
		f := 1.0
		for k, rk := 1, rho; k < per && rk > 1e-4; k, rk = k+1, rk*rho {
			f += 2 * rk * lagSum(jac, jac, k) / jtj
		}
		if f > 1 {
			est.StdErrAR1 = est.StdErr * math.Sqrt(f)
		}
	}

	// 95 % interval, symmetric in ln a: ln a -+ 1.96 StdErrAR1/a.
	su := est.StdErrAR1 / a
	est.Low, est.High = a*math.Exp(-1.96*su), a*math.Exp(1.96*su)
	if o.ProfileInterval {
		lo, hi, n, err := m.profile(u, su, est.StdErrAR1/est.StdErr, nres)
		est.Evaluations += n
		if err != nil {
			return est, err
		}
		est.Low, est.High, est.Profile = lo, hi, true
	}
	return est, nil
}

// chi2q95 is the 95 % quantile of the chi-square distribution with one
// degree of freedom (1.96^2; statistical tables).
const chi2q95 = 3.841458820694124

// profile returns the 95 % profile-likelihood interval of a around the
// best ln a = u: the two values of ln a where the likelihood-ratio
// statistic N ln(S(u)/S_min) / f reaches the chi-square quantile (f the
// variance factor of autocorrelated residuals, 1 for white ones). It
// starts from the Gauss-Newton half-width 1.96 su and solves each side by
// the Illinois variant of regula falsi. It returns the simulations run.
func (m *invModel) profile(u, su, widen float64, nres int) (lo, hi float64, evals int, err error) {
	smin := m.bestS
	f := widen * widen
	g := func(x float64) (float64, error) {
		evals++
		r, _, err := m.residuals(math.Exp(x))
		if err != nil {
			return 0, err
		}
		s := 0.0
		for _, v := range r {
			s += v * v
		}
		return float64(nres)*math.Log(s/smin)/f - chi2q95, nil
	}
	ends := [2]float64{}
	for i, side := range []float64{-1, 1} {
		d := 1.96 * su
		x0, g0 := 0.0, -chi2q95
		x1 := d
		var g1 float64
		for k := 0; ; k++ {
			if g1, err = g(u + side*x1); err != nil {
				return 0, 0, evals, err
			}
			if g1 > 0 {
				break
			}
			if k == 8 {
				return 0, 0, evals, fmt.Errorf("diffusivity fit: the profile likelihood stays flat to %.3g times the best diffusivity: the data hardly constrain it",
					math.Exp(side*x1))
			}
			x0, g0 = x1, g1
			x1 *= 1.6
		}
		// Illinois: [x0, x1] brackets the root, g0 < 0 < g1.
		for k := 0; k < 30 && math.Abs(g1) > 0.005*chi2q95; k++ {
			x2 := x1 - g1*(x1-x0)/(g1-g0)
			g2, err := g(u + side*x2)
			if err != nil {
				return 0, 0, evals, err
			}
			if g2*g1 < 0 {
				x0, g0 = x1, g1
			} else {
				g0 /= 2
			}
			x1, g1 = x2, g2
		}
		ends[i] = math.Exp(u + side*x1)
	}
	return ends[0], ends[1], evals, nil
}

// brentMin minimises f on [a, b] by Brent's method: golden-section steps
// safeguarding parabolic interpolation through the three best points
// (Brent 1973, Algorithms for Minimization without Derivatives, ch. 5).
// It stops when the bracket around the best point is within tol (absolute)
// or after maxIter evaluations, and returns the best point and its value.
func brentMin(f func(float64) float64, a, b, tol float64, maxIter int) (float64, float64) {
	const cgold = 0.3819660112501051 // (3 - sqrt 5) / 2
	x := a + cgold*(b-a)
	w, v := x, x
	fx := f(x)
	fw, fv := fx, fx
	var d, e float64
	for it := 0; it < maxIter; it++ {
		xm := 0.5 * (a + b)
		tol1 := tol/2 + 1e-12
		tol2 := 2 * tol1
		if math.Abs(x-xm) <= tol2-0.5*(b-a) {
			break
		}
		golden := true
		if math.Abs(e) > tol1 {
			// Parabola through x, w, v.
			r := (x - w) * (fx - fv)
			q := (x - v) * (fx - fw)
			p := (x-v)*q - (x-w)*r
			q = 2 * (q - r)
			if q > 0 {
				p = -p
			} else {
				q = -q
			}
			if math.Abs(p) < math.Abs(0.5*q*e) && p > q*(a-x) && p < q*(b-x) {
				e = d
				d = p / q
				golden = false
				if u := x + d; u-a < tol2 || b-u < tol2 {
					d = math.Copysign(tol1, xm-x)
				}
			}
		}
		if golden {
			if x >= xm {
				e = a - x
			} else {
				e = b - x
			}
			d = cgold * e
		}
		u := x + d
		if math.Abs(d) < tol1 {
			u = x + math.Copysign(tol1, d)
		}
		fu := f(u)
		if fu <= fx {
			if u >= x {
				a = x
			} else {
				b = x
			}
			v, fv, w, fw, x, fx = w, fw, x, fx, u, fu
		} else {
			if u < x {
				a = u
			} else {
				b = u
			}
			if fu <= fw || w == x {
				v, fv, w, fw = w, fw, u, fu
			} else if fu <= fv || v == x || v == w {
				v, fv = u, fu
			}
		}
	}
	return x, fx
}
