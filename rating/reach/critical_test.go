package reach

import (
	"math"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
)

// pocketSection is a compound section whose left floodplain lies behind
// a ridge higher than both ends; the left end is the lower. Above it the
// flow spreads over the right floodplain, and a discharge subcritical at
// the lower end's stage passes through critical twice more above it.
func pocketSection(t *testing.T) subdivide.Geometry { return pocketSectionAt(t, 0) }

// pocketSectionAt is pocketSection raised by dz.
func pocketSectionAt(t *testing.T, dz float64) subdivide.Geometry {
	t.Helper()
	pts := subdivide.XZ(0, 3.55, 20, 3.6, 30, 3.9, 35, 4.6, 40, 3.5, 42, 1.0, 46, 0.8, 48, 1.2, 50, 3.5, 80, 3.7, 110, 4.2, 130, 5.0)
	for i := range pts {
		pts[i].Elevation += dz
	}
	p, err := subdivide.Compile(subdivide.Section{Name: "pocket", Points: pts,
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

// TestBoundaryInSupercriticalBand: a boundary stage between two critical
// stages of the last section (above critical depth, yet supercritical)
// starts the profile at the critical stage at the foot of the subcritical
// band above it, the least raise that makes it subcritical, and the note
// says so; a stage below every critical stage starts at critical depth.
func TestBoundaryInSupercriticalBand(t *testing.T) {
	const q = 70.0
	last := pocketSection(t)
	crit, err := rating.CriticalStages(last, q, rating.Options{})
	if err != nil || len(crit) != 3 {
		t.Fatalf("critical stages %+v, %v; want three", crit, err)
	}
	secs := []Section{
		{ID: "UP", Geometry: pocketSectionAt(t, 0.3), Distance: 0, Left: math.NaN(), Right: math.NaN()},
		{ID: "DN", Geometry: last, Distance: 200, Left: math.NaN(), Right: math.NaN()},
	}
	for _, tc := range []struct {
		name  string
		stage float64
		start float64
		note  string
	}{
		{"in the band", (crit[1].Stage + crit[2].Stage) / 2, crit[2].Stage, "in a band between its critical stages"},
		{"below critical depth", crit[0].Stage - 0.2, crit[0].Stage, "is below critical depth at DN"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if f := froudeAt(t, last, tc.stage, q); !(f > 1) {
				t.Fatalf("Froude %g at the boundary stage %g: the case checks nothing", f, tc.stage)
			}
			res, err := ComputeBackwater(secs, []float64{q}, Boundary{Kind: KnownStage, Stage: tc.stage}, BackwaterOptions{})
			if err != nil {
				t.Fatal(err)
			}
			p := res.Profiles[0]
			if !p.StartCritical || math.Abs(p.Start-tc.start) > 10*rating.DepthTolerance*(tc.start-last.Bottom()) {
				t.Errorf("start %g (critical %v), want the critical stage %g", p.Start, p.StartCritical, tc.start)
			}
			if !(p.Start > tc.stage) && tc.stage > crit[0].Stage {
				t.Errorf("start %g lowers the boundary stage %g", p.Start, tc.stage)
			}
			found := false
			for _, w := range p.Warnings {
				found = found || strings.Contains(w, tc.note)
			}
			if !found {
				t.Errorf("no note %q in %q", tc.note, p.Warnings)
			}
		})
	}
}
