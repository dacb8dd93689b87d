package scenarios

import (
	"fmt"
	"io/fs"
	"math"
	"sort"
	"strconv"
	"strings"

	"gopkg.in/yaml.v3"

	"tempstack/fileerr"
	"tempstack/layers"
)

// maxErrors is the most mistakes the decoder reports for one file; past
// it the rest are likely consequences of the first ones.
const maxErrors = 20

// decoder walks a yaml.Node tree and keeps every problem it meets as an
// *Error carrying file, line and key path, up to maxErrors. Its helpers
// report a bad value and go on, so the decoding functions read one key per
// line and a file with several mistakes gets them all at once.
type decoder struct {
	file string
	fsys fs.FS // where files named by the scenario are read; nil: none

	extraColumns []string // value columns a series block reads besides its own

	cache *seriesCache // records already read, shared by a study's cases

	errs     fileerr.List // the mistakes found, in the order met
	reported int          // mistakes met, counting those past maxErrors
}

// report keeps a mistake.
func (d *decoder) report(e *Error) {
	d.reported++
	if len(d.errs) < maxErrors {
		d.errs = append(d.errs, e)
	}
}

// err is nil when the file had no mistake, the *Error of a single mistake,
// or the fileerr.List of several.
func (d *decoder) err() error { return d.errs.Err() }

func (d *decoder) errf(n *yaml.Node, key, format string, args ...any) *Error {
	line := 0
	if n != nil {
		line = n.Line
	}
	return &Error{File: d.file, Line: line, Key: key, Msg: fmt.Sprintf(format, args...)}
}

// failf reports a mistake at node n.
func (d *decoder) failf(n *yaml.Node, key, format string, args ...any) {
	d.report(d.errf(n, key, format, args...))
}

// fail reports a mistake at node n whose words are the cause's.
func (d *decoder) fail(n *yaml.Node, key string, cause error) {
	e := d.errf(n, key, "")
	e.Err = cause
	d.report(e)
}

// object is a YAML mapping whose keys have been checked against a list of
// allowed names.
type object struct {
	d      *decoder
	node   *yaml.Node // the mapping node
	path   string     // key path of the mapping ("" at the top)
	keys   map[string]*yaml.Node
	values map[string]*yaml.Node

	table   *keyTable // the keys allowed here, with their forms
	opened  int       // d.reported when the object was opened
	unknown bool      // an unknown or repeated key was reported
}

func join(path, key string) string {
	if path == "" {
		return key
	}
	return path + "." + key
}

func kindName(n *yaml.Node) string {
	switch n.Kind {
	case yaml.MappingNode:
		return "a mapping (key: value lines)"
	case yaml.SequenceNode:
		return "a list"
	case yaml.ScalarNode:
		return fmt.Sprintf("the value %q", n.Value)
	case yaml.AliasNode:
		return "an alias"
	}
	return "nothing"
}

// object checks that n is a mapping whose keys are all in allowed, without
// duplicates, and returns it for lookups. It reports an unknown or repeated
// key and leaves it out; it reports and returns nil when n is not a
// mapping.
func (d *decoder) object(n *yaml.Node, path string, table *keyTable) *object {
	allowed := table.names()
	o := &object{d: d, node: n, path: path, table: table, keys: map[string]*yaml.Node{}, values: map[string]*yaml.Node{}, opened: d.reported}
	if n != nil && n.Kind == yaml.ScalarNode && n.Tag == "!!null" {
		n2 := *n
		o.node = &n2
		return o
	}
	if n == nil || n.Kind != yaml.MappingNode {
		d.failf(n, path, "expected a mapping of keys (%s), found %s", strings.Join(allowed, ", "), kindName(n))
		return nil
	}
	for i := 0; i+1 < len(n.Content); i += 2 {
		k, v := n.Content[i], n.Content[i+1]
		if k.Kind != yaml.ScalarNode {
			d.failf(k, path, "a key must be a plain word")
			o.unknown = true
			continue
		}
		name := k.Value
		if !contains(allowed, name) {
			msg := fmt.Sprintf("unknown key %q", name)
			if s := layers.Closest(name, allowed, 1); len(s) > 0 {
				msg += fmt.Sprintf("; did you mean %q?", s[0])
			} else {
				msg += "; allowed here: " + strings.Join(sorted(allowed), ", ")
			}
			d.failf(k, join(path, name), "%s", msg)
			o.unknown = true
			continue
		}
		if prev, dup := o.keys[name]; dup {
			d.failf(k, join(path, name), "key given twice (first on line %d)", prev.Line)
			o.unknown = true
			continue
		}
		o.keys[name] = k
		o.values[name] = v
	}
	return o
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

func sorted(list []string) []string {
	out := append([]string(nil), list...)
	sort.Strings(out)
	return out
}

func (o *object) has(key string) bool { _, ok := o.values[key]; return ok }

// clean reports whether no mistake was met since o was opened (in o or in
// what it holds). Checks across keys run only on a clean object, so that
// one mistake is not reported again as its consequences.
func (o *object) clean() bool { return o.d.reported == o.opened }

// line is the line of key (or of the mapping when absent).
func (o *object) line(key string) int {
	if k, ok := o.keys[key]; ok {
		return k.Line
	}
	return o.node.Line
}

func (o *object) errKey(key, format string, args ...any) *Error {
	n := o.values[key]
	if n == nil {
		n = o.node
	}
	return o.d.errf(n, join(o.path, key), format, args...)
}

// failf reports a mistake in the value of key (at the mapping when the key
// is absent).
func (o *object) failf(key, format string, args ...any) {
	o.d.report(o.errKey(key, format, args...))
}

// fail reports a mistake in the value of key whose words are the cause's.
func (o *object) fail(key string, cause error) {
	e := o.errKey(key, "")
	e.Err = cause
	o.d.report(e)
}

// missing reports a required key that is absent, unless an unknown key of
// the mapping (a misspelling of it, most likely) was reported already.
func (o *object) missing(key, what string) {
	if !o.unknown {
		o.d.failf(o.node, join(o.path, key), "missing key (%s)", what)
	}
}

// scalar returns the plain text of key; it reports a value that is not a
// scalar.
func (o *object) scalar(key string) (string, bool) {
	v := o.values[key]
	if v.Kind == yaml.AliasNode && v.Alias != nil {
		v = v.Alias
	}
	if v.Kind != yaml.ScalarNode {
		o.failf(key, "expected a single value, found %s", kindName(v))
		return "", false
	}
	if v.Tag == "!!null" {
		o.failf(key, "has no value")
		return "", false
	}
	return strings.TrimSpace(v.Value), true
}

// The value helpers below read an optional key into *dst. They return true
// when the key is present and its value good; they leave *dst alone when
// it is absent, and report the mistake when it is bad.

// str reads a string.
func (o *object) str(key string, dst *string) bool {
	if !o.has(key) {
		return false
	}
	o.expect(key, read{shape: shapeText})
	s, ok := o.scalar(key)
	if ok {
		*dst = s
	}
	return ok
}

// quantity reads a quantity of the given kind in SI units.
func (o *object) quantity(key string, kind layers.Kind, dst *float64) bool {
	o.expect(key, read{shape: shapeQuantity, kind: kind})
	var s string
	if !o.str(key, &s) {
		return false
	}
	v, err := layers.ParseQuantity(s, kind)
	if err != nil {
		o.fail(key, err)
		return false
	}
	*dst = v
	return true
}

// positive reads a quantity that must be > 0.
func (o *object) positive(key string, kind layers.Kind, dst *float64) bool {
	var v float64
	if !o.quantity(key, kind, &v) {
		return false
	}
	if !(v > 0) {
		o.failf(key, "must be positive, got %s", o.values[key].Value)
		return false
	}
	*dst = v
	return true
}

// nonNegative reads a quantity that must be >= 0.
func (o *object) nonNegative(key string, kind layers.Kind, dst *float64) bool {
	var v float64
	if !o.quantity(key, kind, &v) {
		return false
	}
	if v < 0 {
		o.failf(key, "must not be negative, got %s", o.values[key].Value)
		return false
	}
	*dst = v
	return true
}

// boolean reads true/false (also yes/no, on/off).
func (o *object) boolean(key string, dst *bool) bool {
	o.expect(key, read{shape: shapeBool})
	var s string
	if !o.str(key, &s) {
		return false
	}
	switch strings.ToLower(s) {
	case "true", "yes", "on":
		*dst = true
	case "false", "no", "off":
		*dst = false
	default:
		o.failf(key, "expected true or false, got %q", s)
		return false
	}
	return true
}

// integer reads a whole number from lo to hi.
func (o *object) integer(key string, lo, hi int, dst *int) bool {
	o.expect(key, read{shape: shapeInteger})
	var s string
	if !o.str(key, &s) {
		return false
	}
	var n int
	if _, err := fmt.Sscanf(s, "%d", &n); err != nil || fmt.Sprint(n) != s {
		o.failf(key, "expected a whole number, got %q", s)
		return false
	}
	if n < lo || n > hi {
		o.failf(key, "must lie between %d and %d, got %d", lo, hi, n)
		return false
	}
	*dst = n
	return true
}

// choice reads a word from a fixed list, with a did-you-mean.
func (o *object) choice(key string, allowed []string, dst *string) bool {
	o.expect(key, read{shape: shapeChoice, words: allowed})
	var s string
	if !o.str(key, &s) {
		return false
	}
	if !contains(allowed, s) {
		msg := fmt.Sprintf("%q is not one of %s", s, strings.Join(allowed, ", "))
		if c := layers.Closest(s, allowed, 1); len(c) > 0 {
			msg += fmt.Sprintf("; did you mean %q?", c[0])
		}
		o.failf(key, "%s", msg)
		return false
	}
	*dst = s
	return true
}

// list returns the items of a sequence; ok is false when the key is absent
// or not a list (reported).
func (o *object) list(key string) ([]*yaml.Node, bool) {
	if !o.has(key) {
		return nil, false
	}
	o.expect(key, read{shape: shapeList})
	v := o.values[key]
	if v.Kind != yaml.SequenceNode {
		o.failf(key, "expected a list, found %s", kindName(v))
		return nil, false
	}
	return v.Content, true
}

// child opens a nested mapping; nil when the key is absent or not a
// mapping (reported).
func (o *object) child(key string, table *keyTable) *object {
	if !o.has(key) {
		return nil
	}
	o.expect(key, read{shape: shapeObject, table: table})
	return o.d.object(o.values[key], join(o.path, key), table)
}

// fraction reads a non-negative fraction (0.15 or "15 %"). A bare number
// above 1 is refused with the percentage it most likely means:
// `water_content: 20` reads as 2000 %, and the message suggests "20 %"
// (a unit makes a value above 100 % possible, e.g. "150 %" for a peat).
func (o *object) fraction(key string, dst *float64) bool {
	var s string
	if !o.str(key, &s) {
		return false
	}
	txt := strings.TrimSpace(s)
	if v, err := strconv.ParseFloat(txt, 64); err == nil && v > 1 && !math.IsInf(v, 0) {
		pct := layers.FormatQuantity(v, layers.Fraction)
		o.failf(key, "a bare %s is read as a fraction, %s; did you mean \"%s %%\"? (write \"%s\" if you mean that)", txt, pct, txt, pct)
		return false
	}
	return o.nonNegative(key, layers.Fraction, dst)
}
