package survey

import (
	"errors"
	"math"
	"strings"
	"testing"

	"wetline/rating"
)

func TestRatingFromTableErrors(t *testing.T) {
	for _, tc := range []struct {
		name, csv, want string
		is              error
	}{
		{"no discharge column", "stage,area\n1,2\n", `needs a column named "discharge"`, ErrMissingColumn},
		{"blank stage", "stage,discharge\n1,2\n,3\n", "t.csv:3:1: stage", ErrNotNumber},
		{"bad discharge", "stage,discharge\n1,x\n", `t.csv:2:2: discharge "x"`, ErrNotNumber},
		{"bad optional", "stage,discharge,alpha\n1,2,1;2\n", `t.csv:2:3: alpha`, ErrNotNumber},
		{"empty", "stage,discharge\n", "no data rows", ErrEmpty},
	} {
		_, err := ParseRatingCSV(strings.NewReader(tc.csv), "t.csv", UnitChoice{})
		if err == nil || !strings.Contains(err.Error(), tc.want) || !errors.Is(err, tc.is) {
			t.Errorf("%s: error %v, want %q (%v)", tc.name, err, tc.want, tc.is)
		}
	}
}

func FuzzParseRatingCSV(f *testing.F) {
	for _, s := range []string{
		"stage,discharge\n1,2\n",
		"stage,depth,area,discharge,alpha\n10,0,0,0,\n10.5,0.5,2,1.2,1.0\n",
		"stage,discharge\n1,nan\n",
		"\ufeffstage;discharge\n1;2\n",
		"# c\nStage (m),Discharge (m3/s)\n1,2,3\n",
	} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		tab, err := ParseRatingCSV(strings.NewReader(s), "f.csv", UnitChoice{})
		if err != nil {
			return
		}
		for _, r := range tab.Rows {
			if math.IsNaN(r.Stage) || math.IsInf(r.Stage, 0) || math.IsNaN(r.Discharge) {
				t.Fatalf("row with an undefined stage or discharge: %+v", r)
			}
		}
	})
}

// Units written in a rating table's headers decide its unit system, and
// contradict --units with an error naming the column.
func TestRatingTableUnits(t *testing.T) {
	const us = "stage (ft),discharge (cfs)\n1,2\n"
	tab, err := ParseRatingCSV(strings.NewReader(us), "t.csv", UnitChoice{})
	if err != nil || tab.Units != rating.US {
		t.Fatalf("headers in feet: units %v, %v", tab.Units, err)
	}
	_, err = ParseRatingCSV(strings.NewReader(us), "t.csv", UnitChoice{Units: rating.SI, Given: true})
	if !errors.Is(err, ErrUnitsDisagree) || !strings.Contains(err.Error(), "t.csv:1:1: stage (ft)") {
		t.Errorf("feet table with si asked for: %v", err)
	}
}
