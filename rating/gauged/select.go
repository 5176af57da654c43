package gauged

import (
	"errors"
	"math"
	"sort"
	"strings"
	"time"

	"wetline/rating"
)

// Selection chooses the gaugings a rating is fitted to: those of a rating
// period, less those excluded by time. Gaugings with a non-blank Exclude
// and gaugings with zero discharge are left out whatever the selection.
// The zero value selects every gauging.
type Selection struct {
	// From and To bound the rating period, half-open as rating periods
	// are: from From up to, not including, To, so that a gauging at a
	// boundary falls in the period it begins. A zero time leaves that end
	// open. A gauging without a time lies outside a bounded period.
	From, To time.Time
	// Exclude lists times of gaugings to leave out (time.Time.Equal).
	Exclude []time.Time
	// UTCOffset is the offset from UTC (east positive) at which warnings
	// write times (TimeText); it plays no part in choosing, as times are
	// instants. Analyze sets it from Options.UTCOffset.
	UTCOffset time.Duration
}

// TimeText writes t as RFC 3339 at offset from UTC (east positive); a zero
// offset, none chosen, writes t in UTC (Z), whatever offset it was read
// with, as the reports of shifts and record do.
func TimeText(t time.Time, offset time.Duration) string {
	return t.In(zone(offset)).Format(time.RFC3339)
}

// Reasons a gauging is left out, as shown in reports.
const (
	ReasonZeroDischarge = "zero discharge (a fit in ln Q needs Q > 0)"
	ReasonBeforePeriod  = "before the rating period"
	ReasonAfterPeriod   = "after the rating period"
	ReasonListed        = "excluded by time"
)

// ErrGauging is returned for a gauging that cannot enter a fit: a stage or
// discharge that is not a finite number, a negative discharge, a negative
// or non-finite uncertainty.
var ErrGauging = errors.New("not a usable gauging")

// Reason returns why g is left out under the selection ("" when it is
// used): its own Exclude text first, then zero discharge, the period and
// the list of times.
func (s Selection) Reason(g Gauging) string {
	switch {
	case hasText(g.Exclude):
		return g.Exclude
	case g.Discharge == 0:
		return ReasonZeroDischarge
	case !s.From.IsZero() && (g.Time.IsZero() || g.Time.Before(s.From)):
		return ReasonBeforePeriod
	case !s.To.IsZero() && (g.Time.IsZero() || !g.Time.Before(s.To)):
		return ReasonAfterPeriod
	}
	for _, t := range s.Exclude {
		if g.Time.Equal(t) {
			return ReasonListed
		}
	}
	return ""
}

// Holds reports whether g is of the fit's gaugings whatever its
// discharge: not excluded by its own Exclude text or by time, and inside
// the rating period. A gauging of zero discharge that Holds is left out of
// the fit in ln Q but still speaks of the rating's zero flow.
func (s Selection) Holds(g Gauging) bool {
	switch r := s.Reason(g); r {
	case "":
		return true
	case ReasonZeroDischarge:
		g.Discharge = 1 // any flow: the reasons that follow zero discharge
		return s.Reason(g) == ""
	}
	return false
}

// hasText reports a string with other than white space.
func hasText(s string) bool { return strings.TrimSpace(s) != "" }

// data are the gaugings a fit uses, ascending in stage.
type data struct {
	h, y, sigma []float64 // stage, ln Q, standard uncertainty in ln Q
	w           []float64 // 1/σ², normalised to mean 1
	index       []int     // position of each in the caller's slice
	lo, hi      float64   // lowest and highest stage
	qmax        float64   // largest discharge
}

// n is the number of gaugings used.
func (d *data) n() int { return len(d.h) }

// ErrExcludeUnmatched is the cause of a time of Selection.Exclude that is
// no gauging's (see Selection.Unmatched).
var ErrExcludeUnmatched = errors.New("no gauging is at that time")

// ExcludeMiss is a time of Selection.Exclude that is no gauging's, with
// the time of the gauging nearest it.
type ExcludeMiss struct {
	// Time is the time given to exclude.
	Time time.Time
	// Nearest is the time of the gauging nearest Time: the zero time when
	// no gauging has a time.
	Nearest time.Time
}

// Unmatched returns the times of s.Exclude that are no gauging's of gs
// (the same instant, whatever offset each is written with), in the order
// given, each with the nearest gauging's time: most likely mistyped.
func (s Selection) Unmatched(gs []Gauging) []ExcludeMiss {
	var out []ExcludeMiss
	for _, t := range s.Exclude {
		m, found := ExcludeMiss{Time: t}, false
		for _, g := range gs {
			if g.Time.Equal(t) {
				found = true
				break
			}
			if !g.Time.IsZero() && (m.Nearest.IsZero() || absDuration(g.Time.Sub(t)) < absDuration(m.Nearest.Sub(t))) {
				m.Nearest = g.Time
			}
		}
		if !found {
			out = append(out, m)
		}
	}
	return out
}

// absDuration is the length of d, whatever its sign.
func absDuration(d time.Duration) time.Duration {
	if d < 0 {
		return -d
	}
	return d
}

// selectGaugings checks every gauging, applies the selection and returns
// the data of the fit, the reason each gauging is left out ("" when used)
// and warnings (times listed that match no gauging).
func selectGaugings(gs []Gauging, sel Selection) (*data, []string, []string, error) {
	var errs []error
	reasons := make([]string, len(gs))
	type item struct {
		h float64
		i int
	}
	var use []item
	for i, g := range gs {
		if !finite(g.Stage) || !finite(g.Discharge) || g.Discharge < 0 || g.Uncertainty < 0 || !finite(g.Uncertainty) {
			errs = append(errs, errorf("%s: stage %g, discharge %g, uncertainty %g %%: %w", g.label(), g.Stage, g.Discharge, g.Uncertainty, ErrGauging))
			continue
		}
		reasons[i] = sel.Reason(g)
		if reasons[i] == "" {
			use = append(use, item{g.Stage, i})
		}
	}
	if len(errs) > 0 {
		return nil, nil, nil, errors.Join(errs...)
	}
	var warn []string
	for _, m := range sel.Unmatched(gs) {
		warn = append(warn, sayf("no gauging at %s to exclude", TimeText(m.Time, sel.UTCOffset)))
	}
	sort.SliceStable(use, func(a, b int) bool { return use[a].h < use[b].h })
	d := &data{}
	var wsum float64
	for _, u := range use {
		g := gs[u.i]
		s := g.LogSigma()
		d.h = append(d.h, g.Stage)
		d.y = append(d.y, math.Log(g.Discharge))
		d.sigma = append(d.sigma, s)
		d.w = append(d.w, 1/(s*s))
		d.index = append(d.index, u.i)
		wsum += 1 / (s * s)
		d.qmax = math.Max(d.qmax, g.Discharge)
	}
	for i := range d.w {
		d.w[i] *= float64(len(d.w)) / wsum
	}
	if len(d.h) > 0 {
		d.lo, d.hi = d.h[0], d.h[len(d.h)-1]
	}
	return d, reasons, warn, nil
}

// finite reports a number that is neither NaN nor infinite.
func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// countIn counts the gaugings with lo ≤ h < hi.
func (d *data) countIn(lo, hi float64) int {
	return sort.SearchFloat64s(d.h, hi) - sort.SearchFloat64s(d.h, lo)
}

// FarBelowOthersMultiple is how many times the stage span of the other
// gaugings a fit uses its lowest one may lie below the lowest of them
// before it is refused (ErrGaugingFarBelowOthers). Ten is a project
// choice, generous on purpose (common practice: refuse only what no low
// flow explains): a genuine low-flow gauging lies within a span or so of
// the others, while a missing-value code (such as −99999) or a slip of
// the datum puts a gauging thousands of spans away.
const FarBelowOthersMultiple = 10

// farBelowSpanFloor is the least stage span, in metres, that
// farBelowOthers judges by: the other gaugings of a short period often lie
// within centimetres of one another, and a span that small would refuse an
// ordinary low flow a few tenths of a metre below them. With it a gauging
// is refused only when it lies more than 10 m (about 33 ft) below the
// others, which a missing-value code or a datum slip does and no low flow
// does (a project choice).
const farBelowSpanFloor = 1.0

// ErrGaugingFarBelowOthers is the cause of a gauging with flow, used by a
// fit, whose gauge height lies below the lowest of the other gaugings used
// by more than FarBelowOthersMultiple times their stage span: the check
// that needs no section, beside ErrGaugingFarBelowSection.
var ErrGaugingFarBelowOthers = errors.New("a gauging with flow lies far below the other gaugings")

// farBelowOthers refuses the lowest gauging of d (the gaugings a fit
// uses, with flow, ascending in stage) when it lies below the lowest of
// the others by more than FarBelowOthersMultiple times their stage span
// (ErrGaugingFarBelowOthers, naming it by its source and gauge height),
// the span taken as at least farBelowSpanFloor (1 m, 3.28 ft). With fewer
// than two others nothing is refused. Every fit passes this check,
// by least squares or Bayesian inference, before it starts.
func farBelowOthers(gs []Gauging, d *data, u rating.Units) error {
	n := d.n()
	if n < 3 {
		return nil
	}
	lo, span := d.h[1], d.h[n-1]-d.h[1]
	floor := farBelowSpanFloor
	if u == rating.US {
		floor /= 0.3048
	}
	if !(lo-d.h[0] > FarBelowOthersMultiple*math.Max(span, floor)) {
		return nil
	}
	span = math.Max(span, floor)
	g := gs[d.index[0]]
	return errorf("%w: %s: gauge height %g with %g %s is %s %s below the lowest other gauging (at %s %s), more than %d times the other gaugings' stage span (at least 1 m, 3.28 ft), %s %s: check for a missing-value code or a slip of the datum",
		ErrGaugingFarBelowOthers, g.label(), g.Stage, g.Discharge, u.Discharge(),
		rating.PlainFigures(lo-d.h[0], 4), u.Length(), gh(lo), u.Length(), FarBelowOthersMultiple, rating.PlainFigures(span, 3), u.Length())
}
