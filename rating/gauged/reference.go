package gauged

import (
	"math"
	"strconv"

	"wetline/rating"
	"wetline/subdivide"
)

// reference is the hydraulic rating a fit is compared with, extended on
// and given its prior by: a surveyed section's (sec) or a stage–discharge
// table's (tab), both at gauge heights. The zero value is none.
type reference struct {
	sec *rating.HydraulicCurve
	tab *TableRating
}

// referenceOf returns the reference of a section or, without one, of a
// table.
func referenceOf(sec *rating.HydraulicCurve, tab *TableRating) reference {
	if sec != nil {
		return reference{sec: sec}
	}
	return reference{tab: tab}
}

// ok reports a reference that is given.
func (r reference) ok() bool { return r.sec != nil || r.tab != nil }

// at returns the reference's discharge and conveyance at gauge height h.
// A table has no conveyance: its discharge stands in for K·√S₀ (see
// FitConveyanceSlopeTable). Below a table whose first row is dry the
// discharge is zero; elsewhere outside a table it is an ErrBeyondTable
// error.
func (r reference) at(h float64) (q, k float64, err error) {
	if r.sec != nil {
		row, err := r.sec.Row(h)
		return row.Discharge, row.Conveyance, err
	}
	q, err = tableDischarge(r.tab, h)
	return q, q, err
}

// overbankShare returns φ_ob, the share of the section's conveyance at
// gauge height h carried by its overbank subsections (every region but
// subdivide.Channel, as HydraulicPrior splits them): 0 for a table, which
// has no subsections, and where the section gives no conveyance.
func (r reference) overbankShare(h float64) float64 {
	if r.sec == nil {
		return 0
	}
	row, err := r.sec.Row(h)
	if err != nil || !(row.Conveyance > 0) {
		return 0
	}
	var ob float64
	for _, sub := range row.Subs {
		if sub.Region != subdivide.Channel {
			ob += sub.Conveyance
		}
	}
	return ob / row.Conveyance
}

// hasOverbanks reports a section with overbank subsections (a region
// other than subdivide.Channel), which only bank stations give: a table,
// or a section without bank stations, is all channel.
func (r reference) hasOverbanks() bool {
	return r.sec != nil && hasOverbanks(*r.sec)
}

// discharge returns the reference's discharge at gauge height h.
func (r reference) discharge(h float64) (float64, error) {
	q, _, err := r.at(h)
	return q, err
}

// bottom is the gauge height where the reference starts to flow: the
// section's lowest point, or the table's zero-flow stage (TableBottom).
func (r reference) bottom() float64 {
	if r.sec != nil {
		return r.sec.Bottom()
	}
	return TableBottom(r.tab)
}

// top is the highest gauge height of the reference: the section's lower
// end, or the table's last row.
func (r reference) top() float64 {
	if r.sec != nil {
		return r.sec.Top()
	}
	_, hi := r.tab.Range()
	return hi
}

// TableBottom returns the gauge height at which a hydraulic rating table
// starts to flow: its zero-flow stage when it has one, else the stage of
// the last of its leading rows without discharge (a table computed from a
// section starts at the section's lowest point), else its first stage.
func TableBottom(t *TableRating) float64 {
	tab := t.table
	if tab.HasZeroFlow {
		return tab.ZeroFlow
	}
	b := t.h[0]
	for i := range t.q {
		if t.q[i] > 0 {
			break
		}
		b = t.h[i]
	}
	return b
}

// tableStartsDry reports whether a hydraulic rating table says where its
// flow starts: a zero-flow stage, or a first row without discharge.
func tableStartsDry(t *TableRating) bool {
	return t.table.HasZeroFlow || t.q[0] == 0
}

// tableDischarge is the table's discharge at h: zero at or below its
// bottom when its first row is dry, an ErrBeyondTable error elsewhere
// outside its rows.
func tableDischarge(t *TableRating, h float64) (float64, error) {
	lo, hi := t.Range()
	if h < lo && (t.q[0] == 0 || t.table.HasZeroFlow && h <= t.table.ZeroFlow) {
		return 0, nil
	}
	q, how := t.Discharge(h)
	if how == OutsideTable || math.IsNaN(q) {
		return math.NaN(), errorf("%w: gauge height %s is outside %s to %s of %s", ErrBeyondTable, gh(h), gh(lo), gh(hi), t.Name())
	}
	return q, nil
}

// ghDecimals is the number of decimals of a gauge height in messages:
// 0.1 mm or 0.0001 ft, finer than any gauge is read.
const ghDecimals = 4

// gh writes a gauge height for a message without the round-off of a
// datum subtracted (0.7915, not 0.7914999999999992).
func gh(v float64) string {
	p := math.Pow(10, ghDecimals)
	return strconv.FormatFloat(math.Round(v*p)/p, 'f', -1, 64)
}

// CompareTable measures every gauging against a hydraulic rating given as
// a table at gauge heights, as Compare does against a section's: the
// table's discharge at its gauge height (interpolated as
// TableRating.Discharge does), the percent departure, the shift and the
// quality-band flag. A gauging outside the table's rows is not compared
// (NaN, with a warning naming it).
func CompareTable(gs []Gauging, t *TableRating) Comparison {
	cmp := Comparison{Datum: math.NaN(), Residuals: make([]Residual, len(gs))}
	for i, g := range gs {
		q, err := tableDischarge(t, g.Stage)
		if err != nil {
			cmp.Warnings = append(cmp.Warnings, sayf("%s: not compared with the hydraulic rating: %v", g.label(), err))
			cmp.Residuals[i] = Residual{Gauging: g, Fitted: math.NaN(), DeparturePercent: math.NaN(), LogResidual: math.NaN(), Shift: math.NaN()}
			continue
		}
		cmp.Residuals[i] = residualOf(g, q, stageOrNaN(t.Stage))
	}
	cmp.summarise()
	return cmp
}

// TablePrior returns the prior of a channel control from a hydraulic
// rating given as a table (a step-backwater or a section's rating read
// from a file) over gauge heights from..to, exactly as HydraulicPrior does
// from a section's: the power law Q = a₀·(h − b)^c fitted in ln Q to the
// table's discharge at priorCurvePoints stages, and
//
//	ln a = ln a₀ + ½·ln(S/S₀) − ln f,   sd(ln a) = √(¼·σ²_lnS + σ²_lnf),
//
// which assumes the table's discharges scale as 1/n and √S, as those of a
// Manning computation do. Only the whole discharge is known, so
// opt.Part must be WholeSection. A table that covers only part of
// from..to (a step-backwater ladder that starts above the lowest gauging
// or stops below the highest) gives the prior over the part it covers,
// and the prior's Source says so; no overlap is an error. Errors wrap
// ErrPrior.
//
// The offset b of the fit is kept at or above the table's zero-flow stage
// when the table says where its flow starts (a zero-flow stage or a first
// row without discharge, TableBottom), as a section's is kept at or above
// its lowest point. A table whose first row already carries discharge (a
// step-backwater ladder) does not say where the flow starts: that row is
// not a gauge height of zero flow, so b is fitted freely below it (the
// power law through the table's own rows) and the offset's prior is
// centred on that b with a standard deviation of OffsetPriorFraction of
// the height from b to the top of the range. Unless opt.OffsetFixed.
//
// References:
//
//	Le Coz, J., Renard, B., Bonnifait, L., Branger, F., Le Boursicaud, R.
//	(2014). Combining hydraulic knowledge and uncertain gaugings in the
//	estimation of hydrometric rating curves: a Bayesian approach.
//	Journal of Hydrology 509, 573–587.
func TablePrior(t *TableRating, from, to float64, opt HydraulicPriorOptions) (ControlPrior, error) {
	if opt.Part != WholeSection {
		return ControlPrior{}, errorf("%w: a table gives the whole discharge only, not the channel's or the overbanks' share", ErrPrior)
	}
	q := func(h float64) (float64, error) { return tableDischarge(t, h) }
	lo, hi := t.Range()
	wantFrom, wantTo := from, to
	if from < lo && !tableStartsDry(t) {
		from = lo
	}
	to = math.Min(to, hi)
	if !(to > from) {
		return ControlPrior{}, errorf("%w: the table %s (gauge heights %s to %s) does not reach the control's range %s to %s",
			ErrPrior, t.Name(), gh(lo), gh(hi), gh(wantFrom), gh(wantTo))
	}
	what := "hydraulic rating table " + t.Name()
	if from != wantFrom || to != wantTo {
		what += sayf(" (the part of the control's range %s to %s that it covers)", gh(wantFrom), gh(wantTo))
	}
	bottom := TableBottom(t)
	if !tableStartsDry(t) {
		bottom = math.NaN()
		if !opt.OffsetFixed {
			what += sayf(", offset fitted below its lowest row %s (which flows)", gh(lo))
		}
	}
	return curvePrior(q, bottom, from, to, opt, what)
}

// curvePrior fits the prior of a channel control to the discharge q of a
// hydraulic rating whose flow starts at bottom, over gauge heights
// from..to (see HydraulicPrior); what names the rating in the source. A
// NaN bottom (a rating that does not say where its flow starts) leaves
// the offset of the fit unbounded below the lowest point fitted, and the
// offset prior's standard deviation is taken from the fitted offset.
func curvePrior(q func(float64) (float64, error), bottom, from, to float64, opt HydraulicPriorOptions, what string) (ControlPrior, error) {
	ncv, scv := opt.NCV, opt.SlopeCV
	if ncv == 0 {
		ncv = DefaultNCV
	}
	if scv == 0 {
		scv = DefaultSlopeCV
	}
	if !(ncv >= 0) || !(scv >= 0) || !(to > from) {
		return ControlPrior{}, errorf("%w: range %g to %g, n cv %g, slope cv %g", ErrPrior, from, to, ncv, scv)
	}
	lnA, cc, b, err := fitCurve(q, from, to, opt.OffsetFixed, opt.Offset, bottom)
	if err != nil {
		return ControlPrior{}, err
	}
	if math.IsNaN(bottom) {
		bottom = b
	}
	sdA := math.Sqrt(0.25*math.Pow(logSD(scv), 2) + math.Pow(logSD(ncv), 2))
	return ControlPrior{
		LogCoefficient: ParamPrior{Mean: lnA, SD: sdA},
		Exponent:       ParamPrior{Mean: cc, SD: HydraulicExponentSD},
		Offset:         ParamPrior{Mean: b, SD: OffsetPriorFraction * (to - bottom)},
		Source: sayf("%s from %.4g to %.4g %s (Q = %.4g·%s^%.3g, n cv %.2g, slope cv %.2g)",
			what, from, to, opt.Units.Length(), math.Exp(lnA), depthAbove(b), cc, ncv, scv),
	}, nil
}

// depthAbove writes (h − b) for an offset b, (h + |b|) when it is
// negative.
func depthAbove(b float64) string {
	if b < 0 {
		return sayf("(h + %.4g)", -b)
	}
	return sayf("(h − %.4g)", b)
}
