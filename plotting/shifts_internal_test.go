package plotting

import (
	"slices"
	"strings"
	"testing"
	"time"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"

	"wetline/rating"
	"wetline/rating/gauged"
)

// The applied-shift line of the shift-against-time figure is broken where
// the shift does not run on from one gauging to the next: at a rating
// period's start and at an abrupt diagram, and nowhere else.
func TestShiftLineBreaks(t *testing.T) {
	day := func(d int) time.Time { return time.Date(2025, 1, d, 0, 0, 0, 0, time.UTC) }
	x := func(d int) float64 { return float64(day(d).Unix()) }
	c := &gauged.ShiftCheck{History: gauged.History{
		Periods: []gauged.Period{{From: day(1)}, {From: day(10)}},
		Shifts: []gauged.ShiftDiagram{
			{Time: day(3)},
			{Time: day(20), Abrupt: true},
		},
	}}
	breaks := shiftBreaks(c)
	if len(breaks) != 2 || breaks[0] != x(10) || breaks[1] != x(20) {
		t.Fatalf("breaks %v, want the period start of day 10 and the abrupt diagram of day 20", breaks)
	}
	pts := plotter.XYs{{X: x(2)}, {X: x(5)}, {X: x(9)}, {X: x(10)}, {X: x(15)}, {X: x(25)}}
	runs := splitAt(pts, breaks)
	var lens []int
	for _, r := range runs {
		lens = append(lens, len(r))
	}
	if want := []int{3, 2, 1}; !slices.Equal(lens, want) {
		t.Errorf("runs of %v points, want %v (days 2-9 | 10-15 | 25)", lens, want)
	}
	if got := splitAt(pts, nil); len(got) != 1 || len(got[0]) != len(pts) {
		t.Errorf("no breaks: %d runs, want one of every point", len(got))
	}
}

// A legend placed by legendCorner goes to the corner of the data area
// holding the fewest points, the one it had winning a tie: with points
// crowding the upper right (as late gaugings with large shifts do) it
// moves to the emptiest corner; with no points it stays.
func TestLegendCorner(t *testing.T) {
	for _, tc := range []struct {
		name      string
		pts       plotter.XYs
		top, left bool
	}{
		{"upper right crowded", plotter.XYs{{X: 9, Y: 9}, {X: 9.5, Y: 8}, {X: 1, Y: 1}, {X: 9, Y: 1}, {X: 1, Y: 9}, {X: 1.5, Y: 9}}, false, false},
		{"lower left only empty", plotter.XYs{{X: 9, Y: 9}, {X: 1, Y: 9}, {X: 9, Y: 1}}, false, true},
		{"no points", nil, true, false},
	} {
		p := plot.New()
		p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = 0, 10, 0, 10
		p.Legend.Top = true
		legendCorner(p, tc.pts)
		if p.Legend.Top != tc.top || p.Legend.Left != tc.left {
			t.Errorf("%s: top %v left %v, want top %v left %v", tc.name, p.Legend.Top, p.Legend.Left, tc.top, tc.left)
		}
	}
}

// An excluded gauging is drawn apart from the gaugings used in both shift
// figures: it sets no axis (a shift of -0.25 m beside shifts within
// ±0.03 m leaves the shift axis short of it), lies beyond the axes
// unplotted with a note at the foot naming it, is drawn hollow when it
// falls within them, and is counted apart in the subtitle.
func TestShiftFiguresExcluded(t *testing.T) {
	day := func(d int) time.Time { return time.Date(2025, 1, d, 12, 0, 0, 0, time.UTC) }
	g := func(d int, h, s float64, exclude string) gauged.GaugingShift {
		return gauged.GaugingShift{Gauging: gauged.Gauging{Time: day(d), Stage: h, Quality: rating.Good, Exclude: exclude},
			Shift: s, Applied: 0, Excluded: exclude != ""}
	}
	c := &gauged.ShiftCheck{
		Gaugings: []gauged.GaugingShift{
			g(2, 1.0, -0.02, ""), g(6, 1.4, 0.01, ""), g(10, 0.8, 0.03, ""), g(14, 1.2, 0.0, ""),
			g(18, 1.1, -0.25, "ice on the control"), // far off the rest
			g(22, 1.0, 0.005, "meter fault"),        // among them
		},
		Visits: make([]gauged.Visit, 6),
	}
	for _, tc := range []struct {
		name  string
		panel func(*gauged.ShiftCheck, string) (*plot.Plot, figure, error)
		shift func(*plot.Plot) (float64, float64)
	}{
		{"time", shiftTimePanel, func(p *plot.Plot) (float64, float64) { return p.Y.Min, p.Y.Max }},
		{"stage", shiftStagePanel, func(p *plot.Plot) (float64, float64) { return p.X.Min, p.X.Max }},
	} {
		p, fig, err := tc.panel(c, "Test Creek")
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		lo, hi := tc.shift(p)
		if lo <= -0.25 || lo > -0.02 || hi < 0.03 {
			t.Errorf("%s: shift axis %g to %g, want the used shifts -0.02 to 0.03 and not the excluded -0.25", tc.name, lo, hi)
		}
		at := func(g gauged.GaugingShift) (float64, float64) { return float64(g.Time.Unix()), g.Shift }
		if tc.name == "stage" {
			at = func(g gauged.GaugingShift) (float64, float64) { return g.Shift, g.Stage }
		}
		drawn, clipped := excludedMarks(p, c.Gaugings[4:], at)
		_, y5 := at(c.Gaugings[5])
		if len(drawn) != 1 || drawn[0].y != y5 || len(clipped) != 1 || clipped[0].Exclude != "ice on the control" {
			t.Errorf("%s: drawn %v, beyond the axes %v; want the meter fault drawn and the ice gauging beyond", tc.name, drawn, clipped)
		}
		if want := "4 of 4 gaugings used with a measured shift, 2 excluded (hollow), 6 visits;"; !strings.HasPrefix(fig.subtitle, want) {
			t.Errorf("%s: subtitle %q, want it to begin %q", tc.name, fig.subtitle, want)
		}
		if want := "Beyond the axes, not drawn: 1 excluded gauging (2025-01-18 12:00, shift -0.250 m)"; len(fig.foot) != 2 || fig.foot[0] != want {
			t.Errorf("%s: foot %q, want first %q", tc.name, fig.foot, want)
		}
	}
}

// Drawing excluded gaugings leaves the axes as the gaugings used set them.
func TestExcludedPointsKeepAxes(t *testing.T) {
	p := plot.New()
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = 0, 1, 0, 1
	addExcludedPoints(p, []gaugingPoint{{0.5, 0.5, rating.Good}, {3, -2, rating.Fair}})
	if p.X.Min != 0 || p.X.Max != 1 || p.Y.Min != 0 || p.Y.Max != 1 {
		t.Errorf("axes %g..%g, %g..%g after drawing excluded gaugings, want 0..1, 0..1", p.X.Min, p.X.Max, p.Y.Min, p.Y.Max)
	}
}
