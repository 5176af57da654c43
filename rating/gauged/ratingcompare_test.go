package gauged

import (
	"errors"
	"math"
	"slices"
	"testing"
)

// TestCompareRatings: A is Q = 10·h on 0–10 m, B is Q = 11·h on 1–12 m
// (both linear, no e). The common range is 1–10 m; B is 10 % above A at
// every stage (11h/10h − 1), a difference of h m³/s.
func TestCompareRatings(t *testing.T) {
	a := compileRating(t, RatingTable{Name: "A", Points: []RatingPoint{{0, 0}, {10, 100}}})
	b := compileRating(t, RatingTable{Name: "B", Points: []RatingPoint{{1, 11}, {12, 132}}})
	c, err := CompareRatings(a, b, CompareOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if c.From != 1 || c.To != 10 || len(c.Rows) != 2 {
		t.Fatalf("range %g–%g, %d rows", c.From, c.To, len(c.Rows))
	}
	c, err = CompareRatings(a, b, CompareOptions{Step: 1})
	if err != nil {
		t.Fatal(err)
	}
	if len(c.Rows) != 10 {
		t.Fatalf("%d rows with step 1, want 10", len(c.Rows))
	}
	for _, r := range c.Rows {
		if math.Abs(r.Percent-10) > percentTol || math.Abs(r.Difference-r.Stage) > ratingTol*10 {
			t.Errorf("%+v", r)
		}
	}
	far := compileRating(t, RatingTable{Points: []RatingPoint{{20, 1}, {30, 2}}})
	if _, err := CompareRatings(a, far, CompareOptions{}); !errors.Is(err, ErrNoCommonRange) {
		t.Errorf("disjoint ratings: %v", err)
	}
}

// A comparison says where in the common range each table lies above its
// highest gauging. A is Q = 10·h on 0–10 m, B is Q = 11·h on 1–12 m: the
// common range is 1–10 m (closed form, as above), and the part above a
// highest gauging H is H–10 m, or all of it when H is below 1 m.
func TestCompareRatingsExtrapolation(t *testing.T) {
	nan := math.NaN()
	for _, tc := range []struct {
		name         string
		highA, highB float64 // NaN: not known
		wantA, wantB Extrapolation
		anyA, anyB   bool
	}{
		{"A above its gaugings", 8, nan, Extrapolation{true, 8, 10}, Extrapolation{false, nan, nan}, true, false},
		{"both", 8, 6.5, Extrapolation{true, 8, 10}, Extrapolation{true, 6.5, 10}, true, true},
		{"B only, all of the range", 12, 0.5, Extrapolation{true, nan, nan}, Extrapolation{true, 1, 10}, false, true},
		{"neither", 10, 11, Extrapolation{true, nan, nan}, Extrapolation{true, nan, nan}, false, false},
		{"neither known", nan, nan, Extrapolation{false, nan, nan}, Extrapolation{false, nan, nan}, false, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			ta := RatingTable{Name: "A", Points: []RatingPoint{{0, 0}, {10, 100}}, HasHighGauging: !math.IsNaN(tc.highA), HighGauging: tc.highA}
			tb := RatingTable{Name: "B", Points: []RatingPoint{{1, 11}, {12, 132}}, HasHighGauging: !math.IsNaN(tc.highB), HighGauging: tc.highB}
			if !ta.HasHighGauging {
				ta.HighGauging = 0
			}
			if !tb.HasHighGauging {
				tb.HighGauging = 0
			}
			c, err := CompareRatings(compileRating(t, ta), compileRating(t, tb), CompareOptions{})
			if err != nil {
				t.Fatal(err)
			}
			same := func(got, want Extrapolation) bool {
				eq := func(x, y float64) bool { return x == y || math.IsNaN(x) && math.IsNaN(y) }
				return got.Known == want.Known && eq(got.From, want.From) && eq(got.To, want.To)
			}
			if !same(c.ExtrapolatedA, tc.wantA) || !same(c.ExtrapolatedB, tc.wantB) || c.ExtrapolatedA.Any() != tc.anyA || c.ExtrapolatedB.Any() != tc.anyB {
				t.Errorf("A %+v (any %v), B %+v (any %v); want A %+v, B %+v", c.ExtrapolatedA, c.ExtrapolatedA.Any(), c.ExtrapolatedB, c.ExtrapolatedB.Any(), tc.wantA, tc.wantB)
			}
		})
	}
}

// Each row gives the shift of A's gauge height that carries B's discharge,
// and the comparison the largest difference in discharge beside the
// largest in percent. A is Q = 10(h − 0.3)², B = 10(h − 0.2)², both
// tabulated with their zero flows, so log-linear interpolation in h − e is
// exact between rows and B is A shifted by +0.1 m at every stage (closed
// form). B − A = 10(0.2h − 0.05) = 2h − 0.5 grows with stage, largest
// at the top (5.5 m³/s at 3 m); the percent difference is largest at the
// bottom. With a step the rows are the range's ends and the multiples of
// the step between them.
func TestCompareRatingsShift(t *testing.T) {
	law := func(e float64) RatingTable {
		rt := RatingTable{HasZeroFlow: true, ZeroFlow: e}
		for h := 0.5; h <= 3+1e-9; h += 0.25 {
			rt.Points = append(rt.Points, RatingPoint{Stage: h, Discharge: 10 * (h - e) * (h - e)})
		}
		return rt
	}
	a, b := compileRating(t, law(0.3)), compileRating(t, law(0.2))
	c, err := CompareRatings(a, b, CompareOptions{Step: 0.4})
	if err != nil {
		t.Fatal(err)
	}
	var stages []float64
	for _, r := range c.Rows {
		stages = append(stages, r.Stage)
		switch {
		case r.B > 10*(3-0.3)*(3-0.3): // beyond A's rows
			if !math.IsNaN(r.Shift) {
				t.Errorf("at %g m B %g is above A's rows: shift %g, want NaN", r.Stage, r.B, r.Shift)
			}
		case math.Abs(r.Shift-0.1) > 1e-9:
			t.Errorf("at %g m shift %.12f, want 0.1", r.Stage, r.Shift)
		}
	}
	want := []float64{0.5, 0.8, 1.2, 1.6, 2, 2.4, 2.8, 3}
	if !slices.Equal(stages, want) {
		t.Errorf("stages %v, want %v", stages, want)
	}
	if math.Abs(c.MaxDifference-5.5) > 1e-9 || c.MaxDifferenceStage != 3 || c.MaxStage != 0.5 {
		t.Errorf("largest difference %g at %g, largest percent at %g; want 5.5 at 3, percent at 0.5", c.MaxDifference, c.MaxDifferenceStage, c.MaxStage)
	}
}
