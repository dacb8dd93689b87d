package results

import "fmt"

// Caution texts. Frost depth and foundation advice can hurt people: every
// ground result carries the frost cautions, and every wall result the
// limits of a one-dimensional model. The terminal summary, the report and
// results.json all take them from Cautions.
var (
	// frostCaution says who sets design depths. It is always the first
	// caution of a ground result.
	frostCaution = "These frost depths and ground temperatures are an estimate for planning only. " +
		"Footing depth, frost protection of foundations and pipe cover depth are set by local codes, " +
		"utility standards and a licensed engineer (a geotechnical engineer for foundations). " +
		"Measured local frost depths and local records govern over any computed value."
	// boundCaution says that no method here is a safe upper bound.
	boundCaution = "No method here is a safe upper bound on the frost depth: the simulated depth and the " +
		"Stefan and modified Berggren closed forms can each fall short of the real depth (one can lie " +
		"below another, as the frost table shows), and snow cover, vegetation, soil moisture, " +
		"groundwater flow and nearby buildings change real frost."
	groundModelCaution = "Results assume one-dimensional heat flow through horizontal, homogeneous layers " +
		"with the stated properties; frost heave, ice lenses and water moving to the frost front are not modelled."
	wallModelCaution = "Results assume one-dimensional heat flow through plane, homogeneous layers with the " +
		"stated, constant properties; thermal bridges, edges, moisture and air movement are not included."
	wallMixCaution = "A mixed layer (studs in insulation, mortar joints) is taken by the combined method of ISO 6946, " +
		"whose U lies between its upper and lower limits with the relative error shown; metal fasteners and " +
		"bridges that cross the insulation are not included. The periodic and simulated results treat the mixed " +
		"layer as one equivalent homogeneous layer, so they give the area-average response, not the temperature over a stud."
	wallMaterialCaution = "Material values are those listed in the layer table with their sources; " +
		"check them against the products actually used."
)

// Cautions returns the cautions that go with a result, in plain
// sentences: for a ground column the frost cautions (who sets design
// depths; no method is a safe upper bound, with this run's figures when a
// closed form lies below the simulated depth), the model's limits and, for
// a run that follows a record, the record's warnings (climate.RecordWarnings:
// partial winters, fewer winters than a design index needs); for a wall
// the limits of a one-dimensional model of homogeneous layers. Results
// made by Run carry the same list in r.Cautions (results.json
// "cautions"); Cautions returns that list when it is set.
func Cautions(r *Results) []string {
	if r == nil {
		return nil
	}
	if len(r.Cautions) > 0 {
		return r.Cautions
	}
	return CautionsWith(r, nil)
}

// CautionsWith builds the list of Cautions for r with the warnings rec of
// the measured record the run followed (nil for none).
func CautionsWith(r *Results, rec []string) []string {
	if r.Kind != Ground {
		if r.Steady.CombinedMethod != nil {
			return []string{wallModelCaution, wallMixCaution, wallMaterialCaution}
		}
		return []string{wallModelCaution, wallMaterialCaution}
	}
	out := []string{frostCaution, boundCaution}
	if f := r.Frost; f != nil && r.Simulation != nil && f.MaxFrostDepth_m != nil && *f.MaxFrostDepth_m > 0 {
		for _, c := range []struct {
			name  string
			depth *float64
		}{{"modified Berggren", f.ModifiedBerggrenDepth_m}, {"Stefan", f.StefanDepth_m}} {
			if c.depth != nil && *c.depth > 0 && *c.depth < *f.MaxFrostDepth_m {
				out = append(out, fmt.Sprintf("In this run the %s depth (%.2f m) is below the simulated frost depth (%.2f m): a closed form is not a conservative bound.", c.name, *c.depth, *f.MaxFrostDepth_m))
			}
		}
	}
	out = append(out, groundModelCaution)
	for _, w := range rec {
		out = append(out, "Record: "+w+".")
	}
	return out
}
