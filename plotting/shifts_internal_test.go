package plotting

import (
	"slices"
	"testing"
	"time"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"

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
