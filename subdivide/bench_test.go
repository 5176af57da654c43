package subdivide_test

import (
	"fmt"
	"math"
	"testing"

	"wetline/subdivide"
)

// valley is an invented ordinary valley section of n points over 1000 m:
// a 30 m wide main channel 4 m deep, floodplains rising gently to both
// ends with a levee and a back-swamp pocket on the left, smooth undulation
// of the ground, banks at the channel's edges and n by region.
func valley(n int) subdivide.Section {
	s := subdivide.Section{Name: "valley", HasBanks: true, LeftBank: 485, RightBank: 515,
		NByRegion: subdivide.PerRegion{Channel: 0.035, Left: 0.06, Right: 0.07}}
	for i := 0; i < n; i++ {
		x := 1000 * float64(i) / float64(n-1)
		z := 103 + 0.004*math.Abs(x-500) // floodplain
		if c := math.Abs(x - 500); c < 15 {
			z = 99 + 4*(c/15)*(c/15) // channel
		}
		z += 0.8 * math.Exp(-sq((x-420)/12))           // levee
		z -= 1.2 * math.Exp(-sq((x-300)/40))           // back-swamp
		z += 0.05*math.Sin(x/7) + 0.03*math.Sin(x/2.3) // undulation
		s.Points = append(s.Points, subdivide.Point{Station: x, Elevation: z})
	}
	return s
}

func sq(v float64) float64 { return v * v }

// stageSteps returns m stages evenly from the bottom to the top of p.
func stageSteps(p *subdivide.Profile, m int) []float64 {
	out := make([]float64, m)
	for i := range out {
		out[i] = p.Bottom() + (p.Top()-p.Bottom())*float64(i)/float64(m-1)
	}
	return out
}

var benchSink float64

func benchSweep(b *testing.B, n, m int) {
	p, err := subdivide.Compile(valley(n))
	if err != nil {
		b.Fatal(err)
	}
	stages := stageSteps(p, m)
	b.ReportAllocs()
	for b.Loop() {
		err := p.Sweep(stages, subdivide.Options{AllPools: true}, func(i int, w subdivide.Wetted, err error) error {
			benchSink += w.Area
			return err
		})
		if err != nil {
			b.Fatal(err)
		}
	}
}

func benchClip(b *testing.B, n, m int) {
	p, err := subdivide.Compile(valley(n))
	if err != nil {
		b.Fatal(err)
	}
	stages := stageSteps(p, m)
	b.ReportAllocs()
	for b.Loop() {
		for _, h := range stages {
			w, err := p.At(h, subdivide.Options{AllPools: true})
			if err != nil {
				b.Fatal(err)
			}
			benchSink += w.Area
		}
	}
}

var (
	benchPoints = []int{100, 1000, 10_000, 100_000}
	benchStages = []int{10, 100, 1000, 10_000}
)

// BenchmarkSweep rates the valley section at M stages with Sweep.
func BenchmarkSweep(b *testing.B) {
	for _, n := range benchPoints {
		for _, m := range benchStages {
			b.Run(fmt.Sprintf("N=%d/M=%d", n, m), func(b *testing.B) { benchSweep(b, n, m) })
		}
	}
}

// BenchmarkClip rates the same section stage by stage with At, the
// reference engine.
func BenchmarkClip(b *testing.B) {
	for _, n := range benchPoints {
		for _, m := range benchStages {
			b.Run(fmt.Sprintf("N=%d/M=%d", n, m), func(b *testing.B) { benchClip(b, n, m) })
		}
	}
}

// BenchmarkSweepGrowth doubles N and M together to show how the sweep's
// cost grows (about 2× per doubling for (N+M)·log N).
func BenchmarkSweepGrowth(b *testing.B) {
	for _, k := range []int{1, 2, 4, 8, 16} {
		n, m := 12_500*k, 1250*k
		b.Run(fmt.Sprintf("N=%d/M=%d", n, m), func(b *testing.B) { benchSweep(b, n, m) })
	}
}
