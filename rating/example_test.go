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

// A storm pipe of 0.6 m diameter, n = 0.013, laid at 0.5 %, carrying
// 0.25 m³/s: its normal and critical depths.
func ExampleSolve() {
	shape, err := subdivide.ParseShape("circle:diameter=0.6")
	if err != nil {
		fmt.Println(err)
		return
	}
	g, _ := shape.Build(subdivide.PerRegion{Channel: 0.013})
	sol, err := rating.Solve(g, 0.25, rating.Options{Slope: 0.005})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("normal depth %.3f m (%s), Froude %.2f, %s\n", sol.Normal[0].Depth, sol.Normal[0].Branch(), sol.Normal[0].Row.Froude, sol.Normal[0].Regime)
	fmt.Printf("critical depth %.3f m\n", sol.Critical[0].Depth)
	fmt.Printf("full %.3f m3/s, peak %.3f m3/s at %.3f m\n", sol.FullDischarge, sol.PeakDischarge, sol.PeakStage)
	// Output:
	// normal depth 0.327 m (rising), Froude 0.99, subcritical
	// critical depth 0.325 m
	// full 0.434 m3/s, peak 0.467 m3/s at 0.563 m
}

func ExampleStageForArea() {
	shape, _ := subdivide.ParseShape("trapezoid:bottom=3,side=2")
	g, _ := shape.Build(subdivide.PerRegion{Channel: 0.025})
	r, _ := rating.StageForArea(g, 10, rating.Options{})
	// (3 + 2y)·y = 10 gives y = 1.6085 m.
	fmt.Printf("%.4f m\n", r.Depth)
	// Output: 1.6085 m
}

// A lookup table starts at the tenth at or below the lowest ground and
// steps by hundredths.
func ExampleLookupStages() {
	stages, err := rating.LookupStages(100.34, 100.52)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(len(stages), stages[0], stages[1], stages[len(stages)-1])
	// Output:
	// 23 100.3 100.31 100.52
}
