package scenarios

import (
	"embed"
	"io/fs"
	"path"
	"sort"
	"strings"
)

//go:embed examples/*.yaml
var examplesFS embed.FS

//go:embed starters/*.yaml
var startersFS embed.FS

// DefaultExample is the embedded demo that `tempstack run` solves when it
// is given no file.
const DefaultExample = "brick-wall"

// Example is an embedded demo scenario (an invented place).
type Example struct {
	Name  string // file name without .yaml
	Title string // the scenario's title
	Data  []byte // the YAML text
}

// File is the name the example carries in messages and reports.
func (e Example) File() string { return "examples/" + e.Name + ".yaml" }

// Examples lists the embedded demo scenarios, sorted by name.
func Examples() []Example {
	entries, _ := fs.ReadDir(examplesFS, "examples")
	var out []Example
	for _, e := range entries {
		if !strings.HasSuffix(e.Name(), ".yaml") {
			continue
		}
		data, err := examplesFS.ReadFile(path.Join("examples", e.Name()))
		if err != nil {
			continue
		}
		ex := Example{Name: strings.TrimSuffix(e.Name(), ".yaml"), Data: data}
		if s, err := Decode(ex.File(), data); err == nil {
			ex.Title = s.Title
		}
		out = append(out, ex)
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Name < out[j].Name })
	return out
}

// LookupExample returns the embedded demo called name.
func LookupExample(name string) (Example, bool) {
	for _, e := range Examples() {
		if e.Name == name {
			return e, true
		}
	}
	return Example{}, false
}

// Starter returns the commented starter file for a scenario kind ("wall"
// or "ground").
func Starter(kind string) ([]byte, bool) {
	data, err := startersFS.ReadFile("starters/" + kind + ".yaml")
	return data, err == nil
}
