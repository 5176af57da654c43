package subdivide_test

import (
	"math"
	"testing"

	"wetline/subdivide"
)

// bankTol is the round-off allowed in one interpolation of the ground.
const bankTol = 1e-12

// Bankfull is the lower bank top; a bank between points is interpolated
// (closed form: the ground line is straight between points).
func TestBankfull(t *testing.T) {
	for _, c := range []struct {
		name string
		sec  subdivide.Section
		want float64
		ok   bool
	}{
		{"no banks", subdivide.Section{Points: subdivide.XZ(0, 3, 5, 0, 10, 3)}, 0, false},
		{"banks on points", subdivide.Section{Points: subdivide.XZ(0, 4, 2, 2, 5, 0, 8, 2.5, 10, 4), HasBanks: true, LeftBank: 2, RightBank: 8}, 2, true},
		{"bank between points", subdivide.Section{Points: subdivide.XZ(0, 4, 4, 0, 10, 3), HasBanks: true, LeftBank: 2, RightBank: 7}, 1.5, true},
		{"wall at the bank", subdivide.Section{Points: subdivide.XZ(0, 5, 2, 5, 2, 1, 6, 1, 8, 3), HasBanks: true, LeftBank: 2, RightBank: 8}, 3, true},
	} {
		got, ok := c.sec.Bankfull()
		if ok != c.ok || (ok && math.Abs(got-c.want) > bankTol) {
			t.Errorf("%s: bankfull %g %v, want %g %v", c.name, got, ok, c.want, c.ok)
		}
	}
}

func TestChannelLimits(t *testing.T) {
	subs := []subdivide.Subsection{
		{From: 0, To: 3, Region: subdivide.LeftOverbank},
		{From: 3, To: 5, Region: subdivide.Channel},
		{From: 5, To: 7, Region: subdivide.Channel},
		{From: 7, To: 9, Region: subdivide.RightOverbank},
	}
	if l, r, ok := subdivide.ChannelLimits(subs); !ok || l != 3 || r != 7 {
		t.Errorf("limits %g %g %v, want 3 7 true", l, r, ok)
	}
	if _, _, ok := subdivide.ChannelLimits(subs[1:3]); ok {
		t.Error("a layout without overbanks has no channel limits")
	}
}
