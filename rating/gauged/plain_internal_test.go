package gauged

import "testing"

// A control's exponent warning writes a tiny exponent as rating.Sayf does
// (by hand: 1.12e-15 to three figures).
func TestExponentWarningPlain(t *testing.T) {
	// The exponent warning of a control of exponent near zero.
	r, e := NewRating([]Control{{A: 2, B: 0.3, C: 1.12e-15, Kind: ChannelControl}})
	if e != nil {
		t.Fatal(e)
	}
	w := r.ExponentWarnings()
	if len(w) != 1 || w[0] != "control 1 (channel) has exponent 1.12×10^-15, outside 1 to 2.87 that such a control allows: check the control or its breakpoints" {
		t.Errorf("exponent warning %q", w)
	}
}
