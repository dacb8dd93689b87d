package results

import "strings"

// QuantityInfo says how a study quantity (a key of Summary) is named and
// printed: Words in plain language, Unit as written in results.json key
// suffixes and on the terminal ("" for a ratio), and Decimals for fixed
// notation (-1: three significant digits).
type QuantityInfo struct {
	Words    string
	Unit     string
	Decimals int
}

// quantityInfo lists the quantities the studies know.
var quantityInfo = map[string]QuantityInfo{
	"u_value_W_m2K":                     {"U-value", "W/(m2 K)", -1},
	"decrement_factor":                  {"decrement factor", "", -1},
	"time_shift_h":                      {"time shift", "h", 1},
	"time_shift_unwrapped_h":            {"whole time shift", "h", 1},
	"periodic_transmittance_W_m2K":      {"periodic transmittance", "W/(m2 K)", -1},
	"inside_admittance_W_m2K":           {"inside admittance", "W/(m2 K)", -1},
	"inside_areal_heat_capacity_kJ_m2K": {"inside areal heat capacity", "kJ/(m2 K)", -1},
	"surface_factor":                    {"surface factor", "", -1},
	"max_frost_depth_m":                 {"simulated frost depth", "m", 2},
	"stefan_depth_m":                    {"Stefan depth", "m", 2},
	"modified_berggren_depth_m":         {"modified Berggren depth", "m", 2},
	"freezing_index_Cd":                 {"air freezing index", "degC day", 0},
	"operative_max_C":                   {"peak operative temperature", "degC", 2},
	"air_max_C":                         {"peak room air temperature", "degC", 2},
	"exact_air_max_C":                   {"exact periodic peak air temperature", "degC", 2},
	"hours_above_h":                     {"hours a day above the first threshold", "h", 1},
	"mass_peak_reduction_K":             {"peak lowered by the mass", "K", 2},
}

// Quantity returns how the study quantity key is named and printed. An
// unknown key is named by itself, with the unit its suffix spells.
func Quantity(key string) QuantityInfo {
	if q, ok := quantityInfo[key]; ok {
		return q
	}
	q := QuantityInfo{Words: strings.ReplaceAll(key, "_", " "), Decimals: -1}
	for _, s := range []struct{ suffix, unit string }{
		{"_W_m2K", "W/(m2 K)"}, {"_kJ_m2K", "kJ/(m2 K)"}, {"_Cd", "degC day"}, {"_m", "m"}, {"_h", "h"}, {"_C", "degC"}, {"_K", "K"},
	} {
		if strings.HasSuffix(key, s.suffix) {
			q.Words, q.Unit = strings.ReplaceAll(strings.TrimSuffix(key, s.suffix), "_", " "), s.unit
			break
		}
	}
	return q
}
