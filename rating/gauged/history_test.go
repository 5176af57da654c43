package gauged

import (
	"errors"
	"math"
	"slices"
	"strings"
	"testing"
	"time"

	"wetline/rating"
)

// linearRating is Q = k·h on 0 ≤ h ≤ 10 (two rows, linear between them).
func linearRating(name string, k float64) *RatingTable {
	return &RatingTable{Name: name, Points: []RatingPoint{{0, 0}, {10, 10 * k}}}
}

func compileHistory(t *testing.T, h History) *Rater {
	t.Helper()
	r, err := h.Compile()
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// TestProrationHalfway: half-way in time between two diagrams the shift is
// the mean of the two, at every stage.
//
//	A (1 March): (0.5, 0.10), (1.5, 0.00)     B (11 March): (0.5, 0.04), (1.5, 0.02)
//	6 March is half-way (5 of 10 days); at h = 1.0: s_A = 0.05, s_B = 0.03,
//	s = 0.05 + 0.5·(0.03 − 0.05) = 0.04; at h = 0.5: 0.10 + 0.5·(0.04 − 0.10) = 0.07;
//	at 3.5 days (0.35): h = 1.0 gives 0.05 − 0.35·0.02 = 0.043.
//	After B, B holds. The period has no start, so before A there is no
//	shift (TestShiftBeforeFirstDiagram).
func TestProrationHalfway(t *testing.T) {
	a := ShiftDiagram{Time: march(1), Points: []ShiftPoint{{0.5, 0.10}, {1.5, 0.00}}}
	b := ShiftDiagram{Time: march(11), Points: []ShiftPoint{{0.5, 0.04}, {1.5, 0.02}}}
	r := compileHistory(t, History{Periods: []Period{{Rating: linearRating("base", 10)}}, Shifts: []ShiftDiagram{a, b}})
	for _, tc := range []struct {
		at   time.Time
		h, s float64
	}{
		{march(6), 1.0, 0.04},
		{march(6), 0.5, 0.07},
		{march(4).Add(12 * time.Hour), 1.0, 0.043},
		{march(1), 1.0, 0.05},
		{march(1).Add(-48 * time.Hour), 1.0, 0},
		{march(11), 1.0, 0.03},
		{march(20), 0.5, 0.04},
	} {
		v := r.At(tc.at, tc.h)
		if math.Abs(v.Shift-tc.s) > shiftTol {
			t.Errorf("%s h=%g: shift %v, want %v", tc.at.Format(time.DateOnly), tc.h, v.Shift, tc.s)
		}
		// Q = 10·(h + s) on the linear rating.
		if math.Abs(v.Discharge-10*(tc.h+tc.s)) > ratingTol || v.Effective != tc.h+v.Shift || v.Lookup != InTable {
			t.Errorf("%s h=%g: %+v", tc.at.Format(time.DateOnly), tc.h, v)
		}
	}
}

// TestAbruptSwitch: a diagram that starts abruptly (a flood reshaped the
// control on 11 March) is not prorated: the previous diagram holds up to
// the flood, the new one from it.
//
//	A (1 March) constant 0.10; B (11 March, abrupt) constant −0.05.
//	10 March 23:59: 0.10 (prorated it would be 0.10 − 0.15·(9.999/10) ≈ −0.05).
//	11 March 00:00: −0.05; just before it (the left limit): 0.10.
//	Not abrupt, on 6 March: 0.10 + 0.5·(−0.15) = 0.025.
//	A, the first diagram of a period with no start, takes effect at once
//	too: the breaks are 1 and 11 March.
func TestAbruptSwitch(t *testing.T) {
	a := ShiftDiagram{Time: march(1), Points: []ShiftPoint{{1, 0.10}}}
	b := ShiftDiagram{Time: march(11), Points: []ShiftPoint{{1, -0.05}}, Abrupt: true}
	h := History{Periods: []Period{{Rating: linearRating("base", 10)}}, Shifts: []ShiftDiagram{a, b}}
	r := compileHistory(t, h)
	check := func(what string, got, want float64) {
		t.Helper()
		if math.Abs(got-want) > shiftTol {
			t.Errorf("%s: %v, want %v", what, got, want)
		}
	}
	check("6 March", r.At(march(6), 1).Shift, 0.10)
	check("10 March 23:59", r.At(march(11).Add(-time.Minute), 1).Shift, 0.10)
	check("11 March", r.At(march(11), 1).Shift, -0.05)
	check("left limit at the flood", r.AtUnix(march(11).Unix(), 1, true).Shift, 0.10)
	check("after", r.At(march(25), 1).Shift, -0.05)
	if br := r.Breaks(); len(br) != 2 || !br[0].Equal(march(1)) || !br[1].Equal(march(11)) {
		t.Errorf("breaks %v, want the first diagram and the flood", br)
	}
	h.Shifts[1].Abrupt = false
	check("6 March, prorated", compileHistory(t, h).At(march(6), 1).Shift, 0.025)
}

// TestShiftBeforeFirstDiagram: a rating period starts with no shift (its
// rating as published); an abrupt diagram takes effect at its own time; a
// diagram not abrupt is prorated from zero at its period's start, and the
// first diagram of a period without a start (the first period of an open
// history) takes effect at its time, with a warning unless it is zero.
// Shifts prorated between measurements and applied from the measurement
// that defines them: Kennedy, 1983, USGS TWRI 3-A13, from memory.
//
// Q = 10·h, h = 1. One diagram D on 11 March, constant −0.10 (so Q = 9
// from D on). By hand:
//
//	period from 1 March, D abrupt:  6 March 0 (Q 10); 10 March 23:59 0;
//	  11 March −0.10; the left limit at 11 March 0; a break at 11 March.
//	period from 1 March, D not abrupt: 1 March 0; 3 March (2 of 10 days)
//	  −0.02; 6 March (5 of 10) −0.05 (Q 9.5); 11 March −0.10 and so is its
//	  left limit; 20 March −0.10; no break.
//	open period, D abrupt or not: 6 March 0; 11 March −0.10; left limit 0;
//	  a break at 11 March; a warning only when D is not abrupt.
//	open period, D not abrupt but zero: 0 throughout, no break, no warning.
//	a second period from 20 March (Q = 20·h) with D2 on 30 March, +0.20 not
//	  abrupt: 20 March 0 (Q 20), its left limit −0.10 (period 1, D held);
//	  25 March (5 of 10 days) +0.10 (Q 22); before, the nearest diagram
//	  (D2) held back to 20 March, giving +0.20 there.
func TestShiftBeforeFirstDiagram(t *testing.T) {
	type at struct {
		t      time.Time
		before bool
		shift  float64
	}
	minute := time.Minute
	for _, tc := range []struct {
		name    string
		from    time.Time // the first period's start; zero: none
		abrupt  bool
		shift   float64 // D's shift
		second  bool    // add the second period and D2
		want    []at
		breaks  []time.Time
		warning string
	}{
		{"period start, abrupt", march(1), true, -0.10, false,
			[]at{{march(6), false, 0}, {march(11).Add(-minute), false, 0}, {march(11), false, -0.10}, {march(11), true, 0}},
			[]time.Time{march(11)}, ""},
		{"period start, prorated", march(1), false, -0.10, false,
			[]at{{march(1), false, 0}, {march(3), false, -0.02}, {march(6), false, -0.05}, {march(11), false, -0.10}, {march(11), true, -0.10}, {march(20), false, -0.10}},
			nil, ""},
		{"open period, abrupt", time.Time{}, true, -0.10, false,
			[]at{{march(6), false, 0}, {march(11), false, -0.10}, {march(11), true, 0}},
			[]time.Time{march(11)}, ""},
		{"open period, not abrupt", time.Time{}, false, -0.10, false,
			[]at{{march(6), false, 0}, {march(11), false, -0.10}, {march(11), true, 0}},
			[]time.Time{march(11)}, "the shift diagram of 2024-03-11T00:00:00Z (s:2) is not abrupt, but it is the first of a rating period with no start time"},
		{"open period, zero diagram", time.Time{}, false, 0, false,
			[]at{{march(6), false, 0}, {march(11), false, 0}},
			nil, ""},
		{"second period", march(1), true, -0.10, true,
			[]at{{march(20), false, 0}, {march(20), true, -0.10}, {march(25), false, 0.10}, {march(30), false, 0.20}},
			[]time.Time{march(11), march(20)}, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			h := History{Periods: []Period{{From: tc.from, Rating: linearRating("ten", 10)}},
				Shifts: []ShiftDiagram{{Time: march(11), Points: []ShiftPoint{{Stage: math.NaN(), Shift: tc.shift}}, Abrupt: tc.abrupt, Source: "s:2"}}}
			if tc.second {
				h.Periods = append(h.Periods, Period{From: march(20), Rating: linearRating("twenty", 20)})
				h.Shifts = append(h.Shifts, ShiftDiagram{Time: march(30), Points: []ShiftPoint{{Stage: math.NaN(), Shift: 0.20}}})
			}
			r := compileHistory(t, h)
			for _, w := range tc.want {
				v := r.AtUnix(w.t.Unix(), 1, w.before)
				k := 10.0
				if v.Period == 1 {
					k = 20
				}
				if math.Abs(v.Shift-w.shift) > shiftTol || math.Abs(v.Discharge-k*(1+w.shift)) > ratingTol {
					t.Errorf("%s (before %v): shift %v, Q %v; want %v, Q %v", w.t.Format(time.DateTime), w.before, v.Shift, v.Discharge, w.shift, k*(1+w.shift))
				}
			}
			br := r.Breaks()
			if len(br) != len(tc.breaks) {
				t.Fatalf("breaks %v, want %v", br, tc.breaks)
			}
			for i := range br {
				if !br[i].Equal(tc.breaks[i]) {
					t.Errorf("breaks %v, want %v", br, tc.breaks)
				}
			}
			switch {
			case tc.warning == "" && len(r.Warnings) > 0:
				t.Errorf("warnings %q, want none", r.Warnings)
			case tc.warning != "" && (len(r.Warnings) != 1 || !strings.HasPrefix(r.Warnings[0], tc.warning)):
				t.Errorf("warnings %q, want %q", r.Warnings, tc.warning)
			}
		})
	}
}

// TestPeriods: the rating in force follows the periods; shifts stay in
// their period; outside every period or in a period without a rating there
// is no discharge.
//
//	period 0 from 10 March: Q = 10·h; period 1 from 20 March: no rating;
//	period 2 from 25 March: Q = 20·h.
//	A diagram of 12 March (+0.1) shifts period 0 only, prorated from no
//	shift at its start: h = 1 gives Q = 10 on 10 March, 10·(1 + 0.05) = 10.5
//	on 11 March (half-way), 11 on 15 March.
//	26 March, h = 1: Q = 20 (period 2 has no diagram: no shift).
func TestPeriods(t *testing.T) {
	h := History{
		Periods: []Period{{From: march(10), Rating: linearRating("one", 10)}, {From: march(20)}, {From: march(25), Rating: linearRating("two", 20)}},
		Shifts:  []ShiftDiagram{{Time: march(5), Points: []ShiftPoint{{1, 0.3}}}, {Time: march(12), Points: []ShiftPoint{{1, 0.1}}}, {Time: march(22), Points: []ShiftPoint{{1, 0.2}}}},
	}
	r := compileHistory(t, h)
	for _, tc := range []struct {
		at     time.Time
		period int
		q      float64
		how    Lookup
	}{
		{march(1), -1, math.NaN(), NoRating},
		{march(10), 0, 10, InTable},
		{march(11), 0, 10.5, InTable},
		{march(15), 0, 11, InTable},
		{march(21), 1, math.NaN(), NoRating},
		{march(26), 2, 20, InTable},
	} {
		v := r.At(tc.at, 1)
		if v.Period != tc.period || v.Lookup != tc.how || !(math.Abs(v.Discharge-tc.q) < ratingTol || math.IsNaN(tc.q) && math.IsNaN(v.Discharge)) {
			t.Errorf("%s: %+v, want period %d Q %v (%v)", tc.at.Format(time.DateOnly), v, tc.period, tc.q, tc.how)
		}
	}
	if r.ShiftPeriod(0) != -1 || r.ShiftPeriod(1) != 0 || r.ShiftPeriod(2) != -1 || len(r.Warnings) != 2 {
		t.Errorf("shift periods %d %d %d, warnings %q", r.ShiftPeriod(0), r.ShiftPeriod(1), r.ShiftPeriod(2), r.Warnings)
	}
	if v := r.AtUnix(march(10).Unix(), 1, true); v.Lookup != NoRating {
		t.Errorf("just before the first period: %+v", v)
	}
	br := r.Breaks()
	if len(br) != 2 || !br[0].Equal(march(20)) || !br[1].Equal(march(25)) {
		t.Errorf("breaks %v", br)
	}
	h.Periods[1].From = march(10)
	if _, err := h.Compile(); !errors.Is(err, ErrPeriodOrder) {
		t.Errorf("periods out of order: %v", err)
	}
}

// TestCheckGaugings: a gauging's shift and departure by hand.
//
// Rating (0.2, 0), (0.7, 2), (1.2, 8), e = 0.2 (log-linear above 0.7,
// Q = 2·((h − 0.2)/0.5)²). A good gauging at 0.90 m measuring 4.5 m³/s:
//
//	rated at 0.90: 2·(0.7/0.5)² = 3.92; departure 100·(4.5 − 3.92)/3.92 = 14.796 %, outside 5 %
//	rating stage of 4.5: 0.95 (see TestRatingLogLinear); shift 0.95 − 0.90 = +0.05
//
// With a diagram of +0.05 in force, the shifted departure is 0. A second
// gauging two hours later at 1.0 m, 6.48 m³/s (rated 5.12, the rating
// stage of 6.48 is 0.2 + 0.5·√3.24 = 1.1: shift +0.10), joins the visit.
func TestCheckGaugings(t *testing.T) {
	rt := &RatingTable{Name: "r", Points: []RatingPoint{{0.2, 0}, {0.7, 2}, {1.2, 8}}, HasZeroFlow: true, ZeroFlow: 0.2}
	at := time.Date(2024, 6, 3, 10, 0, 0, 0, time.UTC)
	gs := []Gauging{
		{Time: at, Stage: 0.90, Discharge: 4.5, Quality: rating.Good, Source: "g:2"},
		{Time: at.Add(2 * time.Hour), Stage: 1.0, Discharge: 6.48, Quality: rating.Fair, Source: "g:3"},
		{Time: at.Add(30 * 24 * time.Hour), Stage: 0.9, Discharge: 3.92, Quality: rating.Excellent, Source: "g:4"},
	}
	r := compileHistory(t, History{Periods: []Period{{Rating: rt}}})
	c, err := r.CheckGaugings(gs, CheckOptions{})
	if err != nil {
		t.Fatal(err)
	}
	g := c.Gaugings[0]
	if math.Abs(g.Rated-3.92) > ratingTol || math.Abs(g.Departure-100*0.58/3.92) > percentTol || !g.Outside ||
		math.Abs(g.Shift-0.05) > ratingTol || g.Applied != 0 || math.Abs(g.Residual-0.05) > ratingTol {
		t.Errorf("first gauging %+v", g)
	}
	if s := c.Gaugings[1].Shift; math.Abs(s-0.10) > ratingTol {
		t.Errorf("second gauging's shift %v, want 0.10", s)
	}
	if len(c.Visits) != 2 || len(c.Visits[0].Gaugings) != 2 {
		t.Fatalf("visits %+v", c.Visits)
	}
	p := c.Visits[0].Proposal
	if !p.Time.Equal(at) || len(p.Points) != 2 || math.Abs(p.Points[0].Shift-0.05) > ratingTol || p.Points[1].Stage != 1.0 {
		t.Errorf("proposal %+v", p)
	}
	if p := c.Visits[1].Proposal; len(p.Points) != 1 || math.Abs(p.Points[0].Shift) > ratingTol {
		t.Errorf("third gauging's proposal %+v (it lies on the rating)", p)
	}
	// Feed the first proposal back: the first gauging is then on the
	// shifted rating.
	r2 := compileHistory(t, History{Periods: []Period{{Rating: rt}}, Shifts: []ShiftDiagram{p}})
	c2, err := r2.CheckGaugings(gs[:1], CheckOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if g := c2.Gaugings[0]; math.Abs(g.Applied-0.05) > ratingTol || math.Abs(g.ShiftedDeparture) > percentTol || g.OutsideShifted || math.Abs(g.Residual) > ratingTol {
		t.Errorf("with the proposal applied: %+v", g)
	}
}

// TestCheckGaugingsVisitAcrossBreak: gaugings within the visit gap but
// under two rating periods make two visits, each with its own period,
// diagram and source; gaugings of one period within the gap stay one.
//
// Ratings Q = 10h until 11:00 and Q = 20h from then (linear, through 0):
// at 10:00, h = 1.0, Q = 12 gives the stage 1.2 on the first, a shift of
// +0.2; at 12:00, h = 1.5, Q = 32 gives 1.6 on the second, +0.1 (by hand).
func TestCheckGaugingsVisitAcrossBreak(t *testing.T) {
	at := time.Date(2024, 6, 3, 10, 0, 0, 0, time.UTC)
	type part struct {
		period int
		time   time.Time
		source string
		shift  float64
	}
	for _, tc := range []struct {
		name string
		brk  time.Time
		want []part
	}{
		{"break between the gaugings", at.Add(time.Hour), []part{{0, at, "g:2", 0.2}, {1, at.Add(2 * time.Hour), "g:3", 0.1}}},
		{"break after both", at.Add(3 * time.Hour), []part{{0, at, "g:2", math.NaN()}}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			h := History{Periods: []Period{{Rating: linearRating("ten", 10)}, {From: tc.brk, Rating: linearRating("twenty", 20)}}}
			gs := []Gauging{
				{Time: at, Stage: 1.0, Discharge: 12, Quality: rating.Good, Source: "g:2"},
				{Time: at.Add(2 * time.Hour), Stage: 1.5, Discharge: 32, Quality: rating.Good, Source: "g:3"},
			}
			c, err := compileHistory(t, h).CheckGaugings(gs, CheckOptions{})
			if err != nil {
				t.Fatal(err)
			}
			if len(c.Visits) != len(tc.want) {
				t.Fatalf("visits %+v, want %d", c.Visits, len(tc.want))
			}
			for k, w := range tc.want {
				v := c.Visits[k]
				p := v.Proposal
				if v.Period != w.period || !v.Time.Equal(w.time) || !p.Time.Equal(w.time) || p.Source != w.source {
					t.Errorf("visit %d: period %d at %v, proposal %+v; want period %d at %v from %s", k, v.Period, v.Time, p, w.period, w.time, w.source)
				}
				for _, i := range v.Gaugings {
					if c.Gaugings[i].Period != v.Period {
						t.Errorf("visit %d holds gauging %d of period %d", k, i, c.Gaugings[i].Period)
					}
				}
				if !math.IsNaN(w.shift) && (len(p.Points) != 1 || math.Abs(p.Points[0].Shift-w.shift) > ratingTol) {
					t.Errorf("visit %d: diagram %+v, want one point of shift %g", k, p.Points, w.shift)
				}
			}
		})
	}
}

// TestMessagesInOffset: the rater's and the check's warnings write times
// in the offset asked for, as the reports do; the instants are the same.
// 00:00 UTC on 3 June 2024 is 10:00 at +10:00 and 19:00 on 2 June at -05:00.
func TestMessagesInOffset(t *testing.T) {
	at := time.Date(2024, 6, 3, 0, 0, 0, 0, time.UTC)
	for _, tc := range []struct {
		offset time.Duration
		when   string
	}{
		{0, "2024-06-03T00:00:00Z"},
		{10 * time.Hour, "2024-06-03T10:00:00+10:00"},
		{-5 * time.Hour, "2024-06-02T19:00:00-05:00"},
	} {
		t.Run(tc.when, func(t *testing.T) {
			h := History{Periods: []Period{{From: at.Add(time.Hour), Rating: linearRating("q=10h", 10)}},
				Shifts: []ShiftDiagram{{Time: at, Points: []ShiftPoint{{Stage: 1, Shift: 0.1}}}}, UTCOffset: tc.offset}
			r := compileHistory(t, h)
			c, err := r.CheckGaugings([]Gauging{{Time: at, Stage: 1, Discharge: 12, Source: "g:2"}}, CheckOptions{UTCOffset: tc.offset})
			if err != nil {
				t.Fatal(err)
			}
			for _, want := range []string{"the shift diagram of " + tc.when + " is not used", "g:2: no rating is in force at " + tc.when} {
				found := false
				for _, w := range c.Warnings {
					found = found || strings.HasPrefix(w, want)
				}
				if !found {
					t.Errorf("no warning %q in %q", want, c.Warnings)
				}
			}
		})
	}
}

// TestCheckGaugingsNoShift: a gauging under a rating whose shift cannot be
// measured is marked NoShift; a zero discharge where the rating has flow
// is warned of. Rating (0.2, 0), (0.7, 2), (1.2, 8), e = 0.2 (Q = 2 at
// 0.7 m, 3.92 at 0.9 m by hand, see TestCheckGaugings).
func TestCheckGaugingsNoShift(t *testing.T) {
	rt := &RatingTable{Name: "r", Points: []RatingPoint{{0.2, 0}, {0.7, 2}, {1.2, 8}}, HasZeroFlow: true, ZeroFlow: 0.2}
	at := time.Date(2024, 6, 3, 10, 0, 0, 0, time.UTC)
	for _, tc := range []struct {
		name    string
		g       Gauging
		noShift bool
		warning string
	}{
		{"zero where the rating has flow", Gauging{Time: at, Stage: 0.9, Discharge: 0, Source: "g:2"}, true,
			`g:2: zero discharge measured at gauge height 0.9, where the rating "r" gives 3.92: no shift can be measured`},
		{"zero below e", Gauging{Time: at, Stage: 0.1, Discharge: 0, Source: "g:3"}, false, ""},
		{"beyond the table", Gauging{Time: at, Stage: 1.0, Discharge: 9, Source: "g:4"}, true, "g:4: no shift: "},
		{"measured", Gauging{Time: at, Stage: 0.9, Discharge: 4.5, Source: "g:5"}, false, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c, err := compileHistory(t, History{Periods: []Period{{Rating: rt}}}).CheckGaugings([]Gauging{tc.g}, CheckOptions{})
			if err != nil {
				t.Fatal(err)
			}
			if g := c.Gaugings[0]; g.NoShift != tc.noShift || g.NoShift != math.IsNaN(g.Shift) && g.Discharge > 0 {
				t.Errorf("NoShift %v (shift %v), want %v", g.NoShift, g.Shift, tc.noShift)
			}
			found := false
			for _, w := range c.Warnings {
				found = found || tc.warning != "" && strings.HasPrefix(w, tc.warning)
			}
			if tc.warning != "" && !found {
				t.Errorf("no warning %q in %q", tc.warning, c.Warnings)
			}
		})
	}
}

// A visit whose two gaugings make a diagram falling faster than the stage
// rises proposes none, with a warning.
func TestCheckGaugingsRefusedProposal(t *testing.T) {
	rt := linearRating("q=10h", 10)
	at := time.Date(2024, 6, 3, 10, 0, 0, 0, time.UTC)
	// Q = 10(h + s): at 1.0, Q 15 → s = 0.5; at 1.2, Q 12.5 → s = 0.05: slope −2.25.
	gs := []Gauging{{Time: at, Stage: 1.0, Discharge: 15}, {Time: at.Add(time.Hour), Stage: 1.2, Discharge: 12.5}}
	c, err := compileHistory(t, History{Periods: []Period{{Rating: rt}}}).CheckGaugings(gs, CheckOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(c.Visits) != 1 || c.Visits[0].Proposal.Points != nil || len(c.Warnings) != 1 {
		t.Errorf("visits %+v warnings %q", c.Visits, c.Warnings)
	}
}

// TestCheckStatesHistory: a check carries the history it was measured
// against, the period of each diagram, the rater's warnings first and the
// labels of its options.
func TestCheckStatesHistory(t *testing.T) {
	rt := linearRating("q=10h", 10)
	at := time.Date(2024, 6, 3, 10, 0, 0, 0, time.UTC)
	h := History{
		Periods: []Period{{From: at.Add(-48 * time.Hour), Rating: rt}},
		Shifts: []ShiftDiagram{
			{Time: at.Add(-72 * time.Hour), Points: []ShiftPoint{{Stage: 1, Shift: 0.1}}}, // before every period: not used
			{Time: at, Points: []ShiftPoint{{Stage: 1, Shift: 0.2}}},
		},
	}
	r := compileHistory(t, h)
	c, err := r.CheckGaugings([]Gauging{{Time: at, Stage: 1, Discharge: 12, Source: "g:2"}}, CheckOptions{Units: rating.US, UTCOffset: -5 * time.Hour})
	if err != nil {
		t.Fatal(err)
	}
	if len(c.History.Periods) != 1 || len(c.History.Shifts) != 2 || c.ShiftPeriods[0] != -1 || c.ShiftPeriods[1] != 0 {
		t.Errorf("history %+v, periods %v", c.History, c.ShiftPeriods)
	}
	if len(c.Warnings) != 1 || c.Warnings[0] != r.Warnings[0] || c.Units != rating.US || c.UTCOffset != -5*time.Hour {
		t.Errorf("warnings %q (rater %q), units %v, offset %v", c.Warnings, r.Warnings, c.Units, c.UTCOffset)
	}
	// The check's copy is its own.
	c.History.Periods[0].Rating.Points[0].Discharge = 99
	if r.History().Periods[0].Rating.Points[0].Discharge == 99 {
		t.Error("the check shares the rater's tables")
	}
}

// TestCheckGaugingsMarksLookups: a gauging rated by extrapolation beyond the
// table, and one at or below the zero-flow stage, say so (Lookup and
// ShiftedLookup) and are warned of.
//
// Rating (0.2, 0), (0.7, 2), (1.2, 8), e = 0.2, extrapolation allowed:
// above 0.7 Q = 2·((h − 0.2)/0.5)², carried on above 1.2, so at 1.4 m
// Q = 2·(1.2/0.5)² = 11.52 (by hand); at 0.1 m (below e and below the
// first row) Q = 0. The gauging at 0.1 m of 0.2 m³/s: the first interval
// carries the law above down to e, so the rating's stage of 0.2 is
// 0.2 + 0.5·√0.1 = 0.358113883 (by hand), a shift of +0.258113883. The
// gauging at 0.9 m is in the table (rated 3.92, unmarked).
func TestCheckGaugingsMarksLookups(t *testing.T) {
	rt := &RatingTable{Name: "r", Points: []RatingPoint{{0.2, 0}, {0.7, 2}, {1.2, 8}}, HasZeroFlow: true, ZeroFlow: 0.2, Extrapolate: true}
	at := time.Date(2024, 6, 3, 10, 0, 0, 0, time.UTC)
	gs := []Gauging{
		{Time: at, Stage: 1.4, Discharge: 12, Quality: rating.Good, Source: "g:2"},
		{Time: at.Add(48 * time.Hour), Stage: 0.1, Discharge: 0.2, Quality: rating.Good, Source: "g:3"},
		{Time: at.Add(96 * time.Hour), Stage: 0.9, Discharge: 3.92, Quality: rating.Good, Source: "g:4"},
	}
	c, err := compileHistory(t, History{Periods: []Period{{Rating: rt}}}).CheckGaugings(gs, CheckOptions{})
	if err != nil {
		t.Fatal(err)
	}
	want := []struct {
		rated        float64
		lookup       Lookup
		shift        float64
		warnContains string
	}{
		{11.52, Extrapolated, math.NaN(), "g:2: gauge height 1.4 is beyond the rows of the rating \"r\": rated by extrapolation"},
		{0, ZeroFlow, 0.5*math.Sqrt(0.1) + 0.1, "g:3: gauge height 0.1 is at or below the zero-flow stage 0.2 of the rating \"r\": rated 0"},
		{3.92, InTable, math.NaN(), ""},
	}
	for i, w := range want {
		g := c.Gaugings[i]
		if math.Abs(g.Rated-w.rated) > ratingTol || g.Lookup != w.lookup || g.ShiftedLookup != w.lookup ||
			!math.IsNaN(w.shift) && math.Abs(g.Shift-w.shift) > ratingTol {
			t.Errorf("gauging %d: rated %v (%v, shifted %v), shift %v; want %v (%v), shift %v", i, g.Rated, g.Lookup, g.ShiftedLookup, g.Shift, w.rated, w.lookup, w.shift)
		}
		found := false
		for _, s := range c.Warnings {
			found = found || w.warnContains != "" && s == w.warnContains
		}
		if w.warnContains != "" && !found {
			t.Errorf("gauging %d: no warning %q in %q", i, w.warnContains, c.Warnings)
		}
	}
	if len(c.Warnings) != 2 {
		t.Errorf("warnings %q", c.Warnings)
	}
}

// TestCheckGaugingsAboveAndExcluded: a gauging above the rating's highest
// gauging is marked and warned of, at its gauge height or at its effective
// one; an excluded gauging keeps its numbers but counts against nothing.
//
// Q = 10·h, highest gauging 1.5 m; a diagram of +0.2 m from the period's
// start at 1 March (abrupt). By hand:
//
//	1.6 m: above at the gauge height (and at 1.8 effective);
//	1.4 m: 1.6 effective, above only there;
//	1.0 m measuring 20 (shift +1.0, departure +100 % from 10), excluded
//	  "spin test": Outside false, no diagram from it.
func TestCheckGaugingsAboveAndExcluded(t *testing.T) {
	rt := linearRating("q=10h", 10)
	rt.HasHighGauging, rt.HighGauging = true, 1.5
	h := History{Periods: []Period{{From: march(1), Rating: rt}}, Shifts: []ShiftDiagram{{Time: march(1), Points: []ShiftPoint{{Stage: math.NaN(), Shift: 0.2}}, Abrupt: true}}}
	gs := []Gauging{
		{Time: march(2), Stage: 1.6, Discharge: 18, Quality: rating.Good, Source: "g:2"},
		{Time: march(4), Stage: 1.4, Discharge: 16, Quality: rating.Good, Source: "g:3"},
		{Time: march(6), Stage: 1.0, Discharge: 20, Quality: rating.Good, Source: "g:4", Exclude: "spin test"},
	}
	c, err := compileHistory(t, h).CheckGaugings(gs, CheckOptions{})
	if err != nil {
		t.Fatal(err)
	}
	for i, w := range []struct{ above, shifted, excluded bool }{{true, true, false}, {false, true, false}, {false, false, true}} {
		if g := c.Gaugings[i]; g.AboveGaugings != w.above || g.ShiftedAboveGaugings != w.shifted || g.Excluded != w.excluded {
			t.Errorf("gauging %d: above %v, shifted above %v, excluded %v; want %+v", i+1, g.AboveGaugings, g.ShiftedAboveGaugings, g.Excluded, w)
		}
	}
	want := []string{
		`g:2: gauge height 1.6 is above the highest gauging 1.5 of the rating "q=10h": rated on its extension above the gaugings`,
		`g:3: effective gauge height 1.6 (shift 0.2 applied) is above the highest gauging 1.5 of the rating "q=10h": rated on its extension above the gaugings`,
	}
	if !slices.Equal(c.Warnings, want) {
		t.Errorf("warnings %q, want %q", c.Warnings, want)
	}
	// The extrapolation warning at an effective gauge height writes it
	// without round-off: 9.95 + 0.2 is 10.149999999999999 in binary.
	ext := linearRating("q=10h", 10)
	ext.Extrapolate = true
	h.Periods[0].Rating = ext
	ce, err := compileHistory(t, h).CheckGaugings([]Gauging{{Time: march(2), Stage: 9.95, Discharge: 102, Source: "g:5"}}, CheckOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if w := `g:5: effective gauge height 10.15 (shift 0.2 applied) is beyond the rows of the rating "q=10h": rated by extrapolation`; !slices.Contains(ce.Warnings, w) {
		t.Errorf("warnings %q, want %q", ce.Warnings, w)
	}
	g := c.Gaugings[2]
	if g.Outside || g.OutsideShifted || math.Abs(g.Departure-100) > percentTol || math.Abs(g.Shift-1) > ratingTol || len(c.Visits[2].Proposal.Points) != 0 {
		t.Errorf("excluded gauging %+v, visit %+v", g, c.Visits[2])
	}
}

// The gaugings at times without a rating are warned of in one line that
// counts them and names the first and the last in time, whatever their
// order; one such gauging keeps its own line.
func TestCheckGaugingsUnratedRolledUp(t *testing.T) {
	from := time.Date(2024, 6, 1, 0, 0, 0, 0, time.UTC)
	r := compileHistory(t, History{Periods: []Period{{From: from, Rating: linearRating("q=10h", 10)}}})
	day := func(d int) time.Time { return from.AddDate(0, 0, d) }
	for _, tc := range []struct {
		name  string
		gs    []Gauging
		wants []string
	}{
		{"one", []Gauging{{Time: day(-3), Stage: 1, Discharge: 10, Source: "g:2"}, {Time: day(1), Stage: 1, Discharge: 10, Source: "g:3"}},
			[]string{"g:2: no rating is in force at 2024-05-29T00:00:00Z"}},
		{"three", []Gauging{
			{Time: day(-3), Stage: 1, Discharge: 10, Source: "g:2"},
			{Time: day(-9), Stage: 1, Discharge: 10, Source: "g:3"},
			{Time: day(1), Stage: 1, Discharge: 10, Source: "g:4"},
			{Time: day(-5), Stage: 1, Discharge: 10, Source: "g:5"},
		}, []string{"no rating is in force at the times of 3 gaugings, the first at 2024-05-23T00:00:00Z (g:3), the last at 2024-05-29T00:00:00Z (g:2)"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c, err := r.CheckGaugings(tc.gs, CheckOptions{})
			if err != nil {
				t.Fatal(err)
			}
			var got []string
			for _, w := range c.Warnings {
				if strings.Contains(w, "no rating is in force") {
					got = append(got, w)
				}
			}
			if !slices.Equal(got, tc.wants) {
				t.Errorf("warnings %q, want %q", got, tc.wants)
			}
			for i, g := range c.Gaugings {
				if unrated := tc.gs[i].Time.Before(from); (g.Lookup == NoRating) != unrated {
					t.Errorf("gauging %d: lookup %v", i, g.Lookup)
				}
			}
		})
	}
}
