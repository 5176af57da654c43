package main

import (
	"io"
	"wetline/survey/output"
)

// delivery is what a command hands back: its report, to standard output or
// written whole to a file, then any figures into their folder.
type delivery struct {
	output string   // report file; "" for standard output
	inputs []string // files read, never written over
	write  func(io.Writer) error
	// inline reports that the report carries its warnings itself (the text
	// formats); otherwise they go to standard error after a report on
	// standard output.
	inline   bool
	warnings []string
	plots    string // folder for the figures; "" for none
	figs     []figureFile
	// summary prints the console summary after the report file is written.
	summary func(w io.Writer)
}

// deliver writes the report, then the figures, never over an input or the
// report itself.
func (d delivery) deliver(e *env) error {
	if d.output == "" {
		if err := d.write(e.stdout); err != nil {
			return err
		}
		if err := writeFigures(e.stderr, d.plots, d.figs, d.inputs); err != nil {
			return err
		}
		if !d.inline {
			printWarnings(e.stderr, d.warnings)
		}
		return nil
	}
	if err := output.WriteFile(d.output, d.inputs, d.write); err != nil {
		return err
	}
	if err := writeFigures(e.stderr, d.plots, d.figs, append([]string{d.output}, d.inputs...)); err != nil {
		return err
	}
	if d.summary != nil {
		d.summary(e.stderr)
	}
	return nil
}
