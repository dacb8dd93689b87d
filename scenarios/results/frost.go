package results

import (
	"fmt"
	"math"
	"strings"
)

// IndexOrigin names where the air freezing index of the closed forms came
// from.
type IndexOrigin string

// The origins of the air freezing index.
const (
	FromForcing   IndexOrigin = "forcing"          // one winter of a harmonic forcing
	FromDesign    IndexOrigin = "design"           // analysis.design_freezing_index
	FromSimulated IndexOrigin = "simulated period" // the cold time of the simulated period (a step or a constant)
	FromRecord    IndexOrigin = "record"           // the complete winters of a measured record
)

// IndexSource says which air freezing index the closed forms used. In
// results.json it is one string: the origin, and for a record
// "record: " and how the index was taken from its winters.
type IndexSource struct {
	Origin IndexOrigin
	// Record only: how many of the coldest complete winters were
	// averaged (3 for a design index; 1 for a record with fewer than 3),
	// out of how many, and the label of the coldest one.
	Coldest, Winters int
	ColdestLabel     string
}

// String returns the text of results.json "index_source".
func (s IndexSource) String() string {
	if s.Origin != FromRecord {
		return string(s.Origin)
	}
	if s.Coldest >= 3 {
		return fmt.Sprintf("record: mean of the %d coldest of %d complete winters", s.Coldest, s.Winters)
	}
	return fmt.Sprintf("record: the coldest of %d complete winters (%s; a design index needs 3)", s.Winters, s.ColdestLabel)
}

// Detail is the text after "record: " for a record, else "".
func (s IndexSource) Detail() string {
	d, _ := strings.CutPrefix(s.String(), "record: ")
	if s.Origin != FromRecord {
		return ""
	}
	return d
}

// MarshalText writes the source as String does.
func (s IndexSource) MarshalText() ([]byte, error) { return []byte(s.String()), nil }

// UnmarshalText reads the text String writes.
func (s *IndexSource) UnmarshalText(b []byte) error {
	text := string(b)
	switch {
	case text == "":
		*s = IndexSource{}
	case strings.HasPrefix(text, "record: mean of the "):
		*s = IndexSource{Origin: FromRecord}
		if _, err := fmt.Sscanf(text, "record: mean of the %d coldest of %d complete winters", &s.Coldest, &s.Winters); err != nil {
			return fmt.Errorf("index source %q: %v", text, err)
		}
	case strings.HasPrefix(text, "record: the coldest of "):
		*s = IndexSource{Origin: FromRecord, Coldest: 1}
		rest := strings.TrimPrefix(text, "record: the coldest of ")
		n, label, ok := strings.Cut(rest, " complete winters (")
		if _, err := fmt.Sscanf(n, "%d", &s.Winters); err != nil || !ok {
			return fmt.Errorf("index source %q: not understood", text)
		}
		s.ColdestLabel = strings.TrimSuffix(label, "; a design index needs 3)")
	case text == string(FromForcing) || text == string(FromDesign) || text == string(FromSimulated):
		*s = IndexSource{Origin: IndexOrigin(text)}
	default:
		return fmt.Errorf("index source %q: not understood", text)
	}
	return nil
}

// SurfaceIndexUsed returns the surface freezing index (degC day) the
// closed forms used: the freezing n-factor times the design air index when
// one was given, else SurfaceFreezingIndex_Cd; nil when there is none.
// Surface index = n x air index (UFC 3-130-04, Table 4-1, "Ratio of
// Surface Index to Air Index" [2nd-hand], as in package ground).
func (f *Frost) SurfaceIndexUsed() *float64 {
	if f.IndexSource.Origin == FromDesign && f.DesignFreezingIndex_Cd != nil {
		v := f.NFactorFreezing * *f.DesignFreezingIndex_Cd
		return &v
	}
	return f.SurfaceFreezingIndex_Cd
}

// HalfSpaceFluxAt returns the heat flux (W/m2, into the surface) at time t
// (s) after the step into a semi-infinite body of the surface layer:
// q = b dT / sqrt(pi t) (Incropera et al., Fundamentals of Heat and Mass
// Transfer, section 5.7, eq. 5.58 [derived]), b the effusivity.
func (s *StepResult) HalfSpaceFluxAt(t float64) float64 {
	return s.SurfaceEffusivity_Ws05_m2K * s.Change_K / math.Sqrt(math.Pi*t)
}
