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
