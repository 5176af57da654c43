package gauged_test

import (
	"errors"
	"math"
	"testing"

	"wetline/rating/gauged"
)

// A riffle drowned by the channel (replace) and a floodplain (add): the
// rating is continuous at each breakpoint, the replacing control's offset
// follows from continuity in closed form, and Stage inverts Discharge.
func TestNewRatingContinuity(t *testing.T) {
	r, err := gauged.NewRating([]gauged.Control{
		{Kind: gauged.SectionControl, A: 6, B: 0.2, C: 2.2},
		{Kind: gauged.ChannelControl, Joint: gauged.Replace, A: 9, C: 1.6, From: 0.9},
		{Kind: gauged.ChannelControl, Joint: gauged.Add, A: 15, C: 1.7, From: 2.5},
	})
	if err != nil {
		t.Fatal(err)
	}
	// Closed form: B₂ = κ − (Q₁(κ)/A₂)^(1/C₂).
	q1 := 6 * math.Pow(0.9-0.2, 2.2)
	wantB2 := 0.9 - math.Pow(q1/9, 1/1.6)
	const tol = 1e-12 // round-off
	if b := r.Controls[1].B; math.Abs(b-wantB2) > tol {
		t.Errorf("B2 = %.15g, want %.15g", b, wantB2)
	}
	if r.Controls[2].B != 2.5 || r.Controls[0].From != 0.2 {
		t.Errorf("added control's offset %g, first From %g", r.Controls[2].B, r.Controls[0].From)
	}
	for _, k := range []float64{0.9, 2.5} {
		below, above := r.Discharge(k-1e-10), r.Discharge(k)
		if math.Abs(below-above) > 1e-8*above {
			t.Errorf("jump at %g: %g below, %g at", k, below, above)
		}
	}
	// Above the floodplain's breakpoint the channel carries on and the
	// floodplain adds (closed form).
	h := 3.1
	want := 9*math.Pow(h-wantB2, 1.6) + 15*math.Pow(h-2.5, 1.7)
	if got := r.Discharge(h); math.Abs(got-want) > 1e-12*want {
		t.Errorf("Q(%g) = %g, want %g", h, got, want)
	}
	if r.Discharge(0.2) != 0 || r.Discharge(-1) != 0 {
		t.Error("discharge below the first offset is not zero")
	}
	for _, h := range []float64{0.25, 0.7, 0.9, 1.8, 2.5, 2.51, 4.2} {
		q := r.Discharge(h)
		got, err := r.Stage(q)
		if err != nil || math.Abs(got-h) > 1e-6 { // rating.ShiftTolerance on the bisected control
			t.Errorf("Stage(Q(%g)) = %g, %v", h, got, err)
		}
	}
	if _, err := r.Stage(0); !errors.Is(err, gauged.ErrNoStage) {
		t.Errorf("Stage(0): %v", err)
	}
}

// Controls that make no rating are refused with ErrControls.
func TestNewRatingErrors(t *testing.T) {
	for _, tc := range []struct {
		name string
		cs   []gauged.Control
	}{
		{"none", nil},
		{"zero exponent", []gauged.Control{{A: 1, B: 0, C: 0}}},
		{"break below offset", []gauged.Control{{A: 1, B: 1, C: 2}, {A: 1, C: 2, From: 0.5}}},
		{"five", []gauged.Control{{A: 1, C: 2}, {A: 1, C: 2, From: 1}, {A: 1, C: 2, From: 2}, {A: 1, C: 2, From: 3}, {A: 1, C: 2, From: 4}}},
	} {
		if _, err := gauged.NewRating(tc.cs); !errors.Is(err, gauged.ErrControls) {
			t.Errorf("%s: err = %v", tc.name, err)
		}
	}
}

// Exponents outside the range a control's kind allows are warned about;
// the ranges hold the closed-form exponents of critical flow over
// rectangular (3/2) and triangular (5/2) crests and of Manning flow in wide
// rectangular (5/3) and triangular (8/3) channels (Chow, 1959, sections
// 4-2 and 5-6).
func TestExponentRange(t *testing.T) {
	for _, tc := range []struct {
		kind gauged.ControlKind
		c    []float64
	}{
		{gauged.SectionControl, []float64{1.5, 2.5}},
		{gauged.ChannelControl, []float64{5.0 / 3, 8.0 / 3, 1.0}},
	} {
		lo, hi := gauged.ExponentRange(tc.kind)
		for _, c := range tc.c {
			if c < lo || c > hi {
				t.Errorf("%v: exponent %g outside %g..%g", tc.kind, c, lo, hi)
			}
		}
	}
	r, _ := gauged.NewRating([]gauged.Control{{Kind: gauged.SectionControl, A: 1, B: 0, C: 4}})
	if w := r.ExponentWarnings(); len(w) != 1 {
		t.Errorf("warnings %q", w)
	}
}
