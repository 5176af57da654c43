package gauged_test

import (
	"math"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
)

// The standard error of Johnson's e in closed form, from differentiating
// e = (G₁G₃ − G₂²)/(G₁ + G₃ − 2G₂): at G = 1, 2, 4 (D = 1, e = 0) the
// derivatives are 4, −4 and 1, so stage errors of 0.01 each give
// 0.01·√33; the same as central differences of JohnsonZeroFlow.
func TestJohnsonZeroFlowSE(t *testing.T) {
	got := gauged.JohnsonZeroFlowSE(1, 2, 4, 0.01, 0.01, 0.01)
	if want := 0.01 * math.Sqrt(33); math.Abs(got-want) > 1e-12 {
		t.Errorf("SE %.15g, want %.15g", got, want)
	}
	g := []float64{3.5675, 4.4212, 5.3441} // Johnson's three gauge heights (ft) of the Patuxent fit with breakpoints 5.5, 9 and 13 ft, below
	var v float64
	for i := range g {
		up, dn := append([]float64(nil), g...), append([]float64(nil), g...)
		up[i] += 1e-6
		dn[i] -= 1e-6
		eu, _ := gauged.JohnsonZeroFlow(up[0], up[1], up[2])
		ed, _ := gauged.JohnsonZeroFlow(dn[0], dn[1], dn[2])
		d := (eu - ed) / 2e-6 * 0.02
		v += d * d
	}
	if got := gauged.JohnsonZeroFlowSE(g[0], g[1], g[2], 0.02, 0.02, 0.02); math.Abs(got/math.Sqrt(v)-1) > 1e-5 {
		t.Errorf("SE %g, central differences %g", got, math.Sqrt(v))
	}
}

// Reference: testdata/reference/gaugings-01594440.csv (USGS 01594440).
// With breakpoints 5.5, 9 and 13 ft the first control's gaugings span
// 3.53 to 5.45 ft, and Johnson's three points (3.57, 4.42, 5.34 ft) lie
// on a curve so nearly straight (G₁ + G₃ − 2G₂ = 0.07 ft) that e came out
// −6.96 ft and the fit warned "check the offset" of its plausible 1.6 ft.
// e is now not determined there: its 95 % uncertainty from the curve's
// scatter is more than the 25 % of the gauged depth the check allows,
// and there is no warning. With breakpoint 7 ft the range suffices: e is
// 2.39 ft with its uncertainty, as before.
func TestJohnsonNotDeterminedOnShortRange(t *testing.T) {
	gs := patuxentGaugings(t)
	for _, tc := range []struct {
		breaks       []float64
		undetermined bool
	}{
		{[]float64{5.5, 9, 13}, true},
		{[]float64{7}, false},
		{nil, false},
	} {
		f, err := gauged.FitControls(gs, gauged.ControlOptions{Breaks: tc.breaks, Units: rating.US})
		if err != nil {
			t.Fatal(err)
		}
		j := f.Johnson
		if !j.OK || j.Undetermined != tc.undetermined || !(j.ZeroFlowSE > 0) {
			t.Errorf("%v: Johnson %+v", tc.breaks, j)
		}
		if tc.undetermined && !strings.Contains(j.Note, "not determined: e = -6.96 ± ") {
			t.Errorf("%v: note %q", tc.breaks, j.Note)
		}
		for _, w := range f.Warnings {
			if strings.Contains(w, "Johnson") && tc.undetermined {
				t.Errorf("%v: warning %q", tc.breaks, w)
			}
		}
		if len(tc.breaks) == 1 && math.Abs(j.ZeroFlow-2.3865) > 1e-3 {
			t.Errorf("%v: e = %g, want 2.3865 (as before)", tc.breaks, j.ZeroFlow)
		}
	}
}
