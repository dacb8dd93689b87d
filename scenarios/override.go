package scenarios

import (
	"fmt"
	"strconv"
	"strings"

	"gopkg.in/yaml.v3"
)

// A parameter path names one value of a scenario file the way error
// messages do: keys joined by dots, list items by a 1-based index in
// brackets, e.g. "layers[2].thickness", "layers[1].soil.water_content",
// "surface.temperature.mean", "analysis.design_freezing_index".
type pathStep struct {
	key   string // mapping key; "" for an index step
	index int    // 1-based list index; 0 for a key step
}

func parsePath(p string) ([]pathStep, error) {
	if strings.TrimSpace(p) == "" {
		return nil, fmt.Errorf("empty parameter path")
	}
	var steps []pathStep
	for _, part := range strings.Split(p, ".") {
		name := part
		var idx []int
		for {
			i := strings.IndexByte(name, '[')
			if i < 0 {
				break
			}
			j := strings.IndexByte(name[i:], ']')
			if j < 0 {
				return nil, fmt.Errorf("%q: unclosed [", p)
			}
			n, err := strconv.Atoi(name[i+1 : i+j])
			if err != nil || n < 1 {
				return nil, fmt.Errorf("%q: a list index is a whole number from 1", p)
			}
			idx = append(idx, n)
			if i+j+1 < len(name) && name[i+j+1] != '[' {
				return nil, fmt.Errorf("%q: unexpected text after ]", p)
			}
			rest := name[i+j+1:]
			name = name[:i] + rest
			if rest == "" {
				name = name[:i]
				break
			}
		}
		if name == "" && len(idx) == 0 {
			return nil, fmt.Errorf("%q: empty key", p)
		}
		if name != "" {
			steps = append(steps, pathStep{key: name})
		}
		for _, n := range idx {
			steps = append(steps, pathStep{index: n})
		}
	}
	return steps, nil
}

// cloneNode deep-copies a YAML node tree (aliases are resolved).
func cloneNode(n *yaml.Node) *yaml.Node {
	if n == nil {
		return nil
	}
	if n.Kind == yaml.AliasNode && n.Alias != nil {
		return cloneNode(n.Alias)
	}
	c := *n
	c.Content = make([]*yaml.Node, len(n.Content))
	for i, k := range n.Content {
		c.Content[i] = cloneNode(k)
	}
	return &c
}

// setPath replaces (or creates, in a mapping) the value at path in the tree
// rooted at root with val.
func setPath(root *yaml.Node, path string, val *yaml.Node) error {
	steps, err := parsePath(path)
	if err != nil {
		return err
	}
	cur := root
	for i, st := range steps {
		last := i == len(steps)-1
		if st.key != "" {
			if cur.Kind != yaml.MappingNode {
				return fmt.Errorf("%q: %q is not inside a mapping", path, st.key)
			}
			found := -1
			for k := 0; k+1 < len(cur.Content); k += 2 {
				if cur.Content[k].Value == st.key {
					found = k + 1
				}
			}
			if found < 0 {
				// Create the key: a mapping for an inner step, the value last.
				nv := val
				if !last {
					nv = &yaml.Node{Kind: yaml.MappingNode, Tag: "!!map", Line: val.Line, Column: val.Column}
					if steps[i+1].key == "" {
						return fmt.Errorf("%q: no list %q to index", path, st.key)
					}
				}
				cur.Content = append(cur.Content, &yaml.Node{Kind: yaml.ScalarNode, Tag: "!!str", Value: st.key, Line: val.Line, Column: val.Column}, nv)
				cur = nv
				continue
			}
			if last {
				cur.Content[found] = val
				return nil
			}
			cur = cur.Content[found]
			continue
		}
		if cur.Kind != yaml.SequenceNode {
			return fmt.Errorf("%q: [%d] is not a list index here", path, st.index)
		}
		if st.index > len(cur.Content) {
			return fmt.Errorf("%q: the list has %d items, not %d", path, len(cur.Content), st.index)
		}
		if last {
			cur.Content[st.index-1] = val
			return nil
		}
		cur = cur.Content[st.index-1]
	}
	return nil
}

// scalarAt returns a scalar node holding text, located at line (for
// messages about the substituted value).
func scalarAt(text string, line, col int) *yaml.Node {
	return &yaml.Node{Kind: yaml.ScalarNode, Value: text, Line: line, Column: col}
}

// splitNumber splits "100 mm" into 100 and "mm"; a bare number has no unit.
func splitNumber(s string) (float64, string, error) {
	s = strings.TrimSpace(s)
	i := 0
	for i < len(s) && strings.ContainsRune("+-.0123456789eE", rune(s[i])) {
		// Stop at an 'e' that starts a unit word rather than an exponent.
		if (s[i] == 'e' || s[i] == 'E') && (i+1 >= len(s) || !strings.ContainsRune("+-0123456789", rune(s[i+1]))) {
			break
		}
		i++
	}
	v, err := strconv.ParseFloat(s[:i], 64)
	if err != nil {
		return 0, "", fmt.Errorf("%q does not start with a number", s)
	}
	return v, strings.TrimSpace(s[i:]), nil
}

// joinNumber writes v with the unit u.
func joinNumber(v float64, u string) string {
	t := strconv.FormatFloat(v, 'g', 12, 64)
	if u == "" {
		return t
	}
	return t + " " + u
}
