package main

import (
	"bytes"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"testing"
)

var (
	binOnce sync.Once
	binPath string
	binErr  error
)

// TestMain removes the command built by builtCommand.
func TestMain(m *testing.M) {
	code := m.Run()
	if binPath != "" {
		os.RemoveAll(filepath.Dir(binPath))
	}
	os.Exit(code)
}

// builtCommand builds the command once per test binary, for tests that
// need a real process (signals, terminals, pipes).
func builtCommand(t *testing.T) string {
	t.Helper()
	if testing.Short() {
		t.Skip("builds the command")
	}
	binOnce.Do(func() {
		dir, err := os.MkdirTemp("", "tempstack-bin-")
		if err != nil {
			binErr = err
			return
		}
		binPath = filepath.Join(dir, "tempstack")
		if out, err := exec.Command("go", "build", "-o", binPath, ".").CombinedOutput(); err != nil {
			binErr = &buildError{err, string(out)}
		}
	})
	if binErr != nil {
		t.Fatal(binErr)
	}
	return binPath
}

type buildError struct {
	err error
	out string
}

func (e *buildError) Error() string { return "go build: " + e.err.Error() + "\n" + e.out }

func TestVersion(t *testing.T) {
	for _, flag := range []string{"--version", "-v"} {
		code, out, stderr := runCLI(t, flag)
		if code != 0 || out != "tempstack version "+version+"\n" || stderr != "" {
			t.Errorf("%s: exit %d, stdout %q, stderr %q", flag, code, out, stderr)
		}
	}
}

func TestCompletion(t *testing.T) {
	// The scripts.
	for _, c := range []struct{ shell, want string }{
		{"bash", "complete -o bashdefault -o default -F _tempstack_complete tempstack"},
		{"zsh", "compdef _tempstack tempstack"},
	} {
		code, out, stderr := runCLI(t, "completion", c.shell)
		if code != 0 || !strings.Contains(out, c.want) || !strings.Contains(out, "--generate-bash-completion") {
			t.Errorf("completion %s: exit %d, %q, %q", c.shell, code, out, stderr)
		}
		// Syntax check by the shell itself, where it is installed.
		if sh, err := exec.LookPath(c.shell); err == nil {
			cmd := exec.Command(sh, "-n")
			cmd.Stdin = strings.NewReader(out)
			if b, err := cmd.CombinedOutput(); err != nil {
				t.Errorf("%s -n: %v: %s", c.shell, err, b)
			}
		}
	}
	for _, args := range [][]string{{"completion"}, {"completion", "fish"}, {"completion", "bash", "zsh"}} {
		code, _, stderr := runCLI(t, args...)
		oneLine(t, code, stderr, 1, "bash or zsh")
	}

	// What the scripts ask (urfave/cli reads os.Args for this, so it is
	// asked of the built command): commands, then the flags of a command
	// (also after a file), and never a run.
	bin := builtCommand(t)
	dir := t.TempDir()
	ask := func(args ...string) string {
		cmd := exec.Command(bin, append(args, "--generate-bash-completion")...)
		cmd.Dir = dir
		out, err := cmd.Output()
		if err != nil {
			t.Errorf("%v: %v", args, err)
		}
		return string(out)
	}
	out := ask()
	for _, c := range []string{"run", "check", "materials", "new", "examples", "indices", "completion"} {
		if !strings.Contains(out, c+"\n") {
			t.Errorf("top-level completion lacks %q: %q", c, out)
		}
	}
	// (The scripts ask with "-" when the word is "--", which would end the
	// flags.)
	for _, args := range [][]string{{"run", "-"}, {"run", "wall.yaml", "-"}} {
		out = ask(args...)
		for _, f := range []string{"--out", "--example", "--quiet", "--force"} {
			if !strings.Contains(out, f+"\n") {
				t.Errorf("%v: flag completion lacks %q: %q", args, f, out)
			}
		}
	}
	if out = ask("run", "--o"); out != "--out\n" {
		t.Errorf("completion of --o: %q", out)
	}
	// The bash script end to end, where bash is installed.
	if sh, err := exec.LookPath("bash"); err == nil {
		for _, c := range []struct{ words, want string }{
			{"tempstack ru", "run"},
			{"tempstack run --o", "--out"},
			{"tempstack run wall.yaml --fo", "--force"},
			{"tempstack new --", "--out --force --help"},
		} {
			script := "source <(tempstack completion bash)\nCOMP_WORDS=(" + c.words + ")\n" +
				"COMP_CWORD=$((${#COMP_WORDS[@]}-1))\n_tempstack_complete\necho \"${COMPREPLY[*]}\"\n"
			cmd := exec.Command(sh, "-c", script)
			cmd.Dir = dir
			cmd.Env = append(os.Environ(), "PATH="+filepath.Dir(bin)+string(os.PathListSeparator)+os.Getenv("PATH"))
			out, err := cmd.CombinedOutput()
			if err != nil || strings.TrimSpace(string(out)) != c.want {
				t.Errorf("bash completion of %q: %q (%v), want %q", c.words, out, err, c.want)
			}
		}
	}
	ask("run", "wall.yaml")
	if _, err := os.Stat(filepath.Join(dir, "out")); err == nil {
		t.Error("completion after a file ran the command")
	}
}

// TestNoColour: the command prints no ANSI escape sequences when its
// output is not a terminal, whatever NO_COLOR says (it has no colours at
// all; the only escape, erasing the progress line, goes to terminals).
func TestNoColour(t *testing.T) {
	bin := builtCommand(t)
	dir := t.TempDir()
	bad := filepath.Join("..", "..", "testdata", "bad", "bad-kind.yaml")
	for _, env := range [][]string{nil, {"NO_COLOR=1"}, {"TERM=xterm-256color", "CLICOLOR_FORCE=1"}} {
		for _, args := range [][]string{
			{"run", "--example", "timber-roof", "--out", filepath.Join(dir, "roof"), "--force"},
			{"run", "--out", filepath.Join(dir, "wall"), "--force"},
			{"check", bad},
			{"help"},
			{"run", "--bogus"},
			{"--version"},
		} {
			cmd := exec.Command(bin, args...)
			cmd.Env = append(os.Environ(), env...)
			var stdout, stderr bytes.Buffer
			cmd.Stdout, cmd.Stderr = &stdout, &stderr
			cmd.Run()
			for name, b := range map[string][]byte{"stdout": stdout.Bytes(), "stderr": stderr.Bytes()} {
				if i := bytes.IndexByte(b, 0x1b); i >= 0 {
					t.Errorf("%v %v: escape sequence in %s: %q", env, args, name, b[max(0, i-20):min(len(b), i+20)])
				}
				if bytes.Contains(b, []byte("\r")) {
					t.Errorf("%v %v: carriage return (progress line) in %s", env, args, name)
				}
			}
		}
	}
}
