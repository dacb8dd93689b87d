package scenarios

import (
	"bytes"
	"encoding/json"
	"flag"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strings"
	"testing"

	"gopkg.in/yaml.v3"

	"tempstack/layers"
)

// updateSchema rewrites the published schema from the key tables:
// `go test ./scenarios -run TestSchemaPublished -update-schema`.
var updateSchema = flag.Bool("update-schema", false, "rewrite scenarios/schema/"+SchemaFile+" from the key tables")

var publishedSchema = filepath.Join("schema", SchemaFile)

// The published schema is the one the key tables make: a key added to the
// decoder without regenerating the file fails here.
func TestSchemaPublished(t *testing.T) {
	got, err := Schema()
	if err != nil {
		t.Fatal(err)
	}
	if *updateSchema {
		if err := os.WriteFile(publishedSchema, got, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(publishedSchema)
	if err != nil {
		t.Fatalf("%v (generate it with -update-schema)", err)
	}
	if !bytes.Equal(got, want) {
		t.Errorf("%s differs from the key tables; regenerate it: go test ./scenarios -run TestSchemaPublished -update-schema", publishedSchema)
	}
}

// corpus lists the scenario files the schema tests read: the embedded
// examples and starters, the golden scenarios and the bad-input
// catalogue, with their folder (for series files they name).
func corpus(t *testing.T) (good, bad []string) {
	t.Helper()
	for _, pat := range []string{"examples/*.yaml", "starters/*.yaml", "../testdata/golden/scenarios/*.yaml"} {
		m, err := filepath.Glob(pat)
		if err != nil {
			t.Fatal(err)
		}
		good = append(good, m...)
	}
	bad, err := filepath.Glob("../testdata/bad/*.yaml")
	if err != nil {
		t.Fatal(err)
	}
	several, _ := filepath.Glob("../testdata/several/*.yaml")
	bad = append(bad, several...)
	if len(good) < 10 || len(bad) < 100 {
		t.Fatalf("corpus too small: %d good, %d bad files", len(good), len(bad))
	}
	return good, bad
}

// Every value the decoder reads from the corpus has a form its key table
// allows (object.expect records any disagreement as drift): the tables the
// schema is made from describe what the decoder does.
func TestKeyTablesMatchDecoder(t *testing.T) {
	takeDrift()
	good, bad := corpus(t)
	for _, f := range append(good, bad...) {
		data, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		if strings.HasPrefix(f, "examples/") {
			_, _ = DecodeFS(f, data, ExampleFiles())
		} else {
			_, _ = Decode(f, data)
		}
	}
	for _, seed := range fuzzSeeds(t) {
		_, _ = DecodeFS("seed.yaml", seed, nil)
	}
	if d := takeDrift(); len(d) > 0 {
		t.Errorf("the decoder and its key tables disagree:\n%s", strings.Join(d, "\n"))
	}
}

// fuzzSeeds returns the stored FuzzDecode inputs.
func fuzzSeeds(t *testing.T) [][]byte {
	files, _ := filepath.Glob("testdata/fuzz/FuzzDecode/*")
	var out [][]byte
	for _, f := range files {
		data, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		// go test fuzz v1 / []byte("...")
		if m := regexp.MustCompile(`(?s)\[\]byte\((".*")\)`).FindSubmatch(data); m != nil {
			var s string
			if err := json.Unmarshal(m[1], &s); err == nil {
				out = append(out, []byte(s))
			}
		}
	}
	return out
}

// A drift is caught: a table that says a key is a quantity of another
// kind, and a key the table does not list.
func TestKeyDriftIsRecorded(t *testing.T) {
	takeDrift()
	d := &decoder{file: "x.yaml"}
	var n yaml.Node
	if err := yaml.Unmarshal([]byte("thickness: 0.1\nname: a\n"), &n); err != nil {
		t.Fatal(err)
	}
	o := d.object(n.Content[0], "", layerKeys)
	var v float64
	o.quantity("thickness", layers.Density, &v) // the table says Length
	var s string
	o.table = &keyTable{Name: "stale", Keys: []keySpec{k("thickness", "", fText)}}
	o.str("name", &s)
	got := takeDrift()
	if len(got) != 2 || !strings.Contains(got[0], "thickness") || !strings.Contains(got[1], "does not list") {
		t.Errorf("drift %q; want the wrong kind and the unlisted key", got)
	}
}

// Every example, starter and golden scenario validates against the
// published schema; every file of the bad-input catalogue whose mistake is
// structural (an unknown key, a value of the wrong type or not one of a
// fixed list of words, as the decoder's message says) fails it.
func TestSchemaValidatesCorpus(t *testing.T) {
	raw, err := os.ReadFile(publishedSchema)
	if err != nil {
		t.Fatal(err)
	}
	var schema map[string]any
	if err := json.Unmarshal(raw, &schema); err != nil {
		t.Fatal(err)
	}
	good, bad := corpus(t)
	for _, f := range good {
		if errs := validateFile(t, schema, f); len(errs) > 0 {
			t.Errorf("%s does not validate: %s", f, strings.Join(errs, "; "))
		}
	}
	structural := regexp.MustCompile(`unknown key|expected a list|expected a mapping|expected a single value|expected true or false|is not one of|a key must be a plain word`)
	expect := regexp.MustCompile(`(?m)^# expect: line \d+: (.+)$`)
	// The words of step_response.side and target.quantity depend on the
	// kind; the schema lists those of every kind, so a word of the other
	// kind passes it and only the decoder refuses it.
	byKind := map[string]bool{"step-response-side.yaml": true, "study-target-quantity.yaml": true}
	n := 0
	for _, f := range bad {
		data, _ := os.ReadFile(f)
		m := expect.FindSubmatch(data)
		if m == nil || !structural.Match(m[1]) || byKind[filepath.Base(f)] {
			continue
		}
		n++
		if errs := validateFile(t, schema, f); len(errs) == 0 {
			t.Errorf("%s (%s) passes the schema; its mistake is structural", f, m[1])
		}
	}
	if n < 20 {
		t.Errorf("only %d structurally broken files in the catalogue; the check needs them", n)
	}
	t.Logf("%d good files validate, %d structurally broken files fail", len(good), n)
}

// The starters carry the editor's schema line, and new writes the schema
// it names.
func TestStartersNameTheSchema(t *testing.T) {
	for _, kind := range []string{"wall", "ground"} {
		data, ok := Starter(kind)
		if !ok {
			t.Fatalf("no %s starter", kind)
		}
		first := strings.SplitN(string(data), "\n", 2)[0]
		if first != "# yaml-language-server: $schema="+SchemaFile {
			t.Errorf("%s starter begins %q; want the yaml-language-server schema line", kind, first)
		}
	}
}

func validateFile(t *testing.T, schema map[string]any, f string) []string {
	t.Helper()
	data, err := os.ReadFile(f)
	if err != nil {
		t.Fatal(err)
	}
	var doc any
	if err := yaml.Unmarshal(data, &doc); err != nil {
		return []string{"not YAML: " + err.Error()}
	}
	v := &validator{root: schema}
	v.check(schema, doc, "")
	return v.errs
}

// validator checks a decoded YAML document against the subset of JSON
// Schema (draft-07) that Schema writes: type, enum, properties,
// additionalProperties false, required, items, anyOf, $ref to
// #/definitions. It is written here from the specification (JSON Schema
// Validation, draft-07, sections 6.1.1, 6.1.2, 6.4.3, 6.5.2-6.5.4, 6.7.2;
// $ref resolution of JSON Schema Core, section 8 [memory]) so the check does
// not rest on the generator.
type validator struct {
	root map[string]any
	errs []string
}

func (v *validator) fail(path, format string, args ...any) {
	v.errs = append(v.errs, fmt.Sprintf("%s: %s", path, fmt.Sprintf(format, args...)))
}

// check appends the mistakes of value x against schema s to v.errs.
func (v *validator) check(s map[string]any, x any, path string) {
	if ref, ok := s["$ref"].(string); ok {
		name := strings.TrimPrefix(ref, "#/definitions/")
		def, ok := v.root["definitions"].(map[string]any)[name].(map[string]any)
		if !ok {
			v.fail(path, "unresolved $ref %s", ref)
			return
		}
		v.check(def, x, path)
		return
	}
	if alts, ok := s["anyOf"].([]any); ok {
		for _, a := range alts {
			sub := &validator{root: v.root}
			sub.check(a.(map[string]any), x, path)
			if len(sub.errs) == 0 {
				return
			}
		}
		v.fail(path, "matches none of the %d forms", len(alts))
		return
	}
	if ty, ok := s["type"]; ok && !typeMatches(ty, x) {
		v.fail(path, "is %T, want %v", x, ty)
		return
	}
	if enum, ok := s["enum"].([]any); ok {
		found := false
		for _, e := range enum {
			found = found || fmt.Sprint(e) == fmt.Sprint(x)
		}
		if !found {
			v.fail(path, "%v is not one of %v", x, enum)
		}
	}
	if m, ok := x.(map[string]any); ok {
		props, _ := s["properties"].(map[string]any)
		keys := make([]string, 0, len(m))
		for key := range m {
			keys = append(keys, key)
		}
		sort.Strings(keys)
		for _, key := range keys {
			ps, ok := props[key].(map[string]any)
			switch {
			case ok:
				v.check(ps, m[key], path+"."+key)
			case s["additionalProperties"] == false:
				v.fail(path, "unknown key %q", key)
			}
		}
		req, _ := s["required"].([]any)
		for _, r := range req {
			if _, ok := m[r.(string)]; !ok {
				v.fail(path, "missing %q", r)
			}
		}
	}
	if list, ok := x.([]any); ok {
		if items, ok := s["items"].(map[string]any); ok {
			for i, it := range list {
				v.check(items, it, fmt.Sprintf("%s[%d]", path, i+1))
			}
		}
	}
}

// typeMatches applies the type keyword (a name or a list of names).
func typeMatches(ty any, x any) bool {
	if list, ok := ty.([]any); ok {
		for _, t := range list {
			if typeMatches(t, x) {
				return true
			}
		}
		return false
	}
	switch ty {
	case "string":
		_, ok := x.(string)
		return ok
	case "boolean":
		_, ok := x.(bool)
		return ok
	case "integer":
		switch n := x.(type) {
		case int:
			return true
		case float64:
			return n == math.Trunc(n)
		}
		return false
	case "number":
		switch x.(type) {
		case int, float64:
			return true
		}
		return false
	case "array":
		_, ok := x.([]any)
		return ok
	case "object":
		_, ok := x.(map[string]any)
		return ok
	}
	return false
}
