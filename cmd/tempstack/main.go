// Command tempstack predicts how temperature swings travel through layered
// solids: walls, roofs and floor slabs, and the soil and rock beneath them.
//
// It reads one YAML scenario file, solves it exactly (ISO 13786 transfer
// matrices) and, where asked, numerically, and writes an offline HTML
// report, results.json and CSV series. Run `tempstack help` for the
// commands.
package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"strings"

	"github.com/urfave/cli/v2"

	"tempstack/fileerr"
	"tempstack/layers"
)

// version is the tool version printed by --version and in reports.
var version = "0.1.0-dev"

func main() {
	os.Exit(run(os.Args, os.Stdout, os.Stderr))
}

// userError marks an error caused by the input or the command line: exit 1
// with its one-line message.
type userError struct{ err error }

func (e userError) Error() string { return e.err.Error() }
func (e userError) Unwrap() error { return e.err }

func userErr(format string, args ...any) error {
	return userError{fmt.Errorf(format, args...)}
}

// run is the whole program behind main, callable in-process by tests. It
// returns the exit code: 0 success, 1 a user error (one line on stderr),
// 2 an internal failure.
func run(args []string, stdout, stderr io.Writer) (code int) {
	defer func() {
		if p := recover(); p != nil {
			fmt.Fprintf(stderr, "tempstack: internal error: %v (please report this with the scenario file)\n", p)
			code = 2
		}
	}()
	app := newApp(stdout, stderr)
	err := app.Run(hoistFlags(args, app))
	if err == nil {
		return 0
	}
	for _, line := range errorLines(err) {
		fmt.Fprintf(stderr, "tempstack: %s\n", line)
	}
	var ue userError
	if errors.As(err, &ue) {
		return 1
	}
	var ce cli.ExitCoder
	if errors.As(err, &ce) {
		return ce.ExitCode()
	}
	// Anything else is not the user's doing (a result that cannot be
	// encoded, a write that failed for a reason we did not foresee).
	return 2
}

// errorLines is what the command prints for err: one line per mistake of
// an input file (check and run report every mistake they found), otherwise
// the first line of the message.
func errorLines(err error) []string {
	if all := fileerr.All(err); len(all) > 1 {
		lines := make([]string, len(all))
		for i, e := range all {
			lines[i] = e.Error()
		}
		return lines
	}
	msg := strings.TrimSpace(err.Error())
	if i := strings.IndexByte(msg, '\n'); i >= 0 {
		msg = msg[:i]
	}
	return []string{msg}
}

func newApp(stdout, stderr io.Writer) *cli.App {
	app := &cli.App{
		Name:      "tempstack",
		Usage:     "temperature swings through walls, roofs, slabs and the ground",
		Version:   version,
		Writer:    stdout,
		ErrWriter: stderr,
		// Errors are printed by run, once, as one line.
		ExitErrHandler: func(*cli.Context, error) {},
		CommandNotFound: func(c *cli.Context, name string) {
			// Reported through the returned error of Before below.
		},
		OnUsageError: usageError,
		Commands: []*cli.Command{
			runCommand(),
			checkCommand(),
			materialsCommand(),
			newCommand(),
			examplesCommand(),
			schemaCommand(),
			indicesCommand(),
			completionCommand(),
		},
		HideHelpCommand: false,

		// `--generate-bash-completion` lists what may follow (completion.go).
		EnableBashCompletion: true,
	}
	app.Before = func(c *cli.Context) error {
		if name := c.Args().First(); name != "" && app.Command(name) == nil && name != "help" && name != "h" {
			return userErr("unknown command %q; commands: run, check, materials, new, examples, indices (try `tempstack help`)", name)
		}
		return nil
	}
	return app
}

func usageError(c *cli.Context, err error, _ bool) error {
	// urfave/cli (via the standard flag package) reports an unknown flag
	// as "flag provided but not defined: -name", with one dash whatever
	// was typed; name the flag as typed and the close one.
	const undefined = "flag provided but not defined: -"
	flags, help := c.App.Flags, "tempstack help"
	if c.Command != nil && c.Command.Name != "" && c.Command.Name != c.App.Name {
		flags, help = c.Command.Flags, help+" "+c.Command.Name
	}
	if msg := err.Error(); strings.HasPrefix(msg, undefined) {
		name := strings.TrimPrefix(msg, undefined)
		msg = "unknown flag " + flagText(name)
		if s := closeFlag(name, flags); s != "" {
			msg += "; did you mean " + flagText(s) + "?"
		}
		err = errors.New(msg)
	}
	return userErr("%v (try `%s`)", err, help)
}

// flagText writes a flag name as it is typed: -o, --out.
func flagText(name string) string {
	if len(name) == 1 {
		return "-" + name
	}
	return "--" + name
}

// closeFlag returns the flag of flags that name most likely misspells or
// abbreviates ("output" gives "out", "work" gives "workers"), or "".
func closeFlag(name string, flags []cli.Flag) string {
	var names []string
	for _, f := range flags {
		for _, n := range f.Names() {
			if len(n) > 1 {
				names = append(names, n)
			}
		}
	}
	if s := layers.Closest(name, names, 1); len(s) > 0 {
		return s[0]
	}
	// One is the start of the other, both at least 3 letters long.
	best := ""
	for _, n := range names {
		short, long := n, name
		if len(short) > len(long) {
			short, long = long, short
		}
		if len(short) >= 3 && strings.HasPrefix(long, short) && (best == "" || len(n) < len(best)) {
			best = n
		}
	}
	return best
}

// hoistFlags moves flags that follow a positional argument in front of it,
// so that `tempstack run wall.yaml --out dir` works as users expect
// (urfave/cli v2 stops flag parsing at the first positional argument).
func hoistFlags(args []string, app *cli.App) []string {
	if len(args) < 3 || args[len(args)-1] == "--generate-bash-completion" {
		return args // too short, or a shell completion request (kept as typed)
	}
	cmd := app.Command(args[1])
	if cmd == nil {
		return args
	}
	takesValue := map[string]bool{}
	for _, f := range cmd.Flags {
		_, isBool := f.(*cli.BoolFlag)
		for _, n := range f.Names() {
			takesValue[n] = !isBool
		}
	}
	var flags, pos []string
	rest := args[2:]
	for i := 0; i < len(rest); i++ {
		a := rest[i]
		if a == "--" {
			pos = append(pos, rest[i+1:]...)
			break
		}
		if strings.HasPrefix(a, "-") && a != "-" {
			flags = append(flags, a)
			name := strings.TrimLeft(a, "-")
			if !strings.Contains(name, "=") && takesValue[name] && i+1 < len(rest) {
				flags = append(flags, rest[i+1])
				i++
			}
			continue
		}
		pos = append(pos, a)
	}
	out := append([]string{args[0], args[1]}, flags...)
	return append(out, pos...)
}
