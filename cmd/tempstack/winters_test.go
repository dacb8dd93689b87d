package main

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// TestIndicesAndRunAgreeOnCompleteWinters runs `indices` and `run` on the
// same invented hourly record, 1 July 2021 00:00 to 30 June 2024 23:00: its
// last sample stands for the hour 23:00 to 24:00 (climate.Series.Covered),
// so all three winter years are complete, and both commands say so for
// every winter. The same record cut at 22:00 leaves the last winter
// incomplete in both. [derived: the coverage rule of climate.Series.Covered]
func TestIndicesAndRunAgreeOnCompleteWinters(t *testing.T) {
	for _, tc := range []struct {
		lastHour     int
		wantComplete []bool
	}{
		{23, []bool{true, true, true}},
		{22, []bool{true, true, false}},
	} {
		t.Run(fmt.Sprintf("last sample 30 June %02d:00", tc.lastHour), func(t *testing.T) {
			dir := t.TempDir()
			var b strings.Builder
			b.WriteString("# invented test data: an annual sine wave, mean 2 degC, amplitude 12 K\ntime,air\n")
			start := time.Date(2021, 7, 1, 0, 0, 0, 0, time.UTC)
			end := time.Date(2024, 6, 30, tc.lastHour, 0, 0, 0, time.UTC)
			for d := start; !d.After(end); d = d.Add(time.Hour) {
				day := float64(d.YearDay()) + float64(d.Hour())/24
				fmt.Fprintf(&b, "%s,%.3f\n", d.Format("2006-01-02T15:04"), 2+12*math.Cos(2*math.Pi*(day-200)/365))
			}
			csv := filepath.Join(dir, "air.csv")
			if err := os.WriteFile(csv, []byte(b.String()), 0o644); err != nil {
				t.Fatal(err)
			}
			scen := filepath.Join(dir, "site.yaml")
			if err := os.WriteFile(scen, []byte(`title: three winters (invented)
kind: ground
layers:
  - name: silt
    conductivity: 1.5
    density: 1800
    specific_heat: 1100
    thickness: 12
surface:
  temperature: {file: air.csv, column: air}
bottom:
  heat_flux: 0.06
analysis:
  simulate: {step: 12h}
`), 0o644); err != nil {
				t.Fatal(err)
			}
			ind := indicesJSON(t, csv)
			out := filepath.Join(dir, "out")
			code, _, stderr := runCLI(t, "run", scen, "--out", out, "-q")
			if code != 0 {
				t.Fatalf("run: exit %d: %s", code, stderr)
			}
			data, err := os.ReadFile(filepath.Join(out, "results.json"))
			if err != nil {
				t.Fatal(err)
			}
			var res struct {
				Frost struct {
					Winters []struct {
						Label    string `json:"label"`
						Complete bool   `json:"complete"`
					} `json:"winters"`
				} `json:"frost"`
			}
			if err := json.Unmarshal(data, &res); err != nil {
				t.Fatal(err)
			}
			indices := map[string]bool{}
			var labels []string
			for _, w := range ind.Winters {
				indices[w.Label] = w.Complete
				labels = append(labels, w.Label)
			}
			if want := []string{"2021/22", "2022/23", "2023/24"}; strings.Join(labels, " ") != strings.Join(want, " ") {
				t.Fatalf("indices winters %v, want %v", labels, want)
			}
			for i, l := range labels {
				if indices[l] != tc.wantComplete[i] {
					t.Errorf("indices: %s complete = %v, want %v", l, indices[l], tc.wantComplete[i])
				}
			}
			if len(res.Frost.Winters) != len(labels) {
				t.Fatalf("run has %d winters, indices %d", len(res.Frost.Winters), len(labels))
			}
			for _, w := range res.Frost.Winters {
				c, ok := indices[w.Label]
				if !ok {
					t.Errorf("run winter %q is not an indices winter", w.Label)
				} else if w.Complete != c {
					t.Errorf("%s: run says complete = %v, indices %v", w.Label, w.Complete, c)
				}
			}
		})
	}
}
