package scenarios

import (
	"fmt"
	"math"
	"math/rand"
	"os"
	"testing"
	"time"

	"tempstack/climate"
)

// refSoil is one homogeneous freezing soil under a sinusoidal annual
// surface temperature with a geothermal flux at the bottom.
type refSoil struct {
	ku, kf      float64 // unfrozen and frozen conductivity, W/(m K)
	cu, cf      float64 // unfrozen and frozen volumetric heat capacity, J/(m3 K)
	latent      float64 // J/m3, freezing isothermally at 0 degC
	mean, amp   float64 // surface temperature mean and annual amplitude, degC, K
	peakDay     float64 // day of the warmest surface temperature
	depth, flux float64 // column depth, m; geothermal flux into the bottom, W/m2
}

// yaml is the same soil as a tempstack ground scenario.
func (s refSoil) yaml() string {
	return fmt.Sprintf(`title: random soil
kind: ground
layers:
  - {name: soil, thickness: %g, conductivity: %.6g, conductivity_frozen: %.6g, density: 1000, specific_heat: %.6g, specific_heat_frozen: %.6g, latent_heat: %.6g}
surface:
  temperature: {mean: %.6g, annual: {amplitude: %.6g, peak_day: %.6g}}
bottom:
  heat_flux: %g
analysis:
  periods: [8760h]
  simulate: {}
`, s.depth, s.ku, s.kf, s.cu/1000, s.cf/1000, s.latent, s.mean, s.amp, s.peakDay, s.flux)
}

// refWinter is what the reference simulation reads from one settled
// winter year (from one warmest time of the surface to the next).
type refWinter struct {
	frost     float64 // deepest ice, m
	thaw      float64 // deepest thaw above ice that outlasts the year, m
	frozenAll bool    // ice somewhere all year round
	years     int     // years run until successive winters agreed within 1 mm
	cells     int
	step      float64 // s
	elapsed   time.Duration
	history   []float64 // deepest ice of each year, m
}

// referenceFrost is an independent settled reference for a homogeneous
// freezing soil: explicit (forward Euler) finite volumes on the enthalpy
// (the enthalpy method, Voller and Cross, Int. J. Heat Mass Transfer 24
// (1981) 545 [memory]; Crank, Free and Moving Boundary Problems, Oxford
// 1984, ch. 6 [memory]):
//
//	h_i dH_i/dt = G_{i-1}(T_{i-1} - T_i) - G_i (T_i - T_{i+1}),
//	H(T) = Cf T (T < 0), H in [0, L] at T = 0, L + Cu T (T > 0),
//
// with the conductivity of a cell blended by its liquid fraction, a
// prescribed surface temperature on the top face, a constant heat flux
// into the bottom face, and the stability limit of the surface cell
// dt <= h^2 C / (3 k) (taken with a factor 0.75). It shares no code with the solver: a fine
// uniform grid of h0 down to the zone frost can reach, cells growing by
// 8 % below. It starts from the mean geothermal profile (Tm + q z / k) at
// the warmest time of the surface and runs whole years until two
// successive winters' deepest ice agrees within 1 mm (and at least three
// years). The front is placed in the deepest cell holding ice at its
// upper face plus its ice fraction of the width.
func referenceFrost(s refSoil, h0 float64) refWinter {
	// Grid: fine down to zf, then growing.
	fi := s.amp*climate.Year/math.Pi/climate.Day - s.mean*climate.Year/climate.Day/2 // generous freezing index bound, K day
	stefan := math.Sqrt(2 * s.kf * math.Max(fi, 0) * 86400 / s.latent)
	zf := math.Min(s.depth, math.Max(3, 1.6*stefan))
	nf := int(math.Round(zf / h0))
	zf = float64(nf) * h0
	var faces []float64
	for j := 0; j < nf; j++ {
		faces = append(faces, float64(j)*h0)
	}
	h := h0
	x := zf
	for x < s.depth-h/2 {
		faces = append(faces, x)
		h *= 1.08
		x += h
	}
	faces = append(faces, s.depth)
	n := len(faces) - 1
	w := make([]float64, n)
	xc := make([]float64, n)
	for i := range w {
		w[i] = faces[i+1] - faces[i]
		xc[i] = (faces[i] + faces[i+1]) / 2
	}
	cmin := math.Min(s.cu, s.cf)
	kmax := math.Max(s.ku, s.kf)
	// Forward Euler is stable while dt sum(G)/(h C) <= 1 in every cell; the
	// surface cell has 2k/h to the surface and k/h to its neighbour.
	dt := 0.25 * h0 * h0 * cmin / kmax
	steps := int(math.Ceil(climate.Year / dt))
	dt = climate.Year / float64(steps)

	temp := func(H float64) (T, liquid float64) {
		switch {
		case H < 0:
			return H / s.cf, 0
		case H > s.latent:
			return (H - s.latent) / s.cu, 1
		}
		return 0, H / s.latent
	}
	enth := func(T float64) float64 {
		if T < 0 {
			return s.cf * T
		}
		return s.latent + s.cu*T
	}
	H := make([]float64, n)
	for i := range H {
		// Mean geothermal profile: Tm + q z / k, frozen k while below 0.
		z := xc[i]
		var T float64
		if s.mean < 0 {
			zc := -s.mean * s.kf / s.flux // depth of 0 degC
			if z < zc {
				T = s.mean + s.flux*z/s.kf
			} else {
				T = s.flux * (z - zc) / s.ku
			}
		} else {
			T = s.mean + s.flux*z/s.ku
		}
		H[i] = enth(T)
	}
	T := make([]float64, n)
	liq := make([]float64, n)
	k := make([]float64, n)
	G := make([]float64, n) // G[i] between i and i+1
	q := make([]float64, n+1)
	t0 := (s.peakDay - 0.5) * climate.Day // warmest time (peak_day counts 1 January as day 1, peak at noon)
	surf := func(t float64) float64 {
		return s.mean + s.amp*math.Cos(2*math.Pi*(t-t0)/climate.Year)
	}
	front := func() (frost, thaw float64, any bool) {
		deep := -1
		for i := n - 1; i >= 0; i-- {
			if liq[i] < 1-1e-9 {
				deep = i
				break
			}
		}
		if deep < 0 {
			return 0, 0, false
		}
		frost = faces[deep] + (1-liq[deep])*w[deep]
		top := 0
		for top < n && liq[top] >= 1-1e-9 {
			top++
		}
		if top > 0 || liq[0] > 1e-9 {
			thaw = faces[top] + liq[top]*w[top]
		}
		return frost, thaw, true
	}
	start := time.Now()
	var out refWinter
	prev := math.NaN()
	for year := 1; year <= 60; year++ {
		var maxFrost, maxThaw float64
		always := true
		for st := 0; st < steps; st++ {
			t := t0 + float64(st)*dt
			for i := range H {
				T[i], liq[i] = temp(H[i])
				k[i] = s.kf + liq[i]*(s.ku-s.kf)
			}
			for i := 0; i < n-1; i++ {
				G[i] = 1 / (w[i]/(2*k[i]) + w[i+1]/(2*k[i+1]))
			}
			q[0] = (surf(t) - T[0]) * 2 * k[0] / w[0]
			for i := 0; i < n-1; i++ {
				q[i+1] = G[i] * (T[i] - T[i+1])
			}
			q[n] = -s.flux
			for i := range H {
				H[i] += dt * (q[i] - q[i+1]) / w[i]
			}
			if st%24 == 0 {
				for i := range H {
					_, liq[i] = temp(H[i])
				}
				f, th, any := front()
				maxFrost = math.Max(maxFrost, f)
				maxThaw = math.Max(maxThaw, th)
				always = always && any
			}
		}
		hist := append(out.history, maxFrost)
		out = refWinter{frost: maxFrost, thaw: maxThaw, frozenAll: always, years: year, cells: n, step: dt, history: hist}
		// Permafrost: the settled quantity is the active layer (its base
		// drifts for centuries); otherwise the deepest ice.
		x := maxFrost
		if always {
			x = maxThaw
		}
		if year >= 3 && math.Abs(x-prev) < 1e-3 {
			break
		}
		prev = x
	}
	out.elapsed = time.Since(start)
	return out
}

// randomSoil draws a homogeneous freezing soil in the ranges of the
// frost-depth differential test.
func randomSoil(rng *rand.Rand) refSoil {
	u := func(a, b float64) float64 { return a + (b-a)*rng.Float64() }
	ku := u(0.8, 2.5)
	cu := u(1.5e6, 3e6)
	return refSoil{
		ku: ku, kf: ku * u(1, 1.5),
		cu: cu, cf: cu * u(0.75, 1),
		latent: u(40e6, 160e6),
		mean:   u(-1, 6), amp: u(6, 16),
		peakDay: math.Round(u(180, 230)),
		depth:   20, flux: 0.065,
	}
}

// TestFrostAgainstReference compares the headline simulated frost depth
// of ground runs with the independent settled reference above, over
// seeded random homogeneous soils. Three cases always; the full set of 30
// with TEMPSTACK_FROST_REFERENCE=1 (about a minute per ten soils).
func TestFrostAgainstReference(t *testing.T) {
	nCases := 3
	if os.Getenv("TEMPSTACK_FROST_REFERENCE") != "" {
		nCases = 30
	}
	rng := rand.New(rand.NewSource(20261203))
	for c := 0; c < nCases; c++ {
		s := randomSoil(rng)
		t.Run(fmt.Sprintf("soil%02d", c+1), func(t *testing.T) {
			ref := referenceFrost(s, 0.015)
			r := mustRun(t, s.yaml())
			fr := r.Frost
			want, what := ref.frost, "frost depth"
			head := fr.MaxFrostDepth_m
			if ref.frozenAll {
				want, what, head = ref.thaw, "active layer", fr.ActiveLayer_m
			}
			if head == nil {
				t.Fatalf("no headline %s: %v", what, fr.NotComputed)
			}
			got := *head
			t.Logf("ku %.2f kf %.2f cu %.2f cf %.2f L %.0f mean %.2f amp %.2f: reference frost %.4f m (thaw %.3f, frozen all year %v, %d years, %d cells, dt %.0f s, %v); tempstack %.4f m, spin-up %d cycles",
				s.ku, s.kf, s.cu/1e6, s.cf/1e6, s.latent/1e6, s.mean, s.amp, ref.frost, ref.thaw, ref.frozenAll, ref.years, ref.cells, ref.step, ref.elapsed.Round(time.Millisecond), got, r.Simulation.SpinUpCycles)
			tol := math.Max(0.02*want, 0.01)
			if math.Abs(got-want) > tol {
				t.Errorf("headline %s %.4f m, reference %.4f m (tolerance %.4f m)", what, got, want, tol)
			}
		})
	}
}
