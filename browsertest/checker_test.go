package browsertest

import (
	"context"
	"crypto/sha256"
	"encoding/base64"
	"html"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"tempstack/scenarios"
)

// These tests check the checker: copies of a real report, each broken in
// one known way, must be reported as failing, with the right reason, while
// an untouched copy passes.

var (
	scriptRE = regexp.MustCompile(`(?s)<script>(.*?)</script>`)
	cspRE    = regexp.MustCompile(`<meta http-equiv="Content-Security-Policy" content="([^"]*)">`)
	srcRE    = regexp.MustCompile(`script-src[^;]*`)
)

// rehash rewrites the report's Content-Security-Policy so that it allows
// exactly the inline scripts the page now holds, as if the generator had
// produced the edited page itself. Without it, any edit to a script would
// only show up as a policy violation.
func rehash(t *testing.T, page string) string {
	t.Helper()
	m := cspRE.FindStringSubmatchIndex(page)
	if m == nil {
		t.Fatal("report has no Content-Security-Policy meta tag")
	}
	var src strings.Builder
	src.WriteString("script-src")
	for _, s := range scriptRE.FindAllStringSubmatch(page, -1) {
		h := sha256.Sum256([]byte(s[1]))
		src.WriteString(" 'sha256-" + base64.StdEncoding.EncodeToString(h[:]) + "'")
	}
	policy := html.UnescapeString(page[m[2]:m[3]])
	if !srcRE.MatchString(policy) {
		t.Fatalf("policy has no script-src: %q", policy)
	}
	policy = srcRE.ReplaceAllLiteralString(policy, src.String())
	return page[:m[2]] + html.EscapeString(policy) + page[m[3]:]
}

// dropCSP removes the Content-Security-Policy, as if the generator had
// stopped writing it.
func dropCSP(t *testing.T, page string) string {
	t.Helper()
	out := cspRE.ReplaceAllLiteralString(page, "")
	if out == page {
		t.Fatal("report has no Content-Security-Policy meta tag")
	}
	return out
}

// afterH1 inserts s right after the page's first heading.
func afterH1(t *testing.T, page, s string) string {
	t.Helper()
	i := strings.Index(page, "</h1>")
	if i < 0 {
		t.Fatal("report has no <h1>")
	}
	i += len("</h1>")
	return page[:i] + s + page[i:]
}

// chartEntry returns the start and end of the entry of chart id in the
// tsStart([...]) list of the data script.
func chartEntry(t *testing.T, page, id string) (int, int) {
	t.Helper()
	start := strings.Index(page, `{"id":"`+id+`"`)
	if start < 0 {
		t.Fatalf("chart %s not found in the data script", id)
	}
	end := matchClose(page, start)
	if end < 0 {
		t.Fatalf("entry of chart %s is not closed", id)
	}
	return start, end
}

// matchClose returns the index just past the bracket that closes the one
// at s[i] ('{' or '['), skipping JSON strings; -1 if there is none.
func matchClose(s string, i int) int {
	depth := 0
	for j := i; j < len(s); j++ {
		switch s[j] {
		case '"':
			for j++; j < len(s) && s[j] != '"'; j++ {
				if s[j] == '\\' {
					j++
				}
			}
		case '{', '[':
			depth++
		case '}', ']':
			depth--
			if depth == 0 {
				return j + 1
			}
		}
	}
	return -1
}

// removeChart deletes chart id from the data script, leaving its
// container empty.
func removeChart(t *testing.T, page, id string) string {
	t.Helper()
	start, end := chartEntry(t, page, id)
	// Drop the separating comma on one side.
	switch {
	case strings.HasPrefix(page[end:], ",\n"):
		end += 2
	case strings.HasPrefix(page[end:], ","):
		end++
	case strings.HasSuffix(page[:start], ",\n"):
		start -= 2
	case strings.HasSuffix(page[:start], ","):
		start--
	}
	return page[:start] + page[end:]
}

// emptySeries empties every "data" array in the option of chart id: the
// chart still draws its title, axes and legend, but no data.
func emptySeries(t *testing.T, page, id string) string {
	t.Helper()
	start, end := chartEntry(t, page, id)
	entry := page[start:end]
	var b strings.Builder
	n := 0
	for {
		k := strings.Index(entry, `"data":[`)
		if k < 0 {
			b.WriteString(entry)
			break
		}
		open := k + len(`"data":`)
		close := matchClose(entry, open)
		if close < 0 {
			t.Fatalf("unclosed data array in chart %s", id)
		}
		b.WriteString(entry[:open] + "[]")
		entry = entry[close:]
		n++
	}
	if n == 0 {
		t.Fatalf("chart %s has no data arrays", id)
	}
	return page[:start] + b.String() + page[end:]
}

// TestCheckerCatchesBrokenReports breaks a fresh demo report in one way
// at a time and requires the checker to fail it for that reason.
func TestCheckerCatchesBrokenReports(t *testing.T) {
	b, tool := setup(t)
	dir := t.TempDir()
	out := filepath.Join(dir, "out")
	runTool(t, tool, "run", "--example", scenarios.DefaultExample, "--out", out, "--quiet")
	raw, err := os.ReadFile(filepath.Join(out, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	orig := string(raw)
	const victim = "chart-cycle" // a chart every wall report has

	cases := []struct {
		name string
		edit func(string) string
		want string // a reason problems() must give; "" for the control
	}{
		{"control, policy rewritten", func(p string) string { return rehash(t, p) }, ""},
		{"one chart's data removed", func(p string) string {
			return rehash(t, removeChart(t, p, victim))
		}, `chart "` + victim + `": no canvas or svg`},
		{"one chart's series emptied", func(p string) string {
			return rehash(t, emptySeries(t, p, victim))
		}, `chart "` + victim + `": no data drawn`},
		{"data script removed", func(p string) string {
			i := strings.Index(p, "<script>tsStart(")
			j := strings.Index(p[i:], "</script>")
			return rehash(t, p[:i]+p[i+j+len("</script>"):])
		}, "no canvas or svg"},
		{"data script mangled", func(p string) string {
			return rehash(t, strings.Replace(p, "<script>tsStart([", "<script>tsStart([{,", 1))
		}, "uncaught exception"},
		{"chart box collapsed", func(p string) string {
			return strings.Replace(p, `id="`+victim+`"`, `id="`+victim+`" style="height:0"`, 1)
		}, "container is"},
		{"live script, no policy", func(p string) string {
			return afterH1(t, dropCSP(t, p), `<script>window.__pwned=1</script>`)
		}, "window.__pwned is set"},
		{"live script made trusted", func(p string) string {
			return rehash(t, afterH1(t, p, `<script>window.__pwned=1</script>`))
		}, "window.__pwned is set"},
		{"event handler, policy kept", func(p string) string {
			return afterH1(t, p, `<img src=x onerror="window.__pwned=1">`)
		}, "content security policy violation"},
		{"script element, policy kept", func(p string) string {
			return afterH1(t, p, `<script>window.__pwned=1</script>`)
		}, "content security policy violation"},
		{"dialog", func(p string) string {
			return afterH1(t, dropCSP(t, p), `<script>alert("hello")</script>`)
		}, "dialog opened"},
		{"network image", func(p string) string {
			// Loopback only; the checker fails the request before it leaves.
			return afterH1(t, dropCSP(t, p), `<img src="http://127.0.0.1:9/pixel.png" alt="">`)
		}, "request other than the report itself: http://127.0.0.1:9/pixel.png"},
		{"network fetch", func(p string) string {
			return afterH1(t, dropCSP(t, p), `<script>fetch("http://127.0.0.1:9/data").catch(function(){})</script>`)
		}, "request other than the report itself: http://127.0.0.1:9/data"},
		{"console error", func(p string) string {
			return rehash(t, afterH1(t, p, `<script>console.error("drawing failed")</script>`))
		}, "console error"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			path := filepath.Join(dir, strings.ReplaceAll(c.name, " ", "-")+".html")
			page := c.edit(orig)
			if c.want != "" && page == orig {
				t.Fatal("the edit changed nothing")
			}
			if err := os.WriteFile(path, []byte(page), 0o644); err != nil {
				t.Fatal(err)
			}
			res, err := b.visit(context.Background(), path, "")
			if err != nil {
				t.Fatalf("%v\nchromium log:\n%s", err, b.log())
			}
			probs := res.problems(1)
			logResult(t, res)
			if c.want == "" {
				for _, p := range probs {
					t.Errorf("unbroken copy failed: %s", p)
				}
				return
			}
			if len(probs) == 0 {
				t.Fatalf("checker passed a broken report (want a failure containing %q)", c.want)
			}
			found := false
			for _, p := range probs {
				if strings.Contains(p, c.want) {
					found = true
				}
			}
			if !found {
				t.Errorf("checker failed it, but not for the expected reason %q:\n%s", c.want, strings.Join(probs, "\n"))
			} else {
				t.Logf("caught: %s", strings.Join(probs, "; "))
			}
		})
	}
}
