package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"slices"
	"strings"

	"wetline/plotting"
	"wetline/rating"
	"wetline/rating/reach"
	"wetline/subdivide"
	"wetline/survey"
	"wetline/survey/results"
)

const slopeAreaUsage = "slopearea REACH [--sheet NAME] [--plots DIR] [--site NAME] [--units si|us] [--side mean|left|right] [--mark-spread D] " +
	"[--draws N] [--seed N] [--n-cv CV] [--n-errors independent|by-region] [--mark-sd SD] [--slope S] [--all-pools] [--no-extend] [--surveys-anywhere] [--format text|json|xlsx] [-o FILE]"

// minDraws is the fewest Monte Carlo draws slopearea takes for a band:
// with 100 draws five lie beyond each of the 5th and 95th percentiles
// (common practice; more draws steady the band).
const minDraws = 100

// maxNCV is the largest coefficient of variation of Manning's n slopearea
// takes: drawn log-normal about its median, a CV of 1 already puts the
// 5th to 95th percentiles of n at about a quarter to four times the
// median (exp(±1.645·√ln 2)); more is a slip, not a judgement of n.
const maxNCV = 1.0

// slopeAreaFlags are the settings of a slope-area computation.
type slopeAreaFlags struct {
	sheet, units, side string
	markSpread         float64
	draws              int
	seed               uint64
	nCV, markSD        float64
	nErrors            string
	slope              float64
	allPools           bool
	noExtend           bool
	anywhere           bool
	coords             coordFlags
	format, output     string
	plots, site        string
}

func (f *slopeAreaFlags) register(fs *flagSet) {
	fs.StringVar(&f.sheet, "sheet", "", "workbook sheet holding the reach table (default: the first visible sheet)")
	fs.StringVar(&f.plots, "plots", "", "also write the reach profile and the sections overlaid (PNG) into this folder")
	fs.StringVar(&f.site, "site", "", siteUsage)
	fs.StringVar(&f.units, "units", "si", unitsUsage)
	fs.StringVar(&f.side, "side", "mean", "water surface from the mean of both marks, or from the left or right mark only")
	fs.Float64Var(&f.markSpread, "mark-spread", math.NaN(), "warn when a section's left and right marks differ by more (default 0.15 m or 0.5 ft)")
	fs.IntVar(&f.draws, "draws", reach.DefaultDraws, fmt.Sprintf("Monte Carlo draws for the uncertainty band: 0 for none, else %d or more "+
		"(fewer leave too few draws beyond the 5th and 95th percentiles)", minDraws))
	fs.Uint64Var(&f.seed, "seed", 1, "random seed of the Monte Carlo draws")
	fs.Float64Var(&f.nCV, "n-cv", reach.DefaultNCV, "coefficient of variation of every subsection's Manning's n (log-normal; 0: none; at most 1)")
	fs.StringVar(&f.nErrors, "n-errors", "independent", "how the Monte Carlo draws err in n: independent (each subsection of each section on its own; "+
		"errors partly cancel) or by-region (one error for each of the left overbank, channel and right overbank, shared by every section, "+
		"as when one person judges n for the whole reach; a wider band)")
	fs.Float64Var(&f.markSD, "mark-sd", math.NaN(), "standard deviation of one high-water mark (default 0.03 m or 0.1 ft, at most 1 m or 3 ft; a quality column overrides it where rated, and the report warns when every section is rated; 0: no spread of any mark, rated or not)")
	fs.Float64Var(&f.slope, "slope", 0, "friction slope for a one-section reach: the weaker slope-conveyance estimate Q = K*sqrt(S)")
	fs.notGiven("slope")
	fs.BoolVar(&f.allPools, "all-pools", false, "count water standing in pockets behind higher ground as flowing (default: only the water connected to the main channel)")
	connectedFlag(fs)
	fs.BoolVar(&f.noExtend, "no-extend", false, "make a water surface above an end of a section an error instead of extending the end with a vertical wall, which is warned of")
	fs.StringVar(&f.format, "format", "", "output format: text, json or xlsx (a results workbook with the inputs, checks, uncertainty and figures; needs -o); default: from the -o extension, else text")
	fs.StringVarP(&f.output, "output", "o", "", "output file (default: standard output)")
	fs.output(outputFile, "output")
	fs.output(outputFolder, "plots")
	fs.BoolVar(&f.anywhere, "surveys-anywhere", false, "let the reach table name survey files outside its own folder")
	f.coords.register(fs, false)
	for _, name := range []string{"mark-spread", "mark-sd"} {
		fs.Lookup(name).DefValue = "" // the unit's default, stated in the usage text
	}
}

// options validates the flags that need no data and turns them into the
// estimate's options.
func (f *slopeAreaFlags) options(fs *flagSet) (reach.EstimateOptions, error) {
	var opt reach.EstimateOptions
	u, err := rating.ParseUnits(f.units)
	if err != nil {
		return opt, usageError{err: err}
	}
	side, err := reach.ParseSide(f.side)
	if err != nil {
		return opt, usageError{err: fmt.Errorf("slopearea: --side: %w", err)}
	}
	nErrors, err := reach.ParseNErrors(f.nErrors)
	if err != nil {
		return opt, usageError{err: fmt.Errorf("slopearea: --n-errors: %w", err)}
	}
	switch {
	case f.draws < 0 || f.draws > reach.MaxDraws || f.draws > 0 && f.draws < minDraws:
		return opt, usagef("slopearea: --draws %d: want 0 (no band) or %d to %d", f.draws, minDraws, reach.MaxDraws)
	case f.nCV < 0 || f.nCV > maxNCV:
		return opt, usagef("slopearea: --n-cv %v: want 0 to %g (a coefficient of variation of n above %g is not plausible)", f.nCV, maxNCV, maxNCV)
	case f.markSD < 0:
		return opt, usagef("slopearea: --mark-sd %v: want 0 or more", f.markSD)
	case f.slope < 0:
		return opt, usagef("slopearea: --slope %v: want a positive slope", f.slope)
	}
	if err := fs.positive("mark-spread"); err != nil {
		return opt, err
	}
	if err := checkSlope("slopearea", f.slope); err != nil {
		return opt, err
	}
	opt.SlopeArea = reach.SlopeAreaOptions{Units: u, Side: side,
		Geometry: subdivide.Options{AllPools: f.allPools, NoExtend: f.noExtend}}
	if !math.IsNaN(f.markSpread) {
		opt.SlopeArea.MarkSpread = f.markSpread
	}
	opt.Slope, opt.Draws = f.slope, f.draws
	opt.MonteCarlo = reach.MonteCarloOptions{Seed: f.seed, NCV: f.nCV, MarkSD: f.markSD, NErrors: nErrors}
	if f.nCV == 0 {
		opt.MonteCarlo.NCV = -1 // none
	}
	switch {
	case math.IsNaN(f.markSD):
		opt.MonteCarlo.MarkSD = 0 // default
	case f.markSD == 0:
		opt.MonteCarlo.MarkSD = -1 // none
	}
	return opt, nil
}

func runSlopeArea(ctx context.Context, e *env, args []string) error {
	fs := newFlags("slopearea", slopeAreaUsage)
	var f slopeAreaFlags
	f.register(fs)
	if err := fs.parseOperands(e, args, 1, "one REACH table"); err != nil {
		return err
	}
	format, err := outputFormat("slopearea", f.format, f.output, "text", "json", "xlsx")
	if err != nil {
		return err
	}
	opt, err := f.options(fs)
	if err != nil {
		return err
	}
	path := fs.Arg(0)
	u, err := unitChoice(f.units, fs.Changed("units"))
	if err != nil {
		return err
	}
	co, err := f.coords.options(fs, u)
	if err != nil {
		return err
	}
	rep, err := estimate(path, f.sheet, opt, survey.SectionOptions{SurveysAnywhere: f.anywhere, Coordinates: co}, fs.Changed("units"))
	if err != nil {
		return err
	}
	rep.Provenance.Site = siteWith(rep.Provenance.Site, f.site)
	if f.plots != "" || format == "xlsx" {
		base := strings.TrimSuffix(filepath.Base(path), filepath.Ext(path))
		figs, w, err := plotting.DrawReach(rep, rep.Provenance.Site.Name, base, plotting.Size{})
		if err != nil {
			return err
		}
		rep.Figures, rep.Warnings = figs, append(rep.Warnings, w...)
	}
	write := map[string]func(io.Writer, reach.Report) error{
		"text": results.WriteSlopeAreaText, "json": results.WriteSlopeAreaJSON, "xlsx": results.WriteSlopeAreaWorkbook,
	}[format]
	return e.deliver(delivery{output: f.output, inputs: rep.Provenance.Inputs,
		write:  func(w io.Writer) error { return write(w, rep) },
		inline: true, warnings: rep.Warnings, plots: f.plots, figs: rep.Figures,
		summary: func(w io.Writer) error { return results.WriteSlopeAreaSummary(w, rep, f.output) }})
}

// estimate reads a reach table and its surveys and estimates the peak.
func estimate(path, sheet string, opt reach.EstimateOptions, ro survey.SectionOptions, unitsGiven bool) (reach.Report, error) {
	rt, err := survey.ReadReach(path, sheet, ro)
	if err != nil {
		return reach.Report{}, err
	}
	if opt.SlopeArea.Units, err = rt.ResolveUnits(opt.SlopeArea.Units, unitsGiven); err != nil {
		return reach.Report{}, err
	}
	secs, err := rt.ReachSections(opt.SlopeArea.Units)
	if err != nil {
		return reach.Report{}, err
	}
	rep, err := reach.Estimate(secs, opt)
	if errors.Is(err, reach.ErrSlopeForReach) {
		return rep, usageError{err: fmt.Errorf("slopearea: --slope: %w", err)}
	}
	if errors.Is(err, reach.ErrMarkSD) {
		return rep, usageError{err: fmt.Errorf("slopearea: --mark-sd: %w", err)}
	}
	if err != nil {
		return rep, rt.PlaceError(err)
	}
	rep.Name = survey.Position(path, sheet)
	rep.Provenance = rating.Provenance{Program: program(), Inputs: rt.Inputs(), Site: rt.Site}
	rep.Warnings = slices.Concat(rt.Warnings, rep.Warnings, rt.SlopeAreaWarnings())
	return rep, nil
}
