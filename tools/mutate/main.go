// Command mutate is the mutation harness of tempstack: it plants realistic
// bugs in the code one at a time and checks that the tests notice.
//
// Each mutant (mutants.go) names a file, an exact snippet of it (which must
// occur exactly once), its replacement, a one-line description and the
// packages whose tests should catch it. The harness copies the working tree
// (the files git knows, plus untracked ones that are not ignored) into a
// temporary folder per worker, applies one mutant, runs
//
//	go test -count=1 -timeout T PACKAGES
//
// and restores the file. A mutant is killed when the tests fail, survived
// when they pass. A mutant whose snippet does not occur exactly once
// (the code moved on) is reported as stale and makes the run exit 2; a
// mutant that does not compile is reported as a build error. Neither counts
// towards the score, which is killed / (killed + survived).
//
// Usage, from anywhere in the repository:
//
//	go run ./tools/mutate                 # every mutant, 2 workers
//	go run ./tools/mutate -run 'soil|kersten' -j 1 -v
//	go run ./tools/mutate -list
//
// It is not a test and never runs in `go test ./...`.
package main

import (
	"bytes"
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"sort"
	"strings"
	"sync"
	"time"
)

// status is the outcome of one mutant.
type status string

const (
	killed     status = "killed"
	survived   status = "SURVIVED"
	stale      status = "STALE"
	buildError status = "build-error"
)

type outcome struct {
	m       Mutant
	status  status
	elapsed time.Duration
	detail  string // first failing test, or why the mutant could not be applied
}

func main() {
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}

func run(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("mutate", flag.ContinueOnError)
	fs.SetOutput(stderr)
	pattern := fs.String("run", "", "only mutants whose id or file matches this regular expression")
	workers := fs.Int("j", 2, "mutants tested in parallel")
	timeout := fs.Duration("timeout", 4*time.Minute, "go test -timeout for one mutant")
	verbose := fs.Bool("v", false, "print the test output of survivors and build errors")
	list := fs.Bool("list", false, "list the mutants, check that each applies, and exit")
	if err := fs.Parse(args); err != nil {
		return 2
	}
	sel, err := selectMutants(mutants, *pattern)
	if err != nil {
		fmt.Fprintln(stderr, "mutate:", err)
		return 2
	}
	root, err := repoRoot()
	if err != nil {
		fmt.Fprintln(stderr, "mutate:", err)
		return 2
	}
	if *list {
		code := 0
		for _, m := range sel {
			st := "ok"
			if why := checkApplies(root, m); why != "" {
				st, code = "STALE", 2
			}
			fmt.Fprintf(stdout, "%-28s %-5s %-26s %s\n", m.ID, st, m.File, m.Desc)
		}
		fmt.Fprintf(stdout, "%d mutants\n", len(sel))
		return code
	}
	files, err := repoFiles(root)
	if err != nil {
		fmt.Fprintln(stderr, "mutate:", err)
		return 2
	}

	// Check every snippet against the working tree first: stale mutants are
	// reported loudly, never silently counted.
	var results []outcome
	var todo []Mutant
	for _, m := range sel {
		if why := checkApplies(root, m); why != "" {
			results = append(results, outcome{m: m, status: stale, detail: why})
			continue
		}
		todo = append(todo, m)
	}

	if *workers < 1 {
		*workers = 1
	}
	dirs := make([]string, *workers)
	for i := range dirs {
		d, err := os.MkdirTemp("", "tempstack-mutate-")
		if err != nil {
			fmt.Fprintln(stderr, "mutate:", err)
			return 2
		}
		defer os.RemoveAll(d)
		if err := copyTree(root, d, files); err != nil {
			fmt.Fprintln(stderr, "mutate:", err)
			return 2
		}
		dirs[i] = d
	}

	// The unmutated tree must pass, or every mutant would look killed.
	pkgs := map[string]bool{}
	for _, m := range todo {
		for _, p := range m.Pkgs {
			pkgs[p] = true
		}
	}
	if len(todo) > 0 {
		var all []string
		for p := range pkgs {
			all = append(all, p)
		}
		sort.Strings(all)
		fmt.Fprintf(stderr, "baseline: go test %s\n", strings.Join(all, " "))
		if ok, out := goTest(dirs[0], all, *timeout); !ok {
			fmt.Fprintf(stderr, "mutate: the unmutated tree fails its tests:\n%s\n", out)
			return 2
		}
	}

	start := time.Now()
	jobs := make(chan int)
	out := make([]outcome, len(todo))
	var wg sync.WaitGroup
	var mu sync.Mutex
	done := 0
	for w := 0; w < len(dirs); w++ {
		wg.Add(1)
		go func(dir string) {
			defer wg.Done()
			for i := range jobs {
				o := testMutant(dir, todo[i], *timeout)
				out[i] = o
				mu.Lock()
				done++
				fmt.Fprintf(stderr, "[%d/%d] %-28s %-11s %5.1fs\n", done, len(todo), o.m.ID, o.status, o.elapsed.Seconds())
				if *verbose && (o.status == survived || o.status == buildError) {
					fmt.Fprintln(stderr, o.detail)
				}
				mu.Unlock()
			}
		}(dirs[w])
	}
	for i := range todo {
		jobs <- i
	}
	close(jobs)
	wg.Wait()
	results = append(results, out...)
	report(stdout, results, time.Since(start))
	for _, o := range results {
		if o.status == stale {
			return 2
		}
	}
	return 0
}

// selectMutants checks the list for duplicate ids and empty fields and
// returns the mutants whose id or file matches pattern.
func selectMutants(all []Mutant, pattern string) ([]Mutant, error) {
	re, err := regexp.Compile(pattern)
	if err != nil {
		return nil, fmt.Errorf("-run: %v", err)
	}
	seen := map[string]bool{}
	var sel []Mutant
	for _, m := range all {
		if m.ID == "" || m.File == "" || m.Old == "" || m.Old == m.New || len(m.Pkgs) == 0 || m.Desc == "" {
			return nil, fmt.Errorf("mutant %q is incomplete (id, file, old != new, pkgs and desc are required)", m.ID)
		}
		if seen[m.ID] {
			return nil, fmt.Errorf("mutant id %q is used twice", m.ID)
		}
		seen[m.ID] = true
		if re.MatchString(m.ID) || re.MatchString(m.File) {
			sel = append(sel, m)
		}
	}
	if len(sel) == 0 {
		return nil, fmt.Errorf("no mutant matches %q", pattern)
	}
	return sel, nil
}

func repoRoot() (string, error) {
	b, err := exec.Command("git", "rev-parse", "--show-toplevel").Output()
	if err != nil {
		return "", fmt.Errorf("not inside the git repository: %v", err)
	}
	return strings.TrimSpace(string(b)), nil
}

// repoFiles lists the tracked files and the untracked files that are not
// ignored (so new tests under work are included), relative to root.
func repoFiles(root string) ([]string, error) {
	cmd := exec.Command("git", "ls-files", "-z", "--cached", "--others", "--exclude-standard")
	cmd.Dir = root
	b, err := cmd.Output()
	if err != nil {
		return nil, fmt.Errorf("git ls-files: %v", err)
	}
	var files []string
	for _, f := range strings.Split(string(b), "\x00") {
		if f != "" {
			files = append(files, f)
		}
	}
	return files, nil
}

func copyTree(root, dst string, files []string) error {
	for _, f := range files {
		src := filepath.Join(root, f)
		fi, err := os.Lstat(src)
		if errors.Is(err, os.ErrNotExist) {
			continue // deleted in the working tree
		}
		if err != nil {
			return err
		}
		if !fi.Mode().IsRegular() {
			continue
		}
		data, err := os.ReadFile(src)
		if err != nil {
			return err
		}
		p := filepath.Join(dst, f)
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			return err
		}
		if err := os.WriteFile(p, data, fi.Mode().Perm()); err != nil {
			return err
		}
	}
	return nil
}

// checkApplies returns why m cannot be applied to the tree at root, or "".
func checkApplies(root string, m Mutant) string {
	data, err := os.ReadFile(filepath.Join(root, m.File))
	if err != nil {
		return fmt.Sprintf("cannot read %s: %v", m.File, err)
	}
	switch n := strings.Count(string(data), m.Old); n {
	case 1:
		return ""
	case 0:
		return fmt.Sprintf("snippet not found in %s: %q", m.File, m.Old)
	default:
		return fmt.Sprintf("snippet occurs %d times in %s: %q", n, m.File, m.Old)
	}
}

// testMutant applies m in dir, runs its packages' tests and restores the file.
func testMutant(dir string, m Mutant, timeout time.Duration) outcome {
	o := outcome{m: m}
	p := filepath.Join(dir, m.File)
	orig, err := os.ReadFile(p)
	if err != nil {
		o.status, o.detail = stale, err.Error()
		return o
	}
	defer os.WriteFile(p, orig, 0o644)
	mutated := strings.Replace(string(orig), m.Old, m.New, 1)
	if err := os.WriteFile(p, []byte(mutated), 0o644); err != nil {
		o.status, o.detail = stale, err.Error()
		return o
	}
	start := time.Now()
	ok, out := goTest(dir, m.Pkgs, timeout)
	o.elapsed = time.Since(start)
	switch {
	case ok:
		o.status, o.detail = survived, out
	case strings.Contains(out, "[build failed]") || strings.Contains(out, "[setup failed]") || strings.Contains(out, "vet:"):
		o.status, o.detail = buildError, out
	default:
		o.status, o.detail = killed, firstFailure(out)
	}
	return o
}

// goTest runs the tests of pkgs in dir and reports whether they passed.
func goTest(dir string, pkgs []string, timeout time.Duration) (bool, string) {
	ctx, cancel := context.WithTimeout(context.Background(), timeout+time.Minute)
	defer cancel()
	args := append([]string{"test", "-count=1", "-timeout", timeout.String()}, pkgs...)
	cmd := exec.CommandContext(ctx, "go", args...)
	cmd.Dir = dir
	var buf bytes.Buffer
	cmd.Stdout, cmd.Stderr = &buf, &buf
	err := cmd.Run()
	return err == nil, buf.String()
}

// firstFailure is the first "--- FAIL" line of a test output, or "panic"
// or "timeout" when the tests did not finish.
func firstFailure(out string) string {
	for _, l := range strings.Split(out, "\n") {
		l = strings.TrimSpace(l)
		switch {
		case strings.HasPrefix(l, "--- FAIL"):
			return l
		case strings.HasPrefix(l, "panic: test timed out"):
			return "timeout"
		case strings.HasPrefix(l, "panic:"):
			return l
		}
	}
	return "tests failed"
}

func report(w io.Writer, results []outcome, elapsed time.Duration) {
	sort.SliceStable(results, func(i, j int) bool { return results[i].m.ID < results[j].m.ID })
	count := map[status]int{}
	fmt.Fprintf(w, "\n%-28s %-11s %-26s %s\n", "mutant", "result", "file", "description / first failure")
	for _, o := range results {
		count[o.status]++
		fmt.Fprintf(w, "%-28s %-11s %-26s %s\n", o.m.ID, o.status, o.m.File, o.m.Desc)
		if o.status == killed {
			fmt.Fprintf(w, "%-28s %-11s %-26s   by %s\n", "", "", "", o.detail)
		}
		if o.status == stale {
			fmt.Fprintf(w, "%-28s %-11s %-26s   %s\n", "", "", "", o.detail)
		}
	}
	k, s := count[killed], count[survived]
	fmt.Fprintf(w, "\n%d mutants: %d killed, %d survived, %d stale, %d build errors (%.0fs)\n",
		len(results), k, s, count[stale], count[buildError], elapsed.Seconds())
	if k+s > 0 {
		fmt.Fprintf(w, "score: %d/%d = %.1f %%\n", k, k+s, 100*float64(k)/float64(k+s))
	}
	if s > 0 {
		var names []string
		for _, o := range results {
			if o.status == survived {
				names = append(names, o.m.ID)
			}
		}
		fmt.Fprintf(w, "survivors: %s\n", strings.Join(names, ", "))
	}
	if n := count[stale]; n > 0 {
		fmt.Fprintf(w, "WARNING: %d mutants are STALE (their snippet no longer occurs exactly once): update tools/mutate/mutants.go\n", n)
	}
}
