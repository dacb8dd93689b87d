// Package layers describes what a building component or a ground column is
// made of: quantities with units, a built-in library of building materials
// with a cited source for every value, layers, constructions, steady thermal
// resistance and U-value (ISO 6946), and the derived properties that tell how
// fast a temperature swing travels into a layer (diffusivity, effusivity,
// periodic penetration depth).
//
// Everything inside the package is in SI units: metres, W/(m K), kg/m3,
// J/(kg K), J/(m3 K), J/m3, m2 K/W, W/m2, seconds. Temperatures are in
// degrees Celsius. Conversions happen only in ParseQuantity (input) and
// FormatQuantity / ConvertTo (output).
//
// # Writing quantities
//
// ParseQuantity reads the text a user writes for a value of a given Kind:
//
//   - A bare number is in the default unit of its kind: "0.105" is 0.105 m
//     for a Length, "0.7" is 0.7 W/(m K) for a Conductivity, "24" is 24 hours
//     for a Duration or Period (hours, not seconds), "0.12" is 0.12 for a
//     Fraction, "12" is 12 degC for a Temperature.
//   - A number followed by a unit, with or without a space, carries its unit:
//     "105 mm", "105mm", "4 in", "30min", "3y", "1.2 kJ/(kg K)", "-5 °C",
//     "12 %".
//   - Units are case-sensitive where case carries meaning ("mW/m2" is not
//     "MW/m2"); otherwise a unit written in another case is accepted when it
//     matches exactly one known unit ("MM" reads as "mm").
//   - Within a unit, spaces, "·", "*", "^", "." and brackets are ignored,
//     and "²", "³" read as "2", "3": "W/(m K)", "W/(m·K)", "W/mK", "W m^-1 K^-1" and
//     "W/m/K" are the same unit, as are "kg/m3", "kg/m^3" and "kg/m³".
//   - A year ("y") is 365 days, a week ("w") 7 days, a day ("d") 24 hours.
//   - Imperial units use the exact definitions of the international yard and
//     pound agreement (1959) and NIST SP 811: 1 in = 0.0254 m, 1 ft =
//     0.3048 m, 1 lb = 0.45359237 kg, so 1 pcf (lb/ft3) = 16.018463 kg/m3; the
//     British thermal unit is the International Table Btu, 1055.05585262 J.
//   - A Temperature in "K" is converted with -273.15 and one in "F" with
//     (F - 32) * 5/9. A TemperatureDifference has no offset: 1 K = 1 degC
//     and 1 degF difference = 5/9 K.
//   - The text must hold one finite number and at most one unit. Empty text,
//     NaN, Inf, a number too large for float64, a decimal comma ("1,5"), two
//     numbers ("1 2") and any unknown unit are errors.
//
// An error names the kind of value expected and, for a unit it does not
// know, lists the accepted units:
//
//	unknown unit "mmm" for a length; use m, mm, cm, in or ft
//
// ParseQuantity does not check the range of a value (a negative thickness is
// still parsed); whoever uses the value decides what is possible.
//
// # Materials
//
// Lookup, Materials and Filter give the built-in material library. Each
// Material names the source of its values with a tag, as the project's
// reference notes do: [read] seen in the source named, [2nd-hand] quoted
// from it by another document, [memory] recalled and to be checked before
// relying on it. Suggest and Closest offer did-you-mean corrections for
// misspelt keys.
//
// # Constructions
//
// A Construction lists its Layers from the outside in. Its
// ThermalResistance, TotalResistance and UValue follow ISO 6946 for
// thermally homogeneous layers; SurfaceResistances gives the conventional
// surface resistances of ISO 6946 for a wall, roof or floor. Column turns a
// construction into the solver's input.
package layers
