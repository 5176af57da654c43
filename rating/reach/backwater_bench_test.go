package reach

import (
	"testing"

	"wetline/subdivide"
)

// BenchmarkBackwater computes 50 natural sections of 200 points at 500
// discharges from 5 to 400 m³/s, each from three starting stages (normal
// depth, critical depth and half-way), with the exact geometry of every section,
// in connected-flow mode.
func BenchmarkBackwater(b *testing.B) {
	secs := naturalReach(b, 50, 200, 250, 0.0008)
	qs := ladder(5, 400, 500)
	bd := Boundary{Kind: NormalDepth, Slope: 0.0008}
	opt := BackwaterOptions{Geometry: subdivide.Options{}}
	for b.Loop() {
		if _, err := ComputeBackwater(secs, qs, bd, opt); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkBackwaterAt is BenchmarkBackwater with 10 discharges and every
// stage evaluated with Geometry.At, for comparison.
func BenchmarkBackwaterAt(b *testing.B) {
	secs := hideAll(naturalReach(b, 50, 200, 250, 0.0008))
	qs := ladder(5, 400, 10)
	bd := Boundary{Kind: NormalDepth, Slope: 0.0008}
	opt := BackwaterOptions{Geometry: subdivide.Options{}}
	for b.Loop() {
		if _, err := ComputeBackwater(secs, qs, bd, opt); err != nil {
			b.Fatal(err)
		}
	}
}
