package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"sort"
	"strings"
	"wetline/rating"
	"wetline/survey/output"

	"github.com/spf13/pflag"
)

// Version is the program version stated in every report.
var Version = "0.1.0"

// command is one subcommand: its one-line summary and its entry point.
type command struct {
	summary string
	run     func(ctx context.Context, env *env, args []string) error
}

// env carries the standard streams to a subcommand.
type env struct {
	stdout, stderr io.Writer
	// stderrTTY reports whether stderr is a terminal (for progress lines).
	stderrTTY bool
}

// commands lists the subcommands by name.
var commands = map[string]command{
	"rate":      {"compute a stage–discharge table from a surveyed section", runRate},
	"demo":      {"write an invented demo site, its rating and reports to a folder", runDemo},
	"solve":     {"normal and critical stage for a discharge, or the stage holding a flow area", runSolve},
	"cowan":     {"Manning's n from a description of the reach by Cowan's method", runCowan},
	"shape":     {"write a built section (trapezoid, compound, ...) as an editable survey CSV", runShape},
	"slopearea": {"flood peak from high-water marks over a surveyed reach (slope-area method)", runSlopeArea},
	"fit":       {"compare gaugings with a rating, back-calculate n and fit a power-law rating", runFit},
	"plot":      {"draw rating, section and property figures (PNG) from a saved rating table", runPlot},
	"template":  {"write a blank field workbook (cross-sections, reach, gaugings)", runTemplate},
}

// usageError marks an error in the command line (exit status 2).
type usageError struct{ err error }

func (e usageError) Error() string { return e.err.Error() }
func (e usageError) Unwrap() error { return e.err }

func usagef(format string, a ...any) error { return usageError{fmt.Errorf(format, a...)} }

// errHelp ends a run after help was printed (exit status 0).
var errHelp = errors.New("help shown")

func main() {
	ctx, cancel := context.WithCancel(context.Background())
	sigs := make(chan os.Signal, 1)
	signal.Notify(sigs, os.Interrupt)
	go func() {
		<-sigs
		// Interrupted: no partial output may stay behind.
		cancel()
		output.RemoveTemps()
		fmt.Fprintln(os.Stderr, "wetline: interrupted; no partial output left")
		os.Exit(130)
	}()
	st, _ := os.Stderr.Stat()
	tty := st != nil && st.Mode()&os.ModeCharDevice != 0
	err := run(ctx, &env{stdout: os.Stdout, stderr: os.Stderr, stderrTTY: tty}, os.Args[1:])
	os.Exit(exitStatus(err, os.Stderr))
}

// exitStatus prints err and maps it to the exit status: 0 success (and
// help), 2 usage errors, 1 everything else.
func exitStatus(err error, stderr io.Writer) int {
	if err == nil || errors.Is(err, errHelp) {
		return 0
	}
	var ue usageError
	for _, line := range strings.Split(err.Error(), "\n") {
		fmt.Fprintln(stderr, "wetline: "+line)
	}
	if errors.As(err, &ue) {
		fmt.Fprintln(stderr, "run 'wetline help' for usage")
		return 2
	}
	return 1
}

// run is the whole program behind main: it parses args (without the
// program name) and runs one subcommand.
func run(ctx context.Context, e *env, args []string) error {
	if len(args) == 0 {
		printUsage(e.stderr)
		return usagef("no command given")
	}
	name := args[0]
	switch name {
	case "help", "-h", "--help":
		printUsage(e.stdout)
		return nil
	case "version", "--version":
		fmt.Fprintln(e.stdout, "wetline", Version)
		return nil
	}
	c, ok := commands[name]
	if !ok {
		return usagef("unknown command %q", name)
	}
	return c.run(ctx, e, args[1:])
}

func printUsage(w io.Writer) {
	fmt.Fprintln(w, "wetline: stage–discharge ratings from surveyed river cross-sections")
	fmt.Fprintln(w, "\nUsage: wetline COMMAND [ARGUMENTS]\n\nCommands:")
	names := make([]string, 0, len(commands))
	for n := range commands {
		names = append(names, n)
	}
	sort.Strings(names)
	for _, n := range names {
		fmt.Fprintf(w, "  %-10s %s\n", n, commands[n].summary)
	}
	fmt.Fprintln(w, "\nRun 'wetline COMMAND --help' for a command's flags.")
	fmt.Fprintln(w, "\nCaution: "+rating.Caution)
}

// newFlags returns a flag set for a subcommand with -h/--help defined, so
// help goes to stdout.
func newFlags(name, usage string) *pflag.FlagSet {
	fs := pflag.NewFlagSet(name, pflag.ContinueOnError)
	fs.SortFlags = false
	fs.BoolP("help", "h", false, "show this help")
	fs.Usage = func() {}
	fs.SetOutput(io.Discard)
	usageText[fs] = usage
	return fs
}

var usageText = map[*pflag.FlagSet]string{}

// parseFlags parses args; it prints help to stdout and returns errHelp for
// -h, and wraps parse errors as usage errors.
func parseFlags(fs *pflag.FlagSet, e *env, args []string) error {
	if err := fs.Parse(args); err != nil {
		if errors.Is(err, pflag.ErrHelp) {
			printFlags(fs, e.stdout)
			return errHelp
		}
		return usageError{fmt.Errorf("%s: %w", fs.Name(), err)}
	}
	if h, _ := fs.GetBool("help"); h {
		printFlags(fs, e.stdout)
		return errHelp
	}
	return nil
}

func printFlags(fs *pflag.FlagSet, w io.Writer) {
	fmt.Fprintf(w, "Usage: wetline %s\n\n", usageText[fs])
	fs.VisitAll(func(f *pflag.Flag) {
		name := "--" + f.Name
		if f.Shorthand != "" {
			name = "-" + f.Shorthand + ", " + name
		}
		if typ := f.Value.Type(); typ != "bool" {
			name += " " + argName(typ)
		}
		def := ""
		switch f.DefValue {
		case "", "false", "0", "[]", "NaN":
		default:
			def = fmt.Sprintf(" (default %s)", f.DefValue)
		}
		fmt.Fprintf(w, "  %-24s %s%s\n", name, f.Usage, def)
	})
}

// argName names a flag's argument in help by its type.
func argName(typ string) string {
	switch typ {
	case "float64", "int", "int64", "uint64":
		return "NUM"
	case "float64Slice":
		return "LIST"
	}
	return "TEXT"
}
