package survey

import (
	"errors"
	"strings"
	"testing"
)

// A header's n column with a length unit is not Manning's n: it is
// refused at its cell, asking for northing (and easting for an E column
// with a length unit), whether an n column stands beside it or not.
func TestNWithLengthUnit(t *testing.T) {
	for _, tc := range []struct {
		name, header, want string
	}{
		{"beside n", "E (ft),N (ft),elevation (ft),n,mark", `xs.csv:1:2: N (ft): a column named n with a length unit is not Manning's n, which has no unit: name it northing (or y) if it holds northings, and name E (ft) easting (or x)`},
		{"n before it", "n,E (ft),N (ft),elevation (ft)", `xs.csv:1:3: N (ft): a column named n with a length unit`},
		{"alone", "E (m),N (m),elevation (m)", `xs.csv:1:2: N (m)`},
		{"with stations", "station,elevation,n [m]", `xs.csv:1:3: n [m]: a column named n with a length unit is not Manning's n, which has no unit: name it northing (or y) if it holds northings`},
	} {
		t.Run(tc.name, func(t *testing.T) {
			in := tc.header + "\n0,1,0.03\n1,0,0.03\n2,1,0.03\n"
			_, err := ParseSection(strings.NewReader(in), "xs.csv", SectionOptions{})
			if !errors.Is(err, ErrNWithLength) || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("%v, want ErrNWithLength: %q", err, tc.want)
			}
		})
	}
	// An E column with a length unit in a survey with no station names
	// itself.
	_, err := ParseSection(strings.NewReader("E (m),northing (m),elevation (m)\n0,0,1\n1,0,0\n"), "xs.csv", SectionOptions{})
	if !errors.Is(err, ErrMissingColumn) || !strings.Contains(err.Error(), `xs.csv:1:1: E (m): missing column`) || !strings.Contains(err.Error(), `name this column "easting" (or "x")`) {
		t.Errorf("E (m): %v", err)
	}
	// n without a unit, or with one that is no length, is read as before.
	if _, err := ParseSection(strings.NewReader("station,elevation,N\n0,1,0.03\n1,0,\n"), "xs.csv", SectionOptions{}); err != nil {
		t.Errorf("N: %v", err)
	}
}

// elev and elev. are aliases of elevation, refused beside it.
func TestElevAlias(t *testing.T) {
	for _, h := range []string{"elev", "Elev.", "elev (m)", "ELEV. [ft]"} {
		sv, err := ParseSection(strings.NewReader("station,"+h+"\n0,1\n1,0\n2,1\n"), "xs.csv", SectionOptions{})
		if err != nil || sv.Section.Points[1].Elevation != 0 {
			t.Errorf("%s: %v", h, err)
		}
	}
	_, err := ParseSection(strings.NewReader("station,elevation,elev\n0,1,1\n1,0,0\n"), "xs.csv", SectionOptions{})
	if !errors.Is(err, ErrAliasColumns) || !strings.Contains(err.Error(), "xs.csv:1:3: elev: both elevation and elev: keep one") {
		t.Errorf("elevation beside elev: %v", err)
	}
	tab := &Table{Header: []string{"station", "elev."}}
	if tab.Column(elevationNames()...) != 1 {
		t.Error("elev. not found")
	}
}
