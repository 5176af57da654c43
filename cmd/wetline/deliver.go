package main

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"path/filepath"

	"wetline/rating"
	"wetline/survey/output"
	"wetline/survey/results"
)

// delivery is what a command hands back: its report, to standard output
// or to a file, and its figures into a folder. Every destination is
// checked before the first is written; files reach their places only
// when all are written.
type delivery struct {
	output string // report file; "" or "-" for standard output
	fresh  bool   // the report file must be new: an existing file is refused
	// fileOnly: the report goes to a file, never to standard output (a
	// template), so no refusal suggests -o -.
	fileOnly bool
	inputs   []string // files read, never written over
	write    func(io.Writer) error
	// inline reports that the report carries its warnings and the caution
	// itself (text and JSON); otherwise, on standard output, they go to
	// standard error after it.
	inline   bool
	warnings []string
	// notes are input notes ("input: ..." on the console: before the
	// warnings when the report goes to standard output and does not carry
	// them itself, before the summary when it goes to a file).
	notes []string
	plots string // folder for the figures; "" for none
	figs  []rating.Figure
	// summary prints the console summary after the report file is written.
	summary func(w io.Writer) error
	// console prints, after a report on standard output that does not
	// carry its warnings and caution, what the console says in their
	// place; nil: the warnings and the caution.
	console func(w io.Writer) error
}

// toStdout reports whether the report goes to standard output.
func (d delivery) toStdout() bool { return d.output == "" || d.output == "-" }

// deliver writes the report and the figures, then commits them. A report
// file that is one of the figures (-o naming a file --plots writes) is
// refused, naming both flags and wrapping output.ErrTwice, before anything
// is written.
func (e *env) deliver(d delivery) error {
	e.pass("deliver")
	f := e.files
	f.Protect(d.inputs...)
	var figPaths []string
	if d.plots != "" {
		f.MayCreate(d.plots) // the figures' folder is made if missing
		d.figs = e.figures.place(d.plots, d.figs)
		for _, fig := range d.figs {
			figPaths = append(figPaths, filepath.Join(d.plots, fig.Name))
		}
	}
	if !d.toStdout() {
		for _, p := range figPaths {
			if output.SamePath(d.output, p) {
				// Known only now: the figures' names come from the
				// inputs read and the figures drawn.
				return fmt.Errorf("-o %s is also a figure written into --plots %s (%w): give the report another name or the figures another folder",
					d.output, d.plots, output.ErrTwice)
			}
		}
		check := f.Check
		if d.fresh {
			check = f.CheckNew
		}
		if err := check(d.output); err != nil {
			return d.stdoutHint(err)
		}
	}
	for _, p := range figPaths {
		if err := f.Check(p); err != nil {
			return err
		}
	}
	if !d.toStdout() {
		write := f.Write
		if d.fresh {
			write = f.WriteNew
		}
		if err := write(d.output, d.write); err != nil {
			return d.stdoutHint(err)
		}
	}
	for i, p := range figPaths {
		png := d.figs[i].PNG
		if err := f.Write(p, func(w io.Writer) error { _, err := w.Write(png); return err }); err != nil {
			return err
		}
	}
	if d.toStdout() {
		if err := d.write(e.stdout); err != nil {
			return err
		}
	}
	if err := f.Commit(); err != nil {
		return err
	}
	if err := listFigures(e.stderr, figPaths, d.figs); err != nil {
		return err
	}
	switch {
	case d.toStdout() && !d.inline:
		if err := results.WriteInputNotes(e.stderr, d.notes); err != nil {
			return err
		}
		if d.console != nil {
			return d.console(e.stderr)
		}
		return endNote(e.stderr, d.warnings)
	case !d.toStdout() && d.summary != nil:
		if err := results.WriteInputNotes(e.stderr, d.notes); err != nil {
			return err
		}
		return d.summary(e.stderr)
	}
	return nil
}

// stdoutHint adds to the refusal of the report's path as a stream or as
// no regular file (a pipe, a device: output.ErrStream,
// output.ErrNotRegular) the way to what was most likely meant, standard
// output, when the report can go there. A figure's path under --plots,
// or a template's, is refused without it.
func (d delivery) stdoutHint(err error) error {
	if d.fileOnly {
		return err
	}
	return stdoutHint(err)
}

// stdoutHint adds "write to standard output with -o - instead" to the
// refusal of an -o path that names a stream or no regular file; other
// errors are returned as they are. Only a report that may go to
// standard output is refused so.
func stdoutHint(err error) error {
	if errors.Is(err, output.ErrStream) || errors.Is(err, output.ErrNotRegular) {
		return fmt.Errorf("%w (write to standard output with -o - instead)", err)
	}
	return err
}

// listFigures names each figure written, with its caption.
func listFigures(w io.Writer, paths []string, figs []rating.Figure) error {
	bw := bufio.NewWriter(w)
	for i, p := range paths {
		fmt.Fprintf(bw, "  %-28s %s\n", filepath.Base(p), figs[i].Caption)
	}
	return bw.Flush()
}

// endNote writes the warnings and the caution on the console.
func endNote(w io.Writer, warnings []string) error {
	if err := results.WriteWarnings(w, warnings); err != nil {
		return err
	}
	return results.WriteCaution(w)
}
