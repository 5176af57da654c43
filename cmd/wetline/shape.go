package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"strings"

	"wetline/rating"
	"wetline/subdivide"
	"wetline/survey"
)

const shapeUsage = "shape SPEC [--n N | --n LEFT,CHANNEL,RIGHT] [--units si|us] [--site NAME] [-o FILE]   (SPEC: " + subdivide.ShapeForms + ")"

// runShape writes a built open shape as a survey CSV that can be edited
// and read back by every command.
func runShape(ctx context.Context, e *env, args []string) error {
	fs := newFlags("shape", shapeUsage)
	var n numbers
	fs.Var(&n, "n", "Manning's n: one value, or LEFT,CHANNEL,RIGHT for a compound shape (omit for no n column)")
	units := fs.String("units", "si", "unit system of the dimensions: si (m) or us (ft)")
	out := fs.StringP("output", "o", "", "output file (.csv; default: standard output)")
	fs.output(outputFile, "output")
	site := fs.String("site", "", "the site's name, written as the survey's site key")
	if err := fs.parseOperands(e, args, 1, fmt.Sprintf("one SPEC (%s)", subdivide.ShapeForms)); err != nil {
		return err
	}
	if err := fixedFormat("shape", *out, "csv"); err != nil {
		return err
	}
	u, err := rating.ParseUnits(*units)
	if err != nil {
		return usageError{err: err}
	}
	sh, err := subdivide.ParseShape(fs.Arg(0))
	if err != nil {
		return usageError{err: err}
	}
	if sh.Closed() {
		return usagef("shape %q: a closed conduit has no open ground line to write as a survey; use it directly with --shape", fs.Arg(0))
	}
	var nv subdivide.PerRegion
	if len(n) > 0 {
		if nv, err = survey.ShapeN(sh, n); errors.Is(err, survey.ErrRequest) {
			return usageError{err: fmt.Errorf("shape: %w", err)}
		}
	}
	sec, err := sh.Section(nv)
	if err != nil {
		return usageError{err: err}
	}
	var comments []string
	if *site != "" {
		comments = append(comments, survey.MetaSite+": "+strings.Join(strings.Fields(*site), " "))
	}
	comments = append(comments,
		fmt.Sprintf("%s%s, lengths in %s; invert at elevation %g.", survey.BuiltPrefix, sh.String(), u.Length(), sh.Invert),
		fmt.Sprintf("The sides stop at the nominal top, %g %s above the invert; edit the points freely.", sh.NominalHeight(), u.Length()),
		"Caution: "+rating.Caution,
	)
	// A file of that name may be a field survey: never replaced, as
	// template's workbook is not.
	return e.deliver(delivery{output: *out, inline: true, fresh: true,
		write: func(w io.Writer) error { return survey.WriteSectionCSV(w, sec, u, comments) },
		summary: func(w io.Writer) error {
			_, err := fmt.Fprintf(w, "wrote %s: %d points of %s\n", *out, len(sec.Points), sh.String())
			return err
		}})
}
