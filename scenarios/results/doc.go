// Package results holds what a run of a scenario produces and its
// encoders: the Results type (the numbers of results.json, keys carrying
// their units) with its chart series, the cautions that go with it, and
// the CSV writer. The report writer is package charts; both it and the
// command depend on this package only, not on the decoder or the runners
// of package scenarios.
//
// Conventions: values are in the units their names carry (…_m, …_h, …_C,
// …_W_m2K), converted from SI at the end of a run; heat flux is positive
// from outside to inside (downward in the ground); a value that was not
// computed is nil (null in results.json), never 0.
package results
