package ground

import (
	"math"
	"testing"

	"tempstack/climate"
)

func TestCyclicSeasonHand(t *testing.T) {
	// Daily means (degC) as one period, worked by hand [derived]: 3 days
	// below 0. Cumulative curve 0, 5, 8, 6, 2, 3, 0, 2, 8 (then repeating
	// from 8): largest fall 8 -> 0 over samples 2..6 (index 8 K day, 4
	// days, the 1 degC day inside netted out). Largest rise over the wrap:
	// samples 6, 7, 0, 1 give 2 + 6 + 5 + 3 = 16 K day in 4 days.
	s := []float64{5, 3, -2, -4, 1, -3, 2, 6}
	day := 86400.0
	if v, _ := DaysBelow(s, day, 0); v != 3 {
		t.Errorf("days below %g", v)
	}
	if v, _ := DaysBelow(s, 3600, 2.5); v != 5.0/24 {
		t.Errorf("hours below 2.5: %g days", v)
	}
	f, err := CyclicFreezingSeason(s, day, 0)
	if err != nil {
		t.Fatal(err)
	}
	if f.Index != 8 || f.Start != 2 || f.End != 6 || f.Days != 4 {
		t.Errorf("freezing season %+v", f)
	}
	th, _ := CyclicThawingSeason(s, day, 0)
	if th.Index != 16 || th.Start != 6 || th.End != 10 || th.Days != 4 {
		t.Errorf("thawing season %+v", th)
	}
	// A winter straddling the end of the record: curve 0, -3, -4, 0, 6, 11,
	// 9, then -3, -4: the fall 11 -> 5 runs from sample 5 over the wrap to
	// sample 2 of the next period (6 K day, 3 days).
	w := []float64{-3, -1, 4, 6, 5, -2}
	c, _ := CyclicFreezingSeason(w, day, 0)
	if c.Index != 6 || c.Start != 5 || c.End != 8 || c.Days != 3 {
		t.Errorf("wrapped season %+v", c)
	}
	// Hourly step: the index scales with the step.
	c, _ = CyclicFreezingSeason(w, 3600, 0)
	if math.Abs(c.Index-6.0/24) > 1e-15 {
		t.Errorf("hourly index %g", c.Index)
	}
	// Never below 0: zero season.
	if z, _ := CyclicFreezingSeason([]float64{1, 2, 3}, day, 0); z != (Season{}) {
		t.Errorf("warm record %+v", z)
	}
	// Always below 0: the whole period, index = sum.
	if z, _ := CyclicFreezingSeason([]float64{-1, -2, -3}, day, 0); z.Index != 6 || z.Days != 3 {
		t.Errorf("cold record %+v", z)
	}
}

func TestSeriesBadInputs(t *testing.T) {
	if _, err := DaysBelow(nil, 86400, 0); err == nil {
		t.Error("empty series: want an error")
	}
	if _, err := DaysBelow([]float64{1}, 0, 0); err == nil {
		t.Error("zero step: want an error")
	}
	if _, err := CyclicFreezingSeason([]float64{1, math.NaN()}, 86400, 0); err == nil {
		t.Error("NaN sample: want an error")
	}
	if _, err := Sample(climate.Periodic{}, 1, 0, 1); err == nil {
		t.Error("Sample with to < from: want an error")
	}
	if _, _, _, err := SineIndices(0, -1, 365); err == nil {
		t.Error("negative amplitude: want an error")
	}
	if _, err := PeriodicFrostClimate(climate.Periodic{}, climate.Year, climate.Day, 0); err == nil {
		t.Error("zero n-factor: want an error")
	}
	if _, err := FrostClimateFromWinter(climate.Winter{FreezingIndex: -1}, 1); err == nil {
		t.Error("negative winter index: want an error")
	}
}

func TestSineIndices(t *testing.T) {
	// Closed form [derived] against the sampled signal: annual cosine, mean
	// 3 degC, amplitude 12 K, warmest on day 200; hourly samples of one
	// year. The cyclic season and the degree-days below 0 agree with the
	// closed form (no thaw inside this winter, so both definitions agree).
	mean, amp := 3.0, 12.0
	F, I, days, err := SineIndices(mean, amp, 365)
	if err != nil {
		t.Fatal(err)
	}
	p := climate.Periodic{Mean: mean, Harmonics: []climate.Harmonic{{Period: climate.Year, Amplitude: amp, Peak: 200 * climate.Day}}}
	series, err := Sample(p, 0, climate.Year, 3600)
	if err != nil {
		t.Fatal(err)
	}
	below, above := climate.DegreeDays(series, 3600, 0)
	s, _ := CyclicFreezingSeason(series, 3600, 0)
	ts, _ := CyclicThawingSeason(series, 3600, 0)
	if math.Abs(below-F) > 1e-3*F || math.Abs(s.Index-F) > 1e-3*F || math.Abs(above-I) > 1e-3*I || math.Abs(ts.Index-I) > 1e-3*I {
		t.Errorf("sampled F %g / %g, I %g / %g; closed form F %g, I %g", below, s.Index, above, ts.Index, F, I)
	}
	if math.Abs(s.Days-days) > 2.0/24 {
		t.Errorf("season %g days, closed form %g", s.Days, days)
	}
	// The season is centred on the coldest day (200 - 182.5 = 17.5).
	mid := math.Mod((float64(s.Start+s.End)/2)/24, 365)
	if math.Abs(mid-17.5) > 0.1 {
		t.Errorf("season centre day %g, want 17.5", mid)
	}
	// Mean 0: F = P A / pi exactly; all-frozen and never-frozen limits.
	if F0, _, d0, _ := SineIndices(0, 10, 365); math.Abs(F0-3650/math.Pi) > 1e-9 || math.Abs(d0-182.5) > 1e-12 {
		t.Errorf("mean 0: F %g, season %g", F0, d0)
	}
	if F1, I1, d1, _ := SineIndices(-15, 10, 365); math.Abs(F1-15*365) > 1e-9 || math.Abs(I1) > 1e-9 || d1 != 365 {
		t.Errorf("always frozen: %g %g %g", F1, I1, d1)
	}
	if F2, _, d2, _ := SineIndices(15, 10, 365); F2 != 0 || d2 != 0 {
		t.Errorf("never frozen: %g %g", F2, d2)
	}
	fc, err := PeriodicFrostClimate(p, climate.Year, 3600, 0.5)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(fc.SurfaceIndex-0.5*fc.AirIndex) > 1e-12 || fc.MeanAnnual != mean || math.Abs(fc.AirIndex-F) > 1e-3*F ||
		math.Abs(fc.SeasonDays-days) > 2.0/24 {
		t.Errorf("frost climate %+v", fc)
	}
	// The same climate as a measured daily record of three years read by
	// climate.Winters: the complete winters carry the same index.
	tt := make([]float64, 3*365*24)
	vv := make([]float64, len(tt))
	for i := range tt {
		tt[i] = float64(i) * 3600
		vv[i] = p.At(tt[i])
	}
	ws, err := climate.Winters(tt, vv, climate.WinterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	for _, w := range ws {
		if !w.Complete {
			continue
		}
		n++
		fw, err := FrostClimateFromWinter(w, 0.5)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(fw.AirIndex-F) > 2e-3*F || math.Abs(fw.SeasonDays-days) > 1.01 || math.Abs(fw.MeanAnnual-mean) > 0.05 {
			t.Errorf("winter %s: %+v, closed form F %g, %g days", w.Label, fw, F, days)
		}
	}
	if n == 0 {
		t.Error("no complete winter in three years")
	}
}

func TestGroundWaveHeatEquation(t *testing.T) {
	// The Kusuda form solves dT/dt = a d2T/dz2 [derived]: check with
	// central differences at several depths and times, and the surface
	// condition T(0, t) = Mean - Amplitude cos(2 pi (t - Coldest)/P).
	w, err := Kusuda(9, 11, 20*climate.Day, 0.6e-6)
	if err != nil {
		t.Fatal(err)
	}
	d := w.DampingDepth()
	for _, z := range []float64{0.3, 1, 2.5, 6} {
		for _, tt := range []float64{0, 50 * climate.Day, 123.4 * climate.Day, 300 * climate.Day} {
			hz, ht := 1e-3*d, 1e-4*w.Period
			dTdt := (w.Temperature(z, tt+ht) - w.Temperature(z, tt-ht)) / (2 * ht)
			d2 := (w.Temperature(z+hz, tt) - 2*w.Temperature(z, tt) + w.Temperature(z-hz, tt)) / (hz * hz)
			scale := w.AmplitudeAt(z) * 2 * math.Pi / w.Period
			if math.Abs(dTdt-w.Diffusivity*d2) > 1e-4*scale {
				t.Errorf("z %g t %g: dT/dt %g, a d2T/dz2 %g", z, tt, dTdt, w.Diffusivity*d2)
			}
		}
	}
	for _, tt := range []float64{0, 20 * climate.Day, 100 * climate.Day} {
		want := 9 - 11*math.Cos(2*math.Pi*(tt-20*climate.Day)/climate.Year)
		if math.Abs(w.Temperature(0, tt)-want) > 1e-12 {
			t.Errorf("surface at %g", tt)
		}
	}
	if w.Temperature(0, 20*climate.Day) != 9-11 {
		t.Error("coldest surface temperature not at Coldest")
	}
}

func TestGroundWaveDepths(t *testing.T) {
	// Dry sand, a = 0.19e-6 m2/s (Moene and van Dam 2014 Table 2.2 after
	// de Vries 1963 [2nd-hand]): annual damping depth sqrt(a P / pi) =
	// sqrt(0.19e-6 31.536e6 / pi) = 1.3811 m [derived by hand].
	w, _ := Kusuda(8, 10, 15*climate.Day, 0.19e-6)
	if d := w.DampingDepth(); math.Abs(d-1.3811) > 1e-4 {
		t.Errorf("damping depth %g", d)
	}
	// Amplitude ratio exp(-z/d) and lag z/d P/(2 pi) (Kusuda and Achenbach
	// 1965 form [memory]; Carslaw and Jaeger, section 2.6 [memory]):
	// the minimum at depth z comes LagAt(z) after the surface minimum.
	z := 2.0
	lag := w.LagAt(z)
	tmin := w.Coldest + lag
	lo, _ := w.Envelope(z)
	if math.Abs(w.Temperature(z, tmin)-lo) > 1e-12 || math.Abs(lo-(8-10*math.Exp(-z/w.DampingDepth()))) > 1e-12 {
		t.Errorf("minimum at depth: %g vs %g", w.Temperature(z, tmin), lo)
	}
	// DepthForAmplitude inverts AmplitudeAt.
	zz, err := w.DepthForAmplitude(0.5)
	if err != nil || math.Abs(w.AmplitudeAt(zz)-0.5) > 1e-12 {
		t.Errorf("depth for 0.5 K: %g (%g K), %v", zz, w.AmplitudeAt(zz), err)
	}
	if z0, _ := w.DepthForAmplitude(20); z0 != 0 {
		t.Errorf("threshold above the surface amplitude: %g", z0)
	}
	// Frost-free depth: Mean - A exp(-z/d) = 0 -> z = d ln(A/Mean).
	zf, err := w.FrostFreeDepth(0)
	if err != nil || math.Abs(zf-w.DampingDepth()*math.Log(10.0/8)) > 1e-12 {
		t.Errorf("frost-free depth %g %v", zf, err)
	}
	if lo, _ := w.Envelope(zf); math.Abs(lo) > 1e-12 {
		t.Errorf("minimum at frost-free depth %g", lo)
	}
	if _, err := (Wave{Mean: -1, Amplitude: 5, Period: climate.Year, Diffusivity: 1e-6}).FrostFreeDepth(0); err == nil {
		t.Error("mean below freezing: want an error")
	}
	if _, err := w.DepthForAmplitude(0); err == nil {
		t.Error("zero threshold: want an error")
	}
	if _, err := Kusuda(8, 10, 0, 0); err == nil {
		t.Error("zero diffusivity: want an error")
	}
	if _, err := Kusuda(8, -1, 0, 1e-6); err == nil {
		t.Error("negative amplitude: want an error")
	}
	// From a climate harmonic: the coldest time is half a period after the
	// peak.
	g, err := WaveFromHarmonic(8, climate.Harmonic{Period: climate.Year, Amplitude: 10, Peak: 200 * climate.Day}, 0.19e-6)
	if err != nil || math.Abs(g.Coldest-17.5*climate.Day) > 1e-6 {
		t.Errorf("from harmonic: %+v %v", g, err)
	}
	// ... and its surface temperature is the harmonic's.
	h := climate.Periodic{Mean: 8, Harmonics: []climate.Harmonic{{Period: climate.Year, Amplitude: 10, Peak: 200 * climate.Day}}}
	for _, tt := range []float64{0, 1e6, 2.2e7} {
		if math.Abs(g.Temperature(0, tt)-h.At(tt)) > 1e-9 {
			t.Errorf("surface %g vs %g", g.Temperature(0, tt), h.At(tt))
		}
	}
}

func TestDiffusivityFromHarmonics(t *testing.T) {
	// A Wave with a = 0.45e-6 m2/s (wet clay, Moene and van Dam 2014
	// Table 2.2 [2nd-hand]) sampled daily for two years at 0.2 and 1.0 m; the
	// annual harmonics fitted by climate.FitHarmonics give back a by both
	// methods [derived: amplitude ratio exp(-dz/d), lag dz/d P/(2 pi)].
	const a = 0.45e-6
	w, _ := Kusuda(7, 12, 30*climate.Day, a)
	var tt, v1, v2 []float64
	for i := 0; i < 2*365; i++ {
		ti := float64(i) * climate.Day
		tt = append(tt, ti)
		v1 = append(v1, w.Temperature(0.2, ti))
		v2 = append(v2, w.Temperature(1.0, ti))
	}
	p1, _, err := climate.FitHarmonics(tt, v1, []float64{climate.Year})
	if err != nil {
		t.Fatal(err)
	}
	p2, _, err := climate.FitHarmonics(tt, v2, []float64{climate.Year})
	if err != nil {
		t.Fatal(err)
	}
	d, err := DiffusivityFromHarmonics(0.2, p1.Harmonics[0], 1.0, p2.Harmonics[0])
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(d.Amplitude-a) > 1e-6*a || math.Abs(d.Phase-a) > 1e-6*a {
		t.Errorf("diffusivity amplitude %g, phase %g, want %g", d.Amplitude, d.Phase, a)
	}
	if math.Abs(d.Lag-w.LagAt(0.8)) > 1 {
		t.Errorf("lag %g s, want %g", d.Lag, w.LagAt(0.8))
	}
	h := climate.Harmonic{Period: climate.Year, Amplitude: 5, Peak: 0}
	bad := []struct {
		z1, z2 float64
		h1, h2 climate.Harmonic
	}{
		{1, 0.5, h, climate.Harmonic{Period: climate.Year, Amplitude: 2, Peak: 10}},
		{0.5, 1, h, climate.Harmonic{Period: climate.Year, Amplitude: 6, Peak: 10}},
		{0.5, 1, h, climate.Harmonic{Period: climate.Day, Amplitude: 2, Peak: 10}},
		{0.5, 1, h, climate.Harmonic{Period: climate.Year, Amplitude: 2, Peak: 0}},
	}
	for i, c := range bad {
		if _, err := DiffusivityFromHarmonics(c.z1, c.h1, c.z2, c.h2); err == nil {
			t.Errorf("case %d: want an error", i)
		}
	}
}
