package reach

import (
	"math"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
)

// pocketSection is a compound section whose left floodplain lies behind
// a ridge higher than both ends; the left end is the lower. Above it the
// flow spreads over the right floodplain, and a discharge subcritical at
// the lower end's stage passes through critical twice more above it.
func pocketSection(t *testing.T) subdivide.Geometry {
	t.Helper()
	p, err := subdivide.Compile(subdivide.Section{Name: "pocket",
		Points:   subdivide.XZ(0, 3.55, 20, 3.6, 30, 3.9, 35, 4.6, 40, 3.5, 42, 1.0, 46, 0.8, 48, 1.2, 50, 3.5, 80, 3.7, 110, 4.2, 130, 5.0),
		N:        []float64{0.05, 0.05, 0.05, 0.05, 0.03, 0.03, 0.03, 0.03, 0.08, 0.08, 0.08},
		HasBanks: true, LeftBank: 40, RightBank: 50})
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// TestCriticalCrossingsMatchCriticalStages: the step-backwater solver's
// critical stages (its start at critical depth and its fallback where no
// subcritical stage balances) are those of rating.CriticalStages, which
// solve reports, above the section's lower end too.
func TestCriticalCrossingsMatchCriticalStages(t *testing.T) {
	g := pocketSection(t)
	m, err := newBWModel(g, subdivide.Options{}, rating.SI)
	if err != nil {
		t.Fatal(err)
	}
	c, err := m.criticalCurve()
	if err != nil {
		t.Fatal(err)
	}
	above := 0
	for q := 20.0; q <= 120; q += 5 {
		want, err := rating.CriticalStages(g, q, rating.Options{})
		if err != nil {
			t.Fatal(err)
		}
		got, err := c.crossings(q*q, nil)
		if err != nil {
			t.Fatal(err)
		}
		if len(got) != len(want) {
			t.Errorf("Q %g: backwater's critical stages %+v, CriticalStages %+v", q, got, want)
			continue
		}
		for i := range got {
			if math.Abs(got[i].h-want[i].Stage) > 10*rating.DepthTolerance*want[i].Depth || got[i].rising != want[i].Rising {
				t.Errorf("Q %g: backwater's critical stage %+v, CriticalStages %+v", q, got[i], want[i])
			}
			if want[i].Stage > g.Top() {
				above++
			}
		}
	}
	if above == 0 {
		t.Error("no critical stage above the lower end: the case checks nothing")
	}
}
