package survey_test

import (
	"fmt"
	"strings"

	"wetline/survey"
)

func ExampleParseGaugings() {
	const in = `time,gauge_height,discharge,quality,note
2024-03-05T14:30,1.25,3.4,good,wading
2024-04-01,1.80,7.9,fair,
`
	gs, err := survey.ParseGaugings(strings.NewReader(in), "gaugings.csv")
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, g := range gs.Gaugings {
		fmt.Println(g.Source, g.Time.Format("2006-01-02 15:04"), g.Stage, g.Discharge, g.Quality, g.Quality.BandPercent())
	}
	_, err = survey.ParseGaugings(strings.NewReader("time,stage,discharge\n2024-03-05,1.2,-3\n"), "bad.csv")
	fmt.Println(err)
	// Output:
	// gaugings.csv:2 2024-03-05 14:30 1.25 3.4 good 5
	// gaugings.csv:3 2024-04-01 00:00 1.8 7.9 fair 8
	// bad.csv:2:3: discharge "-3": discharge must not be negative
}
