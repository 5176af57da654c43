package record_test

import (
	"fmt"
	"time"

	"wetline/rating/gauged"
	"wetline/rating/record"
)

// A day of stages turned into unit and daily discharges on a rating with a
// zero-flow stage, with a gap that is not bridged.
func ExampleCompute() {
	rt := &gauged.RatingTable{Name: "rating 1", HasZeroFlow: true, ZeroFlow: 0.2,
		Points: []gauged.RatingPoint{{Stage: 0.4, Discharge: 0.6}, {Stage: 0.9, Discharge: 5.2}, {Stage: 1.6, Discharge: 17.5}}}
	r, err := gauged.History{Periods: []gauged.Period{{Rating: rt}}}.Compile()
	if err != nil {
		fmt.Println(err)
		return
	}
	day := time.Date(2024, 5, 1, 0, 0, 0, 0, time.UTC).Unix()
	st := &record.Stages{Name: "tallow-stage.csv"}
	for i, h := range []float64{0.52, 0.55, 0.61, 0.84, 1.12, 0.97, 0.80, 0.71} {
		hour := int64(3 * i)
		if i >= 5 {
			hour += 2 // a logger outage from 12:00 to 17:00
		}
		st.Time = append(st.Time, day+hour*3600)
		st.Stage = append(st.Stage, h)
	}
	res, err := record.Compute(st, r, record.Options{MaxGap: 4 * time.Hour})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, u := range res.Units[3:6] {
		fmt.Printf("%s %.2f m %6.3f m3/s %v\n", time.Unix(u.Time, 0).In(res.Zone).Format("15:04"), u.Stage, u.Discharge, u.Flags.Words())
	}
	d := res.Daily[0]
	fmt.Printf("%s mean %.3f m3/s, max %.3f at %s, coverage %.3f, %v\n", d.Date.Format(time.DateOnly), d.Mean, d.Max, d.MaxTime.Format("15:04"), d.Coverage, d.Flags.Words())
	// Output:
	// 09:00 0.84 m  4.456 m3/s []
	// 12:00 1.12 m  8.391 m3/s []
	// 17:00 0.97 m  6.144 m3/s [gap]
	// 2024-05-01 mean 3.589 m3/s, max 8.391 at 12:00, coverage 0.750, [gap partial]
}
