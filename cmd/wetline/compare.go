package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strings"

	"wetline/plotting"
	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/subdivide"
	"wetline/survey"
	"wetline/survey/results"
)

const compareUsage = "compare A B [--sheet-a NAME] [--sheet-b NAME] [--units si|us] " +
	"[ratings: --zero-flow E[,E_B]] [--datum D[,D_B]] [--step D] " +
	"[surveys: --stages LIST | --step D] [--n N] [--all-pools] " +
	"[--format text|json|csv|xlsx] [-o FILE] [--plots DIR] [--site NAME]"

// compareFlags are the flags of the compare command.
type compareFlags struct {
	sheetA, sheetB string
	units          string
	coords         coordFlags
	zeroFlow       numbers
	datum          numbers
	step           float64
	stages         numbers
	n              numbers
	allPools       bool
	format, output string
	plots, site    string
}

func (f *compareFlags) register(fs *flagSet) {
	fs.StringVar(&f.sheetA, "sheet-a", "", "workbook sheet of A (default: the first visible sheet)")
	fs.StringVar(&f.sheetB, "sheet-b", "", "workbook sheet of B (default: the first visible sheet)")
	fs.StringVar(&f.units, "units", "si", "unit system of both: si (m, m3/s) or us (ft, ft3/s); default: the units written in the headers of A (or B), else si")
	f.coords.register(fs, true)
	fs.Var(&f.zeroFlow, "zero-flow", "ratings: gauge height of zero flow e, one value for both or A,B (log-linear in h − e between rows; e may not lie below a row without flow, nor at or above a row with flow; a gauge height, also with --datum; default: where a table's flow starts, from its depth column, also when its first row has flow, else its last dry row, else linear, with a warning)")
	fs.Var(&f.datum, "datum", "ratings: subtract from the stages of both, or A,B: read tables of elevations at gauge heights")
	fs.Float64Var(&f.step, "step", 0, "stage step of the comparison, at its multiples (default: ratings, every row stage of either table; surveys, a round step giving about 50 stages)")
	fs.Var(&f.stages, "stages", "surveys: compare at these stages (comma-separated, in any order; the rows list them increasing, each once) instead of a range")
	fs.Var(&f.n, "n", "surveys: Manning's n for both sections, or LEFT,CHANNEL,RIGHT (overrides the surveys' n column)")
	fs.BoolVar(&f.allPools, "all-pools", false, "surveys: count water standing in pockets behind higher ground as flowing")
	fs.StringVar(&f.format, "format", "", "output format: text, json, csv or xlsx (needs -o); default: from the -o extension, else text")
	fs.StringVarP(&f.output, "output", "o", "", "output file (default: standard output)")
	fs.StringVar(&f.plots, "plots", "", "also write the comparison figure (PNG) into this folder")
	fs.output(outputFile, "output")
	fs.output(outputFolder, "plots")
	fs.StringVar(&f.site, "site", "", siteUsage)
}

// ratingOnly and sectionOnly are the flags that apply to one kind of
// comparison.
var (
	ratingOnly  = [...]string{"zero-flow", "datum"}
	sectionOnly = [...]string{"stages", "n", "all-pools", "line", "flow-azimuth", "offset-tolerance"}
)

func runCompare(ctx context.Context, e *env, args []string) error {
	fs := newFlags("compare", compareUsage)
	var f compareFlags
	f.register(fs)
	if err := fs.parseOperands(e, args, 2, "two files A and B (two ratings, or two surveys of one section)"); err != nil {
		return err
	}
	format, err := outputFormat("compare", f.format, f.output, "text", "json", "csv", "xlsx")
	if err != nil {
		return err
	}
	if err := fs.positive("step"); err != nil {
		return err
	}
	if err := fs.within(survey.MaxElevation, "step", "stages", "zero-flow", "datum"); err != nil {
		return err
	}
	if _, err := rating.ParseUnits(f.units); err != nil {
		return usageError{err: err}
	}
	a, b := fs.Arg(0), fs.Arg(1)
	kind, err := f.kinds(a, b)
	if err != nil {
		return err
	}
	if kind == survey.KindRating {
		return f.ratings(e, fs, a, b, format)
	}
	return f.sections(e, fs, a, b, format)
}

// kinds tells what A and B hold by their columns; they must be of one
// kind.
func (f *compareFlags) kinds(a, b string) (survey.TableKind, error) {
	var ks [2]survey.TableKind
	for i, in := range []struct{ path, sheet, flag string }{{a, f.sheetA, "--sheet-a"}, {b, f.sheetB, "--sheet-b"}} {
		t, err := survey.ReadRatingTable(in.path, in.sheet)
		if err != nil {
			return 0, err
		}
		ks[i] = survey.KindOf(t)
		if ks[i] != survey.KindRating && ks[i] != survey.KindSection {
			where, hint := in.path, ""
			if t.Sheet != "" {
				where = survey.Position(in.path, t.Sheet)
				hint = fmt.Sprintf("; name the sheet to compare with %s (sheets: %s)", in.flag, strings.Join(t.Sheets, ", "))
			}
			return 0, fmt.Errorf("compare: %s is a %s: a rating has stage (or gauge_height) and discharge columns, a survey station and elevation columns%s",
				where, ks[i], hint)
		}
	}
	if ks[0] != ks[1] {
		return 0, usagef("compare: %s is a %s and %s a %s: compare two ratings or two surveys", a, ks[0], b, ks[1])
	}
	return ks[0], nil
}

// refuse refuses flags given that do not apply to the comparison.
func refuse(fs *flagSet, what string, names []string) error {
	for _, n := range names {
		if fs.Changed(n) {
			return usagef("compare: --%s has no use when comparing %s", n, what)
		}
	}
	return nil
}

// pair returns value i (0 for A, 1 for B) of a flag given once for both
// or as A,B.
func pair(fs *flagSet, name string, v numbers, i int) (float64, bool, error) {
	switch len(v) {
	case 0:
		return 0, false, nil
	case 1:
		return v[0], true, nil
	case 2:
		return v[i], true, nil
	}
	return 0, false, usagef("compare: --%s gives %d values: give one for both, or A,B", name, len(v))
}

// ratings compares two rating tables.
func (f *compareFlags) ratings(e *env, fs *flagSet, a, b string, format string) error {
	if err := refuse(fs, "ratings", sectionOnly[:]); err != nil {
		return err
	}
	var tables [2]*gauged.TableRating
	var warnings, notes []string
	// The headers of A, then of B, set the units unless --units does.
	d, err := decideUnits(f.units, fs.Changed("units"))
	if err != nil {
		return err
	}
	for i, in := range []struct{ path, sheet string }{{a, f.sheetA}, {b, f.sheetB}} {
		opt := survey.RatingTableOptions{Sheet: in.sheet}
		var err error
		if opt.ZeroFlow, opt.HasZeroFlow, err = pair(fs, "zero-flow", f.zeroFlow, i); err != nil {
			return err
		}
		if opt.Datum, _, err = pair(fs, "datum", f.datum, i); err != nil {
			return err
		}
		rt, err := survey.ReadRatingTables(in.path, opt)
		if err != nil {
			return zeroFlowAbove("compare", opt, err)
		}
		note, err := d.takeTable(rt.Units, in.path)
		if err != nil {
			return err
		}
		if note != "" {
			notes = append(notes, note)
		}
		notes = append(notes, rt.Notes...)
		if n := len(rt.Periods); n != 1 {
			return fmt.Errorf("compare: %s holds %d rating periods (a %s column): compare takes one rating per file", in.path, n, survey.ColRatingValidFrom)
		}
		warnings = append(warnings, rt.Warnings...)
		if tables[i], err = rt.Periods[0].Rating.Compile(); err != nil {
			return fmt.Errorf("%s: %w", in.path, err)
		}
	}
	c, err := gauged.CompareRatings(tables[0], tables[1], gauged.CompareOptions{Step: f.step, Units: d.Units})
	if errors.Is(err, rating.ErrStepTooFine) {
		return tooFineStep("compare", f.step, d.Units, err)
	}
	if err != nil {
		return fmt.Errorf("compare: %s and %s: %w", a, b, err)
	}
	c.Provenance = rating.Provenance{Program: program(), Inputs: []string{a, b}, Site: siteWith(rating.Site{}, f.site), Notes: notes}
	c.Warnings = append(warnings, c.Warnings...)
	if f.plots != "" || format == "xlsx" {
		figs, w, err := plotting.DrawRatingComparison(&c, c.Provenance.Site.Name, compareBase(a, b), plotting.Size{})
		if err != nil {
			return err
		}
		c.Figures, c.Warnings = figs, append(c.Warnings, w...)
	}
	write := map[string]func(io.Writer, *gauged.RatingComparison) error{
		"text": results.WriteRatingComparisonText, "json": results.WriteRatingComparisonJSON,
		"csv": results.WriteRatingComparisonCSV, "xlsx": results.WriteRatingComparisonWorkbook,
	}[format]
	what := "two ratings, largest difference " + results.LargestDifference(&c)
	return f.deliver(e, format, c.Provenance, c.Warnings, c.Figures, func(w io.Writer) error { return write(w, &c) }, what, len(c.Rows))
}

// deliver writes a comparison report and its figures.
func (f *compareFlags) deliver(e *env, format string, p rating.Provenance, warnings []string, figs []rating.Figure, write func(io.Writer) error, what string, rows int) error {
	return e.deliver(delivery{output: f.output, inputs: p.Inputs, write: write,
		inline: format == "text" || format == "json", warnings: warnings, notes: p.Notes, plots: f.plots, figs: figs,
		summary: func(w io.Writer) error { return results.WriteComparisonSummary(w, what, rows, warnings, f.output) }})
}

// compareBase names a comparison's figure after its two files.
func compareBase(a, b string) string {
	base := func(p string) string { return strings.TrimSuffix(filepath.Base(p), filepath.Ext(p)) }
	return base(a) + "-vs-" + base(b)
}

// sections compares two surveys of one section.
func (f *compareFlags) sections(e *env, fs *flagSet, a, b string, format string) error {
	if err := refuse(fs, "surveys", ratingOnly[:]); err != nil {
		return err
	}
	if len(f.stages) > 0 && fs.Changed("step") {
		return usagef("compare: give --stages or --step, not both")
	}
	ps, inputs, warnings, err := f.readSurveys(fs, a, b)
	if err != nil {
		return err
	}
	stages, err := f.sectionStages(ps[0].Geometry, ps[1].Geometry, ps[0].Units)
	if err != nil {
		return err
	}
	opt := rating.Options{Units: ps[0].Units, Geometry: subdivide.Options{AllPools: f.allPools}} // B was read in A's units
	c, err := rating.CompareSections(ps[0].Geometry, ps[1].Geometry, stages, opt)
	if err != nil {
		return fmt.Errorf("compare: %w", err)
	}
	c.A, c.B = ps[0].Source(), ps[1].Source()
	c.Provenance = rating.Provenance{Program: program(), Inputs: inputs, Site: siteWith(ps[0].Site.Merge(ps[1].Site), f.site),
		Notes: append(append([]string(nil), ps[0].Notes...), ps[1].Notes...)}
	c.GroundA, c.GroundB = ps[0].Ground, ps[1].Ground
	c.Warnings = append(warnings, c.Warnings...)
	if w, err := linesApart(ps, [2]string{a, b}, [2]string{f.sheetA, f.sheetB}); err != nil {
		return err
	} else if w != "" {
		c.Warnings = append(c.Warnings, w)
	}
	c.SetSites(ps[0].Site, ps[1].Site)
	if f.plots != "" || format == "xlsx" {
		figs, w, err := plotting.DrawSectionComparison(&c, c.Provenance.Site.Name, compareBase(a, b), plotting.Size{})
		if err != nil {
			return err
		}
		c.Figures, c.Warnings = figs, append(c.Warnings, w...)
	}
	write := map[string]func(io.Writer, *rating.SectionComparison) error{
		"text": results.WriteSectionComparisonText, "json": results.WriteSectionComparisonJSON,
		"csv": results.WriteSectionComparisonCSV, "xlsx": results.WriteSectionComparisonWorkbook,
	}[format]
	return f.deliver(e, format, c.Provenance, c.Warnings, c.Figures, func(w io.Writer) error { return write(w, &c) },
		"two surveys of one section", len(c.Rows))
}

// linesApart warns when both surveys carry eastings and northings and
// their section lines lie farther apart than a resurvey's would.
func linesApart(ps [2]*survey.Prepared, paths, sheets [2]string) (string, error) {
	var lines [2]survey.PlanLine
	for i, p := range ps {
		l, ok, err := survey.SurveyPlanLine(p.Survey, paths[i], sheets[i])
		if err != nil || !ok {
			return "", err
		}
		lines[i] = l
	}
	return survey.ResurveyWarning(lines[0], lines[1], ps[0].Source(), ps[1].Source(), ps[0].Units), nil
}

// readSurveys reads surveys a and b, B in the units of A, and returns
// them with the files read and the readers' warnings (each names its file).
func (f *compareFlags) readSurveys(fs *flagSet, a, b string) ([2]*survey.Prepared, []string, []string, error) {
	var ps [2]*survey.Prepared
	var inputs, warnings []string
	// The headers of A, then of B, set the units unless --units does.
	d, err := decideUnits(f.units, fs.Changed("units"))
	if err != nil {
		return ps, nil, nil, err
	}
	for i, in := range []struct{ path, sheet string }{{a, f.sheetA}, {b, f.sheetB}} {
		choice, err := unitChoice(f.units, fs.Changed("units"))
		if err != nil {
			return ps, nil, nil, err
		}
		co, err := f.coords.options(fs, choice)
		if err != nil {
			return ps, nil, nil, err
		}
		req := survey.SectionRequest{Path: in.path, Sheet: in.sheet, Coordinates: co}
		if len(f.n) > 0 {
			req.N = f.n
		}
		p, err := d.prepareWith(req)
		if err != nil {
			if errors.Is(err, survey.ErrRequest) {
				return ps, nil, nil, usageError{err: fmt.Errorf("compare: %w", err)}
			}
			return ps, nil, nil, err
		}
		ps[i] = p
		inputs = append(inputs, p.Inputs...)
		warnings = append(warnings, p.Warnings...)
	}
	return ps, inputs, warnings, nil
}

// sectionStages are the stages of a comparison of two surveys: --stages,
// a range at --step from the lower bottom to the lower top, or nil for
// the default range.
func (f *compareFlags) sectionStages(a, b subdivide.Geometry, u rating.Units) ([]float64, error) {
	if len(f.stages) > 0 {
		return f.stages, nil
	}
	if f.step > 0 {
		lo, hi := math.Min(a.Bottom(), b.Bottom()), math.Min(a.Top(), b.Top())
		st, err := rating.StageRange(lo, hi, f.step)
		if errors.Is(err, rating.ErrStepTooFine) {
			return nil, tooFineStep("compare", f.step, u, err)
		}
		if err != nil {
			return nil, usageError{err: fmt.Errorf("compare: --step %g: %w", f.step, err)}
		}
		return st, nil
	}
	return nil, nil
}
