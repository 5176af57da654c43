package reach

import (
	"fmt"
	"math"
	"testing"

	"wetline/subdivide"
)

// naturalSection is an invented natural section of n points over 300 m: a
// channel about 30 m wide and 3 m deep between bank stations at 60 and 90
// m, a floodplain rising gently to both ends with a low levee on the left
// (a pocket behind it), a ground line made uneven by two sine terms whose
// phase changes from section to section (i), and n of 0.035 in the
// channel, 0.06 and 0.08 on the overbanks. invert is the thalweg elevation.
func naturalSection(n, i int, invert float64) subdivide.Section {
	s := subdivide.Section{Name: fmt.Sprintf("XS-%d", i), HasBanks: true, LeftBank: 60, RightBank: 90,
		NByRegion: subdivide.PerRegion{Channel: 0.035, Left: 0.06, Right: 0.08}}
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

// naturalReach returns m natural sections of n points dx apart on a bed
// falling s0, upstream first.
func naturalReach(tb testing.TB, m, n int, dx, s0 float64) []Section {
	tb.Helper()
	secs := make([]Section, m)
	for i := range secs {
		p, err := subdivide.Compile(naturalSection(n, i, 100-s0*dx*float64(i)))
		if err != nil {
			tb.Fatal(err)
		}
		secs[i] = Section{ID: p.Name(), Geometry: p, Distance: dx * float64(i), Left: math.NaN(), Right: math.NaN()}
	}
	return secs
}

// prismReach returns m sections of the built shape spec (without its
// invert) with Manning's n by region, dx apart on a bed falling s0 from
// elevation 100, upstream first.
func prismReach(tb testing.TB, spec string, n subdivide.PerRegion, m int, dx, s0 float64) []Section {
	tb.Helper()
	secs := make([]Section, m)
	for i := range secs {
		sh, err := subdivide.ParseShape(fmt.Sprintf("%s,invert=%.12g", spec, 100-s0*dx*float64(i)))
		if err != nil {
			tb.Fatal(err)
		}
		g, err := sh.Build(n)
		if err != nil {
			tb.Fatal(err)
		}
		secs[i] = Section{ID: fmt.Sprintf("P%d", i), Geometry: g, Distance: dx * float64(i), Left: math.NaN(), Right: math.NaN()}
	}
	return secs
}

// ladder returns m discharges from lo to hi in equal steps.
func ladder(lo, hi float64, m int) []float64 {
	qs := make([]float64, m)
	for i := range qs {
		qs[i] = lo + (hi-lo)*float64(i)/float64(max(m-1, 1))
	}
	return qs
}
