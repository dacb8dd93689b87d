package climate

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"time"
)

//go:generate go test -run TestDemoFile -update .

// Demo station: an invented northern inland place. Every number below is
// made up for demonstrations; it is not a model of any real station.
const (
	DemoName   = "Demo Station North (invented)"
	DemoColumn = "air_temperature" // degC
	demoMean   = 1.5               // degC, long-term mean
	demoAnnual = 13.5              // K, annual amplitude
	demoPeak   = 200 * Day         // s, warmest time of year (19 July)
	demoDaily  = 3.5               // K, mean daily amplitude
	demoDaySw  = 1.5               // K, seasonal swing of the daily amplitude
	demoHour   = 15 * 3600.0       // s, warmest hour of the day
	demoTau    = 72 * 3600.0       // s, correlation time of weather noise
	demoSigma  = 3.0               // K, weather noise standard deviation
	demoSevere = 2.2               // K, standard deviation of winter severity
)

// DemoSeed and DemoYears are the settings of the committed demo file
// testdata/climate/demo-station.csv (see DemoComments).
const (
	DemoSeed  = 20141
	DemoYears = 10
)

// DemoComments returns the comment lines written at the head of the demo
// file: they say that the data are invented and how they were made.
func DemoComments(seed uint64, years int) []string {
	return []string{
		"INVENTED DATA for demonstrations and tests of tempstack. Not a measurement:",
		"no real station, place or year is described. Do not use for design.",
		fmt.Sprintf("The calendar years (%d to %d) are placeholders far in the future, so that", DemoStart.Year(), DemoStart.Year()+years),
		"no one mistakes the record for observations.",
		fmt.Sprintf("Station: %s. Hourly air temperature, degC, UTC.", DemoName),
		fmt.Sprintf("Made by climate.GenerateDemo(seed %d, years %d): annual and daily", seed, years),
		"harmonics, a random severity per winter and AR(1) weather noise.",
		"Regenerate with: go generate ./climate/",
	}
}

// DemoStart is the first record of the demo series: 1 July 2914 00:00 UTC,
// so that the record holds whole winters. The year is a placeholder far in
// the future, so the invented record cannot be mistaken for observations;
// it has the leap years of a present-day decade (2916, 2920, 2924).
var DemoStart = time.Date(2914, time.July, 1, 0, 0, 0, 0, time.UTC)

// GenerateDemo returns an invented hourly air-temperature record of the
// given number of years (365 or 366 days each, real calendar) from
// DemoStart to the same date years later, both ends included, for
// demonstrations only. It is deterministic for a seed:
//
//	T(t) = mean + S_k w(t) + A_y cos(2 pi (t - t_y)/Year)
//	       + (A_d + B_d cos(2 pi (t - t_y)/Year)) cos(2 pi (t - t_d)/Day)
//	       + sigma(t) e(t)
//
// with an annual swing peaking on day 200, a daily swing peaking at 15:00
// that is larger in summer, a winter severity offset S_k ~ N(0, 2.2 K)
// drawn per winter and weighted by w = (1 - cos(2 pi (t - t_y)/Year))/2
// (1 in midwinter, 0 in midsummer), and AR(1) weather noise e with a
// correlation time of 3 days (e_i = phi e_{i-1} + sqrt(1 - phi^2) z_i,
// phi = exp(-1 h / 72 h), z standard normal), scaled by 3 K in winter and
// 2 K in summer. The random numbers come from a SplitMix64 generator with
// Box-Muller normals, both written out here, so the output does not depend
// on the Go release.
func GenerateDemo(seed uint64, years int) *Series {
	end := DemoStart.AddDate(years, 0, 0)
	n := int(end.Sub(DemoStart)/time.Hour) + 1 // both ends: whole last day
	rng := splitMix{state: seed}
	origin := time.Date(DemoStart.Year(), time.January, 1, 0, 0, 0, 0, time.UTC)
	t0 := DemoStart.Sub(origin).Seconds()

	// Severity per winter year (boundaries at the warmest time t_y).
	severity := map[int]float64{}
	sev := func(t float64) float64 {
		k := int(math.Floor((t - demoPeak) / Year))
		s, ok := severity[k]
		if !ok {
			s = demoSevere * rng.norm()
			severity[k] = s
		}
		return s
	}
	phi := math.Exp(-3600 / demoTau)
	innov := math.Sqrt(1 - phi*phi)
	e := rng.norm()

	s := &Series{
		Name:    DemoName,
		Start:   origin,
		Times:   make([]time.Time, n),
		T:       make([]float64, n),
		Columns: []string{DemoColumn},
		Values:  map[string][]float64{},
		Step:    3600,
	}
	v := make([]float64, n)
	for i := range n {
		t := t0 + float64(i)*3600
		ya := 2 * math.Pi * (t - demoPeak) / Year
		cy := math.Cos(ya)
		w := 0.5 * (1 - cy)
		x := demoMean + sev(t)*w + demoAnnual*cy +
			(demoDaily+demoDaySw*cy)*math.Cos(2*math.Pi*(t-demoHour)/Day)
		if i > 0 {
			e = phi*e + innov*rng.norm()
		}
		x += (demoSigma - 0.5*(1+cy)) * e
		s.Times[i] = DemoStart.Add(time.Duration(i) * time.Hour)
		s.T[i] = t
		v[i] = math.Round(x*10) / 10
		if v[i] == 0 {
			v[i] = 0 // no "-0.0" in the file
		}
	}
	s.Values[DemoColumn] = v
	return s
}

// splitMix is the SplitMix64 generator (Steele, Lea and Flood, 2014).
type splitMix struct {
	state uint64
	spare float64
	has   bool
}

func (r *splitMix) next() uint64 {
	r.state += 0x9e3779b97f4a7c15
	z := r.state
	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
	z = (z ^ (z >> 27)) * 0x94d049bb133111eb
	return z ^ (z >> 31)
}

// uniform returns a number in (0, 1).
func (r *splitMix) uniform() float64 {
	return (float64(r.next()>>11) + 0.5) / (1 << 53)
}

// norm returns a standard normal number (Box-Muller transform).
func (r *splitMix) norm() float64 {
	if r.has {
		r.has = false
		return r.spare
	}
	u1, u2 := r.uniform(), r.uniform()
	m := math.Sqrt(-2 * math.Log(u1))
	s, c := math.Sincos(2 * math.Pi * u2)
	r.spare, r.has = m*s, true
	return m * c
}

// WriteCSV writes s as CSV: comment lines ("# " + each comment), a header
// "time" plus the column names, then one row per record with an ISO 8601
// time (YYYY-MM-DDThh:mm, with a UTC offset unless the stamp is UTC) and
// the values with the given number of decimals. ReadCSV reads it back with
// TimeColumn "time".
func WriteCSV(w io.Writer, s *Series, decimals int, comments ...string) error {
	bw := bufio.NewWriter(w)
	for _, c := range comments {
		for _, l := range strings.Split(c, "\n") {
			bw.WriteString("# " + l + "\n")
		}
	}
	bw.WriteString("time")
	for _, c := range s.Columns {
		if strings.ContainsAny(c, ",\"\n") {
			return fmt.Errorf("climate: column name %q needs quoting", c)
		}
		bw.WriteString("," + c)
	}
	bw.WriteString("\n")
	cols := make([][]float64, len(s.Columns))
	for k, c := range s.Columns {
		v, err := s.Value(c)
		if err != nil {
			return err
		}
		if len(v) != len(s.Times) {
			return fmt.Errorf("climate: column %q has %d values for %d times", c, len(v), len(s.Times))
		}
		cols[k] = v
	}
	var buf []byte
	for i, ts := range s.Times {
		buf = buf[:0]
		if _, off := ts.Zone(); off == 0 {
			buf = ts.AppendFormat(buf, "2006-01-02T15:04")
		} else {
			buf = ts.AppendFormat(buf, "2006-01-02T15:04-07:00")
		}
		for k := range cols {
			buf = append(buf, ',')
			buf = strconv.AppendFloat(buf, cols[k][i], 'f', decimals, 64)
		}
		buf = append(buf, '\n')
		if _, err := bw.Write(buf); err != nil {
			return err
		}
	}
	return bw.Flush()
}
