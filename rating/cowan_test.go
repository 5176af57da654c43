package rating

import (
	"errors"
	"math"
	"testing"
)

// TestCowan evaluates n = (nb + n1 + n2 + n3 + n4)·m (Cowan 1956, as
// eq. 3 of Arcement & Schneider 1989, USGS WSP 2339) by hand from the table
// values (tables 1-3 of that paper, from memory).
func TestCowan(t *testing.T) {
	tests := []struct {
		in          CowanInput
		lo, mid, hi float64
	}{
		// Gravel 0.028-0.035, minor irregularity 0.001-0.005, gradual 0,
		// minor obstruction 0.005-0.015, small vegetation 0.002-0.010, m 1.
		{CowanInput{Base: "gravel", Irregularity: "minor", Obstruction: "minor", Vegetation: "small"},
			0.036, (0.0315 + 0.003 + 0.010 + 0.006), 0.065},
		// Sand 0.5 mm 0.022, smooth, negligible obstruction 0-0.004 (the
		// first row, taken by default), appreciable meandering m = 1.15.
		{CowanInput{Base: "sand-0.5", Meander: "appreciable"}, 0.022 * 1.15, 0.024 * 1.15, 0.026 * 1.15},
		// Flood plain: firm soil 0.025-0.032, negligible obstruction
		// 0-0.004, extreme vegetation 0.100-0.200, m = 1.0.
		{CowanInput{Base: "firm-soil", Vegetation: "extreme", Floodplain: true}, 0.125, 0.0285 + 0.002 + 0.15, 0.236},
	}
	const tol = 1e-12
	for _, tt := range tests {
		r, err := Cowan(tt.in)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(r.Lo-tt.lo) > tol || math.Abs(r.N-tt.mid) > tol || math.Abs(r.Hi-tt.hi) > tol {
			t.Errorf("%+v: %g %g %g, want %g %g %g", tt.in, r.Lo, r.N, r.Hi, tt.lo, tt.mid, tt.hi)
		}
		if len(r.Terms) != 6 {
			t.Errorf("%+v: %d terms", tt.in, len(r.Terms))
		}
	}
	if _, err := Cowan(CowanInput{Base: "gravel", Vegetation: "extreme"}); !errors.Is(err, ErrCowanChoice) {
		t.Errorf("extreme vegetation in a channel: %v, want ErrCowanChoice (table 2 has no such row)", err)
	}
}
