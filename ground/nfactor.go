package ground

import (
	"fmt"
	"strings"
)

// NFactors are the ratios of a surface freezing (thawing) index to the air
// freezing (thawing) index for one kind of ground surface: surface index =
// n x air index.
//
// Values from UFC 3-130-04 (TM 5-852-4), Table 4-1, "n-Factors for Freeze
// and Thaw (Ratio of Surface Index to Air Index)"; the table's general note:
// surface exposed directly to sun and/or air without any overlying dust,
// soil, snow or ice, except as noted otherwise, and with no building heat
// involved. Where the table gives a range for thawing ("1.6 to 2+"),
// ThawingMin and ThawingMax hold its ends and ThawingOpen says the upper end
// is open ("2+"): the user must choose the value. Where it gives none, the
// thawing factors are 0 and HasThawing is false. The table's lettered
// footnotes on the ranges and on the tree-covered freezing value were not
// seen and are not reproduced.
type NFactors struct {
	Surface     string  // key, e.g. "turf"
	Description string  // the table's surface type
	Freezing    float64 // freezing n-factor
	HasThawing  bool    // false: the table gives no thawing n-factor
	ThawingMin  float64 // thawing n-factor, or the low end of the range
	ThawingMax  float64 // thawing n-factor, or the high end of the range
	ThawingOpen bool    // the high end is open ("2+")
	Source      string
}

// Thawing returns the single thawing n-factor of the surface, and false
// when the table gives a range or no value (the user must then supply one).
func (n NFactors) Thawing() (float64, bool) {
	if !n.HasThawing || n.ThawingOpen || n.ThawingMin != n.ThawingMax {
		return 0, false
	}
	return n.ThawingMin, true
}

const nFactorSource = "UFC 3-130-04 (TM 5-852-4) Table 4-1 [read]"

var nFactors = []NFactors{
	{Surface: "snow", Description: "snow surface", Freezing: 1.0},
	{Surface: "concrete", Description: "Portland cement concrete", Freezing: 0.75, HasThawing: true, ThawingMin: 1.5, ThawingMax: 1.5},
	{Surface: "asphalt", Description: "bituminous pavement", Freezing: 0.7, HasThawing: true, ThawingMin: 1.6, ThawingMax: 2, ThawingOpen: true},
	{Surface: "bare-soil", Description: "bare soil", Freezing: 0.7, HasThawing: true, ThawingMin: 1.4, ThawingMax: 2, ThawingOpen: true},
	{Surface: "shaded", Description: "shaded surface", Freezing: 0.9, HasThawing: true, ThawingMin: 1.0, ThawingMax: 1.0},
	{Surface: "turf", Description: "turf", Freezing: 0.5, HasThawing: true, ThawingMin: 0.8, ThawingMax: 0.8},
	{Surface: "tree-covered", Description: "tree-covered", Freezing: 0.3, HasThawing: true, ThawingMin: 0.4, ThawingMax: 0.4},
}

func init() {
	for i := range nFactors {
		nFactors[i].Source = nFactorSource
	}
}

// NFactor returns the n-factors of a surface by key: "snow", "concrete",
// "asphalt", "bare-soil", "shaded", "turf" or "tree-covered" (case and
// spaces ignored; "_" and " " count as "-").
func NFactor(surface string) (NFactors, bool) {
	key := strings.ToLower(strings.TrimSpace(surface))
	key = strings.NewReplacer("_", "-", " ", "-").Replace(key)
	for _, n := range nFactors {
		if n.Surface == key {
			return n, true
		}
	}
	return NFactors{}, false
}

// Surfaces lists the n-factors of every surface NFactor knows, in table
// order. The slice is a copy.
func Surfaces() []NFactors {
	return append([]NFactors(nil), nFactors...)
}

// SurfaceIndex converts an air freezing or thawing index (K day, >= 0) to
// a surface index with the n-factor n (> 0): surface index = n x air index
// (UFC 3-130-04 section 4).
func SurfaceIndex(airIndex, n float64) (float64, error) {
	if !finite(airIndex) || airIndex < 0 {
		return 0, fmt.Errorf("air index must be a degree-day total >= 0, got %g K day", airIndex)
	}
	if !finite(n) || n <= 0 {
		return 0, fmt.Errorf("n-factor must be positive, got %g", n)
	}
	return n * airIndex, nil
}
