package gauged

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"sort"
	"time"

	"wetline/rating"
)

// GaugingShift is a gauging measured against the rating in force at its
// time.
type GaugingShift struct {
	Gauging
	// Period is the 0-based index of the rating period in force, -1 when
	// none is.
	Period int
	// Rated is the base rating's discharge at the gauge height, unshifted
	// (discharge unit; NaN without a rating or outside it).
	Rated float64
	// Departure is 100·(Q − Rated)/Rated (percent; NaN when Rated is not
	// above zero).
	Departure float64
	// Outside reports a Departure outside the gauging's band
	// (Gauging.Outside); never for an Excluded gauging, which counts
	// against no rating.
	Outside bool
	// Shift is the measured shift: the rating's gauge height for the
	// measured discharge minus the gauge height read (length unit; NaN when
	// the rating cannot carry the discharge or the discharge is zero).
	Shift float64
	// Applied is the shift the history's diagrams give at the gauging's
	// time and gauge height (length unit; 0 without diagrams, NaN without
	// a rating).
	Applied float64
	// Shifted is the discharge of the rating with the applied shift
	// (discharge unit), ShiftedDeparture the percent departure from it and
	// OutsideShifted whether that lies outside the quality band (never for
	// an Excluded gauging).
	Shifted          float64
	ShiftedDeparture float64
	OutsideShifted   bool
	// Residual is Shift − Applied (length unit): the shift the diagrams
	// still miss.
	Residual float64
	// Lookup says how Rated was found at the gauge height, ShiftedLookup
	// how Shifted was found at the effective gauge height (Extrapolated
	// beyond the table's rows, ZeroFlow at or below the zero-flow stage;
	// NoRating without a rating).
	Lookup, ShiftedLookup Lookup
	// NoShift reports a gauging under a rating whose shift could not be
	// measured (Shift NaN): a discharge the rating carries at no stage
	// (beyond its rows, or zero where the rating has flow). A zero
	// discharge at a gauge height the rating also rates 0 needs no shift
	// and is not marked.
	NoShift bool
	// AboveGaugings reports a gauge height above the highest gauging of
	// the rating in force, ShiftedAboveGaugings an effective gauge height
	// above it (both false when that gauging is not known): the discharge
	// is read on the rating's extension above its gaugings.
	AboveGaugings, ShiftedAboveGaugings bool
	// Excluded reports a gauging whose Exclude is not blank: it keeps its
	// departures and shifts, but no visit proposes a diagram from it and
	// it is never Outside or OutsideShifted.
	Excluded bool
}

// Visit is a field visit: gaugings close together in time under one rating
// period, and the shift diagram they propose. A visit spanning a rating
// break is split there, each part a Visit of its own.
type Visit struct {
	// Time is the time of the visit's first gauging.
	Time time.Time
	// Gaugings are indices into ShiftCheck.Gaugings, in time order.
	Gaugings []int
	// Period is the 0-based index of the rating period in force at the
	// visit's gaugings, -1 when none is.
	Period int
	// Proposal is a shift diagram through the measured shifts of the
	// visit's gaugings not excluded (one point per gauge height, shifts
	// measured at one gauge height averaged), dated at Time, for the user
	// to edit; no points when the visit gives no usable shift (every
	// gauging excluded, say) or its shifts make a refused diagram.
	Proposal ShiftDiagram
}

// ShiftCheck is a set of gaugings measured against a rating history: the
// report of the shifts command, in every format.
type ShiftCheck struct {
	// Provenance says what was read and by what (set by the caller).
	Provenance rating.Provenance
	// Units label the values (CheckOptions.Units); nothing is converted.
	Units rating.Units
	// UTCOffset is the offset in which reports write times
	// (CheckOptions.UTCOffset).
	UTCOffset time.Duration
	// History is what the gaugings were measured against: the rating
	// periods and the shift diagrams, as the rater holds them.
	History History
	// ShiftPeriods gives, for each diagram of History, the rating period
	// whose shifts include it (-1 when the diagram is not used).
	ShiftPeriods []int
	// Gaugings are in input order.
	Gaugings []GaugingShift
	// Visits are in time order.
	Visits []Visit
	// Warnings are facts a reviewer should see; they begin with the
	// rater's own (diagrams not used).
	Warnings []string
	// Figures are the report's pictures (none until drawn).
	Figures []rating.Figure
}

// CheckOptions configure CheckGaugings. The zero value groups gaugings
// less than DefaultVisitGap apart into one visit.
type CheckOptions struct {
	// VisitGap is the longest time between consecutive gaugings of one
	// visit (default DefaultVisitGap; ≥ 0).
	VisitGap time.Duration
	// Units label the values in reports (default SI); nothing is converted.
	Units rating.Units
	// UTCOffset is the offset from UTC in which reports write times (east
	// positive; default 0, UTC); it changes no instant.
	UTCOffset time.Duration
}

// DefaultVisitGap is the default longest time between gaugings of one
// field visit (a project choice: one working day).
const DefaultVisitGap = 12 * time.Hour

// ErrVisitGap is the cause of a negative visit gap.
var ErrVisitGap = errors.New("the visit gap must not be negative")

// CheckGaugings measures every gauging against the rating in force at its
// time: the departure from the base rating and whether it lies outside the
// gauging's quality band, the measured shift s with Q_rating(h + s) = Q
// (what must be added to the gauge height for the rating to pass through
// the gauging), the shift the history's diagrams already apply there and
// the departure that remains. A gauging with a non-blank Exclude (a failed
// meter, weed on the section) is measured too but marked Excluded: it is
// never counted outside its band and proposes no diagram. A gauging rated
// by extrapolation beyond the table's rows, or at or below its zero-flow
// stage (rated 0), is marked (Lookup, ShiftedLookup) and warned of, and so
// is one above the rating's highest gauging (AboveGaugings,
// ShiftedAboveGaugings). The gaugings at times when no rating is in force
// are warned of in one line, counted, the first and last named. Gaugings
// are then grouped into visits, and each visit proposes a shift diagram
// through its measured shifts.
//
// References:
//
//	Kennedy, E.J., 1983, Computation of continuous records of streamflow:
//	USGS Techniques of Water-Resources Investigations, book 3, chap. A13
//	(shifts from discharge measurements).
func (r *Rater) CheckGaugings(gs []Gauging, opt CheckOptions) (ShiftCheck, error) {
	gap := opt.VisitGap
	if gap < 0 {
		return ShiftCheck{}, fmt.Errorf("%w: %v", ErrVisitGap, gap)
	}
	if gap == 0 {
		gap = DefaultVisitGap
	}
	c := ShiftCheck{Units: opt.Units, UTCOffset: opt.UTCOffset, History: r.History(), ShiftPeriods: append([]int(nil), r.used...),
		Gaugings: make([]GaugingShift, len(gs)), Warnings: append([]string(nil), r.Warnings...)}
	z := zone(opt.UTCOffset)
	var unrated []Gauging
	at := 0 // where the warning of the unrated gaugings goes
	for i, g := range gs {
		c.Gaugings[i] = r.checkOne(g, z, &c.Warnings)
		if c.Gaugings[i].ShiftedLookup == NoRating { // the rating in force at its time: none
			if len(unrated) == 0 {
				at = len(c.Warnings)
			}
			unrated = append(unrated, g)
		}
	}
	if w := unratedWarning(unrated, z); w != "" {
		c.Warnings = slices.Insert(c.Warnings, at, w)
	}
	c.visits(gap, z)
	return c, nil
}

// unratedWarning words the warning of the gaugings at times when no
// rating is in force: one line for them all, which counts them and names
// the first and the last in time ("" for none); times in zone z.
func unratedWarning(gs []Gauging, z *time.Location) string {
	if len(gs) == 0 {
		return ""
	}
	first, last := gs[0], gs[0]
	for _, g := range gs[1:] {
		if g.Time.Before(first.Time) {
			first = g
		}
		if !g.Time.Before(last.Time) {
			last = g
		}
	}
	if len(gs) == 1 {
		return fmt.Sprintf("%s: no rating is in force at %s", first.label(), first.Time.In(z).Format(time.RFC3339))
	}
	return fmt.Sprintf("no rating is in force at the times of %d gaugings, the first at %s (%s), the last at %s (%s)",
		len(gs), first.Time.In(z).Format(time.RFC3339), first.label(), last.Time.In(z).Format(time.RFC3339), last.label())
}

// checkOne measures one gauging; warnings write times in zone z.
func (r *Rater) checkOne(g Gauging, z *time.Location, warn *[]string) GaugingShift {
	nan := math.NaN()
	out := GaugingShift{Gauging: g, Rated: nan, Departure: nan, Shift: nan, Applied: nan, Shifted: nan, ShiftedDeparture: nan, Residual: nan,
		Lookup: NoRating, ShiftedLookup: NoRating, Excluded: hasText(g.Exclude)}
	base := r.At(g.Time, g.Stage)
	out.Period, out.ShiftedLookup = base.Period, base.Lookup
	if base.Lookup == NoRating {
		return out // warned of by CheckGaugings, with the others
	}
	rt := r.periods[base.Period].rating
	out.Rated, out.Lookup = rt.Discharge(g.Stage)
	out.AboveGaugings, out.ShiftedAboveGaugings = rt.AboveGaugings(g.Stage), base.AboveGaugings
	out.Departure, out.Outside = departure(g, out.Rated)
	out.Applied = base.Shift
	out.Shifted = base.Discharge
	out.ShiftedDeparture, out.OutsideShifted = departure(g, out.Shifted)
	if out.Excluded {
		out.Outside, out.OutsideShifted = false, false
	}
	if g.Discharge > 0 {
		h, err := rt.Stage(g.Discharge)
		if err != nil {
			*warn = append(*warn, fmt.Sprintf("%s: no shift: %v", g.label(), err))
		} else {
			out.Shift = h - g.Stage
			out.Residual = out.Shift - out.Applied
		}
	}
	if g.Discharge == 0 && out.Rated > 0 {
		*warn = append(*warn, fmt.Sprintf("%s: zero discharge measured at gauge height %g, where the rating %q gives %.4g: no shift can be measured (the rating has no stage of zero flow above it)",
			g.label(), g.Stage, rt.Name(), out.Rated))
	}
	out.NoShift = math.IsNaN(out.Shift) && !(g.Discharge == 0 && out.Rated == 0)
	if math.IsNaN(out.Rated) {
		*warn = append(*warn, fmt.Sprintf("%s: gauge height %g is outside the rating %q", g.label(), g.Stage, rt.Name()))
	}
	// Where a lookup left the table's rows: at the gauge height, else at
	// the effective one.
	where := func(l Lookup) string {
		if out.Lookup == l {
			return fmt.Sprintf("gauge height %g", g.Stage)
		}
		return effectiveWords(base)
	}
	if out.Lookup == Extrapolated || out.ShiftedLookup == Extrapolated {
		*warn = append(*warn, fmt.Sprintf("%s: %s is beyond the rows of the rating %q: rated by extrapolation", g.label(), where(Extrapolated), rt.Name()))
	}
	if out.AboveGaugings || out.ShiftedAboveGaugings {
		h, q := fmt.Sprintf("gauge height %g", g.Stage), out.Rated
		if !out.AboveGaugings {
			h, q = effectiveWords(base), out.Shifted
		}
		rated := ": rated on its extension above the gaugings"
		if math.IsNaN(q) {
			rated = "" // outside the rating, warned of below
		}
		*warn = append(*warn, fmt.Sprintf("%s: %s is above the highest gauging %g of the rating %q%s", g.label(), h, rt.table.HighGauging, rt.Name(), rated))
	}
	if out.Lookup == ZeroFlow || out.ShiftedLookup == ZeroFlow {
		*warn = append(*warn, fmt.Sprintf("%s: %s is at or below the zero-flow stage %g of the rating %q: rated 0", g.label(), where(ZeroFlow), rt.table.ZeroFlow, rt.Name()))
	}
	return out
}

// effectiveWords names a rated effective gauge height and its shift in a
// message, to six significant digits so that the round-off of h + s
// (9.95 + 0.2 = 10.149999999999999) is not written.
func effectiveWords(v Rated) string {
	return fmt.Sprintf("effective gauge height %.6g (shift %.6g applied)", v.Effective, v.Shift)
}

// departure returns 100·(Q − rated)/rated and whether it lies outside the
// gauging's band.
func departure(g Gauging, rated float64) (float64, bool) {
	if !(rated > 0) {
		return math.NaN(), false
	}
	d := 100 * (g.Discharge - rated) / rated
	return d, g.Outside(d)
}

// visits groups the gaugings into visits (gaps of at most gap, one rating
// period each) and proposes their diagrams; warnings write times in
// zone z.
func (c *ShiftCheck) visits(gap time.Duration, z *time.Location) {
	idx := make([]int, len(c.Gaugings))
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool { return c.Gaugings[idx[a]].Time.Before(c.Gaugings[idx[b]].Time) })
	for k, i := range idx {
		g := c.Gaugings[i]
		// A rating break ends a visit: shifts measured on two ratings make
		// no one diagram.
		if k == 0 || g.Time.Sub(c.Gaugings[idx[k-1]].Time) > gap || g.Period != c.Gaugings[idx[k-1]].Period {
			c.Visits = append(c.Visits, Visit{Time: g.Time, Period: g.Period})
		}
		v := &c.Visits[len(c.Visits)-1]
		v.Gaugings = append(v.Gaugings, i)
	}
	for k := range c.Visits {
		c.propose(&c.Visits[k], z)
	}
}

// propose lays a shift diagram through the measured shifts of a visit's
// gaugings not excluded; its source is the first of them.
func (c *ShiftCheck) propose(v *Visit, z *time.Location) {
	type sum struct {
		stage, shift float64
		n            int
	}
	var pts []sum
	first := -1 // the first gauging drawn through
	for _, i := range v.Gaugings {
		g := c.Gaugings[i]
		if math.IsNaN(g.Shift) || g.Excluded {
			continue
		}
		if first < 0 {
			first = i
		}
		j := sort.Search(len(pts), func(j int) bool { return pts[j].stage >= g.Stage })
		if j < len(pts) && pts[j].stage == g.Stage {
			pts[j].shift += g.Shift
			pts[j].n++
			continue
		}
		pts = append(pts, sum{})
		copy(pts[j+1:], pts[j:])
		pts[j] = sum{g.Stage, g.Shift, 1}
	}
	if len(pts) == 0 {
		return
	}
	d := ShiftDiagram{Time: v.Time, Source: c.Gaugings[first].Source}
	for _, p := range pts {
		d.Points = append(d.Points, ShiftPoint{Stage: p.stage, Shift: p.shift / float64(p.n)})
	}
	if err := d.Validate(); err != nil {
		c.Warnings = append(c.Warnings, fmt.Sprintf("the visit of %s proposes no diagram: its shifts make one that is refused: %v", v.Time.In(z).Format(time.RFC3339), err))
		return
	}
	v.Proposal = d
}
