package rating_test

import (
	"math"
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
