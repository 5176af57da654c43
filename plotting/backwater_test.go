package plotting_test

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"testing"

	"wetline/plotting"
	"wetline/rating"
	"wetline/rating/reach"
	"wetline/subdivide"
)

// bwReport is an invented reach of five trapezoidal sections (bed 5 m,
// sides 2:1, n 0.03) 400 m apart on a bed falling 0.001, held by a pool
// at 51.0 m, with marks at two sections and a verified flood.
func bwReport(t *testing.T, qs []float64) reach.BackwaterReport {
	t.Helper()
	secs := make([]reach.Section, 5)
	for i := range secs {
		sh, err := subdivide.ParseShape(fmt.Sprintf("trapezoid:bottom=5,side=2,invert=%g", 50-0.4*float64(i)))
		if err != nil {
			t.Fatal(err)
		}
		g, err := sh.Build(subdivide.Uniform(0.03))
		if err != nil {
			t.Fatal(err)
		}
		secs[i] = reach.Section{ID: fmt.Sprintf("XS-%d", i+1), Geometry: g, Distance: 400 * float64(i), Left: math.NaN(), Right: math.NaN()}
	}
	secs[0].Left, secs[0].Right = 52.0, 51.95
	secs[2].Right = 51.4
	rep, err := reach.StepBackwater(secs, qs, reach.Boundary{Kind: reach.KnownStage, Stage: 51},
		reach.BackwaterReportOptions{Verify: 20, Backwater: reach.BackwaterOptions{At: "XS-2"}})
	if err != nil {
		t.Fatal(err)
	}
	rep.Name = "reach.csv"
	return rep
}

// Both figures decode at the asked size and carry ink, for a few profiles
// (each labelled) and for many (only the ends labelled).
func TestDrawBackwater(t *testing.T) {
	for _, qs := range [][]float64{{5, 15, 30}, ladderOf(2, 40, 30)} {
		rep := bwReport(t, qs)
		uniform := plotting.Curve{Label: "uniform flow, slope 0.001"}
		for _, q := range qs {
			uniform.Points = append(uniform.Points, plotting.RatingPoint{Stage: 50 + math.Pow(q, 0.4), Discharge: q})
		}
		figs, warnings, err := plotting.DrawBackwater(plotting.BackwaterFigures{Site: "Invented Creek", Base: "bw",
			Report: rep, Compare: []plotting.Curve{uniform}, Size: plotting.Size{Width: 800, Height: 500}})
		if err != nil {
			t.Fatal(err)
		}
		if len(warnings) != 0 {
			t.Errorf("warnings %q", warnings)
		}
		if len(figs) != 2 || figs[0].Name != "bw-profiles.png" || figs[1].Name != "bw-rating.png" {
			t.Fatalf("figures %+v", figs)
		}
		for _, f := range figs {
			checkPNG(t, f.Name, f.PNG, 800, 500)
			keep(t, fmt.Sprintf("%d-%s", len(qs), f.Name), f.PNG)
		}
	}
}

func ladderOf(lo, hi float64, n int) []float64 {
	out := make([]float64, n)
	for i := range out {
		out[i] = lo + (hi-lo)*float64(i)/float64(n-1)
	}
	return out
}

func TestBackwaterFigureErrors(t *testing.T) {
	var buf bytes.Buffer
	if _, err := plotting.BackwaterProfiles(&buf, plotting.BackwaterPlot{Units: rating.SI}); !errors.Is(err, plotting.ErrNoData) {
		t.Errorf("no sections: %v", err)
	}
	if _, err := plotting.CompareRatings(&buf, plotting.RatingComparison{Curves: []plotting.Curve{{Label: "empty"}}}); !errors.Is(err, plotting.ErrNoData) {
		t.Errorf("no curve points: %v", err)
	}
	res, err := plotting.BackwaterProfiles(&buf, plotting.BackwaterPlot{
		Sections: []plotting.ReachSection{{ID: "A", Bed: 1}, {ID: "B", Distance: 10, Bed: 0.9}},
		Profiles: []plotting.ProfileLine{{Discharge: 1, Points: []plotting.ProfilePoint{{Distance: 0, WaterSurface: 2}}},
			{Discharge: 2, Points: []plotting.ProfilePoint{{Distance: 0, WaterSurface: 2.2}, {Distance: 10, WaterSurface: 2.1}}}},
		Size: plotting.Size{Width: 400, Height: 300}})
	if err != nil || len(res.Warnings) != 1 {
		t.Errorf("a one-point profile: %v %q", err, res.Warnings)
	}
}
