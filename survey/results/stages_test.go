package results

import (
	"errors"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
)

// TestTableStages: default stages of a flat or too shallow section fail
// with ErrNoDepth, naming the source and keeping the cause; the same
// section with a range asked for fails without it (the flags' fault); a
// section 1 m deep gets its stages.
func TestTableStages(t *testing.T) {
	section := func(depth float64) subdivide.Geometry {
		g, err := subdivide.Compile(subdivide.Section{Points: subdivide.XZ(0, 10+depth, 1, 10, 2, 10+depth), N: []float64{0.03, 0.03}})
		if err != nil {
			t.Fatal(err)
		}
		return g
	}
	ranged := rating.StageSpec{From: 10, To: 10.00005, FromSet: true, ToSet: true, MinStep: LengthResolution}
	for _, c := range []struct {
		name   string
		depth  float64
		spec   rating.StageSpec
		cause  error // nil: stages returned
		depth0 bool  // wraps ErrNoDepth
	}{
		{"flat", 0, rating.StageSpec{MinStep: LengthResolution}, rating.ErrNoLowPoint, true},
		{"shallow", 0.00005, rating.StageSpec{MinStep: LengthResolution}, ErrStagesAlike, true},
		{"shallow, range given", 0.00005, ranged, ErrStagesAlike, false},
		{"deep", 1, rating.StageSpec{MinStep: LengthResolution}, nil, false},
	} {
		st, _, err := TableStages(c.spec, section(c.depth), "x.csv")
		switch {
		case c.cause == nil && (err != nil || len(st) < 2):
			t.Errorf("%s: %d stages, %v", c.name, len(st), err)
		case c.cause != nil && !errors.Is(err, c.cause):
			t.Errorf("%s: %v, want %v", c.name, err, c.cause)
		case c.cause != nil && errors.Is(err, ErrNoDepth) != c.depth0:
			t.Errorf("%s: %v: ErrNoDepth %v, want %v", c.name, err, !c.depth0, c.depth0)
		case c.depth0 && !strings.HasPrefix(err.Error(), "x.csv: "):
			t.Errorf("%s: %v does not name the file", c.name, err)
		}
	}
	// A spec without MinStep gets LengthResolution all the same: 0.002 m
	// of depth in steps of 0.0001 m is 0.002/0.0001 + 1 = 21 stages (by
	// hand), with the warning that the step was raised.
	st, warnings, err := TableStages(rating.StageSpec{}, section(0.002), "x.csv")
	if err != nil || len(st) != 21 || len(warnings) == 0 {
		t.Errorf("MinStep unset: %d stages, warnings %q, %v; want 21 stages and a warning", len(st), warnings, err)
	}
}
