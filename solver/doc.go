// Package solver holds the numerics of tempstack: the exact periodic
// (transfer-matrix, ISO 13786) solution of a layered column, the transient
// finite-volume solution with latent heat, the mesh they share, and the
// closed-form reference solutions the tests and users call.
//
// Conventions, used by every function in the package:
//   - SI units throughout: metres, seconds, kelvin or degrees Celsius,
//     watts. Conversions to hours, millimetres or kJ belong to the callers.
//   - Position x (or depth z) is measured from the outside surface (for a
//     ground column, the ground surface) into the column. Layers are listed
//     in that order: Layers[0] touches the outside.
//   - A heat flux is positive when it flows in the +x direction, from the
//     outside towards the inside (downward in the ground), unless a doc
//     comment says otherwise.
//   - Periodic quantities use the complex time dependence exp(+i omega t),
//     omega = 2 pi / period: a physical signal is Re(A exp(i omega t)).
//
// solver knows nothing of YAML, files, units or charts; it imports none of
// tempstack's other packages.
package solver
