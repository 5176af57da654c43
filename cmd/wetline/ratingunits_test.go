package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// withHeader copies a table into dir under name with its header line
// (the first line starting with old) replaced by header.
func withHeader(t *testing.T, dir, name, src, old, header string) string {
	t.Helper()
	data, err := os.ReadFile(src)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(string(data), "\n")
	done := false
	for i, l := range lines {
		if !done && strings.HasPrefix(l, old) {
			lines[i], done = header+strings.TrimPrefix(l, old), true
		}
	}
	if !done {
		t.Fatalf("%s: no line starts with %q", src, old)
	}
	p := filepath.Join(dir, name)
	if err := os.WriteFile(p, []byte(strings.Join(lines, "\n")), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// A rating table whose headers are in feet is read in feet without
// --units and refused with --units si, naming the file, the column and
// both units; by every command that reads rating tables.
func TestRatingTableUnitsFromHeaders(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	feetA := withHeader(t, dir, "a-ft.csv", recRatingA, "stage,discharge", "stage (ft),discharge (ft3/s)")
	feetB := withHeader(t, dir, "b-ft.csv", recRatingB, "stage,discharge", "stage (ft),discharge (cfs)")
	metresB := withHeader(t, dir, "b-m.csv", recRatingB, "stage,discharge", "stage (m),discharge (m3/s)")
	mixed := withHeader(t, dir, "mixed.csv", recRatingA, "stage,discharge", "stage (ft),discharge (m3/s)")
	feetTable := withHeader(t, dir, "xs1-ft.csv", fitDemoRatingTable, "stage,depth", "stage (ft),depth (ft)")
	feetGaugings := withHeader(t, dir, "g-ft.csv", "testdata/record/gaugings.csv", "time,stage,discharge", "time,stage (ft),discharge (ft3/s)")
	feetStages := withHeader(t, dir, "stage-ft.csv", recStages, "time,stage (m)", "time,stage (ft)")
	metresShifts := withHeader(t, dir, "shifts-m.csv", recShifts, "time,stage,shift", "time,stage (m),shift (m)")
	mixedShifts := withHeader(t, dir, "shifts-mixed.csv", recShifts, "time,stage,shift", "time,stage (m),shift (ft)")
	feetFitGaugings := withHeader(t, dir, "fit-g-ft.csv", fitDemoGaugings, "time,gauge_height,discharge", "time,gauge_height (ft),discharge (ft3/s)")
	for _, c := range []struct {
		name      string
		args      []string
		feet      string // a word of the output in feet
		siRefused string // the position named when --units si is given
	}{
		{"compare", []string{"compare", feetA, feetB, "--format", "json"}, `"discharge": "ft3/s"`, "a-ft.csv:2:1: stage (ft)"},
		{"fit", []string{"fit", feetFitGaugings, "--hydraulic-rating", feetTable, "--datum", "100", "--compare-only"}, "us units", "fit-g-ft.csv:3:2: gauge_height (ft)"},
		{"record", []string{"record", feetStages, "--rating", feetA}, "discharge in ft3/s", "a-ft.csv:2:1: stage (ft)"},
		{"shifts", []string{"shifts", feetGaugings, "--rating", feetA}, "ft3/s", "a-ft.csv:2:1: stage (ft)"},
	} {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			out, errs, code := runCLI(t, c.args...)
			if code != 0 || !strings.Contains(out+errs, c.feet) {
				t.Errorf("without --units: exit %d, want %q in\n%s%s", code, c.feet, out, errs)
			}
			_, errs, code = runCLI(t, append(c.args, "--units", "si")...)
			if code != 1 || !strings.Contains(errs, c.siRefused) || !strings.Contains(errs, "says ft") || !strings.Contains(errs, "si units") {
				t.Errorf("with --units si: exit %d, want an error at %s naming both units: %s", code, c.siRefused, errs)
			}
		})
	}
	for _, c := range []struct {
		name string
		args []string
		want []string
	}{
		{"B in other units than A", []string{"compare", feetA, metresB},
			[]string{"b-m.csv:2:1: stage (m)", "says m (si units)", "us units set by the headers of " + feetA}},
		{"mixed in one table", []string{"compare", mixed, feetB}, []string{"mixed.csv:2:2: discharge (m3/s)", "different unit systems"}},
		{"gaugings in other units than the ratings", []string{"shifts", feetGaugings, "--rating", recRatingA, "--rating", metresB + "@2024-05-02T12:00"},
			[]string{"g-ft.csv:2:2: stage (ft)", "si units set by the headers of " + metresB}},
		{"record's gaugings too", []string{"record", recStages, "--rating", metresB, "--gaugings", feetGaugings},
			[]string{"g-ft.csv:2:2: stage (ft)", "si units set by the headers of " + metresB}},
		{"a stage record in other units than the ratings", []string{"record", feetStages, "--rating", metresB},
			[]string{"stage-ft.csv:2:2: stage (ft)", "says ft (us units)", "si units set by the headers of " + metresB}},
		{"a stage record against --units", []string{"record", feetStages, "--rating", recRatingA, "--units", "si"},
			[]string{"stage-ft.csv:2:2: stage (ft)", "si units set by --units"}},
		{"shift diagrams in other units than the ratings", []string{"record", recStages, "--rating", feetA, "--shifts", metresShifts},
			[]string{"shifts-m.csv:2:2: stage (m)", "us units set by the headers of " + feetA}},
		{"shift diagrams checked by shifts too", []string{"shifts", "testdata/record/gaugings.csv", "--rating", feetA, "--shifts", metresShifts},
			[]string{"shifts-m.csv:2:2: stage (m)", "us units set by the headers of " + feetA}},
		{"a shift diagram mixing systems", []string{"record", recStages, "--rating", recRatingA, "--shifts", mixedShifts},
			[]string{"shifts-mixed.csv:2:3: shift (ft)", "different unit systems"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			_, errs, code := runCLI(t, c.args...)
			if code != 1 {
				t.Errorf("exit %d: %s", code, errs)
			}
			for _, w := range c.want {
				if !strings.Contains(errs, w) {
					t.Errorf("error %q lacks %q", errs, w)
				}
			}
		})
	}
}

// Two surveys whose headers are in feet are compared in feet (US
// Manning constant and labels) without --units.
func TestCompareSectionsInFeet(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	a := withHeader(t, dir, "a.csv", recSectionA, "station,elevation", "station (ft),elevation (ft)")
	b := withHeader(t, dir, "b.csv", recSectionB, "station,elevation", "station (ft),elevation (ft)")
	out, errs, code := runCLI(t, "compare", a, b, "--stages", "12", "--format", "json")
	if code != 0 || !strings.Contains(out, `"discharge": "ft3/s"`) || !strings.Contains(out, `"system": "us"`) {
		t.Errorf("exit %d: %s%s", code, out, errs)
	}
}

// A results workbook's rating sheet carries units in its headers: read
// back as a rating table it is in the units it was written in.
func TestRatingSheetUnits(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	xs := withHeader(t, dir, "xs.csv", recSectionA, "station,elevation", "station (ft),elevation (ft)")
	book := filepath.Join(dir, "r.xlsx")
	if _, errs, code := runCLI(t, "rate", xs, "--slope", "0.001", "-o", book); code != 0 {
		t.Fatalf("rate: exit %d: %s", code, errs)
	}
	out, errs, code := runCLI(t, "compare", book, book, "--sheet-a", "rating", "--sheet-b", "rating", "--datum", "10", "--format", "json")
	if code != 0 || !strings.Contains(out, `"system": "us"`) {
		t.Errorf("compare the rating sheet with itself: exit %d: %s%s", code, out, errs)
	}
	_, errs, code = runCLI(t, "compare", book, book, "--sheet-a", "rating", "--sheet-b", "rating", "--units", "si")
	if code != 1 || !strings.Contains(errs, "r.xlsx['rating']!A1: stage (ft)") {
		t.Errorf("with --units si: exit %d: %s", code, errs)
	}
}

// Without --units, an input whose headers name no unit is in si units, as
// it would be alone: beside an input whose headers name us units it is
// refused, whichever is read first, naming the file and the column that
// says ft, instead of taking the other's units (a metric section read as
// feet, k = 1.486). Beside one naming si units, or with --units, it is
// read.
func TestUnitsUnnamedBesideFeet(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	feetA := withHeader(t, dir, "a-ft.csv", recRatingA, "stage,discharge", "stage (ft),discharge (ft3/s)")
	metresB := withHeader(t, dir, "b-m.csv", recRatingB, "stage,discharge", "stage (m),discharge (m3/s)")
	feetXS := withHeader(t, dir, "xs-ft.csv", recSectionA, "station,elevation", "station (ft),elevation (ft)")
	feetGaugings := withHeader(t, dir, "g-ft.csv", "testdata/record/gaugings.csv", "time,stage,discharge", "time,stage (ft),discharge (ft3/s)")
	feetStages := withHeader(t, dir, "stage-ft.csv", recStages, "time,stage (m)", "time,stage (ft)")
	reachTable := filepath.Join(dir, "reach.csv")
	if err := os.WriteFile(reachTable, []byte("section,survey,distance,ws_left,ws_right\nA,xs-ft.csv,0,11.2,\nB,plain.csv,300,11,\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "plain.csv"), []byte("station,elevation,n\n0,12,0.04\n10,10,0.04\n20,12,\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	const unnamed = "without --units, a file whose headers name no unit is in si units"
	plainGaugings := "testdata/record/gaugings.csv"
	plainStages := "testdata/record/linear-stage.csv"
	for _, c := range []struct {
		name string
		args []string
		want []string // on standard error, none when read (exit 0)
	}{
		{"compare, ratings in feet then none", []string{"compare", feetA, recRatingB}, []string{recRatingB + ": " + unnamed, `a-ft.csv:2:1 says ft (us units) in column "stage (ft)"`, "give --units us"}},
		{"compare, ratings in none then feet", []string{"compare", recRatingB, feetA}, []string{"a-ft.csv:2:1: stage (ft): " + unnamed, "the headers of " + recRatingB + " name no unit"}},
		{"compare, with --units us", []string{"compare", feetA, recRatingB, "--units", "us"}, nil},
		{"compare, none beside metres", []string{"compare", recRatingA, metresB}, nil},
		{"compare, surveys in feet then none", []string{"compare", feetXS, recSectionB, "--stages", "12"}, []string{recSectionB + ": " + unnamed, "xs-ft.csv"}},
		{"compare, surveys in none then feet", []string{"compare", recSectionB, feetXS, "--stages", "12"}, []string{"xs-ft.csv:2:1: station (ft): " + unnamed}},
		{"compare, surveys with --units us", []string{"compare", feetXS, recSectionB, "--stages", "12", "--units", "us"}, nil},
		{"fit --section", []string{"fit", feetGaugings, "--section", recSectionA, "--slope", "0.001"}, []string{recSectionA + ": " + unnamed, "g-ft.csv:2:2"}},
		{"shifts --rating", []string{"shifts", plainGaugings, "--rating", feetA}, []string{plainGaugings + ": " + unnamed, "a-ft.csv:2:1"}},
		{"record --rating, stages naming none", []string{"record", plainStages, "--rating", feetA}, []string{plainStages + ": " + unnamed}},
		{"record --rating, rating naming none", []string{"record", feetStages, "--rating", recRatingA}, []string{"stage-ft.csv:2:2: stage (ft): " + unnamed}},
		{"rate --calibrate", []string{"rate", feetXS, "--slope", "0.001", "--calibrate", plainGaugings}, []string{plainGaugings + ": " + unnamed}},
		{"slopearea, a survey naming none", []string{"slopearea", reachTable, "--draws", "0"}, []string{"plain.csv: " + unnamed}},
	} {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			out, errs, code := runCLI(t, c.args...)
			if len(c.want) == 0 {
				if code != 0 {
					t.Errorf("exit %d: %s%s", code, out, errs)
				}
				return
			}
			if code != 1 || out != "" {
				t.Errorf("exit %d, want 1 and no output: %s", code, out)
			}
			for _, w := range c.want {
				if !strings.Contains(errs, w) {
					t.Errorf("error %q lacks %q", errs, w)
				}
			}
		})
	}
}
