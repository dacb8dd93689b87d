package solver

import (
	"fmt"
	"math"
)

// varyResistances sets the surface resistance of each boundary whose
// resistance varies in time (Boundary.ResistanceAt) to its value at t, the
// midpoint of the coming step, and makes the run factorise its matrices
// again when one changed. Between steps no stage is lagged (implicit ends
// every stage with endLag), so recomputing the conductances from the
// current half-cell resistances changes nothing else.
func (r *fvRun) varyResistances(t float64) error {
	changed := false
	for _, b := range []*fvBC{&r.out, &r.in} {
		if b.rAt == nil || b.kind != Environment {
			continue
		}
		rb := b.rAt(t)
		if !(rb >= 0) || math.IsInf(rb, 0) {
			return fmt.Errorf("solver: surface resistance %g m2 K/W at t = %g s; it must be finite and not negative", rb, t)
		}
		if rb != b.rb {
			b.rb, changed = rb, true
		}
	}
	if changed {
		r.updateConductances()
		r.facTh = math.NaN() // linear scheme: factorise M + th A again
		r.nlDirty = r.n - 1  // enthalpy scheme: every row again
	}
	return nil
}
