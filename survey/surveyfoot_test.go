package survey

import (
	"errors"
	"math"
	"strings"
	"testing"

	"wetline/rating"
)

// The US survey foot is 1200/3937 m exactly (the Mendenhall order of
// 1893), the international foot 0.3048 m exactly (the international yard
// and pound of 1959): the survey foot is 2 parts per million longer (from
// memory; the ratio is 1 + 2/999998 by hand, since 3937 × 0.3048 =
// 1199.9976). The note says so.
func TestSurveyFootLength(t *testing.T) {
	ratio := SurveyFootMetres / InternationalFootMetres
	if want := 1 + 2.0/999998; math.Abs(ratio-want) > 1e-15 {
		t.Errorf("ratio %.17g, want %.17g", ratio, want)
	}
	if ppm := (ratio - 1) * 1e6; math.Round(ppm) != SurveyFootPPM {
		t.Errorf("the survey foot is %.6f ppm longer, the note says %d", ppm, SurveyFootPPM)
	}
}

// A survey's headers naming the US survey foot as GNSS and survey exports
// write it (US ft, ftUS, US survey ft, usft; common practice of data
// collectors) are read as feet, with an input note at the first such
// column saying the survey foot differs from the international foot by 2
// parts per million (README, Units). Plain ft has no note; a survey foot
// beside metres is two systems; N in survey feet is still not n; another
// table's headers refuse it, with advice.
func TestSurveyFootHeaders(t *testing.T) {
	const rows = "0,108.2,0.05,lb\n12,100.1,,\n25,108,,rb\n"
	for _, tc := range []struct {
		name, header, at string // at: the note's position, "" for none
	}{
		{"US ft", "Station (US ft),Elevation (US ft),n,code", "s.csv:1:1"},
		{"ftUS", "station (ftUS),elevation (ftUS),n,code", "s.csv:1:1"},
		{"US survey ft in brackets", "station,elevation [US survey ft],n,code", "s.csv:1:2"},
		{"usft after ft", "station (ft),elev (usft),n,code", "s.csv:1:2"},
		{"US Survey Feet", "station (US Survey Feet),elevation (US Survey Feet),n,code", "s.csv:1:1"},
		{"plain feet", "station (ft),elevation (ft),n,code", ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			sv, err := ParseSection(strings.NewReader(tc.header+"\n"+rows), "s.csv", SectionOptions{})
			if err != nil {
				t.Fatal(err)
			}
			if !sv.Units.Found || sv.Units.Units != rating.US {
				t.Errorf("units %+v, want us", sv.Units)
			}
			notes := sv.InputNotes()
			if tc.at == "" {
				if len(notes) != 0 {
					t.Errorf("notes %q, want none", notes)
				}
				return
			}
			if len(notes) != 1 || !strings.HasPrefix(notes[0], tc.at+": the header names US survey feet") ||
				!strings.Contains(notes[0], "2 parts per million") || !strings.Contains(notes[0], "read as feet (ft)") {
				t.Errorf("notes %q, want one at %s of US survey feet", notes, tc.at)
			}
		})
	}
	coords := "easting (US ft),northing (US ft),elevation (US ft),n,mark\n0,0,108,0.05,left pin\n10,0,100,,\n20,0,108,,right pin\n"
	sv, err := ParseSection(strings.NewReader(coords), "c.csv", SectionOptions{})
	if err != nil || sv.Units.Units != rating.US || len(sv.InputNotes()) != 2 || !strings.Contains(sv.InputNotes()[1], "c.csv:1:1: the header names US survey feet") {
		t.Errorf("coordinate survey: %v, %q", err, sv.InputNotes())
	}
	for _, tc := range []struct {
		name, text, at string
		is             error
	}{
		{"survey foot beside metres", "station (m),elevation (US ft)\n0,1\n1,0\n2,1\n", "s.csv:1:2", ErrMixedUnits},
		{"n in survey feet", "E (US ft),N (US ft),elevation (US ft)\n0,0,1\n1,0,0\n2,0,1\n", "s.csv:1:2", ErrNWithLength},
	} {
		if _, err := ParseSection(strings.NewReader(tc.text), "s.csv", SectionOptions{}); !errors.Is(err, tc.is) || !strings.Contains(err.Error(), tc.at) {
			t.Errorf("%s: %v, want %v at %s", tc.name, err, tc.is, tc.at)
		}
	}
	_, err = ParseRatingTables(strings.NewReader("stage (US ft),discharge (cfs)\n0.5,1\n1,3\n"), "r.csv", RatingTableOptions{})
	if !errors.Is(err, ErrUnknownUnit) || !strings.Contains(err.Error(), "r.csv:1:1") || !strings.Contains(err.Error(), "read in a survey's headers") {
		t.Errorf("rating table in survey feet: %v, want ErrUnknownUnit with advice", err)
	}
}
