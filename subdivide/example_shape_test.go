package subdivide_test

import (
	"fmt"

	"wetline/subdivide"
)

func ExampleParseShape() {
	s, err := subdivide.ParseShape("trapezoid:bottom=3,side=2,invert=101.2")
	if err != nil {
		fmt.Println(err)
		return
	}
	g, _ := s.Build(subdivide.PerRegion{Channel: 0.025})
	w, _ := g.At(102.2, subdivide.Options{AllPools: true})
	// One metre deep: A = (3 + 2·1)·1 = 5 m², T = 3 + 2·2·1 = 7 m.
	fmt.Printf("%s: area %.3f m2, top width %.3f m\n", s, w.Area, w.TopWidth)
	_, err = subdivide.ParseShape("trapezoid:bottom=3")
	fmt.Println(err != nil)
	// Output:
	// trapezoid:bottom=3,left=2,right=2,invert=101.2: area 5.000 m2, top width 7.000 m
	// true
}

func ExampleConduit() {
	c := &subdivide.Conduit{Diameter: 1, N: 0.013}
	half, _ := c.At(0.5, subdivide.Options{AllPools: true})
	full, _ := c.At(1, subdivide.Options{AllPools: true})
	fmt.Printf("half: A %.4f P %.4f T %.4f\n", half.Area, half.WettedPerimeter, half.TopWidth)
	fmt.Printf("full: A %.4f P %.4f T %.4f full %v\n", full.Area, full.WettedPerimeter, full.TopWidth, full.Full)
	// Output:
	// half: A 0.3927 P 1.5708 T 1.0000
	// full: A 0.7854 P 3.1416 T 0.0000 full true
}
