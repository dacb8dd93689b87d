package main

import (
	"bytes"
	"compress/gzip"
	"crypto/sha256"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"

	"tempstack/scenarios"
)

// updateGolden rewrites testdata/golden from the current code. Use it only
// for a deliberate change of the output, and name that change in the
// commit: `go test ./cmd/tempstack -run TestGoldenOutputs -update`.
var updateGolden = flag.Bool("update", false, "rewrite the golden outputs in testdata/golden")

// goldenGzipAbove is the size from which a golden file is stored gzipped
// (NAME.gz), to keep the repository small; the comparison is always of the
// uncompressed bytes.
const goldenGzipAbove = 64 << 10

// goldenCase is one run whose outputs are held byte for byte: an embedded
// demo, or a scenario file in testdata/golden/scenarios.
type goldenCase struct {
	name string
	dir  string // run from this folder (scenario files: the path in results.json stays short and fixed)
	args []string
}

func goldenCases(t *testing.T) []goldenCase {
	var cases []goldenCase
	for _, ex := range scenarios.Examples() {
		cases = append(cases, goldenCase{ex.Name, "", []string{"--example", ex.Name}})
	}
	files, err := filepath.Glob(filepath.Join("..", "..", "testdata", "golden", "scenarios", "*.yaml"))
	if err != nil || len(files) == 0 {
		t.Fatalf("no golden scenarios (%v)", err)
	}
	for _, f := range files {
		base := filepath.Base(f)
		cases = append(cases, goldenCase{strings.TrimSuffix(base, ".yaml"), filepath.Dir(f), []string{base}})
	}
	return cases
}

// TestGoldenOutputs runs every embedded demo and every scenario of
// testdata/golden/scenarios through the command (without --date, so the
// output is deterministic) and compares every file it writes —
// results.json, the CSV series and report.html — byte for byte with the
// files generated before a change (testdata/golden/NAME/). It guards
// refactoring: the output may change only deliberately (-update, named in
// the commit). The inlined charting library of report.html is replaced by
// its SHA-256 in the stored copy (see stripLibrary).
func TestGoldenOutputs(t *testing.T) {
	root, err := filepath.Abs(filepath.Join("..", "..", "testdata", "golden"))
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range goldenCases(t) {
		t.Run(c.name, func(t *testing.T) {
			if c.dir != "" {
				t.Chdir(c.dir) // not parallel: the working folder is the process's
			} else if !*updateGolden {
				t.Parallel()
			}
			out := t.TempDir()
			args := append([]string{"run", "--out", out, "--quiet"}, c.args...)
			if code, _, stderr := runCLI(t, args...); code != 0 {
				t.Fatalf("exit %d: %s", code, stderr)
			}
			got := readOutputs(t, out)
			dir := filepath.Join(root, c.name)
			if *updateGolden {
				writeGolden(t, dir, got)
				return
			}
			want := readGolden(t, dir)
			for _, name := range sortedKeys(want) {
				g, ok := got[name]
				if !ok {
					t.Errorf("%s: not written any more", name)
					continue
				}
				if !bytes.Equal(g, want[name]) {
					t.Errorf("%s differs from the golden copy: %s", name, firstDifference(g, want[name]))
				}
			}
			for _, name := range sortedKeys(got) {
				if _, ok := want[name]; !ok {
					t.Errorf("%s: written but not in the golden set", name)
				}
			}
		})
	}
}

// readOutputs reads every file of a run's output folder, with the charting
// library of report.html replaced by its hash.
func readOutputs(t *testing.T, dir string) map[string][]byte {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	files := map[string][]byte{}
	for _, e := range entries {
		data, err := os.ReadFile(filepath.Join(dir, e.Name()))
		if err != nil {
			t.Fatal(err)
		}
		if e.Name() == "report.html" {
			data = stripLibrary(t, data)
		}
		files[e.Name()] = data
	}
	return files
}

// stripLibrary replaces the body of the first script element, the inlined
// Apache ECharts library (it begins with the Apache license header), by a
// comment carrying its SHA-256, so a change of the library is still seen.
func stripLibrary(t *testing.T, html []byte) []byte {
	t.Helper()
	const open, end = "<script>\n/*\n* Licensed to the Apache Software Foundation", "</script>"
	i := bytes.Index(html, []byte(open))
	if i < 0 {
		t.Fatal("report.html: no inlined charting library found")
	}
	body := i + len("<script>")
	j := bytes.Index(html[body:], []byte(end))
	if j < 0 {
		t.Fatal("report.html: charting library not closed")
	}
	sum := sha256.Sum256(html[body : body+j])
	var b bytes.Buffer
	b.Write(html[:body])
	fmt.Fprintf(&b, "/* inlined charting library, %d bytes, sha256 %x */", j, sum)
	b.Write(html[body+j:])
	return b.Bytes()
}

func writeGolden(t *testing.T, dir string, files map[string][]byte) {
	t.Helper()
	if err := os.RemoveAll(dir); err != nil {
		t.Fatal(err)
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	for name, data := range files {
		path := filepath.Join(dir, name)
		if len(data) > goldenGzipAbove {
			var b bytes.Buffer
			zw, _ := gzip.NewWriterLevel(&b, gzip.BestCompression)
			zw.Write(data)
			if err := zw.Close(); err != nil {
				t.Fatal(err)
			}
			path, data = path+".gz", b.Bytes()
		}
		if err := os.WriteFile(path, data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

func readGolden(t *testing.T, dir string) map[string][]byte {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatalf("no golden outputs (generate them with -update before the change): %v", err)
	}
	files := map[string][]byte{}
	for _, e := range entries {
		data, err := os.ReadFile(filepath.Join(dir, e.Name()))
		if err != nil {
			t.Fatal(err)
		}
		name := e.Name()
		if strings.HasSuffix(name, ".gz") {
			zr, err := gzip.NewReader(bytes.NewReader(data))
			if err != nil {
				t.Fatalf("%s: %v", name, err)
			}
			if data, err = io.ReadAll(zr); err != nil {
				t.Fatalf("%s: %v", name, err)
			}
			name = strings.TrimSuffix(name, ".gz")
		}
		files[name] = data
	}
	if len(files) == 0 {
		t.Fatalf("%s is empty", dir)
	}
	return files
}

// firstDifference describes where got first departs from want: the line
// number and both lines (cut to 200 bytes).
func firstDifference(got, want []byte) string {
	gl, wl := bytes.Split(got, []byte("\n")), bytes.Split(want, []byte("\n"))
	for i := 0; i < len(gl) || i < len(wl); i++ {
		var g, w []byte
		if i < len(gl) {
			g = gl[i]
		}
		if i < len(wl) {
			w = wl[i]
		}
		if !bytes.Equal(g, w) {
			cut := func(b []byte) []byte {
				if len(b) > 200 {
					return b[:200]
				}
				return b
			}
			return fmt.Sprintf("line %d:\n  got  %q\n  want %q", i+1, cut(g), cut(w))
		}
	}
	return fmt.Sprintf("length %d, want %d", len(got), len(want))
}

func sortedKeys(m map[string][]byte) []string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return keys
}
