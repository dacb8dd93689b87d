package fileerr

import (
	"errors"
	"io/fs"
	"strconv"
	"testing"
)

func TestErrorFormat(t *testing.T) {
	cause := strconv.ErrSyntax
	tests := []struct {
		e    Error
		want string
	}{
		{Error{File: "a.yaml", Line: 3, Key: "layers[1].thickness", Msg: "must be positive"}, "a.yaml:3: layers[1].thickness: must be positive"},
		{Error{File: "a.yaml", Msg: "file is empty"}, "a.yaml: file is empty"},
		{Error{File: "r.csv", Line: 4, Key: `column "air"`, Msg: `cannot read "x"`, Err: cause}, `r.csv:4: column "air": cannot read "x": invalid syntax`},
		{Error{File: "r.csv", Line: 2, Err: cause}, "r.csv:2: invalid syntax"},
	}
	for _, tc := range tests {
		if got := tc.e.Error(); got != tc.want {
			t.Errorf("got %q, want %q", got, tc.want)
		}
	}
}

func TestUnwrap(t *testing.T) {
	e := &Error{File: "x", Line: 1, Msg: "cannot open", Err: fs.ErrNotExist}
	if !errors.Is(e, fs.ErrNotExist) {
		t.Error("errors.Is does not see the cause")
	}
	l := List{{File: "x", Line: 2, Msg: "first"}, e}
	var got *Error
	if !errors.As(l, &got) || got.Msg != "first" {
		t.Errorf("errors.As on a list found %v, want the first mistake", got)
	}
	if !errors.Is(l, fs.ErrNotExist) {
		t.Error("errors.Is does not see a cause inside a list")
	}
	if l.Error() != "x:2: first\nx:1: cannot open: file does not exist" {
		t.Errorf("list prints %q", l.Error())
	}
}

func TestListErrAndAll(t *testing.T) {
	if (List{}).Err() != nil {
		t.Error("an empty list is an error")
	}
	one := &Error{File: "x", Msg: "m"}
	if err := (List{one}).Err(); err != one {
		t.Errorf("a list of one gives %T, want the *Error", err)
	}
	two := List{one, one}
	if len(All(two.Err())) != 2 || len(All(one)) != 1 || All(errors.New("plain")) != nil {
		t.Error("All does not return the mistakes an error holds")
	}
	if len(All(fmtWrap{two})) != 2 {
		t.Error("All does not see a wrapped list")
	}
}

type fmtWrap struct{ err error }

func (w fmtWrap) Error() string { return "wrapped: " + w.err.Error() }
func (w fmtWrap) Unwrap() error { return w.err }
