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
