package survey_test

import (
	"fmt"
	"strings"
	"time"

	"wetline/survey"
)

// A stage record streamed from CSV: times written without an offset (at
// the offset given), a missing reading, a quality word; then a record whose
// times go back, and one that mixes times with and without an offset.
func ExampleParseStageRecord() {
	const in = `time,stage (m),quality
2024-05-01T10:00,0.512,
2024-05-01T10:15,,
2024-05-01T10:30,0.518,ice
`
	r, err := survey.ParseStageRecord(strings.NewReader(in), "tallow-stage.csv", survey.StageRecordOptions{UTCOffset: 10 * time.Hour})
	if err != nil {
		fmt.Println(err)
		return
	}
	st := r.Stages
	for i := range st.Len() {
		fmt.Printf("%s %.3f %q\n", time.Unix(st.Time[i], 0).UTC().Format(time.RFC3339), st.Stage[i], st.QualityOf(i))
	}
	fmt.Println(r.Warnings[0])
	_, err = survey.ParseStageRecord(strings.NewReader("time,stage\n2024-05-01T00:30,1\n2024-05-01T00:15,1\n"), "bad.csv", survey.StageRecordOptions{})
	fmt.Println(err)
	_, err = survey.ParseStageRecord(strings.NewReader("time,stage\n2024-05-01T10:00,1\n2024-05-01T10:15+10:00,1\n"), "mixed.csv", survey.StageRecordOptions{UTCOffset: 10 * time.Hour})
	fmt.Println(err)
	// Output:
	// 2024-05-01T00:00:00Z 0.512 ""
	// 2024-05-01T00:30:00Z 0.518 "ice"
	// tallow-stage.csv: 1 row with a time but no stage, read as missing readings (flagged missing in the unit values)
	// bad.csv:3:1: time "2024-05-01T00:15": times must increase from row to row: 2024-05-01T00:15:00Z is before 2024-05-01T00:30:00Z, the time of row 2
	// mixed.csv:3:1: time "2024-05-01T10:15+10:00": times with and without a UTC offset in one file: row 3 has one, row 2 has none
}

// Shift diagrams: a stage-dependent diagram tapering to zero, then a
// constant shift that starts abruptly after a flood.
func ExampleParseShiftDiagrams() {
	const in = `time,stage,shift,taper,abrupt
2024-03-01T10:00,0.5,-0.10,1.5,
2024-03-01T10:00,1.0,-0.06,,
2024-04-11T06:00,,0.02,,yes
`
	ds, err := survey.ParseShiftDiagrams(strings.NewReader(in), "shifts.csv", survey.ShiftTableOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, d := range ds.Diagrams {
		fmt.Printf("%s (%s) abrupt %v: shift at 0.75 m %+.3f, at 1.25 m %+.3f\n", d.Time.Format(time.RFC3339), d.Source, d.Abrupt, d.At(0.75), d.At(1.25))
	}
	_, err = survey.ParseShiftDiagrams(strings.NewReader("time,stage,shift\n2024-03-01,0.5,0.30\n2024-03-01,0.7,0.05\n"), "bad.csv", survey.ShiftTableOptions{})
	fmt.Println(err)
	// Output:
	// 2024-03-01T10:00:00Z (shifts.csv:2) abrupt false: shift at 0.75 m -0.080, at 1.25 m -0.030
	// 2024-04-11T06:00:00Z (shifts.csv:4) abrupt true: shift at 0.75 m +0.020, at 1.25 m +0.020
	// bad.csv:3:3: shift "0.05": shift diagram refused: its slope ds/dh is −1 or steeper, so discharge would fall as the stage rises (slope -1.25 between stages 0.5 and 0.7)
}

// Two ratings in one table, each from the time it comes into force, with
// the gauge height of zero flow given as an option.
func ExampleParseRatingTables() {
	const in = `valid_from,stage,discharge
2023-01-01,0.7,2
,1.2,8
2024-06-01,0.7,2.4
,1.2,8.8
`
	rs, err := survey.ParseRatingTables(strings.NewReader(in), "ratings.csv", survey.RatingTableOptions{HasZeroFlow: true, ZeroFlow: 0.2})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, p := range rs.Periods {
		r, err := p.Rating.Compile()
		if err != nil {
			fmt.Println(err)
			return
		}
		q, how := r.Discharge(0.95)
		fmt.Printf("%s: Q(0.95 m) = %.3f m3/s (%s)\n", r.Name(), q, how)
	}
	// Output:
	// ratings.csv from 2023-01-01T00:00:00Z: Q(0.95 m) = 4.500 m3/s (in table)
	// ratings.csv from 2024-06-01T00:00:00Z: Q(0.95 m) = 5.132 m3/s (in table)
}
