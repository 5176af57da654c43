package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"path/filepath"

	"wetline/plotting"
	"wetline/survey"
)

const plotUsage = "plot TABLE [--section SURVEY [--n N] [--banks A,B]] [--sheet NAME] [--table-sheet NAME] [--units si|us] [--zero-flow E] [--datum D] [--site NAME] [--width PX --height PX --dpi N] [-o DIR]"

// plotFlags are the flags of plot.
type plotFlags struct {
	sectionFlags
	section            string
	tableSheet         string
	zeroFlow, datum    float64
	width, height, dpi int
	output             string
}

func (f *plotFlags) register(fs *flagSet) {
	f.sectionFlags.register(fs)
	fs.StringVar(&f.section, "section", "", "surveyed cross-section of the table, for the section figure")
	fs.input("section")
	fs.Lookup("sheet").Usage = "workbook sheet of the survey when --section is a workbook, else of a workbook TABLE (default: the first visible sheet)"
	fs.StringVar(&f.tableSheet, "table-sheet", "", "sheet of a workbook TABLE (default: --sheet when --section is not a workbook, else the first visible sheet)")
	fs.Float64Var(&f.zeroFlow, "zero-flow", math.NaN(), "gauge height of zero flow for the log–log panel (default: where the table's discharge starts, from its depth column, else its last dry row; a row without flow above E, or with flow at or below it, is warned of)")
	fs.Float64Var(&f.datum, "datum", 0, "the table's stages are gauge heights on a gauge whose zero lies at this elevation (for the section figure)")
	fs.notGiven("datum")
	fs.IntVar(&f.width, "width", plotting.DefaultWidth, "figure width in pixels")
	fs.IntVar(&f.height, "height", plotting.DefaultHeight, "figure height in pixels")
	fs.IntVar(&f.dpi, "dpi", plotting.DefaultDPI, "figure resolution in dots per inch (text keeps its size in points)")
	fs.StringVarP(&f.output, "output", "o", "", "folder for the PNG files (default: the table's folder)")
	fs.output(outputFolder, "output")
}

// size checks the figure size flags.
func (f *plotFlags) size(fs *flagSet) (plotting.Size, error) {
	if err := fs.positive("width", "height", "dpi"); err != nil {
		return plotting.Size{}, err
	}
	if err := fs.within(survey.MaxElevation, "datum", "zero-flow"); err != nil {
		return plotting.Size{}, err
	}
	size := plotting.Size{Width: f.width, Height: f.height, DPI: f.dpi}
	if err := size.Check(); err != nil {
		return size, usageError{err: err}
	}
	return size, nil
}

func runPlot(ctx context.Context, e *env, args []string) error {
	fs := newFlags("plot", plotUsage)
	var f plotFlags
	f.register(fs)
	if err := fs.parseOperands(e, args, 1, "one TABLE file (a rating CSV written by 'wetline rate')"); err != nil {
		return err
	}
	u, err := f.unitSystem()
	if err != nil {
		return err
	}
	size, err := f.size(fs)
	if err != nil {
		return err
	}
	path := fs.Arg(0)
	tableSheet, err := f.sheets(fs, path)
	if err != nil {
		return err
	}
	// The section, when given, is read first: with --units, else its own
	// headers deciding, its units are the table's (whose headers then must
	// agree); else the table's headers decide.
	var p *survey.Prepared
	by := "--units"
	if f.section != "" {
		if p, err = f.prepare(f.section); err != nil {
			return err
		}
		if !u.Given && p.Survey.Units.Found {
			u, by = survey.UnitChoice{Units: p.Units, Given: true}, "the headers of "+p.Source()
		}
	}
	src, err := survey.ReadRatingSource(path, tableSheet)
	if err != nil {
		return err
	}
	header, err := survey.RatingUnits(src.Table)
	if err != nil {
		return err
	}
	t, err := survey.RatingFromTableGiven(src.Table, u, survey.ZeroFlowGiven{Given: fs.Changed("zero-flow"), Value: f.zeroFlow})
	if errors.Is(err, survey.ErrUnitsDisagree) {
		return fmt.Errorf("%w (%s units set by %s)", err, u.Units, by)
	}
	if errors.Is(err, survey.ErrMissingColumn) && tableSheet == "" {
		if other := survey.OtherRatingSheet(src.Table); other != "" {
			return fmt.Errorf("%w; sheet %s holds a rating table: give --table-sheet %s", err, survey.SheetArg(other), survey.SheetArg(other))
		}
	}
	if err != nil {
		return err
	}
	fit, err := survey.FitRowsFromTable(src.Table, t)
	if err != nil {
		return err
	}
	if fs.Changed("datum") {
		t.GaugeHeights, t.Datum = true, f.datum
	}
	inputs := []string{path}
	var notes []string
	if n := unitsAssumed(survey.Position(path, src.Table.Sheet), header, u.Given); n != "" {
		notes = append(notes, n)
	}
	zeroFlow := f.zeroFlow
	warnings := append([]string(nil), t.Warnings...)
	if foot, ok := survey.TableDryFoot(t); ok && !fs.Changed("zero-flow") {
		if len(fit) == 0 {
			zeroFlow = foot.E
		} else {
			foot = foot.OfFit() // the fit's rows are drawn from their own e, the same first row
		}
		at := func(int) string { return survey.Position(path, src.Table.Sheet) }
		notes = append(notes, foot.Note(at, "--zero-flow"))
		if w := foot.Warning(at); w != "" {
			warnings = append(warnings, w)
		}
	}
	if n := plotting.FlagNote(plotting.FlagMarks(t), t.Units); n != "" {
		warnings = append(warnings, survey.Position(path, src.Table.Sheet)+": "+n)
	}
	in := plotting.RatingFigures{Site: figureSite(src.Site, p, f.site), Base: figureBase(t.Name), Table: t, ZeroFlow: zeroFlow, Size: size, Fit: fit,
		Subtitle: fmt.Sprintf("redrawn from %s", filepath.Base(path))}
	if src.Summary {
		in.Subtitle += ", sheet " + src.Table.Sheet
	}
	if p != nil {
		inputs = append(inputs, p.Inputs...)
		warnings = append(warnings, p.Warnings...)
		notes = append(notes, p.Notes...)
		if w := t.BottomMismatch(p.Geometry.Bottom(), p.Source()); w != "" {
			warnings = append(warnings, w)
		}
		in.Ground, in.Geometry = p.Ground, f.geometry()
	}
	figs, w, err := plotting.DrawRating(in)
	if err != nil {
		return err
	}
	dir := f.output
	if dir == "" {
		dir = filepath.Dir(path)
	}
	return e.deliver(delivery{output: "-", inputs: inputs, plots: dir, figs: figs, warnings: append(warnings, w...), notes: notes,
		write: func(io.Writer) error { return nil }})
}

// figureSite is the site titling a redrawn rating: --site (flag) when
// given, else the site of the section's survey, else the site a results
// workbook's summary holds (summary).
func figureSite(summary string, p *survey.Prepared, flag string) string {
	switch {
	case flag != "":
		return flag
	case p != nil && p.Site.Name != "":
		return p.Site.Name
	}
	return summary
}

// sheets sorts out which file --sheet names: the survey's when --section
// is a workbook, else the table's (the survey, if any, then has none);
// --table-sheet always names the table's. It returns the table's sheet
// ("" for the first) and clears --sheet for a survey that is not a
// workbook. A sheet named for a table that is not a workbook, or both
// flags naming the table's, is a usage error; an unknown sheet is refused
// by the reader.
func (f *plotFlags) sheets(fs *flagSet, table string) (string, error) {
	sectionBook := f.section != "" && survey.IsWorkbook(f.section)
	sheet, flag := f.tableSheet, "--table-sheet"
	if !sectionBook && fs.Changed("sheet") {
		if fs.Changed("table-sheet") {
			return "", usagef("plot: --sheet and --table-sheet both name the table's sheet (there is no workbook survey): give one")
		}
		sheet, flag, f.sheet = f.sheet, "--sheet", ""
	}
	if sheet != "" && !survey.IsWorkbook(table) {
		return "", usagef("plot: %s %s: %s is not a workbook (.xlsx), so it has no sheets", flag, sheet, table)
	}
	return sheet, nil
}
