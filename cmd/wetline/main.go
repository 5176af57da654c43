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
	"sync"
	"syscall"
	"time"

	"wetline/rating"
	"wetline/survey"
	"wetline/survey/output"
)

// Version is the program version stated in every report. It is set at
// build time with -ldflags "-X main.Version=...".
var Version = "0.1.0"

// program names the program and its version in reports.
func program() string { return "wetline " + Version }

// command is one subcommand: its one-line summary and its entry point.
type command struct {
	summary string
	run     func(ctx context.Context, e *env, args []string) error
}

// commandTable lists the subcommands by name.
func commandTable() map[string]command {
	return map[string]command{
		"rate":      {"compute a stage–discharge table from a surveyed section", runRate},
		"demo":      {"write an invented demo site, its rating and reports to a folder", runDemo},
		"solve":     {"normal and critical stage for a discharge, or the stage holding a flow area", runSolve},
		"cowan":     {"Manning's n from a description of the reach by Cowan's method", runCowan},
		"shape":     {"write a built section (trapezoid, compound, ...) as an editable survey CSV", runShape},
		"slopearea": {"flood peak from high-water marks over a surveyed reach (slope-area method)", runSlopeArea},
		"backwater": {"water-surface profiles and a rating through a surveyed reach (step-backwater method)", runBackwater},
		"fit":       {"compare gaugings with a rating, back-calculate n, fit a rating of controls with its bands", runFit},
		"plot":      {"draw rating, section and property figures (PNG) from a saved rating table", runPlot},
		"template":  {"write a blank field workbook (cross-sections, reach, gaugings)", runTemplate},
		"project":   {"turn a coordinate survey (easting, northing, elevation) into stations along its section line", runProject},
		"shifts":    {"each gauging's shift against the rating in force, and a proposed shift diagram per visit", runShifts},
		"record":    {"turn a stage record into unit and daily discharges with ratings and shifts", runRecord},
		"compare":   {"compare two ratings, or two surveys of one section (scour or fill)", runCompare},
	}
}

// env is what a run of the program works with: its streams, the files it
// writes, and the command table.
type env struct {
	stdout, stderr io.Writer
	// stderrTTY reports whether stderr is a terminal (for progress lines).
	stderrTTY bool
	// files are the run's output files, committed when a command has
	// written them all and discarded when it fails or is interrupted.
	files *output.Files
	// commands is the command table (commandTable, or a test's).
	commands map[string]command
	// progressDelay is how long a batch runs before it shows a progress
	// line; progressEvery the shortest time between two updates.
	progressDelay, progressEvery time.Duration
	// figures are the figure files the run has written.
	figures runFigures
	// reached, when set (by a test), is called as the run passes a
	// point: "section K" when a batch has written its Kth section,
	// "staged" when a batch's output waits to be committed, "deliver"
	// before a report is written, "done" when the command has returned
	// without an error (its output committed, its summary said).
	reached func(point string)
	// stdin is what standard input reads from (nil when unknown): the
	// file, when it is redirected from one, is protected once a command
	// reads standard input.
	stdin os.FileInfo
	// flags is the command's parsed flag set (nil before parsing), for
	// naming the flag of an input that cannot be opened (missingInput).
	flags *flagSet
}

// newEnv returns an environment writing to stdout and stderr.
func newEnv(stdout, stderr io.Writer, cmds map[string]command) *env {
	return &env{stdout: stdout, stderr: stderr, files: output.New(), commands: cmds,
		progressDelay: time.Second, progressEvery: 200 * time.Millisecond}
}

// usageError marks an error in the command line (exit status 2); cmd
// names the command whose help to point at ("" for the program's).
type usageError struct {
	err error
	cmd string
}

func (e usageError) Error() string { return e.err.Error() }
func (e usageError) Unwrap() error { return e.err }

func usagef(format string, a ...any) error { return usageError{err: fmt.Errorf(format, a...)} }

// envError marks a mistake in the environment the program runs in (a
// WETLINE_MAX_* variable that cannot be used): exit status 2, as for a
// mistake on the command line, without a pointer to a command's help.
type envError struct{ err error }

func (e envError) Error() string { return e.err.Error() }
func (e envError) Unwrap() error { return e.err }

// errHelp ends a run after help was printed (exit status 0).
var errHelp = errors.New("help shown")

func main() { os.Exit(mainWith(commandTable())) }

// interruptStatus is the exit status after a signal: 128 plus its number.
func interruptStatus(sig os.Signal) int {
	if s, ok := sig.(syscall.Signal); ok {
		return 128 + int(s)
	}
	return 130
}

// mainWith runs the program with a command table and returns its exit
// status. An interrupt (SIGINT, SIGTERM or SIGHUP) discards every output
// file being written and every temporary file, then exits with 128 plus
// the signal's number and one line, however far the command had got. The
// line tells what the run left: before the output was put in place, no
// output changed; once it was (a commit under way finishes first), the
// new output is whole and in place.
//
// A broken pipe on standard output (the reader went away, as head does)
// ends the run as a failure: what was being written is discarded, the
// scratch folder removed, a line says so, and the exit status is 141
// (128 + SIGPIPE), as for the signal.
func mainWith(cmds map[string]command) int {
	st, _ := os.Stderr.Stat()
	stdout := &pipeWatch{w: os.Stdout}
	e := newEnv(stdout, os.Stderr, cmds)
	e.stderrTTY = st != nil && st.Mode()&os.ModeCharDevice != 0
	e.stdin, _ = os.Stdin.Stat()
	scratch, err := privateTemp()
	if err != nil {
		fmt.Fprintln(os.Stderr, "wetline: "+err.Error())
		return 1
	}
	// Asked for, SIGPIPE no longer kills the process: a write to a closed
	// pipe fails with EPIPE, and the run ends through its clean-up.
	signal.Notify(make(chan os.Signal, 1), syscall.SIGPIPE)
	ctx, cancel := context.WithCancelCause(context.Background())
	sigs := make(chan os.Signal, 1)
	signal.Notify(sigs, os.Interrupt, syscall.SIGTERM, syscall.SIGHUP)
	stop := &ending{files: e.files, scratch: scratch, stderr: os.Stderr}
	go func() {
		sig := <-sigs
		// Noted, and the output discarded, before the cancel: whatever
		// error the cancel causes on its way back through the command is
		// then known to be the interrupt's, and nothing written after it
		// reaches its place.
		stop.note(sig)
		e.files.Discard()
		cancel(interrupted{sig})
		os.Exit(stop.finish())
	}()
	err = run(ctx, e, os.Args[1:])
	return stop.after(err, stdout.broken)
}

// The one line an interrupted run ends with: interrupted before its output
// was put in place (none changed), after (it is whole and in place), or
// between two commits (a demo's: what was committed stays, the rest goes).
const (
	interruptNote        = "wetline: interrupted; no partial output left"
	interruptedAfterNote = "wetline: interrupted after the output was written: it is whole and in place"
	interruptedPartNote  = "wetline: interrupted; the output written before it is whole and in place, the rest discarded (no partial output left)"
)

// interrupted is the cause of the context of a run ended by a signal.
type interrupted struct{ sig os.Signal }

func (i interrupted) Error() string { return "interrupted by " + i.sig.String() }

// ending ends a run once: with the interrupt, whichever of the signal
// handler and the command's return gets there first, or with the
// command's own status. Every error a command returns after a signal
// (the cancelled context, wrapped or not, a worker pool stopped, output
// refused as discarded) is the interrupt's: the run exits with 128 plus
// the signal's number and one line saying so, never with the error. A
// signal after the output was committed (while the summary is printed)
// still ends the run so, and the line says the output is in place.
type ending struct {
	// mu is held by whoever ends the run, until the process exits.
	mu      sync.Mutex
	sigMu   sync.Mutex
	sig     os.Signal
	files   *output.Files
	scratch string
	stderr  io.Writer
}

// note records the signal that ends the run.
func (s *ending) note(sig os.Signal) {
	s.sigMu.Lock()
	defer s.sigMu.Unlock()
	if s.sig == nil {
		s.sig = sig
	}
}

// caught returns the signal noted, or nil.
func (s *ending) caught() os.Signal {
	s.sigMu.Lock()
	defer s.sigMu.Unlock()
	return s.sig
}

// finish ends an interrupted run: it discards the output and the scratch
// folder, says so once and returns the exit status. The caller exits
// with it; a second caller blocks until then.
func (s *ending) finish() int {
	s.mu.Lock()
	return s.interruptLocked()
}

func (s *ending) interruptLocked() int {
	// Discard waits for a commit under way: what Committed then says
	// is what the run leaves.
	s.files.Discard()
	os.RemoveAll(s.scratch)
	note := interruptNote
	switch committed, dropped := s.files.Committed(); {
	case committed && dropped:
		note = interruptedPartNote
	case committed:
		note = interruptedAfterNote
	}
	fmt.Fprintln(s.stderr, note)
	return interruptStatus(s.caught())
}

// after ends a run whose command returned err (broken: standard output
// was found closed) and returns the exit status. Once a signal has come
// the run ends as interrupted, whatever err is: here, or in the signal
// handler, which then holds the end and after waits for the exit.
func (s *ending) after(err error, broken bool) int {
	s.mu.Lock() // held until the process exits
	if s.caught() != nil {
		return s.interruptLocked()
	}
	os.RemoveAll(s.scratch)
	if broken || errors.Is(err, syscall.EPIPE) {
		s.files.Discard()
		fmt.Fprintln(s.stderr, "wetline: standard output was closed before the output was written whole (broken pipe)")
		return interruptStatus(syscall.SIGPIPE)
	}
	return exitStatus(err, s.stderr)
}

// pipeWatch passes writes to standard output and notes a broken pipe.
type pipeWatch struct {
	w      io.Writer
	broken bool
}

func (p *pipeWatch) Write(b []byte) (int, error) {
	n, err := p.w.Write(b)
	if errors.Is(err, syscall.EPIPE) {
		p.broken = true
	}
	return n, err
}

// privateTemp removes the scratch folders that killed runs left behind
// (output.CleanScratch), makes a scratch folder for this run and points
// the process's temporary folder at it, so that the spreadsheet library's
// own temporary files of a large workbook are removed with it, even on an
// interrupt.
func privateTemp() (string, error) {
	output.CleanScratch("", output.ScratchAge, time.Now())
	dir, err := output.NewScratch("")
	if err != nil {
		return "", err
	}
	return dir, os.Setenv("TMPDIR", dir)
}

// exitStatus prints err and maps it to the exit status: 0 success (and
// help), 2 usage and environment errors, 128+N an error caused by signal
// N (the cause of a cancelled context, see interrupted), 1 everything
// else.
func exitStatus(err error, stderr io.Writer) int {
	if err == nil || errors.Is(err, errHelp) {
		return 0
	}
	var ie interrupted
	if errors.As(err, &ie) {
		fmt.Fprintln(stderr, interruptNote)
		return interruptStatus(ie.sig)
	}
	var ue usageError
	var ee envError
	for _, line := range strings.Split(err.Error(), "\n") {
		fmt.Fprintln(stderr, "wetline: "+line)
	}
	if errors.As(err, &ee) {
		return 2
	}
	if errors.As(err, &ue) {
		if ue.cmd != "" {
			fmt.Fprintf(stderr, "run 'wetline %s --help' for its usage\n", ue.cmd)
		} else {
			fmt.Fprintln(stderr, "run 'wetline help' for usage")
		}
		return 2
	}
	return 1
}

// pass notes that the run reached a point (see env.reached).
func (e *env) pass(point string) {
	if e.reached != nil {
		e.reached(point)
	}
}

// run is the whole program behind main: it parses args (without the
// program name) and runs one subcommand.
func run(ctx context.Context, e *env, args []string) error {
	if len(args) == 0 {
		printUsage(e.stderr, e.commands)
		return usagef("no command given")
	}
	name := args[0]
	switch name {
	case "help", "-h", "--help":
		if len(args) > 1 {
			topic := args[1]
			if topic == "-h" || topic == "--help" {
				topic = "help"
			}
			if b, ok := findBuiltin(topic); ok {
				return b.printHelp(e.stdout)
			}
			c, ok := e.commands[args[1]]
			if !ok {
				return usagef("help: unknown command %q", args[1])
			}
			return c.run(ctx, e, []string{"--help"})
		}
		return printUsage(e.stdout, e.commands)
	case "version", "--version":
		if len(args) > 1 {
			if args[1] == "-h" || args[1] == "--help" {
				b, _ := findBuiltin("version")
				return b.printHelp(e.stdout)
			}
			return usageError{err: fmt.Errorf("version: takes no arguments, got %q", args[1]), cmd: "version"}
		}
		_, err := fmt.Fprintln(e.stdout, program())
		return err
	case "completion":
		return runCompletion(ctx, e, args[1:])
	}
	c, ok := e.commands[name]
	if !ok {
		return usagef("unknown command %q", name)
	}
	// The limits of the inputs are read from the environment by every
	// reader; a variable that cannot be used is told before anything is
	// read or written.
	if _, err := survey.EnvLimits(); err != nil {
		return envError{err}
	}
	err := c.run(ctx, e, args[1:])
	if err == nil {
		e.pass("done")
		return nil
	}
	e.files.Discard() // a failed run leaves no output
	err = e.flags.missingInput(err)
	var ue usageError
	if errors.As(err, &ue) && ue.cmd == "" {
		err = usageError{err: err, cmd: name}
	}
	return err
}

// printUsage lists the commands.
func printUsage(w io.Writer, cmds map[string]command) error {
	var b strings.Builder
	b.WriteString("wetline: stage–discharge ratings from surveyed river cross-sections\n")
	b.WriteString("\nUsage: wetline COMMAND [ARGUMENTS]\n\nCommands:\n")
	names := make([]string, 0, len(cmds))
	for n := range cmds {
		names = append(names, n)
	}
	sort.Strings(names)
	for _, n := range names {
		fmt.Fprintf(&b, "  %-10s %s\n", n, cmds[n].summary)
	}
	for _, c := range builtins() {
		fmt.Fprintf(&b, "  %-10s %s\n", c.name, c.summary)
	}
	b.WriteString("\nRun 'wetline COMMAND --help' for a command's flags. An input file named - is\n")
	b.WriteString("standard input; -o - writes to standard output.\n")
	b.WriteString("\nExit status: 0 success, 1 input data or a file could not be used (nothing is\n")
	b.WriteString("written), 2 a mistake on the command line or in a WETLINE_MAX_* variable, 128+N\n")
	b.WriteString("interrupted by signal N.\n")
	b.WriteString("\nCaution: " + rating.Caution + "\n")
	_, err := io.WriteString(w, b.String())
	return err
}

// builtin is a command run handles itself, outside the command table: its
// name, its line in the list of commands, its usage line and what it does.
type builtin struct{ name, summary, usage, about string }

// builtins lists the commands run handles itself, in the order the list
// of commands shows them.
func builtins() []builtin {
	return []builtin{
		{"help", "show this list, or 'wetline help COMMAND' a command's flags", "help [COMMAND]",
			"Without COMMAND, list the commands; with one, print its usage and every flag with its default (as 'wetline COMMAND --help' does)."},
		{"version", "print the program's version (also --version)", "version",
			"Print the program's name and version, as every report states them."},
		{"completion", "print a shell completion script: 'wetline completion bash' or 'zsh'", completionUsage,
			"Print a shell completion script. For bash: source <(wetline completion bash); for zsh: source <(wetline completion zsh)."},
	}
}

// findBuiltin returns the builtin command called name.
func findBuiltin(name string) (builtin, bool) {
	for _, b := range builtins() {
		if b.name == name {
			return b, true
		}
	}
	return builtin{}, false
}

// printHelp prints the builtin's usage line and what it does to w, and
// returns errHelp (or the error of the write).
func (b builtin) printHelp(w io.Writer) error {
	if _, err := fmt.Fprintf(w, "Usage: wetline %s\n\n%s\n", b.usage, b.about); err != nil {
		return err
	}
	return errHelp
}
