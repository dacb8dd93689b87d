package main

import (
	"strings"
	"testing"
)

// TestUnknownFlagSuggests: an unknown flag is named as typed, with the
// close flag of the command (a misspelling or an abbreviation), on one line.
func TestUnknownFlagSuggests(t *testing.T) {
	tests := []struct {
		args []string
		want string
	}{
		{[]string{"run", "--output", "x"}, "unknown flag --output; did you mean --out? (try `tempstack help run`)"},
		{[]string{"run", "--outdir", "x"}, "did you mean --out?"},
		{[]string{"run", "--work", "2"}, "did you mean --workers?"},
		{[]string{"run", "--qiuet"}, "did you mean --quiet?"},
		{[]string{"check", "--exampel", "brick-wall"}, "did you mean --example?"},
		{[]string{"indices", "--decimals", ",", "x.csv"}, "did you mean --decimal?"},
		{[]string{"--vers"}, "unknown flag --vers; did you mean --version? (try `tempstack help`)"},
		{[]string{"run", "--zzz"}, "unknown flag --zzz (try `tempstack help run`)"},
	}
	for _, tc := range tests {
		code, _, stderr := runCLI(t, tc.args...)
		if code != 1 {
			t.Errorf("%v: exit %d, want 1", tc.args, code)
		}
		if !strings.Contains(stderr, tc.want) || strings.Count(stderr, "\n") != 1 {
			t.Errorf("%v: stderr %q, want one line with %q", tc.args, stderr, tc.want)
		}
	}
}
