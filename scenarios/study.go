package scenarios

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"sort"
	"strings"
	"sync"
	"tempstack/fileerr"
	"tempstack/layers"
	"tempstack/scenarios/results"

	"gopkg.in/yaml.v3"
)

// StudySpec is what a scenario asks beyond its own run: variants side by
// side, a sweep of one parameter, a target to seek, and Monte Carlo
// uncertainty. Each case is the base scenario file with some values
// replaced (see parsePath), decoded and run again, so a case is checked
// exactly like a file and its errors point at the replacing line.
type StudySpec struct {
	Variants    []VariantSpec
	Sweep       *SweepSpec
	Target      *TargetSpec
	Uncertainty *UncertaintySpec
}

// VariantSpec is one named variant: values replaced in the base file.
type VariantSpec struct {
	Name string
	Sets []setSpec
	Line int
}

type setSpec struct {
	Path  string
	Value *yaml.Node
	Line  int
}

// SweepSpec varies one parameter over values.
type SweepSpec struct {
	Parameter string
	Values    []string // as substituted, with the unit
	Numbers   []float64
	Unit      string
	Line      int
}

// TargetSpec seeks the value of a parameter for which a quantity meets a
// goal.
type TargetSpec struct {
	Parameter string
	From, To  float64
	Unit      string
	Quantity  string
	Goal      float64
	AtLeast   bool // true: quantity >= Goal; false: quantity <= Goal
	Largest   bool // prefer the largest value that meets the goal
	Tolerance float64
	Line      int
}

// UncertaintySpec propagates parameter distributions by Monte Carlo.
type UncertaintySpec struct {
	Samples int
	Seed    uint64
	Vary    []VarySpec
	Line    int
}

// VarySpec is the distribution of one parameter.
type VarySpec struct {
	Parameter string
	Normal    bool    // normal (Mean, SD) or uniform (Min, Max)
	A, B      float64 // mean and sd, or min and max
	Unit      string
}

// readQuantity reads the quantity called name from r; false when it is
// not a quantity or was not computed.
func readQuantity(name string, r *results.Results) (float64, bool) {
	q, ok := quantityOf(name)
	if !ok {
		return math.NaN(), false
	}
	return q.Read(r)
}

// quantityOf returns the study quantity called name (one row of
// results.Quantities: key, kind, words, label, unit and how to read it).
func quantityOf(name string) (results.QuantityInfo, bool) { return results.LookupQuantity(name) }

// quantityNames lists the quantities a scenario kind has, sorted.
func quantityNames(k Kind) []string {
	var out []string
	for _, q := range results.Quantities() {
		if q.Kind == k {
			out = append(out, q.Key)
		}
	}
	sort.Strings(out)
	return out
}

func summarize(r *results.Results) results.Summary {
	s := results.Summary{}
	for _, q := range results.Quantities() {
		if v, ok := q.Read(r); ok {
			s[q.Key] = v
		}
	}
	return s
}

// ---- decoding ----

func (d *decoder) decodeStudy(top *object, s *Scenario) {
	var st StudySpec
	st.Variants = d.decodeVariants(top)
	if o := top.child("sweep", sweepKeys); o != nil {
		st.Sweep = d.decodeSweep(o)
	}
	if o := top.child("target", targetKeys); o != nil {
		st.Target = d.decodeTarget(o, s)
	}
	if o := top.child("uncertainty", uncertaintyKeys); o != nil {
		st.Uncertainty = d.decodeUncertainty(o)
	}
	if st.Variants != nil || st.Sweep != nil || st.Target != nil || st.Uncertainty != nil {
		s.Study = &st
	}
}

func (d *decoder) decodeVariants(top *object) []VariantSpec {
	items, ok := top.list("variants")
	if !ok {
		return nil
	}
	if len(items) == 0 {
		top.failf("variants", "the list is empty")
		return nil
	}
	var out []VariantSpec
	names := map[string]bool{}
	for i, n := range items {
		o := d.object(n, fmt.Sprintf("variants[%d]", i+1), variantKeys)
		if o == nil {
			continue
		}
		var name string
		switch {
		case !o.has("name") || o.str("name", &name) && name == "":
			o.missing("name", "a short name for the variant")
		case names[name]:
			o.failf("name", "two variants are called %q", name)
		}
		names[name] = true
		out = append(out, VariantSpec{Name: name, Sets: d.decodeSets(o), Line: n.Line})
	}
	return out
}

func (d *decoder) decodeSets(o *object) []setSpec {
	if !o.has("set") {
		o.missing("set", "the values this variant changes, e.g. set: {layers[2].thickness: 240 mm}")
		return nil
	}
	// Parameter paths are free text, so the mapping is read directly
	// rather than checked against a list of keys.
	o.expect("set", read{shape: shapeMap})
	v := o.values["set"]
	if v.Kind != yaml.MappingNode {
		o.failf("set", "expected a mapping of parameter: value lines")
		return nil
	}
	var sets []setSpec
	for i := 0; i+1 < len(v.Content); i += 2 {
		k, val := v.Content[i], v.Content[i+1]
		if _, err := parsePath(k.Value); err != nil {
			d.fail(k, join(o.path, "set"), err)
			continue
		}
		sets = append(sets, setSpec{Path: k.Value, Value: val, Line: k.Line})
	}
	if len(v.Content) == 0 {
		o.failf("set", "give at least one parameter: value")
	}
	return sets
}

// pathKey reads a parameter path such as layers[2].thickness.
func (d *decoder) pathKey(o *object, key string) string {
	var p string
	if !o.has(key) || o.str(key, &p) && p == "" {
		o.missing(key, `a parameter path such as layers[2].thickness`)
		return ""
	}
	if _, err := parsePath(p); err != nil && p != "" {
		o.fail(key, err)
	}
	return p
}

// numberKey reads "100 mm" style values: the number and its unit text.
func (o *object) numberKey(key string) (float64, string, bool) {
	var txt string
	if !o.str(key, &txt) {
		return 0, "", false
	}
	v, u, err := splitNumber(txt)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		o.failf(key, "expected a number with an optional unit, got %q", txt)
		return 0, "", false
	}
	return v, u, true
}

// numberPair reads two numbers that share a unit (from/to, mean/sd,
// min/max); what describes them for a missing-key message.
func (o *object) numberPair(k1, k2, what string) (a, b float64, unit string, ok bool) {
	a, u1, ok1 := o.numberKey(k1)
	b, u2, ok2 := o.numberKey(k2)
	switch {
	case !o.has(k1) || !o.has(k2):
		o.missing(map[bool]string{true: k2, false: k1}[o.has(k1)], what)
		return 0, 0, "", false
	case !ok1 || !ok2:
		return 0, 0, "", false
	case u1 != u2:
		o.failf(k2, "%s and %s must be in the same unit (%q and %q)", k1, k2, u1, u2)
		return 0, 0, "", false
	}
	return a, b, u1, true
}

func (d *decoder) decodeSweep(o *object) *SweepSpec {
	sw := &SweepSpec{Parameter: d.pathKey(o, "parameter"), Line: o.node.Line}
	if items, ok := o.list("values"); ok {
		if o.has("from") || o.has("to") || o.has("steps") {
			o.failf("values", "give either values or from, to and steps")
			return sw
		}
		for i, n := range items {
			key := fmt.Sprintf("sweep.values[%d]", i+1)
			if n.Kind != yaml.ScalarNode {
				d.failf(n, key, "expected a single value")
				continue
			}
			v, u, err := splitNumber(n.Value)
			if err != nil {
				d.fail(n, key, err)
				continue
			}
			sw.Values = append(sw.Values, n.Value)
			sw.Numbers = append(sw.Numbers, v)
			sw.Unit = u
		}
		if len(items) < 2 {
			o.failf("values", "a sweep needs at least two values")
		}
		return sw
	}
	if o.has("values") {
		return sw
	}
	from, to, u1, ok := o.numberPair("from", "to", "the range of the parameter, or a list of values")
	steps := 7
	o.integer("steps", 2, 1000, &steps)
	if !ok || !o.clean() {
		return sw
	}
	if from == to {
		o.failf("to", "the range is empty")
		return sw
	}
	sw.Unit = u1
	for i := 0; i < steps; i++ {
		v := from + (to-from)*float64(i)/float64(steps-1)
		sw.Numbers = append(sw.Numbers, v)
		sw.Values = append(sw.Values, joinNumber(v, u1))
	}
	return sw
}

func (d *decoder) decodeTarget(o *object, s *Scenario) *TargetSpec {
	tg := &TargetSpec{Parameter: d.pathKey(o, "parameter"), Line: o.node.Line}
	from, to, u1, ok := o.numberPair("from", "to", "the range to search")
	if ok && !(to > from) {
		o.failf("to", "must be larger than from")
	}
	tg.From, tg.To, tg.Unit = from, to, u1
	names := quantityNames(s.Kind)
	if !o.choice("quantity", names, &tg.Quantity) && !o.has("quantity") {
		o.missing("quantity", strings.Join(names, ", "))
	}
	switch {
	case o.has("at_least") && o.has("at_most"):
		o.failf("at_most", "give either at_least or at_most")
	case o.has("at_least"):
		tg.Goal, _, _ = o.numberKey("at_least")
		tg.AtLeast = true
	case o.has("at_most"):
		tg.Goal, _, _ = o.numberKey("at_most")
	default:
		o.missing("at_least", "the goal: at_least or at_most, in the unit of the quantity's name")
	}
	var prefer string
	if o.choice("prefer", []string{"smallest", "largest"}, &prefer) {
		tg.Largest = prefer == "largest"
	}
	tg.Tolerance = (to - from) / 1000
	if v, _, ok := o.numberKey("tolerance"); ok {
		if !(v > 0) {
			o.failf("tolerance", "must be positive")
		}
		tg.Tolerance = v
	}
	return tg
}

func (d *decoder) decodeUncertainty(o *object) *UncertaintySpec {
	u := &UncertaintySpec{Samples: 100, Seed: 1, Line: o.node.Line}
	o.integer("samples", 10, 100000, &u.Samples)
	seed := 1
	if o.integer("seed", math.MinInt, math.MaxInt, &seed) {
		if seed < 0 {
			o.failf("seed", "must not be negative")
		}
		u.Seed = uint64(seed)
	}
	items, ok := o.list("vary")
	if !ok || len(items) == 0 {
		if ok || !o.has("vary") {
			o.missing("vary", "a list of {parameter, normal: {mean, sd}} or {parameter, uniform: {min, max}}")
		}
		return u
	}
	for i, n := range items {
		vo := d.object(n, fmt.Sprintf("uncertainty.vary[%d]", i+1), varyKeys)
		if vo != nil {
			u.Vary = append(u.Vary, d.decodeVary(vo))
		}
	}
	return u
}

// decodeVary reads one parameter's distribution: normal {mean, sd} or
// uniform {min, max}.
func (d *decoder) decodeVary(vo *object) VarySpec {
	vs := VarySpec{Parameter: d.pathKey(vo, "parameter")}
	switch {
	case vo.has("normal") && vo.has("uniform"):
		vo.failf("uniform", "give either normal or uniform")
	case vo.has("normal"):
		no := vo.child("normal", normalKeys)
		if no == nil {
			break
		}
		m, sd, u1, ok := no.numberPair("mean", "sd", "mean and standard deviation, in the same unit")
		if ok && sd < 0 {
			no.failf("sd", "the standard deviation must be >= 0")
		}
		vs.Normal, vs.A, vs.B, vs.Unit = true, m, sd, u1
	case vo.has("uniform"):
		uo := vo.child("uniform", uniformKeys)
		if uo == nil {
			break
		}
		a, b, u1, ok := uo.numberPair("min", "max", "the range, in one unit")
		if ok && !(b > a) {
			uo.failf("max", "must be larger than min")
		}
		vs.A, vs.B, vs.Unit = a, b, u1
	default:
		vo.missing("normal", "a distribution: normal: {mean, sd} or uniform: {min, max}")
	}
	return vs
}

// ---- running ----

// studyCase is one set of replacements of the base file.
type studyCase []setSpec

// runCase decodes the base file with the replacements and runs it; it
// returns the run's context error once that is cancelled.
func runCase(s *run, c studyCase) (*results.Results, error) {
	if err := s.ctx.Err(); err != nil {
		return nil, err
	}
	cs, err := decodeCase(s.Scenario, c)
	if err != nil {
		return nil, err
	}
	return Run(s.ctx, cs, Options{settled: s.opts.settled})
}

// decodeCase decodes the base file with the replacements.
func decodeCase(s *Scenario, c studyCase) (*Scenario, error) {
	root := cloneNode(s.root)
	// A case is a plain scenario: drop the study keys.
	for i := 0; i+1 < len(root.Content); {
		switch root.Content[i].Value {
		case "variants", "sweep", "target", "uncertainty":
			root.Content = append(root.Content[:i], root.Content[i+2:]...)
		default:
			i += 2
		}
	}
	for _, st := range c {
		if err := setPath(root, st.Path, cloneNode(st.Value)); err != nil {
			return nil, &Error{File: s.File, Line: st.Line, Key: st.Path, Err: err}
		}
	}
	return decodeDoc(s.File, root, s.fsys, s.cache)
}

// checkStudy decodes the cases a study will run, without running them, so
// that `tempstack check` and the start of `run` report a bad variant,
// path or value with its line: every variant, both ends of a sweep or
// target range, and every parameter of an uncertainty study at its mean
// (normal) or both ends (uniform).
func checkStudy(s *Scenario) error {
	st := s.Study
	if st == nil {
		return nil
	}
	var cases []studyCase
	for _, v := range st.Variants {
		cases = append(cases, v.Sets)
	}
	at := func(path string, line int, text string) studyCase {
		return studyCase{{Path: path, Value: scalarAt(text, line, 1), Line: line}}
	}
	if sw := st.Sweep; sw != nil {
		cases = append(cases, at(sw.Parameter, sw.Line, sw.Values[0]), at(sw.Parameter, sw.Line, sw.Values[len(sw.Values)-1]))
	}
	if tg := st.Target; tg != nil {
		cases = append(cases, at(tg.Parameter, tg.Line, joinNumber(tg.From, tg.Unit)), at(tg.Parameter, tg.Line, joinNumber(tg.To, tg.Unit)))
	}
	if u := st.Uncertainty; u != nil {
		for _, v := range u.Vary {
			if v.Normal {
				cases = append(cases, at(v.Parameter, u.Line, joinNumber(v.A, v.Unit)))
			} else {
				cases = append(cases, at(v.Parameter, u.Line, joinNumber(v.A, v.Unit)), at(v.Parameter, u.Line, joinNumber(v.B, v.Unit)))
			}
		}
	}
	// Every distinct mistake of the cases, in order, up to maxErrors.
	var errs fileerr.List
	seen := map[string]bool{}
	for _, c := range cases {
		_, err := decodeCase(s, c)
		for _, e := range fileerr.All(err) {
			if msg := e.Error(); !seen[msg] && len(errs) < maxErrors {
				seen[msg] = true
				errs = append(errs, e)
			}
		}
		if err != nil && fileerr.All(err) == nil {
			return err
		}
	}
	return errs.Err()
}

// parallel runs fn(0..n-1) on workers goroutines; results land by index,
// so the outcome does not depend on scheduling. Once ctx is cancelled no
// further index is handed out (those running finish) and parallel returns
// ctx.Err().
func parallel(ctx context.Context, n, workers int, fn func(i int)) error {
	if workers < 1 {
		workers = runtime.GOMAXPROCS(0)
	}
	var wg sync.WaitGroup
	next := make(chan int)
	for w := 0; w < min(workers, n); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range next {
				fn(i)
			}
		}()
	}
feed:
	for i := 0; i < n; i++ {
		select {
		case next <- i:
		case <-ctx.Done():
			break feed
		}
	}
	close(next)
	wg.Wait()
	return ctx.Err()
}

// runStudy runs every case the scenario's study asks for and adds the
// results to r. workers caps the goroutines (0: one per core).
func runStudy(s *run, r *results.Results) error {
	workers := s.opts.Workers
	st := s.Study
	if len(st.Variants) > 0 {
		vr := make([]results.VariantResult, len(st.Variants)+1)
		errs := make([]error, len(st.Variants))
		vr[0] = variantResult("base", nil, r)
		if err := parallel(s.ctx, len(st.Variants), workers, func(i int) {
			v := st.Variants[i]
			res, err := runCase(s, v.Sets)
			if err != nil {
				errs[i] = err
				return
			}
			var changes []string
			for _, set := range v.Sets {
				changes = append(changes, set.Path+" = "+nodeText(set.Value))
			}
			vr[i+1] = variantResult(v.Name, changes, res)
		}); err != nil {
			return err
		}
		if err := errors.Join(errs...); err != nil {
			return firstErr(errs)
		}
		r.Variants = vr
	}
	if sw := st.Sweep; sw != nil {
		res := &results.SweepResult{Parameter: sw.Parameter, ParameterLabel: parameterLabel(s.Scenario, sw.Parameter), Unit: parameterUnit(sw.Parameter, sw.Unit)}
		points := make([]results.SweepPoint, len(sw.Values))
		errs := make([]error, len(sw.Values))
		if err := parallel(s.ctx, len(sw.Values), workers, func(i int) {
			rr, err := runCase(s, studyCase{{Path: sw.Parameter, Value: scalarAt(sw.Values[i], sw.Line, 1), Line: sw.Line}})
			if err != nil {
				errs[i] = err
				return
			}
			points[i] = results.SweepPoint{Value: sw.Numbers[i], Text: sw.Values[i], Quantities: summarize(rr)}
		}); err != nil {
			return err
		}
		if err := firstErr(errs); err != nil {
			return err
		}
		res.Points = points
		r.Sweep = res
	}
	if tg := st.Target; tg != nil {
		res, err := seekTarget(s, tg, workers)
		if err != nil {
			return err
		}
		r.Target = res
	}
	if u := st.Uncertainty; u != nil {
		res, err := monteCarlo(s, u, workers)
		if err != nil {
			return err
		}
		r.Uncertainty = res
	}
	return nil
}

func firstErr(errs []error) error {
	for _, e := range errs {
		if e != nil {
			return e
		}
	}
	return nil
}

func nodeText(n *yaml.Node) string {
	if n.Kind == yaml.ScalarNode {
		return n.Value
	}
	out, err := yaml.Marshal(n)
	if err != nil {
		return "(a block)"
	}
	return strings.Join(strings.Fields(string(out)), " ")
}

func variantResult(name string, changes []string, r *results.Results) results.VariantResult {
	return results.VariantResult{
		Name: name, Changes: changes, Quantities: summarize(r), Layers: r.Layers,
		Response: r.Series.Response,
		Profile:  results.ProfileSeries{Position_m: r.Series.Profile.Position_m, Min_C: r.Series.Profile.Min_C, Max_C: r.Series.Profile.Max_C},
		Cycle:    results.CycleSeries{Time_h: r.Series.Cycle.Time_h, InsideFlux_W_m2: r.Series.Cycle.InsideFlux_W_m2},
	}
}

// seekTarget finds the parameter value at which the quantity meets the
// goal. It evaluates an even grid of points over [From, To] in parallel,
// takes the smallest (or largest) grid value that meets the goal, and
// bisects between it and its failing neighbour down to the tolerance: a
// bracketing search, robust for any continuous quantity, that returns a
// value meeting the goal whenever one exists on the grid.
func seekTarget(s *run, tg *TargetSpec, workers int) (*results.TargetResult, error) {
	eval := func(x float64) (float64, error) {
		rr, err := runCase(s, studyCase{{Path: tg.Parameter, Value: scalarAt(joinNumber(x, tg.Unit), tg.Line, 1), Line: tg.Line}})
		if err != nil {
			return 0, err
		}
		v, ok := readQuantity(tg.Quantity, rr)
		if !ok || math.IsNaN(v) {
			return 0, &Error{File: s.File, Line: tg.Line, Key: "target.quantity", Msg: fmt.Sprintf("%s is not computed for this scenario", tg.Quantity)}
		}
		return v, nil
	}
	meets := func(v float64) bool {
		if tg.AtLeast {
			return v >= tg.Goal
		}
		return v <= tg.Goal
	}
	const n = 9
	xs := make([]float64, n)
	vs := make([]float64, n)
	errs := make([]error, n)
	for i := range xs {
		xs[i] = tg.From + (tg.To-tg.From)*float64(i)/float64(n-1)
	}
	if err := parallel(s.ctx, n, workers, func(i int) { vs[i], errs[i] = eval(xs[i]) }); err != nil {
		return nil, err
	}
	if err := firstErr(errs); err != nil {
		return nil, err
	}
	res := &results.TargetResult{Parameter: tg.Parameter, ParameterLabel: parameterLabel(s.Scenario, tg.Parameter), Unit: parameterUnit(tg.Parameter, tg.Unit),
		Quantity: tg.Quantity, Goal: tg.Goal, AtLeast: tg.AtLeast, Tolerance: tg.Tolerance,
		From: tg.From, To: tg.To, Evaluations: n}
	for i := range xs {
		res.Scan = append(res.Scan, results.TargetPoint{Value: xs[i], Quantity: vs[i], Meets: meets(vs[i])})
	}
	order := make([]int, n)
	for i := range order {
		order[i] = i
		if tg.Largest {
			order[i] = n - 1 - i
		}
	}
	hit := -1
	for _, i := range order {
		if meets(vs[i]) {
			hit = i
			break
		}
	}
	if hit < 0 {
		best := 0
		for i := range vs {
			if math.Abs(vs[i]-tg.Goal) < math.Abs(vs[best]-tg.Goal) {
				best = i
			}
		}
		res.Met = false
		res.Value, res.Achieved = xs[best], vs[best]
		res.Margin = margin(tg, vs[best])
		res.Message = fmt.Sprintf("no value of %s from %s to %s meets %s %s %g; the closest is %s: %s = %s",
			tg.Parameter, joinNumber(tg.From, tg.Unit), joinNumber(tg.To, tg.Unit), tg.Quantity, goalWord(tg), tg.Goal,
			joinNumber(results.RoundToTolerance(xs[best], tg.Tolerance), tg.Unit), tg.Quantity, results.Quantity(tg.Quantity).Format(vs[best]))
		return res, nil
	}
	res.Met = true
	ok, okV := xs[hit], vs[hit]
	prev := hit - 1
	if tg.Largest {
		prev = hit + 1
	}
	if prev >= 0 && prev < n {
		var err error
		ok, okV, err = bisectOnGrid(xs[prev], ok, okV, results.TargetStep(tg.Tolerance), tg.Largest, eval, meets, &res.Evaluations)
		if err != nil {
			return nil, err
		}
	}
	res.Value, res.Achieved, res.Margin = ok, okV, margin(tg, okV)
	word := "smallest"
	if tg.Largest {
		word = "largest"
	}
	edge := ""
	if prev < 0 || prev >= n {
		edge = " (the end of the searched range already meets it)"
	}
	res.Message = fmt.Sprintf("%s %s meets %s %s %g: %s = %s, margin %.3g%s",
		word, joinNumber(res.Value, tg.Unit), tg.Quantity, goalWord(tg), tg.Goal, tg.Quantity, results.Quantity(tg.Quantity).Format(okV), res.Margin, edge)
	return res, nil
}

// bisectOnGrid narrows the bracket between bad (fails the goal) and ok
// (meets it, with the quantity okV) to neighbouring points of the grid
// k*step and returns the grid point on the meeting side with its
// quantity: a value that meets the goal while the grid point one step
// towards bad (or bad itself, nearer) does not. Only when the first grid
// point beyond ok (ok lying between grid points) fails, which a
// quantity monotone in the parameter never does, ok stays off the grid.
// largest: the search is for the largest value (bad > ok).
func bisectOnGrid(bad, ok, okV, step float64, largest bool, eval func(float64) (float64, error), meets func(float64) bool, evals *int) (float64, float64, error) {
	sg := 1.0
	if largest {
		sg = -1
	}
	lo, hi := sg*bad, sg*ok // lo < hi in these coordinates
	for {
		// Grid points k1 ... k2-1 lie strictly between lo and hi; k2 is
		// hi itself or the first grid point beyond it.
		k1, k2 := math.Floor(lo/step+1e-9)+1, math.Ceil(hi/step-1e-9)
		if k1 >= k2 {
			if sg*results.OnGrid(sg*k2, step) == hi {
				return sg * hi, okV, nil
			}
			x := results.OnGrid(sg*k2, step)
			v, err := eval(x)
			if err != nil {
				return 0, 0, err
			}
			*evals++
			if meets(v) {
				return x, v, nil
			}
			return sg * hi, okV, nil
		}
		m := math.Floor((k1 + k2 - 1) / 2)
		x := results.OnGrid(sg*m, step)
		v, err := eval(x)
		if err != nil {
			return 0, 0, err
		}
		*evals++
		if meets(v) {
			hi, okV = sg*x, v
		} else {
			lo = sg * x
		}
	}
}

func goalWord(tg *TargetSpec) string {
	if tg.AtLeast {
		return ">="
	}
	return "<="
}

// margin is how far the achieved value lies on the good side of the goal.
func margin(tg *TargetSpec, v float64) float64 {
	if tg.AtLeast {
		return v - tg.Goal
	}
	return tg.Goal - v
}

// monteCarlo draws every sample first from one seeded generator (PCG), so
// the result does not depend on the number of workers, runs them, and
// reports percentiles of every quantity. Samples the decoder refuses (for
// example a negative thickness drawn from a wide normal) are counted and
// left out.
func monteCarlo(s *run, u *UncertaintySpec, workers int) (*results.UncertaintyResult, error) {
	rng := rand.New(rand.NewPCG(u.Seed, 0x7e3b5d1a))
	cases := make([]studyCase, u.Samples)
	draws := make([][]float64, u.Samples)
	for i := range cases {
		for _, v := range u.Vary {
			x := v.A + (v.B-v.A)*rng.Float64()
			if v.Normal {
				x = v.A + v.B*rng.NormFloat64()
			}
			draws[i] = append(draws[i], x)
			cases[i] = append(cases[i], setSpec{Path: v.Parameter, Value: scalarAt(joinNumber(x, v.Unit), u.Line, 1), Line: u.Line})
		}
	}
	sums := make([]results.Summary, u.Samples)
	errs := make([]error, u.Samples)
	if err := parallel(s.ctx, u.Samples, workers, func(i int) {
		rr, err := runCase(s, cases[i])
		if err != nil {
			errs[i] = err
			return
		}
		sums[i] = summarize(rr)
	}); err != nil {
		return nil, err
	}
	res := &results.UncertaintyResult{Samples: u.Samples, Seed: u.Seed}
	for _, v := range u.Vary {
		d := "uniform"
		if v.Normal {
			d = "normal"
		}
		res.Parameters = append(res.Parameters, results.UncertainParameter{Parameter: v.Parameter, ParameterLabel: parameterLabel(s.Scenario, v.Parameter),
			Distribution: d, A: v.A, B: v.B, Unit: parameterUnit(v.Parameter, v.Unit)})
	}
	for i, e := range errs {
		if e != nil {
			res.Rejected++
			if res.FirstRejection == "" {
				res.FirstRejection = e.Error()
			}
			continue
		}
		_ = i
	}
	if res.Rejected == u.Samples {
		return nil, &Error{File: s.File, Line: u.Line, Key: "uncertainty", Msg: "every sample was refused: " + res.FirstRejection}
	}
	for _, name := range quantityNames(s.Kind) {
		var xs []float64
		for i := range sums {
			if errs[i] == nil {
				if v, ok := sums[i][name]; ok && !math.IsNaN(v) {
					xs = append(xs, v)
				}
			}
		}
		if len(xs) == 0 {
			continue
		}
		sort.Float64s(xs)
		q := results.Spread{Quantity: name, Unit: results.Quantity(name).Unit, N: len(xs), P5: percentile(xs, 0.05), P50: percentile(xs, 0.5), P95: percentile(xs, 0.95), Min: xs[0], Max: xs[len(xs)-1]}
		var sum, sq float64
		for _, x := range xs {
			sum += x
		}
		q.Mean = sum / float64(len(xs))
		for _, x := range xs {
			sq += (x - q.Mean) * (x - q.Mean)
		}
		if len(xs) > 1 {
			q.SD = math.Sqrt(sq / float64(len(xs)-1))
		}
		res.Quantities = append(res.Quantities, q)
	}
	return res, nil
}

// percentile of sorted xs by linear interpolation between order
// statistics (type 7 of Hyndman and Fan 1996, the default of R and numpy).
func percentile(xs []float64, p float64) float64 {
	h := (float64(len(xs)) - 1) * p
	lo := math.Floor(h)
	i := int(lo)
	if i+1 >= len(xs) {
		return xs[len(xs)-1]
	}
	return xs[i] + (h-lo)*(xs[i+1]-xs[i])
}

// parameterLabel names a parameter path in words for reports, e.g.
// "thickness of layer 2 (Mineral wool)".
// parameterUnits maps the last key of a parameter path to the kind of
// quantity it holds; a bare number is in that kind's default unit.
var parameterUnits = map[string]layers.Kind{
	"thickness": layers.Length, "conductivity": layers.Conductivity, "conductivity_frozen": layers.Conductivity,
	"density": layers.Density, "dry_density": layers.Density, "solids_density": layers.Density,
	"specific_heat": layers.SpecificHeat, "specific_heat_frozen": layers.SpecificHeat, "solids_specific_heat": layers.SpecificHeat,
	"latent_heat": layers.LatentHeatVolumetric, "resistance": layers.Resistance,
	"mean": layers.Temperature, "freezing_point": layers.Temperature, "initial_temperature": layers.Temperature,
	"contact_temperature": layers.Temperature, "amplitude": layers.TemperatureDifference,
	"freezing_range": layers.TemperatureDifference, "change": layers.TemperatureDifference,
	"heat_flux": layers.HeatFlux, "design_freezing_index": layers.DegreeDays, "design_season_length": layers.Duration,
	"contact_effusivity": layers.Effusivity,
}

// parameterUnit returns the unit the values of the parameter at path are
// in: the unit they were written with, or for bare numbers the default
// unit of the key ("" for a fraction or an unknown key). The irradiance's
// mean and amplitude are W/m2, not temperatures.
func parameterUnit(path, given string) string {
	if given != "" {
		return given
	}
	steps, err := parsePath(path)
	if err != nil || len(steps) == 0 {
		return ""
	}
	last := steps[len(steps)-1].key
	for _, st := range steps {
		if st.key == "irradiance" && (last == "mean" || last == "amplitude") {
			return layers.DefaultUnit(layers.Irradiance)
		}
	}
	if k, ok := parameterUnits[last]; ok {
		return layers.DefaultUnit(k)
	}
	return ""
}

func parameterLabel(s *Scenario, path string) string {
	steps, err := parsePath(path)
	if err != nil || len(steps) == 0 {
		return path
	}
	if steps[0].key == "layers" && len(steps) >= 3 && steps[1].index > 0 && steps[1].index <= len(s.Layers) {
		var words []string
		for _, st := range steps[2:] {
			words = append([]string{strings.ReplaceAll(st.key, "_", " ")}, words...)
		}
		return fmt.Sprintf("%s of layer %d (%s)", strings.Join(words, " of "), steps[1].index, s.Layers[steps[1].index-1].Name)
	}
	var words []string
	for _, st := range steps {
		if st.key != "" {
			words = append(words, strings.ReplaceAll(st.key, "_", " "))
		}
	}
	return strings.Join(words, " ")
}
