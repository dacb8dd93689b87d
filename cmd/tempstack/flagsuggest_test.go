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

// TestDemoNameAsFile: a demo's name given where a file goes (`run
// timber-frame`) says how to run the demo; any other missing file keeps
// the system's words.
func TestDemoNameAsFile(t *testing.T) {
	t.Chdir(t.TempDir())
	tests := []struct{ file, want string }{
		{"timber-frame", "timber-frame: no such file; to solve the embedded demo of that name, use --example timber-frame"},
		{"no-such-wall.yaml", "no-such-wall.yaml: no such file or directory"},
	}
	for _, tc := range tests {
		code, _, stderr := runCLI(t, "check", tc.file)
		if code != 1 || !strings.Contains(stderr, tc.want) || strings.Count(stderr, "\n") != 1 {
			t.Errorf("check %s: exit %d, stderr %q; want exit 1 and one line with %q", tc.file, code, stderr, tc.want)
		}
	}
}
