package ground

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"tempstack/climate"
)

// SensorRecord is a temperature log from sensors buried at two or more
// depths under the same surface (or built into a wall at two or more
// distances from one face), all read at the same times.
type SensorRecord struct {
	Times  []float64   // s, strictly increasing, shared by every sensor
	Depths []float64   // m below the surface (>= 0), strictly increasing
	Temps  [][]float64 // degC, Temps[i][k] at Depths[i] and Times[k]
}

// RecordFromSeries builds a SensorRecord from the columns of a measured
// series (climate.ReadCSV: temperatures already in degC, short holes
// bridged), one column per sensor, listed with their depths (m, from the
// shallowest down). The slices are copied.
func RecordFromSeries(s *climate.Series, columns []string, depths []float64) (SensorRecord, error) {
	if s == nil {
		return SensorRecord{}, errors.New("diffusivity fit: no series")
	}
	if len(columns) != len(depths) {
		return SensorRecord{}, fmt.Errorf("diffusivity fit: %d columns but %d depths", len(columns), len(depths))
	}
	rec := SensorRecord{Times: append([]float64(nil), s.T...), Depths: append([]float64(nil), depths...)}
	for _, c := range columns {
		v, err := s.Value(c)
		if err != nil {
			return SensorRecord{}, err
		}
		rec.Temps = append(rec.Temps, append([]float64(nil), v...))
	}
	return rec, rec.validate()
}

// BottomCondition selects how the numerical inversion of FitDiffusivity
// closes its model column at the bottom.
type BottomCondition int

const (
	// BottomAuto uses BottomSensor with three or more sensors and
	// BottomAdiabatic with two.
	BottomAuto BottomCondition = iota
	// BottomSensor prescribes the measured temperature of the deepest
	// sensor at the bottom of the column and fits the sensors between
	// the shallowest and the deepest. No assumption is made about the
	// soil below the deepest sensor (its mean temperature, a geothermal
	// gradient, layering) and the start-up error dies out in days. Needs
	// three or more sensors. The recommended choice.
	BottomSensor
	// BottomAdiabatic extends the column DeepFactor damping depths (of
	// the longest period or of the record length, whichever is longer)
	// below the deepest sensor, closes it with no heat flow there and fits
	// every sensor below the shallowest. It assumes the soil below the
	// deepest sensor is the same soil with no mean gradient, and it must
	// guess the temperature down there at the start (the deepest sensor's
	// fitted mean and harmonics continued downward), so it needs a record
	// that covers the slowest wave in the data: a whole year of soil
	// temperatures with the annual period among the fitted ones. On a
	// shorter record the unknown deep temperature biases the fit (a
	// synthetic 30-day winter record with four sensors gave 0.38 times
	// the true value, RMS 0.66 K): use BottomSensor.
	// The only choice with two sensors.
	BottomAdiabatic
)

// String returns the name of the condition.
func (b BottomCondition) String() string {
	switch b {
	case BottomAuto:
		return "auto"
	case BottomSensor:
		return "deepest-sensor"
	case BottomAdiabatic:
		return "adiabatic"
	}
	return fmt.Sprintf("BottomCondition(%d)", int(b))
}

// FitOptions controls FitDiffusivity. Only Periods is required.
type FitOptions struct {
	// Periods are the periods of the harmonics fitted to every sensor
	// (s): for example climate.Year and climate.Day. The record must cover
	// each period at least once.
	Periods []float64

	// SkipInversion returns the harmonic estimates only.
	SkipInversion bool

	// Bottom closes the model column of the inversion (see
	// BottomCondition). The zero value is BottomAuto.
	Bottom BottomCondition

	// Discard is the spin-up window at the start of the record that the
	// inversion simulates but leaves out of the misfit, s. 0 means six
	// times the slowest decay time L^2 / (pi^2 a) of the column between
	// the shallowest and the deepest sensor (L their distance, a the
	// harmonic estimate): the error of the linearly interpolated starting
	// profile then falls below 0.3 % of its initial size.
	Discard float64

	// Step is the time step of the simulation, s. 0 means the median
	// spacing of the record, divided evenly into steps of at most a 48th
	// of the shortest period.
	Step float64

	// CellsPerDepth is the number of cells per periodic penetration
	// depth sqrt(a P / pi) of the shortest period (a the harmonic
	// estimate), 0 means 10. The cells are also at most a fortieth of the
	// distance between the outer sensors and a quarter of the closest
	// sensor spacing.
	CellsPerDepth float64

	// DeepFactor is the depth of the adiabatic bottom below the deepest
	// sensor, for BottomAdiabatic, in damping depths sqrt(a P / pi) with
	// P the longest period or the record length, whichever is longer.
	// 0 means 5 (a wave reflected there comes back weaker by exp(-10)).
	DeepFactor float64

	// Tolerance is the relative precision to which the inversion locates
	// the best diffusivity. 0 means 1e-4.
	Tolerance float64

	// ProfileInterval replaces the Gauss-Newton 95 % interval of the
	// inversion by the profile-likelihood interval (about 4 to 8 more
	// simulations).
	ProfileInterval bool
}

// PairEstimate is the diffusivity read from the harmonic of one period at
// two sensors, by the amplitude and the phase methods
// (DiffusivityFromHarmonics).
//
// Standard errors follow from the residual RMS of the harmonic fits: for N
// samples spread over whole periods each cosine and sine coefficient has
// the standard error s = RMS sqrt(2/N), the amplitude s and the phase
// s/A rad; both methods then give a relative standard error of
// 2 sqrt((s1/A1)^2 + (s2/A2)^2) / ln(A1/A2) (the phase lag in radians
// equals ln(A1/A2) in a homogeneous soil). Weather that no harmonic
// describes is autocorrelated, so these errors are optimistic; they serve
// to weight and to screen the estimates.
type PairEstimate struct {
	Period         float64 // s
	Upper, Lower   int     // sensor indices, Upper shallower
	DepthUpper     float64 // m
	DepthLower     float64 // m
	AmplitudeUpper float64 // K, fitted harmonic amplitude at DepthUpper
	AmplitudeLower float64 // K, fitted harmonic amplitude at DepthLower
	Ratio          float64 // AmplitudeUpper / AmplitudeLower
	// Lag is the time by which the lower wave trails the upper one, s.
	// It is unwrapped: when the wave takes more than a period to travel
	// between the sensors, the whole number of periods closest to the
	// amplitude method's prediction (phase lag ln(Ratio) rad) is added.
	Lag   float64
	Turns int // whole periods added to the measured lag

	Amplitude       float64 // m2/s, amplitude method
	AmplitudeStdErr float64 // m2/s
	Phase           float64 // m2/s, phase method
	PhaseStdErr     float64 // m2/s

	// Usable is false when either amplitude is within 3 standard errors
	// of zero (the harmonic is lost in the noise at that depth) or the
	// two differ by less than their noise (ln(A1/A2) between -3 and +2
	// standard errors: decay not measurable); Note says why. Unusable
	// pairs do not enter the combined value. An amplitude that clearly
	// grows with depth is an error of FitDiffusivity.
	Usable bool
	Note   string
}

// InversionEstimate is the diffusivity of a homogeneous model column that
// reproduces the measured series best (see FitDiffusivity).
type InversionEstimate struct {
	Diffusivity float64 // m2/s
	// StdErr is the standard error of Diffusivity from the Gauss-Newton
	// linearisation: var(ln a) = s^2 / (J^T J) with s^2 the residual
	// variance and J the derivative of the modelled series with respect
	// to ln a (central differences). It assumes independent residuals:
	// with autocorrelated misfit (weather the model misses, sensor drift)
	// it is optimistic: see StdErrAR1.
	StdErr float64
	// StdErrAR1 widens StdErr for residuals correlated from one reading
	// to the next, modelled as AR(1): with rho the lag-1 autocorrelation
	// of the residuals (Autocorrelation), errors of covariance
	// s^2 rho^|k| at lag k give least squares the variance
	// s^2 / (J^T J) [1 + 2 sum_k rho^k sum_t J_t J_(t+k) / (J^T J)]
	// [derived]. For a derivative J that varies slowly this tends to the
	// effective sample size N (1 - rho) / (1 + rho) (Bretherton et al.
	// 1999, J. Climate 12:1990, from memory); for a daily wave read
	// hourly it is smaller. It equals StdErr when rho <= 0. Quote this one
	// for field data.
	StdErrAR1       float64
	Autocorrelation float64 // lag-1 autocorrelation of the residuals, capped at 0.99
	// Low and High bound the 95 % interval of the diffusivity, m2/s:
	// exp(ln a -+ 1.96 StdErrAR1/a) (Gauss-Newton, symmetric in ln a),
	// or with FitOptions.ProfileInterval (then Profile is true) the
	// profile-likelihood interval: the values of a at which
	// N ln(S(a)/S_min) / F = 3.841 (the 95 % chi-square quantile with one
	// degree of freedom; S the misfit, F = (StdErrAR1/StdErr)^2 the
	// variance factor of autocorrelated residuals).
	Low, High float64
	Profile   bool
	RMS       float64 // K, root mean square residual over the fitted samples

	// Modelled holds the simulated temperature (degC) at every sensor
	// and record time for the best diffusivity (the simulation is sampled
	// at the record's median spacing and interpolated linearly to the
	// record times); the prescribed sensors repeat their data. Samples
	// before FirstFitted lie in the spin-up window.
	Modelled    [][]float64
	Fitted      []bool  // sensors whose misfit was minimised
	FirstFitted int     // index of the first record time in the misfit
	Samples     int     // residuals in the misfit
	Discard     float64 // s, spin-up window used

	Bottom      BottomCondition // as used (never BottomAuto)
	ColumnDepth float64         // m, depth of the model column's bottom below the surface
	Cells       int             // finite-volume cells
	Step        float64         // s, time step
	Evaluations int             // simulations run
}

// FitResult is the outcome of FitDiffusivity.
type FitResult struct {
	// Sensors holds the mean and harmonics fitted to each sensor
	// (climate.FitHarmonics), SensorFits their residuals.
	Sensors    []climate.Periodic
	SensorFits []climate.Fit

	// Harmonic lists every sensor pair for every period.
	Harmonic []PairEstimate
	// HarmonicCombined is the weighted mean of ln a over the usable
	// amplitude and phase estimates (weights 1 / relative variance), and
	// HarmonicStdErr its standard error treating them as independent
	// (they share sensors: take it as a lower bound), m2/s.
	HarmonicCombined float64
	HarmonicStdErr   float64

	Inversion InversionEstimate // zero when SkipInversion

	// Diffusivity is the recommended value, m2/s: the inversion, or the
	// harmonic combined value when the inversion was skipped.
	Diffusivity float64
}

// FitDiffusivity estimates the thermal diffusivity of the soil (or of a
// homogeneous wall) from temperatures logged at two or more depths, two
// ways.
//
// Harmonic methods: a mean and one harmonic per period of o.Periods are
// fitted to each sensor by least squares (climate.FitHarmonics), and every
// pair of sensors gives an amplitude and a phase estimate for every period
// (DiffusivityFromHarmonics: a = omega dz^2 / (2 ln^2(A1/A2)) and
// a = omega dz^2 / (2 dphi^2), Horton, Wierenga and Nielsen 1983, forms
// from memory). These assume a homogeneous half-space under a periodic
// surface.
//
// Inversion: the transient heat equation dT/dt = a d2T/dz2 is solved
// (solver.Simulate, finite volumes, TR-BDF2) on a homogeneous column from
// the shallowest sensor, whose measured series (a natural cubic spline
// in time) is imposed as the top temperature, down to the deepest sensor
// (BottomSensor, its series imposed) or to an adiabatic bottom far below it
// (BottomAdiabatic). With temperatures (or no flux) on both ends the
// conductivity and the heat capacity enter only through their ratio a, so
// a is the one parameter; a nominal heat capacity is used. The start
// profile interpolates the sensors linearly at the first record time
// (below the deepest sensor: its fitted mean and harmonics continued as
// damped waves), and the first o.Discard seconds are left out of the
// misfit. The misfit, the sum of squared differences between modelled and
// measured temperatures of the fitted sensors, is minimised over ln a:
// a scan by factors of two around the harmonic estimate brackets the
// minimum and Brent's method (golden section with parabolic steps; Brent
// 1973, Algorithms for Minimization without Derivatives, ch. 5) refines it.
// One parameter needs no gradient-based optimiser, and the bracket makes
// the search robust. The mesh is built for the starting value; when the
// result differs from it by more than 25 % the search is repeated on a mesh
// built for the result.
//
// Unlike the harmonic methods the inversion uses every sample, needs no
// periodic forcing, and is not misled by weather that no harmonic
// describes, so it is the recommended value.
//
// Errors: fewer than two sensors, depths not increasing, times not
// increasing, mismatched lengths, a NaN or infinite value, a record
// shorter than a period, an amplitude that does not decay with depth.
func FitDiffusivity(rec SensorRecord, o FitOptions) (FitResult, error) {
	if err := rec.validate(); err != nil {
		return FitResult{}, err
	}
	if err := o.validate(rec); err != nil {
		return FitResult{}, err
	}
	var res FitResult
	if err := res.harmonic(rec, o.Periods); err != nil {
		return FitResult{}, err
	}
	res.Diffusivity = res.HarmonicCombined
	if o.SkipInversion {
		return res, nil
	}
	inv, err := invert(rec, o, res)
	if err != nil {
		return res, err
	}
	res.Inversion = inv
	res.Diffusivity = inv.Diffusivity
	return res, nil
}

// validate checks the shape and values of a record.
func (rec SensorRecord) validate() error {
	n := len(rec.Depths)
	if n < 2 {
		return fmt.Errorf("diffusivity fit: need sensors at two or more depths, got %d", n)
	}
	if len(rec.Temps) != n {
		return fmt.Errorf("diffusivity fit: %d depths but %d temperature series", n, len(rec.Temps))
	}
	for i, z := range rec.Depths {
		if !finite(z) || z < 0 {
			return fmt.Errorf("diffusivity fit: sensor %d depth %g m must be a finite number >= 0", i+1, z)
		}
		if i > 0 && !(z > rec.Depths[i-1]) {
			return fmt.Errorf("diffusivity fit: depths must increase from the shallowest sensor down, but sensor %d is at %g m and sensor %d at %g m",
				i, rec.Depths[i-1], i+1, z)
		}
	}
	nt := len(rec.Times)
	if nt < 4 {
		return fmt.Errorf("diffusivity fit: need at least 4 readings, got %d", nt)
	}
	for k, t := range rec.Times {
		if !finite(t) {
			return fmt.Errorf("diffusivity fit: time %d is not a finite number", k+1)
		}
		if k > 0 && !(t > rec.Times[k-1]) {
			return fmt.Errorf("diffusivity fit: times must increase, but reading %d (%g s) does not come after reading %d (%g s)",
				k+1, t, k, rec.Times[k-1])
		}
	}
	for i, s := range rec.Temps {
		if len(s) != nt {
			return fmt.Errorf("diffusivity fit: sensor %d (%g m) has %d readings for %d times", i+1, rec.Depths[i], len(s), nt)
		}
		for k, v := range s {
			if !finite(v) {
				return fmt.Errorf("diffusivity fit: sensor %d (%g m) reading %d at t = %g s is %g: fill or cut gaps before fitting",
					i+1, rec.Depths[i], k+1, rec.Times[k], v)
			}
		}
	}
	return nil
}

// medianStep is the median spacing of increasing times.
func medianStep(t []float64) float64 {
	d := make([]float64, len(t)-1)
	for i := range d {
		d[i] = t[i+1] - t[i]
	}
	sort.Float64s(d)
	return d[len(d)/2]
}

// coverage is the time a record covers: its span plus one typical step
// (each reading stands for its interval, so 8760 hourly readings cover a
// year).
func (rec SensorRecord) coverage() float64 {
	t := rec.Times
	return t[len(t)-1] - t[0] + medianStep(t)
}

// validate checks o against the record.
func (o FitOptions) validate(rec SensorRecord) error {
	if len(o.Periods) == 0 {
		return errors.New("diffusivity fit: name at least one period to fit (for example a year or a day)")
	}
	cover := rec.coverage()
	for i, p := range o.Periods {
		if !finite(p) || p <= 0 {
			return fmt.Errorf("diffusivity fit: period %d is %g s, want > 0", i+1, p)
		}
		if cover < p*(1-1e-9) {
			return fmt.Errorf("diffusivity fit: the record covers %.4g days, shorter than the period of %.4g days: log at least one whole period",
				cover/climate.Day, p/climate.Day)
		}
	}
	bad := func(v float64) bool { return !finite(v) || v < 0 }
	switch {
	case o.Bottom < BottomAuto || o.Bottom > BottomAdiabatic:
		return fmt.Errorf("diffusivity fit: unknown bottom condition %d", int(o.Bottom))
	case o.Bottom == BottomSensor && len(rec.Depths) < 3:
		return errors.New("diffusivity fit: a prescribed deepest sensor needs three or more sensors (one to fit between the two prescribed)")
	case bad(o.Discard) || bad(o.Step) || bad(o.CellsPerDepth) || bad(o.DeepFactor) || bad(o.Tolerance):
		return errors.New("diffusivity fit: discard, step, cells per depth, deep factor and tolerance must be finite and not negative")
	case o.Tolerance >= 0.1:
		return fmt.Errorf("diffusivity fit: tolerance %g is too loose (want < 0.1)", o.Tolerance)
	}
	return nil
}

// harmonic fills the harmonic part of res.
func (res *FitResult) harmonic(rec SensorRecord, periods []float64) error {
	n := len(rec.Depths)
	nt := float64(len(rec.Times))
	res.Sensors = make([]climate.Periodic, n)
	res.SensorFits = make([]climate.Fit, n)
	for i := range rec.Depths {
		p, f, err := climate.FitHarmonics(rec.Times, rec.Temps[i], periods)
		if err != nil {
			return fmt.Errorf("diffusivity fit: sensor %d (%g m): %w", i+1, rec.Depths[i], err)
		}
		res.Sensors[i], res.SensorFits[i] = p, f
	}
	// Standard error of a cosine or sine coefficient: RMS sqrt(2/N)
	// (least squares over whole periods, the columns nearly orthogonal).
	se := func(i int) float64 { return res.SensorFits[i].RMS * math.Sqrt(2/nt) }
	const floor = 1e-12 // relative error floor for noise-free data
	var sw, swl float64
	first := "" // first reason a pair was left out
	for k, per := range periods {
		for i := 0; i < n; i++ {
			for j := i + 1; j < n; j++ {
				h1, h2 := res.Sensors[i].Harmonics[k], res.Sensors[j].Harmonics[k]
				s1, s2 := se(i), se(j)
				pe := PairEstimate{
					Period: per, Upper: i, Lower: j,
					DepthUpper: rec.Depths[i], DepthLower: rec.Depths[j],
					AmplitudeUpper: h1.Amplitude, AmplitudeLower: h2.Amplitude,
				}
				if h2.Amplitude > 0 {
					pe.Ratio = h1.Amplitude / h2.Amplitude
				}
				if h2.Amplitude <= 3*s2 || h1.Amplitude <= 3*s1 {
					pe.Note = fmt.Sprintf("the %s harmonic is within 3 standard errors (%.2g K) of zero at %g m: lost in the noise",
						periodName(per), 3*math.Max(s1, s2), pickDepth(h1.Amplitude <= 3*s1, rec.Depths[i], rec.Depths[j]))
					if first == "" {
						first = pe.Note
					}
					res.Harmonic = append(res.Harmonic, pe)
					continue
				}
				// Relative standard error of ln(A1/A2) (and of the phase
				// difference, rad).
				rel := math.Hypot(s1/h1.Amplitude, s2/h2.Amplitude)
				if lnr := math.Log(pe.Ratio); lnr <= 2*rel && lnr >= -3*rel {
					// Within the noise of no decay: not measurable, and
					// not proof of growth either.
					pe.Note = fmt.Sprintf("the %s amplitudes at %g and %g m differ by less than their noise (ratio %.4g): decay not measurable",
						periodName(per), rec.Depths[i], rec.Depths[j], pe.Ratio)
					if first == "" {
						first = pe.Note
					}
					res.Harmonic = append(res.Harmonic, pe)
					continue
				}
				d, err := DiffusivityFromHarmonics(rec.Depths[i], h1, rec.Depths[j], h2)
				if err != nil {
					if h1.Amplitude <= h2.Amplitude {
						return fmt.Errorf("diffusivity fit: the %s amplitude does not decay with depth: %.3g K at %g m but %.3g K at %g m (ratio %.3g <= 1); "+
							"a wave driven from the surface must weaken downward: check the depths, the sensor order and the units",
							periodName(per), h1.Amplitude, rec.Depths[i], h2.Amplitude, rec.Depths[j], pe.Ratio)
					}
					return fmt.Errorf("diffusivity fit: sensors %d and %d, %s harmonic: %w", i+1, j+1, periodName(per), err)
				}
				// Unwrap the lag: in a homogeneous soil the phase lag in
				// radians equals ln(A1/A2) (Wave); add the whole
				// number of periods that brings it closest.
				w := 2 * math.Pi / per
				lnr := math.Log(d.Ratio)
				dphi := w * d.Lag
				turns := math.Round((lnr - dphi) / (2 * math.Pi))
				if turns < 0 {
					turns = 0
				}
				dphi += 2 * math.Pi * turns
				dz := rec.Depths[j] - rec.Depths[i]
				pe.Lag = dphi / w
				pe.Turns = int(turns)
				pe.Amplitude = d.Amplitude
				pe.Phase = w * dz * dz / (2 * dphi * dphi)
				relA := math.Max(2*rel/lnr, floor)
				relP := math.Max(2*rel/dphi, floor)
				pe.AmplitudeStdErr = relA * pe.Amplitude
				pe.PhaseStdErr = relP * pe.Phase
				pe.Usable = true
				if pe.Turns > 0 {
					pe.Note = fmt.Sprintf("phase unwrapped by %d period(s) using the amplitude estimate", pe.Turns)
				}
				res.Harmonic = append(res.Harmonic, pe)
				for _, e := range [][2]float64{{pe.Amplitude, relA}, {pe.Phase, relP}} {
					wt := 1 / (e[1] * e[1])
					sw += wt
					swl += wt * math.Log(e[0])
				}
			}
		}
	}
	if sw == 0 {
		return fmt.Errorf("diffusivity fit: no sensor pair gives a usable estimate (%s): fit a period that reaches the sensors (the annual wave for deep sensors)", first)
	}
	res.HarmonicCombined = math.Exp(swl / sw)
	res.HarmonicStdErr = res.HarmonicCombined / math.Sqrt(sw)
	return nil
}

func pickDepth(first bool, a, b float64) float64 {
	if first {
		return a
	}
	return b
}

// periodName names a period for messages: "annual", "daily" or "12 h".
func periodName(p float64) string {
	switch p {
	case climate.Year:
		return "annual"
	case climate.Day:
		return "daily"
	}
	if p >= 2*climate.Day {
		return fmt.Sprintf("%.4g-day", p/climate.Day)
	}
	return fmt.Sprintf("%.4g-hour", p/3600)
}
