package reach_test

import (
	"fmt"
	"math"
	"testing"

	"wetline/rating/reach"
	"wetline/subdivide"
)

// benchReachSection is an invented natural section of n points: a channel
// about 25 m wide and 3 m deep between bank stations at 60 and 90 m, a
// floodplain rising gently to both ends with a low levee on the left, a
// ground line made uneven by two sine terms whose phase changes from
// section to section, and n of 0.035 in the channel, 0.06 and 0.08 on the
// overbanks. invert is the thalweg elevation.
func benchReachSection(n, i int, invert float64) subdivide.Section {
	s := subdivide.Section{Name: fmt.Sprintf("XS-%d", i), HasBanks: true, LeftBank: 60, RightBank: 90,
		NByRegion: [3]float64{0.035, 0.06, 0.08}}
	ph := 0.7 * float64(i)
	for k := 0; k < n; k++ {
		x := 300 * float64(k) / float64(n-1)
		var z float64
		switch c := math.Abs(x - 75); {
		case c < 15:
			z = 3 * (c / 15) * (c / 15)
		default:
			z = 3 + 0.01*(c-15)
		}
		z += 0.6*math.Exp(-(x-40)*(x-40)/50) + 0.05*math.Sin(x/6+ph) + 0.03*math.Sin(x/2.1+2*ph)
		s.Points = append(s.Points, subdivide.Point{Station: x, Elevation: invert + z})
	}
	return s
}

// benchReach returns m sections of n points 250 m apart on a bed falling
// 0.0008.
func benchReach(tb testing.TB, m, n int) []reach.Section {
	secs := make([]reach.Section, m)
	for i := range secs {
		p, err := subdivide.Compile(benchReachSection(n, i, 100-0.0008*250*float64(i)))
		if err != nil {
			tb.Fatal(err)
		}
		secs[i] = reach.Section{ID: p.Name(), Geometry: p, Distance: 250 * float64(i)}
	}
	return secs
}

// BenchmarkBackwater computes 50 sections of 200 points at 500
// discharges from 5 to 400 m³/s, each from two boundary stages (normal
// depth and critical depth), with the exact geometry of every section.
func BenchmarkBackwater(b *testing.B) {
	secs := benchReach(b, 50, 200)
	qs := make([]float64, 500)
	for i := range qs {
		qs[i] = 5 + (400-5)*float64(i)/float64(len(qs)-1)
	}
	bd := reach.Boundary{Kind: reach.NormalDepth, Slope: 0.0008}
	for b.Loop() {
		if _, err := reach.ComputeBackwater(secs, qs, bd, reach.BackwaterOptions{Geometry: subdivide.Options{Connected: true}}); err != nil {
			b.Fatal(err)
		}
	}
}
