package reach

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
)

// saCompound returns an irregular compound section of 25 points with
// overbanks, bank stations and three n values; bed is its lowest elevation
// and widen stretches it sideways.
func saCompound(t testing.TB, bed, widen float64) subdivide.Geometry {
	t.Helper()
	shape := [][2]float64{
		{0, 4.8}, {8, 3.9}, {18, 3.2}, {30, 2.9}, {40, 2.7}, {46, 2.5}, {48, 1.6}, {50, 0.9}, {53, 0.4},
		{56, 0.3}, {57, 0}, {59, 0.5}, {62, 1.1}, {64, 2.0}, {65.5, 2.6}, {72, 2.8}, {78, 3.2}, {82, 2.9},
		{90, 2.7}, {98, 2.8}, {104, 3.3}, {108, 3.6}, {112, 4.0}, {116, 4.4}, {120, 4.9},
	}
	var s subdivide.Section
	for i, p := range shape {
		s.Points = append(s.Points, subdivide.Point{Station: p[0] * widen, Elevation: bed + p[1]})
		if i > 0 {
			n := 0.035
			switch {
			case p[0] <= 46:
				n = 0.05
			case p[0] > 65.5:
				n = 0.07
			}
			s.N = append(s.N, n)
		}
	}
	s.HasBanks, s.LeftBank, s.RightBank = true, 46*widen, 65.5*widen
	g, err := subdivide.Compile(s)
	if err != nil {
		t.Fatal(err)
	}
	return g
}

// saThreeSections is a three-section compound reach, contracting then
// expanding, with both marks at every section.
func saThreeSections(t testing.TB) []Section {
	return []Section{
		{ID: "XS1", Geometry: saCompound(t, 100.0, 1.1), Distance: 0, Left: 103.42, Right: 103.36},
		{ID: "XS2", Geometry: saCompound(t, 99.85, 0.9), Distance: 160, Left: 103.22, Right: 103.18},
		{ID: "XS3", Geometry: saCompound(t, 99.7, 1.0), Distance: 330, Left: 102.95, Right: 102.99},
	}
}

func TestMonteCarloReproducible(t *testing.T) {
	secs := saThreeSections(t)
	a, err := MonteCarlo(secs, SlopeAreaOptions{}, MonteCarloOptions{Draws: 1200, Seed: 7, Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	b, err := MonteCarlo(secs, SlopeAreaOptions{}, MonteCarloOptions{Draws: 1200, Seed: 7, Workers: 3})
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(a.Samples, b.Samples) || a.P50 != b.P50 {
		t.Error("same seed, different worker counts: different draws")
	}
	c, err := MonteCarlo(secs, SlopeAreaOptions{}, MonteCarloOptions{Draws: 1200, Seed: 8, Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	if c.P50 == a.P50 {
		t.Error("different seeds gave the same median")
	}
	if a.Draws != 1200 || a.NCV != DefaultNCV || a.MarkSD != DefaultMarkSDSI {
		t.Errorf("settings %d %g %g", a.Draws, a.NCV, a.MarkSD)
	}
}

// With no spread every draw is the deterministic discharge.
func TestMonteCarloZeroSpread(t *testing.T) {
	secs := saThreeSections(t)
	det, err := SolveSlopeArea(secs, SlopeAreaOptions{})
	if err != nil {
		t.Fatal(err)
	}
	u, err := MonteCarlo(secs, SlopeAreaOptions{}, MonteCarloOptions{Draws: 300, Seed: 1, NCV: -1, MarkSD: -1})
	if err != nil {
		t.Fatal(err)
	}
	if u.Failed != 0 || len(u.Samples) != 300 {
		t.Fatalf("%d failed, %d samples", u.Failed, len(u.Samples))
	}
	for _, q := range []float64{u.Samples[0], u.Samples[299], u.P05, u.P50, u.P95} {
		if saRelErr(q, det.Discharge) > saClosedFormTol {
			t.Fatalf("zero-spread draw %.12g, deterministic %.12g", q, det.Discharge)
		}
	}
}

// saMedianTol is the relative distance allowed between the Monte Carlo
// median and the deterministic discharge. n is drawn with its median at the
// surveyed value and Q is nearly proportional to 1/n, so the median of Q
// sits near the deterministic Q; the marks add a small bias through √fall
// (a statistical property of the method; common practice).
const saMedianTol = 0.03

func TestMonteCarloMedian(t *testing.T) {
	secs := saThreeSections(t)
	det, err := SolveSlopeArea(secs, SlopeAreaOptions{})
	if err != nil {
		t.Fatal(err)
	}
	u, err := MonteCarlo(secs, SlopeAreaOptions{}, MonteCarloOptions{Draws: 5000, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	if saRelErr(u.P50, det.Discharge) > saMedianTol {
		t.Errorf("median %g, deterministic %g", u.P50, det.Discharge)
	}
	if !(u.P05 < u.P50 && u.P50 < u.P95) {
		t.Errorf("percentiles not ordered: %v", u)
	}
	if u.Failed > u.Draws/100 {
		t.Errorf("%d of %d draws failed", u.Failed, u.Draws)
	}
	// A larger n spread widens the band.
	w, err := MonteCarlo(secs, SlopeAreaOptions{}, MonteCarloOptions{Draws: 5000, Seed: 1, NCV: 0.3})
	if err != nil {
		t.Fatal(err)
	}
	if !(w.P95-w.P05 > u.P95-u.P05) {
		t.Errorf("band with CV 0.3 (%g) not wider than with CV 0.15 (%g)", w.P95-w.P05, u.P95-u.P05)
	}
}

// For two equal prismatic sections with one n, Q = K·√(F/L) and K ∝ 1/n,
// so dQ/dn = −Q/n (differentiating Manning's equation, Chow 1959, eq. 6-9);
// raising the upstream water surface raises Q and raising the downstream
// one lowers it.
func TestMonteCarloSensitivities(t *testing.T) {
	const n = 0.04
	secs := []Section{
		{ID: "A", Geometry: saTrapezoid(t, 10, 2, 100, 5, n), Distance: 0, Left: 102, Right: math.NaN()},
		{ID: "B", Geometry: saTrapezoid(t, 10, 2, 99.7, 5, n), Distance: 250, Left: 101.7, Right: math.NaN()},
	}
	det, err := SolveSlopeArea(secs, SlopeAreaOptions{})
	if err != nil {
		t.Fatal(err)
	}
	u, err := MonteCarlo(secs, SlopeAreaOptions{}, MonteCarloOptions{Draws: 10})
	if err != nil {
		t.Fatal(err)
	}
	// Central differences of step 0.001 about n = 0.04: error O((Δn/n)²) ≈ 1e-3.
	const sensitivityTol = 1e-3
	if want := -det.Discharge / n; saRelErr(u.DQDN, want) > sensitivityTol {
		t.Errorf("dQ/dn = %g, want −Q/n = %g", u.DQDN, want)
	}
	// Per 0.001 of n: −Q/n × 0.001.
	if want := -det.Discharge / n * 0.001; saRelErr(u.DQDNPerMilli, want) > sensitivityTol {
		t.Errorf("dQ per 0.001 of n = %g, want %g", u.DQDNPerMilli, want)
	}
	if !(u.DQDH[0] > 0 && u.DQDH[1] < 0) {
		t.Errorf("dQ/dh = %v, want up > 0, down < 0", u.DQDH)
	}
}

// BenchmarkMonteCarlo5000 measures 5 000 draws for a three-section
// compound reach of 25-point sections on one goroutine.
func BenchmarkMonteCarlo5000(b *testing.B) {
	secs := saThreeSections(b)
	for b.Loop() {
		if _, err := MonteCarlo(secs, SlopeAreaOptions{}, MonteCarloOptions{Draws: 5000, Seed: 1, Workers: 1}); err != nil {
			b.Fatal(err)
		}
	}
}

// A section's own mark standard deviation (from a poor quality rating)
// widens its water surface's spread and the band; two marks halve the
// variance of their mean.
func TestMonteCarloMarkSD(t *testing.T) {
	secs := saThreeSections(t)
	base, err := MonteCarlo(secs, SlopeAreaOptions{}, MonteCarloOptions{Draws: 2000, Seed: 3, NCV: -1})
	if err != nil {
		t.Fatal(err)
	}
	if want := DefaultMarkSDSI / math.Sqrt2; saRelErr(base.WaterSurfaceSD[0], want) > saClosedFormTol {
		t.Errorf("water-surface SD %g, want %g", base.WaterSurfaceSD[0], want)
	}
	poor, _ := rating.Poor.MarkSD(rating.SI)
	secs[0].MarkSD = poor
	wide, err := MonteCarlo(secs, SlopeAreaOptions{}, MonteCarloOptions{Draws: 2000, Seed: 3, NCV: -1})
	if err != nil {
		t.Fatal(err)
	}
	if saRelErr(wide.WaterSurfaceSD[0], poor/math.Sqrt2) > saClosedFormTol || !(wide.P95-wide.P05 > base.P95-base.P05) {
		t.Errorf("poor marks at XS1: SD %g, band %g vs %g", wide.WaterSurfaceSD[0], wide.P95-wide.P05, base.P95-base.P05)
	}
}

// BenchmarkMonteCarlo5000Parallel is the same on GOMAXPROCS goroutines.
func BenchmarkMonteCarlo5000Parallel(b *testing.B) {
	secs := saThreeSections(b)
	for b.Loop() {
		if _, err := MonteCarlo(secs, SlopeAreaOptions{}, MonteCarloOptions{Draws: 5000, Seed: 1}); err != nil {
			b.Fatal(err)
		}
	}
}

// Estimate warns that a mark standard deviation given is not used when
// every section's quality sets its own, and only then: not for the
// default, not for none (which overrides the qualities), not when a
// section is unrated, not without draws.
func TestEstimateMarkSDUnused(t *testing.T) {
	const unused = "the standard deviation of a mark given (0.05 m) is not used: every section's quality rating sets that of its own marks"
	good, _ := rating.Good.MarkSD(rating.SI)
	for _, tc := range []struct {
		name   string
		rated  int // how many sections, from the first, have a quality
		markSD float64
		draws  int
		warned bool
	}{
		{"given, all rated", 3, 0.05, 200, true},
		{"given, one unrated", 2, 0.05, 200, false},
		{"given, none rated", 0, 0.05, 200, false},
		{"default, all rated", 3, 0, 200, false},
		{"none, all rated", 3, -1, 200, false},
		{"given, all rated, no draws", 3, 0.05, 0, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			secs := saThreeSections(t)
			for i := range tc.rated {
				secs[i].Quality, secs[i].MarkSD = rating.Good, good
			}
			rep, err := Estimate(secs, EstimateOptions{Draws: tc.draws, MonteCarlo: MonteCarloOptions{Seed: 1, MarkSD: tc.markSD}})
			if err != nil {
				t.Fatal(err)
			}
			if got := slices.Contains(rep.Warnings, unused); got != tc.warned {
				t.Errorf("warned %v, want %v: %q", got, tc.warned, rep.Warnings)
			}
		})
	}
}

// A mark standard deviation above MaxMarkSD of the unit system is refused
// (ErrMarkSD); one at the bound is taken.
func TestMonteCarloMarkSDBound(t *testing.T) {
	for _, tc := range []struct {
		units  rating.Units
		markSD float64
		bad    bool
	}{
		{rating.SI, MaxMarkSDSI, false},
		{rating.SI, 1.01, true},
		{rating.SI, 1e9, true},
		{rating.US, MaxMarkSDUS, false},
		{rating.US, 3.01, true},
	} {
		t.Run(fmt.Sprintf("%v %g", tc.units, tc.markSD), func(t *testing.T) {
			secs := saThreeSections(t) // in US units the same numbers read in feet
			_, err := MonteCarlo(secs, SlopeAreaOptions{Units: tc.units}, MonteCarloOptions{Draws: 200, Seed: 1, MarkSD: tc.markSD})
			if got := errors.Is(err, ErrMarkSD); got != tc.bad {
				t.Errorf("error %v, want ErrMarkSD %v", err, tc.bad)
			}
			if !tc.bad && err != nil {
				t.Error(err)
			}
		})
	}
}

// The warning for draws without a solution: none up to FailedDrawsWarn
// of the draws, their share above it, and no band when all failed.
func TestFailedDrawsWarning(t *testing.T) {
	for _, tc := range []struct {
		draws, failed int
		want          string // "" for no warning
	}{
		{5000, 0, ""},
		{5000, 50, ""},
		{5000, 51, "51 of 5000 Monte Carlo draws (1.0 %) had no solution"},
		{5000, 3604, "3604 of 5000 Monte Carlo draws (72.1 %) had no solution"},
		{5000, 5000, "no uncertainty band: none of the 5000 Monte Carlo draws had a solution"},
	} {
		got := failedDrawsWarning(Uncertainty{Draws: tc.draws, Failed: tc.failed})
		if tc.want == "" && got != "" || !strings.Contains(got, tc.want) {
			t.Errorf("%d of %d failed: %q, want %q", tc.failed, tc.draws, got, tc.want)
		}
	}
}

// TestMonteCarloNSharedByRegion checks the band of n errors shared by
// region against independent ones on a reach where the answer is known:
// three equal sections without banks (all channel, six subsections of
// differing n), the bed and the marks falling 0.1 m per 100 m, marks held.
// Areas and velocity heads are equal at every section, so the fall is all
// friction and Q = K·√S. One factor f on every n divides every K by f:
// Q ∝ 1/f, and with ln f ~ N(0, σ²) the ratio P95/P50 of Q is exp(1.645σ),
// σ = √ln(1 + CV²) (closed form). Independent factors on eighteen
// subsections partly cancel, so that band is narrower.
func TestMonteCarloNSharedByRegion(t *testing.T) {
	var secs []Section
	for i := range 3 {
		bed := 100 - 0.1*float64(i)
		s := subdivide.Section{N: []float64{0.04, 0.035, 0.03, 0.03, 0.035, 0.04}}
		for _, p := range [][2]float64{{0, 3}, {10, 2}, {20, 1}, {30, 0}, {40, 1}, {50, 2}, {60, 3}} {
			s.Points = append(s.Points, subdivide.Point{Station: p[0], Elevation: bed + p[1]})
		}
		g, err := subdivide.Compile(s)
		if err != nil {
			t.Fatal(err)
		}
		secs = append(secs, Section{ID: fmt.Sprint("S", i), Geometry: g, Distance: 100 * float64(i), Left: bed + 2.5, Right: bed + 2.5})
	}
	const cv = 0.15
	band := func(e NErrors) Uncertainty {
		u, err := MonteCarlo(secs, SlopeAreaOptions{}, MonteCarloOptions{Draws: 4000, Seed: 3, NCV: cv, MarkSD: -1, NErrors: e})
		if err != nil {
			t.Fatal(err)
		}
		return u
	}
	shared, indep := band(NSharedByRegion), band(NIndependent)
	if shared.NErrors != NSharedByRegion || indep.NErrors != NIndependent {
		t.Errorf("settings reported %v and %v", shared.NErrors, indep.NErrors)
	}
	want := math.Exp(1.645 * math.Sqrt(math.Log1p(cv*cv)))
	if got := shared.P95 / shared.P50; math.Abs(got/want-1) > 0.02 {
		t.Errorf("shared P95/P50 = %.4f, want %.4f (closed form) within 2 %%", got, want)
	}
	ws, wi := shared.P95-shared.P05, indep.P95-indep.P05
	if !(ws > 1.5*wi) {
		t.Errorf("shared band %.4g not clearly wider than independent %.4g", ws, wi)
	}
}

func TestParseNErrors(t *testing.T) {
	for _, c := range []struct {
		in   string
		want NErrors
		err  bool
	}{{"independent", NIndependent, false}, {"By-Region", NSharedByRegion, false}, {"shared", 0, true}} {
		got, err := ParseNErrors(c.in)
		if (err != nil) != c.err || !c.err && got != c.want {
			t.Errorf("ParseNErrors(%q) = %v, %v", c.in, got, err)
		}
		if c.err && !errors.Is(err, ErrNErrors) {
			t.Errorf("ParseNErrors(%q): %v is not ErrNErrors", c.in, err)
		}
	}
}
