package plotting_test

import (
	"fmt"
	"io"

	"wetline/plotting"
	"wetline/rating"
)

// A rating figure from a few invented points: the gauging below the gauge
// height of zero flow stays on the linear panel and is left out of the
// log–log panel, with a warning.
func ExampleRating() {
	curve := plotting.Curve{Points: []plotting.RatingPoint{
		{Stage: 1.0, Discharge: 0}, {Stage: 1.5, Discharge: 2.1}, {Stage: 2.0, Discharge: 6.3},
		{Stage: 3.0, Discharge: 21}, {Stage: 4.0, Discharge: 45, Extrapolated: true},
	}}
	res, err := plotting.Rating(io.Discard, plotting.RatingPlot{
		Site: "Example Brook", Section: "XS-1", Hydraulic: curve,
		Gaugings: []plotting.Gauging{{Stage: 0.9, Discharge: 0.1, Quality: rating.Poor}, {Stage: 2.2, Discharge: 8, Quality: rating.Good}},
		Size:     plotting.Size{Width: 800, Height: 500, DPI: 100},
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(res.Omitted, "left out of the log-log panel")
	for _, w := range res.Warnings {
		fmt.Println(w)
	}
	// Output:
	// 2 left out of the log-log panel
	// log–log panel: 1 gauging at or below the gauge height of zero flow (1.00 m) or without positive discharge left out
}
