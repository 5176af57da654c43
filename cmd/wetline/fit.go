package main

import (
	"context"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strconv"
	"strings"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/survey"
	"wetline/survey/output"
	"wetline/survey/results"
)

const fitUsage = "fit GAUGINGS [--gaugings-sheet NAME] [--section SURVEY --slope S [--datum D] [--channel-only] [--compare-only]] " +
	"[--segments N | --breaks H1,H2] [--zero-flow auto|control|VALUE] [--to H] [--step D] [--units si|us] [--format text|json|csv|xlsx] [-o FILE] [--plots DIR [--site NAME]]"

// fitFlags are the flags of the fit command.
type fitFlags struct {
	sectionFlags
	gaugingSheet string
	section      string
	slope        float64
	datum        float64
	channelOnly  bool
	compareOnly  bool
	segments     int
	breaks       []float64
	zeroFlow     string
	to, step     float64
	format       string
	output       string
	plots, site  string
}

func runFit(ctx context.Context, e *env, args []string) error {
	fs := newFlags("fit", fitUsage)
	var f fitFlags
	fs.StringVar(&f.gaugingSheet, "gaugings-sheet", "", "workbook sheet holding the gaugings (default: a sheet named gaugings, else the first)")
	fs.StringVar(&f.section, "section", "", "surveyed section at the gauge, for the hydraulic rating, n back-calculation and extrapolation")
	fs.Float64Var(&f.slope, "slope", 0, "friction slope of the hydraulic rating (needed with --section)")
	fs.Float64Var(&f.datum, "datum", 0, "elevation of the gauge's zero in the survey's datum: elevation = gauge height + DATUM")
	fs.BoolVar(&f.channelOnly, "channel-only", false, "back-calculate only the main channel's n (default: one factor on every n)")
	fs.BoolVar(&f.compareOnly, "compare-only", false, "compare the gaugings with the hydraulic rating and fit nothing")
	fs.IntVar(&f.segments, "segments", 0, "number of power-law segments, 1 to 3 (default 1, or one more than --breaks)")
	fs.Float64SliceVar(&f.breaks, "breaks", nil, "given breakpoints (gauge heights), comma-separated, instead of fitted ones")
	fs.StringVar(&f.zeroFlow, "zero-flow", "auto", "gauge height of zero flow e: auto (fitted), control (the section's lowest point) or a number")
	fs.Float64Var(&f.to, "to", 0, "highest gauge height of the lookup table (default: the section's lower end, else the highest gauging)")
	fs.Float64Var(&f.step, "step", 0, "gauge-height step of the lookup table (default: a round step giving about 50 rows)")
	f.sectionFlags.register(fs)
	fs.StringVar(&f.format, "format", "", "output format: text, json, csv or xlsx (a results workbook with the fit, residuals, lookup sheet and figure; needs -o); default: from the -o extension, else text")
	fs.StringVarP(&f.output, "output", "o", "", "output file (default: standard output)")
	fs.StringVar(&f.plots, "plots", "", "also write the rating figure with the gaugings (PNG) into this folder")
	fs.StringVar(&f.site, "site", "", "site name for the figure title")
	if err := parseFlags(fs, e, args); err != nil {
		return err
	}
	if fs.NArg() != 1 {
		return usagef("fit: want one GAUGINGS file, got %d arguments", fs.NArg())
	}
	opt, err := f.options(fs.Changed)
	if err != nil {
		return err
	}
	format, err := outputFormat(f.format, f.output, "text", "json", "csv", "xlsx")
	if err != nil {
		return err
	}
	if format == "xlsx" && f.output == "" {
		return usagef("fit: an xlsx workbook needs -o FILE.xlsx")
	}
	path := fs.Arg(0)
	inputs := []string{path}
	units, err := rating.ParseUnits(f.units)
	if err != nil {
		return usageError{err}
	}
	opt.Units = units
	var warnings []string
	if f.section != "" {
		l, err := f.load(f.section)
		if err != nil {
			return err
		}
		inputs = append(inputs, l.inputs...)
		warnings = append(warnings, l.warnings...)
		opt.Hydraulic = &rating.HydraulicCurve{Geometry: l.geom, Datum: f.datum,
			Options: rating.Options{Slope: f.slope, Units: l.units, Geometry: l.geomOpt}}
		opt.Site = l.survey.Section.Name
	}
	if f.output != "" {
		if err := output.CheckOutput(f.output, inputs); err != nil {
			return err
		}
	}
	gs, err := survey.ReadGaugings(path, f.gaugingSheet)
	if err != nil {
		return err
	}
	warnings = append(warnings, gs.Warnings...)
	if opt.Site == "" {
		opt.Site = strings.TrimSuffix(filepath.Base(path), filepath.Ext(path))
	}
	rep, err := gauged.Analyze(gs.Gaugings, opt)
	if err != nil {
		return fmt.Errorf("%s: %w", path, err)
	}
	rep.Warnings = append(warnings, rep.Warnings...)
	var figs []figureFile
	if f.plots != "" {
		// Drawn in memory first: a drawing error writes nothing.
		var w []string
		base := strings.TrimSuffix(filepath.Base(path), filepath.Ext(path))
		if figs, w, err = fitFigures(rep, f.site, base); err != nil {
			return err
		}
		rep.Warnings = append(rep.Warnings, w...)
	}
	var book results.FitWorkbook
	if format == "xlsx" {
		base := strings.TrimSuffix(filepath.Base(path), filepath.Ext(path))
		if book, err = fitBook(rep, opt.Hydraulic, inputs, f.site, base, figs); err != nil {
			return fmt.Errorf("%s: %w", path, err)
		}
	}
	write := func(w io.Writer) error {
		switch format {
		case "xlsx":
			return results.WriteFitWorkbook(w, book)
		case "json":
			return results.WriteGaugingReportJSON(w, rep)
		case "csv":
			return results.WriteGaugingReportCSV(w, rep)
		}
		return results.WriteGaugingReportText(w, rep)
	}
	return delivery{output: f.output, inputs: inputs, write: write, inline: format == "text", warnings: rep.Warnings,
		plots: f.plots, figs: figs,
		summary: func(w io.Writer) { summarizeFit(w, rep, f.output) }}.deliver(e)
}

// options checks the flags against each other and turns them into report
// options (without the section).
func (f *fitFlags) options(changed func(string) bool) (gauged.Options, error) {
	var opt gauged.Options
	if f.section == "" {
		for _, name := range []string{"slope", "datum", "channel-only", "compare-only", "sheet", "n", "banks", "connected", "no-extend"} {
			if changed(name) {
				return opt, usagef("fit: --%s needs --section SURVEY", name)
			}
		}
	} else if !(f.slope > 0) || math.IsInf(f.slope, 0) {
		return opt, usagef("fit: --section needs --slope S (a positive friction slope)")
	}
	if math.IsNaN(f.datum) || math.IsInf(f.datum, 0) {
		return opt, usagef("fit: --datum must be a finite number")
	}
	opt.ChannelOnly, opt.CompareOnly = f.channelOnly, f.compareOnly
	if f.compareOnly {
		for _, name := range []string{"segments", "breaks", "zero-flow", "to", "step"} {
			if changed(name) {
				return opt, usagef("fit: --%s has no use with --compare-only", name)
			}
		}
	}
	k := f.segments
	if f.breaks != nil {
		if k != 0 && k != len(f.breaks)+1 {
			return opt, usagef("fit: --segments %d and %d breakpoints disagree (want one more segment than breakpoints)", k, len(f.breaks))
		}
		k = len(f.breaks) + 1
		for _, b := range f.breaks {
			if math.IsNaN(b) || math.IsInf(b, 0) {
				return opt, usagef("fit: --breaks: %v is not a finite gauge height", b)
			}
		}
	}
	if k == 0 {
		k = 1
	}
	if k < 1 || k > gauged.MaxSegments {
		return opt, usagef("fit: --segments %d: want 1 to %d", k, gauged.MaxSegments)
	}
	opt.Fit.Segments, opt.Fit.Breaks = k, f.breaks
	switch z := strings.ToLower(strings.TrimSpace(f.zeroFlow)); z {
	case "auto", "":
	case "control":
		if f.section == "" {
			return opt, usagef("fit: --zero-flow control needs --section SURVEY")
		}
		opt.ZeroFlowControl = true
	default:
		v, err := strconv.ParseFloat(z, 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
			return opt, usagef("fit: --zero-flow %q: want auto, control or a gauge height", f.zeroFlow)
		}
		opt.Fit.ZeroFlowFixed, opt.Fit.ZeroFlow, opt.Fit.ZeroFlowSource = true, v, "given"
	}
	if math.IsNaN(f.to) || math.IsInf(f.to, 0) || math.IsNaN(f.step) || math.IsInf(f.step, 0) || f.step < 0 {
		return opt, usagef("fit: --to and --step must be finite (and --step positive)")
	}
	opt.Table.To, opt.Table.Step = f.to, f.step
	return opt, nil
}

// summarizeFit prints the console summary of a written gaugings report.
func summarizeFit(w io.Writer, r *gauged.Report, path string) {
	fmt.Fprintf(w, "wrote %s: %d gaugings", path, len(r.Gaugings))
	if r.Comparison != nil {
		fmt.Fprintf(w, "; gauge datum: elevation = gauge height + %s %s", results.FormatFloat(r.Datum), r.Units.Length())
	} else {
		fmt.Fprint(w, "; stages are gauge heights as read (no section)")
	}
	fmt.Fprintln(w)
	if f := r.Fit; f != nil {
		fmt.Fprintf(w, "  %d segment(s), e = %.3f %s (%s), standard error %.1f %%\n",
			len(f.Segments), f.ZeroFlow, r.Units.Length(), f.ZeroFlowSource, f.StandardErrorPercent)
	}
	if c := r.Comparison; c != nil {
		fmt.Fprintf(w, "  against the hydraulic rating: %d of %d outside their quality bands\n", c.Outside, len(c.Residuals))
	}
	if c := r.Calibration; c != nil {
		fmt.Fprintf(w, "  best factor on n: %.3f\n", c.Factor)
	}
	if t := r.Table; t != nil && t.ScaleNote != "" {
		fmt.Fprintf(w, "  %s\n", t.ScaleNote)
	}
	printWarnings(w, r.Warnings)
	fmt.Fprintln(w, "caution: "+rating.Caution)
}
