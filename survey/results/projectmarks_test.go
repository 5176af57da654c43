package results_test

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"wetline/survey"
	"wetline/survey/results"
)

// A projected survey keeps the bank marks as the crew wrote them: a word
// naming a side (LB, right bank, R.B., ltob) is written on its point, not
// replaced by plain "bank", and the survey written reads back to the same
// banks (a side on the wrong side would be refused, ErrBankSide), whether
// the points were taken left to right or right to left.
func TestProjectKeepsBankSides(t *testing.T) {
	t.Parallel()
	// An invented section across a line running east: left looking
	// downstream is the west end (the pins say so).
	e := []float64{1000, 1001, 1002.5, 1004, 1005.5, 1007, 1008}
	z := []float64{15.2, 14.8, 13.6, 13.2, 13.7, 14.9, 15.3}
	for _, tc := range []struct{ left, right string }{
		{"LB", "RB"}, {"left bank", "right bank"}, {"L.B.", "R. B."}, {"ltob", "rtob"},
		{"bank", "bank"}, {"left top of bank", "tob"},
	} {
		for _, reversed := range []bool{false, true} {
			marks := []string{"left pin", tc.left, "", "", "", tc.right, "right pin"}
			var b strings.Builder
			b.WriteString("easting,northing,elevation,mark\n")
			order := []int{0, 1, 2, 3, 4, 5, 6}
			if reversed {
				slices.Reverse(order)
			}
			for _, i := range order {
				fmt.Fprintf(&b, "%g,2000,%g,%s\n", e[i], z[i], marks[i])
			}
			name := fmt.Sprintf("%s-%s-%v", tc.left, tc.right, reversed)
			path := filepath.Join(t.TempDir(), "xs.csv")
			if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
				t.Fatal(err)
			}
			rep, err := survey.Project(path, "", survey.CoordinateOptions{}, survey.UnitChoice{})
			if err != nil {
				t.Fatalf("%s: %v", name, err)
			}
			var out bytes.Buffer
			if err := results.WriteProjectionCSV(&out, rep); err != nil {
				t.Fatal(err)
			}
			back, err := survey.ParseSection(bytes.NewReader(out.Bytes()), "stations.csv", survey.SectionOptions{})
			if err != nil {
				t.Fatalf("%s: the survey written does not read back: %v\n%s", name, err, out.String())
			}
			sec := back.Section
			if !sec.HasBanks || sec.LeftBank != 1 || sec.RightBank != 7 {
				t.Errorf("%s: banks %v at %g and %g, want 1 and 7", name, sec.HasBanks, sec.LeftBank, sec.RightBank)
			}
			for i, want := range marks {
				if got := back.Mark(i); got != want {
					t.Errorf("%s: point %d (station %g) marked %q, want %q", name, i, sec.Points[i].Station, got, want)
				}
			}
		}
	}
}
