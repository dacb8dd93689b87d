// Package ground holds what tempstack knows about soil and rock: thermal
// properties of soils from their texture, dry density and water content
// (Kersten and Johansen conductivity models, heat capacity, latent heat),
// built-in soil and rock presets, surface n-factors, closed-form frost and
// thaw depth estimates (Stefan, modified Berggren, layered modified
// Berggren), freezing seasons and frost-depth inputs of periodic and
// measured climates (degree-days of records are in package climate), the
// periodic ground temperature of Kusuda and Achenbach, and the soil
// diffusivity read from temperature waves measured at two depths
// (DiffusivityFromHarmonics) or fitted to temperatures logged at several
// depths by harmonic methods and by a numerical inversion of the heat
// equation (FitDiffusivity).
//
// Conventions:
//   - SI units inside: m, s, kg/m3, W/(m K), J/(m3 K), J/m3, degrees Celsius.
//     The one exception is the trade's unit for freezing and thawing indices,
//     the degree-day: an index is in K day (= degC day), and a time step or a
//     period given as an argument is in seconds unless its name ends in Days.
//   - Water content is the mass of water per mass of dry solids, a fraction
//     (0.12 for 12 %), not a percentage.
//   - Depth z is positive downward from the ground surface.
//   - A freezing index counts degree-days below the threshold (0 degC unless
//     stated) and is positive; a thawing index counts degree-days above it
//     and is positive.
//
// Caution: the closed forms here give estimates, and they tend to
// overestimate frost depth. Local measured frost depths and local records are
// better evidence; design frost depths are set by local codes and by a
// licensed engineer, not by this package.
package ground
