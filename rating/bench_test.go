package rating_test

import (
	"fmt"
	"math"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
)

// benchValley is an invented ordinary valley section of n points over
// 1000 m: a 30 m wide channel 4 m deep between banks, floodplains rising
// to both ends, a levee and a back-swamp pocket, a gently undulating ground.
func benchValley(n int) subdivide.Section {
	s := subdivide.Section{Name: "valley", HasBanks: true, LeftBank: 485, RightBank: 515,
		NByRegion: subdivide.PerRegion{Channel: 0.035, Left: 0.06, Right: 0.07}}
	for i := 0; i < n; i++ {
		x := 1000 * float64(i) / float64(n-1)
		z := 103 + 0.004*math.Abs(x-500)
		if c := math.Abs(x - 500); c < 15 {
			z = 99 + 4*(c/15)*(c/15)
		}
		z += 0.8*math.Exp(-(x-420)*(x-420)/144) - 1.2*math.Exp(-(x-300)*(x-300)/1600)
		z += 0.05*math.Sin(x/7) + 0.03*math.Sin(x/2.3)
		s.Points = append(s.Points, subdivide.Point{Station: x, Elevation: z})
	}
	return s
}

// BenchmarkCompute builds a full rating table (hydraulics included) of a
// 100 000-point section at 10 000 stages, by the sweep and stage by stage.
func BenchmarkCompute(b *testing.B) {
	const n, m = 100_000, 10_000
	p, err := subdivide.Compile(benchValley(n))
	if err != nil {
		b.Fatal(err)
	}
	stages, err := rating.StageRange(p.Bottom(), p.Top(), (p.Top()-p.Bottom())/(m-1))
	if err != nil {
		b.Fatal(err)
	}
	for _, eng := range []struct {
		name string
		g    subdivide.Geometry
	}{{"sweep", p}, {"clip", clipOnly{p}}} {
		b.Run(fmt.Sprintf("engine=%s/N=%d/M=%d", eng.name, n, len(stages)), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				t, err := rating.Compute(eng.g, stages, rating.Options{Slope: 0.001})
				if err != nil || len(t.Rows) != len(stages) {
					b.Fatal(err)
				}
			}
		})
	}
}
