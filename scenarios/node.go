package scenarios

import (
	"fmt"
	"io/fs"
	"sort"
	"strings"

	"gopkg.in/yaml.v3"

	"tempstack/layers"
)

// decoder walks a yaml.Node tree and turns every problem into an *Error
// carrying file, line and key path.
type decoder struct {
	file string
	fsys fs.FS // where files named by the scenario are read; nil: none

	extraColumns []string // value columns a series block reads besides its own

	cache *seriesCache // records already read, shared by a study's cases
}

func (d *decoder) errf(n *yaml.Node, key, format string, args ...any) *Error {
	line := 0
	if n != nil {
		line = n.Line
	}
	return &Error{File: d.file, Line: line, Key: key, Msg: fmt.Sprintf(format, args...)}
}

// object is a YAML mapping whose keys have been checked against a list of
// allowed names.
type object struct {
	d      *decoder
	node   *yaml.Node // the mapping node
	path   string     // key path of the mapping ("" at the top)
	keys   map[string]*yaml.Node
	values map[string]*yaml.Node
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
// duplicates, and returns it for lookups.
func (d *decoder) object(n *yaml.Node, path string, allowed []string) (*object, error) {
	if n == nil || n.Kind != yaml.MappingNode {
		if n != nil && n.Kind == yaml.ScalarNode && n.Tag == "!!null" {
			n2 := *n
			return &object{d: d, node: &n2, path: path, keys: map[string]*yaml.Node{}, values: map[string]*yaml.Node{}}, nil
		}
		return nil, d.errf(n, path, "expected a mapping of keys (%s), found %s", strings.Join(allowed, ", "), kindName(n))
	}
	o := &object{d: d, node: n, path: path, keys: map[string]*yaml.Node{}, values: map[string]*yaml.Node{}}
	for i := 0; i+1 < len(n.Content); i += 2 {
		k, v := n.Content[i], n.Content[i+1]
		if k.Kind != yaml.ScalarNode {
			return nil, d.errf(k, path, "a key must be a plain word")
		}
		name := k.Value
		if !contains(allowed, name) {
			msg := fmt.Sprintf("unknown key %q", name)
			if s := layers.Closest(name, allowed, 1); len(s) > 0 {
				msg += fmt.Sprintf("; did you mean %q?", s[0])
			} else {
				msg += "; allowed here: " + strings.Join(sorted(allowed), ", ")
			}
			return nil, d.errf(k, join(path, name), "%s", msg)
		}
		if prev, dup := o.keys[name]; dup {
			return nil, d.errf(k, join(path, name), "key given twice (first on line %d)", prev.Line)
		}
		o.keys[name] = k
		o.values[name] = v
	}
	return o, nil
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

func (o *object) missing(key, what string) *Error {
	return o.d.errf(o.node, join(o.path, key), "missing key (%s)", what)
}

// scalar returns the plain text of key, or an error when it is not a scalar.
func (o *object) scalar(key string) (string, *yaml.Node, error) {
	v := o.values[key]
	if v.Kind == yaml.AliasNode && v.Alias != nil {
		v = v.Alias
	}
	if v.Kind != yaml.ScalarNode {
		return "", v, o.errKey(key, "expected a single value, found %s", kindName(v))
	}
	if v.Tag == "!!null" {
		return "", v, o.errKey(key, "has no value")
	}
	return strings.TrimSpace(v.Value), v, nil
}

// str decodes an optional string; ok is false when the key is absent.
func (o *object) str(key string) (s string, ok bool, err error) {
	if !o.has(key) {
		return "", false, nil
	}
	s, _, err = o.scalar(key)
	return s, err == nil, err
}

// quantity decodes an optional quantity of the given kind into SI units.
func (o *object) quantity(key string, kind layers.Kind) (v float64, ok bool, err error) {
	if !o.has(key) {
		return 0, false, nil
	}
	s, _, err := o.scalar(key)
	if err != nil {
		return 0, false, err
	}
	v, err = layers.ParseQuantity(s, kind)
	if err != nil {
		return 0, false, o.errKey(key, "%v", err)
	}
	return v, true, nil
}

// positive decodes an optional quantity that must be > 0.
func (o *object) positive(key string, kind layers.Kind) (float64, bool, error) {
	v, ok, err := o.quantity(key, kind)
	if err == nil && ok && !(v > 0) {
		return 0, false, o.errKey(key, "must be positive, got %s", o.values[key].Value)
	}
	return v, ok, err
}

// nonNegative decodes an optional quantity that must be >= 0.
func (o *object) nonNegative(key string, kind layers.Kind) (float64, bool, error) {
	v, ok, err := o.quantity(key, kind)
	if err == nil && ok && v < 0 {
		return 0, false, o.errKey(key, "must not be negative, got %s", o.values[key].Value)
	}
	return v, ok, err
}

// boolean decodes an optional true/false value.
func (o *object) boolean(key string) (b, ok bool, err error) {
	if !o.has(key) {
		return false, false, nil
	}
	s, _, err := o.scalar(key)
	if err != nil {
		return false, false, err
	}
	switch strings.ToLower(s) {
	case "true", "yes", "on":
		return true, true, nil
	case "false", "no", "off":
		return false, true, nil
	}
	return false, false, o.errKey(key, "expected true or false, got %q", s)
}

// integer decodes an optional whole number.
func (o *object) integer(key string) (int, bool, error) {
	if !o.has(key) {
		return 0, false, nil
	}
	s, _, err := o.scalar(key)
	if err != nil {
		return 0, false, err
	}
	var n int
	if _, err := fmt.Sscanf(s, "%d", &n); err != nil || fmt.Sprint(n) != s {
		return 0, false, o.errKey(key, "expected a whole number, got %q", s)
	}
	return n, true, nil
}

// choice decodes an optional word from a fixed list, with a did-you-mean.
func (o *object) choice(key string, allowed []string) (string, bool, error) {
	s, ok, err := o.str(key)
	if err != nil || !ok {
		return "", ok, err
	}
	if contains(allowed, s) {
		return s, true, nil
	}
	msg := fmt.Sprintf("%q is not one of %s", s, strings.Join(allowed, ", "))
	if c := layers.Closest(s, allowed, 1); len(c) > 0 {
		msg += fmt.Sprintf("; did you mean %q?", c[0])
	}
	return "", false, o.errKey(key, "%s", msg)
}

// list returns the items of an optional sequence.
func (o *object) list(key string) ([]*yaml.Node, bool, error) {
	if !o.has(key) {
		return nil, false, nil
	}
	v := o.values[key]
	if v.Kind != yaml.SequenceNode {
		return nil, false, o.errKey(key, "expected a list, found %s", kindName(v))
	}
	return v.Content, true, nil
}

// child decodes an optional nested mapping.
func (o *object) child(key string, allowed []string) (*object, bool, error) {
	if !o.has(key) {
		return nil, false, nil
	}
	c, err := o.d.object(o.values[key], join(o.path, key), allowed)
	return c, c != nil, err
}
