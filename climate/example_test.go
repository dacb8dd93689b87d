package climate_test

import (
	"fmt"
	"math"
	"strings"

	"tempstack/climate"
)

// A semicolon-separated file with a decimal comma, a missing cell and
// temperatures in degF (invented values).
func ExampleReadCSV() {
	const file = "# invented example\n" +
		"date;hour;air;sun\n" +
		"2024-01-15;0;23,0;0\n" +
		"2024-01-15;1;;0\n" +
		"2024-01-15;2;26,6;0\n"
	s, err := climate.ReadCSV(strings.NewReader(file), "site.csv", climate.CSVOptions{
		DateColumn: "date", HourColumn: "hour",
		Columns: []string{"air", "sun"},
		Decimal: ',', Unit: "F", ColumnUnits: map[string]string{"sun": "W/m2"},
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("start of axis:", s.Start.Format("2006-01-02"), "first record at", s.T[0]/climate.Day, "days")
	fmt.Printf("air, degC: %.2f\n", s.Values["air"])
	fmt.Printf("bridged: %d cell(s) after line %d\n", s.Bridged[0].Filled, s.Bridged[0].Line)

	// The same file with a misspelt column name.
	_, err = climate.ReadCSV(strings.NewReader(file), "site.csv", climate.CSVOptions{
		DateColumn: "date", HourColumn: "hour", Columns: []string{"airt"}, Decimal: ','})
	fmt.Println(err)
	// Output:
	// start of axis: 2024-01-01 first record at 14 days
	// air, degC: [-5.00 -4.00 -3.00]
	// bridged: 1 cell(s) after line 3
	// site.csv:2: column "airt": no column "airt" in the header; did you mean "air"? (header: "date", "hour", "air", "sun")
}

func ExampleSeries_Resample() {
	const file = "time,t\n2024-03-01T00:00,0\n2024-03-01T03:00,6\n2024-03-01T06:00,3\n"
	s, _ := climate.ReadCSV(strings.NewReader(file), "obs.csv", climate.CSVOptions{TimeColumn: "time", Columns: []string{"t"}})
	v, _ := s.Resample(s.T[0], 3600, 7, "t") // hourly solver steps
	fmt.Println(v)
	at, _ := s.At("t")
	fmt.Println(at(s.T[0] + 4.5*3600))
	// Output:
	// [0 2 4 6 5 4 3]
	// 4.5
}

func ExampleDegreeDays() {
	daily := []float64{-6.5, -3, 0.5, -1, 2} // daily means, degC
	below, above := climate.DegreeDays(daily, climate.Day, 0)
	fmt.Printf("freezing %.1f degC day, thawing %.1f degC day\n", below, above)
	// Output: freezing 10.5 degC day, thawing 2.5 degC day
}

func ExampleWinters() {
	// Invented: a year of daily means from 1 July (t = 181 days): a smooth
	// annual swing of 12 K about +1 degC, coldest on 15 January.
	var t, v []float64
	for d := 181.0; d <= 181+365; d++ {
		t = append(t, d*climate.Day)
		v = append(v, 1-12*math.Cos(2*math.Pi*(d-15)/365))
	}
	ws, _ := climate.Winters(t, v, climate.WinterOptions{})
	for _, w := range ws {
		fmt.Printf("%s: day %.0f to %.0f, %.0f days, freezing index %.0f degC day, complete %v\n",
			w.Label, w.Start/climate.Day, w.End/climate.Day, w.Days, w.FreezingIndex, w.Complete)
	}
	// Closed form for the continuous curve [derived]: below 0 degC while
	// cos(phase) > 1/12, that is 365/pi acos(1/12) = 172.8 days, and the
	// index is 365/(2 pi) (24 sin(acos(1/12)) - 2 acos(1/12)) = 1216.6
	// degC day; daily sampling rounds the bounds to whole days.

	// Output:
	// winter 1: day 294 to 466, 172 days, freezing index 1216 degC day, complete true
}

func ExampleDesignFreezingIndex() {
	// Invented freezing indices of 8 winters, degC day, oldest first.
	fi := []float64{820, 1130, 640, 990, 1410, 760, 1280, 900}
	d, _ := climate.DesignFreezingIndex(fi)
	fmt.Printf("design freezing index %.0f degC day (mean of 1410, 1280, 1130)\n", d)
	// Output: design freezing index 1273 degC day (mean of 1410, 1280, 1130)
}

func ExampleGumbelFit() {
	fi := []float64{820, 1130, 640, 990, 1410, 760, 1280, 900} // invented, degC day
	for _, m := range []climate.FitMethod{climate.Moments, climate.MaxLikelihood, climate.ReducedVariate} {
		g, _ := climate.GumbelFit(fi, m)
		fmt.Printf("%-40s location %4.0f scale %3.0f  100-year %4.0f degC day\n", m, g.Location, g.Scale, g.ReturnLevel(100))
	}
	// Checked outside Go: the moment and reduced-variate formulas by hand
	// (Python statistics module), the likelihood maximum by a direct
	// search on the log-likelihood (871.9, 207.4) [derived].

	// Output:
	// method of moments                        location  872 scale 207  100-year 1823 degC day
	// maximum likelihood                       location  872 scale 207  100-year 1826 degC day
	// Gumbel reduced variate (sample size n)   location  849 scale 293  100-year 2198 degC day
}

func ExampleFitHarmonics() {
	// Invented hourly record of 2 years: mean 3, annual swing 11 K
	// peaking on day 200, daily swing 4 K peaking at 15:00.
	var t, v []float64
	for h := 0; h < 2*8760; h++ {
		x := float64(h) * 3600
		t = append(t, x)
		v = append(v, 3+11*math.Cos(2*math.Pi*(x-200*climate.Day)/climate.Year)+4*math.Cos(2*math.Pi*(x-15*3600)/climate.Day))
	}
	p, fit, _ := climate.FitHarmonics(t, v, []float64{climate.Year, climate.Day})
	fmt.Printf("mean %.3f degC\n", p.Mean)
	fmt.Printf("annual %.3f K, peak day %.3f\n", p.Harmonics[0].Amplitude, p.Harmonics[0].Peak/climate.Day)
	fmt.Printf("daily %.3f K, peak hour %.3f\n", p.Harmonics[1].Amplitude, p.Harmonics[1].Peak/3600)
	fmt.Printf("residual RMS below 1e-9 K: %v\n", fit.RMS < 1e-9)
	// Output:
	// mean 3.000 degC
	// annual 11.000 K, peak day 200.000
	// daily 4.000 K, peak hour 15.000
	// residual RMS below 1e-9 K: true
}

func ExampleSolAir() {
	a, _ := climate.Absorptance("dark")
	he := climate.ExternalSurfaceCoefficient // 25 W/(m2 K), Rse 0.04
	// A dark flat roof at noon: air 28 degC, 850 W/m2 on the roof.
	fmt.Printf("%.1f degC\n", climate.SolAir(28, 850, a, he, climate.SkyCorrectionHorizontal))
	// Output: 54.7 degC
}

func ExampleSolAirPeriodic() {
	air := climate.Periodic{Mean: 20, Harmonics: []climate.Harmonic{{Period: climate.Day, Amplitude: 6, Peak: 15 * 3600}}}
	sun := climate.Periodic{Mean: 250, Harmonics: []climate.Harmonic{{Period: climate.Day, Amplitude: 350, Peak: 12 * 3600}}}
	a, _ := climate.Absorptance("red-brick")
	p, _ := climate.SolAirPeriodic(air, sun, a, climate.ExternalSurfaceCoefficient, climate.SkyCorrectionVertical)
	h := p.Harmonics[0]
	fmt.Printf("mean %.1f degC, daily amplitude %.2f K, peak %.2f h\n", p.Mean, h.Amplitude, h.Peak/3600)
	// By hand [derived]: mean 20 + 0.65 250/25 = 26.5; daily phasors
	// 6 at 15 h plus 0.65 350/25 = 9.1 at 12 h add to 14.00 K at 13.18 h.

	// Output: mean 26.5 degC, daily amplitude 14.00 K, peak 13.18 h
}

// The demo data are invented; this shows the calls, not a climate.
func ExampleGenerateDemo() {
	s := climate.GenerateDemo(climate.DemoSeed, 2)
	ws, _ := s.Winters(climate.DemoColumn, climate.WinterOptions{})
	fmt.Println(len(s.T), "hourly records from", s.Times[0].Format("2006-01-02"))
	for _, w := range ws {
		fmt.Printf("%s: %s to %s, %.0f degC day\n", w.Label, w.StartTime.Format("Jan 2"), w.EndTime.Format("Jan 2"), w.FreezingIndex)
	}
	// Output:
	// 17545 hourly records from 2914-07-01
	// 2914/15: Oct 25 to Apr 16, 1291 degC day
	// 2915/16: Oct 30 to Apr 1, 1133 degC day
}
