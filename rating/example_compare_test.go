package rating_test

import (
	"fmt"

	"wetline/rating"
	"wetline/subdivide"
)

// A riffle surveyed before and after a flood that scoured its bed 0.2 m:
// at each stage the later survey has more area and conveyance.
func ExampleCompareSections() {
	before, _ := subdivide.Compile(subdivide.Section{Name: "2023 survey", Points: subdivide.XZ(0, 2, 2, 0.4, 6, 0.3, 10, 0.5, 12, 2), N: []float64{0.035, 0.035, 0.035, 0.035}})
	after, _ := subdivide.Compile(subdivide.Section{Name: "2024 survey", Points: subdivide.XZ(0, 2, 2, 0.2, 6, 0.1, 10, 0.3, 12, 2), N: []float64{0.035, 0.035, 0.035, 0.035}})
	c, err := rating.CompareSections(before, after, []float64{0.5, 1.0, 1.5}, rating.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, r := range c.Rows {
		fmt.Printf("%.1f m: area %+.3f m2, perimeter %+.3f m, top width %+.3f m, conveyance %+.1f %%\n",
			r.Stage, r.Difference.Area, r.Difference.WettedPerimeter, r.Difference.TopWidth, r.ConveyancePercent)
	}
	// Output:
	// 0.5 m: area +1.667 m2, perimeter +0.597 m, top width +0.444 m, conveyance +386.3 %
	// 1.0 m: area +1.852 m2, perimeter +0.483 m, top width +0.296 m, conveyance +58.4 %
	// 1.5 m: area +1.963 m2, perimeter +0.369 m, top width +0.148 m, conveyance +30.5 %
}
