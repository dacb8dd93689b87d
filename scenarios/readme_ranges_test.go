package scenarios

import (
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
