package main

import (
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// TestCheckReportsEveryMistake runs check on each file of
// testdata/several, which holds several independent mistakes (found by the
// decoder, or by the plan before solving): every one is reported on its
// own line with its file:line, in the order of the file's "# expect:"
// headers, and nothing else.
func TestCheckReportsEveryMistake(t *testing.T) {
	paths, err := filepath.Glob(filepath.Join("..", "..", "testdata", "several", "*.yaml"))
	if err != nil || len(paths) < 2 {
		t.Fatalf("%d files (%v)", len(paths), err)
	}
	for _, path := range paths {
		t.Run(filepath.Base(path), func(t *testing.T) { checkEveryMistake(t, path) })
	}
}

func checkEveryMistake(t *testing.T, path string) {
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	expect := regexp.MustCompile(`(?m)^# expect: line (\d+): (.+)$`).FindAllStringSubmatch(string(data), -1)
	if len(expect) < 2 {
		t.Fatalf("the file expects %d mistakes; it is meant to hold several", len(expect))
	}
	code, out, stderr := runCLI(t, "check", path)
	if code != 1 || out != "" {
		t.Fatalf("exit %d, stdout %q; want 1 and nothing", code, out)
	}
	lines := strings.Split(strings.TrimSuffix(stderr, "\n"), "\n")
	if len(lines) != len(expect) {
		t.Fatalf("%d lines on stderr, want %d:\n%s", len(lines), len(expect), stderr)
	}
	for i, e := range expect {
		prefix := fmt.Sprintf("tempstack: %s:%s:", path, e[1])
		if !strings.HasPrefix(lines[i], prefix) || !strings.Contains(lines[i], e[2]) {
			t.Errorf("line %d is %q, want %s ... %s", i+1, lines[i], prefix, e[2])
		}
	}
}

// TestCheckStopsAtTheLimit gives check more mistakes than it reports: it
// prints the first 20, one per layer, in order.
func TestCheckStopsAtTheLimit(t *testing.T) {
	var b strings.Builder
	b.WriteString("title: many mistakes\nkind: wall\nlayers:\n")
	for i := 0; i < 30; i++ {
		b.WriteString("  - {material: clay-brick, thickness: -1}\n")
	}
	b.WriteString("outside: {temperature: 5}\n")
	path := filepath.Join(t.TempDir(), "many.yaml")
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	code, _, stderr := runCLI(t, "check", path)
	lines := strings.Split(strings.TrimSuffix(stderr, "\n"), "\n")
	if code != 1 || len(lines) != 20 {
		t.Fatalf("exit %d, %d lines; want 1 and 20:\n%s", code, len(lines), stderr)
	}
	for i, l := range lines {
		if want := fmt.Sprintf("%s:%d: layers[%d].thickness: must be positive", path, 4+i, i+1); !strings.Contains(l, want) {
			t.Errorf("line %d is %q, want %q", i+1, l, want)
		}
	}
}
