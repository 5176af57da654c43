package survey_test

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"wetline/survey"
)

// An extrapolated cell that is neither a yes nor a no word is refused at
// its cell, not read as "not extrapolated".
func TestExtrapolatedWordRefused(t *testing.T) {
	dir := t.TempDir()
	for _, tc := range []struct {
		cell string
		ok   bool
	}{{"yes", true}, {"TRUE", true}, {"1", true}, {"no", true}, {"", true}, {"false", true}, {"maybe", false}, {"x", false}} {
		path := filepath.Join(dir, "r.csv")
		body := "stage,discharge,extrapolated\n0.2,0,\n0.5,1.5,\n1.0,6.2," + tc.cell + "\n"
		if err := os.WriteFile(path, []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
		_, err := survey.ReadRatingTables(path, survey.RatingTableOptions{})
		switch {
		case tc.ok && err != nil:
			t.Errorf("%q: %v", tc.cell, err)
		case !tc.ok && !errors.Is(err, survey.ErrExtrapolatedWord):
			t.Errorf("%q: error %v, want ErrExtrapolatedWord", tc.cell, err)
		case !tc.ok && !strings.Contains(err.Error(), "r.csv:4:3"):
			t.Errorf("%q: error %v does not name row 4, column 3", tc.cell, err)
		}
	}
}

// Plot's reading of a fit's table refuses such a cell too.
func TestFitRowsExtrapolatedWordRefused(t *testing.T) {
	path := filepath.Join(t.TempDir(), "f.csv")
	if err := os.WriteFile(path, []byte("stage,discharge,extrapolated\n0.5,1.5,no\n1.0,6.2,perhaps\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	tab, err := survey.ReadRatingTable(path, "")
	if err != nil {
		t.Fatal(err)
	}
	rt, err := survey.RatingFromTable(tab, survey.UnitChoice{})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := survey.FitRowsFromTable(tab, rt); !errors.Is(err, survey.ErrExtrapolatedWord) || !strings.Contains(err.Error(), "f.csv:3:3") {
		t.Errorf("error %v, want ErrExtrapolatedWord at f.csv:3:3", err)
	}
}

// A negative depth is refused at its cell; a given zero flow just below a
// fit table's first row, within a unit of the table's finest decimal, is
// read as that row, and one farther below is still refused.
func TestRatingTableDepthAndGivenRounding(t *testing.T) {
	dir := t.TempDir()
	write := func(name, body string) string {
		path := filepath.Join(dir, name)
		if err := os.WriteFile(path, []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
		return path
	}
	neg := write("neg.csv", "stage,discharge,depth\n100.3,0,0\n100.4,0.3,-0.5\n100.5,1.3,0.2\n")
	if _, err := survey.ReadRatingTables(neg, survey.RatingTableOptions{}); !errors.Is(err, survey.ErrNegativeDepth) || !strings.Contains(err.Error(), "neg.csv:3:3") {
		t.Errorf("negative depth: %v, want ErrNegativeDepth at neg.csv:3:3", err)
	}
	fit := write("fit.csv", "stage,discharge,extrapolated\n0.324584,0,yes\n0.5,1.2,no\n0.9,6.1,no\n")
	for _, tc := range []struct {
		e    float64
		ok   bool
		want float64
	}{
		{0.3245838, true, 0.324584}, // within half a unit of the row's sixth significant digit
		{0.324584, true, 0.324584},
		{0.3245, false, 0}, // rounded by hand: 8.4e-5 below
		{0.31, false, 0},
		{0.32, false, 0}, // fewer decimals buy no tolerance
	} {
		rts, err := survey.ReadRatingTables(fit, survey.RatingTableOptions{HasZeroFlow: true, ZeroFlow: tc.e})
		switch {
		case tc.ok && err != nil:
			t.Errorf("e %g: %v", tc.e, err)
		case tc.ok && rts.Periods[0].Rating.ZeroFlow != tc.want:
			t.Errorf("e %g read as %g, want %g", tc.e, rts.Periods[0].Rating.ZeroFlow, tc.want)
		case !tc.ok && err == nil:
			t.Errorf("e %g, %g below the dry row: accepted", tc.e, 0.324584-tc.e)
		}
	}
	// A table on a coarse grid (rate's 0.3 is 0.3000): its dry row is
	// exact, so e = 0.25 or 0.29 contradicts it.
	coarse := write("coarse.csv", "stage,discharge\n0.2,0\n0.30,0\n0.4,0.5\n0.6,2.1\n")
	for _, e := range []float64{0.21, 0.25, 0.29} {
		if _, err := survey.ReadRatingTables(coarse, survey.RatingTableOptions{HasZeroFlow: true, ZeroFlow: e}); err == nil {
			t.Errorf("e %g below a dry row at 0.3 accepted", e)
		}
	}
}
