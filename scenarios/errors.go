package scenarios

import "tempstack/fileerr"

// Error is a problem in a scenario file (or in a record it names). It
// prints as "file:line: key: message", the one line the command shows a
// user, and unwraps to its cause. The CSV reader of package climate
// returns the same type.
type Error = fileerr.Error
