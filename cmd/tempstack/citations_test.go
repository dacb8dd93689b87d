package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io/fs"
	"os"
	pathpkg "path"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// Every source the repository cites must be findable from the repository
// itself: a comment, test or output string names the publication (author,
// title, table or equation; standard and clause), never a note kept outside
// the repository. outsideRefs finds the ways a text can point outside:
//
//   - the two project notes that live next to the repository (matched by
//     name, in any letter case);
//   - the name of the reference note in capitals, as it used to be cited
//     (the capitalised word followed by "section 4"); the ordinary word
//     "References" is not matched;
//   - a relative path whose "../" steps climb above the repository root,
//     resolved from the directory of the file that holds it;
//   - an absolute path into a home or work directory (a path under "~/"
//     is left alone: the completion help tells users to edit ~/.bashrc).
//
// The words are split so that this file does not itself match a plain
// grep for them.
var outsideRefs = []*regexp.Regexp{
	regexp.MustCompile(`(?i)\b(DESIG[N]|REFERENCE[S])\.md\b`),
	regexp.MustCompile(`\bREFERENCE[S]\b`),
	regexp.MustCompile(`(?:^|[^\w/])/(?:work|home|Users|root|mnt)/[\w.-]`),
}

// climbRE matches a run of "../" steps and the name after it.
var climbRE = regexp.MustCompile(`(?:\.\./)+[\w.-]*`)

// outsideRefsIn returns a description of every reference to something
// outside the repository in text, which is the content of the file at
// rel (slash-separated, relative to the repository root). With a root
// directory, a "../" path that stays inside the repository must also
// exist there.
func outsideRefsIn(root, rel, text string) []string {
	var found []string
	for i, line := range strings.Split(text, "\n") {
		for _, re := range outsideRefs {
			if m := re.FindString(line); m != "" {
				found = append(found, fmt.Sprintf("%s:%d: %q", rel, i+1, strings.TrimSpace(m)))
			}
		}
		for _, m := range climbRE.FindAllString(line, -1) {
			// Depth of the file's directory below the root, against the
			// number of steps up.
			depth := strings.Count(rel, "/")
			if strings.Count(m, "../") > depth {
				found = append(found, fmt.Sprintf("%s:%d: path %q leaves the repository", rel, i+1, m))
				continue
			}
			if name := strings.TrimLeft(m, "./"); root != "" && name != "" {
				p := filepath.Join(root, filepath.FromSlash(pathpkg.Dir(rel)), filepath.FromSlash(m))
				if _, err := os.Stat(p); err != nil {
					found = append(found, fmt.Sprintf("%s:%d: path %q leads nowhere in the repository", rel, i+1, m))
				}
			}
		}
	}
	return found
}

func TestOutsideRefsDetector(t *testing.T) {
	root, err := filepath.Abs(filepath.Join("..", ".."))
	if err != nil {
		t.Fatal(err)
	}
	ref, des := "REFER"+"ENCES", "DES"+"IGN.md"
	for _, tc := range []struct {
		rel, text string
		bad       bool
	}{
		{"ground/frost_test.go", "// Example 11.7 [read, " + ref + " section 4]", true},
		{"ground/frost_test.go", "// see " + strings.ToLower(ref) + ".md", true},
		{"scenarios/results.go", "// " + des + ": core keys are never renamed", true},
		{"layers/materials.go", `src = "ISO 10456 [read, as quoted in ` + ref + `]"`, true},
		{"README.md", "see .." + "/shared/notes.md", true},
		{"layers/materials.go", `"see .` + `./nowhere/notes.md"`, true},
		{"cmd/tempstack/x.go", `"../../testdata/bad"`, false},
		{"cmd/tempstack/x.go", `"../../` + `.` + `./shared/x"`, true},
		{"a.go", "// cp /wo" + "rk/shared/x .", true},
		{"a.go", "// see /ho" + "me/someone/notes.md", true},
		{"a.go", "// Handy and Spangler (2007), Geotechnical Engineering, Example 11.7 [2nd-hand]", false},
		{"a.go", "// References: Incropera et al., section 5.7", false},
		{"a.go", `x := a/work/b`, false},
	} {
		if got := outsideRefsIn(root, tc.rel, tc.text); (len(got) > 0) != tc.bad {
			t.Errorf("%s %q: found %q, want a finding: %v", tc.rel, tc.text, got, tc.bad)
		}
	}
}

// TestNoOutsideReferences scans every text file of the repository (Go
// code, tests, Markdown, scenario files, the report's assets and test
// data) and the materials library as `tempstack materials` prints it.
func TestNoOutsideReferences(t *testing.T) {
	root, err := filepath.Abs(filepath.Join("..", ".."))
	if err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(root, "go.mod")); err != nil {
		t.Fatalf("repository root not found: %v", err)
	}
	var findings []string
	scanned := 0
	err = filepath.WalkDir(root, func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(root, path)
		rel = filepath.ToSlash(rel)
		if d.IsDir() {
			if strings.HasPrefix(d.Name(), ".") && rel != "." && d.Name() != ".ci" {
				return filepath.SkipDir
			}
			return nil
		}
		if d.Name() == ".git" {
			return nil // a worktree's pointer to its repository
		}
		// The bundled chart library is third-party code, kept as shipped.
		if strings.HasSuffix(rel, ".min.js") {
			return nil
		}
		data, err := os.ReadFile(path)
		if err != nil {
			return err
		}
		if bytes.IndexByte(data, 0) >= 0 {
			return nil // binary
		}
		scanned++
		findings = append(findings, outsideRefsIn(root, rel, string(data))...)
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if scanned < 100 {
		t.Fatalf("scanned only %d files", scanned)
	}
	code, out, errOut := runCLI(t, "materials", "--json")
	if code != 0 {
		t.Fatalf("materials: exit %d: %s", code, errOut)
	}
	var rows []materialRow
	if err := json.Unmarshal([]byte(out), &rows); err != nil || len(rows) < 20 {
		t.Fatalf("materials --json: %d rows, %v", len(rows), err)
	}
	for _, r := range rows {
		findings = append(findings, outsideRefsIn("", "tempstack materials "+r.Key, r.Name+"\n"+r.Source)...)
	}
	for _, f := range findings {
		t.Errorf("reference to something outside the repository (cite the publication itself): %s", f)
	}
}
