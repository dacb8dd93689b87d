package scenarios

import (
	"errors"
	"fmt"
	"os"
	"regexp"
	"strings"
	"testing"
)

// TestPeakRangesAgreeWithReadme: the allowed range of annual.peak_day and
// daily.peak_hour that README.md states is the range the decoder's
// message names, and its ends are accepted while a value past them is
// refused.
func TestPeakRangesAgreeWithReadme(t *testing.T) {
	readme, err := os.ReadFile("../README.md")
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct{ block, key string }{{"annual", "peak_day"}, {"daily", "peak_hour"}} {
		m := regexp.MustCompile(tc.key + `: (\d+)–(\d+)`).FindSubmatch(readme)
		if m == nil {
			t.Fatalf("README.md states no range `%s: A–B`", tc.key)
		}
		lo, hi := string(m[1]), string(m[2])
		doc := func(v string) string {
			return fmt.Sprintf("title: x\nkind: wall\nlayers:\n  - material: clay-brick\n    thickness: 0.1\noutside:\n  temperature: {mean: 5, %s: {amplitude: 10, %s: %s}}\n", tc.block, tc.key, v)
		}
		for _, v := range []string{lo, hi} {
			if _, err := Decode("x.yaml", []byte(doc(v))); err != nil {
				t.Errorf("%s: %s (an end of the README range) refused: %v", tc.key, v, err)
			}
		}
		_, err := Decode("x.yaml", []byte(doc(hi+".5")))
		if err == nil {
			t.Fatalf("%s: %s.5 accepted", tc.key, hi)
		}
		if want := fmt.Sprintf("between %s and %s", lo, hi); !strings.Contains(err.Error(), want) {
			t.Errorf("%s: message %q does not say %q (README.md)", tc.key, err, want)
		}
	}
}

// TestMisindentedKeyLine: yaml.v3 reports a mis-indented key at the line
// where its block starts; the decoder names the offending line itself.
func TestMisindentedKeyLine(t *testing.T) {
	head := "title: x\nkind: wall\nlayers:\n  - material: clay-brick\n"
	tests := []struct {
		name, doc string
		line      int
	}{
		{"key too far in", head + "    thickness: 0.1\noutside:\n  temperature: {mean: 5}\n   inside: 3\n", 8},
		{"list item key short", head + "   thickness: 0.1\noutside:\n  temperature: {mean: 5}\n", 5},
		{"top key indented", head + "    thickness: 0.1\n outside:\n  temperature: 5\n", 6},
		{"nested key short", head + "    thickness: 0.1\noutside:\n  temperature:\n    mean: 5\n   daily: {amplitude: 3}\n", 9},
	}
	for _, tc := range tests {
		_, err := Decode("x.yaml", []byte(tc.doc))
		var se *Error
		if !errors.As(err, &se) {
			t.Fatalf("%s: %v, want an *Error", tc.name, err)
		}
		if se.Line != tc.line || !strings.Contains(se.Msg, "not indented like the lines above") {
			t.Errorf("%s: line %d %q, want line %d naming the indentation", tc.name, se.Line, se.Msg, tc.line)
		}
	}
}
