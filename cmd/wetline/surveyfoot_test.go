package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// A survey exported in US survey feet (US ft, ftUS; common practice of
// GNSS data collectors) is rated and projected in feet, each saying once
// on the console that the headers name the US survey foot, 2 parts per
// million from the international foot (README, Units). The survey is
// invented.
func TestSurveyFootCommands(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	xs := filepath.Join(dir, "xs.csv")
	if err := os.WriteFile(xs, []byte("station (US ft),elevation (US ft),n,code\n0,108.2,0.05,lb\n12,100.1,,\n25,108,,rb\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	coords := filepath.Join(dir, "coords.csv")
	if err := os.WriteFile(coords, []byte("Easting (ftUS),Northing (ftUS),Elevation (ftUS),n,Point Code\n0,0,108.2,0.05,LPIN\n0,12,100.1,,\n0,25,108,,RPIN\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name, at string
		args     []string
	}{
		{"rate", xs + ":1:1: ", []string{"rate", xs, "--slope", "0.002", "--stages", "104", "-o", filepath.Join(dir, "r.csv")}},
		{"rate to standard output", xs + ":1:1: ", []string{"rate", xs, "--slope", "0.002", "--stages", "104"}},
		{"project", coords + ":1:1: ", []string{"project", coords, "-o", filepath.Join(dir, "p.csv")}},
	} {
		_, errs, code := runCLI(t, tc.args...)
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", tc.name, code, errs)
		}
		if n := strings.Count(errs, "input: "+tc.at+"the header names US survey feet"); n != 1 || !strings.Contains(errs, "2 parts per million") {
			t.Errorf("%s: %d notes of the survey foot at %s, want one:\n%s", tc.name, n, tc.at, errs)
		}
		if tc.name == "rate" && !strings.Contains(errs, "us units") {
			t.Errorf("rate: not rated in us units:\n%s", errs)
		}
	}
}
