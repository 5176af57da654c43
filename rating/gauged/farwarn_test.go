package gauged_test

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
)

// A fitted gauging more than FarDepartureSigmas standard uncertainties
// (σ = U/1.96 in ln Q, a poor gauging's U read as 12 %) off the fitted
// rating is warned of, by name, stage, departure and multiple of σ, and
// the highest gauging is said to be the one the top of the fit rests on.
// Invented gaugings about Q = 4·h^1.7 (offset held at 0), one fair
// gauging 20 % high at 2.5 m and a poor one 60 % high at the top, 9 m.
// The expected values are the closed-form weighted least-squares line of
// ln Q on ln h (weights 1/σ²; Draper and Smith, 1998, from memory),
// computed by a short independent script: ln A = 1.37583, C = 1.73130;
// departures +0.16411 (+17.83 %, 4.02 σ) at 2.5 m and +0.41170
// (+50.94 %, 6.72 σ) at 9 m, every other gauging within 1.7 σ.
func TestFarGaugingWarnings(t *testing.T) {
	pts := []struct {
		h, factor float64
		q         rating.Quality
	}{
		{1.0, 1.01, rating.Good}, {1.5, 0.99, rating.Good}, {2.0, 1.00, rating.Good}, {2.5, 1.20, rating.Fair},
		{3.0, 1.01, rating.Good}, {4.0, 0.99, rating.Good}, {5.0, 1.00, rating.Good}, {6.0, 1.01, rating.Good},
		{9.0, 1.60, rating.Poor},
	}
	var gs []gauged.Gauging
	for i, p := range pts {
		gs = append(gs, gauged.Gauging{Source: fmt.Sprintf("row %d", i+2), Stage: p.h, Discharge: 4 * math.Pow(p.h, 1.7) * p.factor, Quality: p.q})
	}
	f, err := gauged.FitControls(gs, gauged.ControlOptions{OffsetFixed: true, Offset: 0, OffsetSource: "given"})
	if err != nil {
		t.Fatal(err)
	}
	if c := f.Rating.Controls[0]; math.Abs(math.Log(c.A)-1.37583) > 1e-4 || math.Abs(c.C-1.73130) > 1e-4 {
		t.Fatalf("fit ln A %.6g, C %.6g, want 1.37583, 1.73130", math.Log(c.A), c.C)
	}
	var far []string
	for _, w := range f.Warnings {
		if strings.Contains(w, "standard uncertainty") {
			far = append(far, w)
		}
	}
	want := [][]string{
		{"row 5 at gauge height 2.5 m departs +17.8 % from the fitted rating (+0.164 in ln Q), 4.0 times its standard uncertainty", "U = 8 %", "check the gauging"},
		{"row 10 at gauge height 9 m departs +50.9 % from the fitted rating (+0.412 in ln Q), 6.7 times its standard uncertainty", "U = 12 %", "it is the highest gauging"},
	}
	if len(far) != len(want) {
		t.Fatalf("warnings of far gaugings %q, want %d", far, len(want))
	}
	for i, parts := range want {
		for _, p := range parts {
			if !strings.Contains(far[i], p) {
				t.Errorf("warning %q lacks %q", far[i], p)
			}
		}
	}
}
