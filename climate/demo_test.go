package climate

import (
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"testing"
)

var update = flag.Bool("update", false, "rewrite testdata/climate/demo-station.csv")

var demoPath = filepath.Join("..", "testdata", "climate", "demo-station.csv")

// TestDemoFile checks that the committed demo file is exactly what
// GenerateDemo writes (the data are invented; this checks determinism and
// the writer/reader round trip, not physics). With -update it rewrites the
// file.
func TestDemoFile(t *testing.T) {
	var buf bytes.Buffer
	s := GenerateDemo(DemoSeed, DemoYears)
	if err := WriteCSV(&buf, s, 1, DemoComments(DemoSeed, DemoYears)...); err != nil {
		t.Fatal(err)
	}
	if *update {
		if err := os.MkdirAll(filepath.Dir(demoPath), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(demoPath, buf.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	disk, err := os.ReadFile(demoPath)
	if err != nil {
		t.Fatalf("%v (run go generate ./climate/)", err)
	}
	if !bytes.Equal(disk, buf.Bytes()) {
		t.Fatalf("%s differs from GenerateDemo output (run go generate ./climate/)", demoPath)
	}
	r, err := ReadCSV(bytes.NewReader(disk), "demo-station.csv", CSVOptions{TimeColumn: "time", Columns: []string{DemoColumn}})
	if err != nil {
		t.Fatal(err)
	}
	if len(r.T) != len(s.T) || len(r.Bridged) != 0 || !r.Start.Equal(s.Start) {
		t.Fatalf("read back %d records (%d bridged), start %v; wrote %d, start %v", len(r.T), len(r.Bridged), r.Start, len(s.T), s.Start)
	}
	got, want := r.Values[DemoColumn], s.Values[DemoColumn]
	for i := range want {
		if got[i] != want[i] || r.T[i] != s.T[i] {
			t.Fatalf("record %d: read %v at %v, wrote %v at %v", i, got[i], r.T[i], want[i], s.T[i])
		}
	}
	ws, err := r.Winters(DemoColumn, WinterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if n := len(FreezingIndices(ws)); n != DemoYears {
		t.Errorf("%d complete winters, want %d", n, DemoYears)
	}
}
