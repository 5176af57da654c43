package subdivide

import (
	"math/rand/v2"
	"sort"
	"testing"
)

// TestFirstAbove checks the galloping search against sort.Search from
// every starting guess.
func TestFirstAbove(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 1))
	for n := 0; n < 40; n++ {
		hs := make([]float64, n)
		for i := range hs {
			hs[i] = float64(rng.IntN(10))
		}
		sort.Float64s(hs)
		for z := -1.0; z <= 10; z += 0.5 {
			want := sort.Search(n, func(k int) bool { return hs[k] > z })
			for k0 := 0; k0 <= n; k0++ {
				if got := firstAbove(hs, z, k0); got != want {
					t.Fatalf("firstAbove(%v, %g, %d) = %d, want %d", hs, z, k0, got, want)
				}
			}
		}
	}
}
