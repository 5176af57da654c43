package main

import (
	"context"
	"fmt"
	"io"
	"math"
	"path/filepath"

	"wetline/plotting"
	"wetline/survey"
)

const plotUsage = "plot TABLE.csv [--section SURVEY [--n N] [--banks A,B]] [--units si|us] [--zero-flow E] [--datum D] [--site NAME] [--width PX --height PX --dpi N] [-o DIR]"

func runPlot(ctx context.Context, e *env, args []string) error {
	fs := newFlags("plot", plotUsage)
	var sf sectionFlags
	sf.register(fs)
	section := fs.String("section", "", "surveyed cross-section of the table, for the section figure")
	zeroFlow := fs.Float64("zero-flow", math.NaN(), "gauge height of zero flow for the log–log panel (default: where the table's discharge starts)")
	datum := fs.Float64("datum", 0, "the table's stages are gauge heights on a gauge whose zero lies at this elevation (for the section figure)")
	width := fs.Int("width", plotting.DefaultWidth, "figure width in pixels")
	height := fs.Int("height", plotting.DefaultHeight, "figure height in pixels")
	dpi := fs.Int("dpi", plotting.DefaultDPI, "figure resolution in dots per inch (text keeps its size in points)")
	out := fs.StringP("output", "o", "", "folder for the PNG files (default: the table's folder)")
	if err := fs.parse(e, args); err != nil {
		return err
	}
	if fs.NArg() != 1 {
		return usagef("plot: want one TABLE file (a rating CSV written by 'wetline rate'), got %d arguments", fs.NArg())
	}
	u, err := sf.unitSystem()
	if err != nil {
		return err
	}
	if err := fs.positive("width", "height", "dpi"); err != nil {
		return err
	}
	if err := fs.within(survey.MaxElevation, "datum", "zero-flow"); err != nil {
		return err
	}
	size := plotting.Size{Width: *width, Height: *height, DPI: *dpi}
	if err := size.Check(); err != nil {
		return usageError{err: err}
	}
	path := fs.Arg(0)
	t, err := survey.ReadRatingCSV(path, "", u)
	if err != nil {
		return err
	}
	if fs.Changed("datum") {
		t.GaugeHeights, t.Datum = true, *datum
	}
	inputs := []string{path}
	warnings := append([]string(nil), t.Warnings...)
	in := plotting.RatingFigures{Site: sf.site, Base: figureBase(t.Name), Table: t, ZeroFlow: *zeroFlow, Size: size,
		Subtitle: fmt.Sprintf("redrawn from %s", filepath.Base(path))}
	if *section != "" {
		p, err := sf.prepareIn(*section, t.Units)
		if err != nil {
			return err
		}
		inputs = append(inputs, p.Inputs...)
		warnings = append(warnings, p.Warnings...)
		in.Ground, in.Geometry = p.Ground, sf.geometry()
		in.Site = siteWith(p.Site, sf.site).Name
	}
	figs, w, err := plotting.DrawRating(in)
	if err != nil {
		return err
	}
	warnings = append(warnings, w...)
	dir := *out
	if dir == "" {
		dir = filepath.Dir(path)
	}
	return e.deliver(delivery{output: "-", inputs: inputs, plots: dir, figs: figs, warnings: warnings,
		write: func(io.Writer) error { return nil }})
}
