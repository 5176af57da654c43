package main

import (
	"context"
	"fmt"
	"io"
	"math"

	"github.com/spf13/pflag"

	"wetline/rating"
	"wetline/rating/reach"
	"wetline/subdivide"
	"wetline/survey"
	"wetline/survey/output"
	"wetline/survey/results"
	"wetline/survey/workbook"
)

const slopeAreaUsage = "slopearea REACH [--sheet NAME] [--plots DIR [--site NAME]] [--units si|us] [--side mean|left|right] [--mark-spread D] " +
	"[--draws N] [--seed N] [--n-cv CV] [--mark-sd SD] [--slope S] [--connected] [--no-extend] [--format text|json|xlsx] [-o FILE]"

// slopeAreaFlags are the settings of a slope-area computation.
type slopeAreaFlags struct {
	sheet, units, side string
	markSpread         float64
	draws              int
	seed               uint64
	nCV, markSD        float64
	slope              float64
	connected          bool
	noExtend           bool
	format, output     string
	plots, site        string
}

func (f *slopeAreaFlags) register(fs *pflag.FlagSet) {
	fs.StringVar(&f.sheet, "sheet", "", "workbook sheet holding the reach table (default: the first sheet)")
	fs.StringVar(&f.plots, "plots", "", "also write the reach profile and the sections overlaid (PNG) into this folder")
	fs.StringVar(&f.site, "site", "", "site name for the figure titles")
	fs.StringVar(&f.units, "units", "si", "unit system of all input and output: si (m, m3/s) or us (ft, ft3/s)")
	fs.StringVar(&f.side, "side", "mean", "water surface from the mean of both marks, or from the left or right mark only")
	fs.Float64Var(&f.markSpread, "mark-spread", math.NaN(), "warn when a section's left and right marks differ by more (default 0.15 m or 0.5 ft)")
	fs.IntVar(&f.draws, "draws", reach.DefaultDraws, "Monte Carlo draws for the uncertainty band (0: none)")
	fs.Uint64Var(&f.seed, "seed", 1, "random seed of the Monte Carlo draws")
	fs.Float64Var(&f.nCV, "n-cv", reach.DefaultNCV, "coefficient of variation of every subsection's Manning's n (log-normal; 0: none)")
	fs.Float64Var(&f.markSD, "mark-sd", math.NaN(), "standard deviation of one high-water mark (default 0.03 m or 0.1 ft; a quality column overrides; 0: none)")
	fs.Float64Var(&f.slope, "slope", 0, "friction slope for a one-section reach: the weaker slope-conveyance estimate Q = K*sqrt(S)")
	fs.BoolVar(&f.connected, "connected", false, "count only the wetted reach holding the main channel, not pockets behind higher ground")
	fs.BoolVar(&f.noExtend, "no-extend", false, "make a water surface above an end of a section an error instead of extending the end with a vertical wall")
	fs.StringVar(&f.format, "format", "", "output format: text, json or xlsx (a results workbook with the inputs, checks, uncertainty and figures; needs -o); default: from the -o extension, else text")
	fs.StringVarP(&f.output, "output", "o", "", "output file (default: standard output)")
	for _, name := range []string{"mark-spread", "mark-sd"} {
		fs.Lookup(name).DefValue = "" // the unit's default, stated in the usage text
	}
}

// check validates the flags that need no data.
func (f *slopeAreaFlags) check() (rating.Units, reach.Side, error) {
	u, err := rating.ParseUnits(f.units)
	if err != nil {
		return u, 0, usageError{err}
	}
	side, err := reach.ParseSide(f.side)
	if err != nil {
		return u, side, usageError{err}
	}
	switch {
	case f.draws < 0 || f.draws > reach.MaxDraws:
		return u, side, usagef("--draws %d: want 0 to %d", f.draws, reach.MaxDraws)
	case !(f.nCV >= 0) || math.IsInf(f.nCV, 0):
		return u, side, usagef("--n-cv %v: want 0 or more", f.nCV)
	case f.markSD < 0 || math.IsInf(f.markSD, 0):
		return u, side, usagef("--mark-sd %v: want 0 or more", f.markSD)
	case !math.IsNaN(f.markSpread) && (!(f.markSpread > 0) || math.IsInf(f.markSpread, 0)):
		return u, side, usagef("--mark-spread %v: want a positive length", f.markSpread)
	case f.slope < 0 || math.IsNaN(f.slope) || math.IsInf(f.slope, 0):
		return u, side, usagef("--slope %v: want a positive slope", f.slope)
	}
	return u, side, nil
}

func runSlopeArea(ctx context.Context, e *env, args []string) error {
	fs := newFlags("slopearea", slopeAreaUsage)
	var f slopeAreaFlags
	f.register(fs)
	if err := parseFlags(fs, e, args); err != nil {
		return err
	}
	if fs.NArg() != 1 {
		return usagef("slopearea: want one REACH table, got %d arguments", fs.NArg())
	}
	format, err := outputFormat(f.format, f.output, "text", "json", "xlsx")
	if err != nil {
		return err
	}
	if format == "xlsx" && f.output == "" {
		return usagef("slopearea: an xlsx workbook needs -o FILE.xlsx")
	}
	rep, inputs, err := slopeArea(fs.Arg(0), &f)
	if err != nil {
		return err
	}
	var figs []figureFile
	if f.plots != "" || format == "xlsx" {
		// Figures are drawn in memory first: a drawing error writes nothing.
		var w []string
		if figs, w, err = slopeAreaFigures(rep, f.site); err != nil {
			return err
		}
		rep.Warnings = append(rep.Warnings, w...)
	}
	plotFigs := figs // written as files only with --plots
	if f.plots == "" {
		plotFigs = nil
	}
	write := func(w io.Writer) error {
		if format == "xlsx" {
			return results.WriteSlopeAreaWorkbook(w, rep, pictures(figs))
		}
		if format == "json" {
			return results.WriteSlopeAreaJSON(w, rep)
		}
		return results.WriteSlopeAreaText(w, rep)
	}
	return delivery{output: f.output, inputs: inputs, write: write, inline: format == "text", warnings: rep.Warnings,
		plots: f.plots, figs: plotFigs,
		summary: func(w io.Writer) { summarizeSlopeArea(w, rep, f.output) }}.deliver(e)
}

// slopeArea reads a reach and computes its slope-area report. It returns
// the files read, which no output may overwrite.
func slopeArea(path string, f *slopeAreaFlags) (results.SlopeAreaReport, []string, error) {
	rep := results.SlopeAreaReport{Version: Version}
	u, side, err := f.check()
	if err != nil {
		return rep, nil, err
	}
	rt, err := survey.ReadReach(path, f.sheet, survey.SectionOptions{})
	if err != nil {
		return rep, nil, err
	}
	rep.Reach = rt
	inputs := rt.Inputs()
	if f.output != "" {
		if err := output.CheckOutput(f.output, inputs); err != nil {
			return rep, nil, err
		}
	}
	secs, err := rt.ReachSections(u)
	if err != nil {
		return rep, nil, err
	}
	opt := reach.SlopeAreaOptions{Units: u, Side: side,
		Geometry: subdivide.Options{Connected: f.connected, NoExtend: f.noExtend}}
	if !math.IsNaN(f.markSpread) {
		opt.MarkSpread = f.markSpread
	}
	rep.Warnings = append(rep.Warnings, rt.Warnings...)
	if len(secs) == 1 {
		if f.slope == 0 {
			return rep, nil, rt.PlaceError(reach.ErrTooFewSections)
		}
		res, err := reach.SlopeConveyance(secs[0], f.slope, opt)
		if err != nil {
			return rep, nil, rt.PlaceError(err)
		}
		rep.Result = res
		rep.Warnings = append(rep.Warnings, res.Warnings...)
		return rep, inputs, nil
	}
	if f.slope != 0 {
		return rep, nil, usagef("--slope is only for a reach of one section (the slope-conveyance estimate); this reach has %d", len(secs))
	}
	res, err := reach.SolveSlopeArea(secs, opt)
	if err != nil {
		return rep, nil, rt.PlaceError(err)
	}
	rep.Result = res
	rep.Warnings = append(rep.Warnings, res.Warnings...)
	if f.draws > 0 {
		mc := reach.MonteCarloOptions{Draws: f.draws, Seed: f.seed, NCV: f.nCV, MarkSD: f.markSD}
		if mc.NCV == 0 {
			mc.NCV = -1 // none
		}
		switch {
		case math.IsNaN(f.markSD):
			mc.MarkSD = 0 // default
		case f.markSD == 0:
			mc.MarkSD = -1 // none
		}
		un, err := reach.MonteCarlo(secs, opt, mc)
		if err != nil {
			return rep, nil, rt.PlaceError(err)
		}
		rep.Uncertainty = &un
		if un.Failed > un.Draws/100 {
			rep.Warnings = append(rep.Warnings, fmt.Sprintf(
				"%d of %d Monte Carlo draws had no solution (a section dry or no fall): the band leaves them out", un.Failed, un.Draws))
		}
	}
	return rep, inputs, nil
}

// summarizeSlopeArea prints the console summary of a written report.
func summarizeSlopeArea(w io.Writer, rep results.SlopeAreaReport, path string) {
	r := rep.Result
	fmt.Fprintf(w, "wrote %s: %s peak discharge %s %s", path, r.Method, sig3(r.Discharge), r.Units.Discharge())
	if u := rep.Uncertainty; u != nil {
		fmt.Fprintf(w, " (90 %% band %s to %s %s)", sig3(u.P05), sig3(u.P95), r.Units.Discharge())
	}
	warn := 0
	for _, c := range r.Checks {
		if !c.Pass {
			warn++
		}
	}
	fmt.Fprintf(w, ", %d of %d checks warn\n", warn, len(r.Checks))
	printWarnings(w, rep.Warnings)
	fmt.Fprintln(w, "caution: "+rating.Caution)
}

func saNaN() float64 { return math.NaN() }

// pictures turns figures into workbook pictures captioned by what they show.
func pictures(figs []figureFile) []workbook.Picture {
	out := make([]workbook.Picture, len(figs))
	for i, f := range figs {
		out[i] = workbook.Picture{Name: f.what, PNG: f.data}
	}
	return out
}
