package scenarios

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	"gopkg.in/yaml.v3"

	"tempstack/layers"
)

// maxLayers bounds the layers of a column: real constructions have a
// handful, measured soil profiles a few dozen.
const maxLayers = 1000

// maxFileSize bounds a scenario file; anything larger is surely not one.
const maxFileSize = 4 << 20

// Load reads and decodes the scenario file at path.
func Load(path string) (*Scenario, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, &Error{File: path, Err: osCause(err)}
	}
	defer f.Close()
	data, err := io.ReadAll(io.LimitReader(f, maxFileSize+1))
	if err != nil {
		return nil, &Error{File: path, Err: osCause(err)}
	}
	if len(data) > maxFileSize {
		return nil, &Error{File: path, Msg: fmt.Sprintf("file is larger than %d MiB; is it a scenario file?", maxFileSize>>20)}
	}
	return Decode(path, data)
}

// osCause is the cause of a failed file operation without the path the
// message already names (the *os.PathError's own error, which
// errors.Is still matches against fs.ErrNotExist).
func osCause(err error) error {
	var pe *os.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

func cleanOSError(err error) string {
	var pe *os.PathError
	if errors.As(err, &pe) {
		return pe.Err.Error()
	}
	return err.Error()
}

// Decode decodes a scenario from data; file names it in error messages and
// files the scenario names (CSV series) are read relative to its folder.
func Decode(file string, data []byte) (*Scenario, error) {
	return DecodeFS(file, data, os.DirFS(filepath.Dir(file)))
}

// DecodeFS is Decode with the files the scenario names read from fsys.
func DecodeFS(file string, data []byte, fsys fs.FS) (*Scenario, error) {
	doc, err := parseYAML(file, data)
	if err != nil {
		return nil, err
	}
	return decodeDoc(file, doc, fsys, nil)
}

// parseYAML parses data into its one YAML document node.
func parseYAML(file string, data []byte) (*yaml.Node, error) {
	d := &decoder{file: file}
	if len(bytes.TrimSpace(data)) == 0 {
		return nil, &Error{File: file, Line: 1, Msg: "file is empty; start from `tempstack new wall`"}
	}
	var doc yaml.Node
	dec := yaml.NewDecoder(bytes.NewReader(data))
	if err := dec.Decode(&doc); err != nil {
		if errors.Is(err, io.EOF) {
			return nil, &Error{File: file, Line: 1, Msg: "file is empty (only comments); start from `tempstack new wall`"}
		}
		return nil, yamlError(file, data, err)
	}
	var extra yaml.Node
	if err := dec.Decode(&extra); err == nil {
		return nil, d.errf(&extra, "", "the file holds more than one YAML document (a second '---'); a scenario is one document")
	}
	if doc.Kind != yaml.DocumentNode || len(doc.Content) == 0 {
		return nil, &Error{File: file, Line: 1, Msg: "file is empty (only comments); start from `tempstack new wall`"}
	}
	return doc.Content[0], nil
}

// decodeDoc decodes the top mapping of a scenario. It reads on past a
// mistake and returns every mistake it met (up to maxErrors): an *Error
// for one, a fileerr.List for several.
func decodeDoc(file string, root *yaml.Node, fsys fs.FS, cache *seriesCache) (*Scenario, error) {
	if cache == nil {
		cache = &seriesCache{}
	}
	d := &decoder{file: file, fsys: fsys, cache: cache}
	top := d.object(root, "", topKeys)
	if top == nil {
		return nil, d.err()
	}
	s := &Scenario{File: file}
	d.decodeHeader(top, s)
	if s.Kind == "" {
		// Every other key depends on the kind.
		return nil, d.err()
	}
	if s.Kind == Room {
		return d.decodeRoomDoc(top, s, root, fsys, cache)
	}
	rejectRoomKeys(top, s)
	d.decodeOrientation(top, s)
	layersClean := d.decodeLayers(top, s)
	d.decodeSides(top, s)
	d.decodeAnalysis(top, s, layersClean)
	d.decodeStudy(top, s)
	if err := d.err(); err != nil {
		return nil, err
	}
	if err := homogeniseMixes(s); err != nil {
		return nil, err
	}
	if s.Analysis.Simulate != nil && s.Outside.Temperature != nil {
		// Resolved here, once: no run changes a decoded scenario.
		simDefaults(s)
	}
	s.root, s.fsys, s.cache = root, fsys, cache
	if err := checkStudy(s); err != nil {
		return nil, err
	}
	return s, nil
}

// decodeHeader reads title, description and kind.
func (d *decoder) decodeHeader(top *object, s *Scenario) {
	if !top.has("title") || top.str("title", &s.Title) && s.Title == "" {
		top.missing("title", "a one-line name for the report")
	}
	top.str("description", &s.Description)
	decodeTitleBlock(top, s)
	var kind string
	if top.choice("kind", kindWords(), &kind) {
		s.Kind = Kind(kind)
	} else if !top.has("kind") {
		top.missing("kind", "wall, ground or room")
	}
}

// yamlError turns a yaml.v3 syntax error ("yaml: line 3: ...") into an
// *Error with the line split out.
func yamlError(file string, data []byte, err error) error {
	msg := err.Error()
	msg = strings.TrimPrefix(msg, "yaml: ")
	line := 0
	if n, _ := fmt.Sscanf(msg, "line %d:", &line); n == 1 {
		if i := strings.Index(msg, ":"); i >= 0 {
			msg = strings.TrimSpace(msg[i+1:])
		}
	}
	if te := (*yaml.TypeError)(nil); errors.As(err, &te) && len(te.Errors) > 0 {
		msg = te.Errors[0]
	}
	if line > 0 && (msg == "did not find expected key" || msg == "did not find expected '-' indicator") {
		if bad := firstFailingLine(data, line, msg); bad > line {
			return &Error{File: file, Line: bad, Msg: "not valid YAML: this line is not indented like the lines above it (" + msg + ")"}
		}
	}
	if line == 0 {
		// yaml.v3 gives no line for some errors: an unclosed quote or
		// bracket runs to the end of the file; others point at the top.
		line = 1
		if strings.Contains(msg, "end of stream") {
			line = bytes.Count(bytes.TrimRight(data, "\n"), []byte("\n")) + 1
			msg += " (an unclosed quote or bracket?)"
		}
	}
	return &Error{File: file, Line: line, Msg: "not valid YAML: " + msg}
}

// firstFailingLine finds the line of a mis-indented key. yaml.v3 reports
// "did not find expected key" (and "... '-' indicator") at the line where
// the enclosing block starts (its context mark), not at the offending line.
// The offending line is the first line n after from at which the file cut
// after line n fails to parse with the same message msg; 0 when there is
// none (the cut then fails otherwise, e.g. inside a multi-line quote).
func firstFailingLine(data []byte, from int, msg string) int {
	lines := bytes.SplitAfter(data, []byte("\n"))
	for n := from + 1; n <= len(lines) && n <= from+2000; n++ {
		var doc yaml.Node
		err := yaml.Unmarshal(bytes.Join(lines[:n], nil), &doc)
		if err == nil {
			continue
		}
		if strings.HasSuffix(err.Error(), ": "+msg) {
			return n
		}
		return 0
	}
	return 0
}

func (d *decoder) decodeOrientation(top *object, s *Scenario) {
	word := "wall"
	if top.choice("orientation", []string{"wall", "roof", "floor"}, &word) && s.Kind == Ground {
		top.failf("orientation", "applies to kind: wall only (a ground column is always horizontal)")
		word = "wall"
	}
	o, err := layers.ParseOrientation(word)
	if err != nil {
		top.fail("orientation", err)
	}
	s.Orientation = o
}
