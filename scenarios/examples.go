package scenarios

import (
	"bytes"
	"embed"
	"io"
	"io/fs"
	"path"
	"sort"
	"strings"
	"sync"
	"time"

	"tempstack/climate"
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

// Decode decodes the example; files it names are read from the embedded
// examples folder.
func (e Example) Decode() (*Scenario, error) {
	return DecodeFS(e.File(), e.Data, ExampleFiles())
}

// DemoSeriesFile is the name of the invented demo station record that the
// examples may name. It is not stored twice: it is made on first use by
// climate.GenerateDemo with the settings of the committed
// testdata/climate/demo-station.csv, whose bytes a climate test holds equal
// to the generator's output.
const DemoSeriesFile = "demo-station.csv"

var (
	demoOnce sync.Once
	demoCSV  []byte
)

func demoSeries() []byte {
	demoOnce.Do(func() {
		var b bytes.Buffer
		s := climate.GenerateDemo(climate.DemoSeed, climate.DemoYears)
		if err := climate.WriteCSV(&b, s, 1, climate.DemoComments(climate.DemoSeed, climate.DemoYears)...); err == nil {
			demoCSV = b.Bytes()
		}
	})
	return demoCSV
}

// ExampleFiles is the read-only file system of the embedded examples: the
// scenario files and the demo series.
func ExampleFiles() fs.FS { return exampleFS{} }

type exampleFS struct{}

func (exampleFS) Open(name string) (fs.File, error) {
	if name == DemoSeriesFile {
		return &memFile{name: name, Reader: bytes.NewReader(demoSeries()), size: int64(len(demoSeries()))}, nil
	}
	sub, err := fs.Sub(examplesFS, "examples")
	if err != nil {
		return nil, err
	}
	return sub.Open(name)
}

// memFile is an in-memory fs.File.
type memFile struct {
	*bytes.Reader
	name string
	size int64
}

func (f *memFile) Stat() (fs.FileInfo, error) { return memInfo{f.name, f.size}, nil }
func (f *memFile) Close() error               { return nil }

var _ io.Reader = (*memFile)(nil)

type memInfo struct {
	name string
	size int64
}

func (i memInfo) Name() string       { return i.name }
func (i memInfo) Size() int64        { return i.size }
func (i memInfo) Mode() fs.FileMode  { return 0o444 }
func (i memInfo) ModTime() time.Time { return time.Time{} }
func (i memInfo) IsDir() bool        { return false }
func (i memInfo) Sys() any           { return nil }

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
		ex.Title = titleOf(data)
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

// titleOf reads the title line of a scenario without decoding it (decoding
// an example may read its series).
func titleOf(data []byte) string {
	for _, line := range strings.Split(string(data), "\n") {
		if strings.HasPrefix(line, "title:") {
			return strings.TrimSpace(strings.TrimPrefix(line, "title:"))
		}
	}
	return ""
}
