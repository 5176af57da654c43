package main

import (
	"context"
	"io"
	"math"
	"wetline/survey"

	"wetline/rating"
	"wetline/survey/results"
)

const solveUsage = "solve (SURVEY | --shape SPEC) (--discharge Q [--slope S] | --area A | --stage H [--slope S]) [--n ...] [--composite M] [--units si|us] [--site NAME] [--format text|json] [-o FILE]"

func runSolve(ctx context.Context, e *env, args []string) error {
	fs := newFlags("solve", solveUsage)
	var sf sectionFlags
	sf.register(fs)
	q := rating.Query{Discharge: math.NaN(), Area: math.NaN(), Stage: math.NaN()}
	var slope float64
	var format, output string
	fs.Float64Var(&q.Discharge, "discharge", math.NaN(), "discharge to find the normal and critical stages of")
	fs.Float64Var(&q.Area, "area", math.NaN(), "flow area to find the stage of (instead of --discharge)")
	fs.Float64Var(&q.Stage, "stage", math.NaN(), "stage to find the critical (and, with --slope, uniform-flow) discharge at")
	fs.Float64Var(&slope, "slope", 0, "friction slope for the normal stage (m/m or ft/ft)")
	fs.StringVar(&format, "format", "", "output format: text or json (default: from the -o extension, else text)")
	fs.StringVarP(&output, "output", "o", "", "output file (default: standard output)")
	if err := fs.parse(e, args); err != nil {
		return err
	}
	if fs.NArg() > 1 || (fs.NArg() == 0 && sf.shape == "") {
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
	if err := checkSlope("solve", slope); err != nil {
		return err
	}
	format, err := outputFormat("solve", format, output, "text", "json")
	if err != nil {
		return err
	}
	p, err := sf.prepare(fs.Arg(0))
	if err != nil {
		return err
	}
	c, _ := rating.ParseComposite(sf.composite)
	rep, err := rating.Answer(p.Geometry, q, rating.Options{Slope: slope, Units: p.Units, Geometry: sf.geometry(), Composite: c})
	if err != nil {
		return failed(p, err)
	}
	rep.Section = p.Source()
	rep.Provenance = rating.Provenance{Program: program(), Inputs: p.Inputs, Site: siteWith(p.Site, sf.site)}
	rep.Warnings = append(append([]string(nil), p.Warnings...), rep.Warnings...)
	write := results.WriteSolveText
	if format == "json" {
		write = results.WriteSolveJSON
	}
	return e.deliver(delivery{output: output, inputs: p.Inputs, inline: true,
		write:   func(w io.Writer) error { return write(w, rep) },
		summary: func(w io.Writer) error { return results.WriteWrote(w, output, nil) }})
}
