package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"wetline/plotting"
	"wetline/survey/results"
)

// Test inputs of the record, shifts and compare commands (invented).
const (
	recStages   = "testdata/record/stage.csv"
	recRatingA  = "testdata/record/rating-a.csv"
	recRatingB  = "testdata/record/rating-b.csv"
	recShifts   = "testdata/record/shifts.csv"
	recGaugings = "testdata/record/gaugings.csv"
)

// recordArgs are the arguments of a record with two rating periods, shift
// diagrams and gaugings.
func recordArgs(extra ...string) []string {
	args := []string{"record", recStages, "--rating", recRatingA, "--rating", recRatingB + "@2024-05-02T12:00",
		"--zero-flow", "0.2", "--shifts", recShifts, "--gaugings", recGaugings, "--max-gap", "4h"}
	return append(args, extra...)
}

// recordGolden is a command line whose standard output is the golden
// file testdata/record/golden/NAME.
type recordGolden struct {
	name string
	args []string
}

// checkRecordGoldens runs each command line in a parallel subtest named
// by its golden file and checks what it writes against that file.
func checkRecordGoldens(t *testing.T, cases []recordGolden) {
	t.Helper()
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			out, errs, code := runCLI(t, tc.args...)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errs)
			}
			golden(t, filepath.Join("record", "golden", tc.name), out)
		})
	}
}

func TestRecordGolden(t *testing.T) {
	t.Parallel()
	checkRecordGoldens(t, []recordGolden{
		{"record.txt", recordArgs()},
		{"record-unit.txt", recordArgs("--unit", "--utc-offset", "+10:00")},
		{"record-daily.csv", recordArgs("--format", "csv")},
		{"record-unit.csv", recordArgs("--unit", "--format", "csv")},
		{"record.json", recordArgs("--format", "json")},
	})
}

// jsonKeys returns the keys of a JSON object in the order written.
func jsonKeys(t *testing.T, data []byte) []string {
	t.Helper()
	dec := json.NewDecoder(bytes.NewReader(data))
	if tok, err := dec.Token(); err != nil || tok != json.Delim('{') {
		t.Fatalf("not a JSON object: %v %v", tok, err)
	}
	var keys []string
	for dec.More() {
		tok, err := dec.Token()
		if err != nil {
			t.Fatal(err)
		}
		keys = append(keys, tok.(string))
		var skip json.RawMessage
		if err := dec.Decode(&skip); err != nil {
			t.Fatal(err)
		}
	}
	return keys
}

// firstOf returns the first element of the list at key of a JSON object.
func firstOf(t *testing.T, data []byte, key string) []byte {
	t.Helper()
	var doc map[string]json.RawMessage
	var list []json.RawMessage
	if err := json.Unmarshal(data, &doc); err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(doc[key], &list); err != nil || len(list) == 0 {
		t.Fatalf("%s is not a list with rows: %v", key, err)
	}
	return list[0]
}

// TestRecordJSONContract: the record's JSON has the keys of the contract,
// in order, then the site, units and the input notes (added after them, as
// every report's JSON adds keys; its ratings name no unit, so it has
// notes), and its rows have exactly the keys of the contract.
func TestRecordJSONContract(t *testing.T) {
	t.Parallel()
	out, errs, code := runCLI(t, recordArgs("--format", "json")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	data := []byte(out)
	for _, c := range []struct {
		got, want []string
	}{
		{jsonKeys(t, data), []string{"unit", "daily", "ratings", "shifts", "warnings", "caution", "site", "units", "input_notes"}},
		// Rows have the CSV tables' columns, in their order.
		{jsonKeys(t, firstOf(t, data, "unit")), []string{"time", "stage", "shift", "effective_stage", "discharge", "flags", "rating_period", "quality"}},
		{jsonKeys(t, firstOf(t, data, "daily")), []string{"date", "mean", "min", "max", "max_time", "coverage", "flags", "min_time", "readings"}},
		{jsonKeys(t, firstOf(t, data, "ratings")), []string{"period", "from", "to", "rating", "zero_flow", "highest_gauging", "extrapolate", "readings", "table", "zero_flow_source"}},
		{jsonKeys(t, firstOf(t, data, "shifts")), []string{"time", "rating_period", "abrupt", "taper", "points", "source"}},
	} {
		if strings.Join(c.got, ",") != strings.Join(c.want, ",") {
			t.Errorf("keys %q, want %q", c.got, c.want)
		}
	}
	var doc struct {
		Caution string
		Daily   []struct{ Mean *float64 }
		Units   map[string]string
	}
	if err := json.Unmarshal(data, &doc); err != nil {
		t.Fatal(err)
	}
	// The record's inputs name metres (stage (m)): SI, as shifts and fit
	// state it.
	if u := doc.Units; u["system"] != "si" || u["length"] != "m" || u["discharge"] != "m3/s" {
		t.Errorf("units %v", u)
	}
	if !strings.Contains(doc.Caution, "provisional") || !strings.Contains(doc.Caution, "verify them against discharge measurements") {
		t.Errorf("caution %q", doc.Caution)
	}
	// --daily leaves the unit values out (null), --unit the daily values.
	for _, c := range []struct{ flag, null string }{{"--daily", "unit"}, {"--unit", "daily"}} {
		out, _, code := runCLI(t, recordArgs("--format", "json", c.flag)...)
		var doc map[string]json.RawMessage
		if code != 0 || json.Unmarshal([]byte(out), &doc) != nil || string(doc[c.null]) != "null" {
			t.Errorf("%s: exit %d, %s = %s", c.flag, code, c.null, doc[c.null])
		}
	}
}

// TestRecordHandComputed: the rating Q = 10·h (rows at 0 and 10 m, linear
// between them), readings every 6 h on 1 January 2024 at 1, 2, 3, 2 and
// 1 m. Trapezoids by hand: ½(10+20)·6 + ½(20+30)·6 + ½(30+20)·6 +
// ½(20+10)·6 = 480 m³/s·h over 24 h, a daily mean of 20 m³/s (the
// discharge of the mean stage, 1.8 m, would be 18). A constant shift of
// +0.5 m adds 5 m³/s everywhere: 25. Hand computation.
func TestRecordHandComputed(t *testing.T) {
	t.Parallel()
	const tol = 1e-9 // round-off on sums of a few products near 100
	for _, c := range []struct {
		shifts []string
		mean   float64
	}{{nil, 20}, {[]string{"--shifts", "testdata/record/constant-shift.csv"}, 25}} {
		args := append([]string{"record", "testdata/record/linear-stage.csv", "--rating", "testdata/record/linear.csv", "--max-gap", "6h", "--format", "json"}, c.shifts...)
		out, errs, code := runCLI(t, args...)
		if code != 0 {
			t.Fatalf("exit %d: %s", code, errs)
		}
		var doc struct {
			Daily []struct {
				Date     string
				Mean     float64
				Coverage float64
				Max      float64
				MaxTime  string `json:"max_time"`
			}
			Unit []struct {
				Shift     float64
				Discharge float64
			}
		}
		if err := json.Unmarshal([]byte(out), &doc); err != nil {
			t.Fatal(err)
		}
		d := doc.Daily[0]
		if math.Abs(d.Mean-c.mean) > tol || d.Coverage != 1 || d.Date != "2024-01-01" || d.MaxTime != "2024-01-01T12:00:00Z" {
			t.Errorf("shifts %v: day %+v, want mean %g", c.shifts, d, c.mean)
		}
		if u := doc.Unit[2]; math.Abs(u.Discharge-(c.mean+10)) > tol {
			t.Errorf("shifts %v: noon %+v", c.shifts, u)
		}
	}
}

// TestRecordRefusals: each mistake exits with its status, names the
// position or flag at fault, and writes nothing.
func TestRecordRefusals(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	write := func(name, body string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	steep := write("steep.csv", "time,stage,shift\n2024-05-01,0.5,0.30\n2024-05-01,0.7,0.05\n")
	repeated := write("repeated.csv", "time,stage\n2024-05-01T00:00,0.5\n2024-05-01T01:00,0.6\n2024-05-01T01:00,0.7\n")
	bad := write("bad.csv", "time,stage\n2024-05-01T00:00,0.5\n2024-05-01T01:00,x\n")
	year1 := write("year1.csv", "time,stage\n0001-01-01T00:00,0.5\n2025-01-01T00:00,0.6\n")
	mixed := write("mixed.csv", "time,stage\n2024-05-01T00:00,0.5\n2024-05-01T01:00Z,0.6\n")
	both := write("both.csv", "time,stage,gauge_height\n2024-05-01T00:00,0.5,0.5\n")
	latin := write("latin.csv", "time,stage\n2024-05-01T00:00,0.5\xb0\n")
	for _, c := range []struct {
		name string
		args []string
		code int
		want string
	}{
		{"no rating", []string{"record", recStages}, 2, "--rating"},
		{"two files", []string{"record", recStages, recStages, "--rating", recRatingA}, 2, "one STAGES file"},
		{"both tables in csv", recordArgs("--unit", "--daily", "--format", "csv"), 2, "CSV file holds one table"},
		{"xlsx to stdout", recordArgs("--format", "xlsx"), 2, "needs -o"},
		{"bad extension", recordArgs("-o", filepath.Join(dir, "r.pdf")), 2, "extension"},
		{"zero max gap", recordArgs("--max-gap", "0s"), 2, "--max-gap"},
		{"bad offset", recordArgs("--utc-offset", "+25:00"), 2, "offset"},
		{"bad rating time", []string{"record", recStages, "--rating", recRatingA + "@yesterday"}, 2, "the time after @"},
		{"two from the beginning", []string{"record", recStages, "--rating", recRatingA, "--rating", recRatingB}, 2, "both come into force from the beginning"},
		{"none without time", []string{"record", recStages, "--rating", "none"}, 2, "none@TIME"},
		{"zero-flow count", []string{"record", recStages, "--rating", recRatingA, "--rating", recRatingB + "@2024-05-02", "--zero-flow", "0.1,0.2,0.3"}, 2, "3 values for 2 --rating"},
		{"gaugings sheet without gaugings", recordArgs()[:5], 2, ""},
		{"refused shift diagram", []string{"record", recStages, "--rating", recRatingA, "--shifts", steep}, 1, "steep.csv:3:3"},
		{"repeated time", []string{"record", repeated, "--rating", recRatingA}, 1, "repeated.csv:4:1"},
		{"bad stage", []string{"record", bad, "--rating", recRatingA}, 1, "bad.csv:3:2"},
		{"missing rating file", []string{"record", recStages, "--rating", filepath.Join(dir, "nope.csv")}, 1, "nope.csv"},
		{"rating time in year 1", []string{"record", recStages, "--rating", recRatingA, "--rating", recRatingB + "@0001-01-01"}, 2, "@0001-01-01: the time after @: year 1 is not a plausible year for a gauge record (1800 to 2200)"},
		{"reading in year 1", []string{"record", year1, "--rating", recRatingA}, 1, `year1.csv:2:1: time "0001-01-01T00:00": year 1 is not a plausible year`},
		{"times with and without an offset", []string{"record", mixed, "--rating", recRatingA}, 1,
			`mixed.csv:3:1: time "2024-05-01T01:00Z": times with and without a UTC offset in one file: row 3 has one, row 2 has none`},
		{"stage and gauge_height", []string{"record", both, "--rating", recRatingA}, 1, "both.csv:1:3: gauge_height: both stage and gauge_height: keep one"},
		{"windows-1252 stage", []string{"record", latin, "--rating", recRatingA}, 1, "latin.csv:2:2: is not UTF-8 text"},
	} {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			if c.name == "gaugings sheet without gaugings" {
				c.args = []string{"record", recStages, "--rating", recRatingA, "--gaugings-sheet", "g"}
				c.want = "--gaugings-sheet needs --gaugings FILE"
			}
			out := filepath.Join(dir, strings.ReplaceAll(c.name, " ", "-")+".json")
			args := append(append([]string(nil), c.args...), "-o", out)
			if strings.Contains(strings.Join(c.args, " "), " -o ") || strings.Contains(c.name, "stdout") {
				args = c.args
			}
			_, errs, code := runCLI(t, args...)
			if code != c.code || !strings.Contains(errs, c.want) {
				t.Errorf("exit %d, want %d; stderr %q should hold %q", code, c.code, errs, c.want)
			}
			if _, err := os.Stat(out); err == nil {
				t.Error("an output file was written")
			}
		})
	}
}

// TestRecordFlagsReadings: a period without a rating gives no discharge
// and flags its readings; a stage beyond every table is outside the
// rating; the record says so in its warnings.
func TestRecordFlagsReadings(t *testing.T) {
	t.Parallel()
	out, errs, code := runCLI(t, "record", recStages, "--rating", recRatingA, "--rating", "none@2024-05-02T00:00", "--max-gap", "4h", "--unit", "--format", "csv")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	lines := strings.Split(strings.TrimSpace(out), "\n")
	if lines[0] != strings.Join(results.RecordUnitColumns(), ",") {
		t.Errorf("header %q", lines[0])
	}
	// 2024-05-02T02:00 is in the period without a rating.
	if !strings.HasPrefix(lines[9], "2024-05-02T02:00:00Z,0.66,,,,no_rating,2,") {
		t.Errorf("row 9 %q", lines[9])
	}
	if !strings.Contains(errs, "have no rating in force") || !strings.Contains(errs, "provisional") {
		t.Errorf("stderr %q", errs)
	}
}

// TestRecordFiles: a workbook with its sheets and the hydrograph, a CSV
// with the console summary, the figure a PNG of the default size.
func TestRecordFiles(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	book := filepath.Join(dir, "record.xlsx")
	plots := filepath.Join(dir, "plots")
	_, errs, code := runCLI(t, recordArgs("-o", book, "--plots", plots, "--site", "Test Creek")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if !strings.Contains(errs, "wrote "+book) || !strings.Contains(errs, "provisional:") || !strings.Contains(errs, "caution:") {
		t.Errorf("summary %q", errs)
	}
	decodeAll(t, plots, []string{"stage-hydrograph.png"}, plotting.DefaultWidth, plotting.DefaultHeight)
	f, err := excelize.OpenFile(book)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	want := []string{results.SheetSummary, results.SheetDaily, results.SheetUnit, results.SheetRatings, results.SheetShifts, results.SheetGaugings, results.SheetPlots}
	if got := f.GetSheetList(); strings.Join(got, "|") != strings.Join(want, "|") {
		t.Errorf("sheets %q, want %q", got, want)
	}
	// The shifts sheet reads back as the diagrams it states.
	_, errs, code = runCLI(t, "record", recStages, "--rating", recRatingA, "--shifts", book, "--shifts-sheet", results.SheetShifts, "--format", "csv")
	if code != 0 {
		t.Errorf("the workbook's shifts sheet does not read back: exit %d: %s", code, errs)
	}
	// The ratings sheet states the periods used and does not read back as
	// a rating file, as WriteRecordWorkbook and README say: its first
	// period starts at "the beginning", no time.
	_, errs, code = runCLI(t, "record", recStages, "--rating", book, "--rating-sheet", results.SheetRatings, "--format", "csv")
	if code != 1 || !strings.Contains(errs, "['ratings']!B2: valid from \"the beginning\": not an ISO 8601 date-time") {
		t.Errorf("the workbook's ratings sheet read as a rating file: exit %d: %s", code, errs)
	}
}

// FuzzUTCOffset: any text is an offset within bounds or an error, and an
// offset written back reads the same.
func FuzzUTCOffset(f *testing.F) {
	for _, s := range []string{"+10:00", "-05:30", "+0930", "Z", "0", "+14:00", "+14:01", "10", "-", "+1:00"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		var o utcOffset
		if err := o.Set(s); err != nil {
			return
		}
		if d := time.Duration(o); d > 14*time.Hour || d < -14*time.Hour {
			t.Fatalf("%q: %v out of bounds", s, d)
		}
		var back utcOffset
		if err := back.Set(o.String()); err != nil || back != o {
			t.Fatalf("%q → %q → %v, %v", s, o.String(), time.Duration(back), err)
		}
	})
}

// TestDemoRecord: the demo's year of record at Tallow Creek holds every
// file it lists, its JSON keeps the contract, its accepted shifts bring
// every gauging within its quality band, and its figures are PNGs of the
// default size.
func TestDemoRecord(t *testing.T) {
	t.Parallel()
	dir, out := demoOutput(t)
	for _, name := range []string{demoStages, demoVisits, demoRating7, demoRating8, demoShifts, demoSurvey2025,
		"tallow-shifts-check.txt", "tallow-shifts-proposed.csv", "tallow-record-2025.txt", "tallow-record-2025-daily.csv",
		"tallow-record-2025-unit.csv", "tallow-record-2025.xlsx", "tallow-rating-7-vs-8.txt", "tallow-xs1-2019-vs-2025.txt"} {
		if _, err := os.Stat(filepath.Join(dir, name)); err != nil {
			t.Error(err)
		}
		if !strings.Contains(out, name) {
			t.Errorf("the demo does not list %s", name)
		}
	}
	data, err := os.ReadFile(filepath.Join(dir, "tallow-record-2025.json"))
	if err != nil {
		t.Fatal(err)
	}
	if got := strings.Join(jsonKeys(t, data), ","); got != "unit,daily,ratings,shifts,warnings,caution,site,units" {
		t.Errorf("keys %s", got)
	}
	var doc struct {
		Unit  []json.RawMessage
		Daily []struct{ Coverage float64 }
	}
	if err := json.Unmarshal(data, &doc); err != nil {
		t.Fatal(err)
	}
	const year = 365 * 96 // 15-minute readings in 2024-25, less the outage
	if len(doc.Unit) >= year || len(doc.Unit) < year-200 || len(doc.Daily) != 365 {
		t.Errorf("%d unit values, %d days", len(doc.Unit), len(doc.Daily))
	}
	text, err := os.ReadFile(filepath.Join(dir, "tallow-record-2025.txt"))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(text), "0 of 13 gaugings lie outside their quality bands from the record") {
		t.Error("the accepted shifts leave gaugings outside their bands")
	}
	for _, f := range []string{"tallow-stage-2025-hydrograph.png", "tallow-visits-2025-shift-time.png", "tallow-visits-2025-shift-stage.png",
		"tallow-rating-7-vs-8-compare.png", "tallow-xs1-2019-vs-2025-overlay.png"} {
		checkPNGSize(t, filepath.Join(dir, f), plotting.DefaultWidth, plotting.DefaultHeight)
	}
	// The proposed diagrams read back as shift diagrams.
	if _, errs, code := runCLI(t, "shifts", filepath.Join(dir, demoVisits), "--rating", filepath.Join(dir, demoRating7),
		"--rating", filepath.Join(dir, demoRating8)+"@2025-02-18T06:00", "--utc-offset", "+10:00", "--zero-flow", "0.32,0.26",
		"--shifts", filepath.Join(dir, "tallow-shifts-proposed.csv"), "--format", "csv"); code != 0 {
		t.Errorf("the proposed diagrams do not read back: exit %d: %s", code, errs)
	}
}

// checkPNGSize checks a file is a PNG of the given size.
func checkPNGSize(t *testing.T, path string, w, h int) {
	t.Helper()
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	cfg, err := png.DecodeConfig(bytes.NewReader(data))
	if err != nil || cfg.Width != w || cfg.Height != h {
		t.Errorf("%s: %d×%d (%v), want %d×%d", path, cfg.Width, cfg.Height, err, w, h)
	}
}

// The stage record's site keys name the site of the record, in its text
// and JSON, as the other readers' do.
func TestRecordStageSite(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	data, err := os.ReadFile("testdata/record/linear-stage.csv")
	if err != nil {
		t.Fatal(err)
	}
	stage := filepath.Join(dir, "stage.csv")
	if err := os.WriteFile(stage, append([]byte("# site: Fernbrook at Old Weir\n# site id: FB-1\n"), data...), 0o644); err != nil {
		t.Fatal(err)
	}
	args := []string{"record", stage, "--rating", "testdata/record/linear.csv", "--max-gap", "6h"}
	out, errs, code := runCLI(t, args...)
	if code != 0 || !strings.Contains(out, "Site: Fernbrook at Old Weir (id FB-1)") {
		t.Errorf("text: exit %d, no site line:\n%.600s\n%s", code, out, errs)
	}
	out, errs, code = runCLI(t, append(args, "--format", "json")...)
	var doc struct {
		Site *struct{ Name, ID string }
	}
	if code != 0 || json.Unmarshal([]byte(out), &doc) != nil || doc.Site == nil || doc.Site.Name != "Fernbrook at Old Weir" || doc.Site.ID != "FB-1" {
		t.Errorf("JSON: exit %d, site %+v\n%s", code, doc.Site, errs)
	}
}

// TestRecordTableFoot: a rating whose first row is dry at the gauge height
// of zero flow is read on the power law of the rows above it between that
// row and the first row with flow: with the e --zero-flow gives, else with
// the stage of the dry first row as e, which an input note says; a table
// with a row of flow first and no --zero-flow is read linearly, with the
// warning asking for e.
//
// Rows (0.2, 0), (0.7, 2), (1.2, 8) with e = 0.2: above 0.7 the law is
// Q = 2·((h − 0.2)/0.5)² (b = ln 4/ln 2 = 2), so at 0.45 m Q = 2·0.25 = 0.5
// (by hand); linear from (0.2, 0) to (0.7, 2) gives 1. Rows (0.45, 0.5),
// (1.2, 8) read linearly give 0.5 + 7.5·0.5/0.75 = 5.5 at 0.95 m (by hand).
func TestRecordTableFoot(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	table := filepath.Join(dir, "foot.csv")
	wet := filepath.Join(dir, "wet.csv")
	stages := filepath.Join(dir, "stage.csv")
	if err := os.WriteFile(table, []byte("stage,discharge\n0.2,0\n0.7,2\n1.2,8\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(wet, []byte("stage,discharge\n0.45,0.5\n1.2,8\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(stages, []byte("time,stage\n2024-10-01T00:00,0.45\n2024-10-01T00:15,0.95\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	const tol = 1e-5 // six significant digits in the CSV
	for _, tc := range []struct {
		name, table string
		extra       []string
		q           []float64
		warning     string
		note        bool
	}{
		{"e given", table, []string{"--zero-flow", "0.2"}, []float64{0.5, 4.5}, "", false},
		{"e from the dry first row", table, nil, []float64{0.5, 4.5}, "", true},
		{"no dry row, e not given", wet, nil, []float64{0.5, 5.5}, "the table has no row without flow and --zero-flow is not given, so it is read linearly", false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			args := append([]string{"record", stages, "--rating", tc.table, "--unit", "--format", "csv"}, tc.extra...)
			out, errs, code := runCLI(t, args...)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errs)
			}
			lines := strings.Split(strings.TrimSpace(out), "\n")
			if len(lines) != 1+len(tc.q) {
				t.Fatalf("unit rows %q", lines)
			}
			for i, want := range tc.q {
				f := strings.Split(lines[i+1], ",")
				var q float64
				if _, err := fmt.Sscan(f[4], &q); err != nil || math.Abs(q-want) > tol*want {
					t.Errorf("row %q: discharge %s, want %g", lines[i+1], f[4], want)
				}
			}
			if warned := strings.Contains(errs, "give the gauge height of zero flow") || strings.Contains(errs, "read linearly"); warned != (tc.warning != "") ||
				tc.warning != "" && !strings.Contains(errs, tc.warning) {
				t.Errorf("warning %q wanted: %s", tc.warning, errs)
			}
			note := "input: " + table + ":2: the gauge height of zero flow e = 0.2 is the stage of the table's last dry row at its foot (--zero-flow not given)"
			if got := strings.Contains(errs, note); got != tc.note {
				t.Errorf("note of the dry first row: %v, want %v: %s", got, tc.note, errs)
			}
		})
	}
}

// A reading far below its rating table (a missing-value code such as -999)
// is a missing reading: the record gives the daily values of the same
// record with that row left out, not a reading rated 0 below zero flow
// that pulls the mean down, and says so once.
func TestRecordMissingValueCode(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	const head = "time,stage\n2026-06-01T00:00,1.5\n2026-06-01T00:15,1.6\n"
	const tail = "2026-06-01T00:45,1.7\n"
	rt := filepath.Join(dir, "r.csv")
	files := map[string]string{"r.csv": "stage,discharge\n0,0\n1,10\n2,40\n3,90\n",
		"code.csv": head + "2026-06-01T00:30,-999\n" + tail, "left-out.csv": head + tail}
	for name, text := range files {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	daily := func(stages string) (string, string) {
		out, errs, code := runCLI(t, "record", filepath.Join(dir, stages), "--rating", rt, "--zero-flow", "0")
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", stages, code, errs)
		}
		i := strings.Index(out, "2026-06-01 ")
		if i < 0 {
			t.Fatalf("%s: no daily row:\n%s", stages, out)
		}
		return out[i : i+strings.Index(out[i:], "\n")], out
	}
	got, out := daily("code.csv")
	want, _ := daily("left-out.csv")
	if got != want {
		t.Errorf("daily row with the code\n%s\nwant that without its row\n%s", got, want)
	}
	if !strings.Contains(out, "1 reading lies below the lowest row of its rating table") || !strings.Contains(out, "left out as missing readings") || strings.Contains(out, "below_zero_flow") {
		t.Errorf("report:\n%s", out)
	}
}

// --daily with --unit writes both tables in text, JSON and a workbook and
// is refused in CSV (one table a file), and the help of --daily says just
// that.
func TestRecordBothTables(t *testing.T) {
	t.Parallel()
	help, _, code := runCLI(t, "record", "--help")
	var daily string
	for _, l := range strings.Split(help, "\n") {
		if strings.HasPrefix(strings.TrimSpace(l), "--daily ") {
			daily = l
		}
	}
	if code != 0 || !strings.Contains(daily, "with --unit too, both tables, in text, JSON or a workbook (a CSV file holds one") {
		t.Errorf("help of --daily %q", daily)
	}
	dir := t.TempDir()
	for _, format := range []string{"text", "json", "xlsx", "csv"} {
		out := filepath.Join(dir, "record."+format)
		_, errs, code := runCLI(t, recordArgs("--daily", "--unit", "-o", out)...)
		if format == "csv" {
			if code != 2 || !strings.Contains(errs, "CSV file holds one table") {
				t.Errorf("csv: exit %d, stderr %q", code, errs)
			}
			continue
		}
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", format, code, errs)
		}
		switch format {
		case "text":
			b, _ := os.ReadFile(out)
			if !strings.Contains(string(b), "\nDaily values") || !strings.Contains(string(b), "\nUnit values") {
				t.Errorf("text lacks a table")
			}
		case "json":
			b, _ := os.ReadFile(out)
			var doc struct{ Unit, Daily []any }
			if err := json.Unmarshal(b, &doc); err != nil || len(doc.Unit) == 0 || len(doc.Daily) == 0 {
				t.Errorf("json: %d unit and %d daily rows (%v)", len(doc.Unit), len(doc.Daily), err)
			}
		case "xlsx":
			f, err := excelize.OpenFile(out)
			if err != nil {
				t.Fatal(err)
			}
			sheets := f.GetSheetList()
			f.Close()
			if !slices.Contains(sheets, results.SheetDaily) || !slices.Contains(sheets, results.SheetUnit) {
				t.Errorf("workbook sheets %q", sheets)
			}
		}
	}
}

// TestRecordGaugeStages: gaugings outside the record's span are left out
// of the check, counted once; each gauging within it gets the recorded
// stage at its time and the difference, flagged beyond the tolerance. By
// hand on testdata/record/stage.csv (max gap 4 h): at 10:30 the record is
// 0.84 + 1.5/3·(1.12 − 0.84) = 0.98 m, so a gauge height of 0.95 m differs
// by −0.03 m, beyond the default 0.02 m but within --stage-tolerance 0.05;
// 14:00 falls in the 5 h gap from 12:00 to 17:00, which is not bridged.
func TestRecordGaugeStages(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	gaugings := filepath.Join(dir, "g.csv")
	body := "time,stage,discharge,quality\n2024-04-30T09:00,0.80,4.0,good\n2024-05-01T10:30,0.95,6.0,good\n2024-05-01T14:00,1.05,7.0,fair\n2024-05-03T09:00,0.60,1.9,good\n"
	if err := os.WriteFile(gaugings, []byte(body), 0o644); err != nil {
		t.Fatal(err)
	}
	args := func(extra ...string) []string {
		return append([]string{"record", recStages, "--rating", recRatingA, "--zero-flow", "0.2", "--gaugings", gaugings, "--max-gap", "4h"}, extra...)
	}
	out, errs, code := runCLI(t, args()...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, want := range []string{
		"shift used  recorded difference\n",
		"     0.980    -0.030!\n", // 10:30
		"         -         -\n",  // 14:00, in the gap
		"  1 of 2 gauge heights differs from the recorded stage by more than 0.02 m\n",
		"warning: 2 of 4 gaugings lie outside the record's span, from 2024-05-01T00:00:00Z to 2024-05-02T23:00:00Z, and are not checked against it (1 before its first reading, 1 after its last)\n",
		"warning: " + gaugings + ":3: gauging of 2024-05-01T10:30:00Z read gauge height 0.95 m where the record gives 0.980 m (linear between the readings of 2024-05-01T09:00:00Z (0.84 m) and 2024-05-01T12:00:00Z (1.12 m)): gauging − record = -0.030 m, more than the tolerance 0.02 m",
		"warning: " + gaugings + ":4: gauging of 2024-05-01T14:00:00Z: no recorded stage",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("the report does not hold %q:\n%s", want, out)
		}
	}
	if strings.Contains(out, "2024-04-30T09:00") || strings.Contains(out, "2024-05-03T09:00") || strings.Count(out, "outside the record's span") != 1 {
		t.Errorf("a gauging outside the span is listed, or the span stated more than once:\n%s", out)
	}
	// --stage-tolerance 0.05 takes the 0.03 m difference.
	out, errs, code = runCLI(t, args("--stage-tolerance", "0.05")...)
	if code != 0 || !strings.Contains(out, "     0.980    -0.030\n") || !strings.Contains(out, "0 of 2 gauge heights differ from the recorded stage by more than 0.05 m") ||
		strings.Contains(out, "more than the tolerance") {
		t.Errorf("--stage-tolerance 0.05: exit %d %s\n%s", code, errs, out)
	}
	// The workbook's gaugings sheet adds the recorded stage and the
	// difference after its columns, then the exclude reason last.
	book := filepath.Join(dir, "r.xlsx")
	if _, errs, code := runCLI(t, args("-o", book)...); code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	f, err := excelize.OpenFile(book)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := f.GetRows(results.SheetGaugings)
	if err != nil {
		t.Fatal(err)
	}
	head := strings.Join(rows[0], "|")
	if !strings.HasSuffix(head, "|flags|recorded stage (m)|stage difference (m)|beyond stage tolerance|exclude") {
		t.Errorf("gaugings sheet header %q", head)
	}
	if len(rows) != 3 {
		t.Fatalf("gaugings sheet rows %q", rows)
	}
	if r := rows[1]; len(r) < 21 || r[18] != "0.980" || r[19] != "-0.030" || r[20] != "yes" {
		t.Errorf("gaugings sheet row %q", r)
	}
	// The tolerance must be a positive length, and needs the gaugings.
	for _, bad := range [][]string{args("--stage-tolerance", "0"), args("--stage-tolerance", "-0.02"), {"record", recStages, "--rating", recRatingA, "--stage-tolerance", "0.05"}} {
		if _, errs, code := runCLI(t, bad...); code != 2 || !strings.Contains(errs, "--stage-tolerance") {
			t.Errorf("%q: exit %d: %s", bad, code, errs)
		}
	}
}

// recordAgainst runs the record of recordArgs checked against the
// gaugings CSV body instead of the test gaugings, and returns its report;
// a run that fails fails t.
func recordAgainst(t *testing.T, body string) string {
	t.Helper()
	gs := filepath.Join(t.TempDir(), "gaugings.csv")
	if err := os.WriteFile(gs, []byte(body), 0o644); err != nil {
		t.Fatal(err)
	}
	args := recordArgs()
	for i, a := range args {
		if a == recGaugings {
			args[i] = gs
		}
	}
	out, errs, code := runCLI(t, args...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	return out
}

// TestRecordExcludedGaugings: a gauging left out by its exclude column is
// marked x in the record's gauging table, listed with its reason and not
// counted outside its band (it is outside: -13.1 % of a good gauging's
// 5 % band, in record.txt).
func TestRecordExcludedGaugings(t *testing.T) {
	t.Parallel()
	out := recordAgainst(t, "time,stage,discharge,quality,exclude\n"+
		"2024-05-01T09:00,0.84,4.10,good,\n2024-05-01T12:00,1.12,7.60,fair,\n2024-05-02T11:00,0.60,1.95,good,meter spin test failed\n")
	for _, want := range []string{"-13.1x", "0 of 3 gaugings (1 excluded) lie outside their quality bands from the record",
		"excluded, never counted outside its band: 2024-05-02T11:00:00Z, meter spin test failed"} {
		if !strings.Contains(out, want) {
			t.Errorf("record report lacks %q:\n%s", want, out)
		}
	}
}

// TestRecordOffsetsDiffer: gaugings whose times carry a UTC offset beside
// a stage record whose times carry none are warned of, unless
// --utc-offset says how to read the record. The gauging is invented.
func TestRecordOffsetsDiffer(t *testing.T) {
	t.Parallel()
	g := filepath.Join(t.TempDir(), "gaugings.csv")
	if err := os.WriteFile(g, []byte("time,stage,discharge,quality\n2024-05-01T16:00+10:00,0.60,1.95,good\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		extra []string
		warn  bool
	}{{nil, true}, {[]string{"--utc-offset", "+10:00"}, false}} {
		args := append([]string{"record", recStages, "--rating", recRatingA, "--gaugings", g}, tc.extra...)
		out, errs, code := runCLI(t, args...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", tc.extra, code, errs)
		}
		if got := strings.Contains(out+errs, "writes its times with a UTC offset (the first +10:00) and "+recStages+" without one, read as UTC"); got != tc.warn {
			t.Errorf("%v: warned %v, want %v: %s", tc.extra, got, tc.warn, errs)
		}
	}
}

// TestRecordWorkbookTimeCells: the ratings and shifts sheets of a record
// workbook hold their times as date cells, as the unit and daily sheets
// do, at the wall clock of --utc-offset, with that offset in a tz column;
// the shifts sheet reads back as the diagrams read from the CSV, whatever
// offset the second run gives.
func TestRecordWorkbookTimeCells(t *testing.T) {
	t.Parallel()
	book := filepath.Join(t.TempDir(), "record.xlsx")
	if _, errs, code := runCLI(t, recordArgs("--utc-offset", "+10:00", "-o", book)...); code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	f, err := excelize.OpenFile(book)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	for _, c := range []struct {
		sheet, time, zone, shown string
	}{
		{results.SheetUnit, "A2", "", "2024-05-01 00:00"},
		{results.SheetRatings, "B6", "F6", "2024-05-02 12:00"}, // rating B, from 2024-05-02T12:00 at +10:00
		{results.SheetShifts, "A2", "H2", "2024-05-01 00:00"},  // the first diagram of testdata/record/shifts.csv
	} {
		raw, err := f.GetCellValue(c.sheet, c.time, excelize.Options{RawCellValue: true})
		if err != nil {
			t.Fatal(err)
		}
		if _, err := strconv.ParseFloat(raw, 64); err != nil {
			t.Errorf("%s!%s holds %q, not a date serial", c.sheet, c.time, raw)
		}
		if shown, _ := f.GetCellValue(c.sheet, c.time); shown != c.shown {
			t.Errorf("%s!%s shows %q, want %q", c.sheet, c.time, shown, c.shown)
		}
		if c.zone != "" {
			if z, _ := f.GetCellValue(c.sheet, c.zone); z != "+10:00" {
				t.Errorf("%s!%s zone %q, want +10:00", c.sheet, c.zone, z)
			}
		}
	}
	diagrams := func(args ...string) string {
		out, errs, code := runCLI(t, append([]string{"record", recStages, "--rating", recRatingA, "--format", "json"}, args...)...)
		if code != 0 {
			t.Fatalf("exit %d: %s", code, errs)
		}
		var doc struct {
			Shifts []struct {
				Time string `json:"time"`
			} `json:"shifts"`
		}
		if err := json.Unmarshal([]byte(out), &doc); err != nil {
			t.Fatal(err)
		}
		var times []string
		for _, s := range doc.Shifts {
			tm, err := time.Parse(time.RFC3339, s.Time)
			if err != nil {
				t.Fatal(err)
			}
			times = append(times, tm.UTC().Format(time.RFC3339))
		}
		return strings.Join(times, " ")
	}
	want := diagrams("--shifts", recShifts, "--utc-offset", "+10:00")
	if got := diagrams("--shifts", book, "--shifts-sheet", results.SheetShifts, "--utc-offset", "-05:00"); got != want {
		t.Errorf("the shifts sheet reads back at %s, want %s", got, want)
	}
}

// TestRecordMissingReadings: a row with a time and no stage is a missing
// reading (README, File formats): every format lists it among the unit
// values, between its neighbours, flagged missing with no discharge, and
// the daily values are those of the record without the row.
func TestRecordMissingReadings(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	data, err := os.ReadFile(recStages)
	if err != nil {
		t.Fatal(err)
	}
	const at = "2024-05-01T04:30"
	with := strings.Replace(string(data), "2024-05-01T06:00,", at+",,\n2024-05-01T06:00,", 1)
	stages := filepath.Join(dir, "stage-missing.csv")
	if err := os.WriteFile(stages, []byte(with), 0o644); err != nil {
		t.Fatal(err)
	}
	args := func(stages string, extra ...string) []string {
		a := []string{"record", stages, "--rating", recRatingA, "--zero-flow", "0.2", "--max-gap", "4h"}
		return append(a, extra...)
	}
	csvOut, errs, code := runCLI(t, args(stages, "--unit", "--format", "csv")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if want := "\n2024-05-01T03:00:00Z,0.55,"; !strings.Contains(csvOut, want+"") {
		t.Fatalf("csv lacks %q:\n%s", want, csvOut)
	}
	if want := "\n2024-05-01T04:30:00Z,,,,,missing,,\n2024-05-01T06:00:00Z,0.61,"; !strings.Contains(csvOut, want) {
		t.Errorf("csv lacks %q:\n%s", want, csvOut)
	}
	jsonOut, errs, code := runCLI(t, args(stages, "--unit", "--format", "json")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if want := `{"time": "2024-05-01T04:30:00Z", "stage": null, "shift": null, "effective_stage": null, "discharge": null, "flags": ["missing"], "rating_period": null, "quality": null}`; !strings.Contains(jsonOut, want) {
		t.Errorf("json lacks %q", want)
	}
	text, errs, code := runCLI(t, args(stages, "--unit")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if !regexp.MustCompile(`\n  2024-05-01T04:30:00Z +- +- +- +- +-  missing\n`).MatchString(text) || !strings.Contains(text, "missing 1;") {
		t.Errorf("text lacks the missing reading:\n%s", text)
	}
	book := filepath.Join(dir, "record.xlsx")
	if _, errs, code := runCLI(t, args(stages, "--unit", "-o", book)...); code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	f, err := excelize.OpenFile(book)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := f.GetRows(results.SheetUnit)
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) < 4 || rows[3][0] != "2024-05-01 04:30" || rows[3][1] != "" || rows[3][4] != "" || rows[3][5] != "missing" {
		t.Errorf("unit sheet rows %q", rows[:min(len(rows), 5)])
	}
	// The daily values are the record's without the row.
	daily := func(stages string) string {
		out, errs, code := runCLI(t, args(stages, "--format", "csv")...)
		if code != 0 {
			t.Fatalf("exit %d: %s", code, errs)
		}
		return out
	}
	if got, want := daily(stages), daily(recStages); got != want {
		t.Errorf("daily values with the missing reading:\n%s\nwithout it:\n%s", got, want)
	}
}

// TestRecordOneGaugingCounted: a record checked against one gauging says
// "the 1 gauging", where it read "0 of 1 gauging lie". The gauging is
// invented (0.84 m, 4.10 m3/s, as in TestRecordExcludedGaugings).
func TestRecordOneGaugingCounted(t *testing.T) {
	t.Parallel()
	out := recordAgainst(t, "time,stage,discharge,quality\n2024-05-01T09:00,0.84,4.10,good\n")
	if !strings.Contains(out, "  the 1 gauging does not lie outside its quality band from the record\n") ||
		!strings.Contains(out, "  the 1 gauge height does not differ from the recorded stage by more than ") || strings.Contains(out, "of 1 gauging") {
		t.Errorf("record report:\n%s", out)
	}
}
