package survey

import (
	"bytes"
	"reflect"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
)

// TestWriteSectionCSV: a section written as a survey reads back to the
// same points, n and banks (numbers are written exactly), and in the unit
// system it was written in: the headers carry the unit.
func TestWriteSectionCSV(t *testing.T) {
	sec := subdivide.Section{
		Name: "built",
		Points: []subdivide.Point{{Station: -0.1, Elevation: 3}, {Station: 4.5, Elevation: 1.5}, {Station: 24.5, Elevation: 1.5},
			{Station: 26, Elevation: 0.1 + 0.2}, {Station: 28, Elevation: 0}, {Station: 29.5, Elevation: 1.5}, {Station: 54, Elevation: 3}},
		N:        []float64{0.06, 0.06, 0.035, 0.035, 0.035, 0.06},
		HasBanks: true, LeftBank: 24.5, RightBank: 29.5,
	}
	for _, u := range []rating.Units{rating.SI, rating.US} {
		var buf bytes.Buffer
		if err := WriteSectionCSV(&buf, sec, u, []string{"two lines\nof comment"}); err != nil {
			t.Fatal(err)
		}
		text := buf.String()
		sv, err := ParseSection(&buf, "built.csv", SectionOptions{})
		if err != nil {
			t.Fatalf("%v\n%s", err, text)
		}
		if !sv.Units.Found || sv.Units.Units != u {
			t.Errorf("%v: read back in %+v\n%s", u, sv.Units, text)
		}
		got := sv.Section
		got.Name = sec.Name
		if !reflect.DeepEqual(got, sec) {
			t.Errorf("%v: read back %+v\nwant %+v", u, got, sec)
		}
	}
}
