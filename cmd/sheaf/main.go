// Command sheaf turns a YAML page spec and tables of yearly counts into
// print-ready pages of small-multiple line charts and the same charts for
// the web.
//
// Usage:
//
//	sheaf check SPEC [--json] [--strict]
//	sheaf palette SPEC [--out DIR]
//	sheaf build SPEC [--out DIR] [--only OUTPUT] [--strict] [--no-proofs] [--full] [--quiet] [--paths]
//	sheaf terms SPEC [--match TEXT] [--pattern RE] [--sort COLUMN] [--reverse] [--selected] [--limit N] [--json]
//	sheaf schema
//	sheaf help [COMMAND]
//
// Exit status: 0 when all is well, 1 when checks find problems or a build
// fails, 2 for bad input or usage.
package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"os/signal"
	"runtime/debug"
	"strings"
	"syscall"

	"sheaf/render/production"
	"sheaf/specs"
)

// version is the program's version, written into file metadata.
const version = production.Version

const (
	exitOK       = 0
	exitFindings = 1
	exitBadInput = 2
)

type command struct {
	name, args, summary string
	run                 func(args []string, stdout, stderr io.Writer) int
}

func commands() []command {
	return []command{
		{"check", "SPEC [--json] [--strict]", "validate the spec and data; print a summary, pages and preflight findings", runCheck},
		{"palette", "SPEC [--out DIR]", "print the era palette's table and checks; write a swatch sheet", runPalette},
		{"build", "SPEC [--out DIR] [--only OUTPUT] [--strict] [--no-proofs] [--full] [--quiet] [--paths]", "render every output: PDF, proofs, SVG, PNG; manifest and change report", runBuild},
		{"terms", termsArgs, "list the terms in the data with their counts, peak year and whether the spec selects them", runTerms},
		{"pairs", "SPEC [--top N] [--per-term N] [--output NAME] [--size 'W x H'] [--json] [--out DIR] [--no-sheet]", "find the most alike pairs of terms and the strongest hand-overs; inserts entries and a sheet", runPairs},
		{"count", countArgs, "count terms in a dated text archive into the two tables a spec's data reads", runCount},

		{"schema", "", "print the JSON Schema of the page spec, for YAML editors", runSchema},

		{"help", "[COMMAND]", "show help for sheaf or one command", nil},
	}
}

func main() {
	deferFirstCollection(firstCollectionAt)
	stop := startProfiles()
	code := run(os.Args[1:], os.Stdout, os.Stderr)
	stop()
	os.Exit(code)
}

// run is main without the process: tests call it.
func run(args []string, stdout, stderr io.Writer) (code int) {
	defer func() {
		// A panic is a bug in sheaf, never the input's fault: exit 1. The
		// stack is for whoever fixes it, shown with SHEAF_DEBUG=1.
		if r := recover(); r != nil {
			fmt.Fprintf(stderr, "sheaf: internal error: %v (please report this with the spec that caused it)\n", r)
			if os.Getenv("SHEAF_DEBUG") == "1" {
				stderr.Write(debug.Stack())
			}
			code = exitFindings
		}
	}()
	if len(args) == 0 {
		usage(stderr)
		return exitBadInput
	}
	name := args[0]
	if name == "help" || name == "-h" || name == "--help" || name == "-help" {
		if len(args) > 1 && name == "help" && args[1] != "help" {
			for _, c := range commands() {
				if c.name == args[1] && c.run != nil {
					return c.run([]string{"-h"}, stdout, stdout)
				}
			}
			fmt.Fprintf(stderr, "sheaf: no command %q\n", args[1])
			return exitBadInput
		}
		usage(stdout)
		return exitOK
	}
	if name == "version" || name == "--version" {
		fmt.Fprintln(stdout, "sheaf", version)
		return exitOK
	}
	for _, c := range commands() {
		if c.name == name && c.run != nil {
			// "sheaf build -h" is "sheaf help build": the same text, on stdout.
			for _, a := range args[1:] {
				if a == "-h" || a == "--help" || a == "-help" {
					return c.run([]string{"-h"}, stdout, stdout)
				}
				if a == "--" {
					break
				}
			}
			return c.run(args[1:], stdout, stderr)
		}
	}
	fmt.Fprintf(stderr, "sheaf: unknown command %q\n\n", name)
	usage(stderr)
	return exitBadInput
}

func usage(w io.Writer) {
	fmt.Fprintln(w, "sheaf turns a page spec and yearly counts into pages of small-multiple line charts.")
	fmt.Fprintln(w, "\nUsage:")
	for _, c := range commands() {
		fmt.Fprintf(w, "  %s\n      %s\n", synopsis(c.name, c.args), c.summary)
	}
	fmt.Fprintln(w, "\nRun 'sheaf COMMAND -h' for a command's flags. Exit status: 0 ok, 1 findings or failed build, 2 bad input or usage.")
}

// synopsis is a command's usage line, "sheaf NAME ARGS", with no trailing
// space for a command that takes no arguments.
func synopsis(name, args string) string {
	return strings.TrimSpace("sheaf " + name + " " + args)
}

// parseFlags parses flags that may stand before or after the positional
// arguments ("sheaf check spec.yaml --json") and returns the positionals.
// A -h ends with help printed and errHelp.
func parseFlags(fs *flag.FlagSet, args []string) ([]string, error) {
	var pos []string
	for {
		if err := fs.Parse(args); err != nil {
			return nil, err
		}
		args = fs.Args()
		if len(args) == 0 {
			return pos, nil
		}
		pos = append(pos, args[0])
		args = args[1:]
	}
}

// newFlags makes a command's flag set that prints its usage to w.
func newFlags(name, argsHelp, summary string, w io.Writer) *flag.FlagSet {
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(w)
	fs.Usage = func() {
		fmt.Fprintf(w, "Usage: %s\n\n%s\n", synopsis(name, argsHelp), summary)
		printFlags(w, fs)
	}
	return fs
}

// printFlags lists a command's flags as README writes them, "--name
// VALUE", with the help and the default: Go's flag package would print
// "-name".
func printFlags(w io.Writer, fs *flag.FlagSet) {
	var lines []string
	fs.VisitAll(func(f *flag.Flag) {
		value, usage := flag.UnquoteUsage(f)
		line := "  --" + f.Name
		if value != "" {
			line += " " + strings.ToUpper(value)
		}
		line += "\n      " + strings.ReplaceAll(usage, "\n", "\n      ")
		if d := f.DefValue; d != "" && d != "false" && d != "0" {
			line += fmt.Sprintf(" (default %s)", d)
		}
		lines = append(lines, line)
	})
	if len(lines) > 0 {
		fmt.Fprintln(w, "\nFlags:")
		fmt.Fprintln(w, strings.Join(lines, "\n"))
	}
}

// startCommand parses args for a command taking exactly one SPEC. It
// returns the spec path, or an exit code when the command is done.
func startCommand(fs *flag.FlagSet, args []string, stderr io.Writer) (string, int, bool) {
	pos, err := parseFlags(fs, args)
	if errors.Is(err, flag.ErrHelp) {
		return "", exitOK, false
	}
	if err != nil {
		return "", exitBadInput, false
	}
	if len(pos) != 1 {
		fmt.Fprintf(stderr, "sheaf %s: give exactly one spec file (got %d: %s)\n", fs.Name(), len(pos), strings.Join(pos, " "))
		fs.Usage()
		return "", exitBadInput, false
	}
	return pos[0], 0, true
}

// report prints an error for the user and returns its exit code: bad
// input (a *specs.InputError anywhere in its chain) is 2, anything else 1.
func report(stderr io.Writer, err error) int {
	fmt.Fprintln(stderr, err)
	if specs.IsBadInput(err) {
		return exitBadInput
	}
	return exitFindings
}

// interruptible is the context of a command that writes files: Ctrl-C or
// SIGTERM cancels it, so the library stops between steps and removes its
// temporary files instead of the process dying mid-write.
func interruptible() (context.Context, context.CancelFunc) {
	return signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
}
