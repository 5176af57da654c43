package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"slices"

	"wetline/plotting"
	"wetline/rating"
	"wetline/subdivide"
	"wetline/survey"
	"wetline/survey/rate"
	"wetline/survey/results"
)

// rateFlags are the flags of the rate command.
type rateFlags struct {
	sectionFlags
	slope          float64
	from, to, step float64
	stages         numbers
	format, output string
	plots          string
	calib          calibrateFlags
	allSheets      bool
	long           bool
}

const rateUsage = "rate (SURVEY ... | FOLDER | --shape SPEC) --slope S [--from H1 --to H2 --step D | --stages h1,h2,...] [--n N | --n LEFT,CHANNEL,RIGHT] [--banks A,B] [--composite M] [--datum D] [--calibrate GAUGINGS [--channel-only]] [--all-pools] [--no-extend] [--units si|us] [--format csv|json|text|xlsx] [-o FILE|DIR] [--plots DIR] [--site NAME]; a batch: [--all-sheets] (-o DIR | --long [-o FILE])"

func (f *rateFlags) register(fs *flagSet) {
	f.sectionFlags.register(fs)
	fs.Float64Var(&f.slope, "slope", 0, "friction slope (m/m or ft/ft), required")
	fs.notGiven("slope")
	fs.Float64Var(&f.from, "from", math.NaN(), "lowest stage (default: the lowest ground point)")
	fs.Float64Var(&f.to, "to", math.NaN(), "highest stage (default: the lower end of the section)")
	fs.Float64Var(&f.step, "step", math.NaN(), "stage step, at least 0.0001 (stages are written to 4 decimals; default: a round step giving about 50 rows, never under 0.0001, a shallower section warned of)")
	fs.Var(&f.stages, "stages", "explicit stages, comma-separated, in any order (the table lists them increasing, each once; instead of --from/--to/--step)")
	fs.StringVar(&f.format, "format", "", "output format: csv, json, text (aligned columns to read on screen) or xlsx (a results workbook with figures and a lookup sheet at every hundredth of stage); default: from the -o extension, else csv")
	fs.StringVarP(&f.output, "output", "o", "", "output file, or a batch's folder (an existing folder is replaced only if it holds just an earlier batch's index.csv and tables; default: standard output)")
	f.calib.register(fs)
	fs.StringVar(&f.plots, "plots", "", "also write the rating, section and properties figures (PNG) into this folder")
	fs.output(outputEither, "output") // a folder for a batch
	fs.output(outputFolder, "plots")
	fs.BoolVar(&f.allSheets, "all-sheets", false, "rate every sheet of a workbook that holds a survey (a station and an elevation column)")
	fs.BoolVar(&f.long, "long", false, "with several surveys (files, folders, --all-sheets) -o names a folder for one table per section and an index; --long writes one long CSV table with a section column instead (to -o FILE or standard output)")
}

// check validates the flags that need no data.
func (f *rateFlags) check(fs *flagSet) error {
	if !fs.Changed("slope") {
		return usagef("rate: --slope S (a positive friction slope) is required")
	}
	if !(f.slope > 0) {
		return usagef("rate: --slope %g: the friction slope must be positive", f.slope)
	}
	if err := fs.positive("step"); err != nil {
		return err
	}
	if err := fs.within(survey.MaxElevation, "from", "to", "step", "datum", "stages"); err != nil {
		return err
	}
	if len(f.stages) > 0 && (fs.Changed("from") || fs.Changed("to") || fs.Changed("step")) {
		return usagef("rate: give --stages or --from/--to/--step, not both")
	}
	if fs.Changed("step") && f.step < results.LengthResolution {
		return usagef("rate: --step %g is finer than the table's stages are written (%d decimals): give a step of at least %g",
			f.step, results.LengthDecimals, results.LengthResolution)
	}
	if len(f.stages) > 0 {
		if err := results.CheckStagesApart(slices.Compact(slices.Sorted(slices.Values(f.stages)))); err != nil {
			return usageError{err: fmt.Errorf("rate: --stages: %w", err)}
		}
	}
	return checkSlope("rate", f.slope)
}

// stagesApart is the usage error for stages, laid out for a table, that
// the table would write alike (err wraps results.ErrStagesAlike), naming
// the flag that asked for them: a default step over a narrow --from/--to
// range can be as fine.
func stagesApart(fs *flagSet, err error) error {
	switch {
	case fs.Changed("stages"):
		return usageError{err: fmt.Errorf("rate: --stages: %w", err)}
	case fs.Changed("step"):
		return usageError{err: fmt.Errorf("rate: --step: %w", err)}
	}
	return usageError{err: fmt.Errorf("rate: the range is shorter than the table's precision, so its default stages are written alike: %w; give a wider --from/--to range", err)}
}

// stageSpec returns the stages asked for (results.TableStages keeps a
// default step no finer than the table writes its stages).
func (f *rateFlags) stageSpec(fs *flagSet) rating.StageSpec {
	spec := rating.StageSpec{List: f.stages, From: f.from, To: f.to, FromSet: fs.Changed("from"), ToSet: fs.Changed("to"), Datum: f.calib.datum}
	if fs.Changed("step") {
		spec.Step = f.step
	}
	return spec
}

// isBatch reports whether rate was given several surveys: more than one
// path, a folder, or --all-sheets.
func (f *rateFlags) isBatch(args []string) bool {
	if len(args) > 1 || f.allSheets {
		return true
	}
	if len(args) == 1 {
		if st, err := os.Stat(args[0]); err == nil && st.IsDir() {
			return true
		}
	}
	return false
}

func runRate(ctx context.Context, e *env, args []string) error {
	fs := newFlags("rate", rateUsage)
	var f rateFlags
	f.register(fs)
	if err := fs.parse(e, args); err != nil {
		return err
	}
	if err := f.check(fs); err != nil {
		return err
	}
	if f.isBatch(fs.Args()) {
		return runBatch(ctx, e, fs, &f)
	}
	if err := fs.needs("several surveys (files, a folder or --all-sheets)", false, "long"); err != nil {
		return err
	}
	if fs.NArg() != 1 && !(fs.NArg() == 0 && f.shape != "") {
		return usagef("rate: want one SURVEY file (or --shape SPEC), got %d arguments", fs.NArg())
	}
	format, err := outputFormat("rate", f.format, f.output, "csv", "json", "text", "xlsx")
	if err != nil {
		return err
	}
	rep, err := f.rate(fs, fs.Arg(0), format == "xlsx")
	if err != nil {
		return err
	}
	if f.plots != "" || format == "xlsx" {
		if err := drawRating(&rep, fs.Arg(0), rep.Provenance.Site.Name); err != nil {
			return err
		}
	}
	write := map[string]func(io.Writer, rating.RatingReport) error{
		"csv": results.WriteRatingCSV, "json": results.WriteRatingJSON,
		"text": results.WriteRatingText, "xlsx": results.WriteRatingWorkbook,
	}[format]
	return e.deliver(delivery{output: f.output, inputs: rep.Provenance.Inputs,
		write:  func(w io.Writer) error { return write(w, rep) },
		inline: format == "text" || format == "json", warnings: rep.Warnings, notes: rep.Provenance.Notes, plots: f.plots, figs: rep.Figures,
		summary: func(w io.Writer) error { return results.WriteRatingSummary(w, rep, f.output) }})
}

// rate reads the section at path and computes its rating report
// (rate.Section), the flags turned into its options.
func (f *rateFlags) rate(fs *flagSet, path string, lookup bool) (rating.RatingReport, error) {
	req, err := f.request(path)
	if err != nil {
		return rating.RatingReport{}, err
	}
	res, err := rate.Section(rate.Options{Request: req, Stages: f.stageSpec(fs),
		Rating: rating.RateOptions{Options: rating.Options{Slope: f.slope, Geometry: f.geometry()},
			Lookup: lookup, GaugeHeights: fs.Changed("datum"), Datum: f.calib.datum},
		Calibrate: func(p *survey.Prepared, opt rating.Options) (*rating.NCalibration, error) {
			return f.calib.apply(fs, p, opt)
		}})
	if err != nil {
		return rating.RatingReport{}, f.rateError(fs, err)
	}
	rep := res.Report
	rep.Provenance.Program = program()
	rep.Provenance.Site = siteWith(rep.Provenance.Site, f.site)
	return rep, nil
}

// rateError maps an error of rate.Section to the run's: stages the
// flags asked for that cannot be laid out, a table too long for a
// workbook, a stage above a conduit's crown and a request the flags got
// wrong are usage errors; a section with no depth to rate, and the
// data's other faults, are not.
func (f *rateFlags) rateError(fs *flagSet, err error) error {
	var se *rate.StagesError
	var ce *rate.ComputeError
	switch {
	case errors.As(err, &se):
		err = se.Err
		switch {
		case errors.Is(err, results.ErrNoDepth):
			return err // the survey's fault: exit 1
		case errors.Is(err, results.ErrStagesAlike):
			return stagesApart(fs, err)
		}
		if fs.Changed("step") {
			err = tooFineStep("rate", f.step, se.Units, err)
		}
		if ue := (usageError{}); errors.As(err, &ue) {
			return err
		}
		return usageError{err: fmt.Errorf("rate: %w", err)}
	case errors.As(err, &ce):
		if errors.Is(err, subdivide.ErrAboveCrown) {
			return usageError{err: err}
		}
		return err
	case errors.Is(err, results.ErrWorkbookRows):
		return usageError{err: fmt.Errorf("rate: %w", err)}
	}
	return f.requestError(err)
}

// drawRating draws a rating report's figures into it, named after the
// section (figureBase) and titled with site.
func drawRating(rep *rating.RatingReport, path, site string) error {
	base := figureBase(rep.Table.Name)
	sub := fmt.Sprintf("section surveyed in %s", filepath.Base(rep.Ground.Source)) // the file, and the sheet
	if path == "" {
		sub = "built section " + rep.Ground.Source
	}
	figs, warnings, err := plotting.DrawRating(plotting.RatingFigures{Site: site, Base: base, Subtitle: sub,
		Table: rep.Table, Ground: rep.Ground, ZeroFlow: math.NaN()})
	if err != nil {
		return err
	}
	rep.Figures = figs
	rep.Warnings = append(rep.Warnings, warnings...)
	return nil
}

// ErrImplausibleSlope is the cause of a friction slope no river has.
var ErrImplausibleSlope = errors.New("is not a plausible friction slope (m/m): did you mean a fraction, such as 0.0012?")

// maxSlope is the steepest friction slope accepted (common practice: the
// steepest mountain torrents fall about 0.2 m/m; Manning's equation is not
// meant for steeper).
const maxSlope = 0.5

// checkSlope refuses a slope that is a typing slip rather than a slope.
func checkSlope(cmd string, s float64) error {
	if s > maxSlope {
		return usageError{err: fmt.Errorf("%s: --slope %g %w", cmd, s, ErrImplausibleSlope)}
	}
	return nil
}
