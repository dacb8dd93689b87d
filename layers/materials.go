package layers

import (
	"fmt"
	"sort"
	"strings"
)

// Material is one entry of the built-in material library, in SI units.
//
// A massive material has Conductivity, Density and SpecificHeat and zero
// Resistance. An air layer (Family "air") has no conductivity or heat
// capacity of its own: Resistance is its thermal resistance at the
// thickness ResistanceThickness for the direction of heat flow HeatFlow,
// and a layer of another thickness takes its resistance from
// AirLayerResistance.
type Material struct {
	Key    string // kebab-case identifier used in scenario files, e.g. "clay-brick"
	Name   string // human-readable name
	Family string // one of Families(): concrete, masonry, stone, ... (report tinting)
	Source string // where the values come from, with a tag [read], [2nd-hand] or [memory]
	Note   string // caveat for the user, e.g. "use the product's declared value"

	Conductivity float64 // lambda, W/(m K); 0 for air layers
	Density      float64 // rho, kg/m3; 0 for air layers
	SpecificHeat float64 // c, J/(kg K); 0 for air layers

	Resistance          float64     // air layers: thermal resistance, m2 K/W
	ResistanceThickness float64     // air layers: thickness Resistance applies to, m
	HeatFlow            Orientation // air layers: direction of heat flow the Resistance is for
}

// Massless reports whether m stores no heat: an air layer described by a
// thermal resistance instead of conductivity and heat capacity (the same
// meaning as Layer.Massless and solver.Layer.Massless).
func (m Material) Massless() bool { return m.Resistance > 0 }

// HeatCapacity is the volumetric heat capacity rho*c of m, J/(m3 K).
func (m Material) HeatCapacity() float64 { return m.Density * m.SpecificHeat }

// Diffusivity is the thermal diffusivity lambda/(rho c) of m, m2/s; 0 for
// an air layer.
func (m Material) Diffusivity() float64 {
	if m.Massless() || m.HeatCapacity() == 0 {
		return 0
	}
	return m.Conductivity / m.HeatCapacity()
}

// The families a Material belongs to, in the order Materials sorts them.
const (
	FamilyConcrete   = "concrete"
	FamilyMasonry    = "masonry"
	FamilyStone      = "stone"
	FamilyPlaster    = "plaster"
	FamilyBoard      = "board"
	FamilyTimber     = "timber"
	FamilyInsulation = "insulation"
	FamilyMetal      = "metal"
	FamilyGlass      = "glass"
	FamilyLiquid     = "liquid"
	FamilyAir        = "air"
	FamilyOther      = "other"
)

var familyOrder = []string{
	FamilyConcrete, FamilyMasonry, FamilyStone, FamilyPlaster, FamilyBoard, FamilyTimber,
	FamilyInsulation, FamilyMetal, FamilyGlass, FamilyLiquid, FamilyAir, FamilyOther,
}

// Families returns the material families in display order.
func Families() []string { return append([]string(nil), familyOrder...) }

func familyRank(f string) int {
	for i, g := range familyOrder {
		if g == f {
			return i
		}
	}
	return len(familyOrder)
}

// Sources of the library values. The tag says how the value reached this
// table: [read] seen in the source named, [2nd-hand] quoted from that source
// by another document, [memory] recalled and to be checked. A value seen
// only as quoted by another document is [2nd-hand], never [read].
const (
	srcISO10456Quoted = "ISO 10456:2007 Table 3 [2nd-hand; memory agrees]"
	srcWaterIce       = "CRC Handbook of Chemistry and Physics, properties of water and ice, rounded [memory]"
	srcISO10456       = "ISO 10456:2007 Table 3 [memory]"
	srcISO10456Ins    = "conductivity: typical declared value of current products, common practice [memory]; specific heat: ISO 10456:2007 [memory]"
	srcEN12524        = "ISO 10456:2007 Table 3, the values of EN 12524:2000 it took over [memory]"
	srcCIBSE336       = "CIBSE Guide A, Table 3.36 (impermeable materials) [read]"
	srcCIBSE337       = "CIBSE Guide A, Table 3.37 (non-hygroscopic materials) [read]"
	srcCIBSEBlock     = "CIBSE Guide A, typical UK values for brickwork and concrete blocks [memory]"
	srcTypical        = "typical value, no single source [memory]; use the product's declared value"
	srcISO6946Air     = "ISO 6946:2007 Table 2, unventilated air layer, high-emissivity faces [memory]"
)

// library is the built-in material table.
//
// To add a material, append one row: a unique kebab-case Key, a Name, one
// of the Family constants, SI values (lambda W/(m K), rho kg/m3, c J/(kg K))
// and a Source naming where the numbers come from with its tag ([read],
// [2nd-hand] or [memory]); never leave Source empty or invent a citation,
// and never cite a web page, an online catalogue or another program.
// An air layer gives Resistance (m2 K/W), ResistanceThickness (m) and
// HeatFlow instead. TestLibrary checks every row.
var library = []Material{
	// Concrete.
	{Key: "concrete", Name: "Concrete, high density (2400 kg/m3)", Family: FamilyConcrete, Conductivity: 2.0, Density: 2400, SpecificHeat: 1000, Source: srcISO10456},
	{Key: "concrete-medium", Name: "Concrete, medium density (2000 kg/m3)", Family: FamilyConcrete, Conductivity: 1.35, Density: 2000, SpecificHeat: 1000, Source: srcISO10456},
	{Key: "reinforced-concrete", Name: "Reinforced concrete", Family: FamilyConcrete, Conductivity: 2.3, Density: 2400, SpecificHeat: 1000, Source: "ISO 10456:2007 Table 3, reinforced concrete: conductivity 2.3 W/(m K) as for 1 % steel, density 2400 kg/m3 and specific heat 1000 J/(kg K) as for 2 % steel [memory]"},
	{Key: "lightweight-concrete", Name: "Lightweight aggregate concrete (1400 kg/m3)", Family: FamilyConcrete, Conductivity: 0.57, Density: 1400, SpecificHeat: 1000, Source: srcTypical},
	{Key: "aerated-concrete", Name: "Autoclaved aerated concrete (500 kg/m3)", Family: FamilyConcrete, Conductivity: 0.14, Density: 500, SpecificHeat: 1000, Source: srcTypical, Note: "AAC varies with density and moisture: 0.09 to 0.20 W/(m K)"},
	{Key: "screed", Name: "Cement-sand screed", Family: FamilyConcrete, Conductivity: 1.4, Density: 2000, SpecificHeat: 1000, Source: srcTypical},

	// Masonry.
	{Key: "clay-brick", Name: "Clay brickwork, solid (exposed outer leaf)", Family: FamilyMasonry, Conductivity: 0.77, Density: 1700, SpecificHeat: 1000, Source: srcCIBSEBlock},
	{Key: "clay-brick-protected", Name: "Clay brickwork, solid (protected inner leaf)", Family: FamilyMasonry, Conductivity: 0.56, Density: 1700, SpecificHeat: 1000, Source: srcCIBSEBlock},
	{Key: "perforated-clay-block", Name: "Clay block, vertically perforated", Family: FamilyMasonry, Conductivity: 0.30, Density: 900, SpecificHeat: 1000, Source: srcTypical, Note: "equivalent conductivity of the block; products range from 0.07 to 0.45 W/(m K)"},
	{Key: "calcium-silicate-brick", Name: "Calcium silicate brickwork", Family: FamilyMasonry, Conductivity: 0.90, Density: 1800, SpecificHeat: 1000, Source: srcTypical},
	{Key: "concrete-block-dense", Name: "Concrete block, dense aggregate", Family: FamilyMasonry, Conductivity: 1.63, Density: 2300, SpecificHeat: 1000, Source: srcCIBSEBlock},
	{Key: "concrete-block-medium", Name: "Concrete block, medium density", Family: FamilyMasonry, Conductivity: 0.51, Density: 1400, SpecificHeat: 1000, Source: srcCIBSEBlock},
	{Key: "concrete-block-light", Name: "Concrete block, lightweight", Family: FamilyMasonry, Conductivity: 0.19, Density: 600, SpecificHeat: 1000, Source: srcCIBSEBlock},
	{Key: "concrete-block-hollow", Name: "Concrete block, hollow dense aggregate", Family: FamilyMasonry, Conductivity: 1.0, Density: 1200, SpecificHeat: 1000, Source: srcTypical, Note: "equivalent conductivity and gross density of the block"},

	// Natural stone.
	{Key: "granite", Name: "Granite", Family: FamilyStone, Conductivity: 2.8, Density: 2600, SpecificHeat: 1000, Source: srcISO10456},
	{Key: "limestone", Name: "Limestone, hard", Family: FamilyStone, Conductivity: 1.7, Density: 2200, SpecificHeat: 1000, Source: srcISO10456},
	{Key: "sandstone", Name: "Sandstone (silica)", Family: FamilyStone, Conductivity: 2.3, Density: 2600, SpecificHeat: 1000, Source: srcISO10456},
	{Key: "marble", Name: "Marble", Family: FamilyStone, Conductivity: 3.5, Density: 2800, SpecificHeat: 1000, Source: srcISO10456},
	{Key: "slate", Name: "Slate", Family: FamilyStone, Conductivity: 2.2, Density: 2400, SpecificHeat: 1000, Source: srcISO10456},

	// Renders and plasters.
	{Key: "lime-plaster", Name: "Lime-sand plaster", Family: FamilyPlaster, Conductivity: 0.80, Density: 1600, SpecificHeat: 1000, Source: srcISO10456},
	{Key: "gypsum-plaster", Name: "Gypsum plaster", Family: FamilyPlaster, Conductivity: 0.57, Density: 1300, SpecificHeat: 1000, Source: srcISO10456},
	{Key: "cement-render", Name: "Cement-sand render", Family: FamilyPlaster, Conductivity: 1.0, Density: 1800, SpecificHeat: 1000, Source: srcISO10456},

	// Boards.
	{Key: "gypsum-board", Name: "Gypsum plasterboard (900 kg/m3)", Family: FamilyBoard, Conductivity: 0.25, Density: 900, SpecificHeat: 1000, Source: srcISO10456},
	{Key: "gypsum-fibre-board", Name: "Gypsum fibre board", Family: FamilyBoard, Conductivity: 0.32, Density: 1000, SpecificHeat: 1100, Source: srcTypical},
	{Key: "osb", Name: "Oriented strand board (OSB, 650 kg/m3)", Family: FamilyBoard, Conductivity: 0.13, Density: 650, SpecificHeat: 1700, Source: srcISO10456},
	{Key: "plywood", Name: "Plywood (500 kg/m3)", Family: FamilyBoard, Conductivity: 0.13, Density: 500, SpecificHeat: 1600, Source: srcISO10456},
	{Key: "particleboard", Name: "Particleboard (600 kg/m3)", Family: FamilyBoard, Conductivity: 0.14, Density: 600, SpecificHeat: 1700, Source: srcISO10456},
	{Key: "fibreboard", Name: "Fibreboard incl. MDF (600 kg/m3)", Family: FamilyBoard, Conductivity: 0.14, Density: 600, SpecificHeat: 1700, Source: srcISO10456},

	// Timber.
	{Key: "softwood", Name: "Softwood timber (500 kg/m3)", Family: FamilyTimber, Conductivity: 0.13, Density: 500, SpecificHeat: 1600, Source: srcISO10456Quoted},
	{Key: "softwood-light", Name: "Softwood construction timber (450 kg/m3)", Family: FamilyTimber, Conductivity: 0.12, Density: 450, SpecificHeat: 1600, Source: srcISO10456},
	{Key: "hardwood", Name: "Hardwood timber (700 kg/m3)", Family: FamilyTimber, Conductivity: 0.18, Density: 700, SpecificHeat: 1600, Source: srcEN12524},

	// Insulation. Declared values differ between products: the row is a
	// starting point, the product's declared value governs.
	{Key: "mineral-wool", Name: "Mineral wool (stone wool slab)", Family: FamilyInsulation, Conductivity: 0.036, Density: 40, SpecificHeat: 1030, Source: srcISO10456Ins},
	{Key: "glass-wool", Name: "Glass wool (20 kg/m3)", Family: FamilyInsulation, Conductivity: 0.035, Density: 20, SpecificHeat: 1030, Source: srcISO10456Ins},
	{Key: "mineral-wool-light", Name: "Mineral wool batt, declared 0.035 (20 kg/m3)", Family: FamilyInsulation, Conductivity: 0.035, Density: 20, SpecificHeat: 1030, Source: srcISO10456Ins},
	{Key: "eps", Name: "Expanded polystyrene (EPS)", Family: FamilyInsulation, Conductivity: 0.035, Density: 20, SpecificHeat: 1450, Source: srcISO10456Ins},
	{Key: "xps", Name: "Extruded polystyrene (XPS)", Family: FamilyInsulation, Conductivity: 0.034, Density: 35, SpecificHeat: 1450, Source: srcISO10456Ins},
	{Key: "pur", Name: "Polyurethane foam board (PUR)", Family: FamilyInsulation, Conductivity: 0.028, Density: 30, SpecificHeat: 1470, Source: srcCIBSE337},
	{Key: "pir", Name: "Polyisocyanurate board (PIR), foil faced", Family: FamilyInsulation, Conductivity: 0.022, Density: 32, SpecificHeat: 1400, Source: srcISO10456Ins},
	{Key: "phenolic-foam", Name: "Phenolic foam", Family: FamilyInsulation, Conductivity: 0.040, Density: 30, SpecificHeat: 1400, Source: srcCIBSE337},
	{Key: "wood-fibre", Name: "Wood fibre insulation board", Family: FamilyInsulation, Conductivity: 0.040, Density: 160, SpecificHeat: 2100, Source: srcTypical},
	{Key: "cellulose", Name: "Cellulose fibre, blown", Family: FamilyInsulation, Conductivity: 0.040, Density: 50, SpecificHeat: 2000, Source: srcTypical},
	{Key: "cork", Name: "Expanded cork board", Family: FamilyInsulation, Conductivity: 0.040, Density: 120, SpecificHeat: 1560, Source: srcTypical},
	{Key: "cellular-glass", Name: "Cellular (foam) glass", Family: FamilyInsulation, Conductivity: 0.052, Density: 140, SpecificHeat: 840, Source: srcCIBSE336},

	// Metals.
	{Key: "steel", Name: "Steel", Family: FamilyMetal, Conductivity: 50, Density: 7800, SpecificHeat: 450, Source: srcISO10456Quoted},
	{Key: "stainless-steel", Name: "Stainless steel", Family: FamilyMetal, Conductivity: 17, Density: 7900, SpecificHeat: 460, Source: srcEN12524},
	{Key: "aluminium", Name: "Aluminium alloy", Family: FamilyMetal, Conductivity: 160, Density: 2800, SpecificHeat: 880, Source: srcEN12524},
	{Key: "copper", Name: "Copper", Family: FamilyMetal, Conductivity: 380, Density: 8900, SpecificHeat: 380, Source: srcEN12524},

	// Glass.
	{Key: "glass", Name: "Glass, soda-lime", Family: FamilyGlass, Conductivity: 1.0, Density: 2500, SpecificHeat: 750, Source: srcEN12524},

	// Water and its solid forms.
	{Key: "water", Name: "Water (about 10 degC)", Family: FamilyLiquid, Conductivity: 0.60, Density: 1000, SpecificHeat: 4190, Source: srcWaterIce},
	{Key: "ice", Name: "Ice (about -10 degC)", Family: FamilyOther, Conductivity: 2.30, Density: 920, SpecificHeat: 2000, Source: srcWaterIce},
	{Key: "snow", Name: "Snow, soft (200 kg/m3)", Family: FamilyOther, Conductivity: 0.12, Density: 200, SpecificHeat: 2000, Source: srcISO10456},
	{Key: "snow-compacted", Name: "Snow, compacted (500 kg/m3)", Family: FamilyOther, Conductivity: 0.60, Density: 500, SpecificHeat: 2000, Source: srcISO10456},

	// Other.
	{Key: "asphalt", Name: "Asphalt, poured", Family: FamilyOther, Conductivity: 1.20, Density: 2100, SpecificHeat: 920, Source: srcCIBSE336},
	{Key: "roofing-felt", Name: "Roofing felt", Family: FamilyOther, Conductivity: 0.19, Density: 960, SpecificHeat: 840, Source: srcCIBSE336},
	{Key: "ceramic-tile", Name: "Ceramic, glazed (tiles)", Family: FamilyOther, Conductivity: 1.40, Density: 2500, SpecificHeat: 840, Source: srcCIBSE336},

	// Unventilated air layers, surfaces of high emissivity; Resistance at
	// 25 mm. A layer of another thickness uses AirLayerResistance.
	{Key: "air-gap-wall", Name: "Unventilated air layer, horizontal heat flow (wall)", Family: FamilyAir, Resistance: 0.18, ResistanceThickness: 0.025, HeatFlow: Wall, Source: srcISO6946Air},
	{Key: "air-gap-roof", Name: "Unventilated air layer, upward heat flow (roof, ceiling)", Family: FamilyAir, Resistance: 0.16, ResistanceThickness: 0.025, HeatFlow: Roof, Source: srcISO6946Air},
	{Key: "air-gap-floor", Name: "Unventilated air layer, downward heat flow (floor)", Family: FamilyAir, Resistance: 0.19, ResistanceThickness: 0.025, HeatFlow: Floor, Source: srcISO6946Air},
}

var (
	libraryIndex  map[string]int
	libraryKeys   []string
	librarySorted []Material
)

func init() {
	libraryIndex = make(map[string]int, len(library))
	for i, m := range library {
		if _, dup := libraryIndex[m.Key]; dup {
			panic(fmt.Sprintf("layers: material key %q listed twice", m.Key))
		}
		libraryIndex[m.Key] = i
		libraryKeys = append(libraryKeys, m.Key)
	}
	sort.Strings(libraryKeys)
	librarySorted = append([]Material(nil), library...)
	sort.SliceStable(librarySorted, func(i, j int) bool {
		a, b := librarySorted[i], librarySorted[j]
		if ra, rb := familyRank(a.Family), familyRank(b.Family); ra != rb {
			return ra < rb
		}
		return a.Key < b.Key
	})
}

// normaliseKey folds case and treats spaces and underscores as hyphens, so
// "Clay Brick" and "clay_brick" find "clay-brick".
func normaliseKey(key string) string {
	k := strings.ToLower(strings.TrimSpace(key))
	k = strings.Join(strings.FieldsFunc(k, func(r rune) bool { return r == ' ' || r == '_' || r == '-' || r == '\t' }), "-")
	return k
}

// Lookup returns the library material with the given key. Case, spaces and
// underscores are forgiven ("Clay Brick" finds "clay-brick").
func Lookup(key string) (Material, bool) {
	i, ok := libraryIndex[normaliseKey(key)]
	if !ok {
		return Material{}, false
	}
	return library[i], true
}

// Materials returns a copy of the library sorted by family (in the order of
// Families) and then by key.
func Materials() []Material { return append([]Material(nil), librarySorted...) }

// MaterialKeys returns the keys of all library materials in alphabetical order.
func MaterialKeys() []string { return append([]string(nil), libraryKeys...) }

// Filter returns the library materials whose key, name or family contains
// q, ignoring case, in the order of Materials. An empty q returns all.
func Filter(q string) []Material {
	q = strings.ToLower(strings.TrimSpace(q))
	var out []Material
	for _, m := range librarySorted {
		if q == "" || strings.Contains(m.Key, q) || strings.Contains(strings.ToLower(m.Name), q) || strings.Contains(m.Family, q) {
			out = append(out, m)
		}
	}
	return out
}

// Suggest returns up to three library keys close to a misspelt key,
// closest first ("clay-brik" gives "clay-brick" first). It returns nil if
// nothing is close.
func Suggest(key string) []string {
	return Closest(normaliseKey(key), libraryKeys, 3)
}

// UnknownMaterialError is returned for a material key not in the library.
type UnknownMaterialError struct {
	Key         string
	Suggestions []string // close keys, closest first; may be empty
}

func (e *UnknownMaterialError) Error() string {
	msg := fmt.Sprintf("unknown material %q", e.Key)
	if len(e.Suggestions) > 0 {
		msg += "; did you mean " + quoteList(e.Suggestions) + "?"
	}
	return msg + " (tempstack materials lists them all)"
}

// quoteList writes ["a" "b" "c"] as `"a", "b" or "c"`.
func quoteList(s []string) string {
	q := make([]string, len(s))
	for i, v := range s {
		q[i] = fmt.Sprintf("%q", v)
	}
	if len(q) == 1 {
		return q[0]
	}
	return strings.Join(q[:len(q)-1], ", ") + " or " + q[len(q)-1]
}
