package survey

import (
	"errors"
	"strings"
	"testing"

	"wetline/subdivide"
)

// A point out of order names both rows: the one whose station falls and
// the one before it, either of which may be misplaced.
func TestOutOfOrderNamesBothRows(t *testing.T) {
	for _, tc := range []struct {
		name, in, want string
		is             error
	}{
		{"stations", "station,elevation\n0,3\n12,0\n9,0\n15,3\n", `xs.csv:4:1: station "9": station decreases (an overhang): stations must not decrease left to right (station 9 after 12 at row 3: one of the two is out of place)`, subdivide.ErrOverhang},
		{"coordinates", "easting,northing,elevation,mark\n0,0,3,left pin\n3,0,1.5,\n12,0,0,\n9,0,0,\n6,0,0,\n15,0,1.5,\n18,0,3,right pin\n", `xs.csv:5:1: easting "9": the point folds back along the section line: stations must run one way (station 9.000 after 12.000 at row 4: one of the two is out of place)`, ErrFoldBack},
	} {
		_, err := ParseSection(strings.NewReader(tc.in), "xs.csv", SectionOptions{})
		if !errors.Is(err, tc.is) || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: %v, want %q", tc.name, err, tc.want)
		}
	}
}

// A survey whose stations decrease at every step, or nearly every one,
// runs from right to left: one error says so, at the first decreasing
// station, not one per row; a station or two out of place keep their
// own errors. The data are invented.
func TestReversedStationsOneError(t *testing.T) {
	for _, tc := range []struct {
		name, in string
		errs     int // errors reported
		want     string
	}{
		{"every step", "station,elevation\n40,3\n30,1\n20,0\n10,1\n0,3\n", 1,
			`xs.csv:3:1: station "30": station decreases (an overhang): stations must not decrease left to right: the stations decrease throughout (4 of 4 steps, from 40 to 0): the survey runs from right to left?`},
		{"nearly every step", "station,elevation\n50,3\n40,2\n30,1\n32,0\n20,0\n10,1\n0,3\n", 1, "the stations decrease throughout (5 of 6 steps"},
		{"two out of place", "station,elevation\n0,3\n12,0\n9,0\n15,3\n14,3\n20,3\n", 2, "station 9 after 12 at row 3"},
	} {
		_, err := ParseSection(strings.NewReader(tc.in), "xs.csv", SectionOptions{})
		if !errors.Is(err, subdivide.ErrOverhang) || !strings.Contains(err.Error(), tc.want) || strings.Count(err.Error(), "\n")+1 != tc.errs {
			t.Errorf("%s: %v, want %d error(s) holding %q", tc.name, err, tc.errs, tc.want)
		}
	}
}
