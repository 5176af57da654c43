package gauged

import (
	"cmp"
	"errors"
	"math"
	"time"

	"gonum.org/v1/gonum/stat/distuv"

	"wetline/rating"
)

// Options configure a gaugings report. The zero value fits one control of
// unknown kind by least squares, with its offset fitted and no section.
type Options struct {
	// Site names the gaugings in reports (their site, or their file);
	// Section names the section of Hydraulic ("" without, or unnamed).
	Site, Section string
	// Units is the unit system of stages and discharges.
	Units rating.Units
	// Hydraulic is the section's hydraulic rating at gauge heights (its
	// Datum relates gauge height to elevation); nil without a section.
	Hydraulic *rating.HydraulicCurve
	// DatumGiven says that Hydraulic's Datum was given, not left at 0
	// (gauge heights read as the survey's elevations); reports say which.
	DatumGiven bool
	// HydraulicTable is a hydraulic rating given as a table at gauge
	// heights (a section's or a step-backwater rating read from a file),
	// used instead of a section: comparison, extension, prior and the
	// Hydraulic column, but no n back-calculation. Ignored when Hydraulic
	// is set.
	HydraulicTable *TableRating
	// Crest is a surveyed crest section of a section control (riffle, weir
	// crest; its Datum relates it to the gauge): the prior of section
	// controls of a Bayesian fit. Nil: none.
	Crest *rating.HydraulicCurve
	// ChannelOnly back-calculates only the channel's n.
	ChannelOnly bool
	// CompareOnly compares the gaugings with the hydraulic rating and
	// fits nothing (needs Hydraulic or HydraulicTable).
	CompareOnly bool
	// ZeroFlowControl fixes the first control's offset at the section's
	// lowest point, or the table's zero-flow stage (its zero-flow stage or
	// dry first row; ErrTableFlowsAtFoot without either); it overrides
	// Controls' offset fields.
	ZeroFlowControl bool
	// Method is how the rating is fitted (default LeastSquares).
	Method Method
	// Controls are the controls, breakpoints, first offset and selection
	// of gaugings (its Units are set from above).
	Controls ControlOptions
	// Bayes configures a Bayesian fit: its ControlOptions, Hydraulic,
	// HydraulicTable and Crest are set from above; the rest as given.
	Bayes BayesOptions
	// Table configures the table (its Hydraulic and HydraulicTable are
	// set from above).
	Table ControlTableOptions
	// Lookup also evaluates the table's rule at every hundredth of stage
	// (Report.Lookup), for a printed lookup sheet.
	Lookup bool
	// Floodplain lets a Bayesian fit of one control on a section with
	// overbanks, whose table goes above the bank stage (BankStage), add a
	// second control there that adds to the first: a floodplain joining
	// the channel, its prior from the overbanks' share of the hydraulic
	// rating and its breakpoint's from the bank stage, so that the table
	// above the gaugings follows the floodplain instead of one power law.
	// Given breakpoints turn it off.
	Floodplain bool
	// UTCOffset is the offset from UTC (east positive) at which reports and
	// warnings write the times of gaugings (TimeText); zero writes each as
	// read.
	UTCOffset time.Duration
}

// CurvePoint is the hydraulic rating at one gauge height.
type CurvePoint struct {
	// Stage is the gauge height (length unit).
	Stage float64
	// Hydraulic is the discharge with the survey's n (or the table's);
	// Calibrated with n times the calibration factor (NaN without a
	// calibration).
	Hydraulic, Calibrated float64
}

// MoreControlsTest is the F test of one more control: whether a rating of
// one more control (a channel control replacing the top one, its
// breakpoint fitted), fitted by least squares, cuts the residual sum of
// squares by more than chance would,
//
//	F = ((SSR_k − SSR_k+1)/(p_k+1 − p_k)) / (SSR_k+1/(n − p_k+1)),
//
// with SSR_k the weighted sum of squares in ln Q of k controls and p their
// parameters (nested models; common practice).
type MoreControlsTest struct {
	// Made reports that the test was made (breakpoints fitted, fewer than
	// MaxControls controls, enough gaugings).
	Made bool
	// Controls is the number of controls tested against one more.
	Controls int
	// F is the statistic and P its p-value (NaN when not made).
	F, P float64
	// StandardErrorPercent is the standard error of estimate with one
	// more control (NaN when not made).
	StandardErrorPercent float64
	// Poor reports P < PoorFitLevel: the rating has too few controls.
	Poor bool
}

// Report holds everything a report on gaugings shows: the comparison with
// the hydraulic rating, the back-calculated n, the fit of the rating of
// controls with its tests, the table with both bands and the hydraulic
// curve, for text, JSON, CSV, workbook and plot writers alike. Fields that
// do not apply are nil.
type Report struct {
	// Site, Section (Options.Site and Options.Section), Units and Datum
	// (elevation of the gauge's zero in the survey's datum, length unit;
	// NaN without a section) describe the data.
	Site, Section string
	Units         rating.Units
	Datum         float64
	// DatumGiven is Options.DatumGiven.
	DatumGiven bool
	// Slope is the friction slope of the hydraulic rating (dimensionless;
	// NaN without a section).
	Slope float64
	// HydraulicSource names the hydraulic rating: "section NAME",
	// "table NAME" or "" without one.
	HydraulicSource string
	// Gaugings are the measurements, in input order.
	Gaugings []Gauging
	// Selection is how the gaugings fitted were chosen.
	Selection Selection
	// Comparison needs a hydraulic rating; Calibration a section.
	Comparison  *Comparison
	Calibration *Calibration
	// Method is the fit's method.
	Method Method
	// Fit and Table are nil in comparison-only mode.
	Fit   *ControlFit
	Table *ControlTable
	// MoreControls is the F test of one more control.
	MoreControls MoreControlsTest
	// Prior is the rating of a Bayesian fit's prior means (nil without
	// informative priors; see ControlFit.PriorRating).
	Prior *Rating
	// BankStage is the gauge height where the section's overbanks start
	// to flow (length unit; NaN without a section or overbanks).
	BankStage float64
	// FloodplainAdded reports the control added by Options.Floodplain.
	FloodplainAdded bool
	// Curve is the hydraulic rating from its lowest point to its top, at
	// round gauge heights (the table's own rows for a table; nil
	// without).
	Curve []CurvePoint
	// Warnings gathers the warnings of every part.
	Warnings []string
	// Hydraulic and HydraulicTable are the hydraulic rating the report was
	// made with (nil without).
	Hydraulic      *rating.HydraulicCurve
	HydraulicTable *TableRating
	// Lookup is the table's rule at every hundredth of stage from the
	// first offset to the table's top (see Options.Lookup), without bands;
	// nil when not asked for.
	Lookup []ControlRow
	// UTCOffset is Options.UTCOffset: reports write the times of gaugings
	// at it (TimeText).
	UTCOffset time.Duration
	// Provenance says what the report was computed from.
	Provenance rating.Provenance
	// Figures are the report's pictures (none until drawn).
	Figures []rating.Figure

	joins []rating.PocketJoin // where the hydraulic rating steps (see joinWarnings)
}

// UncertaintyConvention states, for every report, how a gauging's
// uncertainty enters a fit: the convention of Gauging.LogSigma.
func UncertaintyConvention() string {
	return sayf("each gauging's uncertainty is its uncertainty column (percent at 95 %%) or else its quality grade read as a 95 %% expanded uncertainty "+
		"(excellent %g %%, good %g %%, fair %g %%, poor %g %%, unrated %g %%): σ = U/%.2f in ln Q",
		rating.Excellent.WeightPercent(), rating.Good.WeightPercent(), rating.Fair.WeightPercent(),
		rating.Poor.WeightPercent(), rating.Unrated.WeightPercent(), CoverageFactor95)
}

// UncertaintyPercent is the gauging's expanded uncertainty at the 95 %
// level in percent of its discharge, as a fit uses it: its Uncertainty,
// or else its quality's band (see LogSigma).
func (g Gauging) UncertaintyPercent() float64 {
	if g.Uncertainty > 0 {
		return g.Uncertainty
	}
	return g.Quality.WeightPercent()
}

// Outside reports whether a departure (percent) of the gauging's
// discharge from a rating lies outside the gauging's band: its own
// uncertainty when one is given (percent at 95 %), else its quality's
// (rating.Quality.Outside: an unrated gauging is held to the fair band, as
// a fit weights it, and a poor one is never outside). The band is the one
// UncertaintyPercent gives, which the fit figure draws as the error bar.
func (g Gauging) Outside(departurePercent float64) bool {
	if g.Uncertainty > 0 {
		return math.Abs(departurePercent) > g.Uncertainty
	}
	return g.Quality.Outside(departurePercent)
}

// ErrNoHydraulic is returned for a report that needs a hydraulic rating
// (comparison only, the offset from the survey) and has none.
var ErrNoHydraulic = errors.New("this needs a section or a hydraulic rating table")

// ErrTableFlowsAtFoot is returned for the offset from the survey's control
// (Options.ZeroFlowControl) taken from a hydraulic rating table that does
// not say where its flow starts: no zero-flow stage, and its first row
// carries discharge (a step-backwater ladder), so that row is no gauge
// height of zero flow.
var ErrTableFlowsAtFoot = errors.New("the hydraulic rating table does not say where its flow starts")

// ErrGaugingsOutsideSection is returned when no gauging lies within the
// section's stage range: the datum relating gauge heights to the survey's
// elevations is likely missing or wrong.
var ErrGaugingsOutsideSection = errors.New("no gauging lies within the section's stage range")

// ErrGaugingFarBelowSection is the cause of a gauging with flow that lies
// further below the section's lowest point than the section is high: no
// water flows through the section there, and no scour or missed pool
// puts the bed so deep, so its gauge height or the datum is a slip.
var ErrGaugingFarBelowSection = errors.New("a gauging with flow lies far below the section")

// Analyze compares, calibrates and fits gaugings as opt says: the
// comparison with the hydraulic rating (a section's or a table's;
// Compare, CompareTable), the n back-calculation (a section; Calibrate),
// the fit of a rating of controls by least squares (FitControls) or
// Bayesian inference (FitBayes), the F test of one more control
// (MoreControlsTest), the table with both 95 % bands on every row
// (ControlFit.Table) and, when asked, the lookup at every hundredth of
// stage. Stages are gauge heights in the length unit of opt.Units (a
// section's Datum relates its elevations to them) and discharges are in
// its discharge unit. The report gathers the warnings of every part; a
// calibration that finds no gauging to use, or whose best factor makes n
// implausible (PlausibleN.Check, which rate's calibration refuses: here
// the calibration is left out of the report), and a lookup out of range,
// are warnings, not errors.
//
// Preconditions: CompareOnly and ZeroFlowControl need opt.Hydraulic or
// opt.HydraulicTable.
//
// Errors: ErrNoHydraulic when they have neither, ErrTableFlowsAtFoot for
// ZeroFlowControl on a table whose first row flows, and the errors of the
// parts (the comparison, the calibration, the fit, the table and the
// lookup).
//
// References:
//
//	ISO 18320:2020. Hydrometry — Measurement of liquid flow in open
//	channels — Determination of the stage–discharge relationship.
//	International Organization for Standardization, Geneva.
//	Le Coz, J., Renard, B., Bonnifait, L., Branger, F., Le Boursicaud, R.
//	(2014). Combining hydraulic knowledge and uncertain gaugings in the
//	estimation of hydrometric rating curves: a Bayesian approach.
//	Journal of Hydrology 509, 573–587.
func Analyze(gs []Gauging, opt Options) (*Report, error) {
	opt.Controls.Selection.UTCOffset = opt.UTCOffset
	ref := referenceOf(opt.Hydraulic, opt.HydraulicTable)
	r := &Report{Hydraulic: ref.sec, HydraulicTable: ref.tab, Site: opt.Site, Section: opt.Section, Units: opt.Units, Datum: math.NaN(), Slope: math.NaN(),
		Gaugings: gs, Selection: opt.Controls.Selection, Method: opt.Method, BankStage: math.NaN(), DatumGiven: opt.DatumGiven, UTCOffset: opt.UTCOffset}
	if !ref.ok() && (opt.CompareOnly || opt.ZeroFlowControl) {
		return nil, errorf("comparison with a hydraulic rating and the offset from the survey's control: %w", ErrNoHydraulic)
	}
	if err := r.compare(gs, ref, opt); err != nil {
		return nil, err
	}
	if opt.CompareOnly {
		r.Warnings = append(r.Warnings, r.joinWarnings()...)
		return r, nil
	}
	co := opt.Controls
	co.Units = opt.Units
	if r.wantFloodplain(opt) {
		kind := ChannelControl
		if len(co.Controls) == 1 && co.Controls[0].Kind != UnknownControl {
			kind = co.Controls[0].Kind
		}
		co.Controls = []ControlSpec{{Kind: kind}, {Kind: ChannelControl, Joint: Add}}
		r.FloodplainAdded = true
	}
	if opt.ZeroFlowControl && ref.sec == nil && !tableStartsDry(ref.tab) {
		lo, _ := ref.tab.Range()
		return nil, errorf("the offset from the survey's control: %w: %s has no zero-flow stage and its first row, at gauge height %s %s, carries %s %s",
			ErrTableFlowsAtFoot, ref.tab.Name(), gh(lo), opt.Units.Length(), rating.PlainFigures(ref.tab.q[0], 4), opt.Units.Discharge())
	}
	if opt.ZeroFlowControl {
		co.OffsetFixed, co.Offset = true, ref.bottom()
		co.OffsetSource = "survey control (the section's lowest point)"
		if ref.tab != nil {
			co.OffsetSource = "the hydraulic rating table's zero flow"
		}
	}
	f, err := fitReport(gs, co, opt)
	if err != nil {
		return nil, err
	}
	r.Fit = f
	r.Warnings = append(r.Warnings, f.Warnings...)
	if pr, ok := f.PriorRating(); ok {
		r.Prior = &pr
	}
	r.MoreControls = moreControls(gs, co, f)
	if m := r.MoreControls; m.Poor {
		by := ""
		if f.Method == Bayesian {
			by = ", a least-squares test"
		}
		r.Warnings = append(r.Warnings, sayf(
			"%s %s these gaugings poorly: one more cuts the standard error to %.1f %% (F = %.1f, p = %.2g < %g%s); the control likely changes with stage: fit more controls",
			rating.Counted(m.Controls, "control", "controls"), rating.Agree(m.Controls, "fits", "fit"), m.StandardErrorPercent, m.F, m.P, PoorFitLevel, by))
	}
	to := opt.Table
	to.Hydraulic, to.HydraulicTable = ref.sec, ref.tab
	t, err := f.Table(to)
	if err != nil {
		return nil, err
	}
	r.Table = &t
	r.Warnings = append(r.Warnings, t.Warnings...)
	r.Warnings = append(r.Warnings, r.floodplainWarnings()...)
	r.Warnings = append(r.Warnings, r.joinWarnings()...)
	if opt.Lookup {
		r.Lookup, err = LookupControlRows(&t)
		if errors.Is(err, rating.ErrLookupRange) {
			r.Warnings = append(r.Warnings, sayf("no lookup table: %v", err))
		} else if err != nil {
			return nil, err
		}
	}
	return r, nil
}

// compare fills the comparison, calibration, curve and bank stage.
func (r *Report) compare(gs []Gauging, ref reference, opt Options) error {
	switch {
	case ref.sec != nil:
		c := ref.sec
		r.Datum, r.Slope = c.Datum, c.Options.Slope
		if err := withinSection(gs, *c); err != nil {
			return err
		}
		if err := farBelowSection(gs, *c); err != nil {
			return err
		}
		r.HydraulicSource = "section"
		if name := cmp.Or(opt.Section, opt.Site); name != "" {
			r.HydraulicSource += " " + name
		}
		cmp, err := Compare(gs, *c)
		if err != nil {
			return err
		}
		cmp.summariseOver(opt.Controls.Selection)
		r.Comparison = &cmp
		r.Warnings = append(r.Warnings, cmp.Warnings...)
		if w := cmp.farOffWarning(); w != "" {
			r.Warnings = append(r.Warnings, w)
		}
		cal, err := calibrate(gs, *c, opt.ChannelOnly, opt.Controls.Selection)
		if err != nil && !errors.Is(err, ErrCalibrate) {
			return err
		}
		if err == nil {
			err = PlausibleN.Check(cal, *c) // as rate --calibrate refuses it, a warning here: the fit does not rest on it
		}
		r.Warnings = append(r.Warnings, cal.Warnings...)
		if err == nil {
			r.Calibration = &cal
		} else {
			r.Warnings = append(r.Warnings, err.Error())
		}
		if bank, ok, err := BankStage(*c); err == nil && ok {
			r.BankStage = bank
		}
		return r.curve(c)
	case ref.tab != nil:
		r.HydraulicSource = "table " + ref.tab.Name()
		cmp := CompareTable(gs, ref.tab)
		cmp.summariseOver(opt.Controls.Selection)
		r.Comparison = &cmp
		r.Warnings = append(r.Warnings, cmp.Warnings...)
		if w := cmp.farOffWarning(); w != "" {
			r.Warnings = append(r.Warnings, w)
		}
		for _, p := range ref.tab.table.Points {
			r.Curve = append(r.Curve, CurvePoint{Stage: p.Stage, Hydraulic: p.Discharge, Calibrated: math.NaN()})
		}
	}
	return nil
}

// wantFloodplain reports whether Options.Floodplain adds a control.
func (r *Report) wantFloodplain(opt Options) bool {
	co := opt.Controls
	if !opt.Floodplain || opt.Method != Bayesian || r.Hydraulic == nil || math.IsNaN(r.BankStage) || co.Breaks != nil || len(co.Controls) > 1 {
		return false
	}
	top := r.Hydraulic.Top()
	if opt.Table.To != 0 {
		top = opt.Table.To
	}
	return top > r.BankStage
}

// fitReport fits the rating by the options' method.
func fitReport(gs []Gauging, co ControlOptions, opt Options) (*ControlFit, error) {
	if opt.Method == Bayesian {
		bo := opt.Bayes
		bo.ControlOptions = co
		bo.Hydraulic, bo.HydraulicTable, bo.Crest = opt.Hydraulic, opt.HydraulicTable, opt.Crest
		if bo.Hydraulic != nil {
			bo.HydraulicTable = nil
		}
		return FitBayes(gs, bo)
	}
	return FitControls(gs, co)
}

// moreControls makes the F test of one more control by least squares.
func moreControls(gs []Gauging, co ControlOptions, f *ControlFit) MoreControlsTest {
	k := len(f.Rating.Controls)
	t := MoreControlsTest{Controls: k, F: math.NaN(), P: math.NaN(), StandardErrorPercent: math.NaN()}
	if co.Breaks != nil || k >= MaxControls || f.N < (k+1)*MinPerSegment {
		return t
	}
	base := f
	if f.Method != LeastSquares {
		var err error
		if base, err = FitControls(gs, co); err != nil {
			return t
		}
	}
	more := co
	more.Controls = append(specsOf(co, k), ControlSpec{Kind: ChannelControl})
	g, err := FitControls(gs, more)
	if err != nil {
		return t
	}
	ssr := base.StandardErrorLog * base.StandardErrorLog * float64(base.N-base.Params)
	ssr2 := g.StandardErrorLog * g.StandardErrorLog * float64(g.N-g.Params)
	d1, d2 := float64(g.Params-base.Params), float64(g.N-g.Params)
	if !(ssr2 > 0) || !(ssr2 < ssr) || !(d1 > 0) || !(d2 > 0) || ssr <= fitZeroSSR*float64(base.N) {
		return t
	}
	t.Made = true
	t.F = ((ssr - ssr2) / d1) / (ssr2 / d2)
	t.P = distuv.F{D1: d1, D2: d2}.Survival(t.F)
	t.StandardErrorPercent = g.StandardErrorPercent
	t.Poor = t.P < PoorFitLevel
	return t
}

// specsOf returns the options' control specs, k of them (unknown kinds
// when none were given).
func specsOf(co ControlOptions, k int) []ControlSpec {
	if len(co.Controls) == k {
		return append([]ControlSpec(nil), co.Controls...)
	}
	return make([]ControlSpec, k)
}

// floodplainWarnings warns when the table carries the fitted controls,
// not the hydraulics, above the gaugings and the hydraulic rating there
// parts from them: the hydraulic rating scaled to meet the fit at the
// highest gauging leaves the total band (or, without bands, differs by
// more than the fit's standard error twice over), the mark of a shape a
// power law carried on does not follow (a floodplain, a change of
// control). With the section's bank stage below the table's top it says
// so.
func (r *Report) floodplainWarnings() []string {
	f, t := r.Fit, r.Table
	if t.Extension != nil || len(t.Rows) == 0 || !(r.Hydraulic != nil || r.HydraulicTable != nil) {
		return nil
	}
	for _, c := range f.Rating.Controls[1:] {
		if c.Joint == Add {
			return nil
		}
	}
	ref := referenceOf(r.Hydraulic, r.HydraulicTable)
	qh, err := ref.discharge(f.HighStage)
	if err != nil || !(qh > 0) {
		return nil
	}
	scale := f.Rating.Discharge(f.HighStage) / qh
	u := r.Units
	for _, row := range t.Rows {
		if row.Basis != FitAboveGaugings || !(row.Hydraulic > 0) {
			continue
		}
		q := scale * row.Hydraulic
		lo, hi := row.TotalLower, row.TotalUpper
		if math.IsNaN(lo) || math.IsNaN(hi) {
			d := 2 * f.StandardErrorLog
			lo, hi = row.Discharge*math.Exp(-d), row.Discharge*math.Exp(d)
		}
		if q >= lo && q <= hi {
			continue
		}
		msg := sayf("above the highest gauging the table carries the fitted controls on, but at %.4g %s the hydraulic rating scaled to meet them at the highest gauging gives %.4g %s, outside their total band (%.4g to %.4g %s): one power law carried on does not follow the hydraulics",
			row.Stage, u.Length(), q, u.Discharge(), lo, hi, u.Discharge())
		if !math.IsNaN(r.BankStage) && r.BankStage < t.Rows[len(t.Rows)-1].Stage {
			msg += sayf("; the overbanks start to flow at %.3g %s: fit a control that adds there", r.BankStage, u.Length())
		} else {
			msg += "; fit another control, or extend by conveyance-slope (least squares)"
		}
		return []string{msg}
	}
	return nil
}

// curve fills the hydraulic curve at round gauge heights.
func (r *Report) curve(c *rating.HydraulicCurve) error {
	lo, hi := c.Bottom(), c.Top()
	step := rating.NiceStep((hi - lo) / rating.MaxDefaultRows)
	hs := []float64{lo}
	for i := math.Floor(lo/step) + 1; i*step < hi; i++ {
		hs = append(hs, i*step)
	}
	hs = append(hs, hi)
	elev := make([]float64, len(hs))
	for i, h := range hs {
		elev[i] = h + c.Datum
	}
	t, err := rating.Compute(c.Geometry, elev, c.Options)
	if err != nil {
		return err
	}
	r.Warnings = append(r.Warnings, dropJoinWarnings(t, c.Options.Units)...)
	r.joins = t.Joins
	var ct rating.Table
	if r.Calibration != nil {
		sc := rating.ScaledN{Geometry: c.Geometry, Factor: r.Calibration.Factor, ChannelOnly: r.Calibration.ChannelOnly}
		if ct, err = rating.Compute(sc, elev, c.Options); err != nil {
			return err
		}
	}
	for i, h := range hs {
		p := CurvePoint{Stage: h, Hydraulic: t.Rows[i].Discharge, Calibrated: math.NaN()}
		if ct.Rows != nil {
			p.Calibrated = ct.Rows[i].Discharge
		}
		r.Curve = append(r.Curve, p)
	}
	return nil
}

// farBelowSection refuses each gauging kept for the fit (Exclude blank)
// whose discharge is above zero at a gauge height further below the
// section's lowest point than the section is high, from its lowest point
// to its lower end (ErrGaugingFarBelowSection, naming each): the check
// every fit on a section passes, by least squares or Bayesian inference,
// before either starts. A gauging nearer the bed is warned of by Compare.
func farBelowSection(gs []Gauging, c rating.HydraulicCurve) error {
	bottom, top := c.Bottom(), c.Top()
	var errs []error
	for _, g := range gs {
		if g.Exclude == "" && g.Discharge > 0 && bottom-g.Stage > top-bottom {
			errs = append(errs, errorf("%w: %s: gauge height %g (elevation %g at datum %g) with %g %s is %s %s below the section's lowest point (%s on the gauge), which is %s %s high: check the gauge height and --datum",
				ErrGaugingFarBelowSection, g.label(), g.Stage, g.Stage+c.Datum, c.Datum, g.Discharge, c.Options.Units.Discharge(),
				rating.PlainFigures(bottom-g.Stage, 4), c.Options.Units.Length(), gh(bottom), rating.PlainFigures(top-bottom, 3), c.Options.Units.Length()))
		}
	}
	return errors.Join(errs...)
}

// withinSection returns ErrGaugingsOutsideSection, with the ranges, when no
// gauging's gauge height lies between the section's lowest and highest
// points (c.Bottom() ≤ h ≤ c.Top(), gauge heights).
func withinSection(gs []Gauging, c rating.HydraulicCurve) error {
	if len(gs) == 0 {
		return nil
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, g := range gs {
		if g.Stage >= c.Bottom() && g.Stage <= c.Top() {
			return nil
		}
		lo, hi = math.Min(lo, g.Stage), math.Max(hi, g.Stage)
	}
	return errorf("%w: gauge heights %g to %g are elevations %g to %g at datum %g, and the section runs from %g to %g",
		ErrGaugingsOutsideSection, lo, hi, lo+c.Datum, hi+c.Datum, c.Datum, c.Geometry.Bottom(), c.Geometry.Top())
}
