package gauged_test

import (
	"math"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/subdivide"
)

// A fit on a section with a pocket behind a levee whose crest the table
// passes: the report warns once, at the crest's gauge height, with the
// discharges on either side that Manning's equation gives by hand for
// the section without and with the pocket (Chow, 1959, Open-Channel
// Hydraulics, eq. 5-7; areas and wetted perimeters of the straight
// ground under the crest's level, Table 2-1). The least-squares table's
// conveyance-slope extension, Q ∝ K above the gaugings, steps by the
// ratio of those discharges (Kennedy, 1984, TWRI 3-A10); a Bayesian
// fit's prior, fitted to the rating across the crest, is said to smooth
// it.
func TestFitPocketJoins(t *testing.T) {
	const n, slope = 0.035, 0.001
	p, err := subdivide.Compile(subdivide.Section{
		Points: []subdivide.Point{{Station: 0, Elevation: 5}, {Station: 10, Elevation: 0}, {Station: 20, Elevation: 3.6},
			{Station: 25, Elevation: 1}, {Station: 30, Elevation: 1}, {Station: 35, Elevation: 5}},
		N: []float64{n, n, n, n, n},
	})
	if err != nil {
		t.Fatal(err)
	}
	c := rating.HydraulicCurve{Geometry: p, Options: rating.Options{Slope: slope}}
	manning := func(a, per float64) float64 { return a * math.Pow(a/per, 2.0/3) * math.Sqrt(slope) / n }
	chA, chP := 7.2*3.6/2+10*3.6/2, math.Hypot(7.2, 3.6)+math.Hypot(10, 3.6)
	poA, poP := 5*2.6/2+5*2.6+3.25*2.6/2, math.Hypot(5, 2.6)+5+math.Hypot(3.25, 2.6)
	before, after := manning(chA, chP), manning(chA+poA, chP+poP)
	gs := gaugeTruth(t, c, linspace(0.5, 3, 12), nil)

	joinWarnings := func(rep *gauged.Report) []string {
		var out []string
		for _, w := range rep.Warnings {
			if strings.Contains(w, "joins the flow") {
				out = append(out, w)
			}
		}
		return out
	}
	for _, tc := range []struct {
		name string
		opt  gauged.Options
		want func(rep *gauged.Report) string
	}{
		{"least squares", gauged.Options{Hydraulic: &c, Table: gauged.ControlTableOptions{Step: 0.1}}, func(rep *gauged.Report) string {
			for _, r := range rep.Table.Rows {
				if math.Abs(r.Stage-3.6) < 1e-9 {
					return "follows the step, from " + rating.PlainFigures(r.Discharge, 4) + " to " + rating.PlainFigures(r.Discharge*after/before, 4) + " m3/s"
				}
			}
			t.Fatal("no row at 3.6")
			return ""
		}},
		{"Bayesian", gauged.Options{Hydraulic: &c, Method: gauged.Bayesian, Table: gauged.ControlTableOptions{Step: 0.1},
			Controls: gauged.ControlOptions{Controls: []gauged.ControlSpec{{Kind: gauged.ChannelControl}}},
			Bayes:    gauged.BayesOptions{Chains: 2, Draws: 500, Seed: 1}}, func(*gauged.Report) string {
			return "the Bayesian prior of control 1, a power law fitted to the whole of this rating from"
		}},
		{"comparison only", gauged.Options{Hydraulic: &c, CompareOnly: true}, func(*gauged.Report) string { return "(+" }},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rep, err := gauged.Analyze(gs, tc.opt)
			if err != nil {
				t.Fatal(err)
			}
			ws := joinWarnings(rep)
			if len(ws) != 1 {
				t.Fatalf("join warnings %q, want one", ws)
			}
			head := "at gauge height 3.6 m (elevation 3.6 m) the water standing behind the crest at station 20 m (stations 20 to 35 m) joins the flow"
			steps := "steps up from " + rating.PlainFigures(before, 4) + " m3/s at the crest to " + rating.PlainFigures(after, 4) + " m3/s just above it"
			for _, part := range []string{head, steps, tc.want(rep)} {
				if !strings.Contains(ws[0], part) {
					t.Errorf("warning %q lacks %q", ws[0], part)
				}
			}
		})
	}
}

// A fit follows a table's rule for joins: on a floodplain with survey
// scatter (crests and hollows of a centimetre or two, and a back-swamp
// beyond) the report words one by one only the rating.JoinsWarnedEach
// joins of the largest steps among those of rating.JoinStepWarned or
// more, rolls the rest of those up in one line, and leaves the joins of
// smaller steps (here at 102.03 and 102.06 m) unwarned.
func TestFitJoinsScatter(t *testing.T) {
	const n, slope = 0.035, 0.001
	pts := subdivide.XZ(0, 104, 10, 100, 20, 102, 21, 101.99, 22, 102.02, 23, 102.01, 24, 102.03,
		24.2, 102.025, 24.4, 102.04, 25.4, 102.03, 26.4, 102.06, 26.6, 102.055, 26.8, 102.07, 28, 102.06,
		29, 102.09, 30, 102.08, 31, 102.11, 32, 101.5, 36, 101.5, 37, 102.2, 40, 105)
	ns := make([]float64, len(pts)-1)
	for i := range ns {
		ns[i] = n
	}
	p, err := subdivide.Compile(subdivide.Section{Points: pts, N: ns})
	if err != nil {
		t.Fatal(err)
	}
	c := rating.HydraulicCurve{Geometry: p, Options: rating.Options{Slope: slope}}
	joins, err := rating.PocketJoins(p, c.Options)
	if err != nil {
		t.Fatal(err)
	}
	var small []float64
	for _, j := range joins {
		if !j.Warned() {
			small = append(small, j.Stage)
		}
	}
	if len(joins) != 8 || len(small) != 2 {
		t.Fatalf("%d joins, %d of them small: want 8 and 2", len(joins), len(small))
	}
	gs := gaugeTruth(t, c, linspace(100.5, 101.9, 12), nil)
	rep, err := gauged.Analyze(gs, gauged.Options{Hydraulic: &c, Table: gauged.ControlTableOptions{Step: 0.01}})
	if err != nil {
		t.Fatal(err)
	}
	var ws []string
	for _, w := range rep.Warnings {
		if strings.Contains(w, "joins the flow") {
			ws = append(ws, w)
		}
	}
	if len(ws) != rating.JoinsWarnedEach+1 {
		t.Fatalf("join warnings %q, want %d one by one and one rolled up", ws, rating.JoinsWarnedEach)
	}
	roll := ws[len(ws)-1]
	if !strings.HasPrefix(roll, "at 3 more stages, from gauge height 102.04 m") || !strings.Contains(roll, "the section's hydraulic discharge steps by 2 % or more (3 falls)") {
		t.Errorf("roll-up %q", roll)
	}
	for _, z := range small {
		for _, w := range ws {
			if strings.Contains(w, "gauge height "+rating.PlainFigures(z, 7)+" m") {
				t.Errorf("the small join at %v is warned: %q", z, w)
			}
		}
	}
}
