package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"wetline/plotting"
	"wetline/survey/results"
)

// shiftsArgs are the arguments of a shift check of the test gaugings on
// two rating periods.
func shiftsArgs(extra ...string) []string {
	args := []string{"shifts", recGaugings, "--rating", recRatingA, "--rating", recRatingB + "@2024-05-02T00:00", "--zero-flow", "0.2"}
	return append(args, extra...)
}

func TestShiftsGolden(t *testing.T) {
	t.Parallel()
	checkRecordGoldens(t, []recordGolden{
		{"shifts.txt", shiftsArgs()},
		{"shifts-applied.txt", shiftsArgs("--shifts", recShifts, "--utc-offset", "-05:00")},
		{"shifts.csv", shiftsArgs("--format", "csv")},
		{"shifts.json", shiftsArgs("--shifts", recShifts, "--format", "json")},
	})
}

// TestShiftsJSONKeys: the check's JSON keys come in their documented
// order (input_notes last: its rating names no unit), and so do a
// gauging's.
func TestShiftsJSONKeys(t *testing.T) {
	t.Parallel()
	out, errs, code := runCLI(t, shiftsArgs("--format", "json")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if got := strings.Join(jsonKeys(t, []byte(out)), ","); got != "units,gaugings,visits,ratings,shifts,warnings,caution,site,input_notes" {
		t.Errorf("keys %s", got)
	}
	if got := jsonKeys(t, firstOf(t, []byte(out), "gaugings")); strings.Join(got, ",") != strings.Join(results.ShiftGaugingColumns(), ",") {
		t.Errorf("gauging keys %q", got)
	}
	if got := strings.Join(jsonKeys(t, firstOf(t, []byte(out), "visits")), ","); got != "visit,time,gaugings,proposal" {
		t.Errorf("visit keys %s", got)
	}
}

// TestShiftsProposedRoundTrip: the proposed diagrams are written in the
// shift-diagram format, their lengths' headers naming the run's unit, so
// that given back with --shifts, in either unit system and without
// --units, every gauging whose visit proposed a diagram is matched by the
// shifted rating (its residual is zero to the four decimals written).
func TestShiftsProposedRoundTrip(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name, length, discharge string
	}{
		{"si", "m", "m3/s"},
		{"us", "ft", "ft3/s"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			dir := t.TempDir()
			// The test inputs with their units in the headers: the run's
			// unit system is the headers'.
			inputs := map[string]string{}
			for _, in := range []string{recGaugings, recRatingA, recRatingB} {
				data, err := os.ReadFile(in)
				if err != nil {
					t.Fatal(err)
				}
				text := strings.Replace(string(data), "stage,discharge", "stage ("+tc.length+"),discharge ("+tc.discharge+")", 1)
				path := filepath.Join(dir, filepath.Base(in))
				if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
					t.Fatal(err)
				}
				inputs[in] = path
			}
			args := func(extra ...string) []string {
				a := []string{"shifts", inputs[recGaugings], "--rating", inputs[recRatingA], "--rating", inputs[recRatingB] + "@2024-05-02T00:00", "--zero-flow", "0.2"}
				return append(a, extra...)
			}
			proposed := filepath.Join(dir, "proposed.csv")
			_, errs, code := runCLI(t, args("--proposed", proposed, "-o", filepath.Join(dir, "check.txt"))...)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errs)
			}
			if !strings.Contains(errs, "wrote "+proposed) {
				t.Errorf("stderr %q", errs)
			}
			data, err := os.ReadFile(proposed)
			if err != nil {
				t.Fatal(err)
			}
			L := tc.length
			if header := "\ntime,stage (" + L + "),shift (" + L + "),taper (" + L + "),abrupt\n"; !strings.Contains(string(data), header) || !strings.HasPrefix(string(data), "# ") {
				t.Errorf("proposed file, want the header %q:\n%s", header, data)
			}
			out, errs, code := runCLI(t, args("--shifts", proposed, "--format", "json")...)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errs)
			}
			var doc struct {
				Units struct {
					System string `json:"system"`
				} `json:"units"`
				Gaugings []struct {
					Residual *float64 `json:"residual_shift"`
					Source   string
				}
			}
			if err := json.Unmarshal([]byte(out), &doc); err != nil {
				t.Fatal(err)
			}
			if doc.Units.System != tc.name {
				t.Errorf("units %q, want %q", doc.Units.System, tc.name)
			}
			const writtenTol = 5e-5 // shifts are written to four decimals
			for _, g := range doc.Gaugings {
				if g.Residual == nil || *g.Residual > writtenTol || *g.Residual < -writtenTol {
					t.Errorf("%s: residual %v after applying its own proposal", g.Source, g.Residual)
				}
			}
		})
	}
}

// TestShiftsFiles: a workbook whose proposed-shifts sheet reads back as
// shift diagrams, and two figures of the default size.
func TestShiftsFiles(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	book := filepath.Join(dir, "check.xlsx")
	plots := filepath.Join(dir, "plots")
	_, errs, code := runCLI(t, shiftsArgs("-o", book, "--plots", plots)...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	decodeAll(t, plots, []string{"gaugings-shift-stage.png", "gaugings-shift-time.png"}, plotting.DefaultWidth, plotting.DefaultHeight)
	f, err := excelize.OpenFile(book)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	want := []string{results.SheetSummary, results.SheetGaugings, results.SheetProposals, results.SheetRatings, results.SheetPlots}
	if got := f.GetSheetList(); strings.Join(got, "|") != strings.Join(want, "|") {
		t.Errorf("sheets %q, want %q", got, want)
	}
	if _, errs, code := runCLI(t, shiftsArgs("--shifts", book, "--shifts-sheet", results.SheetProposals)...); code != 0 {
		t.Errorf("proposed shifts sheet does not read back: exit %d: %s", code, errs)
	}
}

func TestShiftsRefusals(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	for _, c := range []struct {
		name string
		args []string
		code int
		want string
	}{
		{"proposed not csv", shiftsArgs("--proposed", filepath.Join(dir, "p.txt")), 2, "name the file .csv"},
		{"proposed is output", shiftsArgs("--proposed", filepath.Join(dir, "p.csv"), "-o", filepath.Join(dir, "p.csv")), 2, "name the same path"},
		{"no gaugings", []string{"shifts", "--rating", recRatingA}, 2, "one GAUGINGS file"},
		{"negative visit gap", shiftsArgs("--visit-gap", "-1h"), 2, "--visit-gap"},
		{"valid_from and @", []string{"shifts", recGaugings, "--rating", "testdata/record/periods.csv@2024-05-01"}, 2, "valid_from"},
		{"proposed over an input", shiftsArgs("--proposed", recRatingA), 1, "refusing to write over an input"},
	} {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			_, errs, code := runCLI(t, c.args...)
			if code != c.code || !strings.Contains(errs, c.want) {
				t.Errorf("exit %d, want %d; stderr %q should hold %q", code, c.code, errs, c.want)
			}
		})
	}
	if _, err := os.Stat(filepath.Join(dir, "p.csv")); err == nil {
		t.Error("a refused run wrote its proposals")
	}
}

// TestShiftsVisitGap: gaugings no more than --visit-gap apart make one
// visit; 0 makes every gauging its own; a rating break splits a visit. The
// test gaugings are at 09:00 and 12:00 on one day and 11:00 the next (3 h
// and 23 h apart, the second rating in force from midnight between them),
// so the visit counts follow by hand.
func TestShiftsVisitGap(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		gap    []string
		visits int
	}{
		{nil, 2}, // the default, 12 h
		{[]string{"--visit-gap", "0"}, 3},
		{[]string{"--visit-gap", "2h"}, 3},
		{[]string{"--visit-gap", "3h"}, 2},
		{[]string{"--visit-gap", "24h"}, 2}, // split at the break at midnight
	} {
		out, errs, code := runCLI(t, shiftsArgs(append(tc.gap, "--format", "json")...)...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", tc.gap, code, errs)
		}
		var doc struct{ Visits []json.RawMessage }
		if err := json.Unmarshal([]byte(out), &doc); err != nil {
			t.Fatal(err)
		}
		if len(doc.Visits) != tc.visits {
			t.Errorf("%v: %d visits, want %d", tc.gap, len(doc.Visits), tc.visits)
		}
	}
}

// TestShiftsFlagsEveryProblem: each gauging the check cannot measure is
// flagged and warned of. On testdata/record/rating-a.csv (first row 0.40 m,
// 0.6 m3/s; last 1.60 m, 17.5 m3/s) with e = 0.2 until a period without a
// rating from 1 June: zero discharge at 0.84 m, where the rating has flow,
// has no shift; zero at 0.15 m (below e) agrees with the rating; 2.0 m is
// above the last row and 30 m3/s beyond it, and above the rating's highest
// gauging (1.2 m), flagged above_gaugings as the record flags it; a
// gauging in June has no rating.
func TestShiftsFlagsEveryProblem(t *testing.T) {
	t.Parallel()
	gaugings := filepath.Join(t.TempDir(), "g.csv")
	if err := os.WriteFile(gaugings, []byte("time,stage,discharge,quality\n"+
		"2024-05-01T09:00,0.84,0,good\n2024-05-02T09:00,0.15,0,good\n2024-05-03T09:00,2.0,30,good\n2024-06-02T09:00,0.84,4.1,good\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	out, errs, code := runCLI(t, "shifts", gaugings, "--rating", recRatingA, "--rating", "none@2024-06-01", "--zero-flow", "0.2", "--format", "csv")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	rows := strings.Split(strings.TrimSpace(out), "\n")
	for i, tc := range []struct {
		flags, warning string
	}{
		{"no_shift", "g.csv:2: zero discharge measured at gauge height 0.84, where the rating \"rating-a.csv\" gives"},
		{"below_zero_flow", "g.csv:3: gauge height 0.15 is at or below the zero-flow stage 0.2"},
		{"above_gaugings outside_rating no_shift", "g.csv:4: gauge height 2 is outside the rating"},
		{"no_rating", "g.csv:5: no rating is in force"},
	} {
		f := strings.Split(rows[i+1], ",")
		if got := f[slices.Index(results.ShiftGaugingColumns(), "flags")]; got != tc.flags {
			t.Errorf("row %q: flags %q, want %q", rows[i+1], got, tc.flags)
		}
		if !strings.Contains(errs, tc.warning) {
			t.Errorf("no warning %q in %s", tc.warning, errs)
		}
	}
	if w := "g.csv:4: gauge height 2 is above the highest gauging 1.2 of the rating \"rating-a.csv\"\n"; !strings.Contains(errs, w) {
		t.Errorf("no warning %q in %s", w, errs)
	}
}

// TestShiftsWarningsInOffset: with --utc-offset the warnings write times in
// that offset, as the report does. Read at +10:00, the test diagram of
// 2024-05-01T00:00 lies before the rating from 06:00 that day, the one of
// 2024-05-02T06:00 and the gauging of 2024-05-02T11:00 in the period
// without a rating from midnight.
func TestShiftsWarningsInOffset(t *testing.T) {
	t.Parallel()
	out, errs, code := runCLI(t, "shifts", recGaugings, "--rating", recRatingA+"@2024-05-01T06:00", "--rating", "none@2024-05-02T00:00", "--zero-flow", "0.2",
		"--shifts", recShifts, "--utc-offset", "+10:00", "--format", "csv")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, want := range []string{"the shift diagram of 2024-05-01T00:00:00+10:00 (", "the shift diagram of 2024-05-02T06:00:00+10:00 (",
		"no rating is in force at 2024-05-02T11:00:00+10:00"} {
		if !strings.Contains(errs, want) {
			t.Errorf("warnings %s: want %q", errs, want)
		}
	}
	if !strings.Contains(out, "2024-05-02T11:00:00+10:00") {
		t.Errorf("the report does not write the gauging's time at +10:00: %s", out)
	}
}

// TestShiftsAppliedFromDiagramTime: a diagram is never applied before its
// own time. One constant diagram of −0.05 m at 2024-05-01T10:00, between
// the test gaugings of 09:00 and 12:00 that day (and one the next day). By
// hand (Kennedy, 1983, USGS TWRI 3-A13, from memory: shifts prorated in
// time from the start of the rating period, applied from the diagram's
// time):
//
//	abrupt, rating from the start of the record: 0, −0.05, −0.05;
//	not abrupt, rating from 2024-05-01T00:00: at 09:00, 9 of 10 hours from
//	  the period's start, 0.9·(−0.05) = −0.045; then −0.05, −0.05;
//	not abrupt, rating without a time: 0, −0.05, −0.05, and a warning that
//	  the diagram has no start to be prorated from.
func TestShiftsAppliedFromDiagramTime(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	for _, tc := range []struct {
		name, rating, abrupt string
		applied              []string
		warning              string
	}{
		{"abrupt", recRatingA, "yes", []string{"0", "-0.05", "-0.05"}, ""},
		{"prorated from the period's start", recRatingA + "@2024-05-01T00:00", "", []string{"-0.045", "-0.05", "-0.05"}, ""},
		{"no start to prorate from", recRatingA, "", []string{"0", "-0.05", "-0.05"}, "is not abrupt, but it is the first of a rating period with no start time"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			shifts := filepath.Join(dir, strings.ReplaceAll(tc.name, " ", "-")+".csv")
			if err := os.WriteFile(shifts, []byte("time,stage,shift,taper,abrupt\n2024-05-01T10:00,,-0.05,,"+tc.abrupt+"\n"), 0o644); err != nil {
				t.Fatal(err)
			}
			out, errs, code := runCLI(t, "shifts", recGaugings, "--rating", tc.rating, "--zero-flow", "0.2", "--shifts", shifts, "--format", "csv")
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errs)
			}
			rows := strings.Split(strings.TrimSpace(out), "\n")
			col := slices.Index(results.ShiftGaugingColumns(), "applied_shift")
			for i, want := range tc.applied {
				if got := strings.Split(rows[i+1], ",")[col]; got != want {
					t.Errorf("gauging %d: applied_shift %q, want %q", i+1, got, want)
				}
			}
			if has := strings.Contains(errs, "no start time"); has != (tc.warning != "") || tc.warning != "" && !strings.Contains(errs, tc.warning) {
				t.Errorf("stderr %q, want warning %q", errs, tc.warning)
			}
		})
	}
}

// TestShiftsPoorBandOpen: the README says a poor gauging's band is open,
// so that it is never marked outside its band unless its uncertainty
// column gives one, and the check does so. On testdata/record/rating-a.csv
// 0.90 m is a row of 5.20 m3/s, so that 7.0 m3/s departs by
// 100·(7.0 − 5.2)/5.2 = 34.6 %: outside the good band (5 %), not outside
// a poor one, outside a given 20 % and not a given 40 %.
func TestShiftsPoorBandOpen(t *testing.T) {
	t.Parallel()
	if text := strings.Join(strings.Fields(readme(t)), " "); !strings.Contains(text, "a poor gauging's band is open, so it is never marked outside its band unless its `uncertainty` column gives one") {
		t.Error("the README's shifts section does not say that a poor gauging's band is open")
	}
	gaugings := filepath.Join(t.TempDir(), "g.csv")
	if err := os.WriteFile(gaugings, []byte("time,stage,discharge,quality,uncertainty\n"+
		"2024-05-01T09:00,0.90,7.0,good,\n2024-05-02T09:00,0.90,7.0,poor,\n2024-05-03T09:00,0.90,7.0,poor,20\n2024-05-04T09:00,0.90,7.0,poor,40\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	out, errs, code := runCLI(t, "shifts", gaugings, "--rating", recRatingA, "--zero-flow", "0.2", "--format", "csv")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	rows := strings.Split(strings.TrimSpace(out), "\n")
	col := slices.Index(results.ShiftGaugingColumns(), "outside_band")
	for i, want := range []string{"true", "false", "true", "false"} {
		if got := strings.Split(rows[i+1], ",")[col]; got != want {
			t.Errorf("row %q: outside_band %q, want %q", rows[i+1], got, want)
		}
	}
}
