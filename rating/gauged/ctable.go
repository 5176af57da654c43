package gauged

import (
	"errors"
	"math"
	"sort"

	"gonum.org/v1/gonum/mat"

	"wetline/rating"
)

// ExtrapolationWarnMultiple is the multiple of the largest gauged
// discharge past which a table warns (common practice: a rating is not
// carried beyond about twice the largest measured discharge without a
// hydraulic basis).
const ExtrapolationWarnMultiple = 2.0

// ControlRow is one row of a table of a rating of controls.
type ControlRow struct {
	// Stage is the gauge height (length unit); Discharge the table's value
	// (discharge unit): the fitted rating (least squares, or the posterior
	// mode), or the conveyance-slope extension.
	Stage, Discharge float64
	// ParametricLower and ParametricUpper (discharge unit) bound the 95 %
	// band of the relation: least squares, the band of the mean relation; Bayesian,
	// the quantiles of the rating over the posterior draws.
	ParametricLower, ParametricUpper float64
	// TotalLower and TotalUpper (discharge unit) bound the 95 % total
	// band: least squares,
	// the prediction band of one gauging (the relation plus the standard
	// error of estimate); Bayesian, the relation plus the remnant error.
	// NaN where not available (at or below the offset, bands withheld).
	TotalLower, TotalUpper float64
	// Basis says what the row rests on.
	Basis Basis
	// Multiple is Discharge over the largest gauged discharge
	// (dimensionless), on rows above the highest gauging (NaN on the
	// others).
	Multiple float64
	// Hydraulic is the section's hydraulic discharge (discharge unit; NaN
	// without a section).
	Hydraulic float64
	// OverbankShare is φ_ob(h), the overbank subsections' share of the
	// section's conveyance at the row's gauge height, on rows of the
	// conveyance-slope extension (ConveyanceSlopeAbove): with the join's
	// share it gives the row's allowance for Manning's n off the channel
	// (see ConveyanceSlope.At). 0 on a reference without overbanks (a
	// table, a section without bank stations); NaN on rows of other bases.
	OverbankShare float64
}

// Extrapolated reports a row outside the range of the gaugings.
func (r ControlRow) Extrapolated() bool { return r.Basis != WithinGaugings }

// ControlTableOptions configure a table of a rating of controls. The zero
// value lays out about rating.MaxDefaultRows round stages from the first
// offset to the highest gauging, or to the section's lower end when a
// hydraulic rating is given.
type ControlTableOptions struct {
	// Step is the stage step (length unit, > 0; default a round step).
	Step float64
	// To is the highest stage (gauge height; 0 = default). With a
	// hydraulic rating it may not lie above the higher of its top (the
	// section's lower end, the table's last row) and the highest gauging;
	// without one, rows above the highest gauging carry the fitted rating
	// on.
	To float64
	// Hydraulic is the section's hydraulic rating: the conveyance-slope
	// extension of a least-squares fit above the highest gauging, the
	// Hydraulic column and the default top.
	Hydraulic *rating.HydraulicCurve
	// HydraulicTable, used when Hydraulic is nil, is a hydraulic rating
	// given as a table at gauge heights, in the same roles (its discharge
	// standing in for the conveyance; see FitConveyanceSlopeTable).
	HydraulicTable *TableRating
	// ExtensionGaugings is the number of highest gaugings the
	// conveyance-slope extension is fitted to (0: those on the top
	// control, or the upper half of the gauged stages with one control;
	// at least ConveyanceSlopeMin).
	ExtensionGaugings int
	// ShowUnconverged gives a Bayesian fit's bands even when its chains
	// disagree (R̂ above RHatLimit); by default they are withheld.
	ShowUnconverged bool
}

// ControlTable is a stage–discharge table of a rating of controls with
// both bands on every row.
type ControlTable struct {
	// Method is the fit's method.
	Method Method
	// Rows ascend in stage.
	Rows []ControlRow
	// Extension is the conveyance-slope extension (least squares with a
	// section; nil otherwise).
	Extension *ConveyanceSlope
	// MaxDischarge is the largest gauged discharge fitted (discharge
	// unit); MaxMultiple the largest Multiple of the table (NaN when no
	// row is above the gaugings).
	MaxDischarge, MaxMultiple float64
	// BandsWithheld reports bands left out because the chains disagree.
	BandsWithheld bool
	// BandNote says what the two bands are, in words.
	BandNote string
	// AboveNote says what the rows above the highest gauging rest on, in
	// words ("" when the table stops there).
	AboveNote string
	// Warnings are facts a reviewer should see.
	Warnings []string

	fit  *ControlFit
	hyd  reference
	held heldLower
}

// heldLowerSteps is the number of stage steps from the highest gauging to
// the table's top on which the lower bands of a joined extension are held.
const heldLowerSteps = 512

// heldLower holds the lower bands of a joined conveyance-slope extension
// at the highest value they reach below a stage: discharge does not fall
// as stage rises, so a lower limit at one stage bounds every stage above
// it, and the widening of the bands (ConveyanceSlope.At) may not pull the
// lower limit down. p and t are the running maxima of the parametric and
// total lower limits at from + i·step.
type heldLower struct {
	from, step float64
	p, t       []float64
}

// newHeldLower lays out the running maxima of the lower limits of the
// extension e on heldLowerSteps steps from the join to top.
func newHeldLower(e *ConveyanceSlope, c reference, top float64) heldLower {
	j := e.Join
	if j == nil || !(top > j.Stage) {
		return heldLower{}
	}
	l := heldLower{from: j.Stage, step: (top - j.Stage) / heldLowerSteps}
	pMax, tMax := math.Inf(-1), math.Inf(-1)
	for i := 0; i <= heldLowerSteps; i++ {
		h := l.from + float64(i)*l.step
		if _, k, err := c.at(h); err == nil {
			_, pLo, _, tLo, _ := e.At(h, k)
			pMax, tMax = math.Max(pMax, pLo), math.Max(tMax, tLo)
		}
		l.p, l.t = append(l.p, pMax), append(l.t, tMax)
	}
	return l
}

// at returns the lower limits p and t at gauge height h held at their
// running maxima below h.
func (l heldLower) at(h, p, t float64) (float64, float64) {
	if len(l.p) == 0 || !(h > l.from) {
		return p, t
	}
	i := min(int((h-l.from)/l.step), len(l.p)-1)
	return math.Max(p, l.p[i]), math.Max(t, l.t[i])
}

// Table lays out the fitted rating as a table from the first offset, with
// the 95 % parametric and total bands on every row (see ControlRow).
// Between the gaugings and below them the rows are the fitted rating;
// above the highest gauging, a least-squares fit with a section follows
// the conveyance-slope extension (FitConveyanceSlope, every gauging of the
// upper range) joined to the fitted rating at the highest gauging
// (ConveyanceSlope.Joined: the rating and its bands are continuous there,
// the lower bands held where they would fall), a Bayesian fit or a fit
// without a section carries the rating on (the Bayesian band then widens
// as the prior allows). Rows above
// the gaugings give their discharge as a multiple of the largest gauged
// one, with a warning past ExtrapolationWarnMultiple. A To more than
// TableEdge above the limit, the higher of the section's lower end (a
// table's last row) and the highest gauging, is ErrBeyondSection, the
// message naming the limit (within TableEdge, the table stops at it).
//
// References:
//
//	Kennedy, E. J. (1984). Discharge ratings at gaging stations. USGS
//	TWRI 3-A10 (extrapolation; conveyance-slope method).
//	Le Coz, J., et al. (2014). Journal of Hydrology 509, 573–587
//	(parametric and total bands from the posterior).
func (f *ControlFit) Table(opt ControlTableOptions) (ControlTable, error) {
	c := referenceOf(opt.Hydraulic, opt.HydraulicTable)
	t := ControlTable{Method: f.Method, MaxDischarge: f.MaxDischarge, MaxMultiple: math.NaN(), fit: f, hyd: c}
	u := f.Units
	lo, top := f.Rating.Controls[0].B, f.HighStage
	end := "the section's lower end"
	if c.tab != nil {
		end = "the hydraulic rating table's last row"
	}
	if c.ok() {
		top = math.Max(top, c.top())
		if c.top() < f.HighStage {
			t.Warnings = append(t.Warnings, sayf("the highest gauging (%s %s) is above %s (%s %s on the gauge)", gh(f.HighStage), u.Length(), end, gh(c.top()), u.Length()))
		}
	}
	if opt.To != 0 {
		// A To at the section's end, as a gauge height the datum was
		// subtracted from (104.60 − 101), may lie above it by round-off:
		// within TableEdge it is the end.
		limit := math.Inf(1)
		limitWhat := ""
		if c.ok() {
			limit = math.Max(c.top(), f.HighStage)
			limitWhat = sayf("%s at %s %s", end, gh(c.top()), u.Length())
			if f.HighStage > c.top() {
				limitWhat = sayf("the highest gauging at %s %s, the table's limit since it lies above %s (%s %s)",
					gh(f.HighStage), u.Length(), end, gh(c.top()), u.Length())
			}
		}
		if opt.To > limit+TableEdge {
			return t, errorf("%w: stage %g %s is above %s", ErrBeyondSection, opt.To, u.Length(), limitWhat)
		}
		if !(opt.To > lo) {
			return t, errorf("%w: stage %g is not above the gauge height of zero flow %g", rating.ErrStages, opt.To, lo)
		}
		top = math.Min(opt.To, limit)
	}
	if f.Method == LeastSquares && c.ok() && top > f.HighStage {
		h, q, w := upperGaugings(f.d, f.Rating, opt.ExtensionGaugings)
		ext, err := fitConveyanceSlope(c, h, q, w)
		if err == nil {
			ext, err = t.join(ext)
		}
		if err != nil {
			t.Warnings = append(t.Warnings, sayf("%v: the fitted rating is carried above the gaugings instead", err))
		} else {
			t.Extension = &ext
		}
	}
	if f.Posterior != nil && !f.Posterior.Converged && !opt.ShowUnconverged {
		t.BandsWithheld = true
		t.Warnings = append(t.Warnings, sayf("bands withheld: the chains disagree (R̂ %s, above %g)", rhatIs(f.Posterior.RHatMax), RHatLimit))
	}
	t.BandNote = t.bandNote()
	if top > f.HighStage {
		t.AboveNote = t.aboveNote()
	}
	if t.Extension != nil {
		t.held = newHeldLower(t.Extension, c, top)
	}
	stages, err := tableStages(lo, top, opt.Step, []float64{f.LowStage, f.HighStage})
	if err != nil {
		return t, err
	}
	var uncovered []float64
	for _, h := range stages {
		r, err := t.row(h, true)
		if err != nil {
			return t, err
		}
		if t.hyd.ok() && math.IsNaN(r.Hydraulic) {
			uncovered = append(uncovered, h)
		}
		t.Rows = append(t.Rows, r)
		if !math.IsNaN(r.Multiple) && !(r.Multiple <= t.MaxMultiple) {
			t.MaxMultiple = r.Multiple
		}
	}
	t.Warnings = append(t.Warnings, t.extensionWarnings()...)
	if fl := f.BandFloor(); t.rowsWithin(f.Rating.Controls[0].B, fl) > 0 && !t.BandsWithheld {
		t.Warnings = append(t.Warnings, sayf("no bands below gauge height %s %s: it is the upper end of the 95 %% band of the gauge height of zero flow (%s ± %s %s, t times its standard error), below which the linearised band does not hold",
			gh(fl), f.Units.Length(), gh(f.Controls[0].B), rating.PlainFigures(fl-f.Controls[0].B, 2), f.Units.Length()))
	}
	if len(uncovered) > 0 {
		lo, hi := t.hyd.tab.Range()
		n := len(uncovered)
		t.Warnings = append(t.Warnings, sayf("%s from gauge height %.3f to %.3f %s outside the hydraulic rating table (%.3f to %.3f): %s no hydraulic discharge",
			rating.Counted(n, "row", "rows"), uncovered[0], uncovered[n-1], rating.Agree(n, "lies", "lie"), lo, hi, rating.Agree(n, "it has", "they have")))
	}
	return t, nil
}

// join ties the conveyance-slope extension to the fitted rating at the
// highest gauging (ConveyanceSlope.Joined). No conveyance there is
// ErrExtension.
func (t *ControlTable) join(e ConveyanceSlope) (ConveyanceSlope, error) {
	f := t.fit
	h := f.HighStage
	_, k, err := t.hyd.at(h)
	if err != nil {
		return e, err
	}
	q := f.Rating.Discharge(h)
	if !(k > 0) || !(q > 0) {
		return e, errorf("%w: no conveyance or fitted discharge at the highest gauging (%s)", ErrExtension, gh(h))
	}
	pLo, pHi, tLo, tHi := f.Band(h)
	return e.Joined(h, q, k, 0.5*math.Log(pHi/pLo), 0.5*math.Log(tHi/tLo)), nil
}

// BandFloor is the lowest gauge height (length unit) at which a
// least-squares fit gives bands: its first offset B₁ plus t·SE(B₁), the
// upper end of the offset's own 95 % band (B₁ when the offset is given or
// its standard error is not available; NaN for a Bayesian fit, whose
// bands need no floor).
//
// Below it the delta method fails: the gradient of ln Q in B₁,
// −C/(h − B₁), grows without bound as h falls to B₁, and the linearised
// upper bound Q·exp(t·C·SE(B₁)/(h − B₁)) has its minimum at
// h − B₁ = t·SE(B₁) and rises below it, to above the discharge of gauge
// heights far higher (in one fitted rating, 3.7 m³/s at 6 mm above zero
// flow, for a discharge of 0.0012). A band there would be read as a bound, so
// none is given.
//
// References:
//
//	Seber, G. A. F., Wild, C. J. (1989). Nonlinear Regression. Wiley,
//	chapter 5 (linearisation and its failure where the model is far from
//	linear in a parameter; from memory).
func (f *ControlFit) BandFloor() float64 {
	if f.Method == Bayesian || len(f.Controls) == 0 {
		return math.NaN()
	}
	c := f.Controls[0]
	if math.IsNaN(c.BSE) || math.IsInf(c.BSE, 0) {
		return c.B
	}
	return c.B + f.tq*c.BSE
}

// rowsWithin counts the table's rows strictly between gauge heights lo
// and hi.
func (t *ControlTable) rowsWithin(lo, hi float64) int {
	n := 0
	for _, r := range t.Rows {
		if r.Stage > lo && r.Stage < hi {
			n++
		}
	}
	return n
}

// bandNote says what the bands of the table are.
func (t *ControlTable) bandNote() string {
	if t.Method == Bayesian {
		return "parametric: 2.5 and 97.5 % quantiles of the rating over the posterior draws; total: the same with the remnant error added (the uncertainty of the rated discharge, not of a gauging)"
	}
	note := "parametric: 95 % band of the mean relation (delta method); total: 95 % prediction band of a single discharge (adds the standard error of estimate)"
	if e := t.Extension; e != nil {
		slope := "the standard error of the trend of ln S"
		if e.Level {
			slope = "the standard error of the trend of ln S that the gaugings leave open (S taken as level, p = " + sayf("%.2g", e.TrendP) + ")"
			if math.IsNaN(e.TrendP) {
				slope = "the standard error of the trend of ln S that the gaugings leave open (S constant over them)"
			}
		}
		n := sayf("and z·|Δφ|·%.3g for Manning's n of the overbanks relative to the channel's (log-normal, cv %g; φ the overbanks' share of the conveyance, Δφ its change from the join)", e.NLogSD, DefaultNCV)
		switch {
		case t.hyd.tab != nil:
			n = "(no allowance for n off the channel: a table reference has no subsections)"
		case !t.hyd.hasOverbanks():
			n = "(no allowance for n off the channel: " + noBanks + ")"
		}
		note += "; above the highest gauging, the fitted rating's bands at the join, widened along the conveyance-slope extension in quadrature by t·½·(h − h_j) times " + slope + " " + n
	}
	return note
}

// noBanks says why a section without bank stations gives the extension's
// bands no allowance for n off the channel.
const noBanks = "the section has no bank stations, so it is all channel with no overbanks; mark the banks, by a bank word in the survey's mark column or --banks, to get one"

// extensionWarnings warns of rows far above the gaugings, of a jump where
// the extension meets the fit and of bands without an allowance for n off
// the channel on a section without bank stations.
func (t *ControlTable) extensionWarnings() []string {
	var out []string
	f := t.fit
	if t.Extension != nil && t.hyd.sec != nil && !t.hyd.hasOverbanks() {
		out = append(out, "the bands above the highest gauging have no allowance for Manning's n off the channel: "+noBanks)
	}
	if t.MaxMultiple > ExtrapolationWarnMultiple {
		out = append(out, sayf("the table goes to %.1f times the largest gauged discharge (%.4g %s), past %g times (common practice): rows there rest on the %s",
			t.MaxMultiple, t.MaxDischarge, f.Units.Discharge(), ExtrapolationWarnMultiple, t.aboveWhat()))
	}
	if e := t.Extension; e != nil && e.Join != nil {
		j := e.Join
		q := j.Conveyance * math.Exp(0.5*j.GaugedLogSlope)
		if _, _, tLo, tHi := f.Band(j.Stage); q < tLo || q > tHi {
			out = append(out, sayf("at the highest gauging (%s %s) the upper gaugings' own slope S would give %.4g %s against the fitted rating's %.4g %s, outside its prediction band: the extension is tied to the fitted rating there; check the fit's top control and the section",
				gh(j.Stage), f.Units.Length(), q, f.Units.Discharge(), j.Discharge, f.Units.Discharge()))
		}
	}
	prev := 0.0
	for _, r := range t.Rows {
		if r.Discharge < prev {
			out = append(out, sayf("discharge falls at %g %s: check the section and the extension", r.Stage, f.Units.Length()))
			break
		}
		prev = r.Discharge
	}
	return out
}

// aboveNote says what the rows above the highest gauging rest on.
func (t *ControlTable) aboveNote() string {
	f := t.fit
	u := f.Units
	head := sayf("above the highest gauging (%g %s, %.4g %s) ", f.HighStage, u.Length(), f.MaxDischarge, u.Discharge())
	if e := t.Extension; e != nil {
		how := sayf("levels off (no significant trend, p = %.2g)", e.TrendP)
		if math.IsNaN(e.TrendP) {
			how = "is constant"
		}
		if !e.Level {
			how = sayf("has a trend in ln S of %.3g per %s (p = %.2g)", e.Trend, u.Length(), e.TrendP)
		}
		ref := "the section's conveyance K"
		if t.hyd.tab != nil {
			ref = "the hydraulic rating table's discharge in place of K·√S₀"
		}
		return head + sayf("the conveyance-slope extension Q = K·√S(h) on %s, from the fitted rating's S = (Q/K)² there; S of the %d highest gaugings %s (Kennedy, 1984)",
			ref, len(e.Points), how)
	}
	if t.Method == Bayesian && t.topPriorWeak() {
		src := "weak priors"
		if ps := f.Posterior.PriorSources; len(ps) > 0 && ps[len(ps)-1] != "" {
			src = ps[len(ps)-1]
		}
		return head + sayf("the table carries the top control's power law on with no hydraulic basis (%s, none from a survey); its bands are those of the posterior carried on", src)
	}
	if t.Method == Bayesian {
		return head + "the table carries the fitted controls on; its bands are those of the posterior, which there rests on the top control's prior as the gaugings pull it"
	}
	return head + "the table carries the top control on; its bands are those of the fitted relation carried on, with no hydraulic basis"
}

// aboveWhat names what rows above the gaugings rest on.
func (t *ControlTable) aboveWhat() string {
	switch {
	case t.Extension != nil:
		return "conveyance-slope extension"
	case t.Method == Bayesian && t.topPriorWeak():
		return "top control carried on with weak priors, with no hydraulic basis"
	case t.Method == Bayesian:
		return "top control's prior as the gaugings pull it"
	}
	return "top control carried on"
}

// topPriorWeak reports a Bayesian fit whose top control's priors of ln A
// and C are the weak defaults (neither from a survey nor given): above
// the gaugings nothing hydraulic holds it.
func (t *ControlTable) topPriorWeak() bool {
	p := t.fit.Posterior
	if p == nil || len(p.informative) == 0 {
		return false
	}
	return !p.informative[len(p.informative)-1]
}

// tableStages lays out round stages from lo to top in step (default a
// round step giving about rating.MaxDefaultRows rows), with lo, top and
// the must stages within the range, dropping grid stages within
// stageMerge of a step of them.
func tableStages(lo, top, step float64, must []float64) ([]float64, error) {
	if !(step > 0) || math.IsInf(step, 0) {
		step = rating.NiceStep((top - lo) / rating.MaxDefaultRows)
	}
	if (top-lo)/step > rating.MaxStages {
		return nil, errorf("%w: %.3g stages from %s to %s is more than %d", rating.ErrStepTooFine, (top-lo)/step, gh(lo), gh(top), rating.MaxStages)
	}
	keep := []float64{lo, top}
	for _, m := range must {
		if m > lo && m < top {
			keep = append(keep, m)
		}
	}
	return stageGrid(keep, lo, top, step), nil
}

// stageGrid returns the stages keep and the multiples of step between lo
// and top, less those within stageMerge of a step of a stage kept, sorted
// and without repeats.
func stageGrid(keep []float64, lo, top, step float64) []float64 {
	out := append([]float64(nil), keep...)
	first := math.Ceil(lo / step)
	for i := 0.0; ; i++ {
		h := rating.StepMultiple(first+i, step) // 0.6, not 0.6000000000000001
		if h >= top {
			break
		}
		near := false
		for _, m := range keep {
			near = near || math.Abs(h-m) < stageMerge*step
		}
		if !near && h > lo {
			out = append(out, h)
		}
	}
	out = rating.SortedStages(out)
	sort.Float64s(out)
	return out
}

// row returns the table's row at gauge height h, with its bands when
// bands is set (NaN otherwise).
func (t *ControlTable) row(h float64, bands bool) (ControlRow, error) {
	f := t.fit
	r := ControlRow{Stage: h, Multiple: math.NaN(), Hydraulic: math.NaN(), OverbankShare: math.NaN()}
	k := math.NaN()
	if t.hyd.ok() {
		q, kk, err := t.hyd.at(h)
		switch {
		// A table that does not reach a row leaves it without a hydraulic
		// discharge, unless the row rests on it (the extension above the
		// gaugings needs its conveyance).
		case errors.Is(err, ErrBeyondTable) && !(h > f.HighStage && t.Extension != nil):
		case err != nil:
			return r, err
		default:
			r.Hydraulic, k = q, kk
		}
	}
	switch {
	case h > f.HighStage && t.Extension != nil:
		r.Basis = ConveyanceSlopeAbove
		r.Discharge, r.ParametricLower, r.ParametricUpper, r.TotalLower, r.TotalUpper = t.Extension.At(h, k)
		r.OverbankShare = t.Extension.ref.overbankShare(h)
		r.ParametricLower, r.TotalLower = t.held.at(h, r.ParametricLower, r.TotalLower)
	case !bands:
		switch {
		case h > f.HighStage:
			r.Basis = FitAboveGaugings
		case h < f.LowStage:
			r.Basis = BelowGaugings
		}
		nan := math.NaN()
		r.Discharge = f.Rating.Discharge(h)
		r.ParametricLower, r.ParametricUpper, r.TotalLower, r.TotalUpper = nan, nan, nan, nan
	default:
		switch {
		case h > f.HighStage:
			r.Basis = FitAboveGaugings
		case h < f.LowStage:
			r.Basis = BelowGaugings
		}
		r.Discharge = f.Rating.Discharge(h)
		r.ParametricLower, r.ParametricUpper, r.TotalLower, r.TotalUpper = f.Band(h)
	}
	if h > f.HighStage && f.MaxDischarge > 0 {
		r.Multiple = r.Discharge / f.MaxDischarge
	}
	if t.BandsWithheld || !bands {
		nan := math.NaN()
		r.ParametricLower, r.ParametricUpper, r.TotalLower, r.TotalUpper = nan, nan, nan, nan
	}
	return r, nil
}

// At evaluates the table's rule at any gauge height h between its first
// and last rows, exactly as Table does for its own rows: it is how a finer
// table is made without interpolating between rows. A stage outside the
// table is ErrBeyondSection.
func (t *ControlTable) At(h float64) (ControlRow, error) {
	if len(t.Rows) == 0 || math.IsNaN(h) || h < t.Rows[0].Stage-TableEdge || h > t.Rows[len(t.Rows)-1].Stage+TableEdge {
		return ControlRow{}, errorf("%w: stage %g is outside the table", ErrBeyondSection, h)
	}
	return t.row(h, true)
}

// LookupControlRows evaluates a table's rule (ControlTable.At, without
// the bands) at every hundredth of stage from its first row (the first
// offset) to its last, for a printed lookup sheet: hundredths below the
// first row are left out (no flow). A range longer than
// rating.MaxLookupStages is rating.ErrLookupRange.
func LookupControlRows(t *ControlTable) ([]ControlRow, error) {
	if t == nil || len(t.Rows) == 0 {
		return nil, nil
	}
	lo, hi := t.Rows[0].Stage, t.Rows[len(t.Rows)-1].Stage
	return lookupAt(lo, hi, func(h float64) (ControlRow, error) {
		row, err := t.row(math.Min(math.Max(h, lo), hi), false)
		row.Stage = h
		return row, err
	})
}

// Band returns the fitted rating's 95 % bands at gauge height h (without
// any extension): least squares, the band of the mean relation by the
// delta method and the prediction band,
//
//	exp(ln Q̂ ± t·√(gᵀΣg)),   exp(ln Q̂ ± t·√(gᵀΣg + s²)),
//
// with g the gradient of ln Q̂ in the parameters, Σ their covariance, s
// the standard error of estimate and t Student's quantile with n − p
// degrees of freedom; Bayesian, PosteriorBand. NaN at or below the first
// offset and where the covariance is not available; least squares, NaN
// also below BandFloor, where the gauge height lies within the 95 % band
// of the fitted gauge height of zero flow itself.
//
// References:
//
//	Seber, G. A. F., Wild, C. J. (1989). Nonlinear Regression. Wiley,
//	chapter 5 (from memory).
func (f *ControlFit) Band(h float64) (pLo, pHi, tLo, tHi float64) {
	if f.Method == Bayesian {
		return f.PosteriorBand(h)
	}
	nan := math.NaN()
	if f.cov == nil || !(h > f.Rating.Controls[0].B) || h < f.BandFloor() {
		return nan, nan, nan, nan
	}
	lq := func(x []float64) []float64 {
		r, ok := f.m.rating(f.m.full(x))
		if !ok {
			return nil
		}
		return []float64{logQ(r, h)}
	}
	y := logQ(f.Rating, h)
	jac := jacobian(lq, f.x, f.scale, []float64{y})
	if jac == nil {
		return nan, nan, nan, nan
	}
	g := mat.NewVecDense(len(f.x), mat.Row(nil, 0, jac))
	v := mat.Inner(g, f.cov, g)
	hp := f.tq * math.Sqrt(v)
	ht := f.tq * math.Sqrt(v+f.StandardErrorLog*f.StandardErrorLog)
	return math.Exp(y - hp), math.Exp(y + hp), math.Exp(y - ht), math.Exp(y + ht)
}
