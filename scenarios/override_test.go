package scenarios

import (
	"testing"

	"gopkg.in/yaml.v3"
)

func TestSetPath(t *testing.T) {
	src := "a: 1\nlayers:\n  - {t: 1}\n  - {t: 2, soil: {w: 3}}\n"
	var doc yaml.Node
	if err := yaml.Unmarshal([]byte(src), &doc); err != nil {
		t.Fatal(err)
	}
	root := doc.Content[0]
	for _, c := range []struct{ path, val string }{
		{"a", "5"}, {"layers[2].t", "7"}, {"layers[2].soil.w", "9"}, {"b.c", "new"},
	} {
		if err := setPath(root, c.path, scalarAt(c.val, 1, 1)); err != nil {
			t.Fatalf("%s: %v", c.path, err)
		}
	}
	out, _ := yaml.Marshal(root)
	want := "a: 5\nlayers:\n    - {t: 1}\n    - {t: 7, soil: {w: 9}}\nb:\n    c: new\n"
	if string(out) != want {
		t.Errorf("got\n%s\nwant\n%s", out, want)
	}
	for _, bad := range []string{"layers[3].t", "a.b", "layers[0]", "layers[x]", "", "layers[1"} {
		if err := setPath(root, bad, scalarAt("1", 1, 1)); err == nil {
			t.Errorf("%q accepted", bad)
		}
	}
}

func TestSplitNumber(t *testing.T) {
	for _, c := range []struct {
		in   string
		v    float64
		unit string
	}{{"100 mm", 100, "mm"}, {"0.12", 0.12, ""}, {"1e3 K h", 1000, "K h"}, {"-5degC", -5, "degC"}, {"12 %", 12, "%"}} {
		v, u, err := splitNumber(c.in)
		if err != nil || v != c.v || u != c.unit {
			t.Errorf("%q: %v %q %v", c.in, v, u, err)
		}
	}
}
