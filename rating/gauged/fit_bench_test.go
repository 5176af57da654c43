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

// Fitting the 142 Patuxent gaugings (testdata/reference) by least squares
// with two to four controls, breakpoints and first offset fitted.
func BenchmarkFitControlsPatuxent(b *testing.B) {
	gs := patuxentGaugings(b)
	for _, k := range []int{2, 3, 4} {
		b.Run(string(rune('0'+k))+"-controls", func(b *testing.B) {
			opt := gauged.ControlOptions{Controls: make([]gauged.ControlSpec, k), Units: rating.US}
			for b.Loop() {
				if _, err := gauged.FitControls(gs, opt); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
