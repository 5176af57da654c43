package gauged_test

import (
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
)

// Fitting the 142 Patuxent gaugings (testdata/reference) with e fitted.
func BenchmarkFitPatuxent(b *testing.B) {
	gs := patuxentGaugings(b)
	for _, k := range []int{1, 2, 3} {
		b.Run(string(rune('0'+k))+"-segments", func(b *testing.B) {
			for b.Loop() {
				if _, err := gauged.FitPowerLaw(gs, gauged.FitOptions{Segments: k, Units: rating.US}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
