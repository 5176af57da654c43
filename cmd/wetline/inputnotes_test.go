package main

import (
	"path/filepath"
	"strings"
	"testing"
)

// TestInputNotesEveryFormat: a note of an input (a coordinate survey's
// projection, a rating table naming no unit) reaches every report: in
// JSON as input_notes, the last key; in a workbook as the summary's
// input note; in text as an Input: line.
func TestInputNotesEveryFormat(t *testing.T) {
	t.Parallel()
	dir, _ := demoOutput(t)
	in := func(name string) string { return filepath.Join(dir, name) }
	const projected, noUnit = "stations were projected", "names no unit"
	for _, tc := range []struct {
		name string
		args []string
		note string
	}{
		{"rate", []string{"rate", in(demoCoordSurvey), "--slope", "0.003"}, projected},
		{"solve discharge", []string{"solve", in(demoCoordSurvey), "--discharge", "2", "--slope", "0.003"}, projected},
		{"solve area", []string{"solve", in(demoCoordSurvey), "--area", "2"}, projected},
		{"backwater", []string{"backwater", in(demoBWReach), "--discharges", "10,20", "--boundary", "rating:" + in("tallow-xs1-rating.csv")}, "is the stage of the table's last dry row at its foot"},
		{"compare ratings", []string{"compare", in("tallow-rating-7.csv"), in("tallow-rating-8.csv")}, noUnit},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			out, errs, code := runCLI(t, append(tc.args, "--format", "json")...)
			if code != 0 {
				t.Fatalf("json: exit %d: %s", code, errs)
			}
			keys := jsonKeys(t, []byte(out))
			if keys[len(keys)-1] != "input_notes" || !strings.Contains(out, tc.note) {
				t.Errorf("json: keys end %q, want input_notes last holding %q", keys[max(0, len(keys)-4):], tc.note)
			}
			if text, errs, code := runCLI(t, append(tc.args, "--format", "text")...); code != 0 || !strings.Contains(text, "Input: ") || !strings.Contains(text, tc.note) {
				t.Errorf("text: exit %d %s: no Input: line holding %q", code, errs, tc.note)
			}
			if tc.args[0] == "solve" { // text and JSON only
				return
			}
			book := filepath.Join(t.TempDir(), "r.xlsx")
			if _, errs, code := runCLI(t, append(tc.args, "-o", book)...); code != 0 {
				t.Fatalf("xlsx: exit %d: %s", code, errs)
			}
			f := openBook(t, book)
			if n := summary(t, f)["input note"]; !strings.Contains(n, tc.note) {
				t.Errorf("xlsx: summary's input note %q, want one holding %q", n, tc.note)
			}
		})
	}
}
