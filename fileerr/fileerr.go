// Package fileerr is the error of a mistake in an input file (a scenario
// or a CSV record), located by file, line and key, with the cause it came
// from. The scenario decoder and the CSV reader share it, so a mistake
// prints the same way wherever it was found:
//
//	file:line: key: message: cause
//
// and errors.As and errors.Is see through it to the cause (Unwrap), as
// with encoding/csv's ParseError. A List holds several mistakes of one file
// (tempstack check reports them all, each on its own line).
package fileerr

import (
	"errors"
	"fmt"
	"strings"
)

// Error is one mistake in an input file.
type Error struct {
	File string // the file as given (or a name such as "(embedded demo)")
	Line int    // 1-based line; 0 when the mistake is not tied to a line
	// Key says where in the line: the dotted key path of a scenario
	// ("layers[2].thickness"), `column "air"` in a CSV file; may be empty.
	Key string
	Msg string // what is wrong; may be empty when Err says it all
	Err error  // the cause; may be nil
}

// Error formats the mistake as "file:line: key: message: cause", leaving
// out the parts that are unknown.
func (e *Error) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	if e.Line > 0 {
		fmt.Fprintf(&b, ":%d", e.Line)
	}
	if e.Key != "" {
		b.WriteString(": ")
		b.WriteString(e.Key)
	}
	b.WriteString(": ")
	b.WriteString(e.Msg)
	if e.Err != nil {
		if e.Msg != "" {
			b.WriteString(": ")
		}
		b.WriteString(e.Err.Error())
	}
	return b.String()
}

// Unwrap returns the cause.
func (e *Error) Unwrap() error { return e.Err }

// List is several mistakes of one input, in the order they were found.
type List []*Error

// Error prints one mistake per line.
func (l List) Error() string {
	lines := make([]string, len(l))
	for i, e := range l {
		lines[i] = e.Error()
	}
	return strings.Join(lines, "\n")
}

// Unwrap returns the mistakes, so that errors.As finds the first *Error.
func (l List) Unwrap() []error {
	out := make([]error, len(l))
	for i, e := range l {
		out[i] = e
	}
	return out
}

// Err returns nil for an empty list, the one *Error of a list of one, and
// the list otherwise.
func (l List) Err() error {
	switch len(l) {
	case 0:
		return nil
	case 1:
		return l[0]
	}
	return l
}

// All returns the mistakes err holds: the items of a List, the one *Error
// of any other error that wraps one, or nil when err holds none.
func All(err error) []*Error {
	var l List
	if errors.As(err, &l) {
		return l
	}
	var e *Error
	if errors.As(err, &e) {
		return []*Error{e}
	}
	return nil
}
