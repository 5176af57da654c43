package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"time"

	"wetline/plotting"
	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/survey"
	"wetline/survey/results"
)

const fitUsage = "fit GAUGINGS [--gaugings-sheet NAME] [--section SURVEY --slope S | --hydraulic-rating TABLE [--hydraulic-zero-flow E]] [--datum D] [--channel-only] [--compare-only] " +
	"[--method bayes|lsq] [--controls N] [--breaks H1,H2] [--kinds K1,K2] [--joints J2] [--zero-flow auto|control|VALUE] " +
	"[--control-section RIFFLE] [--n-cv CV] [--slope-cv CV] [--draws N] [--chains N] [--seed N] [--show-unconverged] " +
	"[--exclude TIME,...] [--period FROM..TO] [--utc-offset ±HH:MM] [--to H] [--step D] [--units si|us] [--format text|json|csv|xlsx] [-o FILE] [--plots DIR] [--site NAME]"

// Defaults of the fit command's Bayesian flags.
const (
	// fitDefaultSeed seeds the chains when --seed is not given, so that a
	// run repeats.
	fitDefaultSeed = 1
)

// fitFlags are the flags of the fit command.
type fitFlags struct {
	sectionFlags
	gaugingSheet    string
	section         string
	slope           float64
	hydraulicTable  string
	hydraulicSheet  string
	hydraulicZero   float64
	datum           float64
	channelOnly     bool
	compareOnly     bool
	method          string
	controls        int
	segments        int
	breaks          numbers
	kinds           string
	joints          string
	zeroFlow        string
	controlSection  string
	nCV, slopeCV    float64
	crestCV         float64
	draws, chains   int
	seed            uint64
	showUnconverged bool
	exclude         string
	period          string
	offset          utcOffset
	to, step        float64
	format          string
	output          string
	plots           string
}

func (f *fitFlags) register(fs *flagSet) {
	fs.StringVar(&f.gaugingSheet, "gaugings-sheet", "", "workbook sheet holding the gaugings (default: a sheet named gaugings, else the first)")
	fs.StringVar(&f.section, "section", "", "surveyed section at the gauge: hydraulic rating, n back-calculation, extension and prior")
	fs.Float64Var(&f.slope, "slope", 0, "friction slope of the hydraulic rating (needed with --section)")
	fs.notGiven("slope")
	fs.StringVar(&f.hydraulicTable, "hydraulic-rating", "", "a hydraulic rating table (stage and discharge columns, as rate writes it) instead of --section: comparison, extension and prior")
	fs.StringVar(&f.hydraulicSheet, "hydraulic-rating-sheet", "", "workbook sheet of --hydraulic-rating (default: the first visible sheet)")
	fs.Float64Var(&f.hydraulicZero, "hydraulic-zero-flow", 0, "gauge height of zero flow e of --hydraulic-rating: between rows the table is read log-linearly in (h − e), as shifts, record and compare read a rating given --zero-flow (e may not lie below a row without flow, nor at or above a row with flow; default: where the table's flow starts, from its depth column, also when its first row has flow, else its last leading row without flow; a table with none of these is read linearly, with a warning)")
	fs.notGiven("hydraulic-zero-flow")
	fs.Float64Var(&f.datum, "datum", 0, "elevation of the gauge's zero in the survey's datum: elevation = gauge height + DATUM (for --section, --control-section and the stages of --hydraulic-rating)")
	fs.notGiven("datum")
	fs.BoolVar(&f.channelOnly, "channel-only", false, "back-calculate only the main channel's n (default: one factor on every n)")
	fs.BoolVar(&f.compareOnly, "compare-only", false, "compare the gaugings with the hydraulic rating and fit nothing")
	fs.StringVar(&f.method, "method", "bayes", "how the rating is fitted: bayes (Bayesian, priors from the survey) or lsq (weighted least squares in ln Q; above the highest gauging h_j the bands widen in quadrature by t·½·(h − h_j)·SE for a trend of ln S, even when S is taken as level, and by 1.96·|φ(h) − φ(h_j)|·σ for the overbanks' n against the channel's, φ their share of conveyance, cv 0.2; lower limits never fall with stage)")
	fs.IntVar(&f.controls, "controls", 0, fmt.Sprintf("number of controls, 1 to %d, each Q = A·(h − B)^C with its own offset (default 1, or one more than --breaks; a Bayesian fit on a section whose overbanks flow below the table's top adds a floodplain control at the bank stage unless --controls, --breaks, --kinds, --joints or --control-section is given)", gauged.MaxControls))
	fs.IntVar(&f.segments, "segments", 0, "the same as --controls (the name of earlier versions)")
	fs.notGiven("segments")
	fs.Var(&f.breaks, "breaks", "given breakpoints (gauge heights), comma-separated, instead of fitted ones; each control needs 3 gaugings (a Bayesian fit allows fewer, warned, with a prior from --section or --control-section)")
	fs.StringVar(&f.kinds, "kinds", "", "what each control is, comma-separated: section (riffle, weir crest), channel or unknown (default: channel with a section or hydraulic rating, section for the first with --control-section, else unknown)")
	fs.StringVar(&f.joints, "joints", "", "how each control above the first joins the one below, comma-separated: replace (takes over) or add (a floodplain adding to the channel); default replace")
	fs.StringVar(&f.zeroFlow, "zero-flow", "auto", "offset B of the first control (gauge height of zero flow): auto (fitted), control (the section's lowest point) or a number")
	fs.StringVar(&f.controlSection, "control-section", "", "surveyed crest of a riffle or weir (same datum as --datum): the prior of a section control by critical flow (Bayesian)")
	fs.Float64Var(&f.nCV, "n-cv", gauged.DefaultNCV, "coefficient of variation of Manning's n in the prior from the hydraulic rating (Bayesian)")
	fs.Float64Var(&f.slopeCV, "slope-cv", gauged.DefaultSlopeCV, "coefficient of variation of the friction slope in the prior from the hydraulic rating (Bayesian)")
	fs.Float64Var(&f.crestCV, "crest-cv", gauged.DefaultCrestCV, "coefficient of variation of the critical-flow discharge over --control-section (Bayesian)")
	fs.IntVar(&f.draws, "draws", gauged.DefaultDraws, "posterior draws kept per chain (Bayesian)")
	fs.IntVar(&f.chains, "chains", gauged.DefaultChains, "number of chains, each with its own seeded source (Bayesian; 2 or more for R̂)")
	fs.Uint64Var(&f.seed, "seed", fitDefaultSeed, "seed of the chains: the same seed gives the same output (Bayesian)")
	fs.BoolVar(&f.showUnconverged, "show-unconverged", false, fmt.Sprintf("give the bands even when the chains disagree (R̂ above %g; by default they are withheld)", gauged.RHatLimit))
	fs.StringVar(&f.exclude, "exclude", "", "times of gaugings to leave out of the fit, comma-separated (ISO 8601; a time without an offset is read at --utc-offset, not at a tz column of the file: write one, as 2023-05-27T10:00-06:00, for another; a time that is no gauging's is an error)")
	fs.StringVar(&f.period, "period", "", "fit only the gaugings of a rating period FROM..TO, from FROM up to, not including, TO, as rating periods run (ISO 8601; either end may be left open; a date alone as TO includes that day, up to the next day's 00:00; a time without an offset is read at --utc-offset)")
	fs.Var(&f.offset, "utc-offset", "offset ±HH:MM of times written without one, in the gaugings and in --period and --exclude (so a date is a local day); the reports give every time at it (default UTC)")
	fs.Float64Var(&f.to, "to", 0, "highest gauge height of the table (default: the top of the hydraulic rating, else the highest gauging; never above the section's lower end, where rate would extend with a wall: the fit does not extrapolate on walls it did not survey)")
	fs.Float64Var(&f.step, "step", 0, "gauge-height step of the table (default: a round step giving about 50 rows)")
	f.sectionFlags.register(fs)
	fs.StringVar(&f.format, "format", "", "output format: text, json, csv or xlsx (a results workbook with the fit, residuals, bands, posterior, lookup sheet and figure; needs -o); default: from the -o extension, else text")
	fs.StringVarP(&f.output, "output", "o", "", "output file (default: standard output)")
	fs.StringVar(&f.plots, "plots", "", "also write the rating figure with the gaugings and both bands (PNG) into this folder")
	fs.output(outputFile, "output")
	fs.input("section", "hydraulic-rating", "control-section")
	fs.output(outputFolder, "plots")
}

func runFit(ctx context.Context, e *env, args []string) error {
	fs := newFlags("fit", fitUsage)
	var f fitFlags
	f.register(fs)
	if err := fs.parseOperands(e, args, 1, "one GAUGINGS file"); err != nil {
		return err
	}
	opt, err := f.options(fs)
	if err != nil {
		return err
	}
	format, err := outputFormat("fit", f.format, f.output, "text", "json", "csv", "xlsx")
	if err != nil {
		return err
	}
	opt.Lookup = format == "xlsx"
	rep, err := f.analyze(fs.Arg(0), opt)
	if err != nil {
		return err
	}
	base := strings.TrimSuffix(filepath.Base(fs.Arg(0)), filepath.Ext(fs.Arg(0)))
	if f.plots != "" || format == "xlsx" {
		figs, w, err := plotting.DrawFit(rep, rep.Provenance.Site.Name, base, plotting.Size{})
		if err != nil {
			return err
		}
		rep.Figures, rep.Warnings = figs, append(rep.Warnings, w...)
	}
	write := map[string]func(io.Writer, *gauged.Report) error{
		"text": results.WriteFitText, "json": results.WriteFitJSON, "csv": results.WriteFitCSV, "xlsx": results.WriteFitWorkbook,
	}[format]
	return e.deliver(delivery{output: f.output, inputs: rep.Provenance.Inputs,
		write:  func(w io.Writer) error { return write(w, rep) },
		inline: format == "text" || format == "json", warnings: rep.Warnings, notes: rep.Provenance.Notes, plots: f.plots, figs: rep.Figures,
		summary: func(w io.Writer) error { return results.WriteFitSummary(w, rep, f.output) }})
}

// analyze reads the gaugings at path (and the section, hydraulic rating
// table and crest section, when given) and computes the gaugings report.
func (f *fitFlags) analyze(path string, opt gauged.Options) (*gauged.Report, error) {
	// The gaugings' headers set the units unless --units did; then the
	// hydraulic rating table's, read before the sections for that.
	d, err := decideUnits(f.units, f.fs != nil && f.fs.Changed("units"))
	if err != nil {
		return nil, err
	}
	gs, err := survey.ReadGaugingsAt(path, f.gaugingSheet, time.Duration(f.offset))
	if err != nil {
		return nil, err
	}
	if err := d.take(gs.Units, path); err != nil {
		return nil, err
	}
	gs.Warnings = append(gs.Warnings, gs.SpanWarnings(d.Units)...)
	if err := f.periodHolds(path, gs.Gaugings, opt); err != nil {
		return nil, err
	}
	if err := excludesMatch(path, gs.Gaugings, opt); err != nil {
		return nil, err
	}
	var table *gauged.TableRating
	var tableWarnings []string
	var tableNotes []string
	if f.hydraulicTable != "" {
		zero := hydraulicZero{given: f.fs != nil && f.fs.Changed("hydraulic-zero-flow"), e: f.hydraulicZero}
		if table, tableWarnings, tableNotes, err = readHydraulicTable(f.hydraulicTable, f.hydraulicSheet, f.datum, zero, &d); err != nil {
			return nil, err
		}
	}
	opt.Units = d.Units
	in := fitInputs{inputs: []string{path}, warnings: append([]string(nil), gs.Warnings...), site: gs.Site}
	in.notes = append(in.notes, tableNotes...)
	ropt := rating.Options{Slope: f.slope, Units: d.Units, Geometry: f.geometry()}
	if f.section != "" {
		p, err := f.prepareIn(f.section, &d)
		if err != nil {
			return nil, err
		}
		in.addSection(p)
		opt.Hydraulic = &rating.HydraulicCurve{Geometry: p.Geometry, Datum: f.datum, Options: ropt}
		opt.DatumGiven = f.fs != nil && f.fs.Changed("datum")
		opt.Section = p.Survey.Section.Name
		in.site = in.site.Merge(p.Site)
	}
	if table != nil {
		in.add([]string{f.hydraulicTable}, tableWarnings)
		opt.HydraulicTable = table
	}
	if f.controlSection != "" {
		p, err := d.prepareWith(survey.SectionRequest{Path: f.controlSection})
		if err != nil {
			return nil, err
		}
		in.addSection(p)
		opt.Crest = &rating.HydraulicCurve{Geometry: p.Geometry, Datum: f.datum, Options: ropt}
	}
	// The report goes by the gaugings' file, with or without a section.
	opt.Site = strings.TrimSuffix(filepath.Base(path), filepath.Ext(path))
	rep, err := gauged.Analyze(gs.Gaugings, opt)
	if errors.Is(err, gauged.ErrGaugingsOutsideSection) && !opt.DatumGiven {
		return nil, fmt.Errorf("%s: %w: give --datum, the elevation of the gauge's zero in the survey's datum", path, err)
	}
	if errors.Is(err, gauged.ErrTableFlowsAtFoot) {
		return nil, fmt.Errorf("fit: --zero-flow control: %w; give --hydraulic-zero-flow E, the table's gauge height of zero flow, or --zero-flow auto to fit it", err)
	}
	var below *gauged.BelowZeroError
	if errors.As(err, &below) {
		return nil, f.belowZeroFlow(below)
	}
	if sel := opt.Controls.Selection; errors.Is(err, gauged.ErrFewGaugings) && !(sel.From.IsZero() && sel.To.IsZero()) {
		return nil, fmt.Errorf("fit: --period %s: %s: %w; widen the period or leave --period out", strings.TrimSpace(f.period), path, err)
	}
	if errors.Is(err, rating.ErrStepTooFine) {
		return nil, tooFineStep("fit", f.step, d.Units, err)
	}
	if ref := f.section + f.hydraulicTable; errors.Is(err, gauged.ErrBeyondSection) && f.to != 0 && ref != "" {
		// The table's top is the section's (or the hydraulic rating
		// table's): name that file, not the gaugings'.
		return nil, fmt.Errorf("fit: --to %g: %s: %w", f.to, ref, err)
	}
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	rep.Warnings = append(in.warnings, rep.Warnings...)
	rep.Provenance = rating.Provenance{Program: program(), Inputs: in.inputs, Site: siteWith(in.site, f.site), Notes: in.notes}
	return rep, nil
}

// fitInputs gathers what fit read: the files, their readers' warnings and
// what they say of the site.
type fitInputs struct {
	inputs, warnings, notes []string
	site                    rating.Site
}

func (in *fitInputs) add(files, warnings []string) {
	in.inputs = append(in.inputs, files...)
	in.warnings = append(in.warnings, warnings...)
}

// addSection adds a section's files, warnings and input notes.
func (in *fitInputs) addSection(p *survey.Prepared) {
	in.add(p.Inputs, p.Warnings)
	in.notes = append(in.notes, p.Notes...)
}

// hydraulicZero is the gauge height of zero flow given for a hydraulic
// rating table (--hydraulic-zero-flow), when given.
type hydraulicZero struct {
	given bool
	e     float64
}

// readHydraulicTable reads a hydraulic rating table at gauge heights
// (stage − datum) with the reader the shifts, record and compare commands
// use (survey.ReadRatingTables), so that it is read as they read a rating:
// log-linearly in (h − e) between rows, e the gauge height of zero flow
// zero.e when given, else where the table's flow starts (survey.TableFoot:
// from its depth column, also when its first row has flow, else its last dry row at its foot); a table with
// neither is read linearly in stage, with a warning. The units of its
// headers must be those decided, or decide them (see
// unitsDecided.takeTable, which gives the first input note returned; a
// dry foot's e is another). A zero-flow stage at or above a row with
// flow, or below a row without flow, is an error naming the flag.
func readHydraulicTable(path, sheet string, datum float64, zero hydraulicZero, units *unitsDecided) (*gauged.TableRating, []string, []string, error) {
	opt := survey.RatingTableOptions{Sheet: sheet, Datum: datum, HasZeroFlow: zero.given, ZeroFlow: zero.e,
		ZeroFlowFlag: "--hydraulic-zero-flow"}
	rt, err := survey.ReadRatingTables(path, opt)
	if zero.given && (errors.Is(err, gauged.ErrZeroFlowAbove) || errors.Is(err, gauged.ErrDryAboveZeroFlow)) {
		return nil, nil, nil, fmt.Errorf("fit: --hydraulic-zero-flow %s: %w", strconv.FormatFloat(zero.e, 'g', -1, 64), err)
	}
	if err != nil {
		return nil, nil, nil, err
	}
	note, err := units.takeTable(rt.Units, path)
	if err != nil {
		return nil, nil, nil, err
	}
	if len(rt.Periods) != 1 || rt.Periods[0].Rating == nil {
		return nil, nil, nil, fmt.Errorf("%s: a hydraulic rating is one table, not %d rating periods", path, len(rt.Periods))
	}
	tab := *rt.Periods[0].Rating
	tab.HasHighGauging = false
	c, err := tab.Compile()
	if err != nil {
		return nil, nil, nil, fmt.Errorf("%s: %w", path, err)
	}
	var notes []string
	if note != "" {
		notes = append(notes, note)
	}
	return c, rt.Warnings, append(notes, rt.Notes...), nil
}

// options checks the flags against each other and turns them into report
// options (without the section, tables and gaugings).
func (f *fitFlags) options(fs *flagSet) (gauged.Options, error) {
	var opt gauged.Options
	if err := f.checkSources(fs); err != nil {
		return opt, err
	}
	if err := fs.within(survey.MaxElevation, "datum", "to", "step", "breaks", "hydraulic-zero-flow"); err != nil {
		return opt, err
	}
	opt.ChannelOnly, opt.CompareOnly = f.channelOnly, f.compareOnly
	if f.compareOnly {
		for _, name := range []string{"segments", "controls", "breaks", "kinds", "joints", "zero-flow", "to", "step", "method", "control-section",
			"n-cv", "slope-cv", "crest-cv", "draws", "chains", "seed", "show-unconverged"} {
			if fs.Changed(name) {
				return opt, usagef("fit: --%s has no use with --compare-only", name)
			}
		}
	}
	m, err := gauged.ParseMethod(f.method)
	if err != nil {
		return opt, usagef("fit: --method %q: want bayes or lsq", f.method)
	}
	opt.Method = m
	if m == gauged.LeastSquares {
		for _, name := range []string{"control-section", "n-cv", "slope-cv", "crest-cv", "draws", "chains", "seed", "show-unconverged"} {
			if fs.Changed(name) {
				return opt, usagef("fit: --%s is for the Bayesian fit (--method bayes)", name)
			}
		}
	}
	if err := f.controlOptions(fs, &opt.Controls); err != nil {
		return opt, err
	}
	if err := f.zeroFlowOption(&opt); err != nil {
		return opt, err
	}
	sel, err := f.selection(fs.Changed("period"))
	if err != nil {
		return opt, err
	}
	opt.Controls.Selection = sel
	opt.UTCOffset = time.Duration(f.offset) // reports give times at it
	opt.Floodplain = f.controlSection == ""
	for _, name := range []string{"controls", "segments", "breaks", "kinds", "joints"} {
		opt.Floodplain = opt.Floodplain && !fs.Changed(name)
	}
	opt.Bayes = gauged.BayesOptions{NCV: f.nCV, SlopeCV: f.slopeCV, CrestCV: f.crestCV, Draws: f.draws, Chains: f.chains, Seed: f.seed}
	opt.Table = gauged.ControlTableOptions{To: f.to, Step: f.step, ShowUnconverged: f.showUnconverged}
	return opt, nil
}

// checkSources checks the flags of the section and the hydraulic rating
// table, and the numbers that must be positive.
func (f *fitFlags) checkSources(fs *flagSet) error {
	if err := fs.needs("--section SURVEY", f.section != "", "slope", "channel-only", "sheet", "n", "banks", "all-pools", "no-extend", "shape", "composite"); err != nil {
		return err
	}
	if err := fs.needs("--section SURVEY, --hydraulic-rating TABLE or --control-section RIFFLE", f.section != "" || f.hydraulicTable != "" || f.controlSection != "", "datum"); err != nil {
		return err
	}
	if err := fs.needs("--hydraulic-rating TABLE", f.hydraulicTable != "", "hydraulic-rating-sheet", "hydraulic-zero-flow"); err != nil {
		return err
	}
	if err := fs.needs("--section SURVEY or --hydraulic-rating TABLE", f.section != "" || f.hydraulicTable != "", "compare-only", "n-cv", "slope-cv"); err != nil {
		return err
	}
	if err := fs.needs("--control-section RIFFLE", f.controlSection != "", "crest-cv"); err != nil {
		return err
	}
	if f.section != "" && f.hydraulicTable != "" {
		return usagef("fit: give --section or --hydraulic-rating, not both")
	}
	if f.section != "" && !(f.slope > 0) {
		return usagef("fit: --section needs --slope S (a positive friction slope)")
	}
	if err := checkSlope("fit", f.slope); err != nil {
		return err
	}
	if err := fs.positive("step", "segments", "controls", "n-cv", "slope-cv", "crest-cv", "draws", "chains"); err != nil {
		return err
	}
	if f.chains > gauged.MaxChains || f.draws > gauged.MaxKeptDraws || f.chains*(f.draws+gauged.DefaultPilot) > gauged.MaxKeptDraws {
		return usagef("fit: --chains %d --draws %d: at most %d chains and %d draws in all, pilot iterations (%d a chain) included",
			f.chains, f.draws, gauged.MaxChains, gauged.MaxKeptDraws, gauged.DefaultPilot)
	}
	return nil
}

// controlOptions reads --controls (or --segments), --breaks, --kinds and
// --joints.
func (f *fitFlags) controlOptions(fs *flagSet, co *gauged.ControlOptions) error {
	k, err := f.controlCount(fs)
	if err != nil {
		return err
	}
	if len(f.breaks) > 0 {
		co.Breaks = append([]float64(nil), f.breaks...)
	}
	kinds, err := f.controlKinds(k)
	if err != nil {
		return err
	}
	joints, err := f.controlJoints(k)
	if err != nil {
		return err
	}
	co.Controls = make([]gauged.ControlSpec, k)
	for j := range co.Controls {
		co.Controls[j] = gauged.ControlSpec{Kind: kinds[j], Joint: joints[j]}
	}
	return nil
}

// controlCount reconciles --controls, --segments and --breaks.
func (f *fitFlags) controlCount(fs *flagSet) (int, error) {
	k, flag := f.controls, "--controls"
	if fs.Changed("segments") {
		if fs.Changed("controls") && f.segments != f.controls {
			return 0, usagef("fit: --segments %d and --controls %d disagree (they are the same)", f.segments, f.controls)
		}
		k, flag = f.segments, "--segments"
	}
	if len(f.breaks) > 0 {
		if k != 0 && k != len(f.breaks)+1 {
			return 0, usagef("fit: --breaks gives %d breakpoints, which make %d controls, not the %d of %s", len(f.breaks), len(f.breaks)+1, k, flag)
		}
		k = len(f.breaks) + 1
	}
	if k == 0 {
		k = 1
	}
	if k < 1 || k > gauged.MaxControls {
		what := fmt.Sprintf("%s %d", flag, k)
		if len(f.breaks) > 0 {
			what = fmt.Sprintf("--breaks with %d values (%d controls)", len(f.breaks), k)
		}
		return 0, usagef("fit: %s: want 1 to %d controls", what, gauged.MaxControls)
	}
	return k, nil
}

// controlKinds reads --kinds, or gives the default kinds of k controls.
func (f *fitFlags) controlKinds(k int) ([]gauged.ControlKind, error) {
	out := make([]gauged.ControlKind, k)
	if f.kinds == "" {
		for j := range out {
			switch {
			case j == 0 && f.controlSection != "":
				out[j] = gauged.SectionControl
			case f.section != "" || f.hydraulicTable != "":
				out[j] = gauged.ChannelControl
			}
		}
		return out, nil
	}
	words := strings.Split(f.kinds, ",")
	if len(words) != k {
		return nil, usagef("fit: --kinds gives %d kinds for %d controls", len(words), k)
	}
	for j, w := range words {
		kind, err := gauged.ParseControlKind(w)
		if err != nil {
			return nil, usagef("fit: --kinds: %v", err)
		}
		out[j] = kind
	}
	return out, nil
}

// controlJoints reads --joints: one word per control above the first, or
// one per control with the first "replace".
func (f *fitFlags) controlJoints(k int) ([]gauged.Joint, error) {
	out := make([]gauged.Joint, k)
	if f.joints == "" {
		return out, nil
	}
	words := strings.Split(f.joints, ",")
	if len(words) == k && k > 1 {
		if j, err := gauged.ParseJoint(words[0]); err != nil || j != gauged.Replace {
			return nil, usagef("fit: --joints %q: the first control joins nothing; give one word per control above the first", f.joints)
		}
		words = words[1:]
	}
	if len(words) != k-1 {
		return nil, usagef("fit: --joints gives %d joints for %d controls (one per control above the first)", len(words), k)
	}
	for j, w := range words {
		joint, err := gauged.ParseJoint(w)
		if err != nil {
			return nil, usagef("fit: --joints: %v", err)
		}
		out[j+1] = joint
	}
	return out, nil
}

// zeroFlowOption reads --zero-flow.
func (f *fitFlags) zeroFlowOption(opt *gauged.Options) error {
	switch z := strings.ToLower(strings.TrimSpace(f.zeroFlow)); z {
	case "auto", "":
	case "control":
		if f.section == "" && f.hydraulicTable == "" {
			return usagef("fit: --zero-flow control needs --section SURVEY or --hydraulic-rating TABLE")
		}
		opt.ZeroFlowControl = true
	default:
		v, err := strconv.ParseFloat(z, 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
			return usagef("fit: --zero-flow %q: want auto, control or a gauge height", f.zeroFlow)
		}
		opt.Controls.OffsetFixed, opt.Controls.Offset, opt.Controls.OffsetSource = true, v, "given"
	}
	return nil
}

// periodHolds checks that the rating period of --period holds at least
// one of the gaugings read from path, for a fit or a comparison alone: a
// period holding none is an error naming the flag, its value and the
// times the gaugings span.
func (f *fitFlags) periodHolds(path string, gs []gauged.Gauging, opt gauged.Options) error {
	sel := opt.Controls.Selection
	if sel.From.IsZero() && sel.To.IsZero() {
		return nil
	}
	period := gauged.Selection{From: sel.From, To: sel.To}
	var first, last time.Time
	for _, g := range gs {
		switch period.Reason(g) {
		case gauged.ReasonBeforePeriod, gauged.ReasonAfterPeriod:
		default:
			return nil
		}
		if g.Time.IsZero() {
			continue
		}
		if first.IsZero() || g.Time.Before(first) {
			first = g.Time
		}
		if last.IsZero() || g.Time.After(last) {
			last = g.Time
		}
	}
	span := "none of them has a time"
	if !first.IsZero() {
		span = fmt.Sprintf("they run from %s to %s", gauged.TimeText(first, opt.UTCOffset), gauged.TimeText(last, opt.UTCOffset))
	}
	return fmt.Errorf("fit: --period %s: none of the %d gaugings of %s falls in it (%s): %w", strings.TrimSpace(f.period), len(gs), path, span, gauged.ErrFewGaugings)
}

// excludesMatch checks that every time of --exclude is the time of one
// of the gaugings read from path (the same instant, whatever offset each
// is written with): a time matching none, most likely mistyped, is an
// error (wrapping gauged.ErrExcludeUnmatched) naming it as read and the
// nearest gauging's time, one line per such time.
func excludesMatch(path string, gs []gauged.Gauging, opt gauged.Options) error {
	var errs []error
	for _, m := range opt.Controls.Selection.Unmatched(gs) {
		near := "none of them has a time"
		if !m.Nearest.IsZero() {
			near = "the nearest is at " + gauged.TimeText(m.Nearest, opt.UTCOffset)
		}
		errs = append(errs, fmt.Errorf("fit: --exclude %s: %s: %w (%s): check the time against the file",
			gauged.TimeText(m.Time, opt.UTCOffset), path, gauged.ErrExcludeUnmatched, near))
	}
	return errors.Join(errs...)
}

// belowZeroFlow words a gauge height of zero flow from --zero-flow that
// lies at or above gaugings to be fitted: one line naming the flag, its
// value, the lowest gauging concerned and why.
func (f *fitFlags) belowZeroFlow(e *gauged.BelowZeroError) error {
	L := e.Units.Length()
	what := fmt.Sprintf("--zero-flow %s", strings.TrimSpace(f.zeroFlow))
	if strings.EqualFold(strings.TrimSpace(f.zeroFlow), "control") {
		what = fmt.Sprintf("--zero-flow control (%s %s from %s)", rating.PlainFigures(e.ZeroFlow, 6), L, e.Source)
	}
	return fmt.Errorf("fit: %s: %d of the %d gaugings used lie at or below it, the lowest %s at %s %s, where a rating has no discharge (%w); give a value below every gauging fitted, or auto to fit it",
		what, e.Count, e.Used, e.Lowest, rating.PlainFigures(e.Stage, 6), L, gauged.ErrBelowZero)
}

// parseTime reads a time of --period or --exclude in the forms of
// survey.ParseISOTime, a time written without an offset taken at
// --utc-offset (UTC by default), as the gaugings' times are.
func (f *fitFlags) parseTime(s string) (time.Time, error) {
	return survey.ParseISOTime(s, time.Duration(f.offset))
}

// selection reads --exclude and --period; given says --period was on the
// command line, where an empty value is refused.
func (f *fitFlags) selection(given bool) (gauged.Selection, error) {
	var sel gauged.Selection
	if f.exclude != "" {
		for _, s := range strings.Split(f.exclude, ",") {
			t, err := f.parseTime(s)
			if err != nil {
				return sel, usagef("fit: --exclude %q: %v", strings.TrimSpace(s), err)
			}
			sel.Exclude = append(sel.Exclude, t)
		}
	}
	if strings.TrimSpace(f.period) == "" {
		if given {
			return sel, usagef("fit: --period is empty: want FROM..TO (either end may be left open), or leave --period out to fit every gauging")
		}
		return sel, nil
	}
	from, to, ok := strings.Cut(f.period, "..")
	if ok && strings.TrimSpace(from) == "" && strings.TrimSpace(to) == "" {
		return sel, usagef("fit: --period %q has neither end: want FROM..TO with at least one of them, or leave --period out to fit every gauging", f.period)
	}
	if !ok {
		return sel, usagef("fit: --period %q: want FROM..TO (either end may be left open)", f.period)
	}
	var err error
	if s := strings.TrimSpace(from); s != "" {
		if sel.From, err = f.parseTime(s); err != nil {
			return sel, usagef("fit: --period from %q: %v", s, err)
		}
	}
	if s := strings.TrimSpace(to); s != "" {
		if sel.To, err = f.parseTime(s); err != nil {
			return sel, usagef("fit: --period to %q: %v", s, err)
		}
		if len(s) == len(time.DateOnly) {
			sel.To = sel.To.AddDate(0, 0, 1) // the whole of that day: up to the next day's start
		}
	}
	if !sel.From.IsZero() && !sel.To.IsZero() && !sel.To.After(sel.From) {
		return sel, usagef("fit: --period %q: the end is not after the start", f.period)
	}
	return sel, nil
}
