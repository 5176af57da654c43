package gauged

import (
	"errors"
	"math"
	"testing"
)

// Tolerances of the package's tests.
const (
	// ratingTol is the tolerance on hand-computed discharges and stages
	// (round-off of a few operations on numbers near 1).
	ratingTol = 1e-12
	// percentTol is the tolerance on percent departures and differences
	// (round-off of a ratio times 100).
	percentTol = 1e-9
)

func compileRating(t *testing.T, rt RatingTable) *TableRating {
	t.Helper()
	r, err := rt.Compile()
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// TestRatingLogLinear checks the interpolation laws against hand
// computations.
//
// Table (0.2, 0), (0.7, 2), (1.2, 8) with e = 0.2:
//
//	0.7 → 1.2: log-linear in (h − e): b = ln(8/2)/ln(1.0/0.5) = ln 4/ln 2 = 2,
//	           Q(0.95) = 2·(0.75/0.5)² = 2·2.25 = 4.5 (linear would give 5).
//	0.2 → 0.7: the dry row is e itself, so the exponent above carries down:
//	           Q(0.45) = 2·(0.25/0.5)² = 0.5 (linear, without e, gives 1).
//	at or below e: Q = 0; above 1.2 with extrapolation, the last law:
//	           Q(1.5) = 2·(1.3/0.5)² = 2·6.76 = 13.52.
func TestRatingLogLinear(t *testing.T) {
	pts := []RatingPoint{{0.2, 0}, {0.7, 2}, {1.2, 8}}
	withE := compileRating(t, RatingTable{Points: pts, HasZeroFlow: true, ZeroFlow: 0.2})
	noE := compileRating(t, RatingTable{Points: pts})
	extra := compileRating(t, RatingTable{Points: pts, HasZeroFlow: true, ZeroFlow: 0.2, Extrapolate: true})
	for _, tc := range []struct {
		name string
		r    *TableRating
		h, q float64
		how  Lookup
	}{
		{"log-linear", withE, 0.95, 4.5, InTable},
		{"linear without e", noE, 0.95, 5, InTable},
		{"foot log-linear where e is a row", withE, 0.45, 0.5, InTable},
		{"foot linear without e", noE, 0.45, 1, InTable},
		{"a row", withE, 0.7, 2, InTable},
		{"last row", withE, 1.2, 8, InTable},
		{"at e", withE, 0.2, 0, ZeroFlow},
		{"below e", withE, 0.1, 0, ZeroFlow},
		{"above the table", withE, 1.5, math.NaN(), OutsideTable},
		{"below the table, no e", noE, 0.1, math.NaN(), OutsideTable},
		{"extrapolated above", extra, 1.5, 13.52, Extrapolated},
	} {
		t.Run(tc.name, func(t *testing.T) {
			q, how := tc.r.Discharge(tc.h)
			if how != tc.how || !(math.Abs(q-tc.q) <= ratingTol*math.Max(1, tc.q) || math.IsNaN(q) && math.IsNaN(tc.q)) {
				t.Errorf("Discharge(%g) = %v, %v; want %v, %v", tc.h, q, how, tc.q, tc.how)
			}
		})
	}
	// The inverse: Stage(4.5) = 0.95 exactly as above; Stage(0.5) = 0.45.
	for _, tc := range []struct{ q, h float64 }{{4.5, 0.95}, {0.5, 0.45}, {8, 1.2}, {2, 0.7}} {
		h, err := withE.Stage(tc.q)
		if err != nil || math.Abs(h-tc.h) > ratingTol {
			t.Errorf("Stage(%g) = %v, %v; want %v", tc.q, h, err, tc.h)
		}
	}
	if _, err := withE.Stage(9); !errors.Is(err, ErrBeyondTable) {
		t.Errorf("Stage(9) error %v, want ErrBeyondTable", err)
	}
	if h, err := extra.Stage(13.52); err != nil || math.Abs(h-1.5) > ratingTol {
		t.Errorf("extrapolated Stage(13.52) = %v, %v; want 1.5", h, err)
	}
}

// A table laid out from one power law Q = 4·(h − 0.2)^1.8 is interpolated
// exactly by the log-linear law with e = 0.2 (closed form: ln Q is linear
// in ln(h − e) between any two rows).
func TestRatingPowerLawExact(t *testing.T) {
	law := func(h float64) float64 { return 4 * math.Pow(h-0.2, 1.8) }
	var pts []RatingPoint
	for _, h := range []float64{0.3, 0.5, 0.8, 1.4, 2.2, 3.5} {
		pts = append(pts, RatingPoint{h, law(h)})
	}
	r := compileRating(t, RatingTable{Points: pts, HasZeroFlow: true, ZeroFlow: 0.2})
	for h := 0.3; h <= 3.5; h += 0.037 {
		q, how := r.Discharge(h)
		if how != InTable || math.Abs(q/law(h)-1) > ratingTol {
			t.Fatalf("Q(%g) = %v (%v), want %v", h, q, how, law(h))
		}
		back, err := r.Stage(q)
		if err != nil || math.Abs(back-h) > ratingTol {
			t.Fatalf("Stage(Q(%g)) = %v, %v", h, back, err)
		}
	}
}

// TestRatingFootLogLinear checks the stretch from a dry row at or below e
// to the first row with flow against the power law the table was laid out
// from. Rows of Q = 8.264·(h − 0.3242)^2.1075 (closed form) above a dry row
// at e, or below it, are read back on that law between the dry row and the
// first row with flow, since the law's exponent is the one of the stretch
// above; a single row with flow leaves no exponent and the stretch linear.
func TestRatingFootLogLinear(t *testing.T) {
	const e, c, b = 0.3242, 8.264, 2.1075
	law := func(h float64) float64 { return c * math.Pow(h-e, b) }
	rows := func(dry float64, hs ...float64) []RatingPoint {
		pts := []RatingPoint{{dry, 0}}
		for _, h := range hs {
			pts = append(pts, RatingPoint{h, law(h)})
		}
		return pts
	}
	linear := func(h0, h1, h float64) float64 { return law(h1) * (h - h0) / (h1 - h0) }
	for _, tc := range []struct {
		name string
		rt   RatingTable
		h, q float64
		how  Lookup
	}{
		{"dry row at e", RatingTable{Points: rows(e, 0.4, 0.46, 0.5), HasZeroFlow: true, ZeroFlow: e}, 0.33, law(0.33), InTable},
		{"dry row at e, near the first row", RatingTable{Points: rows(e, 0.4, 0.46), HasZeroFlow: true, ZeroFlow: e}, 0.39, law(0.39), InTable},
		{"dry row below e", RatingTable{Points: rows(0.3, 0.4, 0.46), HasZeroFlow: true, ZeroFlow: e}, 0.36, law(0.36), InTable},
		{"between the dry row and e", RatingTable{Points: rows(0.3, 0.4, 0.46), HasZeroFlow: true, ZeroFlow: e}, 0.31, 0, ZeroFlow},
		{"two dry rows", RatingTable{Points: append([]RatingPoint{{0.2, 0}}, rows(0.3, 0.4, 0.46)...), HasZeroFlow: true, ZeroFlow: e}, 0.35, law(0.35), InTable},
		{"e not known", RatingTable{Points: rows(e, 0.4, 0.46)}, 0.33, linear(e, 0.4, 0.33), InTable},
		{"one row with flow", RatingTable{Points: rows(e, 0.4), HasZeroFlow: true, ZeroFlow: e}, 0.33, linear(e, 0.4, 0.33), InTable},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := compileRating(t, tc.rt)
			q, how := r.Discharge(tc.h)
			if how != tc.how || math.Abs(q-tc.q) > ratingTol*math.Max(1, tc.q) || tc.q > 0 && math.Abs(q/tc.q-1) > ratingTol {
				t.Fatalf("Discharge(%g) = %v, %v; want %v, %v", tc.h, q, how, tc.q, tc.how)
			}
			if q > 0 {
				if back, err := r.Stage(q); err != nil || math.Abs(back-tc.h) > ratingTol {
					t.Errorf("Stage(%g) = %v, %v; want %g", q, back, err, tc.h)
				}
			}
		})
	}
}

func TestRatingValidate(t *testing.T) {
	for _, tc := range []struct {
		name  string
		rt    RatingTable
		point int
		is    error
	}{
		{"one row", RatingTable{Points: []RatingPoint{{1, 1}}}, -1, ErrRatingTooFew},
		{"stages fall", RatingTable{Points: []RatingPoint{{1, 1}, {0.9, 2}}}, 1, ErrRatingStages},
		{"repeated stage", RatingTable{Points: []RatingPoint{{1, 1}, {1, 2}}}, 1, ErrRatingStages},
		{"discharge falls", RatingTable{Points: []RatingPoint{{1, 1}, {2, 3}, {3, 2.5}}}, 2, ErrRatingNotRising},
		{"discharge flat", RatingTable{Points: []RatingPoint{{1, 1}, {2, 3}, {3, 3}}}, 2, ErrRatingNotRising},
		{"back to zero", RatingTable{Points: []RatingPoint{{1, 1}, {2, 0}}}, 1, ErrRatingNotRising},
		{"negative", RatingTable{Points: []RatingPoint{{1, -1}, {2, 0}}}, 0, ErrRatingNegative},
		{"NaN", RatingTable{Points: []RatingPoint{{1, 0}, {math.NaN(), 1}}}, 1, ErrRatingNotFinite},
		{"e above flow", RatingTable{Points: []RatingPoint{{1, 1}, {2, 3}}, HasZeroFlow: true, ZeroFlow: 1}, 0, ErrZeroFlowAbove},
		{"dry row above e", RatingTable{Points: []RatingPoint{{0.25, 0}, {0.35, 0.4}, {0.55, 2.9}}, HasZeroFlow: true, ZeroFlow: 0.1}, 0, ErrDryAboveZeroFlow},
		{"second dry row above e", RatingTable{Points: []RatingPoint{{0.05, 0}, {0.25, 0}, {0.35, 0.4}}, HasZeroFlow: true, ZeroFlow: 0.1}, 1, ErrDryAboveZeroFlow},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := tc.rt.Compile()
			var re *RatingError
			if !errors.As(err, &re) || re.Point != tc.point || !errors.Is(err, tc.is) {
				t.Errorf("error %v, want %v at point %d", err, tc.is, tc.point)
			}
		})
	}
	// Zero rows may repeat at the foot of the table (a pool below the control).
	if _, err := (RatingTable{Points: []RatingPoint{{0.1, 0}, {0.2, 0}, {0.5, 1}}}).Compile(); err != nil {
		t.Errorf("zero rows at the foot: %v", err)
	}
	// Dry rows at and below e, and e between the last dry row and the
	// first with flow, agree with it.
	for _, e := range []float64{0.2, 0.37} {
		if _, err := (RatingTable{Points: []RatingPoint{{0.1, 0}, {0.2, 0}, {0.5, 1}}, HasZeroFlow: true, ZeroFlow: e}).Compile(); err != nil {
			t.Errorf("dry rows at or below e = %g: %v", e, err)
		}
	}
}

// A table's compiled rating does not follow later changes to the caller's
// slice.
func TestRatingCopies(t *testing.T) {
	pts := []RatingPoint{{0, 0}, {1, 10}}
	r := compileRating(t, RatingTable{Points: pts})
	pts[1].Discharge = 99
	if q, _ := r.Discharge(1); q != 10 {
		t.Errorf("Q(1) = %v after the caller's slice changed", q)
	}
}
