package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"

	"github.com/spf13/pflag"

	"wetline/rating"
	"wetline/subdivide"
	"wetline/survey"
	"wetline/survey/output"
)

// registerShape adds the flags for built shapes and composite roughness.
func (sf *sectionFlags) registerShape(fs *pflag.FlagSet) {
	fs.StringVar(&sf.shape, "shape", "", "a built section instead of a survey: "+subdivide.ShapeForms)
	fs.StringVar(&sf.composite, "composite", "split", "roughness where a region's ground has several n: split (a subsection per n), horton, pavlovskii or lotter")
}

// loadShape builds the section given by --shape; path must be empty.
func (sf *sectionFlags) loadShape(l *loaded, path string) (*loaded, error) {
	switch {
	case sf.shape == "":
		return nil, usagef("give a SURVEY file or --shape SPEC")
	case path != "":
		return nil, usagef("give a SURVEY file or --shape SPEC, not both")
	case sf.banks != "":
		return nil, usagef("--banks does not apply to a built shape (a compound shape's banks are its channel's top corners)")
	case sf.sheet != "":
		return nil, usagef("--sheet does not apply to a built shape")
	}
	sh, err := subdivide.ParseShape(sf.shape)
	if err != nil {
		return nil, usageError{err}
	}
	l.shape, l.source, l.inputs = sh, sh.String(), nil
	n, err := sf.shapeN(sh)
	if err != nil {
		return nil, err
	}
	g, err := sh.Build(n)
	if err != nil {
		return nil, usageError{err}
	}
	if !sh.Closed() {
		if sec, err := sh.Section(n); err == nil {
			l.section = sec
		}
	}
	if sh.Closed() {
		l.warnings = append(l.warnings, fmt.Sprintf(
			"closed conduit: at its crown (stage %g %s) it flows full: the wetted perimeter is the whole circumference, the top width is zero and the Froude number is undefined; a stage above the crown is an error",
			g.Top(), l.units.Length()))
	}
	return sf.finish(l, g)
}

// shapeN reads --n for a built shape: one value, or LEFT,CHANNEL,RIGHT
// for a compound shape (whose floodn key, when given, takes precedence).
func (sf *sectionFlags) shapeN(sh subdivide.Shape) (subdivide.RegionN, error) {
	var n subdivide.RegionN
	if sf.n == "" {
		return n, usagef("--shape: give Manning's n with --n")
	}
	v, err := parseFloats(sf.n, "--n")
	if err != nil {
		return n, err
	}
	for _, x := range v {
		if !(x > 0) || math.IsInf(x, 0) {
			return n, usagef("--n %q: Manning's n must be positive", sf.n)
		}
	}
	switch {
	case len(v) == 1:
		n = subdivide.UniformN(v[0])
	case len(v) == 3 && sh.Kind == subdivide.Compound:
		n = subdivide.RegionN{Left: v[0], Channel: v[1], Right: v[2]}
	case len(v) == 3:
		return n, usagef("--n LEFT,CHANNEL,RIGHT needs a compound shape; a %s has one n", sh.Kind)
	default:
		return n, usagef("--n wants one value or three (LEFT,CHANNEL,RIGHT), got %q", sf.n)
	}
	return n, nil
}

// finish applies the composite roughness method to the geometry.
func (sf *sectionFlags) finish(l *loaded, g subdivide.Geometry) (*loaded, error) {
	c, err := rating.ParseComposite(sf.composite)
	if err != nil {
		return nil, usageError{err}
	}
	l.geom = rating.CompositeGeometry(g, c)
	return l, nil
}

// fail words an error from computing on the loaded section: a stage above
// a conduit's crown is a usage error.
func (l *loaded) fail(err error) error {
	err = fmt.Errorf("%s: %w", l.source, err)
	if errors.Is(err, subdivide.ErrAboveCrown) {
		return usageError{err}
	}
	return err
}

const shapeUsage = "shape SPEC --n N [--units si|us] [-o FILE]   (SPEC: " + subdivide.ShapeForms + ")"

// runShape writes a built open shape as a survey CSV that can be edited
// and read back by every command.
func runShape(ctx context.Context, e *env, args []string) error {
	fs := newFlags("shape", shapeUsage)
	n := fs.String("n", "", "Manning's n: one value, or LEFT,CHANNEL,RIGHT for a compound shape (omit for no n column)")
	units := fs.String("units", "si", "unit system of the dimensions: si (m) or us (ft)")
	out := fs.StringP("output", "o", "", "output file (default: standard output)")
	if err := parseFlags(fs, e, args); err != nil {
		return err
	}
	if fs.NArg() != 1 {
		return usagef("shape: want one SPEC (%s), got %d arguments", subdivide.ShapeForms, fs.NArg())
	}
	u, err := rating.ParseUnits(*units)
	if err != nil {
		return usageError{err}
	}
	sh, err := subdivide.ParseShape(fs.Arg(0))
	if err != nil {
		return usageError{err}
	}
	if sh.Closed() {
		return usagef("shape %q: a closed conduit has no open ground line to write as a survey; use it directly with --shape", fs.Arg(0))
	}
	var nv subdivide.RegionN
	if *n != "" {
		sf := sectionFlags{n: *n}
		if nv, err = sf.shapeN(sh); err != nil {
			return err
		}
	}
	sec, err := sh.Section(nv)
	if err != nil {
		return usageError{err}
	}
	comments := []string{
		fmt.Sprintf("Built section %s, lengths in %s; invert at elevation %g.", sh.String(), u.Length(), sh.Invert),
		fmt.Sprintf("The sides stop at the nominal top, %g %s above the invert; edit the points freely.", sh.NominalHeight(), u.Length()),
		"Caution: " + rating.Caution,
	}
	write := func(w io.Writer) error { return survey.WriteSectionCSV(w, sec, comments) }
	if *out == "" {
		return write(e.stdout)
	}
	if err := output.WriteFile(*out, nil, write); err != nil {
		return err
	}
	fmt.Fprintf(e.stderr, "wrote %s: %d points of %s\n", *out, len(sec.Points), sh.String())
	return nil
}
