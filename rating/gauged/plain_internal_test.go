package gauged

import (
	"math"
	"strings"
	"testing"

	"wetline/rating"
)

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

// Johnson's estimate whose standard error is not known is not
// determined, and its note gives no "± -" (the case: e = 0.61 m from
// 0.9079 to 1.1996 m, a gauged depth of 0.7 m, of which 25 % is 0.175 m).
func TestJohnsonJudgeUnknownSE(t *testing.T) {
	for _, tc := range []struct {
		name    string
		se      float64
		undet   bool
		warn    bool
		in, not string
	}{
		{"unknown", math.NaN(), true, false, "its uncertainty not known", "± -"},
		{"too wide", 0.17, true, false, "e = 0.61 ± 0.33 m (95 %)", "± -"},
		{"determined, far from B", 0.01, false, true, "", "± -"},
	} {
		j := JohnsonEstimate{OK: true, ZeroFlow: 0.61, ZeroFlowSE: tc.se, G1: 0.9079, G2: 1.029, G3: 1.1996}
		w := j.judge(0.3, 0.7, rating.SI)
		if j.Undetermined != tc.undet || (w != "") != tc.warn || !strings.Contains(j.Note, tc.in) || strings.Contains(j.Note+w, tc.not) {
			t.Errorf("%s: undetermined %v, note %q, warning %q", tc.name, j.Undetermined, j.Note, w)
		}
	}
}
