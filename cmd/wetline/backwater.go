package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"slices"
	"strconv"
	"strings"

	"wetline/plotting"
	"wetline/rating"
	"wetline/rating/reach"
	"wetline/subdivide"
	"wetline/survey"
	"wetline/survey/results"
)

const backwaterUsage = "backwater REACH [--sheet NAME] (--discharges Q1,Q2,... | --from Q1 --to Q2 --step DQ) " +
	"--boundary normal:S|critical|stage:H|rating:FILE [--at ID] [--expansion K] [--contraction K] [--spread-tol D] " +
	"[--verify Q] [--units si|us] [--all-pools] [--no-extend] [--surveys-anywhere] [--format text|csv|json|xlsx] [-o FILE] [--plots DIR] [--site NAME]"

// MaxDischarges bounds the number of discharges of one run (a project
// bound: a ladder of more is a typing slip, not a rating).
const MaxDischarges = 10_000

// backwaterFlags are the settings of a step-backwater run.
type backwaterFlags struct {
	sheet, units           string
	discharges             numbers
	from, to, step         float64
	boundary               string
	at                     string
	expansion, contraction float64
	spreadTol, verify      float64
	allPools, noExtend     bool
	format, output         string
	plots, site            string
	anywhere               bool
	coords                 coordFlags
}

func (f *backwaterFlags) register(fs *flagSet) {
	fs.StringVar(&f.sheet, "sheet", "", "workbook sheet holding the reach table (default: the first visible sheet)")
	fs.Var(&f.discharges, "discharges", "discharges to compute, comma-separated (m3/s or ft3/s)")
	fs.Float64Var(&f.from, "from", math.NaN(), "least discharge of a ladder (with --to and --step)")
	fs.Float64Var(&f.to, "to", math.NaN(), "greatest discharge of a ladder")
	fs.Float64Var(&f.step, "step", math.NaN(), "discharge step of a ladder")
	fs.StringVar(&f.boundary, "boundary", "", "downstream boundary at the last section, required: normal:S (normal depth at friction slope S), "+
		"critical (critical depth), stage:H (a known water-surface elevation) or rating:FILE (a stage–discharge table, such as rate writes, "+
		"in the reach's datum)")
	fs.inputAfter("rating:", "boundary")
	fs.StringVar(&f.at, "at", "", "id of the section whose stages make the rating (default: the upstream section)")
	fs.Float64Var(&f.expansion, "expansion", math.NaN(), "eddy-loss coefficient where the flow expands (velocity head falling downstream), 0 to 1 (default 0.5)")
	fs.Float64Var(&f.contraction, "contraction", 0, "eddy-loss coefficient where the flow contracts, 0 to 1")
	fs.Float64Var(&f.spreadTol, "spread-tol", math.NaN(), "largest difference between the profile from the boundary and those from the second and half-way starts at the rating section "+
		"before its stage is flagged unsettled (default 0.01 m or 0.03 ft)")
	fs.Float64Var(&f.verify, "verify", math.NaN(), "also compute the profile of this discharge and its departure from each high-water mark of the reach table (text report, JSON verification, workbook verification sheet; with csv, the mean and largest departure on standard error)")
	fs.StringVar(&f.units, "units", "si", unitsUsage)
	fs.BoolVar(&f.allPools, "all-pools", false, "count water standing in pockets behind higher ground as flowing (default: only the water connected to the main channel)")
	fs.BoolVar(&f.noExtend, "no-extend", false, "make a water surface above an end of a section an error instead of extending the end with a vertical wall, which is warned of")
	fs.StringVar(&f.format, "format", "", "output format: text (the report), csv (the rating at the section as a rating table like rate's, "+
		"for plot and fit --hydraulic-rating), json or xlsx (a results workbook; needs -o); default: from the -o extension, else text")
	fs.StringVarP(&f.output, "output", "o", "", "output file (default: standard output)")
	fs.StringVar(&f.plots, "plots", "", "also write the reach profile and the rating figures (PNG) into this folder")
	fs.output(outputFile, "output")
	fs.output(outputFolder, "plots")
	fs.StringVar(&f.site, "site", "", siteUsage)
	fs.BoolVar(&f.anywhere, "surveys-anywhere", false, "let the reach table name survey files outside its own folder")
	f.coords.register(fs, false)
	for _, name := range []string{"expansion", "spread-tol"} {
		fs.Lookup(name).DefValue = "" // stated in the usage text
	}
}

// options validates the flags that need no data and turns them into the
// computation's options.
func (f *backwaterFlags) options(fs *flagSet) (reach.BackwaterReportOptions, error) {
	var opt reach.BackwaterReportOptions
	u, err := rating.ParseUnits(f.units)
	if err != nil {
		return opt, usageError{err: err}
	}
	if err := fs.positive("spread-tol", "verify"); err != nil {
		return opt, err
	}
	if err := fs.within(rating.MaxDischarge, "discharges", "from", "to", "step", "verify"); err != nil {
		return opt, err
	}
	if err := fs.within(survey.MaxElevation, "spread-tol"); err != nil {
		return opt, err
	}
	for _, k := range []struct {
		name string
		v    float64
	}{{"expansion", f.expansion}, {"contraction", f.contraction}} {
		if fs.Changed(k.name) && !(k.v >= 0 && k.v <= 1) {
			return opt, usagef("backwater: --%s %g: want an eddy-loss coefficient from 0 to 1", k.name, k.v)
		}
	}
	bo := reach.BackwaterOptions{Units: u, At: f.at, Contraction: f.contraction,
		Geometry: subdivide.Options{AllPools: f.allPools, NoExtend: f.noExtend}}
	switch {
	case math.IsNaN(f.expansion):
		bo.Expansion = 0 // the default
	case f.expansion == 0:
		bo.Expansion = -1 // none
	default:
		bo.Expansion = f.expansion
	}
	if !math.IsNaN(f.spreadTol) {
		bo.SpreadTolerance = f.spreadTol
	}
	opt.Backwater = bo
	if !math.IsNaN(f.verify) {
		opt.Verify = f.verify
	}
	return opt, nil
}

// dischargeList returns the discharges asked for, ascending.
func (f *backwaterFlags) dischargeList(fs *flagSet) ([]float64, error) {
	ladder := fs.Changed("from") || fs.Changed("to") || fs.Changed("step")
	switch {
	case len(f.discharges) > 0 && ladder:
		return nil, usagef("backwater: give --discharges or --from/--to/--step, not both")
	case len(f.discharges) == 0 && !ladder:
		return nil, usagef("backwater: give the discharges: --discharges Q1,Q2,... or --from Q1 --to Q2 --step DQ")
	}
	qs := append([]float64(nil), f.discharges...)
	if ladder {
		if !fs.Changed("from") || !fs.Changed("to") || !fs.Changed("step") {
			return nil, usagef("backwater: --from, --to and --step go together")
		}
		if err := fs.positive("from", "to", "step"); err != nil {
			return nil, err
		}
		if f.to < f.from {
			return nil, usagef("backwater: --to %g is below --from %g", f.to, f.from)
		}
		if n := (f.to - f.from) / f.step; n+1 > MaxDischarges {
			return nil, usagef("backwater: --from %g --to %g --step %g gives %.0f discharges: at most %d", f.from, f.to, f.step, n+1, MaxDischarges)
		}
		var err error
		if qs, err = rating.StageRange(f.from, f.to, f.step); err != nil {
			return nil, usageError{err: fmt.Errorf("backwater: discharges: %w", err)}
		}
	}
	slices.Sort(qs)
	for i, q := range qs {
		if !(q > 0) {
			return nil, usagef("backwater: --discharges: %g is not a positive discharge", q)
		}
		if i > 0 && q == qs[i-1] {
			return nil, usagef("backwater: --discharges: %g is given twice", q)
		}
	}
	if len(qs) > MaxDischarges {
		return nil, usagef("backwater: %d discharges: at most %d", len(qs), MaxDischarges)
	}
	return qs, nil
}

// ErrBoundarySpec is the cause of a --boundary the command cannot read.
var ErrBoundarySpec = errors.New("want normal:S, critical, stage:H or rating:FILE")

// parseBoundary reads a --boundary spec. A rating:FILE boundary names the
// file in file, read by the caller.
func parseBoundary(spec string) (b reach.Boundary, file string, err error) {
	kind, arg, _ := strings.Cut(strings.TrimSpace(spec), ":")
	bad := func(why string) error {
		return usageError{err: fmt.Errorf("backwater: --boundary %q: %s: %w", spec, why, ErrBoundarySpec)}
	}
	num := func() (float64, error) {
		v, err := strconv.ParseFloat(strings.TrimSpace(arg), 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
			return 0, bad(fmt.Sprintf("%q is not a finite number", arg))
		}
		return v, nil
	}
	switch strings.ToLower(kind) {
	case "normal":
		s, err := num()
		if err != nil {
			return b, "", err
		}
		if !(s > 0) {
			return b, "", bad("the slope must be positive")
		}
		if s > maxSlope {
			return b, "", usageError{err: fmt.Errorf("backwater: --boundary normal:%s %w", strings.TrimSpace(arg), ErrImplausibleSlope)}
		}
		return reach.Boundary{Kind: reach.NormalDepth, Slope: s}, "", nil
	case "critical":
		if arg != "" {
			return b, "", bad("critical takes no value")
		}
		return reach.Boundary{Kind: reach.CriticalDepth}, "", nil
	case "stage":
		h, err := num()
		if err != nil {
			return b, "", err
		}
		if math.Abs(h) > survey.MaxElevation {
			return b, "", usagef("backwater: --boundary stage:%s is beyond ±%g: not a plausible stage", strings.TrimSpace(arg), survey.MaxElevation)
		}
		return reach.Boundary{Kind: reach.KnownStage, Stage: h}, "", nil
	case "rating":
		if strings.TrimSpace(arg) == "" {
			return b, "", bad("name the stage–discharge table")
		}
		return reach.Boundary{Kind: reach.StageRating}, arg, nil
	case "":
		return b, "", usagef("backwater: --boundary is required: normal:S, critical, stage:H or rating:FILE")
	}
	return b, "", bad(fmt.Sprintf("unknown boundary %q", kind))
}

func runBackwater(ctx context.Context, e *env, args []string) error {
	fs := newFlags("backwater", backwaterUsage)
	var f backwaterFlags
	f.register(fs)
	if err := fs.parseOperands(e, args, 1, "one REACH table"); err != nil {
		return err
	}
	format, err := outputFormat("backwater", f.format, f.output, "text", "csv", "json", "xlsx")
	if err != nil {
		return err
	}
	opt, err := f.options(fs)
	if err != nil {
		return err
	}
	qs, err := f.dischargeList(fs)
	if err != nil {
		return err
	}
	b, bfile, err := parseBoundary(f.boundary)
	if err != nil {
		return err
	}
	u, err := unitChoice(f.units, fs.Changed("units"))
	if err != nil {
		return err
	}
	co, err := f.coords.options(fs, u)
	if err != nil {
		return err
	}
	path := fs.Arg(0)
	ro := survey.ReachOptions{MarksOptional: true, Section: survey.SectionOptions{SurveysAnywhere: f.anywhere, Coordinates: co}}
	rep, err := backwater(path, f.sheet, qs, b, bfile, opt, ro, u.Given)
	if err != nil {
		return err
	}
	rep.Provenance.Site = siteWith(rep.Provenance.Site, f.site)
	if f.plots != "" || format == "xlsx" {
		base := strings.TrimSuffix(filepath.Base(path), filepath.Ext(path))
		figs, w, err := plotting.DrawBackwater(plotting.BackwaterFigures{Site: rep.Provenance.Site.Name, Base: base, Report: rep})
		if err != nil {
			return err
		}
		rep.Figures, rep.Warnings = figs, append(rep.Warnings, w...)
	}
	write := map[string]func(io.Writer, reach.BackwaterReport) error{
		"text": results.WriteBackwaterText, "csv": results.WriteBackwaterCSV,
		"json": results.WriteBackwaterJSON, "xlsx": results.WriteBackwaterWorkbook,
	}[format]
	return e.deliver(delivery{output: f.output, inputs: rep.Provenance.Inputs,
		write:  func(w io.Writer) error { return write(w, rep) },
		inline: format == "text" || format == "json", warnings: rep.Warnings, notes: rep.Provenance.Notes, plots: f.plots, figs: rep.Figures,
		summary: func(w io.Writer) error { return results.WriteBackwaterSummary(w, rep, f.output) },
		console: func(w io.Writer) error { return results.WriteBackwaterConsole(w, rep) }})
}

// backwater reads a reach table, its surveys and a boundary rating file
// (bfile, for a StageRating boundary) and computes the profiles.
func backwater(path, sheet string, qs []float64, b reach.Boundary, bfile string, opt reach.BackwaterReportOptions, ro survey.ReachOptions, unitsGiven bool) (reach.BackwaterReport, error) {
	var rep reach.BackwaterReport
	rt, err := survey.ReadReachWith(path, sheet, ro)
	if err != nil {
		return rep, err
	}
	if opt.Backwater.Units, err = rt.ResolveUnits(opt.Backwater.Units, unitsGiven); err != nil {
		return rep, err
	}
	if err := rt.OpenChannel(); err != nil {
		return rep, err
	}
	if at := opt.Backwater.At; at != "" && !slices.ContainsFunc(rt.Rows, func(r survey.ReachRow) bool { return r.ID == at }) {
		ids := make([]string, len(rt.Rows))
		for i, r := range rt.Rows {
			ids[i] = r.ID
		}
		return rep, usagef("backwater: --at %q: %v (the sections are %s)", at, reach.ErrRatingSection, strings.Join(ids, ", "))
	}
	inputs := rt.Inputs()
	var warnings, notes []string // the boundary rating's
	if b.Kind == reach.StageRating {
		br, err := survey.ReadBoundaryRating(bfile, "")
		if err != nil {
			return rep, err
		}
		if err := rt.AgreeBoundary(br, opt.Backwater.Units, unitsGiven); err != nil {
			return rep, err
		}
		if b, err = br.Boundary(); err != nil {
			return rep, err
		}
		inputs = append(inputs, bfile)
		warnings = br.Warnings
		if n := unitsAssumed(survey.Position(br.File, br.Sheet), br.Units, unitsGiven || rt.UnitsNamed()); n != "" {
			notes = append(notes, n)
		}
		if n := br.ZeroFlowNote(); n != "" {
			notes = append(notes, n)
		}
	}
	secs, err := rt.ReachSections(opt.Backwater.Units)
	if err != nil {
		return rep, err
	}
	rep, err = reach.StepBackwater(secs, qs, b, opt)
	switch {
	case errors.Is(err, reach.ErrNoMarks):
		return rep, fmt.Errorf("%s: --verify: %w (give ws_left or ws_right in the reach table)",
			(&survey.ParseError{File: rt.File, Sheet: rt.Sheet}).Position(), err)
	case errors.Is(err, reach.ErrBoundaryRange) && bfile != "":
		return rep, fmt.Errorf("%s: %w", bfile, err)
	case err != nil:
		return rep, rt.PlaceError(err)
	}
	rep.Name = survey.Position(path, sheet)
	rep.BoundarySource = bfile
	rep.Provenance = rating.Provenance{Program: program(), Inputs: inputs, Site: rt.Site, Notes: notes}
	rep.Warnings = slices.Concat(rt.Warnings, warnings, rep.Warnings)
	return rep, nil
}
