package plotting

import (
	"math"
	"testing"
	"time"

	"wetline/rating/gauged"
	"wetline/rating/record"
)

// TestTimeTicks: a time axis is marked at calendar boundaries in its zone,
// at a step giving no more than maxTimeTicks labels.
func TestTimeTicks(t *testing.T) {
	t.Parallel()
	z := time.FixedZone("UTC+10:00", 10*3600)
	for _, c := range []struct {
		from, to time.Time
		first    string
		labels   int
	}{
		{time.Date(2024, 10, 1, 0, 0, 0, 0, z), time.Date(2025, 9, 30, 23, 45, 0, 0, z), "Nov 2024", 6},
		{time.Date(2024, 5, 1, 0, 0, 0, 0, z), time.Date(2024, 5, 2, 23, 0, 0, 0, z), "05-01 00:00", 8},
		{time.Date(2024, 5, 1, 7, 30, 0, 0, z), time.Date(2024, 5, 1, 10, 0, 0, 0, z), "08:00", 3},
		{time.Date(1995, 1, 1, 0, 0, 0, 0, z), time.Date(2025, 1, 1, 0, 0, 0, 0, z), "1995", 7},
	} {
		ticks := timeTicks{z}.Ticks(float64(c.from.Unix()), float64(c.to.Unix()))
		if len(ticks) == 0 || ticks[0].Label != c.first || len(ticks) != c.labels {
			var got []string
			for _, tk := range ticks {
				got = append(got, tk.Label)
			}
			t.Errorf("%v to %v: %q, want %d from %q", c.from, c.to, got, c.labels, c.first)
			continue
		}
		for i, tk := range ticks {
			at := time.Unix(int64(tk.Value), 0).In(z)
			if at.Minute() != 0 || at.Second() != 0 || (i > 0 && tk.Value <= ticks[i-1].Value) {
				t.Errorf("tick %d at %v", i, at)
			}
		}
	}
	if ticks := (timeTicks{}).Ticks(5, 5); ticks != nil {
		t.Errorf("an empty range has ticks %v", ticks)
	}
}

// TestRecordRuns: a long record is thinned to each interval's least and
// greatest value (so its peak is kept exactly), broken at gaps and at
// readings without a discharge.
func TestRecordRuns(t *testing.T) {
	t.Parallel()
	const n = 40000
	res := &record.Result{Units: make([]record.UnitValue, n)}
	for i := range res.Units {
		u := &res.Units[i]
		u.Time = int64(i) * 900
		u.Discharge = 1 + math.Sin(float64(i)/500)
		switch {
		case i == 12345:
			u.Discharge = 50 // a one-reading peak
		case i >= 20000 && i < 20010:
			u.Discharge = math.NaN()
		case i == 30000:
			u.Flags = record.Gap
		}
	}
	runs := recordRuns(res, func(u record.UnitValue) float64 { return u.Discharge })
	if len(runs) != 3 {
		t.Fatalf("%d runs, want 3 (broken at the missing discharges and the gap)", len(runs))
	}
	points, peak := 0, 0.0
	for _, r := range runs {
		points += len(r)
		for _, p := range r {
			peak = math.Max(peak, p.Y)
			if !finite(p.Y) {
				t.Fatalf("a point without a value: %v", p)
			}
		}
		for i := 1; i < len(r); i++ {
			if r[i].X <= r[i-1].X {
				t.Fatalf("run not in time order at %d", i)
			}
		}
	}
	if points > 2*hydroBins+2*len(runs) || peak != 50 {
		t.Errorf("%d points, peak %v", points, peak)
	}
	if runs[2][0].X != 30000*900 {
		t.Errorf("the run after the gap starts at %v", runs[2][0].X)
	}
}

// TestDiagramLine: a diagram with a taper is drawn through its point, its
// taper and its constant ends (the shifts of gauged.ShiftDiagram.At).
func TestDiagramLine(t *testing.T) {
	t.Parallel()
	d := gauged.ShiftDiagram{Points: []gauged.ShiftPoint{{Stage: 0.6, Shift: -0.03}}, HasTaper: true, Taper: 1.2}
	xy := diagramLine(d, 0.4, 2)
	want := [][2]float64{{-0.03, 0.4}, {-0.03, 0.6}, {0, 1.2}, {0, 2}}
	if len(xy) != len(want) {
		t.Fatalf("%v", xy)
	}
	for i, w := range want {
		if xy[i].X != w[0] || xy[i].Y != w[1] {
			t.Errorf("point %d %v, want %v", i, xy[i], w)
		}
	}
}
