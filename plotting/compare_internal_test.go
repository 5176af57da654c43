package plotting

import (
	"io"
	"math"
	"slices"
	"strings"
	"testing"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/recorder"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/rating/reach"
)

// TestCompareRatingsMarkersInside: every rating point of a comparison,
// one discharge alone or the ends of a ladder, is drawn whole, its marker
// (a cross of 4.5 points' radius at critical depth, the largest drawn)
// inside the data area, at
// the default size and at a small one. The data area and the positions are
// gonum's own (Plot.DataCanvas, Plot.Transforms) in the canvas the figure
// is drawn in.
func TestCompareRatingsMarkersInside(t *testing.T) {
	const radius = 4.5 // points: the cross of a read at critical depth
	one := []RatingPoint{{Stage: 102.281, Discharge: 38}}
	var ladder []RatingPoint
	for q := 2.0; q <= 60; q += 2 {
		ladder = append(ladder, RatingPoint{Stage: 100 + 0.02*q, Discharge: q}) // an invented rating
	}
	for _, tc := range []struct {
		name string
		pts  []RatingPoint
		size Size
	}{
		{"one discharge", one, Size{}},
		{"one discharge, small", one, Size{Width: 400, Height: 300, DPI: 72}},
		{"ladder", ladder, Size{}},
		{"ladder, small", ladder, Size{Width: 400, Height: 300, DPI: 72}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rc := RatingComparison{Section: "XS-1", Curves: []Curve{{Label: "rating", Points: tc.pts}}, Marked: tc.pts, Critical: tc.pts, Size: tc.size}
			p, fig, _, err := comparePanel(rc)
			if err != nil {
				t.Fatal(err)
			}
			err = render(io.Discard, tc.size, fig, func(c draw.Canvas) error {
				p.Draw(c)
				dc := p.DataCanvas(c)
				trX, trY := p.Transforms(&dc)
				r := vg.Points(radius)
				for _, q := range tc.pts {
					x, y := trX(q.Discharge), trY(q.Stage)
					if x-r < dc.Min.X || x+r > dc.Max.X || y-r < dc.Min.Y || y+r > dc.Max.Y {
						t.Errorf("the marker of %g at %g (%.1f, %.1f ± %.1f) leaves the data area %v to %v", q.Discharge, q.Stage, x, y, r, dc.Min, dc.Max)
					}
				}
				return nil
			})
			if err != nil {
				t.Fatal(err)
			}
		})
	}
}

// TestBackwaterRatingMarksCritical: the rating figure of a step-backwater
// report crosses the reads at critical depth, as the profile figure marks
// them, with a legend entry; reads not at critical depth are not crossed.
// The legend's text is read from gonum's recording canvas.
func TestBackwaterRatingMarksCritical(t *testing.T) {
	rows := []reach.RatingRead{ // an invented steep reach, critical at its two ends
		{Discharge: 5, Stage: 65.096, Critical: true},
		{Discharge: 20, Stage: 65.661, Unsettled: true},
		{Discharge: 100, Stage: 67.268, Critical: true},
	}
	rep := reach.BackwaterReport{Result: reach.Backwater{Units: rating.SI,
		Rating: reach.BackwaterRating{Section: "X1", Tolerance: 0.01, Rows: rows}}}
	rc := backwaterComparison(BackwaterFigures{Report: rep})
	want := []RatingPoint{{Stage: 65.096, Discharge: 5}, {Stage: 67.268, Discharge: 100}}
	if !slices.Equal(rc.Critical, want) {
		t.Errorf("critical points %v, want %v", rc.Critical, want)
	}
	p, _, _, err := comparePanel(rc)
	if err != nil {
		t.Fatal(err)
	}
	var rec recorder.Canvas
	p.Draw(draw.NewCanvas(&rec, 6*vg.Inch, 4*vg.Inch))
	found := false
	for _, a := range rec.Actions {
		if s, ok := a.(*recorder.FillString); ok && s.String == criticalLabel {
			found = true
		}
	}
	if !found {
		t.Errorf("no legend entry %q in the rating figure", criticalLabel)
	}
}

// TestRatingComparisonSubtitleSign: the subtitle gives the largest percent
// difference with its sign, as the report does: B below A near zero flow
// is a negative difference. An invented comparison whose rows give
// 100·(0.3 − 2.532)/2.532 = −88.15 % at 1.5 ft and +4 % at 10 ft.
func TestRatingComparisonSubtitleSign(t *testing.T) {
	for _, tc := range []struct {
		name string
		rows []gauged.RatingDifference
		want string
	}{
		{"B below A", []gauged.RatingDifference{{Stage: 1.5, A: 2.532, B: 0.3, Percent: -88.15}, {Stage: 10, A: 100, B: 104, Percent: 4}},
			"largest difference 100·(B − A)/A -88.15 % at 1.50 ft"},
		{"B above A", []gauged.RatingDifference{{Stage: 1.5, A: 2, B: 2.2, Percent: 10}, {Stage: 10, A: 100, B: 104, Percent: 4}},
			"largest difference 100·(B − A)/A +10.00 % at 1.50 ft"},
	} {
		c := &gauged.RatingComparison{Units: rating.US, From: 1.5, To: 10, Rows: tc.rows, MaxPercent: math.Abs(tc.rows[0].Percent), MaxStage: 1.5}
		if got := ratingComparisonSubtitle(c, names(rating.US)); !strings.Contains(got, tc.want) {
			t.Errorf("%s: subtitle %q, want %q in it", tc.name, got, tc.want)
		}
	}
}
