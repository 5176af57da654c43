package reach

import (
	"math"
	"testing"

	"wetline/subdivide"
)

// wallBox is a rectangular section 5 m wide and 3 m deep with vertical
// walls of n 0.1 and a bed of n 0.03, its bed at elevation z.
func wallBox(t *testing.T, z float64) subdivide.Geometry {
	t.Helper()
	p, err := subdivide.Compile(subdivide.Section{Points: []subdivide.Point{{Station: 0, Elevation: z + 3}, {Station: 0, Elevation: z},
		{Station: 5, Elevation: z}, {Station: 5, Elevation: z + 3}}, N: []float64{0.1, 0.03, 0.1}})
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// wallBoxQ is uniform flow at depth 1 m in wallBox at slope s, by hand
// (Manning's equation with the Horton–Einstein composite n of bed and
// walls, Chow 1959, sections 6-4 and 6-7): A = 5, P = 7,
// n = ((5·0.03^1.5 + 2·0.1^1.5)/7)^(2/3), Q = (1/n)·A·(A/P)^(2/3)·√s.
func wallBoxQ(s float64) float64 {
	n := math.Pow((5*math.Pow(0.03, 1.5)+2*math.Pow(0.1, 1.5))/7, 2.0/3)
	return 5 * math.Pow(5.0/7, 2.0/3) * math.Sqrt(s) / n
}

// The reach methods convey rough walls as the one-section hydraulics do:
// slope-area with marks 1 m above the bed of a prismatic reach returns
// uniform flow at that depth, and step-backwater from normal depth keeps
// the profile there (the depth of uniform flow of wallBoxQ is 1 m).
func TestWallsInReach(t *testing.T) {
	const s, dx = 0.001, 250
	var secs []Section
	for i := range 5 {
		z := 100 - s*dx*float64(i)
		secs = append(secs, Section{ID: string(rune('A' + i)), Geometry: wallBox(t, z), Distance: dx * float64(i), Left: z + 1, Right: z + 1})
	}
	sa, err := SolveSlopeArea(secs, SlopeAreaOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if q := wallBoxQ(s); saRelErr(sa.Discharge, q) > saClosedFormTol {
		t.Errorf("slope-area Q = %.9g, uniform flow by hand %.9g", sa.Discharge, q)
	}
	bw, err := ComputeBackwater(secs, []float64{wallBoxQ(s)}, Boundary{Kind: NormalDepth, Slope: s}, BackwaterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range bw.Profiles[0].Sections {
		if depth := p.WaterSurface - p.Bottom; math.Abs(depth-1) > 1e-6 {
			t.Errorf("%s: depth %.9g, normal depth 1", p.ID, depth)
		}
	}
}
