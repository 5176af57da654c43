package gauged_test

import (
	"errors"
	"math"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
)

// scaledLookup is the lookup table of a fit to gaugings of a compound
// section in its channel (1.0 to 2.4 m, below the banks at 2.5, e = 0.5
// fixed by a survey control), with the section's hydraulic rating c at
// 1.2 times the truth's n above them; f is the fit.
func scaledLookup(t *testing.T) (f *gauged.Fit, c rating.HydraulicCurve, tab gauged.FitTable) {
	t.Helper()
	truth := compound(t, 0.030, 0.060)
	gs := sample(t, truth, linspace(1.0, 2.4, 12))
	f, err := gauged.FitPowerLaw(gs, gauged.FitOptions{ZeroFlowFixed: true, ZeroFlow: 0.5, ZeroFlowSource: "survey control"})
	if err != nil {
		t.Fatal(err)
	}
	c = rating.HydraulicCurve{Geometry: compound(t, 0.036, 0.072), Options: rating.Options{Slope: 0.001}, Datum: 9.5}
	if tab, err = gauged.LookupTable(f, gauged.TableOptions{Hydraulic: &c, Step: 0.1}); err != nil {
		t.Fatal(err)
	}
	return f, c, tab
}

// The lookup table: the fit between the gaugings, the fit down to e below
// them, the hydraulic rating scaled to meet the fit at the highest gauging
// above them, and nothing past the section's lower end.
func TestLookupTable(t *testing.T) {
	f, c, tab := scaledLookup(t)
	// Conveyance ∝ 1/n (Chow, 1959, eq. 6-9): the survey's n is 1.2 times
	// the truth, so the hydraulic rating is 1/1.2 of the truth, and the fit
	// (a power law through the truth) meets it with a factor near 1.2.
	if math.Abs(tab.ScaleFactor-1.2) > 0.02 || tab.ScaleStage != 2.4 || tab.ScaleNote == "" {
		t.Errorf("scale factor %g at %g (%q)", tab.ScaleFactor, tab.ScaleStage, tab.ScaleNote)
	}
	first, last := tab.Rows[0], tab.Rows[len(tab.Rows)-1]
	if first.Stage != 0.5 || first.Discharge != 0 || first.Basis != gauged.BelowGaugings || !first.Extrapolated() {
		t.Errorf("first row %+v", first)
	}
	if want := c.Top(); last.Stage != want || last.Basis != gauged.HydraulicAbove {
		t.Errorf("last row %+v, want stage %g (the section's lower end)", last, want)
	}
	const tol = 1e-12 // round-off
	for _, r := range tab.Rows {
		switch {
		case r.Stage < 1.0 && r.Basis != gauged.BelowGaugings,
			r.Stage >= 1.0 && r.Stage <= 2.4 && (r.Basis != gauged.WithinGaugings || r.Extrapolated()),
			r.Stage > 2.4 && r.Basis != gauged.HydraulicAbove:
			t.Errorf("stage %g: basis %v", r.Stage, r.Basis)
		}
		if r.Basis == gauged.HydraulicAbove && relErr(r.Discharge, tab.ScaleFactor*r.Hydraulic) > tol {
			t.Errorf("stage %g: %g is not the factor times %g", r.Stage, r.Discharge, r.Hydraulic)
		}
		if r.Stage == 2.4 && relErr(r.Discharge, tab.ScaleFactor*r.Hydraulic) > tol {
			t.Errorf("the two curves do not meet at the highest gauging: %g and %g", r.Discharge, tab.ScaleFactor*r.Hydraulic)
		}
	}
	if _, err := gauged.LookupTable(f, gauged.TableOptions{Hydraulic: &c, To: c.Top() + 0.1}); !errors.Is(err, gauged.ErrBeyondSection) {
		t.Errorf("past the section's end: err = %v", err)
	}
	if _, err := gauged.LookupTable(f, gauged.TableOptions{To: 3}); !errors.Is(err, gauged.ErrBeyondSection) {
		t.Errorf("above the gaugings without a section: err = %v", err)
	}
	plain, err := gauged.LookupTable(f, gauged.TableOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if l := plain.Rows[len(plain.Rows)-1]; l.Stage != 2.4 || l.Extrapolated() || !math.IsNaN(plain.ScaleFactor) {
		t.Errorf("without a section the table ends at %+v", l)
	}
}

// FitTable.At gives every row of the table back exactly (it is the rule
// the table was laid out with), follows the same three pieces between
// rows, and refuses stages outside the table.
func TestFitTableAt(t *testing.T) {
	f, c, tab := scaledLookup(t)
	same := func(a, b float64) bool { return a == b || (math.IsNaN(a) && math.IsNaN(b)) }
	for _, r := range tab.Rows {
		got, err := tab.At(f, &c, r.Stage)
		if err != nil {
			t.Fatalf("stage %g: %v", r.Stage, err)
		}
		if !same(got.Discharge, r.Discharge) || got.Basis != r.Basis || !same(got.Lower, r.Lower) || !same(got.Hydraulic, r.Hydraulic) {
			t.Errorf("stage %g: At gives %+v, the table %+v", r.Stage, got, r)
		}
	}
	for _, tc := range []struct {
		h     float64
		basis gauged.Basis
	}{{0.73, gauged.BelowGaugings}, {1.57, gauged.WithinGaugings}, {2.43, gauged.HydraulicAbove}} {
		got, err := tab.At(f, &c, tc.h)
		if err != nil {
			t.Fatal(err)
		}
		want := f.Discharge(tc.h)
		if tc.basis == gauged.HydraulicAbove {
			q, _ := c.Discharge(tc.h)
			want = tab.ScaleFactor * q
		}
		if got.Basis != tc.basis || got.Discharge != want {
			t.Errorf("stage %g: %v %g, want %v %g", tc.h, got.Basis, got.Discharge, tc.basis, want)
		}
	}
	for _, h := range []float64{0.49, c.Top() + 0.01, math.NaN()} {
		if _, err := tab.At(f, &c, h); !errors.Is(err, gauged.ErrBeyondSection) {
			t.Errorf("stage %g outside the table: err = %v", h, err)
		}
	}
}
