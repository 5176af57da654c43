package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"wetline/survey"
)

// TestUnitsAssumedNote: every command reading a rating table that names
// no unit, without --units and with no other input naming units, says
// on the console (plot too), in one wording (survey.UnitsAssumedNote), that it was
// read in SI units and --units us reads feet; with --units, or headers
// naming the units, it says nothing of it. The tables are the invented
// ones of the tests of record, shifts, compare and fit.
func TestUnitsAssumedNote(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	named := filepath.Join(dir, "named.csv")
	if err := os.WriteFile(named, []byte("stage (m),discharge (m3/s)\n0.4,0.6\n0.9,5.2\n1.6,17.5\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	o := func(name string) string { return filepath.Join(dir, name) }
	for _, tc := range []struct {
		name  string
		args  []string
		notes []string // files noted
	}{
		{"plot", []string{"plot", recRatingA, "-o", o("p1")}, []string{recRatingA}},
		{"plot --units si", []string{"plot", recRatingA, "--units", "si", "-o", o("p2")}, nil},
		{"plot, units in the headers", []string{"plot", named, "-o", o("p3")}, nil},
		{"compare, units in the headers", []string{"compare", named, recRatingB, "--zero-flow", "0.2", "-o", o("c0.csv")}, nil},
		{"compare to a file", []string{"compare", recRatingA, recRatingB, "-o", o("c.csv")}, []string{recRatingA, recRatingB}},
		{"compare csv to standard output", []string{"compare", recRatingA, recRatingB, "--format", "csv"}, []string{recRatingA, recRatingB}},
		{"compare --units us", []string{"compare", recRatingA, recRatingB, "--units", "us", "-o", o("c2.csv")}, nil},
		{"fit --hydraulic-rating", []string{"fit", fitDemoGaugings, "--hydraulic-rating", fitDemoRatingTable, "--datum", "100", "--method", "lsq", "-o", o("f.csv")}, []string{fitDemoRatingTable}},
		{"shifts --rating", []string{"shifts", recGaugings, "--rating", recRatingA, "-o", o("s.csv")}, []string{recRatingA}},
		{"record --rating", []string{"record", recStages, "--rating", recRatingA, "-o", o("r.csv")}, []string{recRatingA}},
		{"record --units si", []string{"record", recStages, "--rating", recRatingA, "--units", "si", "-o", o("r2.csv")}, nil},
	} {
		t.Run(tc.name, func(t *testing.T) { checkUnitNotes(t, tc.args, tc.notes) })
	}
}

// TestUnitsAssumedNoteWritten: the boundary rating of backwater and the
// shift diagrams of record (as shifts --proposed writes them) are tables
// wetline writes too, noted when read in SI units by default; a boundary
// rating whose headers say metres is not. The reach is the tests' plain
// reach (bwPlain), whose sections name no unit.
func TestUnitsAssumedNoteWritten(t *testing.T) {
	t.Parallel()
	path := bwPlain(t)
	dir := filepath.Dir(path)
	bare, metres := filepath.Join(dir, "bare.csv"), filepath.Join(dir, "metres.csv")
	rows := "100.5,1\n101,6\n101.5,15\n102,40\n103,100\n"
	for f, h := range map[string]string{bare: "stage,discharge", metres: "stage (m),discharge (m3/s)"} {
		if err := os.WriteFile(f, []byte(h+"\n"+rows), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	for _, tc := range []struct {
		name  string
		args  []string
		notes []string
	}{
		{"backwater rating boundary", []string{"backwater", path, "--discharges", "5,20", "--boundary", "rating:" + bare, "--at", "XS-1", "-o", filepath.Join(dir, "b1.csv")}, []string{bare}},
		{"backwater rating boundary in metres", []string{"backwater", path, "--discharges", "5,20", "--boundary", "rating:" + metres, "--at", "XS-1", "-o", filepath.Join(dir, "b2.csv")}, nil},
		{"record --shifts", []string{"record", recStages, "--rating", recRatingA, "--shifts", recShifts, "-o", filepath.Join(dir, "r.csv")}, []string{recRatingA, recShifts}},
	} {
		t.Run(tc.name, func(t *testing.T) { checkUnitNotes(t, tc.args, tc.notes) })
	}
}

// TestUnitsAssumedNoteInReports: the note of a rating table read in SI
// units by default reaches record's and shifts's JSON (input_notes, the
// last key, as rate's and fit's JSON carry their input notes) and their
// workbooks' summaries (input note), as it reaches their text reports;
// with --units there is no note and no key. The tables are the invented
// ones of the tests of record and shifts.
func TestUnitsAssumedNoteInReports(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	o := func(name string) string { return filepath.Join(dir, name) }
	note := survey.UnitsAssumedNote(recRatingA)
	for _, tc := range []struct {
		name string
		args []string
	}{
		{"record", []string{"record", recStages, "--rating", recRatingA}},
		{"shifts", []string{"shifts", recGaugings, "--rating", recRatingA}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			out, errs, code := runCLI(t, append(tc.args, "--format", "json")...)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errs)
			}
			var doc map[string]json.RawMessage
			dec := json.NewDecoder(strings.NewReader(out))
			if err := dec.Decode(&doc); err != nil {
				t.Fatal(err)
			}
			var notes []string
			if err := json.Unmarshal(doc["input_notes"], &notes); err != nil || len(notes) != 1 || notes[0] != note {
				t.Errorf("input_notes %s (%v), want [%q]", doc["input_notes"], err, note)
			}
			if keys := jsonKeys(t, []byte(out)); len(keys) == 0 || keys[len(keys)-1] != "input_notes" {
				t.Errorf("keys %q: input_notes is not the last", keys)
			}
			out, errs, code = runCLI(t, append(tc.args, "--format", "json", "--units", "si")...)
			if code != 0 || strings.Contains(out, "input_notes") {
				t.Errorf("--units si: exit %d, input_notes written: %s", code, errs)
			}
			book := o(tc.name + ".xlsx")
			if _, errs, code := runCLI(t, append(tc.args, "-o", book)...); code != 0 {
				t.Fatalf("workbook: exit %d: %s", code, errs)
			}
			if got := summary(t, openBook(t, book))["input note"]; got != note {
				t.Errorf("summary input note %q, want %q", got, note)
			}
		})
	}
}

// checkUnitNotes runs wetline with args and checks that standard error
// carries one note of units assumed for each file of notes, and no other.
func checkUnitNotes(t *testing.T, args, notes []string) {
	t.Helper()
	_, errs, code := runCLI(t, args...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if got := strings.Count(errs, "names no unit"); got != len(notes) {
		t.Errorf("%d notes of units assumed, want %d:\n%s", got, len(notes), errs)
	}
	for _, f := range notes {
		if !strings.Contains(errs, "input: "+survey.UnitsAssumedNote(f)) {
			t.Errorf("no note of %s:\n%s", f, errs)
		}
	}
}
