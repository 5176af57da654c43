package gauged_test

import (
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
)

// A fitted gauging more than FarDepartureSigmas standard uncertainties
// (σ = U/1.96 in ln Q, a poor gauging's U read as 12 %) off the fitted
// rating is warned of, by name, stage, departure and multiple of σ, when
// no band marks it: the highest gauging (the top of the fit rests on it)
// and poor gaugings (their band is open). A fair gauging as far off is
// starred in the table instead, and not warned of. Invented gaugings
// about Q = 4·h^1.7 (offset held at 0), one gauging high at 2.5 m and a
// poor one 60 % high at the top, 9 m. The expected values are the
// closed-form weighted least-squares line of ln Q on ln h (weights 1/σ²;
// Draper and Smith, 1998, from memory), computed by a short independent
// script.
func TestFarGaugingWarnings(t *testing.T) {
	type point struct {
		h, factor float64
		q         rating.Quality
	}
	base := []point{
		{1.0, 1.01, rating.Good}, {1.5, 0.99, rating.Good}, {2.0, 1.00, rating.Good}, {2.5, 1.20, rating.Fair},
		{3.0, 1.01, rating.Good}, {4.0, 0.99, rating.Good}, {5.0, 1.00, rating.Good}, {6.0, 1.01, rating.Good},
		{9.0, 1.60, rating.Poor},
	}
	poorMiddle := append([]point(nil), base...)
	poorMiddle[3] = point{2.5, 1.35, rating.Poor}
	for _, c := range []struct {
		name   string
		pts    []point
		lnA, C float64
		want   [][]string
	}{
		// ln A = 1.37583, C = 1.73130; +0.16411 (+17.83 %, 4.02 σ) at
		// 2.5 m (fair: starred, not warned), +0.41170 (+50.94 %, 6.72 σ)
		// at 9 m, every other gauging within 1.7 σ.
		{"fair far off", base, 1.37583, 1.73130, [][]string{
			{"row 10 at gauge height 9 m departs +50.9 % from the fitted rating (+0.412 in ln Q), 6.7 times its standard uncertainty", "U = 12 %", "it is the highest gauging"},
		}},
		// ln A = 1.37317, C = 1.73187; +0.28402 (+32.846 %, 4.639 σ) at
		// 2.5 m, +0.41309 (+51.149 %, 6.747 σ) at 9 m, every other gauging
		// within 1.7 σ.
		{"poor far off", poorMiddle, 1.37317, 1.73187, [][]string{
			{"row 5 at gauge height 2.5 m departs +32.8 % from the fitted rating (+0.284 in ln Q), 4.6 times its standard uncertainty", "U = 12 %", "band is open"},
			{"row 10 at gauge height 9 m departs +51.1 % from the fitted rating (+0.413 in ln Q), 6.7 times its standard uncertainty", "U = 12 %", "it is the highest gauging"},
		}},
	} {
		t.Run(c.name, func(t *testing.T) {
			var gs []gauged.Gauging
			for i, p := range c.pts {
				gs = append(gs, gauged.Gauging{Source: fmt.Sprintf("row %d", i+2), Stage: p.h, Discharge: 4 * math.Pow(p.h, 1.7) * p.factor, Quality: p.q})
			}
			f, err := gauged.FitControls(gs, gauged.ControlOptions{OffsetFixed: true, Offset: 0, OffsetSource: "given"})
			if err != nil {
				t.Fatal(err)
			}
			if k := f.Rating.Controls[0]; math.Abs(math.Log(k.A)-c.lnA) > 1e-4 || math.Abs(k.C-c.C) > 1e-4 {
				t.Fatalf("fit ln A %.6g, C %.6g, want %g, %g", math.Log(k.A), k.C, c.lnA, c.C)
			}
			var far []string
			for _, w := range f.Warnings {
				if strings.Contains(w, "standard uncertainty") {
					far = append(far, w)
				}
			}
			if len(far) != len(c.want) {
				t.Fatalf("warnings of far gaugings %q, want %d", far, len(c.want))
			}
			// The highest gauging is warned of first.
			slices.Reverse(far)
			for i, parts := range c.want {
				for _, p := range parts {
					if !strings.Contains(far[i], p) {
						t.Errorf("warning %q lacks %q", far[i], p)
					}
				}
			}
		})
	}
}
