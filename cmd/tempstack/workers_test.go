package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// --workers sets how many study cases run at once; the results do not
// depend on it (the cases land by index), and a negative count is a user
// error.
func TestWorkersFlag(t *testing.T) {
	dir := t.TempDir()
	var outs [][]byte
	for _, w := range []string{"1", "2"} {
		out := filepath.Join(dir, "w"+w)
		if code, _, stderr := runCLI(t, "run", "--example", "wall-options", "--out", out, "-q", "--workers", w); code != 0 {
			t.Fatalf("--workers %s: exit %d: %s", w, code, stderr)
		}
		b, err := os.ReadFile(filepath.Join(out, "results.json"))
		if err != nil {
			t.Fatal(err)
		}
		outs = append(outs, b)
	}
	if !bytes.Equal(outs[0], outs[1]) {
		t.Error("results.json differs between --workers 1 and --workers 2")
	}
	code, _, stderr := runCLI(t, "run", "--example", "wall-options", "--out", filepath.Join(dir, "bad"), "--workers", "-1")
	if code != 1 || !strings.Contains(stderr, "--workers") {
		t.Errorf("--workers -1: exit %d, %q", code, stderr)
	}
}
