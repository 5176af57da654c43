package survey

import (
	"errors"
	"math"
	"strings"
	"testing"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
)

func TestParseShiftDiagrams(t *testing.T) {
	const in = "time,stage (m),shift (m),taper (m),abrupt,note\n" +
		"2024-03-01T10:00,1.0,-0.06,1.5,,weed\n" +
		"2024-03-01T10:00,0.5,-0.10,,,\n" +
		"2024-04-11,,0.02,,yes,flood\n"
	ds, err := ParseShiftDiagrams(strings.NewReader(in), "s.csv", ShiftTableOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(ds.Diagrams) != 2 {
		t.Fatalf("%d diagrams", len(ds.Diagrams))
	}
	a, b := ds.Diagrams[0], ds.Diagrams[1]
	if !a.Time.Equal(time.Date(2024, 3, 1, 10, 0, 0, 0, time.UTC)) || a.Points[0].Stage != 0.5 || !a.HasTaper || a.Taper != 1.5 || a.Abrupt || a.Source != "s.csv:2" {
		t.Errorf("first diagram %+v", a)
	}
	if !b.Abrupt || !math.IsNaN(b.Points[0].Stage) || b.At(7) != 0.02 {
		t.Errorf("second diagram %+v", b)
	}
}

// Bad shift tables: every error names file:row:column; a diagram falling
// faster than the stage rises is refused at the row that makes it so.
func TestParseShiftDiagramsErrors(t *testing.T) {
	const head = "time,stage,shift,taper,abrupt\n"
	for _, tc := range []struct {
		name, in string
		want     []string
		is       error
	}{
		{"refused slope", head + "2024-03-01,0.5,0.30,,\n2024-03-01,0.7,0.05,,\n", []string{"s.csv:3:3", "slope"}, gauged.ErrShiftSlope},
		{"refused taper", head + "2024-03-01,1.0,0.5,1.25,\n", []string{"s.csv:2:4"}, gauged.ErrShiftSlope},
		{"taper inside", head + "2024-03-01,1.0,0.1,1.5,\n2024-03-01,2.0,0.1,,\n", []string{"s.csv:2:4"}, gauged.ErrTaperInside},
		{"time order", head + "2024-03-05,1,0.1,,\n2024-03-01,1,0.1,,\n", []string{"s.csv:3:1"}, gauged.ErrShiftTime},
		{"same stage", head + "2024-03-01,1,0.1,,\n2024-03-01,1,0.2,,\n", []string{"s.csv:3:2"}, gauged.ErrShiftStages},
		{"blank stage among several", head + "2024-03-01,,0.1,,\n2024-03-01,1,0.2,,\n", []string{"s.csv:2:2"}, gauged.ErrShiftNoStage},
		{"abrupt word", head + "2024-03-01,1,0.1,,maybe\n", []string{"s.csv:2:5", `abrupt "maybe"`}, ErrAbruptWord},
		{"blank shift", head + "2024-03-01,1,,,\n", []string{"s.csv:2:3", "blank"}, ErrNotNumber},
		{"bad time", head + "March 1,1,0.1,,\n", []string{"s.csv:2:1"}, ErrISOTime},
		{"no shift column", "time,stage\n2024-03-01,1\n", []string{"shift"}, ErrMissingColumn},
		{"no rows", head, []string{"no data rows"}, ErrEmpty},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ParseShiftDiagrams(strings.NewReader(tc.in), "s.csv", ShiftTableOptions{})
			if err == nil {
				t.Fatal("no error")
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q does not say %q", err, w)
				}
			}
			if !errors.Is(err, tc.is) {
				t.Errorf("error %q is not %v", err, tc.is)
			}
		})
	}
}

// A proposed diagram written as rows of the shift table reads back as the
// same diagram.
func TestShiftRowsRoundTrip(t *testing.T) {
	d := gauged.ShiftDiagram{Time: time.Date(2024, 6, 3, 10, 0, 0, 0, time.UTC), Points: []gauged.ShiftPoint{{Stage: 0.9, Shift: 0.05}, {Stage: 1.4, Shift: 0.01}}, HasTaper: true, Taper: 2}
	var b strings.Builder
	b.WriteString(strings.Join(ShiftColumns(), ",") + "\n")
	for _, r := range d.Rows() {
		abrupt := "no"
		if r.Abrupt {
			abrupt = "yes"
		}
		b.WriteString(r.Time.Format(time.RFC3339) + "," + formatG(r.Stage) + "," + formatG(r.Shift) + "," + formatG(r.Taper) + "," + abrupt + "\n")
	}
	ds, err := ParseShiftDiagrams(strings.NewReader(b.String()), "p.csv", ShiftTableOptions{})
	if err != nil {
		t.Fatal(err)
	}
	got := ds.Diagrams[0]
	if !got.Time.Equal(d.Time) || len(got.Points) != 2 || got.At(1.7) != d.At(1.7) {
		t.Errorf("read back %+v", got)
	}
}

// Units written in the headers of shift diagrams (stage, shift, taper)
// and of a stage record (stage) are reported, to be resolved by the caller
// against the ratings; units of two systems or an unknown unit are refused
// at the column. Other columns' headers are not read.
func TestShiftAndStageHeaderUnits(t *testing.T) {
	t.Parallel()
	shifts := func(header string) (UnitNote, error) {
		ds, err := ParseShiftDiagrams(strings.NewReader(header+"\n2024-03-01,1.0,0.1,2.0,,x\n"), "s.csv", ShiftTableOptions{})
		return ds.Units, err
	}
	stages := func(header string) (UnitNote, error) {
		sr, err := ParseStageRecord(strings.NewReader(header+"\n2024-03-01T00:00,1.0,x\n2024-03-01T01:00,1.1,x\n"), "s.csv", StageRecordOptions{})
		if err != nil {
			return UnitNote{}, err
		}
		return sr.Units, nil
	}
	for _, tc := range []struct {
		name, header string
		read         func(string) (UnitNote, error)
		found        bool
		units        rating.Units
		at           string // the first column naming a unit, or the refused one
		is           error
	}{
		{"shifts without units", "time,stage,shift,taper,abrupt,note", shifts, false, rating.SI, "", nil},
		{"shifts in feet", "time,stage (ft),shift (ft),taper (ft),abrupt,note", shifts, true, rating.US, "s.csv:1:2", nil},
		{"shift alone in metres", "time,stage,shift (m),taper,abrupt,note", shifts, true, rating.SI, "s.csv:1:3", nil},
		{"taper in another system", "time,stage (m),shift (m),taper (ft),abrupt,note", shifts, false, rating.SI, "s.csv:1:4: taper (ft)", ErrMixedUnits},
		{"shift in an unknown unit", "time,stage,shift (cubits),taper,abrupt,note", shifts, false, rating.SI, "s.csv:1:3: shift (cubits)", ErrUnknownUnit},
		{"note not read", "time,stage,shift,taper,abrupt,note (furlongs)", shifts, false, rating.SI, "", nil},
		{"stages without units", "time,stage,quality", stages, false, rating.SI, "", nil},
		{"stages in feet", "time,gauge height (ft),quality", stages, true, rating.US, "s.csv:1:2", nil},
		{"stages in an unknown unit", "time,stage (yd),quality", stages, false, rating.SI, "s.csv:1:2: stage (yd)", ErrUnknownUnit},
		{"quality not read", "time,stage,quality (m3/s)", stages, false, rating.SI, "", nil},
	} {
		t.Run(tc.name, func(t *testing.T) {
			u, err := tc.read(tc.header)
			if tc.is != nil {
				if !errors.Is(err, tc.is) || !strings.Contains(err.Error(), tc.at) {
					t.Errorf("%v, want %v at %s", err, tc.is, tc.at)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			if u.Found != tc.found || (u.Found && (u.Units != tc.units || u.At.Position() != tc.at)) {
				t.Errorf("units %+v, want found %v, %v at %s", u, tc.found, tc.units, tc.at)
			}
		})
	}
}
