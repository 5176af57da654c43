package gauged_test

import (
	"fmt"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
)

// A rating table with its gauge height of zero flow: log-linear between
// rows in (h − e), zero at or below e, nothing above the table.
func ExampleRating_Discharge() {
	r, err := gauged.RatingTable{
		Name:        "rating 3",
		Points:      []gauged.RatingPoint{{Stage: 0.7, Discharge: 2}, {Stage: 1.2, Discharge: 8}},
		HasZeroFlow: true, ZeroFlow: 0.2,
	}.Compile()
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, h := range []float64{0.15, 0.95, 1.5} {
		q, how := r.Discharge(h)
		fmt.Printf("%.2f m: %.3f m3/s (%s)\n", h, q, how)
	}
	// Output:
	// 0.15 m: 0.000 m3/s (zero flow)
	// 0.95 m: 4.500 m3/s (in table)
	// 1.50 m: NaN m3/s (outside the rating)
}

// A shift diagram of a weed-grown riffle: a full shift at low stage
// tapering to zero where the control drowns.
func ExampleShiftDiagram_At() {
	d := gauged.ShiftDiagram{Points: []gauged.ShiftPoint{{Stage: 0.5, Shift: -0.10}, {Stage: 1.0, Shift: -0.06}}, HasTaper: true, Taper: 1.5}
	if err := d.Validate(); err != nil {
		fmt.Println(err)
		return
	}
	for _, h := range []float64{0.3, 0.75, 1.25, 2} {
		fmt.Printf("%.2f m: %+.3f m\n", h, d.At(h))
	}
	// Output:
	// 0.30 m: -0.100 m
	// 0.75 m: -0.080 m
	// 1.25 m: -0.030 m
	// 2.00 m: +0.000 m
}

// Two visits' diagrams on one rating: half-way between them the shift is
// prorated half-way.
func ExampleRater_At() {
	h := gauged.History{
		Periods: []gauged.Period{{Rating: &gauged.RatingTable{Name: "base", Points: []gauged.RatingPoint{{Stage: 0, Discharge: 0}, {Stage: 10, Discharge: 100}}}}},
		Shifts: []gauged.ShiftDiagram{
			{Time: time.Date(2024, 3, 1, 0, 0, 0, 0, time.UTC), Points: []gauged.ShiftPoint{{Stage: 1, Shift: 0.10}}},
			{Time: time.Date(2024, 3, 11, 0, 0, 0, 0, time.UTC), Points: []gauged.ShiftPoint{{Stage: 1, Shift: 0.02}}},
		},
	}
	r, err := h.Compile()
	if err != nil {
		fmt.Println(err)
		return
	}
	v := r.At(time.Date(2024, 3, 6, 0, 0, 0, 0, time.UTC), 1.2)
	fmt.Printf("shift %.3f m, effective %.3f m, Q %.2f m3/s\n", v.Shift, v.Effective, v.Discharge)
	// Output:
	// shift 0.060 m, effective 1.260 m, Q 12.60 m3/s
}

// A gauging set against the rating in force: its departure, its measured
// shift, and the diagram its visit proposes.
func ExampleRater_CheckGaugings() {
	rt := &gauged.RatingTable{Name: "rating 3", Points: []gauged.RatingPoint{{Stage: 0.7, Discharge: 2}, {Stage: 1.2, Discharge: 8}}, HasZeroFlow: true, ZeroFlow: 0.2}
	r, err := gauged.History{Periods: []gauged.Period{{Rating: rt}}}.Compile()
	if err != nil {
		fmt.Println(err)
		return
	}
	gs := []gauged.Gauging{{Time: time.Date(2024, 6, 3, 10, 0, 0, 0, time.UTC), Stage: 0.9, Discharge: 4.5, Quality: rating.Good}}
	c, err := r.CheckGaugings(gs, gauged.CheckOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	g := c.Gaugings[0]
	fmt.Printf("rated %.2f m3/s, departure %+.1f %%, outside its band %v, shift %+.3f m\n", g.Rated, g.Departure, g.Outside, g.Shift)
	for _, row := range c.Visits[0].Proposal.Rows() {
		fmt.Printf("proposed: %s, %.2f, %+.3f\n", row.Time.Format(time.RFC3339), row.Stage, row.Shift)
	}
	// Output:
	// rated 3.92 m3/s, departure +14.8 %, outside its band true, shift +0.050 m
	// proposed: 2024-06-03T10:00:00Z, 0.90, +0.050
}

// A rating revision: the new rating 10 % above the old at every stage.
func ExampleCompareRatings() {
	a, _ := gauged.RatingTable{Name: "rating 3", Points: []gauged.RatingPoint{{Stage: 0, Discharge: 0}, {Stage: 2, Discharge: 20}}}.Compile()
	b, _ := gauged.RatingTable{Name: "rating 4", Points: []gauged.RatingPoint{{Stage: 0.5, Discharge: 5.5}, {Stage: 3, Discharge: 33}}}.Compile()
	c, err := gauged.CompareRatings(a, b, gauged.CompareOptions{Step: 0.5})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, r := range c.Rows {
		fmt.Printf("%.1f m: %5.2f %5.2f %+.1f %%\n", r.Stage, r.A, r.B, r.Percent)
	}
	// Output:
	// 0.5 m:  5.00  5.50 +10.0 %
	// 1.0 m: 10.00 11.00 +10.0 %
	// 1.5 m: 15.00 16.50 +10.0 %
	// 2.0 m: 20.00 22.00 +10.0 %
}
