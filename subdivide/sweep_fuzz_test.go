package subdivide_test

import (
	"cmp"
	"math"
	"slices"
	"testing"

	"wetline/subdivide"
)

// fuzzSection decodes a section from bytes: two bytes a point, the
// station step in halves of the unit (zero makes a vertical wall) plus a
// tenth for the top bits, the elevation in eighths above 100 (exact binary
// fractions, so flats and stages exactly at a vertex are common).
func fuzzSection(data []byte, flags uint8) subdivide.Section {
	const maxPoints = 2000
	var s subdivide.Section
	x := 0.0
	for i := 0; i+1 < len(data) && len(s.Points) < maxPoints; i += 2 {
		if i > 0 {
			x += float64(data[i]%8)*0.5 + float64(data[i]>>6)*0.1
		}
		s.Points = append(s.Points, subdivide.Point{Station: x, Elevation: 100 + float64(data[i+1])*0.125})
	}
	s.NByRegion = subdivide.PerRegion{Channel: 0.05, Left: 0.035, Right: 0.06}
	if flags&4 != 0 && len(s.Points) > 1 && x > 0 {
		s.HasBanks, s.LeftBank, s.RightBank = true, x*float64(flags>>4)/40, x*(1-float64(flags>>6)/10)
	}
	if flags&8 != 0 && len(s.Points) > 1 {
		s.N = make([]float64, len(s.Points)-1)
		for i := range s.N {
			s.N[i] = 0.03 + 0.01*float64(data[2*i]%3)
		}
		s.NByRegion = subdivide.PerRegion{}
	}
	return s
}

// FuzzSweep checks the sweep and clip engines on decoded sections. Oracles:
// no panic; every result finite and non-negative; area never decreasing as
// the stage rises; Sweep equal to At at every stage (to sweepTol).
func FuzzSweep(f *testing.F) {
	f.Add([]byte{0, 40, 2, 8, 2, 0, 2, 8, 2, 40}, []byte{0, 16, 17, 32, 64, 130, 255}, uint8(0))
	f.Add([]byte{0, 40, 0, 0, 4, 0, 0, 40}, []byte{0, 1, 100, 200}, uint8(1))
	f.Add([]byte{0, 10, 3, 2, 3, 30, 3, 0, 3, 50, 2, 10}, []byte{4, 10, 20, 30, 40, 60}, uint8(5|2<<4))
	f.Add([]byte{0, 8, 2, 8, 2, 8, 1, 0, 1, 8, 3, 20}, []byte{8, 8, 9, 0, 40}, uint8(3|8))
	f.Fuzz(func(t *testing.T, data, stageData []byte, flags uint8) {
		s := fuzzSection(data, flags)
		p, err := subdivide.Compile(s)
		if err != nil {
			return
		}
		if len(stageData) > 400 {
			stageData = stageData[:400]
		}
		stages := make([]float64, len(stageData))
		for i, b := range stageData {
			stages[i] = 99 + float64(b)*0.0625
		}
		opt := subdivide.Options{AllPools: flags&1 == 0, NoExtend: flags&2 != 0}
		ws, errs := sweepAll(t, p, stages, opt)
		for i, h := range stages {
			want, werr := p.At(h, opt)
			if (werr == nil) != (errs[i] == nil) {
				t.Fatalf("stage %g: sweep error %v, clip error %v", h, errs[i], werr)
			}
			if werr != nil {
				continue
			}
			w := ws[i]
			for _, v := range []float64{w.Area, w.WettedPerimeter, w.TopWidth, w.ExtendedLeft, w.ExtendedRight} {
				if !(v >= 0) || math.IsInf(v, 0) {
					t.Fatalf("stage %g: %+v has a negative or non-finite value", h, w)
				}
			}
			for _, sw := range w.Subs {
				if !(sw.Area >= 0 && sw.WettedPerimeter >= 0 && sw.TopWidth >= 0) {
					t.Fatalf("stage %g: subsection %+v negative", h, sw)
				}
			}
			if w.Area > 0 && !(w.CentroidDepth >= 0 && w.CentroidDepth <= (h-p.Bottom())*(1+sweepTol)) {
				t.Fatalf("stage %g: centroid depth %v outside the water", h, w.CentroidDepth)
			}
			if d := diffWetted(w, want); d != "" {
				t.Fatalf("stage %g %+v: sweep differs from clip: %s", h, opt, d)
			}
		}
		// Area never decreases as the stage rises.
		idx := make([]int, 0, len(stages))
		for i := range stages {
			if errs[i] == nil {
				idx = append(idx, i)
			}
		}
		slices.SortFunc(idx, func(a, b int) int { return cmp.Compare(stages[a], stages[b]) })
		for k := 1; k < len(idx); k++ {
			lo, hi := ws[idx[k-1]], ws[idx[k]]
			if hi.Area < lo.Area*(1-sweepTol) {
				t.Fatalf("area %v at stage %g is less than %v at %g", hi.Area, hi.Stage, lo.Area, lo.Stage)
			}
		}
	})
}
