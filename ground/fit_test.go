package ground

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"tempstack/climate"
)

// synthWaves is the SYNTHETIC surface climate of the fit tests (invented):
// a mean of 9 degC, an annual swing of 11 K (coldest on day 20) and a
// daily swing of 4 K (coldest at 03:00), over a homogeneous half-space of
// diffusivity a (m2/s).
func synthWaves(a float64) []Wave {
	return []Wave{
		{Mean: 9, Amplitude: 11, Coldest: 20 * climate.Day, Period: climate.Year, Diffusivity: a},
		{Mean: 0, Amplitude: 4, Coldest: 3 * 3600, Period: climate.Day, Diffusivity: a},
	}
}

// synthRecord returns a SYNTHETIC record (invented data, for tests only):
// the exact periodic temperature under synthWaves(a) read at the given
// depths every hour for the given number of days, plus Gaussian noise of
// standard deviation sigma (K) from a seeded generator. Each harmonic is
// the closed form of Kusuda and Achenbach (1965) (Wave; form
// [memory], checked against the heat equation in
// TestGroundWaveHeatEquation [derived]); the heat equation is linear, so
// their sum is the exact periodic solution.
func synthRecord(a float64, depths []float64, days int, sigma float64, seed uint64) SensorRecord {
	return synthRecordOf(synthWaves(a), depths, days, sigma, 0, seed)
}

// synthRecordOf is synthRecord for any sum of ground waves (their means
// add up) and for noise correlated from one hour to the next: an AR(1)
// series e_k = phi e_(k-1) + sqrt(1 - phi^2) sigma xi_k of standard
// deviation sigma (phi 0: white noise).
func synthRecordOf(waves []Wave, depths []float64, days int, sigma, phi float64, seed uint64) SensorRecord {
	rng := rand.New(rand.NewPCG(seed, 1))
	n := days * 24
	rec := SensorRecord{Times: make([]float64, n), Depths: append([]float64(nil), depths...), Temps: make([][]float64, len(depths))}
	for k := range rec.Times {
		rec.Times[k] = float64(k) * 3600
	}
	for i, z := range depths {
		rec.Temps[i] = make([]float64, n)
		e := sigma * rng.NormFloat64()
		for k, t := range rec.Times {
			v := 0.0
			for _, w := range waves {
				v += w.Temperature(z, t)
			}
			if k > 0 {
				e = phi*e + math.Sqrt(1-phi*phi)*sigma*rng.NormFloat64()
			}
			rec.Temps[i][k] = v + e
		}
	}
	return rec
}

// relErr is |got/want - 1|.
func relErr(got, want float64) float64 { return math.Abs(got/want - 1) }

// TestFitDiffusivitySynthetic fits SYNTHETIC records generated from a
// known diffusivity with the exact periodic solution (synthRecord) back:
// the harmonic methods within 2 %, the inversion within 1 %. The
// diffusivities are those of wet clay, dry sand and rock in Moene and van
// Dam (2014), Transport in the Atmosphere-Vegetation-Soil Continuum,
// Table 2.2, after de Vries 1963 [2nd-hand];
// the noise of 0.05 K is an invented logger noise.
//
// Runtime on the shared 2-core machine: 2 to 4 s for the table; the
// one-year three-sensor case has 63 cells, 17520 half-hour steps and 15
// simulations (0.5 to 0.9 s), the 60-day case 0.1 s.
func TestFitDiffusivitySynthetic(t *testing.T) {
	const sigma = 0.05
	cases := []struct {
		name    string
		a       float64
		depths  []float64
		days    int
		periods []float64
		bottom  BottomCondition
	}{
		{"wet clay, one year, 3 sensors, deepest prescribed", 0.45e-6, []float64{0.1, 0.4, 0.8}, 365,
			[]float64{climate.Year, climate.Day}, BottomSensor},
		{"rock, one year, 2 sensors, adiabatic bottom", 1.4e-6, []float64{0.5, 1.5}, 365,
			[]float64{climate.Year}, BottomAuto},
		{"dry sand, 60 days, daily, 3 sensors", 0.19e-6, []float64{0.02, 0.08, 0.16}, 60,
			[]float64{climate.Day}, BottomAuto},
		{"wet clay, one year, 4 sensors, annual only, adiabatic bottom", 0.45e-6, []float64{0.1, 0.4, 0.8, 1.2}, 365,
			[]float64{climate.Year}, BottomAdiabatic},
	}
	for i, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			rec := synthRecord(c.a, c.depths, c.days, sigma, uint64(11+i))
			r, err := FitDiffusivity(rec, FitOptions{Periods: c.periods, Bottom: c.bottom})
			if err != nil {
				t.Fatal(err)
			}
			if e := relErr(r.HarmonicCombined, c.a); e > 0.02 {
				t.Errorf("harmonic combined %.4g m2/s, want %.4g within 2 %% (off %.2f %%)", r.HarmonicCombined, c.a, 100*e)
			}
			for _, p := range r.Harmonic {
				if !p.Usable {
					continue
				}
				// Every usable estimate within 2 % or 4 of its standard errors.
				for _, m := range []struct {
					name   string
					v, err float64
				}{{"amplitude", p.Amplitude, p.AmplitudeStdErr}, {"phase", p.Phase, p.PhaseStdErr}} {
					if tol := math.Max(0.02*c.a, 4*m.err); math.Abs(m.v-c.a) > tol {
						t.Errorf("%s method, %s wave, %g-%g m: %.4g m2/s, want %.4g within %.2g", m.name, periodName(p.Period),
							p.DepthUpper, p.DepthLower, m.v, c.a, tol)
					}
				}
			}
			inv := r.Inversion
			if e := relErr(inv.Diffusivity, c.a); e > 0.01 {
				t.Errorf("inversion %.5g m2/s, want %.5g within 1 %% (off %.2f %%)", inv.Diffusivity, c.a, 100*e)
			}
			if r.Diffusivity != inv.Diffusivity {
				t.Errorf("recommended value %g is not the inversion's %g", r.Diffusivity, inv.Diffusivity)
			}
			// The misfit is the logger noise: RMS close to sigma.
			if inv.RMS < 0.9*sigma || inv.RMS > 1.15*sigma {
				t.Errorf("inversion RMS %.4f K, want about the noise %.2f K", inv.RMS, sigma)
			}
			if !(inv.StdErr > 0) || inv.StdErr > 0.01*c.a {
				t.Errorf("inversion standard error %g m2/s, want small and positive", inv.StdErr)
			}
			// The modelled series reproduce the RMS over the fitted part.
			var ss float64
			var n int
			for j, ok := range inv.Fitted {
				if len(inv.Modelled[j]) != len(rec.Times) {
					t.Fatalf("modelled series %d has %d values for %d times", j, len(inv.Modelled[j]), len(rec.Times))
				}
				if !ok {
					continue
				}
				for k := inv.FirstFitted; k < len(rec.Times); k++ {
					d := inv.Modelled[j][k] - rec.Temps[j][k]
					ss += d * d
					n++
				}
			}
			if n != inv.Samples || math.Abs(math.Sqrt(ss/float64(n))-inv.RMS) > 1e-9 {
				t.Errorf("modelled series give RMS %g over %d samples, result says %g over %d", math.Sqrt(ss/float64(n)), n, inv.RMS, inv.Samples)
			}
			want := c.bottom
			if want == BottomAuto {
				want = BottomSensor
				if len(c.depths) < 3 {
					want = BottomAdiabatic
				}
			}
			if inv.Bottom != want {
				t.Errorf("bottom %v, want %v", inv.Bottom, want)
			}
			t.Logf("harmonic %.4f, inversion %.4f +- %.4f (x true), RMS %.4f K, %d cells, step %g s, %d simulations, discard %.1f days",
				r.HarmonicCombined/c.a, inv.Diffusivity/c.a, inv.StdErr/c.a, inv.RMS, inv.Cells, inv.Step, inv.Evaluations, inv.Discard/climate.Day)
		})
	}
}

// TestFitDiffusivityWeather: SYNTHETIC record under irregular "weather"
// made of 24 harmonics with periods from 2.3 to 45 days (random
// amplitudes up to 2 K and phases, seeded) on top of the annual and daily
// waves. Each harmonic is exact (Wave, Kusuda and
// Achenbach 1965 form [memory]), so the sum is the exact response to that surface history. The
// inversion, which needs no periodic forcing, must still land within 1 %;
// the harmonic methods, fitting only the daily wave, are logged.
func TestFitDiffusivityWeather(t *testing.T) {
	const a = 0.45e-6
	waves := synthWaves(a)
	rng := rand.New(rand.NewPCG(77, 3))
	for i := range 24 {
		p := 2.3 * math.Pow(45/2.3, float64(i)/23) * climate.Day
		waves = append(waves, Wave{Amplitude: 2 * rng.Float64(), Coldest: p * rng.Float64(), Period: p, Diffusivity: a})
	}
	rec := synthRecordOf(waves, []float64{0.05, 0.15, 0.35}, 90, 0.05, 0, 5)
	r, err := FitDiffusivity(rec, FitOptions{Periods: []float64{climate.Day}})
	if err != nil {
		t.Fatal(err)
	}
	inv := r.Inversion
	t.Logf("harmonic %.4f, inversion %.4f +- %.4f (AR1 %.4f) x true, RMS %.4f K, residual autocorrelation %.2f",
		r.HarmonicCombined/a, inv.Diffusivity/a, inv.StdErr/a, inv.StdErrAR1/a, inv.RMS, inv.Autocorrelation)
	if e := relErr(inv.Diffusivity, a); e > 0.01 {
		t.Errorf("inversion %.5g m2/s, want %.5g within 1 %% (off %.2f %%)", inv.Diffusivity, a, 100*e)
	}
	if inv.RMS > 0.06 {
		t.Errorf("inversion RMS %.4f K, want about the noise 0.05 K", inv.RMS)
	}
}

// TestFitDiffusivityProfile: for one parameter and a nearly linear model
// the profile-likelihood interval must agree with the Gauss-Newton one
// (both 95 %), and hold the true value (SYNTHETIC record, one seed).
func TestFitDiffusivityProfile(t *testing.T) {
	const a = 0.19e-6
	rec := synthRecord(a, []float64{0.02, 0.08, 0.16}, 60, 0.05, 21)
	gn, err := FitDiffusivity(rec, FitOptions{Periods: []float64{climate.Day}})
	if err != nil {
		t.Fatal(err)
	}
	pl, err := FitDiffusivity(rec, FitOptions{Periods: []float64{climate.Day}, ProfileInterval: true})
	if err != nil {
		t.Fatal(err)
	}
	g, p := gn.Inversion, pl.Inversion
	t.Logf("a %.5g: Gauss-Newton %.5g..%.5g, profile %.5g..%.5g (%d more simulations)", p.Diffusivity, g.Low, g.High, p.Low, p.High, p.Evaluations-g.Evaluations)
	if g.Profile || !p.Profile || g.Diffusivity != p.Diffusivity {
		t.Errorf("profile flags %v %v, estimates %g %g", g.Profile, p.Profile, g.Diffusivity, p.Diffusivity)
	}
	for _, c := range [][2]float64{{g.Low, p.Low}, {g.High, p.High}} {
		if half := g.Diffusivity - g.Low; math.Abs(c[0]-c[1]) > 0.05*half {
			t.Errorf("interval ends %.5g (Gauss-Newton) and %.5g (profile) differ by more than 5 %% of the half-width", c[0], c[1])
		}
	}
	if !(p.Low < p.Diffusivity && p.Diffusivity < p.High) || !(p.Low < a && a < p.High) {
		t.Errorf("interval %.5g..%.5g around %.5g, true %.5g", p.Low, p.High, p.Diffusivity, a)
	}
}

// TestFitDiffusivityStdErr compares the Gauss-Newton standard error of
// the inversion with the scatter of the estimates over independent noise
// draws (the definition of a standard error) on SYNTHETIC 30-day records.
// With 12 draws the sample standard deviation is itself uncertain by about
// 20 %: accept a factor 1.6 either way.
//
// With white noise StdErr and StdErrAR1 must both match the scatter. With
// noise correlated from hour to hour (AR(1), phi = 0.8) the white-noise
// StdErr is too small, by sqrt(1 + 2 Re(z/(1 - z))) = 1.95 with
// z = phi exp(i 2 pi/24) for a daily-wave derivative read hourly
// [derived], and StdErrAR1 must match the scatter instead. (Over 40 draws:
// scatter 8.1e-9, StdErr 4.0e-9, StdErrAR1 7.5e-9 m2/s.)
func TestFitDiffusivityStdErr(t *testing.T) {
	const a, draws = 0.45e-6, 12
	for _, phi := range []float64{0, 0.8} {
		var sum, sum2, se, seAR float64
		for s := range draws {
			rec := synthRecordOf(synthWaves(a), []float64{0.05, 0.12, 0.25}, 30, 0.1, phi, uint64(100+s))
			r, err := FitDiffusivity(rec, FitOptions{Periods: []float64{climate.Day}})
			if err != nil {
				t.Fatal(err)
			}
			sum += r.Inversion.Diffusivity
			sum2 += r.Inversion.Diffusivity * r.Inversion.Diffusivity
			se += r.Inversion.StdErr
			seAR += r.Inversion.StdErrAR1
		}
		mean := sum / draws
		sd := math.Sqrt((sum2 - draws*mean*mean) / (draws - 1))
		se /= draws
		seAR /= draws
		t.Logf("phi %g: mean %.5g, scatter %.3g, mean standard errors %.3g (white) %.3g (AR1) m2/s", phi, mean, sd, se, seAR)
		if ratio := sd / seAR; ratio < 1/1.6 || ratio > 1.6 {
			t.Errorf("phi %g: scatter of the estimates %.3g m2/s, StdErrAR1 %.3g: ratio %.2f", phi, sd, seAR, ratio)
		}
		if ratio := sd / se; phi == 0 && (ratio < 1/1.6 || ratio > 1.6) || phi > 0 && ratio < 1.5 {
			t.Errorf("phi %g: scatter of the estimates %.3g m2/s, StdErr %.3g: ratio %.2f", phi, sd, se, ratio)
		}
	}
}

// TestFitDiffusivityPhaseUnwrap: between 0.05 and 0.9 m the daily wave in
// a soil of 0.5e-6 m2/s lags by (0.85/d) P/(2 pi) = 1.16 days (Wave,
// lag z/d P/(2 pi) of the Kusuda and Achenbach form [derived]): the phase method must add one period.
// SYNTHETIC noise-free record of the daily wave alone, harmonic methods
// only.
func TestFitDiffusivityPhaseUnwrap(t *testing.T) {
	const a = 0.5e-6
	wave := synthWaves(a)[1]
	wave.Mean = 9
	rec := synthRecordOf([]Wave{wave}, []float64{0.05, 0.9}, 10, 0, 0, 1)
	r, err := FitDiffusivity(rec, FitOptions{Periods: []float64{climate.Day}, SkipInversion: true})
	if err != nil {
		t.Fatal(err)
	}
	p := r.Harmonic[0]
	if p.Turns != 1 || math.Abs(p.Lag-(wave.LagAt(0.9)-wave.LagAt(0.05))) > 60 {
		t.Errorf("lag %.0f s with %d turns, want %.0f s with 1", p.Lag, p.Turns, wave.LagAt(0.9)-wave.LagAt(0.05))
	}
	if e := relErr(p.Phase, a); e > 0.01 {
		t.Errorf("phase method %.4g, want %.4g", p.Phase, a)
	}
	if r.Inversion.Evaluations != 0 || r.Diffusivity != r.HarmonicCombined {
		t.Errorf("SkipInversion ran %d simulations, recommended %g", r.Inversion.Evaluations, r.Diffusivity)
	}
}

// TestFitDiffusivityNoise: a daily wave that has died out at the lower
// sensor is flagged as lost in the noise and left out, not turned into a
// number. SYNTHETIC record.
func TestFitDiffusivityNoise(t *testing.T) {
	const a = 0.45e-6
	rec := synthRecord(a, []float64{0.1, 0.5, 1.0}, 365, 0.05, 3)
	r, err := FitDiffusivity(rec, FitOptions{Periods: []float64{climate.Year, climate.Day}, SkipInversion: true})
	if err != nil {
		t.Fatal(err)
	}
	var lost int
	for _, p := range r.Harmonic {
		if p.Period == climate.Day && p.DepthLower == 1.0 {
			// Daily amplitude at 1 m: 4 exp(-1/0.11) = 5e-4 K, under the
			// 3 standard errors of 8e-4 K.
			if p.Usable || !strings.Contains(p.Note, "noise") {
				t.Errorf("daily pair %g-%g m: usable %v, note %q", p.DepthUpper, p.DepthLower, p.Usable, p.Note)
			}
			lost++
		}
	}
	if lost != 2 {
		t.Errorf("%d daily pairs to 1 m, want 2", lost)
	}
	if e := relErr(r.HarmonicCombined, a); e > 0.02 {
		t.Errorf("combined %.4g, want %.4g", r.HarmonicCombined, a)
	}
}

func TestFitDiffusivityErrors(t *testing.T) {
	good := func() SensorRecord { return synthRecord(0.45e-6, []float64{0.05, 0.1, 0.2}, 3, 0, 5) }
	day := FitOptions{Periods: []float64{climate.Day}}
	cases := []struct {
		name string
		rec  func() SensorRecord
		o    FitOptions
		want string
	}{
		{"one sensor", func() SensorRecord {
			r := good()
			r.Depths, r.Temps = r.Depths[:1], r.Temps[:1]
			return r
		}, day, "two or more depths"},
		{"depths not increasing", func() SensorRecord {
			r := good()
			r.Depths[2] = 0.1
			return r
		}, day, "depths must increase"},
		{"negative depth", func() SensorRecord {
			r := good()
			r.Depths[0] = -0.05
			return r
		}, day, ">= 0"},
		{"NaN reading", func() SensorRecord {
			r := good()
			r.Temps[1][17] = math.NaN()
			return r
		}, day, "sensor 2 (0.1 m) reading 18"},
		{"infinite reading", func() SensorRecord {
			r := good()
			r.Temps[0][3] = math.Inf(1)
			return r
		}, day, "fill or cut gaps"},
		{"times not increasing", func() SensorRecord {
			r := good()
			r.Times[5] = r.Times[4]
			return r
		}, day, "times must increase"},
		{"short series", func() SensorRecord {
			r := good()
			r.Temps[2] = r.Temps[2][:10]
			return r
		}, day, "readings for"},
		{"record shorter than the period", good, FitOptions{Periods: []float64{climate.Year}}, "shorter than the period"},
		{"no period", good, FitOptions{}, "at least one period"},
		{"amplitude grows with depth", func() SensorRecord {
			r := good()
			r.Temps[0], r.Temps[2] = r.Temps[2], r.Temps[0]
			return r
		}, day, "does not decay with depth"},
		{"prescribed bottom with two sensors", func() SensorRecord {
			r := good()
			r.Depths, r.Temps = r.Depths[:2], r.Temps[:2]
			return r
		}, FitOptions{Periods: []float64{climate.Day}, Bottom: BottomSensor}, "three or more sensors"},
		{"spin-up longer than the record", good, FitOptions{Periods: []float64{climate.Day}, Discard: 5 * climate.Day}, "leaves nothing"},
		{"no wave at all", func() SensorRecord {
			r := good()
			for i := range r.Temps {
				for k := range r.Temps[i] {
					r.Temps[i][k] = 5
				}
			}
			return r
		}, day, "no sensor pair gives a usable estimate"},
		{"sensors too close to see the decay", func() SensorRecord {
			// Daily ratio exp(0.001/0.111) = 1.009 against a noise of
			// 0.2 K on a 1.6 K wave read 480 times.
			return synthRecord(0.45e-6, []float64{0.1, 0.101}, 20, 0.2, 9)
		}, day, "decay not measurable"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := FitDiffusivity(c.rec(), c.o)
			if err == nil || !strings.Contains(err.Error(), c.want) {
				t.Errorf("error %v, want one containing %q", err, c.want)
			}
		})
	}
}

// TestBrentMin checks the 1-D minimiser on functions with known minima:
// a parabola (exact), cos on [2, 5] (minimum at pi) and x - ln x (minimum
// at 1), with an evaluation count far below a plain golden-section search.
func TestBrentMin(t *testing.T) {
	cases := []struct {
		name   string
		f      func(float64) float64
		lo, hi float64
		want   float64
	}{
		{"parabola", func(x float64) float64 { return (x-0.3)*(x-0.3) + 2 }, -4, 5, 0.3},
		{"cos", math.Cos, 2, 5, math.Pi},
		{"x - ln x", func(x float64) float64 { return x - math.Log(x) }, 0.1, 7, 1},
	}
	for _, c := range cases {
		n := 0
		f := func(x float64) float64 { n++; return c.f(x) }
		x, _ := brentMin(f, c.lo, c.hi, 1e-7, 200)
		if math.Abs(x-c.want) > 1e-6 {
			t.Errorf("%s: minimum at %.9g, want %.9g", c.name, x, c.want)
		}
		if n > 30 {
			t.Errorf("%s: %d evaluations", c.name, n)
		}
	}
}

// BenchmarkFitDiffusivityYear times the whole fit of a SYNTHETIC one-year
// hourly record (8760 readings) at three depths: harmonic methods for the
// annual and daily waves, then the inversion (deepest sensor prescribed,
// half-hour steps).
func BenchmarkFitDiffusivityYear(b *testing.B) {
	rec := synthRecord(0.45e-6, []float64{0.1, 0.4, 0.8}, 365, 0.05, 42)
	o := FitOptions{Periods: []float64{climate.Year, climate.Day}}
	var r FitResult
	for b.Loop() {
		var err error
		if r, err = FitDiffusivity(rec, o); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(r.Inversion.Evaluations), "simulations/op")
	b.ReportMetric(float64(r.Inversion.Cells), "cells")
}

// BenchmarkFitDiffusivityHarmonic times the harmonic methods alone on the
// same record.
func BenchmarkFitDiffusivityHarmonic(b *testing.B) {
	rec := synthRecord(0.45e-6, []float64{0.1, 0.4, 0.8}, 365, 0.05, 42)
	o := FitOptions{Periods: []float64{climate.Year, climate.Day}, SkipInversion: true}
	for b.Loop() {
		if _, err := FitDiffusivity(rec, o); err != nil {
			b.Fatal(err)
		}
	}
}

// TestRecordFromSeries reads a SYNTHETIC two-sensor log (invented, the
// columns in degF to check the conversion happens before the fit) through
// climate.ReadCSV and checks the record and the errors.
func TestRecordFromSeries(t *testing.T) {
	var b strings.Builder
	b.WriteString("time,t10,t40\n")
	for h := range 48 {
		fmt.Fprintf(&b, "2025-03-%02dT%02d:00,%g,%g\n", 1+h/24, h%24, 50+float64(h%24), 41+0.1*float64(h))
	}
	s, err := climate.ReadCSV(strings.NewReader(b.String()), "log.csv", climate.CSVOptions{TimeColumn: "time", Columns: []string{"t10", "t40"}, Unit: "F"})
	if err != nil {
		t.Fatal(err)
	}
	rec, err := RecordFromSeries(s, []string{"t10", "t40"}, []float64{0.1, 0.4})
	if err != nil {
		t.Fatal(err)
	}
	// 50 degF = 10 degC, 41 degF = 5 degC (exact conversions).
	if len(rec.Times) != 48 || math.Abs(rec.Temps[0][0]-10) > 1e-12 || math.Abs(rec.Temps[1][0]-5) > 1e-12 || rec.Times[1]-rec.Times[0] != 3600 {
		t.Errorf("record: %d times, first readings %g and %g degC", len(rec.Times), rec.Temps[0][0], rec.Temps[1][0])
	}
	if _, err := RecordFromSeries(s, []string{"t10", "t99"}, []float64{0.1, 0.4}); err == nil || !strings.Contains(err.Error(), "t99") {
		t.Errorf("unknown column: %v", err)
	}
	if _, err := RecordFromSeries(s, []string{"t40", "t10"}, []float64{0.4, 0.1}); err == nil || !strings.Contains(err.Error(), "depths must increase") {
		t.Errorf("depths out of order: %v", err)
	}
	if _, err := RecordFromSeries(s, []string{"t10"}, []float64{0.1, 0.4}); err == nil {
		t.Error("columns and depths of different lengths accepted")
	}
}
