package gauged_test

import (
	"math"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
)

// A replacing control fitted with its exponent near zero keeps the rating
// continuous at its breakpoint in form only: its offset lies within a hair
// of the breakpoint, and the rating rises by a factor within 0.1 mm. The
// fit warns of the step, naming the breakpoint and the discharges at it
// and just above; a rating whose controls meet smoothly gets no such
// warning. Invented gaugings: four on a riffle at 0.46 to 0.71 m, three
// high up at 2.31 to 2.96 m that barely rise (37 to 38.5 m3/s), the
// breakpoint given between them; and, for the smooth case, gaugings on
// Q = 5·(h − 0.3)² below 1.5 m and Q = 5·1.2²·((h − 0.9)/0.6)^1.6 above
// (continuous at 1.5 m; closed form).
func TestFitWarnsOfStepAtBreak(t *testing.T) {
	sparse := []gauged.Gauging{
		{Stage: 0.46, Discharge: 0.121, Quality: rating.Good}, {Stage: 0.52, Discharge: 0.27, Quality: rating.Good},
		{Stage: 0.58, Discharge: 0.496, Quality: rating.Fair}, {Stage: 0.71, Discharge: 1.11, Quality: rating.Good},
		{Stage: 2.31, Discharge: 37, Quality: rating.Fair}, {Stage: 2.74, Discharge: 38.5, Quality: rating.Fair},
		{Stage: 2.96, Discharge: 38.1, Quality: rating.Poor},
	}
	var smooth []gauged.Gauging
	for i := range 16 {
		h := 0.45 + 0.15*float64(i)
		q := 5 * (h - 0.3) * (h - 0.3)
		if h >= 1.5 {
			q = 5 * 1.2 * 1.2 * math.Pow((h-0.9)/0.6, 1.6)
		}
		smooth = append(smooth, gauged.Gauging{Stage: h, Discharge: q, Quality: rating.Good})
	}
	two := []gauged.ControlSpec{{Kind: gauged.SectionControl}, {Kind: gauged.ChannelControl}}
	for _, tc := range []struct {
		name   string
		gs     []gauged.Gauging
		breaks []float64
		want   string // "" for no step
	}{
		{"flat top, breakpoint 1 m", sparse, []float64{1}, "the rating steps at the breakpoint 1 m: 0.0001 m above it, it gives "},
		{"flat top, breakpoint 2 m", sparse, []float64{2}, "the rating steps at the breakpoint 2 m: 0.0001 m above it, it gives "},
		{"smooth", smooth, []float64{1.5}, ""},
	} {
		f, err := gauged.FitControls(tc.gs, gauged.ControlOptions{Controls: two, Breaks: tc.breaks})
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		var got string
		for _, w := range f.Warnings {
			if strings.Contains(w, "the rating steps") {
				got = w
			}
		}
		switch {
		case tc.want == "" && got != "":
			t.Errorf("%s: warned of a step: %s", tc.name, got)
		case tc.want != "" && !strings.Contains(got, tc.want):
			t.Errorf("%s: warnings %q, want one containing %q", tc.name, f.Warnings, tc.want)
		}
		steps := f.BreakSteps()
		if (len(steps) > 0) != (tc.want != "") {
			t.Errorf("%s: steps %+v", tc.name, steps)
		}
		for _, s := range steps {
			// The step is the rating's own: the discharge below is the
			// rating at the breakpoint, the one above StepProbe higher
			// (computed in logarithms, so to rounding).
			if math.Abs(s.Below/f.Rating.Discharge(s.Stage-1e-9)-1) > 1e-6 || math.Abs(s.Above/f.Rating.Discharge(s.Stage+gauged.StepProbe)-1) > 1e-12 ||
				!(s.Ratio > 1+s.Limit) || math.Abs(s.Limit-0.08) > 1e-4 { // fair gaugings either side: 8 % (README)
				t.Errorf("%s: step %+v", tc.name, s)
			}
		}
	}
}
