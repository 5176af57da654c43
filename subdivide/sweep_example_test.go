package subdivide_test

import (
	"fmt"

	"wetline/subdivide"
)

// Rate a V-shaped channel (side slopes 1:1) at three stages given in any
// order; the sweep visits them from the lowest up and reports each with
// its index in the caller's list.
func ExampleProfile_Sweep() {
	p, err := subdivide.Compile(subdivide.Section{
		Points:    []subdivide.Point{{Station: 0, Elevation: 12}, {Station: 10, Elevation: 2}, {Station: 20, Elevation: 12}},
		NByRegion: subdivide.PerRegion{Channel: 0.035},
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	stages := []float64{5, 3, 4}
	err = p.Sweep(stages, subdivide.Options{AllPools: true}, func(i int, w subdivide.Wetted, err error) error {
		if err != nil {
			return err
		}
		fmt.Printf("stages[%d] = %g: area %.2f, top width %.2f, wetted perimeter %.3f\n",
			i, w.Stage, w.Area, w.TopWidth, w.WettedPerimeter)
		return nil
	})
	if err != nil {
		fmt.Println(err)
	}
	// Output:
	// stages[1] = 3: area 1.00, top width 2.00, wetted perimeter 2.828
	// stages[2] = 4: area 4.00, top width 4.00, wetted perimeter 5.657
	// stages[0] = 5: area 9.00, top width 6.00, wetted perimeter 8.485
}
