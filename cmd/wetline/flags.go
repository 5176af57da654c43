package main

import (
	"errors"
	"fmt"
	"io"
	iofs "io/fs"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"time"

	"github.com/spf13/pflag"

	"wetline/rating"
	"wetline/rating/record"
	"wetline/survey"
	"wetline/survey/output"
)

// flagSet is a subcommand's flags with its usage line.
type flagSet struct {
	*pflag.FlagSet
	usage string
}

// newFlags returns a flag set for a subcommand with -h/--help defined, so
// help goes to stdout.
func newFlags(name, usage string) *flagSet {
	fs := pflag.NewFlagSet(name, pflag.ContinueOnError)
	fs.SortFlags = false
	fs.BoolP("help", "h", false, "show this help")
	fs.Usage = func() {}
	fs.SetOutput(io.Discard)
	return &flagSet{FlagSet: fs, usage: usage}
}

// parseOperands parses args as parse does and then wants exactly n
// operands, which want describes ("one REACH table"): a usage error
// "NAME: want WANT, got N arguments" otherwise.
func (fs *flagSet) parseOperands(e *env, args []string, n int, want string) error {
	if err := fs.parse(e, args); err != nil {
		return err
	}
	if fs.NArg() != n {
		return usagef("%s: want %s, got %d arguments", fs.Name(), want, fs.NArg())
	}
	return nil
}

// parse parses args; it prints help to stdout and returns errHelp for -h,
// wraps parse errors as usage errors, and refuses a number flag given a
// value that is not finite (NaN, Inf).
func (fs *flagSet) parse(e *env, args []string) error {
	seen := map[string]bool{}
	err := fs.ParseAll(args, func(f *pflag.Flag, value string) error {
		if seen[f.Name] && !repeatable(f) {
			name := "--" + f.Name
			if f.Shorthand != "" {
				name = "-" + f.Shorthand + " (--" + f.Name + ")"
			}
			return fmt.Errorf("%s is given twice: give it once (a later one would replace the first)", name)
		}
		seen[f.Name] = true
		return fs.Set(f.Name, value)
	})
	if err != nil {
		if errors.Is(err, pflag.ErrHelp) {
			return fs.help(e.stdout)
		}
		return usageError{err: fmt.Errorf("%s: %w", fs.Name(), err)}
	}
	if h, _ := fs.GetBool("help"); h {
		return fs.help(e.stdout)
	}
	var bad error
	fs.Visit(func(f *pflag.Flag) {
		if bad != nil || f.Value.Type() != "float64" {
			return
		}
		if v, err := strconv.ParseFloat(f.Value.String(), 64); err == nil && (math.IsNaN(v) || math.IsInf(v, 0)) {
			bad = usagef("%s: --%s %s: want a finite number", fs.Name(), f.Name, f.Value.String())
		}
	})
	if bad != nil {
		return bad
	}
	e.flags = fs
	if err := fs.oneStdin(); err != nil {
		return err
	}
	if fs.readsStdin() {
		e.files.ProtectStdin(e.stdin)
	}
	return fs.distinctOutputs()
}

// readsStdin reports whether an input is standard input (-).
func (fs *flagSet) readsStdin() bool {
	return len(fs.stdinPlaces()) > 0
}

// repeatable reports a flag that may be given more than once: a list
// that each use adds to (--rating FILE@TIME ...), or a switch. Any other
// flag given twice would keep only its last value, so it is refused.
func repeatable(f *pflag.Flag) bool {
	switch f.Value.Type() {
	case "stringArray", "bool":
		return true
	}
	return false
}

// inputKey is the flag annotation marking a flag that names an input file.
const inputKey = "wetline/input"

// input marks the flags names as naming input files, which may be "-" for
// standard input (a list flag's values may be FILE@TIME): parse refuses
// standard input named twice (oneStdin).
func (fs *flagSet) input(names ...string) { fs.annotate(inputKey, "", names...) }

// inputAfter marks the flags names as naming an input file after prefix
// (as --boundary rating:FILE), for oneStdin.
func (fs *flagSet) inputAfter(prefix string, names ...string) {
	fs.annotate(inputKey, prefix, names...)
}

// oneStdin refuses, as a usage error naming both places, standard input
// (-) named twice among the arguments (every one an input, or a spec
// that is never "-") and the input flags (marked with input): it can be
// read only once.
func (fs *flagSet) oneStdin() error {
	places := fs.stdinPlaces()
	if len(places) > 1 {
		return usagef("%s: standard input (-) is named twice, as %s and as %s: it can be read only once; save one of the inputs to a file",
			fs.Name(), places[0], places[1])
	}
	return nil
}

// stdinPlaces lists where standard input (-) is named as an input.
func (fs *flagSet) stdinPlaces() []string {
	var places []string
	for i, a := range fs.Args() {
		if a == "-" {
			places = append(places, fmt.Sprintf("argument %d", i+1))
		}
	}
	fs.inputValues(func(f *pflag.Flag, prefix, v string) bool {
		if v == "-" || strings.HasPrefix(v, "-@") {
			places = append(places, flagWords(f)+" "+prefix+v)
		}
		return true
	})
	return places
}

// inputValues calls yield with every value given to an input flag (marked
// with input; each value of a list flag), the flag's prefix (a kind such
// as "rating:") cut off, skipping values without it, until yield returns
// false.
func (fs *flagSet) inputValues(yield func(f *pflag.Flag, prefix, v string) bool) {
	done := false
	fs.VisitAll(func(f *pflag.Flag) {
		if done || len(f.Annotations[inputKey]) == 0 || !f.Changed {
			return
		}
		values := []string{f.Value.String()}
		if sv, ok := f.Value.(pflag.SliceValue); ok {
			values = sv.GetSlice()
		}
		prefix := f.Annotations[inputKey][0]
		for _, v := range values {
			v, ok := strings.CutPrefix(v, prefix)
			if !ok {
				continue
			}
			if !yield(f, prefix, v) {
				done = true
				return
			}
		}
	})
}

// missingInput names the flag of an input that could not be opened
// because it does not exist or may not be read: err, when it is such an
// error for a path (a *survey.ParseError naming the file, or an
// *fs.PathError) that an input flag (marked with input) was given, is
// returned as "COMMAND --FLAG: err", so the message says which input it
// is, as a usage error names its flag. Any other error, and every error
// when fs is nil, is returned as it is. An input given as an argument is
// named by its path alone.
func (fs *flagSet) missingInput(err error) error {
	if fs == nil || !(errors.Is(err, iofs.ErrNotExist) || errors.Is(err, iofs.ErrPermission)) {
		return err
	}
	var path string
	if pe := (*survey.ParseError)(nil); errors.As(err, &pe) {
		path = pe.File
	} else if pe := (*iofs.PathError)(nil); errors.As(err, &pe) {
		path = pe.Path
	}
	if path == "" || path == "-" {
		return err
	}
	var place string
	fs.inputValues(func(f *pflag.Flag, _, v string) bool {
		if v == path || strings.HasPrefix(v, path+"@") { // FILE@TIME
			place = flagWords(f)
			return false
		}
		return true
	})
	if place == "" {
		return err
	}
	return fmt.Errorf("%s %s: %w", fs.Name(), place, err)
}

// Kinds of path an output flag names (see output).
const (
	outputFile   = "file"   // a file written whole
	outputFolder = "folder" // a folder files are written into
	outputEither = "either" // a file or a folder, by the run (rate's -o)
)

// outputKey is the flag annotation holding an output flag's kind.
const outputKey = "wetline/output"

// output marks the flags names as naming outputs of kind (outputFile,
// outputFolder or outputEither): parse refuses two of them that name one
// path (distinctOutputs).
func (fs *flagSet) output(kind string, names ...string) { fs.annotate(outputKey, kind, names...) }

// annotate sets the annotation key to value on each flag of names.
func (fs *flagSet) annotate(key, value string, names ...string) {
	for _, n := range names {
		if err := fs.SetAnnotation(n, key, []string{value}); err != nil {
			panic(err) // a flag registered under another name: a defect
		}
	}
}

// flagWords names a flag as a user types it: -o for the output, else
// --name.
func flagWords(f *pflag.Flag) string {
	if f.Shorthand != "" {
		return "-" + f.Shorthand
	}
	return "--" + f.Name
}

// distinctOutputs refuses, as a usage error naming both flags, two output
// flags (marked with output) given paths that name the same file or
// folder, after cleaning and through symbolic links (output.SamePath), or
// a path inside another flag's path that is written as a file, and an
// output flag given an empty path. Standard output (-) and flags not
// given are passed over.
func (fs *flagSet) distinctOutputs() error {
	type dest struct {
		flag, path, kind string
	}
	var outs []dest
	var empty, emptyKind string
	fs.VisitAll(func(f *pflag.Flag) {
		kind := f.Annotations[outputKey]
		if len(kind) == 0 || !f.Changed {
			return
		}
		if p := f.Value.String(); p != "" && p != "-" {
			outs = append(outs, dest{flagWords(f), p, kind[0]})
		} else if p == "" && empty == "" {
			empty, emptyKind = flagWords(f), kind[0]
		}
	})
	if empty != "" {
		what := "a file, or - for standard output"
		if emptyKind == outputFolder {
			what = "a folder"
		}
		return usagef("%s: %s is given an empty path: name %s", fs.Name(), empty, what)
	}
	for i, a := range outs {
		for _, b := range outs[i+1:] {
			if output.SamePath(a.path, b.path) {
				return usagef("%s: %s %s and %s %s name the same path: give each output its own", fs.Name(), a.flag, a.path, b.flag, b.path)
			}
			for _, file := range [][2]dest{{a, b}, {b, a}} {
				if out, in := file[0], file[1]; out.kind == outputFile && output.Inside(in.path, out.path) {
					return usagef("%s: %s %s lies inside %s %s, which is written as a file: give each output its own path", fs.Name(), in.flag, in.path, out.flag, out.path)
				}
			}
		}
	}
	return nil
}

// help prints the usage line and the flags, and returns errHelp.
func (fs *flagSet) help(w io.Writer) error {
	var b strings.Builder
	fmt.Fprintf(&b, "Usage: wetline %s\n\n", fs.usage)
	fs.VisitAll(func(f *pflag.Flag) {
		if f.Hidden {
			return // kept for old scripts, not offered
		}
		name := "--" + f.Name
		if f.Shorthand != "" {
			name = "-" + f.Shorthand + ", " + name
		}
		if typ := f.Value.Type(); typ != "bool" {
			name += " " + argName(typ)
		}
		def := ""
		switch {
		case f.DefValue == "" || f.DefValue == "false" || f.DefValue == "[]" || f.DefValue == "NaN":
		case strings.Contains(f.Usage, "default:"): // the usage says the default in words
		case (f.DefValue == "0" || f.DefValue == "0s") && (!isNumber(f) || strings.Contains(f.Usage, "default") || f.Annotations[notGivenKey] != nil):
			// a zero standing for a default said in words, for "not given",
			// or of a value that is no number (an offset: UTC)
		case f.Value.Type() == "duration":
			def = fmt.Sprintf(" (default %s)", helpDuration(f.DefValue))
		default:
			def = fmt.Sprintf(" (default %s)", f.DefValue)
		}
		fmt.Fprintf(&b, "  %-24s %s%s\n", name, f.Usage, def)
	})
	if _, err := io.WriteString(w, b.String()); err != nil {
		return err
	}
	return errHelp
}

// notGivenKey is the flag annotation of a number flag whose zero default
// stands for "not given" (see notGiven).
const notGivenKey = "wetline/not-given"

// notGiven marks number flags whose zero default is no value but "not
// given" (a required slope, a datum whose presence changes the report), so
// help shows no default for them. Every other zero default is a value
// help states, as "(default 0)", unless the usage says the default in
// words.
func (fs *flagSet) notGiven(names ...string) { fs.annotate(notGivenKey, "true", names...) }

// isNumber reports whether a flag takes a number or a duration.
func isNumber(f *pflag.Flag) bool {
	return argName(f.Value.Type()) == "NUM" || f.Value.Type() == "duration"
}

// helpDuration writes a duration flag's default as reports write
// durations (record.FormatDuration): 2h, not 2h0m0s.
func helpDuration(def string) string {
	d, err := time.ParseDuration(def)
	if err != nil {
		return def
	}
	return record.FormatDuration(d)
}

// argName names a flag's argument in help by its type.
func argName(typ string) string {
	switch typ {
	case "float64", "int", "int64", "uint64":
		return "NUM"
	case "numbers":
		return "LIST"
	}
	return "TEXT"
}

// positive refuses a flag that was given and is not above zero.
func (fs *flagSet) positive(names ...string) error {
	for _, n := range names {
		f := fs.Lookup(n)
		if f == nil || !f.Changed {
			continue
		}
		if v, err := strconv.ParseFloat(f.Value.String(), 64); err != nil || !(v > 0) {
			return usagef("%s: --%s %s: want a positive number", fs.Name(), n, f.Value.String())
		}
	}
	return nil
}

// within refuses a number flag, or any number of a list flag, that was
// given beyond ±limit: a typing slip or a unit mistake rather than a value
// of a river.
func (fs *flagSet) within(limit float64, names ...string) error {
	for _, n := range names {
		f := fs.Lookup(n)
		if f == nil || !f.Changed {
			continue
		}
		for _, item := range strings.Split(f.Value.String(), ",") {
			if v, err := strconv.ParseFloat(item, 64); err == nil && math.Abs(v) > limit {
				return usagef("%s: --%s %s is beyond ±%g: not a plausible value", fs.Name(), n, item, limit)
			}
		}
	}
	return nil
}

// needs refuses flags that were given without the flag they depend on.
func (fs *flagSet) needs(flag string, given bool, names ...string) error {
	if given {
		return nil
	}
	for _, n := range names {
		if fs.Changed(n) {
			return usagef("%s: --%s needs %s", fs.Name(), n, flag)
		}
	}
	return nil
}

// numbers is a flag holding a comma-separated list of numbers; spaces
// around each number are allowed, anything else not a number is refused
// with the flag's text.
type numbers []float64

func (n *numbers) String() string {
	parts := make([]string, len(*n))
	for i, v := range *n {
		parts[i] = strconv.FormatFloat(v, 'g', -1, 64)
	}
	return strings.Join(parts, ",")
}

func (n *numbers) Set(s string) error {
	var out []float64
	for _, f := range strings.Split(s, ",") {
		f = strings.TrimSpace(f)
		v, err := strconv.ParseFloat(f, 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("%q is not a finite number", f)
		}
		out = append(out, v)
	}
	*n = out
	return nil
}

func (n *numbers) Type() string { return "numbers" }

// outputFormat picks the format from the flag, else from the output
// file's extension (.txt is text), else the first allowed one for
// standard output. An extension the command cannot write is refused.
func outputFormat(cmd, flag, output string, allowed ...string) (string, error) {
	return pickFormat(cmd, flag, output, true, allowed)
}

// fixedFormat checks the output file's extension is that of the one
// format a command without a --format flag writes.
func fixedFormat(cmd, output, format string) error {
	_, err := pickFormat(cmd, "", output, false, []string{format})
	return err
}

// pickFormat is outputFormat; withFlag says the command has --format, so
// its messages offer it.
func pickFormat(cmd, flag, output string, withFlag bool, allowed []string) (string, error) {
	f, err := chooseFormat(cmd, flag, output, withFlag, allowed)
	if err == nil && f == "xlsx" && output == "" {
		// A workbook is no text for a terminal: it goes to a file, or to
		// standard output only when asked for with -o -.
		return "", usagef("%s: an xlsx workbook needs -o FILE.xlsx (or -o - for standard output)", cmd)
	}
	return f, err
}

// outputFormats are the formats of every report (.txt read as text): an
// -o named as one of them names a format the command may not write.
var outputFormats = map[string]bool{"csv": true, "json": true, "text": true, "xlsx": true}

// chooseFormat picks the format of --format, else of the -o extension,
// else the first allowed. Its refusals of an extension name the formats
// the command writes; an unknown extension's offers --format too where
// the command has it (withFlag).
func chooseFormat(cmd, flag, output string, withFlag bool, allowed []string) (string, error) {
	if st, err := os.Stat(output); err == nil && st.IsDir() && output != "-" {
		return "", usagef("%s: -o %s is a folder: name a file (such as %s)", cmd, output,
			filepath.Join(output, strings.Fields(cmd)[0]+"."+extensions(allowed)[0]))
	}
	f := strings.ToLower(flag)
	if f != "" {
		for _, a := range allowed {
			if a == f {
				return f, nil
			}
		}
		return "", usagef("%s: --format %q: want one of %s", cmd, flag, strings.Join(allowed, ", "))
	}
	if output == "" || output == "-" {
		return allowed[0], nil
	}
	ext := strings.TrimPrefix(strings.ToLower(filepath.Ext(output)), ".")
	if ext == "txt" {
		ext = "text"
	}
	for _, a := range allowed {
		if a == ext {
			return a, nil
		}
	}
	exts := extensions(allowed)
	for i := range exts {
		exts[i] = "." + exts[i]
	}
	if outputFormats[ext] {
		return "", usagef("%s: -o %s: %s writes %s, not %s: name the file %s", cmd, output, cmd, orList(allowed), ext, orList(exts))
	}
	hint := "name the file " + orList(exts)
	if withFlag {
		hint += ", or give --format"
	}
	return "", usagef("%s: -o %s: cannot tell the format from the extension %q: %s", cmd, output, filepath.Ext(output), hint)
}

// orList joins words as "a", "a or b", "a, b or c".
func orList(words []string) string {
	if len(words) < 2 {
		return strings.Join(words, "")
	}
	return strings.Join(words[:len(words)-1], ", ") + " or " + words[len(words)-1]
}

// extensions lists the file extensions of formats.
func extensions(formats []string) []string {
	out := make([]string, len(formats))
	for i, f := range formats {
		if f == "text" {
			f = "txt"
		}
		out[i] = f
	}
	return out
}

// tooFineStep turns an error of a --step too fine for its range
// (rating.ErrStepTooFine) into a usage error of cmd naming --step with its
// value and length unit; other errors, and nil, pass unchanged.
func tooFineStep(cmd string, step float64, u rating.Units, err error) error {
	if !errors.Is(err, rating.ErrStepTooFine) {
		return err
	}
	return usageError{err: fmt.Errorf("%s: --step %s %s: %w; give a coarser step", cmd, strconv.FormatFloat(step, 'g', -1, 64), u.Length(), err)}
}
