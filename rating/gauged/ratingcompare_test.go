package gauged

import (
	"errors"
	"math"
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
