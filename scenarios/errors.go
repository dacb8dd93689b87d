package scenarios

import (
	"fmt"
	"strings"
)

// Error is a problem in a scenario file. It prints as
// "file:line: key: message", the one line the command shows a user.
type Error struct {
	File string // scenario file as given; "(embedded demo)" style names for built-ins
	Line int    // 1-based; 0 when the problem is not tied to a line
	Key  string // dotted path of the key, e.g. "layers[2].thickness"; may be empty
	Msg  string
}

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
	return b.String()
}
