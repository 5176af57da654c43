package subdivide_test

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"wetline/subdivide"
)

// sweepTol is the relative difference allowed between Sweep and At: both
// sum the same non-negative terms, in a different order and, for fully wet
// ground, carried forward from stage to stage, so they agree to a few
// units of rounding; 1e-9 leaves ample room.
const sweepTol = 1e-9

// randomSection builds a section of about n points that has, at random,
// vertical walls (repeated stations), flat runs and vertices on a 0.25
// grid (so that stages hit them exactly), pockets behind higher ground,
// bank stations on or between points, n changing along the section, and
// large survey coordinates.
func randomSection(rng *rand.Rand, n int) subdivide.Section {
	x0 := []float64{0, 1000, 523417.3}[rng.IntN(3)]
	z0 := []float64{0, 97.5, 2841.25}[rng.IntN(3)]
	s := subdivide.Section{Name: "random"}
	x := x0
	for i := 0; i < n; i++ {
		if i > 0 {
			switch r := rng.Float64(); {
			case r < 0.12: // vertical wall
			case r < 0.6:
				x += 0.5 * float64(1+rng.IntN(8))
			default:
				x += 4 * rng.Float64()
			}
		}
		var z float64
		switch r := rng.Float64(); {
		case r < 0.15 && i > 0: // flat run
			z = s.Points[i-1].Elevation
		case r < 0.6:
			z = z0 + 0.25*float64(rng.IntN(24))
		default:
			z = z0 + 6*rng.Float64()
		}
		s.Points = append(s.Points, subdivide.Point{Station: x, Elevation: z})
	}
	last := &s.Points[len(s.Points)-1]
	if last.Station == s.Points[0].Station {
		last.Station += 1
	}
	if rng.IntN(4) > 0 {
		ns := []float64{0.03, 0.045, 0.08}
		s.N = make([]float64, len(s.Points)-1)
		cur := ns[rng.IntN(3)]
		for i := range s.N {
			if rng.IntN(6) == 0 {
				cur = ns[rng.IntN(3)]
			}
			s.N[i] = cur
		}
	} else {
		s.NByRegion = subdivide.Uniform(0.035)
	}
	if rng.IntN(2) == 0 {
		lo, hi := s.Points[0].Station, last.Station
		a, b := lo+(hi-lo)*rng.Float64(), lo+(hi-lo)*rng.Float64()
		if rng.IntN(2) == 0 { // banks on surveyed points
			a = s.Points[rng.IntN(len(s.Points))].Station
			b = s.Points[rng.IntN(len(s.Points))].Station
		}
		if a > b {
			a, b = b, a
		}
		if a < b {
			s.HasBanks, s.LeftBank, s.RightBank = true, a, b
		}
	}
	if s.HasBanks {
		s.NByRegion.Channel = []float64{0, 0.04}[rng.IntN(2)]
	}
	return s
}

// randomStages returns stages for a section: every vertex elevation (a
// stage exactly at a vertex or on flat ground), grid values, random values
// from below the bottom to above both ends, repeats, and a NaN.
func randomStages(rng *rand.Rand, s subdivide.Section, m int) []float64 {
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, p := range s.Points {
		lo, hi = math.Min(lo, p.Elevation), math.Max(hi, p.Elevation)
	}
	var out []float64
	for len(out) < m {
		switch r := rng.Float64(); {
		case r < 0.4:
			out = append(out, s.Points[rng.IntN(len(s.Points))].Elevation)
		case r < 0.5:
			out = append(out, lo+0.25*float64(rng.IntN(30)))
		case r < 0.55 && len(out) > 0:
			out = append(out, out[rng.IntN(len(out))])
		case r < 0.56:
			out = append(out, math.NaN())
		default:
			out = append(out, lo-0.5+(hi-lo+1.5)*rng.Float64())
		}
	}
	return out
}

// sweepAll runs Sweep and returns its results by stage index.
func sweepAll(t testing.TB, p *subdivide.Profile, stages []float64, opt subdivide.Options) ([]subdivide.Wetted, []error) {
	ws := make([]subdivide.Wetted, len(stages))
	errs := make([]error, len(stages))
	seen := make([]bool, len(stages))
	err := p.Sweep(stages, opt, func(i int, w subdivide.Wetted, err error) error {
		if seen[i] {
			return fmt.Errorf("stage %d yielded twice", i)
		}
		seen[i] = true
		ws[i], errs[i] = w, err
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	for i, ok := range seen {
		if !ok {
			t.Fatalf("stage %d never yielded", i)
		}
	}
	return ws, errs
}

// sameValue reports whether a and b agree to sweepTol relative (NaN
// matches NaN).
func sameValue(a, b float64) bool {
	if math.IsNaN(a) || math.IsNaN(b) {
		return math.IsNaN(a) && math.IsNaN(b)
	}
	return math.Abs(a-b) <= sweepTol*math.Max(math.Abs(a), math.Abs(b))
}

// diffWetted describes how got differs from want, or returns "".
func diffWetted(got, want subdivide.Wetted) string {
	type field struct {
		name string
		g, w float64
	}
	fs := []field{
		{"Stage", got.Stage, want.Stage}, {"Area", got.Area, want.Area},
		{"WettedPerimeter", got.WettedPerimeter, want.WettedPerimeter}, {"TopWidth", got.TopWidth, want.TopWidth},
		{"HydraulicRadius", got.HydraulicRadius, want.HydraulicRadius}, {"HydraulicDepth", got.HydraulicDepth, want.HydraulicDepth},
		{"CentroidDepth", got.CentroidDepth, want.CentroidDepth},
		{"ExtendedLeft", got.ExtendedLeft, want.ExtendedLeft}, {"ExtendedRight", got.ExtendedRight, want.ExtendedRight},
	}
	if len(got.Subs) != len(want.Subs) {
		return fmt.Sprintf("%d subsections, want %d", len(got.Subs), len(want.Subs))
	}
	for i := range got.Subs {
		g, w := got.Subs[i], want.Subs[i]
		if g.Subsection != w.Subsection {
			return fmt.Sprintf("subsection %d is %+v, want %+v", i, g.Subsection, w.Subsection)
		}
		fs = append(fs, field{fmt.Sprintf("Subs[%d].Area", i), g.Area, w.Area},
			field{fmt.Sprintf("Subs[%d].WettedPerimeter", i), g.WettedPerimeter, w.WettedPerimeter},
			field{fmt.Sprintf("Subs[%d].TopWidth", i), g.TopWidth, w.TopWidth})
	}
	for _, f := range fs {
		if !sameValue(f.g, f.w) {
			return fmt.Sprintf("%s = %.17g, want %.17g", f.name, f.g, f.w)
		}
	}
	if got.Pools != want.Pools || got.Full != want.Full || got.PondedPools != want.PondedPools {
		return fmt.Sprintf("Pools %d Full %v ponded pools %d, want %d %v %d", got.Pools, got.Full, got.PondedPools, want.Pools, want.Full, want.PondedPools)
	}
	// The sweep finds the ponded area as a difference of two sums: it
	// holds the round-off of the whole area.
	if math.Abs(got.Ponded-want.Ponded) > pondedTol*math.Max(1, got.Area+got.Ponded) {
		return fmt.Sprintf("Ponded = %.17g, want %.17g", got.Ponded, want.Ponded)
	}
	return ""
}

// pondedTol is the relative round-off allowed in a ponded area found by
// difference.
const pondedTol = 1e-9

// checkSweep compares Sweep with At at every stage.
func checkSweep(t *testing.T, s subdivide.Section, stages []float64, opt subdivide.Options) bool {
	t.Helper()
	p, err := subdivide.Compile(s)
	if err != nil {
		t.Fatalf("compile: %v", err)
	}
	ws, errs := sweepAll(t, p, stages, opt)
	for i, h := range stages {
		want, werr := p.At(h, opt)
		if (werr == nil) != (errs[i] == nil) || (werr != nil && werr.Error() != errs[i].Error()) {
			t.Errorf("%+v\nstage %v %+v: error %v, want %v", s, h, opt, errs[i], werr)
			return false
		}
		if werr != nil {
			continue
		}
		if d := diffWetted(ws[i], want); d != "" {
			t.Errorf("%+v\nstage %v %+v: %s", s, h, opt, d)
			return false
		}
	}
	return true
}

var allOptions = []subdivide.Options{
	{AllPools: true}, {}, {AllPools: true, NoExtend: true}, {NoExtend: true},
}

// TestSweepMatchesAt is the property test of the sweep engine: on many
// random sections (vertical walls, flat ground exactly at a stage, stages
// at vertices, pockets, banks, changing n) and with every option, Sweep
// yields what At yields at every stage, to sweepTol. The reference is At,
// the direct per-stage clip whose segment formulas are closed-form
// trapezoid and triangle geometry.
func TestSweepMatchesAt(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 1))
	for k := 0; k < 2000; k++ {
		s := randomSection(rng, 2+rng.IntN(40))
		stages := randomStages(rng, s, 1+rng.IntN(40))
		for _, opt := range allOptions {
			if !checkSweep(t, s, stages, opt) {
				return
			}
		}
	}
}

// TestSweepCases pins the boundary cases named in the package doc.
func TestSweepCases(t *testing.T) {
	pts := func(v ...float64) []subdivide.Point {
		var out []subdivide.Point
		for i := 0; i+1 < len(v); i += 2 {
			out = append(out, subdivide.Point{Station: v[i], Elevation: v[i+1]})
		}
		return out
	}
	tests := []struct {
		name   string
		s      subdivide.Section
		stages []float64
	}{
		{"vee", subdivide.Section{Points: pts(0, 2, 1, 0, 2, 2), NByRegion: subdivide.PerRegion{Channel: 0.03}}, []float64{-1, 0, 0.5, 2, 3}},
		{"vertical walls", subdivide.Section{Points: pts(0, 3, 0, 0, 4, 0, 4, 3), NByRegion: subdivide.PerRegion{Channel: 0.03}}, []float64{0, 1, 3, 4}},
		{"flat floor at stage", subdivide.Section{Points: pts(0, 3, 1, 1, 5, 1, 6, 3), NByRegion: subdivide.PerRegion{Channel: 0.03}}, []float64{1, 1, 1.5, 1}},
		{"pocket behind levee", subdivide.Section{Points: pts(0, 1, 2, 0.2, 4, 2, 6, 0, 8, 3),
			N: []float64{0.06, 0.06, 0.035, 0.035}, HasBanks: true, LeftBank: 4, RightBank: 8},
			[]float64{0.1, 0.2, 0.5, 1, 1.5, 2, 2.5, 3, 3.5}},
		{"channel at right end", subdivide.Section{Points: pts(0, 2, 1, 1, 2, 0), NByRegion: subdivide.PerRegion{Channel: 0.03}}, []float64{0.5, 1, 1.5, 2.5}},
		{"channel at left end", subdivide.Section{Points: pts(0, 0, 1, 1, 2, 0.5, 3, 2), NByRegion: subdivide.PerRegion{Channel: 0.03}}, []float64{0.5, 1, 1.5, 2.5}},
		{"one segment", subdivide.Section{Points: pts(0, 0, 1, 1), NByRegion: subdivide.PerRegion{Channel: 0.03}}, []float64{0.5, 2}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			for _, opt := range allOptions {
				checkSweep(t, tt.s, tt.stages, opt)
			}
		})
	}
}

// TestSweepVee checks the sweep against closed-form geometry of a
// symmetric V channel with side slopes 1:1 (depth y): A = y², P = 2√2·y,
// T = 2y, centroid depth y/3 (triangle, elementary geometry).
func TestSweepVee(t *testing.T) {
	p, err := subdivide.Compile(subdivide.Section{
		Points:    []subdivide.Point{{Station: 0, Elevation: 10}, {Station: 10, Elevation: 0}, {Station: 20, Elevation: 10}},
		NByRegion: subdivide.PerRegion{Channel: 0.03},
	})
	if err != nil {
		t.Fatal(err)
	}
	stages := []float64{7, 1, 4, 2.5}
	ws, _ := sweepAll(t, p, stages, subdivide.Options{AllPools: true})
	for i, y := range stages {
		w := ws[i]
		for _, c := range []struct {
			name      string
			got, want float64
		}{
			{"area", w.Area, y * y}, {"perimeter", w.WettedPerimeter, 2 * math.Sqrt2 * y},
			{"top width", w.TopWidth, 2 * y}, {"centroid depth", w.CentroidDepth, y / 3},
		} {
			if !sameValue(c.got, c.want) {
				t.Errorf("y=%g %s = %v, want %v", y, c.name, c.got, c.want)
			}
		}
	}
}

// TestSweepStops checks that an error from the callback ends the sweep.
func TestSweepStops(t *testing.T) {
	p, err := subdivide.Compile(subdivide.Section{Points: []subdivide.Point{{0, 1}, {1, 0}, {2, 1}}})
	if err != nil {
		t.Fatal(err)
	}
	stop := errors.New("stop")
	calls := 0
	err = p.Sweep([]float64{0.1, 0.2, 0.3}, subdivide.Options{AllPools: true}, func(int, subdivide.Wetted, error) error {
		calls++
		return stop
	})
	if !errors.Is(err, stop) || calls != 1 {
		t.Fatalf("err %v after %d calls, want stop after 1", err, calls)
	}
}

// TestSweepLongValley checks the sweep against At on a long, finely
// sampled section at many stages, where the running sums are carried over
// thousands of steps, in both modes.
func TestSweepLongValley(t *testing.T) {
	s := valley(5000)
	p, err := subdivide.Compile(s)
	if err != nil {
		t.Fatal(err)
	}
	stages := stageSteps(p, 2000)
	for _, opt := range []subdivide.Options{{AllPools: true}, {}} {
		checkSweep(t, s, stages, opt)
	}
}
