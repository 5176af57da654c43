package gauged_test

import (
	"testing"

	"wetline/rating/gauged"
)

// TestHydraulicPriorOffsetAtOrAboveBed: a channel control's prior from the
// section puts zero flow no lower than the section's lowest point, over
// any range of stage; flow cannot cease below the bed (closed form: the
// bed is the lowest stage with zero area). Over a compound section's
// floodplain range an unbounded fit of ln Q = ln a + c·ln(h − b) trades
// b against c without limit; held at the bed, the exponent is the
// section's own growth there and stays within the range a channel shows
// (1 to 5, common practice).
func TestHydraulicPriorOffsetAtOrAboveBed(t *testing.T) {
	c := built(t, "compound:bottom=4,side=1,depth=1,floodplain=40", 0.035, 0.001)
	for _, r := range [][2]float64{{0.2, 1}, {0.5, 3}, {1.2, 4}, {2, 5}} {
		p, err := gauged.HydraulicPrior(c, r[0], r[1], gauged.HydraulicPriorOptions{})
		if err != nil {
			t.Fatal(err)
		}
		if p.Offset.Mean < c.Bottom() || !(p.Exponent.Mean > 1 && p.Exponent.Mean < 5) {
			t.Errorf("range %v: offset %g (bed %g), exponent %g", r, p.Offset.Mean, c.Bottom(), p.Exponent.Mean)
		}
		t.Logf("range %v: %s", r, p.Source)
	}
}
