package rating_test

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
)

// manning is Manning's discharge of one subsection of area a and wetted
// perimeter p, Q = (1/n)·A·(A/P)^(2/3)·√S in SI units (Chow, 1959,
// Open-Channel Hydraulics, McGraw-Hill, eq. 5-7).
func manning(a, p, n, s float64) float64 {
	return a * math.Pow(a/p, 2.0/3) * math.Sqrt(s) / n
}

// TestPocketJoins checks the step of a rating where a pocket behind a
// levee joins the flow: the stage is the surveyed crest, exactly, and the
// discharges at the crest and just above it are Manning's on the section
// without and with the pocket, its area and wetted perimeter summed by
// hand from the straight ground under the crest's level.
func TestPocketJoins(t *testing.T) {
	const n, slope = 0.035, 0.001
	sec := subdivide.Section{
		Points: []subdivide.Point{{Station: 0, Elevation: 5}, {Station: 10, Elevation: 0}, {Station: 20, Elevation: 3.6},
			{Station: 25, Elevation: 1}, {Station: 30, Elevation: 1}, {Station: 35, Elevation: 5}},
		N: []float64{n, n, n, n, n},
	}
	p, err := subdivide.Compile(sec)
	if err != nil {
		t.Fatal(err)
	}
	// At 3.6 the channel is wet from x = 2.8 to the crest at 20; the
	// pocket from 20 down to 1 at 25, flat to 30 and up to 3.6 at 33.25.
	chA := 7.2*3.6/2 + 10*3.6/2
	chP := math.Hypot(7.2, 3.6) + math.Hypot(10, 3.6)
	poA := 5*2.6/2 + 5*2.6 + 3.25*2.6/2
	poP := math.Hypot(5, 2.6) + 5 + math.Hypot(3.25, 2.6)
	before, after := manning(chA, chP, n, slope), manning(chA+poA, chP+poP, n, slope)

	opt := rating.Options{Slope: slope}
	joins, err := rating.PocketJoins(p, opt)
	if err != nil {
		t.Fatal(err)
	}
	if len(joins) != 1 {
		t.Fatalf("joins %+v, want one", joins)
	}
	j := joins[0]
	if j.Stage != 3.6 {
		t.Errorf("join at %v, want the crest 3.6", j.Stage)
	}
	if !within(j.Before.Discharge, before, 1e-12) || !within(j.After.Discharge, after, 1e-12) {
		t.Errorf("discharge %v → %v, want Manning's %v → %v", j.Before.Discharge, j.After.Discharge, before, after)
	}
	for _, c := range []struct {
		name   string
		stages []float64
		opt    rating.Options
		warned bool
	}{
		{"across the crest", []float64{3, 3.6, 4}, opt, true},
		{"at the crest and above", []float64{3.6, 3.7}, opt, true},
		{"above the crest only", []float64{3.61, 4}, opt, false},
		{"up to the crest", []float64{3, 3.6}, opt, false},
		{"every pool counted", []float64{3, 4}, rating.Options{Slope: slope, Geometry: subdivide.Options{AllPools: true}}, false},
	} {
		tab, err := rating.Compute(p, c.stages, c.opt)
		if err != nil {
			t.Fatal(err)
		}
		var got []string
		for _, w := range tab.Warnings {
			if strings.Contains(w, "joins the flow") {
				got = append(got, w)
			}
		}
		want := 0
		if c.warned {
			want = 1
		}
		if len(got) != want {
			t.Errorf("%s: join warnings %q, want %d", c.name, got, want)
			continue
		}
		if c.warned && !strings.HasPrefix(got[0], "at 3.6 m ") {
			t.Errorf("%s: %q does not start at the crest", c.name, got[0])
		}
	}
}

// Rated at gauge heights, the table words the join at the crest's gauge
// height, the surveyed crest less the datum.
func TestPocketJoinGaugeHeights(t *testing.T) {
	p, err := subdivide.Compile(subdivide.Section{
		Points: []subdivide.Point{{Station: 0, Elevation: 105}, {Station: 10, Elevation: 100}, {Station: 20, Elevation: 103.6},
			{Station: 25, Elevation: 101}, {Station: 30, Elevation: 101}, {Station: 35, Elevation: 105}},
		N: []float64{0.035, 0.035, 0.035, 0.035, 0.035},
	})
	if err != nil {
		t.Fatal(err)
	}
	rep, err := rating.Rate(p, []float64{3.5, 3.6, 3.7}, rating.RateOptions{Options: rating.Options{Slope: 0.001}, GaugeHeights: true, Datum: 100})
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, w := range rep.Warnings {
		if strings.Contains(w, "joins the flow") {
			got = append(got, w)
		}
	}
	if len(got) != 1 || !strings.HasPrefix(got[0], "at gauge height 3.6 m (elevation 103.6 m) ") {
		t.Errorf("join warnings %q, want one at gauge height 3.6 m", got)
	}
}

func within(a, b, tol float64) bool {
	return math.Abs(a-b) <= tol*math.Max(math.Abs(a), math.Abs(b))
}

// scatterSection is a V-shaped channel whose right floodplain rises in
// small crests and hollows, as a survey with a centimetre or two of
// scatter gives, with one deep back-swamp beyond: every crest is a
// running maximum walking out of the channel, so each joins the flow.
var scatterSection = subdivide.XZ(0, 104, 10, 100, 20, 102, 21, 101.99, 22, 102.02, 23, 102.01, 24, 102.03,
	24.2, 102.025, 24.4, 102.04, 25.4, 102.03, 26.4, 102.06, 26.6, 102.055, 26.8, 102.07, 28, 102.06,
	29, 102.09, 30, 102.08, 31, 102.11, 32, 101.5, 36, 101.5, 37, 102.2, 40, 105)

// underGround returns the flow area and wetted perimeter of water at
// stage z over the ground line pts between stations from and to: each
// straight segment clipped exactly where it crosses z (trapezoids and
// triangles).
func underGround(pts []subdivide.Point, z, from, to float64) (a, p float64) {
	for i := 1; i < len(pts); i++ {
		x1, y1, x2, y2 := pts[i-1].Station, pts[i-1].Elevation, pts[i].Station, pts[i].Elevation
		lo, hi := math.Max(x1, from), math.Min(x2, to)
		if !(hi > lo) {
			continue
		}
		at := func(x float64) float64 { return y1 + (y2-y1)*(x-x1)/(x2-x1) }
		da, db := z-at(lo), z-at(hi)
		if da <= 0 && db <= 0 {
			continue
		}
		if da < 0 {
			lo, da = lo+(hi-lo)*da/(da-db), 0
		} else if db < 0 {
			hi, db = lo+(hi-lo)*da/(da-db), 0
		}
		a += (da + db) / 2 * (hi - lo)
		p += math.Hypot(hi-lo, da-db)
	}
	return a, p
}

// On a floodplain with survey scatter every crest joins a pocket to the
// flow. The stages are the surveyed crests, exactly, and the discharges
// on either side Manning's on the ground clipped by hand (the channel up
// to the crest, then on to the next higher ground; one n, one
// subsection). A table warns one by one only the JoinsWarnedEach joins
// of the largest steps among those of JoinStepWarned or more, a fall
// worded as one; the rest of those in one line with their count, stage
// range and largest step; the joins of smaller steps not at all.
func TestJoinWarningsScatter(t *testing.T) {
	const n, slope = 0.035, 0.001
	ns := make([]float64, len(scatterSection)-1)
	for i := range ns {
		ns[i] = n
	}
	p, err := subdivide.Compile(subdivide.Section{Points: scatterSection, N: ns})
	if err != nil {
		t.Fatal(err)
	}
	// The crests walking out of the channel (station, stage) and the
	// station of the next higher ground beyond each.
	type crest struct{ x, z, next float64 }
	crests := []crest{{20, 102, 22}, {22, 102.02, 24}, {24, 102.03, 24.4}, {24.4, 102.04, 26.4}, {26.4, 102.06, 26.8},
		{26.8, 102.07, 29}, {29, 102.09, 31}, {31, 102.11, 37}}
	joins, err := rating.PocketJoins(p, rating.Options{Slope: slope})
	if err != nil {
		t.Fatal(err)
	}
	if len(joins) != len(crests) {
		t.Fatalf("%d joins, want %d", len(joins), len(crests))
	}
	type step struct {
		z, before, after float64
	}
	var steps []step
	for i, c := range crests {
		j := joins[i]
		if j.Stage != c.z || j.Pockets[0].Crest != c.x || j.Pockets[0].To != c.next {
			t.Errorf("join %d at %v (crest %v, to %v), want the surveyed crest %v at %v, to %v", i, j.Stage, j.Pockets[0].Crest, j.Pockets[0].To, c.z, c.x, c.next)
		}
		a0, p0 := underGround(scatterSection, c.z, 0, c.x)
		a1, p1 := underGround(scatterSection, c.z, 0, c.next)
		s := step{c.z, manning(a0, p0, n, slope), manning(a1, p1, n, slope)}
		if !within(j.Before.Discharge, s.before, 1e-9) || !within(j.After.Discharge, s.after, 1e-9) {
			t.Errorf("join at %v: %v → %v, want Manning's %v → %v", c.z, j.Before.Discharge, j.After.Discharge, s.before, s.after)
		}
		steps = append(steps, s)
	}
	// The rule, applied to the hand values: warned from 2 %, the three
	// largest one by one.
	size := func(s step) float64 { return math.Abs(s.after/s.before - 1) }
	var warned, small []step
	for _, s := range steps {
		if size(s) >= 0.02 {
			warned = append(warned, s)
		} else {
			small = append(small, s)
		}
	}
	if len(warned) <= rating.JoinsWarnedEach || len(small) == 0 {
		t.Fatalf("the section should make more than %d joins of 2 %% or more and some smaller: %d and %d", rating.JoinsWarnedEach, len(warned), len(small))
	}
	bySize := slices.Clone(warned)
	slices.SortFunc(bySize, func(a, b step) int { return cmp.Compare(size(b), size(a)) })
	each, rolled := bySize[:rating.JoinsWarnedEach], bySize[rating.JoinsWarnedEach:]
	slices.SortFunc(each, func(a, b step) int { return cmp.Compare(a.z, b.z) })
	slices.SortFunc(rolled, func(a, b step) int { return cmp.Compare(a.z, b.z) })

	var stages []float64
	for i := range 21 {
		stages = append(stages, 100.5+0.1*float64(i))
	}
	tab, err := rating.Compute(p, stages, rating.Options{Slope: slope})
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, w := range tab.Warnings {
		if strings.Contains(w, "joins the flow") {
			got = append(got, w)
		}
	}
	if len(got) != len(each)+1 {
		t.Fatalf("join warnings %q, want %d one by one and one rolled up", got, len(each))
	}
	fig := func(v float64) string { return rating.PlainFigures(v, 4) }
	pct := func(s step) string { return fmt.Sprintf("%.0f %%", 100*math.Abs(s.after/s.before-1)) }
	for i, s := range each {
		how, sign := "steps up", "+"
		if s.after < s.before {
			how, sign = "falls", "-"
		}
		head := "at " + rating.PlainFigures(s.z, 7) + " m the water standing behind the crest"
		want := "the discharge " + how + " from " + fig(s.before) + " m3/s at the crest to " + fig(s.after) + " m3/s just above it (" + sign + pct(s) + ")"
		if !strings.HasPrefix(got[i], head) || !strings.Contains(got[i], want) {
			t.Errorf("warning %d %q, want it to start %q and say %q", i, got[i], head, want)
		}
	}
	big := rolled[0]
	for _, s := range rolled {
		if size(s) > size(big) {
			big = s
		}
	}
	roll := got[len(got)-1]
	for _, want := range []string{
		fmt.Sprintf("at %d more stages, from %s m to %s m, water", len(rolled), rating.PlainFigures(rolled[0].z, 7), rating.PlainFigures(rolled[len(rolled)-1].z, 7)),
		"steps by 2 % or more",
		"the largest step is a fall of " + pct(big) + ", at " + rating.PlainFigures(big.z, 7) + " m, from " + fig(big.before) + " to " + fig(big.after) + " m3/s",
	} {
		if !strings.Contains(roll, want) {
			t.Errorf("roll-up %q lacks %q", roll, want)
		}
	}
	for _, s := range small {
		at := " " + rating.PlainFigures(s.z, 7) + " m"
		for _, w := range got {
			if strings.Contains(w, at) {
				t.Errorf("the join at%s steps %.2f %%, under 2 %%, yet %q names it", at, 100*(s.after/s.before-1), w)
			}
		}
	}
}

// A pocket whose join moves the discharge by well under JoinStepWarned
// (a hollow a centimetre deep on a wide floodplain) is not warned.
func TestJoinUnderThresholdQuiet(t *testing.T) {
	p, err := subdivide.Compile(subdivide.Section{
		Points: subdivide.XZ(0, 105, 10, 100, 20, 103, 20.05, 102.99, 20.1, 103.1, 30, 105),
		N:      []float64{0.035, 0.035, 0.035, 0.035, 0.035},
	})
	if err != nil {
		t.Fatal(err)
	}
	joins, err := rating.PocketJoins(p, rating.Options{Slope: 0.001})
	if err != nil {
		t.Fatal(err)
	}
	if len(joins) != 1 || joins[0].Stage != 103 || math.Abs(joins[0].Step()) >= rating.JoinStepWarned || joins[0].Step() == 0 {
		t.Fatalf("joins %+v, want one at 103 that steps by less than %v", joins, rating.JoinStepWarned)
	}
	tab, err := rating.Compute(p, []float64{102.5, 103, 103.5}, rating.Options{Slope: 0.001})
	if err != nil {
		t.Fatal(err)
	}
	for _, w := range tab.Warnings {
		if strings.Contains(w, "joins the flow") {
			t.Errorf("warned %q", w)
		}
	}
}

// A comparison of two surveys, rated without a slope, words a join's step
// as conveyance, K = A·R^(2/3)/n (Chow, 1959, Open-Channel Hydraulics,
// eq. 6-18), with the levee section's areas and wetted perimeters summed
// by hand as in TestPocketJoins; with a slope, as discharge.
func TestCompareJoinConveyance(t *testing.T) {
	const n = 0.035
	mk := func(name string) subdivide.Geometry {
		p, err := subdivide.Compile(subdivide.Section{Name: name,
			Points: []subdivide.Point{{Station: 0, Elevation: 5}, {Station: 10, Elevation: 0}, {Station: 20, Elevation: 3.6},
				{Station: 25, Elevation: 1}, {Station: 30, Elevation: 1}, {Station: 35, Elevation: 5}},
			N: []float64{n, n, n, n, n}})
		if err != nil {
			t.Fatal(err)
		}
		return p
	}
	chA := 7.2*3.6/2 + 10*3.6/2
	chP := math.Hypot(7.2, 3.6) + math.Hypot(10, 3.6)
	poA := 5*2.6/2 + 5*2.6 + 3.25*2.6/2
	poP := math.Hypot(5, 2.6) + 5 + math.Hypot(3.25, 2.6)
	k0, k1 := manning(chA, chP, n, 1), manning(chA+poA, chP+poP, n, 1)
	for _, c := range []struct {
		name  string
		slope float64
		want  string
	}{
		{"no slope", 0, "the conveyance steps up from " + rating.PlainFigures(k0, 4) + " m3/s at the crest to " + rating.PlainFigures(k1, 4) + " m3/s just above it"},
		{"a slope", 0.0004, "the discharge steps up from " + rating.PlainFigures(k0*0.02, 4) + " m3/s at the crest to " + rating.PlainFigures(k1*0.02, 4) + " m3/s just above it"},
	} {
		cmpr, err := rating.CompareSections(mk("2023"), mk("2024"), []float64{3, 3.6, 4}, rating.Options{Slope: c.slope})
		if err != nil {
			t.Fatal(err)
		}
		var got []string
		for _, w := range cmpr.Warnings {
			if strings.Contains(w, "joins the flow") {
				got = append(got, w)
			}
		}
		if len(got) != 2 {
			t.Fatalf("%s: join warnings %q, want one for each survey", c.name, got)
		}
		for _, w := range got {
			if !strings.Contains(w, c.want) {
				t.Errorf("%s: %q lacks %q", c.name, w, c.want)
			}
			if c.slope == 0 && strings.Contains(w, "discharge") {
				t.Errorf("%s: %q speaks of discharge at a slope not given", c.name, w)
			}
		}
	}
}

// Rated at gauge heights, the scatter section's join warnings, one by one
// and rolled up, word every stage as a gauge height with its elevation,
// and no warning at an elevation is left beside them.
func TestJoinWarningsScatterGaugeHeights(t *testing.T) {
	ns := make([]float64, len(scatterSection)-1)
	for i := range ns {
		ns[i] = 0.035
	}
	p, err := subdivide.Compile(subdivide.Section{Points: scatterSection, N: ns})
	if err != nil {
		t.Fatal(err)
	}
	rep, err := rating.Rate(p, []float64{0.5, 1.5, 2, 2.05, 2.1, 2.5}, rating.RateOptions{Options: rating.Options{Slope: 0.001}, GaugeHeights: true, Datum: 100})
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, w := range rep.Warnings {
		if strings.Contains(w, "joins the flow") {
			got = append(got, w)
		}
	}
	if len(got) != rating.JoinsWarnedEach+1 {
		t.Fatalf("join warnings %q, want %d", got, rating.JoinsWarnedEach+1)
	}
	for _, w := range got[:rating.JoinsWarnedEach] {
		if !strings.HasPrefix(w, "at gauge height ") {
			t.Errorf("%q is not at a gauge height", w)
		}
	}
	if roll := got[len(got)-1]; !strings.Contains(roll, ", from gauge height 2.04 m (elevation 102.04 m) to gauge height 2.09 m (elevation 102.09 m), water") {
		t.Errorf("roll-up %q is not worded at gauge heights", roll)
	}
}
