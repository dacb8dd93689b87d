package scenarios

import (
	"fmt"
	"strings"

	"gopkg.in/yaml.v3"

	"tempstack/climate"
	"tempstack/layers"
	"tempstack/scenarios/results"
	"tempstack/solver"
)

// Side is the condition at one face of the column, one of a closed set of
// variants: Environment (an environment temperature behind a surface
// resistance, with n-factors or the sun), HeatFlux (a flux prescribed into
// the column) and Adiabatic (nothing crosses). Each variant decodes itself
// (sideVariants), describes itself for results.json (Info) and maps one to
// one onto the solver's boundary (Boundary); nothing else decides what a
// side is.
type Side interface {
	// Boundary is the condition of the side in the transient solver; the
	// variant decides its solver.BoundaryKind, one to one.
	Boundary() solver.Boundary
	// Info describes the side for results.json.
	Info() results.SideForcing
	// SurfaceResistance is the surface resistance, m2 K/W, that the column
	// and the exact (steady and periodic) analysis use; of a resistance
	// that varies in time, its usual value.
	SurfaceResistance() float64

	// temperature is the environment temperature behind the surface, nil
	// when the side has none.
	temperature() *Forcing
	// drive is what drives the side in time (the environment temperature,
	// a flux that changes in time), for the periods a run resolves and
	// settles over; nil when the side is constant.
	drive() *Forcing
	// steadyFlux is the heat flux, W/m2, entering the column through a
	// side without an environment in the steady state (0 when adiabatic or
	// when the side has an environment).
	steadyFlux() float64
	// varies reports whether the side's boundary changes in a way the
	// exact periodic solution does not follow, so that the simulation
	// needs a settled start.
	varies() bool
	// notes says what the exact analysis leaves out of the side (for the
	// run's warnings); name is the side as the scenario names it.
	notes(name string) []string
}

// sideAt is where a side is decoded: what its variant may depend on.
type sideAt struct {
	s   *Scenario
	key string // the side's key: outside, inside, surface or bottom
	// sunlit: the sun may shine on the side (a wall's outside); solar is
	// refused elsewhere.
	sunlit bool
	// environment: the side must be an Environment (the outside of a
	// wall, the ground surface).
	environment bool
	// bottom: the bottom of a ground column, whose temperature must be
	// constant.
	bottom bool
	r      float64 // the surface resistance given (or the default), m2 K/W
	// periods are the times of the year with another resistance; nil:
	// constant.
	periods []ResistancePeriod
}

// sideVariants are the conditions a side may hold, each chosen by its key;
// a side holds exactly one. decode reads the variant from o (the side's
// mapping, which has key) and returns nil when the key does not choose it
// (adiabatic: false) or after a mistake, which it reported.
var sideVariants = []struct {
	key    string // the key that chooses the variant
	hint   string // how a message asks for it
	decode func(d *decoder, o *object, at sideAt) Side
}{
	{"temperature", "temperature", decodeEnvironment},
	{"heat_flux", "heat_flux", decodeHeatFlux},
	{"adiabatic", "adiabatic: true", decodeAdiabatic},
}

// HeatFlux is a side through which a prescribed heat flux enters the
// column (ground bottom: the geothermal flux, positive upward into the
// column), constant or changing in time (a heating cable on a schedule).
type HeatFlux struct {
	Flux float64 // W/m2 into the column; of a flux that changes in time, its mean
	// Varying is the flux over time, W/m2 into the column (a mean and
	// harmonics, the mean equal to Flux); nil: Flux all the time.
	Varying *Forcing
	// Resistance is the surface resistance, m2 K/W, the column carries for
	// the exact analysis (a wall's ISO 6946 value); the flux enters the
	// surface whatever it is.
	Resistance float64
}

// decodeHeatFlux reads heat_flux: a value (W/m2), or a mean with daily,
// annual and further harmonics for a flux that changes in time.
func decodeHeatFlux(d *decoder, o *object, at sideAt) Side {
	sd := HeatFlux{Resistance: at.r}
	if !constantResistance(o, at, "a heat flux") {
		return nil
	}
	n := o.values["heat_flux"]
	if n.Kind != yaml.MappingNode {
		if !o.quantity("heat_flux", layers.HeatFlux, &sd.Flux) {
			return nil
		}
		return sd
	}
	for i := 0; i+1 < len(n.Content); i += 2 {
		if k := n.Content[i].Value; k == "file" || k == "step" {
			d.failf(n.Content[i], join(join(o.path, "heat_flux"), k), "a heat flux takes a mean and harmonics (daily, annual, harmonics)")
			return nil
		}
	}
	f := d.decodeForcing(o, "heat_flux", forcingHeatFlux)
	if f == nil {
		return nil
	}
	sd.Flux, sd.Varying = f.Mean, f
	return sd
}

// Boundary is a solver.PrescribedFlux boundary.
func (sd HeatFlux) Boundary() solver.Boundary {
	if f := sd.Varying; f != nil {
		return solver.Boundary{Kind: solver.PrescribedFlux, Flux: f.At}
	}
	q := sd.Flux
	return solver.Boundary{Kind: solver.PrescribedFlux, Flux: func(float64) float64 { return q }}
}

// Info describes the side: kind heat_flux, its mean and harmonics.
func (sd HeatFlux) Info() results.SideForcing {
	q := sd.Flux
	out := results.SideForcing{Kind: "heat_flux", Resistance_m2K_W: sd.Resistance, HeatFlux_W_m2: &q}
	if f := sd.Varying; f != nil {
		out.Harmonics = harmonicsInfo(f.Harmonics)
	}
	return out
}

// SurfaceResistance is Resistance.
func (sd HeatFlux) SurfaceResistance() float64 { return sd.Resistance }

func (sd HeatFlux) temperature() *Forcing { return nil }
func (sd HeatFlux) drive() *Forcing       { return sd.Varying }
func (sd HeatFlux) steadyFlux() float64   { return sd.Flux }
func (sd HeatFlux) varies() bool          { return sd.Varying != nil && len(sd.Varying.Harmonics) > 0 }

func (sd HeatFlux) notes(name string) []string {
	if !sd.varies() {
		return nil
	}
	return []string{fmt.Sprintf("the %s heat flux changes in time: the simulation follows it; the exact periodic analysis and the closed forms use its mean, %g W/m2", name, sd.Flux)}
}

// Adiabatic is a side that no heat crosses (a plane of symmetry, a
// perfectly insulated face).
type Adiabatic struct {
	// Resistance is the surface resistance, m2 K/W, the column carries for
	// the exact analysis (a wall's ISO 6946 value).
	Resistance float64
}

func decodeAdiabatic(d *decoder, o *object, at sideAt) Side {
	var adiabatic bool
	if !o.boolean("adiabatic", &adiabatic) || !adiabatic || !constantResistance(o, at, "an adiabatic face") {
		return nil
	}
	return Adiabatic{Resistance: at.r}
}

// Boundary is a solver.Adiabatic boundary.
func (sd Adiabatic) Boundary() solver.Boundary { return solver.Boundary{Kind: solver.Adiabatic} }

// Info describes the side: kind adiabatic.
func (sd Adiabatic) Info() results.SideForcing {
	return results.SideForcing{Kind: "adiabatic", Resistance_m2K_W: sd.Resistance}
}

// SurfaceResistance is Resistance.
func (sd Adiabatic) SurfaceResistance() float64 { return sd.Resistance }

func (sd Adiabatic) temperature() *Forcing      { return nil }
func (sd Adiabatic) drive() *Forcing            { return nil }
func (sd Adiabatic) steadyFlux() float64        { return 0 }
func (sd Adiabatic) varies() bool               { return false }
func (sd Adiabatic) notes(name string) []string { return nil }

// constantResistance reports a resistance that varies in time on a side
// without an environment, where it would mean nothing.
func constantResistance(o *object, at sideAt, what string) bool {
	if len(at.periods) > 0 {
		o.failf("resistance", "a resistance that changes in the course of the year needs a temperature behind it; %s takes a plain number", what)
		return false
	}
	return true
}

// sideNotes collects what the exact analysis leaves out of either side.
func sideNotes(s *Scenario) []string {
	names := map[Kind][2]string{Wall: {"outside", "inside"}, Ground: {"surface", "bottom"}}[s.Kind]
	return append(s.Outside.notes(names[0]), s.Inside.notes(names[1])...)
}

// decodeSide reads one side of s under top's key: its resistance, and
// exactly one of the variants of sideVariants. A side that is not given
// takes its default: 20 degC behind the ISO 6946 resistance defaultR
// inside a wall, the geothermal flux below the ground. It returns nil
// after a mistake.
func (d *decoder) decodeSide(top *object, key string, s *Scenario, defaultR float64, outside bool) Side {
	allowed := sideKeys
	if s.Kind == Ground {
		defaultR = 0
		allowed = bottomKeys
		if outside {
			allowed = surfaceKeys
		}
	}
	if !top.has(key) {
		switch {
		case outside:
			top.missing(key, "the temperature on this side, e.g. temperature: {mean: 10, daily: {amplitude: 8, peak_hour: 15}}")
			return nil
		case s.Kind == Ground:
			// Default bottom: the continental mean geothermal heat flux,
			// 65 mW/m2 (Pollack, Hurter and Johnson 1993, Rev. Geophys.
			// 31:267, abstract [read]).
			return HeatFlux{Flux: DefaultGeothermalFlux}
		}
		// Default inside: 20 degC air behind the ISO 6946 resistance.
		return Environment{Temperature: &Forcing{Periodic: climate.Periodic{Mean: 20}}, Resistance: defaultR}
	}
	o := top.child(key, allowed)
	if o == nil {
		return nil
	}
	return d.decodeSideObject(o, sideAt{s: s, key: key, sunlit: outside && s.Kind == Wall, environment: outside,
		bottom: !outside && s.Kind == Ground, r: defaultR})
}

// decodeSideObject reads a side from its mapping o (whose allowed keys
// say which variants it may hold): the resistance (at.r when not given),
// and exactly one variant. It returns nil after a mistake.
func (d *decoder) decodeSideObject(o *object, at sideAt) Side {
	d.decodeResistance(o, &at.r, &at.periods)
	if o.has("solar") && !at.sunlit {
		o.failf("solar", "the sun shines on the outside surface only")
	}
	var chosen []Side
	var keys, hints []string
	for _, v := range sideVariants {
		keys, hints = append(keys, v.key), append(hints, v.hint)
		if o.has(v.key) {
			if sd := v.decode(d, o, at); sd != nil {
				chosen = append(chosen, sd)
			}
		}
	}
	if !o.clean() {
		return nil
	}
	switch {
	case len(chosen) == 0:
		o.missing(keys[0], "give "+orList(hints, "or"))
	case len(chosen) > 1:
		o.d.failf(o.node, o.path, "give only one of %s", orList(keys, "and"))
	case at.environment && !isEnvironment(chosen[0]):
		o.missing("temperature", "the "+at.key+" side is driven by a temperature")
	default:
		return chosen[0]
	}
	return nil
}

func isEnvironment(sd Side) bool {
	_, ok := sd.(Environment)
	return ok
}

// orList joins words as "a, b or c".
func orList(words []string, conj string) string {
	if len(words) < 2 {
		return strings.Join(words, "")
	}
	return fmt.Sprintf("%s %s %s", strings.Join(words[:len(words)-1], ", "), conj, words[len(words)-1])
}
