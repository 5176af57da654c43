package rating_test

import (
	"fmt"

	"wetline/rating"
	"wetline/subdivide"
)

// Rating a small compound channel at three stages.
func ExampleCompute() {
	p, _ := subdivide.Compile(subdivide.Section{
		Points:   subdivide.XZ(0, 3, 0, 1.5, 10, 1.5, 12, 0, 16, 0, 18, 1.5, 28, 1.5, 28, 3),
		N:        []float64{0.06, 0.06, 0.035, 0.035, 0.035, 0.06, 0.06},
		HasBanks: true, LeftBank: 10, RightBank: 18,
	})
	t, err := rating.Compute(p, []float64{1, 1.5, 2.5}, rating.Options{Slope: 0.001, Units: rating.SI})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, r := range t.Rows {
		fmt.Printf("stage %.1f m: Q=%.2f m3/s alpha=%.3f Fr=%.3f\n", r.Stage, r.Discharge, r.Alpha, r.Froude)
	}
	// Output:
	// stage 1.0 m: Q=3.90 m3/s alpha=1.000 Fr=0.261
	// stage 1.5 m: Q=8.13 m3/s alpha=1.000 Fr=0.272
	// stage 2.5 m: Q=33.36 m3/s alpha=1.738 Fr=0.330
}
