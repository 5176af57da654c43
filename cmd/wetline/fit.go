package main

import (
	"context"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strconv"
	"strings"

	"wetline/plotting"
	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/survey"
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
	breaks       numbers
	zeroFlow     string
	to, step     float64
	format       string
	output       string
	plots, site  string
}

func (f *fitFlags) register(fs *flagSet) {
	fs.StringVar(&f.gaugingSheet, "gaugings-sheet", "", "workbook sheet holding the gaugings (default: a sheet named gaugings, else the first)")
	fs.StringVar(&f.section, "section", "", "surveyed section at the gauge, for the hydraulic rating, n back-calculation and extrapolation")
	fs.Float64Var(&f.slope, "slope", 0, "friction slope of the hydraulic rating (needed with --section)")
	fs.Float64Var(&f.datum, "datum", 0, "elevation of the gauge's zero in the survey's datum: elevation = gauge height + DATUM")
	fs.BoolVar(&f.channelOnly, "channel-only", false, "back-calculate only the main channel's n (default: one factor on every n)")
	fs.BoolVar(&f.compareOnly, "compare-only", false, "compare the gaugings with the hydraulic rating and fit nothing")
	fs.IntVar(&f.segments, "segments", 0, "number of power-law segments, 1 to 3 (default 1, or one more than --breaks)")
	fs.Var(&f.breaks, "breaks", "given breakpoints (gauge heights), comma-separated, instead of fitted ones")
	fs.StringVar(&f.zeroFlow, "zero-flow", "auto", "gauge height of zero flow e: auto (fitted), control (the section's lowest point) or a number")
	fs.Float64Var(&f.to, "to", 0, "highest gauge height of the lookup table (default: the section's lower end, else the highest gauging)")
	fs.Float64Var(&f.step, "step", 0, "gauge-height step of the lookup table (default: a round step giving about 50 rows)")
	f.sectionFlags.register(fs)
	fs.StringVar(&f.format, "format", "", "output format: text, json, csv or xlsx (a results workbook with the fit, residuals, lookup sheet and figure; needs -o); default: from the -o extension, else text")
	fs.StringVarP(&f.output, "output", "o", "", "output file (default: standard output)")
	fs.StringVar(&f.plots, "plots", "", "also write the rating figure with the gaugings (PNG) into this folder")
	fs.StringVar(&f.site, "site", "", "site name for the figure title")
}

func runFit(ctx context.Context, e *env, args []string) error {
	fs := newFlags("fit", fitUsage)
	var f fitFlags
	f.register(fs)
	if err := fs.parse(e, args); err != nil {
		return err
	}
	if fs.NArg() != 1 {
		return usagef("fit: want one GAUGINGS file, got %d arguments", fs.NArg())
	}
	opt, err := f.options(fs)
	if err != nil {
		return err
	}
	format, err := outputFormat("fit", f.format, f.output, "text", "json", "csv", "xlsx")
	if err != nil {
		return err
	}
	if format == "xlsx" && f.output == "" {
		return usagef("fit: an xlsx workbook needs -o FILE.xlsx")
	}
	opt.Lookup = format == "xlsx"
	rep, err := f.analyze(fs.Arg(0), opt)
	if err != nil {
		return err
	}
	base := strings.TrimSuffix(filepath.Base(fs.Arg(0)), filepath.Ext(fs.Arg(0)))
	if f.plots != "" || format == "xlsx" {
		figs, w, err := plotting.DrawFit(rep, f.site, base, plotting.Size{})
		if err != nil {
			return err
		}
		rep.Figures, rep.Warnings = figs, append(rep.Warnings, w...)
	}
	figs := rep.Figures
	if f.plots == "" {
		figs = nil
	}
	write := map[string]func(io.Writer, *gauged.Report) error{
		"text": results.WriteFitText, "json": results.WriteFitJSON, "csv": results.WriteFitCSV, "xlsx": results.WriteFitWorkbook,
	}[format]
	return e.deliver(delivery{output: f.output, inputs: rep.Provenance.Inputs,
		write:  func(w io.Writer) error { return write(w, rep) },
		inline: format == "text" || format == "json", warnings: rep.Warnings, plots: f.plots, figs: figs,
		summary: func(w io.Writer) error { return results.WriteFitSummary(w, rep, f.output) }})
}

// analyze reads the gaugings at path (and the section, when given) and
// computes the gaugings report.
func (f *fitFlags) analyze(path string, opt gauged.Options) (*gauged.Report, error) {
	inputs := []string{path}
	choice, err := f.unitSystem()
	if err != nil {
		return nil, err
	}
	gs, err := survey.ReadGaugings(path, f.gaugingSheet)
	if err != nil {
		return nil, err
	}
	units, err := gs.Units.Resolve(choice.Units, choice.Given)
	if err != nil {
		return nil, err
	}
	opt.Units = units
	warnings := append([]string(nil), gs.Warnings...)
	site := gs.Site
	if f.section != "" {
		p, err := f.prepareIn(f.section, units)
		if err != nil {
			return nil, err
		}
		inputs = append(inputs, p.Inputs...)
		warnings = append(warnings, p.Warnings...)
		opt.Hydraulic = &rating.HydraulicCurve{Geometry: p.Geometry, Datum: f.datum,
			Options: rating.Options{Slope: f.slope, Units: units, Geometry: f.geometry()}}
		opt.Site = p.Survey.Section.Name
		site = site.Merge(p.Site)
	}
	if opt.Site == "" {
		opt.Site = strings.TrimSuffix(filepath.Base(path), filepath.Ext(path))
	}
	rep, err := gauged.Analyze(gs.Gaugings, opt)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	rep.Warnings = append(warnings, rep.Warnings...)
	rep.Provenance = rating.Provenance{Program: program(), Inputs: inputs, Site: site}
	return rep, nil
}

// options checks the flags against each other and turns them into report
// options (without the section).
func (f *fitFlags) options(fs *flagSet) (gauged.Options, error) {
	var opt gauged.Options
	if err := fs.needs("--section SURVEY", f.section != "", "slope", "datum", "channel-only", "compare-only", "sheet", "n", "banks", "all-pools", "no-extend"); err != nil {
		return opt, err
	}
	if f.section != "" && !(f.slope > 0) {
		return opt, usagef("fit: --section needs --slope S (a positive friction slope)")
	}
	if err := checkSlope("fit", f.slope); err != nil {
		return opt, err
	}
	if err := fs.positive("step", "segments"); err != nil {
		return opt, err
	}
	if err := fs.within(survey.MaxElevation, "datum", "to", "step"); err != nil {
		return opt, err
	}
	opt.ChannelOnly, opt.CompareOnly = f.channelOnly, f.compareOnly
	if f.compareOnly {
		for _, name := range []string{"segments", "breaks", "zero-flow", "to", "step"} {
			if fs.Changed(name) {
				return opt, usagef("fit: --%s has no use with --compare-only", name)
			}
		}
	}
	k, err := f.segmentCount(fs)
	if err != nil {
		return opt, err
	}
	opt.Fit.Segments = k
	if len(f.breaks) > 0 {
		opt.Fit.Breaks = f.breaks
	}
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
	opt.Table.To, opt.Table.Step = f.to, f.step
	return opt, nil
}

// segmentCount reconciles --segments and --breaks.
func (f *fitFlags) segmentCount(fs *flagSet) (int, error) {
	k := f.segments
	if len(f.breaks) > 0 {
		if fs.Changed("segments") && k != len(f.breaks)+1 {
			return 0, usagef("fit: --breaks gives %d breakpoints, which make %d segments, not the %d of --segments", len(f.breaks), len(f.breaks)+1, k)
		}
		k = len(f.breaks) + 1
	}
	if k == 0 {
		k = 1
	}
	if k < 1 || k > gauged.MaxSegments {
		what := fmt.Sprintf("--segments %d", k)
		if len(f.breaks) > 0 {
			what = fmt.Sprintf("--breaks with %d values (%d segments)", len(f.breaks), k)
		}
		return 0, usagef("fit: %s: want 1 to %d segments", what, gauged.MaxSegments)
	}
	return k, nil
}
