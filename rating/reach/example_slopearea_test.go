package reach_test

import (
	"fmt"
	"math"

	"wetline/rating/reach"
	"wetline/subdivide"
)

// saRectangle returns a rectangular channel of width b with bed at bed and
// Manning's n.
func saRectangle(b, bed, n float64) subdivide.Geometry {
	p, err := subdivide.Compile(subdivide.Section{
		Points: []subdivide.Point{
			{Station: 0, Elevation: bed + 5}, {Station: 0, Elevation: bed},
			{Station: b, Elevation: bed}, {Station: b, Elevation: bed + 5},
		},
		N: []float64{n, n, n},
	})
	if err != nil {
		panic(err)
	}
	return p
}

// A two-section reach that widens downstream: the eddy loss k = 0.5 applies.
// The discharge agrees with the two-section formula evaluated by hand for
// rectangles (α = 1): Q² = F / (L/(K1K2) − 0.5·(1/A1² − 1/A2²)/(2g)).
func ExampleSolveSlopeArea() {
	secs := []reach.Section{
		{ID: "upper", Geometry: saRectangle(10, 100, 0.03), Distance: 0, Left: 102.0, Right: 102.04},
		{ID: "lower", Geometry: saRectangle(14, 99.9, 0.03), Distance: 150, Left: 101.8, Right: math.NaN()},
	}
	res, err := reach.SolveSlopeArea(secs, reach.SlopeAreaOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	sr := res.Subreaches[0]
	fmt.Printf("Q = %.2f m3/s, expanding %v, k = %.1f\n", res.Discharge, sr.Expanding, sr.EddyK)
	for _, s := range res.Sections {
		fmt.Printf("%s: ws %.2f, area %.2f, velocity head %.3f, froude %.2f\n", s.ID, s.WaterSurface, s.Area, s.VelocityHead, s.Froude)
	}
	// Output:
	// Q = 42.06 m3/s, expanding true, k = 0.5
	// upper: ws 102.02, area 20.20, velocity head 0.221, froude 0.47
	// lower: ws 101.80, area 26.60, velocity head 0.127, froude 0.37
}
