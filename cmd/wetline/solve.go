package main

import (
	"context"
	"io"
	"math"
	"slices"

	"wetline/rating"
	"wetline/survey"
	"wetline/survey/results"
)

const solveUsage = "solve (SURVEY | --shape SPEC) (--discharge Q [--slope S] | --area A | --stage H [--slope S]) [--n ...] [--composite M] [--units si|us] [--site NAME] [--format text|json] [-o FILE]"

// solveFlags are the flags of solve.
type solveFlags struct {
	sectionFlags
	q              rating.Query
	slope          float64
	format, output string
}

func (f *solveFlags) register(fs *flagSet) {
	f.sectionFlags.register(fs)
	f.q = rating.Query{Discharge: math.NaN(), Area: math.NaN(), Stage: math.NaN()}
	fs.Float64Var(&f.q.Discharge, "discharge", math.NaN(), "discharge to find the normal (with --slope) and critical stages of, with specific energy and Froude number; where discharge does not grow steadily with stage (a pipe near its crown), each root's branch, and whether each critical stage is a minimum or maximum of specific energy, or neither")
	fs.Float64Var(&f.q.Area, "area", math.NaN(), "flow area to find the stage of (instead of --discharge)")
	fs.Float64Var(&f.q.Stage, "stage", math.NaN(), "stage to find the critical (and, with --slope, uniform-flow) discharge at; at a pipe's crown, the full-flow one")
	fs.Float64Var(&f.slope, "slope", 0, "friction slope for the normal stage (m/m or ft/ft)")
	fs.notGiven("slope")
	fs.StringVar(&f.format, "format", "", "output format: text or json (default: from the -o extension, else text)")
	fs.StringVarP(&f.output, "output", "o", "", "output file (default: standard output)")
	fs.output(outputFile, "output")
}

// check refuses a command line that asks for nothing, or for more than
// one thing, or gives implausible values; it settles the format.
func (f *solveFlags) check(fs *flagSet) error {
	if fs.NArg() > 1 || (fs.NArg() == 0 && f.shape == "") {
		return usagef("solve: want one SURVEY file or --shape SPEC, got %d arguments", fs.NArg())
	}
	asked := 0
	for _, name := range []string{"discharge", "area", "stage"} {
		if fs.Changed(name) {
			asked++
		}
	}
	if asked != 1 {
		return usagef("solve: give one of --discharge Q, --area A or --stage H")
	}
	if err := fs.positive("discharge", "area", "slope"); err != nil {
		return err
	}
	if err := fs.within(rating.MaxDischarge, "discharge", "area"); err != nil {
		return err
	}
	if err := fs.within(survey.MaxElevation, "stage"); err != nil {
		return err
	}
	if err := checkSlope("solve", f.slope); err != nil {
		return err
	}
	var err error
	f.format, err = outputFormat("solve", f.format, f.output, "text", "json")
	return err
}

// roughUse says what the query takes from the section's n: nothing for
// an area; only alpha for critical flow without a slope; else Manning's
// equation.
func (f *solveFlags) roughUse() survey.RoughUse {
	switch {
	case !math.IsNaN(f.q.Area):
		return survey.RoughUnused
	case f.slope > 0:
		return survey.RoughNeeded
	}
	return survey.RoughAlphaOnly
}

func runSolve(ctx context.Context, e *env, args []string) error {
	fs := newFlags("solve", solveUsage)
	var f solveFlags
	f.register(fs)
	if err := fs.parse(e, args); err != nil {
		return err
	}
	if err := f.check(fs); err != nil {
		return err
	}
	req, err := f.request(fs.Arg(0))
	if err != nil {
		return err
	}
	req.Roughless = f.roughUse()
	p, err := survey.Prepare(req)
	if err = f.requestError(err); err != nil {
		return err
	}
	c, _ := rating.ParseComposite(f.composite)
	rep, err := rating.Answer(p.Geometry, f.q, rating.Options{Slope: f.slope, Units: p.Units, Geometry: f.geometry(), Composite: c})
	if err != nil {
		return failed(p, err)
	}
	rep.Section, rep.NUnset = p.Source(), p.NUnset
	rep.Provenance = rating.Provenance{Program: program(), Inputs: p.Inputs, Site: siteWith(p.Site, f.site), Notes: p.Notes}
	rep.Warnings = slices.Concat(p.Warnings, rep.Warnings)
	write := results.WriteSolveText
	if f.format == "json" {
		write = results.WriteSolveJSON
	}
	return e.deliver(delivery{output: f.output, inputs: p.Inputs, inline: true,
		write:   func(w io.Writer) error { return write(w, rep) },
		summary: func(w io.Writer) error { return results.WriteWrote(w, f.output, nil) }})
}
