package gauged

import (
	"math"
	"testing"
)

// refineBreak narrows a bracket by levels of about profileLevel positions:
// on a profile with one least position, with kinks (|i − m|) and a smooth
// part ((i − m)²) as the sum of squares has between and at gauged stages,
// it ends at that position having fitted O(log n) positions, not the 2·step
// of every position out to the coarse fits beside the minimum. The least
// position of a unimodal sequence is where a bracketing search ends
// (Kiefer, J. (1953). Sequential minimax search for a maximum. Proceedings
// of the American Mathematical Society 4(3), 502–506; from memory).
func TestRefineBreakLevels(t *testing.T) {
	cases := []struct {
		name    string
		n, m    int
		kink, q float64
	}{
		{"kink at a stage, middle", 100001, 51234, 1, 0},
		{"smooth, middle", 100001, 48888, 0, 1e-6},
		{"both, near the bottom", 20000, 3, 0.5, 1e-4},
		{"both, at the top", 20000, 19999, 0.5, 1e-4},
		{"short grid", 130, 77, 1, 1e-3},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			f := func(i int) float64 {
				d := float64(i - c.m)
				return 1 + c.kink*math.Abs(d) + c.q*d*d
			}
			done := map[int]scanned{}
			fits := 0
			run := func(idx []int, _ bool, _ []float64) {
				for _, i := range idx {
					if _, ok := done[i]; ok {
						continue
					}
					fits++
					done[i] = scanned{heldFit{ssr: f(i)}, i}
				}
			}
			step := (c.n + profileGrid - 2) / (profileGrid - 1)
			for i := 0; i < c.n; i += step {
				done[i] = scanned{heldFit{ssr: f(i)}, i}
			}
			done[c.n-1] = scanned{heldFit{ssr: f(c.n - 1)}, c.n - 1}
			start := localMinima(done)[0].i
			refineBreak(done, c.n, start, step, run)
			if got := localMinima(done)[0].i; got != c.m {
				t.Errorf("ended at position %d, want %d", got, c.m)
			}
			levels := int(math.Ceil(math.Log(float64(step)) / math.Log(profileLevel/2)))
			if most := (levels+1)*(profileLevel+1) + 2*profileFinal + 2; fits > most {
				t.Errorf("%d fits for a bracket of ±%d positions, more than %d", fits, step, most)
			}
		})
	}
}
