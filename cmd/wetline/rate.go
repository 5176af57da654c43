package main

import (
	"context"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strings"

	"wetline/rating"
	"wetline/survey/output"
	"wetline/survey/results"
)

type rateFlags struct {
	sectionFlags
	slope          float64
	from, to, step float64
	stages         []float64
	format, output string
	calib          calibrateFlags
	batch          batchFlags
}

const rateUsage = "rate (SURVEY | --shape SPEC) --slope S [--n N | --n LEFT,CHANNEL,RIGHT] [--banks A,B] [--from H1 --to H2 --step D | --stages h1,h2,...] [--units si|us] [--connected] [--format csv|json|text|xlsx] [-o FILE] [--calibrate GAUGINGS [--datum D] [--channel-only]] [--plots DIR]"

func runRate(ctx context.Context, e *env, args []string) error {
	fs := newFlags("rate", rateUsage)
	var f rateFlags
	f.sectionFlags.register(fs)
	fs.Float64Var(&f.slope, "slope", 0, "friction slope (m/m or ft/ft), required")
	fs.Float64Var(&f.from, "from", math.NaN(), "lowest stage (default: the lowest ground point)")
	fs.Float64Var(&f.to, "to", math.NaN(), "highest stage (default: the lower end of the section)")
	fs.Float64Var(&f.step, "step", math.NaN(), "stage step (default: a round step giving about 50 rows)")
	fs.Float64SliceVar(&f.stages, "stages", nil, "explicit stages, comma-separated (instead of --from/--to/--step)")
	fs.StringVar(&f.format, "format", "", "output format: csv, json, text (aligned columns to read on screen) or xlsx (a results workbook with figures); default: from the -o extension, else csv")
	fs.StringVarP(&f.output, "output", "o", "", "output file (default: standard output)")
	f.calib.register(fs)
	plotDir := fs.String("plots", "", "also write the rating, section and properties figures (PNG) into this folder")
	f.batch.register(fs)
	if err := parseFlags(fs, e, args); err != nil {
		return err
	}
	if f.isBatch(fs.Args()) {
		return runBatch(ctx, e, &f, fs.Args())
	}
	if fs.NArg() != 1 && !(fs.NArg() == 0 && f.shape != "") {
		return usagef("rate: want one SURVEY file (or --shape SPEC), got %d arguments", fs.NArg())
	}
	if !(f.slope > 0) || math.IsInf(f.slope, 0) {
		return usagef("rate: --slope S (a positive friction slope) is required")
	}
	format, err := outputFormat(f.format, f.output, "csv", "json", "text", "xlsx")
	if err != nil {
		return err
	}
	if format == "xlsx" && f.output == "" {
		return usagef("rate: an xlsx workbook needs -o FILE.xlsx")
	}
	l, err := f.load(fs.Arg(0))
	if err != nil {
		return err
	}
	if err := f.calib.apply(l, f.slope, fs.Changed); err != nil {
		return err
	}
	if f.output != "" {
		if err := output.CheckOutput(f.output, l.inputs); err != nil {
			return err
		}
	}
	stages, err := f.stageList(l)
	if err != nil {
		return err
	}
	t, err := rating.Compute(l.geom, stages, rating.Options{Slope: f.slope, Units: l.units, Geometry: l.geomOpt})
	if err != nil {
		return l.fail(err)
	}
	warnings := append(append([]string(nil), l.warnings...), t.Warnings...)
	// Figures are drawn in memory first: a drawing error writes nothing.
	figs, figWarnings, err := rateFigures(*plotDir, fs.Arg(0), l, t)
	if err != nil {
		return err
	}
	warnings = append(warnings, figWarnings...)
	var book results.RatingWorkbook
	if format == "xlsx" {
		if book, warnings, err = ratingBook(l, t, warnings); err != nil {
			return fmt.Errorf("%s: %w", fs.Arg(0), err)
		}
	}
	write := func(w io.Writer) error {
		switch format {
		case "json":
			return results.WriteRatingJSON(w, t, warnings)
		case "text":
			return results.WriteRatingText(w, t, warnings)
		case "xlsx":
			return results.WriteRatingWorkbook(w, book)
		}
		return results.WriteRatingCSV(w, t)
	}
	return delivery{output: f.output, inputs: l.inputs, write: write, inline: format == "text", warnings: warnings,
		plots: *plotDir, figs: figs,
		summary: func(w io.Writer) { summarizeRating(w, t, f.output, warnings) }}.deliver(e)
}

// stageList returns the stages asked for, or the default range.
func (f *rateFlags) stageList(l *loaded) ([]float64, error) {
	if len(f.stages) > 0 {
		if !math.IsNaN(f.from) || !math.IsNaN(f.to) || !math.IsNaN(f.step) {
			return nil, usagef("rate: give --stages or --from/--to/--step, not both")
		}
		for _, h := range f.stages {
			if math.IsNaN(h) || math.IsInf(h, 0) {
				return nil, usagef("rate: --stages: %v is not a finite stage", h)
			}
		}
		return f.stages, nil
	}
	if math.IsNaN(f.from) && math.IsNaN(f.to) && math.IsNaN(f.step) {
		return rating.DefaultStages(l.geom), nil
	}
	from, to, step := f.from, f.to, f.step
	if math.IsNaN(from) {
		from = l.geom.Bottom()
	}
	if math.IsNaN(to) {
		to = l.geom.Top()
	}
	if math.IsNaN(step) {
		step = rating.NiceStep((to - from) / rating.MaxDefaultRows)
	}
	s, err := rating.StageRange(from, to, step)
	if err != nil {
		return nil, usageError{err}
	}
	return s, nil
}

// outputFormat picks the format from the flag, else from the output file's
// extension, else the first allowed one.
func outputFormat(flag, output string, allowed ...string) (string, error) {
	f := strings.ToLower(flag)
	if f == "" {
		ext := strings.TrimPrefix(strings.ToLower(filepath.Ext(output)), ".")
		for _, a := range allowed {
			if a == ext {
				return a, nil
			}
		}
		return allowed[0], nil
	}
	for _, a := range allowed {
		if a == f {
			return f, nil
		}
	}
	return "", usagef("--format %q: want one of %s", flag, strings.Join(allowed, ", "))
}

func printWarnings(w io.Writer, warnings []string) {
	for _, s := range warnings {
		fmt.Fprintln(w, "warning: "+s)
	}
}

// summarizeRating prints the console summary of a written rating table.
func summarizeRating(w io.Writer, t rating.Table, path string, warnings []string) {
	u := t.Units
	fmt.Fprintf(w, "wrote %s: %d stage(s)", path, len(t.Rows))
	if n := len(t.Rows); n > 0 {
		lo, hi := t.Rows[0], t.Rows[0]
		for _, r := range t.Rows {
			if r.Stage < lo.Stage {
				lo = r
			}
			if r.Stage > hi.Stage {
				hi = r
			}
		}
		fmt.Fprintf(w, " from %.3f to %.3f %s, discharge %s to %s %s",
			lo.Stage, hi.Stage, u.Length(), sig3(lo.Discharge), sig3(hi.Discharge), u.Discharge())
	}
	fmt.Fprintf(w, " (slope %g, %s units)\n", t.Slope, u)
	printWarnings(w, warnings)
	fmt.Fprintln(w, "caution: "+rating.Caution)
}

// sig3 formats a value to three significant figures for a summary.
func sig3(v float64) string {
	if math.IsNaN(v) {
		return "-"
	}
	return fmt.Sprintf("%.3g", v)
}
