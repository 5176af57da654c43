package plotting

import (
	"io"
	"math"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// TestCompareRatingsMarkersInside: every rating point of a comparison,
// one discharge alone or the ends of a ladder, is drawn whole, its marker
// (a ring of 4 points' radius, the largest drawn) inside the data area, at
// the default size and at a small one. The data area and the positions are
// gonum's own (Plot.DataCanvas, Plot.Transforms) in the canvas the figure
// is drawn in.
func TestCompareRatingsMarkersInside(t *testing.T) {
	const radius = 4 // points: the ring of a marked read
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
			rc := RatingComparison{Section: "XS-1", Curves: []Curve{{Label: "rating", Points: tc.pts}}, Marked: tc.pts, Size: tc.size}
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
