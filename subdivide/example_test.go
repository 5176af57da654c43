package subdivide_test

import (
	"fmt"

	"wetline/subdivide"
)

// A trapezoidal ditch with a floodplain on the right, wetted at two stages.
func ExampleProfile_At() {
	sec := subdivide.Section{
		Name:     "ditch",
		Points:   subdivide.XZ(0, 2, 2, 0, 4, 0, 6, 1, 12, 1.2, 12, 3),
		N:        []float64{0.03, 0.03, 0.03, 0.06, 0.06},
		HasBanks: true, LeftBank: 0, RightBank: 6,
	}
	p, err := subdivide.Compile(sec)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, stage := range []float64{0.8, 1.5} {
		w, _ := p.At(stage, subdivide.Options{AllPools: true})
		fmt.Printf("stage %.1f: A=%.3f P=%.3f T=%.3f R=%.3f\n", stage, w.Area, w.WettedPerimeter, w.TopWidth, w.HydraulicRadius)
		for _, s := range w.Subs {
			fmt.Printf("  %-14s %4.1f-%4.1f n=%.3f A=%.3f\n", s.Region, s.From, s.To, s.N, s.Area)
		}
	}
	// Output:
	// stage 0.8: A=2.560 P=4.920 T=4.400 R=0.520
	//   channel         0.0- 6.0 n=0.030 A=2.560
	//   right overbank  6.0-12.0 n=0.060 A=0.000
	// stage 1.5: A=8.525 P=12.661 T=11.500 R=0.673
	//   channel         0.0- 6.0 n=0.030 A=6.125
	//   right overbank  6.0-12.0 n=0.060 A=2.400
}

// The bankfull stage of a surveyed section: the lower bank top, here the
// right bank at 10.9.
func ExampleSection_Bankfull() {
	sec := subdivide.Section{
		Points: []subdivide.Point{
			{Station: 0, Elevation: 12}, {Station: 10, Elevation: 11.2}, {Station: 14, Elevation: 9},
			{Station: 20, Elevation: 10.9}, {Station: 30, Elevation: 12},
		},
		HasBanks: true, LeftBank: 10, RightBank: 20,
	}
	h, ok := sec.Bankfull()
	fmt.Printf("%.2f %v\n", h, ok)
	// Output: 10.90 true
}
