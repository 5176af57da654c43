package reach_test

import (
	"fmt"
	"math"

	"wetline/rating"
	"wetline/rating/reach"
	"wetline/subdivide"
)

// trapezoidReach returns an invented reach of m trapezoidal sections 5 m
// wide at the bed with side slopes 2:1 and n 0.03, dx apart on a bed
// falling s0 from elevation 50.
func trapezoidReach(m int, dx, s0 float64) []reach.Section {
	secs := make([]reach.Section, m)
	for i := range secs {
		sh, err := subdivide.ParseShape(fmt.Sprintf("trapezoid:bottom=5,side=2,invert=%g", 50-s0*dx*float64(i)))
		if err != nil {
			panic(err)
		}
		g, err := sh.Build(subdivide.Uniform(0.03))
		if err != nil {
			panic(err)
		}
		secs[i] = reach.Section{ID: fmt.Sprintf("S%d", i+1), Geometry: g, Distance: dx * float64(i),
			Left: math.NaN(), Right: math.NaN()}
	}
	return secs
}

// A pool held at 51.2 m below a mild channel: the profile is a backwater
// (M1) curve, deepest at the pool and falling upstream towards normal
// depth (about 2.11 m at 25 m³/s). The second profile, from critical
// depth, still differs by 0.07 m at the upstream section: 2 km is too
// short for the pool to be forgotten there, and the rating reads say so.
func ExampleComputeBackwater() {
	secs := trapezoidReach(6, 400, 0.001)
	res, err := reach.ComputeBackwater(secs, []float64{10, 25},
		reach.Boundary{Kind: reach.KnownStage, Stage: 51.2}, reach.BackwaterOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, s := range res.Profiles[1].Sections {
		fmt.Printf("%s %6.0f m: ws %.3f  depth %.3f  energy %.3f  Froude %.2f  spread %.3f\n",
			s.ID, s.Distance, s.WaterSurface, s.WaterSurface-s.Bottom, s.EnergyGrade, s.Froude, s.Spread)
	}
	for _, r := range res.Rating.Rows {
		fmt.Printf("rating at %s: %.0f m3/s at %.3f m (spread %.3f, unsettled %v)\n", res.Rating.Section, r.Discharge, r.Stage, r.Spread, r.Unsettled)
	}
	// Output:
	// S1      0 m: ws 52.186  depth 2.186  energy 52.262  Froude 0.32  spread 0.076
	// S2    400 m: ws 51.868  depth 2.268  energy 51.936  Froude 0.30  spread 0.156
	// S3    800 m: ws 51.608  depth 2.408  energy 51.665  Froude 0.27  spread 0.293
	// S4   1200 m: ws 51.416  depth 2.616  energy 51.461  Froude 0.23  spread 0.493
	// S5   1600 m: ws 51.285  depth 2.885  energy 51.318  Froude 0.19  spread 0.744
	// S6   2000 m: ws 51.200  depth 3.200  energy 51.224  Froude 0.15  spread 2.039
	// rating at S1: 10 m3/s at 51.535 m (spread 0.220, unsettled true)
	// rating at S1: 25 m3/s at 52.186 m (spread 0.076, unsettled true)
}

// The subreach length of a bend whose overbank paths are shorter than the
// channel, weighted by where the conveyance is at each end.
func ExampleWeightedLength() {
	lengths := subdivide.PerRegion{Channel: 260, Left: 200, Right: 230}
	up := subdivide.PerRegion{Channel: 900, Left: 150, Right: 50}
	down := subdivide.PerRegion{Channel: 700, Left: 250, Right: 100}
	fmt.Printf("%.2f m\n", reach.WeightedLength(lengths, up, down))
	// Output:
	// 246.66 m
}

// Marks of a flood of 25 m³/s set against the computed profile: positive
// where the computed water surface stands above the mark.
func ExampleVerifyBackwater() {
	secs := trapezoidReach(6, 400, 0.001)
	secs[0].Left, secs[0].Right = 52.16, 52.10
	secs[2].Left = 51.30
	v, err := reach.VerifyBackwater(secs, 25, reach.Boundary{Kind: reach.NormalDepth, Slope: 0.001}, reach.BackwaterOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, m := range v.Marks {
		fmt.Printf("%s: computed %.3f, mark %.3f, departure %+.3f m\n", m.ID, m.WaterSurface, m.Mark, m.Departure)
	}
	fmt.Printf("mean %+.3f m, largest %+.3f m\n", v.MeanDeparture, v.MaxDeparture)
	// Output:
	// S1: computed 52.109, mark 52.130, departure -0.021 m
	// S3: computed 51.309, mark 51.300, departure +0.009 m
	// mean -0.006 m, largest -0.021 m
}

// The rating read at the upstream section as a table with full hydraulics
// at each computed stage; each row's friction slope is (Q/K)², so its
// Manning discharge is the discharge of the profile.
func ExampleBackwaterRating_Table() {
	secs := trapezoidReach(8, 400, 0.001)
	res, err := reach.ComputeBackwater(secs, []float64{5, 15, 30},
		reach.Boundary{Kind: reach.NormalDepth, Slope: 0.001}, reach.BackwaterOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	tab, err := res.Rating.Table()
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, r := range tab.Rows {
		fmt.Printf("stage %.3f m  depth %.3f m  area %.2f m2  K %.0f m3/s  Q %.2f m3/s  V %.2f m/s\n",
			r.Stage, r.Depth, r.Area, r.Conveyance, r.Discharge, r.MeanVelocity)
	}
	// Output:
	// stage 50.902 m  depth 0.902 m  area 6.14 m2  K 158 m3/s  Q 5.00 m3/s  V 0.81 m/s
	// stage 51.625 m  depth 1.625 m  area 13.41 m2  K 474 m3/s  Q 15.00 m3/s  V 1.12 m/s
	// stage 52.310 m  depth 2.310 m  area 22.22 m2  K 949 m3/s  Q 30.00 m3/s  V 1.35 m/s
}

// A step-backwater study of the example reach: the rating at the upstream
// section as a table, and a flood's marks set against its profile, each
// within the band of its quality (a good mark: ±0.10 ft).
func ExampleStepBackwater() {
	secs := trapezoidReach(8, 400, 0.001)
	secs[0].Left, secs[0].Quality = 52.09, rating.Good
	rep, err := reach.StepBackwater(secs, []float64{10, 25}, reach.Boundary{Kind: reach.NormalDepth, Slope: 0.001},
		reach.BackwaterReportOptions{Verify: 25})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, r := range rep.Table.Rows {
		fmt.Printf("%s: %.0f m3/s at %.3f m, area %.2f m2, friction slope %.5f\n", rep.Result.Rating.Section, r.Discharge, r.Stage, r.Area,
			(r.Discharge/r.Conveyance)*(r.Discharge/r.Conveyance))
	}
	for _, m := range rep.Verification.Marks {
		fmt.Printf("mark at %s: departure %+.3f m, band ±%.3f m, outside %v\n", m.ID, m.Departure, m.Band, m.Outside)
	}
	// Output:
	// S1: 10 m3/s at 51.314 m, area 10.02 m2, friction slope 0.00100
	// S1: 25 m3/s at 52.109 m, area 19.44 m2, friction slope 0.00100
	// mark at S1: departure +0.019 m, band ±0.030 m, outside false
}
