package rating_test

import (
	"runtime"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
)

// maxRowBytes bounds the live heap of one table row with six
// subsections, on which MaxStages is set (measured: about 690 bytes).
const maxRowBytes = 1200

// TestTableMemoryPerRow measures the heap a long table holds per row, the
// figure behind MaxStages: the largest table must fit in about a gigabyte.
func TestTableMemoryPerRow(t *testing.T) {
	if testing.Short() {
		t.Skip("rates 100 000 stages")
	}
	sec := subdivide.Section{Points: subdivide.XZ(0, 104.8, 18, 103.2, 46, 102.5, 50, 100.9, 56, 100.3, 62, 101.1, 65.5, 102.6, 78, 103.6, 90, 102.2, 120, 104.9),
		N: []float64{0.045, 0.04, 0.035, 0.035, 0.035, 0.035, 0.07, 0.08, 0.06}, HasBanks: true, LeftBank: 46, RightBank: 65.5}
	p, err := subdivide.Compile(sec)
	if err != nil {
		t.Fatal(err)
	}
	const n = 100_000
	stages, err := rating.StageRange(100, 106, 6.0/n)
	if err != nil {
		t.Fatal(err)
	}
	var before, after runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&before)
	tab, err := rating.Compute(p, stages, rating.Options{Slope: 0.001})
	if err != nil {
		t.Fatal(err)
	}
	runtime.GC()
	runtime.ReadMemStats(&after)
	per := float64(after.HeapAlloc-before.HeapAlloc) / float64(len(tab.Rows))
	t.Logf("%d rows, %d subsections: %.0f bytes a row", len(tab.Rows), len(tab.Subsections), per)
	if per > maxRowBytes {
		t.Errorf("%.0f bytes a row, want at most %d: revisit MaxStages", per, maxRowBytes)
	}
	runtime.KeepAlive(tab)
}
