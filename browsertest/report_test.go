package browsertest

import (
	"context"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"tempstack/scenarios"
)

// envRequire is the variable that turns a missing browser from a skip into
// a failure.
const envRequire = "TEMPSTACK_BROWSER_TEST"

// shared holds what every test here needs once: a running chromium and a
// freshly built tempstack binary.
var shared struct {
	once    sync.Once
	browser *browser
	tool    string // path of the built tempstack binary
	tmp     string
	err     error
	skip    string
}

func TestMain(m *testing.M) {
	code := m.Run()
	if shared.browser != nil {
		shared.browser.close()
	}
	if shared.tmp != "" {
		os.RemoveAll(shared.tmp)
	}
	os.Exit(code)
}

// setup returns the shared browser and tool, skipping or failing t when
// chromium is missing (see the package comment).
func setup(t *testing.T) (*browser, string) {
	t.Helper()
	shared.once.Do(func() {
		path := findChromium()
		if path == "" {
			shared.skip = "chromium is not installed (apt-get install chromium)"
			return
		}
		if testing.Short() && os.Getenv(envRequire) != "1" {
			shared.skip = "browser test skipped in -short mode"
			return
		}
		tmp, err := os.MkdirTemp("", "tempstack-browsertest-")
		if err != nil {
			shared.err = err
			return
		}
		shared.tmp = tmp
		shared.tool = filepath.Join(tmp, "tempstack")
		goBin, err := exec.LookPath("go")
		if err != nil {
			shared.err = fmt.Errorf("the go command is needed to build tempstack: %w", err)
			return
		}
		build := exec.Command(goBin, "build", "-o", shared.tool, "tempstack/cmd/tempstack")
		if out, err := build.CombinedOutput(); err != nil {
			shared.err = fmt.Errorf("building tempstack: %v\n%s", err, out)
			return
		}
		if err := openToolSources(goBin); err != nil {
			shared.err = err
			return
		}
		shared.browser, shared.err = launchBrowser(path, filepath.Join(tmp, "profile"))
	})
	if shared.skip != "" {
		if os.Getenv(envRequire) == "1" {
			t.Fatalf("%s=1 but: %s", envRequire, shared.skip)
		}
		t.Skip(shared.skip + "; set " + envRequire + "=1 to make this a failure")
	}
	if shared.err != nil {
		t.Fatal(shared.err)
	}
	return shared.browser, shared.tool
}

// openToolSources opens (and closes) every file of this module that goes
// into the tempstack binary: the Go and embedded files of each package
// tempstack/cmd/tempstack depends on, and go.mod and go.sum. The binary is
// built by a separate go command, which the go test cache cannot see; the
// files a test opens are part of its cache key, so opening them makes a
// cached result of this package stand only while none of them changed
// (a change to the report's script or template, the charts package or the
// command reruns the browser test; nothing else does).
func openToolSources(goBin string) error {
	const format = `{{if .Module}}{{if .Module.Main}}{{.Dir}}|{{join .GoFiles ","}}|{{join .EmbedFiles ","}}{{end}}{{end}}`
	out, err := exec.Command(goBin, "list", "-deps", "-f", format, "tempstack/cmd/tempstack").Output()
	if err != nil {
		return fmt.Errorf("listing the sources of tempstack: %v", err)
	}
	root, err := filepath.Abs("..")
	if err != nil {
		return err
	}
	files := []string{filepath.Join(root, "go.mod"), filepath.Join(root, "go.sum")}
	for _, line := range strings.Split(strings.TrimSpace(string(out)), "\n") {
		parts := strings.Split(line, "|")
		if len(parts) != 3 {
			continue
		}
		for _, list := range parts[1:] {
			for _, name := range strings.Split(list, ",") {
				if name != "" {
					files = append(files, filepath.Join(parts[0], name))
				}
			}
		}
	}
	if len(files) < 10 {
		return fmt.Errorf("go list named only %d source files of tempstack", len(files))
	}
	for _, name := range files {
		f, err := os.Open(name)
		if err != nil {
			return err
		}
		f.Close()
	}
	return nil
}

// runTool runs the built tempstack with args and fails t on a non-zero
// exit.
func runTool(t *testing.T, tool string, args ...string) {
	t.Helper()
	cmd := exec.Command(tool, args...)
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("tempstack %s: %v\n%s", strings.Join(args, " "), err, out)
	}
}

// screenshotPath is where the screenshot called name is saved:
// in the folder TEMPSTACK_SCREENSHOTS (made when missing), or nowhere ("")
// when that is not set. Screenshots are for people to look at, not part of
// any check; writing them on every run would also keep go test from
// caching this package (a file written during a test is too new to trust).
func screenshotPath(name string) string {
	d := os.Getenv("TEMPSTACK_SCREENSHOTS")
	if d == "" {
		return ""
	}
	return filepath.Join(d, name)
}

// logResult writes what the page reported into the test log.
func logResult(t *testing.T, r *pageResult) {
	t.Helper()
	for _, c := range r.State.Charts {
		t.Logf("chart %-22s %dx%d canvases=%d svgs=%d ink=%d coloured=%d (in %d plot areas: %d) echarts=%v",
			c.ID, c.Width, c.Height, c.Canvases, c.SVGs, c.Ink, c.Colour, c.Grids, c.PlotColour, c.Instance)
	}
	for _, w := range r.Warnings {
		t.Logf("console warning (not a failure): %s", w)
	}
	if r.Screenshot != "" {
		t.Logf("screenshot: %s", r.Screenshot)
	}
}

// TestDemoReports generates the report of every embedded example with the
// tempstack binary and opens it in chromium from its file:// URL.
func TestDemoReports(t *testing.T) {
	b, tool := setup(t)
	examples := scenarios.Examples()
	if len(examples) == 0 {
		t.Fatal("no embedded examples found")
	}
	for _, ex := range examples {
		t.Run(ex.Name, func(t *testing.T) {
			t.Parallel()
			start := time.Now()
			out := filepath.Join(t.TempDir(), "out")
			runTool(t, tool, "run", "--example", ex.Name, "--out", out, "--quiet")
			t.Logf("tempstack run took %v", time.Since(start).Round(time.Millisecond))
			start = time.Now()
			res, err := b.visit(context.Background(), filepath.Join(out, "report.html"),
				screenshotPath(ex.Name+".png"))
			if err != nil {
				t.Fatalf("%v\nchromium log:\n%s", err, b.log())
			}
			logResult(t, res)
			for _, p := range res.problems(1) {
				t.Error(p)
			}
			if !strings.Contains(res.State.H1, ex.Title) {
				t.Errorf("heading is %q, want the scenario title %q", res.State.H1, ex.Title)
			}
			t.Logf("browser check took %v", time.Since(start).Round(time.Millisecond))
		})
	}
}

// payloads are strings that would run as script if any layer of the
// report (HTML text, attribute, inline JSON, go-echarts' function marker,
// template literal, the trusted-function placeholders) let them through.
// Each sets window.__pwned or opens a dialog if it runs.
var payloads = []string{
	`</script><script>window.__pwned=1</script>`,
	`<img src=x onerror="window.__pwned=2;alert(2)">`,
	`__f__function(){window.__pwned=3}__f__`,
	`"}]}});window.__pwned=4;//`,
	`${window.__pwned=5}`,
	`<svg onload="window.__pwned=6">`,
	`</title><script>window.__pwned=7;alert(7)</script>`,
	`<!--<script>window.__pwned=8</script>-->`,
	`'><img src=x onerror=window.__pwned=9>`,
	`javascript:window.__pwned=10`,
	`__tsfn_tipX__`,
	"line\u2028separator\u2029__f__alert(11)__f__",
	`<iframe srcdoc="<script>parent.__pwned=12</script>"></iframe>`,
	`<a href="javascript:window.__pwned=13">x</a>&amp;&lt;`,
}

// yamlQuote returns s as a YAML single-quoted scalar.
func yamlQuote(s string) string {
	return "'" + strings.ReplaceAll(s, "'", "''") + "'"
}

// hostileScenario is a valid wall scenario whose every free-text field
// (title, description, inline layer names, library layer renamed) carries
// the payloads.
func hostileScenario() string {
	var b strings.Builder
	fmt.Fprintf(&b, "title: %s\n", yamlQuote("Hostile "+strings.Join(payloads[:7], " ")))
	fmt.Fprintf(&b, "description: %s\n", yamlQuote(strings.Join(payloads, " | ")))
	b.WriteString("kind: wall\norientation: wall\nlayers:\n")
	// Library materials renamed, then inline layers named with a payload each.
	fmt.Fprintf(&b, "  - material: cement-render\n    name: %s\n    thickness: 20 mm\n", yamlQuote(payloads[0]))
	fmt.Fprintf(&b, "  - material: clay-brick\n    name: %s\n    thickness: 240 mm\n", yamlQuote(payloads[1]))
	for i, p := range payloads[2:] {
		fmt.Fprintf(&b, "  - name: %s\n    conductivity: %g\n    density: %d\n    specific_heat: 1000\n    thickness: 10 mm\n",
			yamlQuote(p), 0.5+0.1*float64(i), 800+100*i)
	}
	b.WriteString(`outside:
  resistance: 0.04
  temperature:
    mean: 11
    daily: {amplitude: 9, peak_hour: 15}
    annual: {amplitude: 8, peak_day: 200}
inside:
  resistance: 0.13
  temperature: {mean: 20}
analysis:
  periods: [24h, 8760h]
  probes: [0.05, 0.15]
`)
	return b.String()
}

// TestInjectedText runs tempstack on a scenario whose text fields (and
// file name) hold script in every shape we know of, opens the report and
// checks that nothing ran, no dialog opened, and the text is shown as
// text.
func TestInjectedText(t *testing.T) {
	b, tool := setup(t)
	dir := t.TempDir()
	// The file name is printed in the report too.
	file := filepath.Join(dir, `wall<img src=x onerror=window.__pwned=20>.yaml`)
	if err := os.WriteFile(file, []byte(hostileScenario()), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "out")
	runTool(t, tool, "run", file, "--out", out, "--quiet")
	res, err := b.visit(context.Background(), filepath.Join(out, "report.html"),
		screenshotPath("injected-text.png"))
	if err != nil {
		t.Fatalf("%v\nchromium log:\n%s", err, b.log())
	}
	logResult(t, res)
	for _, p := range res.problems(1) {
		t.Error(p)
	}
	// The text must be shown literally, not dropped or half-parsed.
	for _, want := range []string{payloads[0], payloads[1], payloads[6]} {
		if !strings.Contains(res.State.H1, want) {
			t.Errorf("heading %q does not show %q literally", res.State.H1, want)
		}
	}
	for _, p := range payloads[:4] {
		if !strings.Contains(res.State.BodyText, p) {
			t.Errorf("page text does not show the layer name %q literally", p)
		}
	}
}
