package main

import (
	"bytes"
	"context"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"

	"wetline/plotting"
	"wetline/rating"
	"wetline/survey"
	"wetline/survey/output"
)

const plotUsage = "plot TABLE.csv [--section SURVEY [--n N] [--banks A,B]] [--units si|us] [--zero-flow E] [--site NAME] [--width PX --height PX --dpi N] [-o DIR]"

// figureFile is a figure rendered in memory, written only when every
// figure of a run has been drawn.
type figureFile struct {
	name, what string
	data       []byte
}

func runPlot(ctx context.Context, e *env, args []string) error {
	fs := newFlags("plot", plotUsage)
	var sf sectionFlags
	sf.register(fs)
	section := fs.String("section", "", "surveyed cross-section of the table, for the section figure")
	zeroFlow := fs.Float64("zero-flow", math.NaN(), "gauge height of zero flow for the log–log panel (default: where the table's discharge starts)")
	site := fs.String("site", "", "site name for the figure titles")
	width := fs.Int("width", plotting.DefaultWidth, "figure width in pixels")
	height := fs.Int("height", plotting.DefaultHeight, "figure height in pixels")
	dpi := fs.Int("dpi", plotting.DefaultDPI, "figure resolution in dots per inch (text keeps its size in points)")
	out := fs.StringP("output", "o", "", "folder for the PNG files (default: the table's folder)")
	if err := parseFlags(fs, e, args); err != nil {
		return err
	}
	if fs.NArg() != 1 {
		return usagef("plot: want one TABLE file (a rating CSV written by 'wetline rate'), got %d arguments", fs.NArg())
	}
	u, err := rating.ParseUnits(sf.units)
	if err != nil {
		return usageError{err}
	}
	size := plotting.Size{Width: *width, Height: *height, DPI: *dpi}
	if err := size.Check(); err != nil {
		return usageError{err}
	}
	path := fs.Arg(0)
	t, err := survey.ReadRatingCSV(path, "", u)
	if err != nil {
		return err
	}
	inputs := []string{path}
	warnings := append([]string(nil), t.Warnings...)
	dir := *out
	if dir == "" {
		dir = filepath.Dir(path)
	}
	base := t.Name
	opt := rating.Options{Units: u}
	var l *loaded
	if *section != "" {
		if l, err = sf.load(*section); err != nil {
			return err
		}
		inputs = append(inputs, l.inputs...)
		warnings = append(warnings, l.warnings...)
		opt.Geometry = l.geomOpt
	}
	figs, w, err := drawFigures(figureInput{site: *site, base: base, table: t, loaded: l, zeroFlow: *zeroFlow, size: size, opt: opt,
		subtitle: fmt.Sprintf("redrawn from %s", filepath.Base(path))})
	if err != nil {
		return err
	}
	warnings = append(warnings, w...)
	if err := writeFigures(e.stderr, dir, figs, inputs); err != nil {
		return err
	}
	printWarnings(e.stderr, warnings)
	fmt.Fprintln(e.stderr, "caution: "+rating.Caution)
	return nil
}

// figureInput is what the rating, section and properties figures need.
type figureInput struct {
	site, base, subtitle string
	table                rating.Table
	loaded               *loaded // nil: no section figure
	zeroFlow             float64 // NaN: from the table
	size                 plotting.Size
	opt                  rating.Options
}

// drawFigures renders the figures of a rating table in memory.
func drawFigures(in figureInput) ([]figureFile, []string, error) {
	var figs []figureFile
	var warnings []string
	t := in.table
	name := t.Name
	add := func(suffix, what string, draw func(w io.Writer) (plotting.Result, error)) error {
		var buf bytes.Buffer
		res, err := draw(&buf)
		if err != nil {
			return fmt.Errorf("%s figure: %w", suffix, err)
		}
		for _, w := range res.Warnings {
			warnings = append(warnings, suffix+" figure: "+w)
		}
		figs = append(figs, figureFile{name: in.base + "-" + suffix + ".png", what: what, data: buf.Bytes()})
		return nil
	}
	un := t.Units
	sub := in.subtitle
	if t.Slope > 0 {
		sub = fmt.Sprintf("hydraulic rating by Manning's equation, friction slope %g, %s units; %s", t.Slope, strings.ToUpper(un.String()), sub)
	}
	rp := plotting.RatingPlot{Site: in.site, Section: name, Subtitle: strings.TrimSuffix(sub, "; "), Units: un,
		Hydraulic: plotting.CurveFromTable(t, ""), Size: in.size}
	if !math.IsNaN(in.zeroFlow) {
		rp.ZeroFlow, rp.HasZeroFlow = in.zeroFlow, true
	}
	var bankfull float64
	var hasBankfull bool
	if in.loaded != nil {
		bankfull, hasBankfull = in.loaded.section.Bankfull()
		rp.Bankfull, rp.HasBankfull = bankfull, hasBankfull
	}
	if err := add("rating", "stage–discharge rating, linear and log–log", func(w io.Writer) (plotting.Result, error) {
		return plotting.Rating(w, rp)
	}); err != nil {
		return nil, nil, err
	}
	if in.loaded != nil && len(in.loaded.section.Points) > 0 {
		water := []plotting.WaterSurface{}
		if hasBankfull {
			water = append(water, plotting.WaterSurface{Stage: bankfull, Label: "bankfull", Shade: true})
		}
		if n := len(t.Rows); n > 0 {
			top := t.Rows[0].Stage
			for _, r := range t.Rows {
				top = math.Max(top, r.Stage)
			}
			if !hasBankfull || top > bankfull {
				water = append(water, plotting.WaterSurface{Stage: top, Label: "highest rated stage", Shade: !hasBankfull})
			}
		}
		if err := add("section", "surveyed cross-section with subsections and water surfaces", func(w io.Writer) (plotting.Result, error) {
			return plotting.CrossSection(w, plotting.SectionPlot{Site: in.site, Section: in.loaded.section, Units: un,
				Marks: in.loaded.survey.Labels, Water: water, Geometry: in.opt.Geometry, Size: in.size})
		}); err != nil {
			return nil, nil, err
		}
	}
	err := add("properties", "area, top width, hydraulic radius, conveyance, alpha and velocity against stage", func(w io.Writer) (plotting.Result, error) {
		return plotting.Properties(w, plotting.PropertiesPlot{Site: in.site, Section: name, Units: un,
			Rows: plotting.PropertiesFromTable(t), Bankfull: bankfull, HasBankfull: hasBankfull, Size: in.size})
	})
	if err != nil {
		// A table without geometry columns still has its rating figure.
		warnings = append(warnings, "no properties figure: "+err.Error())
	}
	return figs, warnings, nil
}

// writeFigures writes rendered figures into dir (created if missing) and
// lists them on w. No figures, no folder.
func writeFigures(w io.Writer, dir string, figs []figureFile, inputs []string) error {
	if len(figs) == 0 {
		return nil
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	for _, f := range figs {
		path := filepath.Join(dir, f.name)
		if err := output.WriteFile(path, inputs, func(out io.Writer) error {
			_, err := out.Write(f.data)
			return err
		}); err != nil {
			return err
		}
		fmt.Fprintf(w, "  %-28s %s\n", f.name, f.what)
	}
	return nil
}

// rateFigures draws the figures of the rate command when dir is set.
func rateFigures(dir, surveyPath string, l *loaded, t rating.Table) ([]figureFile, []string, error) {
	if dir == "" {
		return nil, nil, nil
	}
	base := strings.TrimSuffix(filepath.Base(surveyPath), filepath.Ext(surveyPath))
	return drawFigures(figureInput{base: base, table: t, loaded: l, zeroFlow: math.NaN(), opt: rating.Options{Geometry: l.geomOpt},
		subtitle: fmt.Sprintf("section surveyed in %s", filepath.Base(surveyPath))})
}

// demoPlots draws the demo site's figures from its survey and rating.
func demoPlots(ctx context.Context, e *env, dir string) error {
	path := filepath.Join(dir, demoSurvey)
	sf := sectionFlags{units: "si"}
	l, err := sf.load(path)
	if err != nil {
		return err
	}
	t, err := rating.Compute(l.geom, rating.DefaultStages(l.geom), rating.Options{Slope: demoSlope, Units: l.units})
	if err != nil {
		return err
	}
	figs, warnings, err := drawFigures(figureInput{site: demoSite,
		base: strings.TrimSuffix(demoSurvey, filepath.Ext(demoSurvey)), table: t, loaded: l, zeroFlow: math.NaN(),
		subtitle: "section XS-1 at the gauge"})
	if err != nil {
		return err
	}
	if err := writeFigures(e.stdout, dir, figs, []string{path}); err != nil {
		return err
	}
	printWarnings(e.stdout, warnings)
	return nil
}
