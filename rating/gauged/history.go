package gauged

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"time"
)

// Period is a rating period: a rating in force from a time until the next
// period begins.
type Period struct {
	// From is when the period begins; the zero time means from the
	// beginning of any record.
	From time.Time
	// Rating is the rating in force; nil for a period without a rating
	// (no discharge is computed in it).
	Rating *RatingTable
}

// History is what turns a gauge's stages into discharges over time: the
// rating periods and the shift diagrams, both in time order. It is a plain
// value; Compile checks it and prepares it for lookups.
//
// A shift diagram is relative to the rating in force at its time, and
// shifts are prorated between the diagrams of one rating period only:
//
//   - a rating period starts with no shift: its rating as published;
//   - an abrupt diagram takes effect at its own time, the shift before it
//     holding until then;
//   - a diagram not abrupt is prorated in time from the previous diagram of
//     its period, and the first diagram of a period from zero shift at the
//     period's start;
//   - the first period of a history that begins at the zero time has no
//     start to prorate from: before its first diagram there is no shift,
//     and that diagram takes effect at its time as if abrupt (the compiled
//     Rater warns of it, unless the diagram is zero at every stage);
//   - after a period's last diagram that diagram holds to the period's end;
//     a period without diagrams has no shift.
//
// Diagrams dated before every period or in a period without a rating are
// not used (the compiled Rater says so).
//
// References:
//
//	Kennedy, E.J., 1983, Computation of continuous records of streamflow:
//	USGS Techniques of Water-Resources Investigations, book 3, chap. A13
//	(shifts prorated in time between discharge measurements, and applied
//	from the time of the measurement that defines them; from memory).
type History struct {
	// Periods ascend strictly in From.
	Periods []Period
	// Shifts ascend strictly in Time.
	Shifts []ShiftDiagram
	// UTCOffset is the offset from UTC (east positive; default 0, UTC) in
	// which the compiled Rater's warnings and Compile's errors write
	// times; it changes no instant.
	UTCOffset time.Duration
}

// zone is the fixed zone of a UTC offset, in which messages write times.
func zone(offset time.Duration) *time.Location {
	return time.FixedZone("", int(offset/time.Second))
}

// A HistoryError reports a rating period or a shift diagram of a history
// that cannot be used.
type HistoryError struct {
	// Period and Shift are 0-based indices; -1 when not concerned.
	Period, Shift int
	Err           error
}

func (e *HistoryError) Error() string {
	switch {
	case e.Shift >= 0:
		return fmt.Sprintf("shift diagram %d: %v", e.Shift+1, e.Err)
	case e.Period >= 0:
		return fmt.Sprintf("rating period %d: %v", e.Period+1, e.Err)
	}
	return e.Err.Error()
}

func (e *HistoryError) Unwrap() error { return e.Err }

// ErrPeriodOrder is the cause of rating periods not in strictly ascending
// order of their start.
var ErrPeriodOrder = errors.New("rating periods must begin in time order, one period per time")

// Rated is a stage turned into a discharge at a time.
type Rated struct {
	// Period is the 0-based index of the rating period in force, -1 when
	// the time is before every period.
	Period int
	// Shift is the shift applied (length unit), NaN without a rating.
	Shift float64
	// Effective is the effective gauge height h + Shift (length unit), NaN
	// without a rating.
	Effective float64
	// Discharge is the rating's discharge at Effective (discharge unit);
	// NaN outside the rating or without one.
	Discharge float64
	// Lookup says how the discharge was found (NoRating without a rating).
	Lookup Lookup
	// AboveGaugings reports an effective stage above the highest gauging of
	// the rating (when that is known).
	AboveGaugings bool
}

// periodRater is one compiled rating period.
type periodRater struct {
	from   int64 // Unix seconds; math.MinInt64 for the zero time (no start)
	rating *TableRating
	times  []int64 // diagram times, Unix seconds
	curves []curve
	abrupt []bool
	shifts []int // indices into History.Shifts
}

// Rater turns gauge heights at times into discharges with a compiled
// History. It is safe for concurrent use; build it with History.Compile.
type Rater struct {
	history History
	periods []periodRater
	froms   []int64 // period starts, Unix seconds
	// used[i] is the period index of diagram i, -1 when it is not used.
	used []int
	// Warnings are facts a reviewer should see (diagrams not used).
	Warnings []string
}

// unix returns a time's Unix seconds, math.MinInt64 for the zero time.
func unix(t time.Time) int64 {
	if t.IsZero() {
		return math.MinInt64
	}
	return t.Unix()
}

// Compile validates a history (every rating table, every diagram, the
// order of periods and diagrams) and prepares it. Errors are
// *HistoryError wrapping the cause (a *RatingError, a *ShiftError, or
// ErrPeriodOrder, ErrShiftTime). Times are taken to the second.
func (h History) Compile() (*Rater, error) {
	r := &Rater{used: make([]int, len(h.Shifts))}
	z := zone(h.UTCOffset)
	at := func(t time.Time) string { return t.In(z).Format(time.RFC3339) }
	r.history.Periods = append([]Period(nil), h.Periods...)
	r.history.Shifts = append([]ShiftDiagram(nil), h.Shifts...)
	for i, p := range h.Periods {
		pr := periodRater{from: unix(p.From)}
		if i > 0 && pr.from <= r.periods[i-1].from {
			return nil, &HistoryError{Period: i, Shift: -1, Err: fmt.Errorf("%w: %s is not after %s", ErrPeriodOrder, at(p.From), at(h.Periods[i-1].From))}
		}
		if p.Rating != nil {
			c, err := p.Rating.Compile()
			if err != nil {
				return nil, &HistoryError{Period: i, Shift: -1, Err: err}
			}
			r.periods = append(r.periods, periodRater{from: pr.from, rating: c})
			r.froms = append(r.froms, pr.from)
			t := c.Table()
			r.history.Periods[i].Rating = &t
			continue
		}
		r.periods = append(r.periods, pr)
		r.froms = append(r.froms, pr.from)
	}
	for i, d := range h.Shifts {
		if err := d.Validate(); err != nil {
			return nil, &HistoryError{Period: -1, Shift: i, Err: err}
		}
		t := d.Time.Unix()
		if i > 0 && t <= h.Shifts[i-1].Time.Unix() {
			return nil, &HistoryError{Period: -1, Shift: i, Err: fmt.Errorf("%w: %s is not after %s", ErrShiftTime, at(d.Time), at(h.Shifts[i-1].Time))}
		}
		d.Points = append([]ShiftPoint(nil), d.Points...)
		r.history.Shifts[i] = d
		p := r.periodAt(t, false)
		r.used[i] = p
		if p < 0 || r.periods[p].rating == nil {
			r.used[i] = -1
			r.Warnings = append(r.Warnings, fmt.Sprintf("the shift diagram of %s%s is not used: no rating is in force at its time",
				at(d.Time), sourceNote(d.Source)))
			continue
		}
		pr := &r.periods[p]
		pr.times = append(pr.times, t)
		pr.curves = append(pr.curves, curveOf(d))
		pr.abrupt = append(pr.abrupt, d.Abrupt)
		pr.shifts = append(pr.shifts, i)
	}
	for i := range r.periods {
		if p := &r.periods[i]; p.jumpsAtFirst() && !p.abrupt[0] && !p.hasStart() {
			d := h.Shifts[p.shifts[0]]
			r.Warnings = append(r.Warnings, fmt.Sprintf("the shift diagram of %s%s is not abrupt, but it is the first of a rating period with no start time to prorate it from: "+
				"no shift is applied before it, and it takes effect at its time as if abrupt; give the rating a start time to prorate the shift from zero there, "+
				"or mark the diagram abrupt", at(d.Time), sourceNote(d.Source)))
		}
	}
	return r, nil
}

// hasStart reports a period with a start time, from which its first
// diagram is prorated.
func (p *periodRater) hasStart() bool { return p.from != math.MinInt64 }

// jumpsAtFirst reports a period whose shift jumps at its first diagram:
// one not zero at every stage that is abrupt or cannot be prorated (the
// period has no start), dated after the period's start.
func (p *periodRater) jumpsAtFirst() bool {
	if len(p.times) == 0 || p.times[0] <= p.from || !(p.abrupt[0] || !p.hasStart()) {
		return false
	}
	for _, s := range p.curves[0].s {
		if s != 0 {
			return true
		}
	}
	return false
}

func sourceNote(s string) string {
	if s == "" {
		return ""
	}
	return " (" + s + ")"
}

// History returns a copy of the history the rater was compiled from.
func (r *Rater) History() History {
	h := History{Periods: append([]Period(nil), r.history.Periods...), Shifts: append([]ShiftDiagram(nil), r.history.Shifts...)}
	for i, p := range h.Periods {
		if p.Rating != nil {
			t := *p.Rating
			t.Points = append([]RatingPoint(nil), t.Points...)
			h.Periods[i].Rating = &t
		}
	}
	for i, d := range h.Shifts {
		h.Shifts[i].Points = append([]ShiftPoint(nil), d.Points...)
	}
	return h
}

// ShiftPeriod returns the index of the rating period whose shifts include
// diagram i of the history, or -1 when the diagram is not used.
func (r *Rater) ShiftPeriod(i int) int { return r.used[i] }

// Rating returns the compiled rating of period p (nil for a period without
// one, or p out of range).
func (r *Rater) Rating(p int) *TableRating {
	if p < 0 || p >= len(r.periods) {
		return nil
	}
	return r.periods[p].rating
}

// Breaks returns, in time order, the times at which the rated discharge
// may jump: the beginning of every rating period after the first, every
// abrupt diagram after the first of its period, and the first diagram of a
// period when the shift jumps there from zero (it is abrupt, or its period
// has no start to prorate it from, and it is not zero at every stage). The
// slice is new.
func (r *Rater) Breaks() []time.Time {
	var out []int64
	for i := range r.periods {
		p := &r.periods[i]
		if i > 0 {
			out = append(out, p.from)
		}
		if p.jumpsAtFirst() {
			out = append(out, p.times[0])
		}
		for j := 1; j < len(p.times); j++ {
			if p.abrupt[j] {
				out = append(out, p.times[j])
			}
		}
	}
	sort.Slice(out, func(a, b int) bool { return out[a] < out[b] })
	ts := make([]time.Time, len(out))
	for i, s := range out {
		ts[i] = time.Unix(s, 0).UTC()
	}
	return ts
}

// periodAt is the index of the period in force at Unix time t, or just
// before it (before), -1 when none.
func (r *Rater) periodAt(t int64, before bool) int {
	return lastAtOrBefore(r.froms, t, before)
}

// lastAtOrBefore returns the last index i with keys[i] ≤ t (keys[i] < t
// when strict), keys ascending; -1 when none.
func lastAtOrBefore(keys []int64, t int64, strict bool) int {
	lo, hi := 0, len(keys) // the answer + 1 lies in [lo, hi]
	for lo < hi {
		m := int(uint(lo+hi) >> 1)
		if keys[m] < t || !strict && keys[m] == t {
			lo = m + 1
		} else {
			hi = m
		}
	}
	return lo - 1
}

// At rates gauge height h at time t (taken to the second).
func (r *Rater) At(t time.Time, h float64) Rated { return r.AtUnix(t.Unix(), h, false) }

// AtUnix rates gauge height h at Unix time sec. With before it rates with
// what was in force just before sec (the left limit at a period's
// beginning or an abrupt diagram), as the end of an interval reaching sec
// from the left needs.
//
// The shift between diagrams A and B of one period, at times t_A < t ≤ t_B,
// is prorated linearly in time,
//
//	s(t, h) = s_A(h) + (t − t_A)/(t_B − t_A) · (s_B(h) − s_A(h)),
//
// unless B is abrupt: then s_A(h) holds until t_B. Before the first diagram
// of a period, A is zero shift at the period's start t_0 (no shift at all
// before the first diagram when it is abrupt or the period has no start),
//
//	s(t, h) = (t − t_0)/(t_B − t_0) · s_B(h);
//
// after the last diagram it holds (see History). The effective gauge
// height h + s is read on the period's rating (see Rating.Discharge).
//
// References:
//
//	Kennedy, E.J., 1983, Computation of continuous records of streamflow:
//	USGS Techniques of Water-Resources Investigations, book 3, chap. A13
//	(shift-adjustment variation diagrams with time and stage).
func (r *Rater) AtUnix(sec int64, h float64, before bool) Rated {
	out := Rated{Period: r.periodAt(sec, before), Shift: math.NaN(), Effective: math.NaN(), Discharge: math.NaN(), Lookup: NoRating}
	if out.Period < 0 || r.periods[out.Period].rating == nil {
		return out
	}
	p := &r.periods[out.Period]
	out.Shift = p.shiftAt(sec, h, before)
	out.Effective = h + out.Shift
	out.Discharge, out.Lookup = p.rating.Discharge(out.Effective)
	out.AboveGaugings = p.rating.AboveGaugings(out.Effective)
	return out
}

// shiftAt is the period's shift at Unix time t and gauge height h.
func (p *periodRater) shiftAt(t int64, h float64, before bool) float64 {
	n := len(p.times)
	if n == 0 {
		return 0
	}
	j := lastAtOrBefore(p.times, t, before)
	switch {
	case j < 0:
		// Before the period's first diagram: prorated from no shift at the
		// period's start, when it has one and the diagram is not abrupt.
		if p.abrupt[0] || !p.hasStart() || p.times[0] <= p.from {
			return 0
		}
		w := float64(t-p.from) / float64(p.times[0]-p.from)
		return w * p.curves[0].at(h)
	case j == n-1:
		return p.curves[n-1].at(h)
	case p.abrupt[j+1]:
		return p.curves[j].at(h)
	}
	sa, sb := p.curves[j].at(h), p.curves[j+1].at(h)
	w := float64(t-p.times[j]) / float64(p.times[j+1]-p.times[j])
	return sa + w*(sb-sa)
}
