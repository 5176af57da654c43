package main

import (
	"bytes"
	"context"
	"encoding/csv"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"wetline/survey/output"
)

// surveyCSV is a small invented trapezoid-like section with bank marks;
// shift raises every elevation.
func surveyCSV(shift float64) string {
	var b strings.Builder
	b.WriteString("station,elevation,n,mark\n")
	for _, p := range [][2]float64{{0, 5}, {4, 3}, {6, 3}, {8, 0}, {12, 0}, {14, 3}, {18, 3.5}, {20, 5}} {
		mark := ""
		if p[0] == 6 || p[0] == 14 {
			mark = "bank"
		}
		fmt.Fprintf(&b, "%g,%g,0.035,%s\n", p[0], p[1]+shift, mark)
	}
	return b.String()
}

func runArgs(t *testing.T, e *env, args ...string) error {
	t.Helper()
	return run(context.Background(), e, args)
}

func readCSV(t *testing.T, path string) [][]string {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return recs
}

// batchInputs writes n surveys (the one named bad has a bad cell) into a
// new folder and returns it.
func batchInputs(t *testing.T, names ...string) string {
	t.Helper()
	dir := filepath.Join(t.TempDir(), "in")
	if err := os.Mkdir(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	for i, n := range names {
		text := surveyCSV(float64(i))
		if n == "bad" {
			text = strings.Replace(text, "\n8,", "\n8,x", 1)
		}
		if err := os.WriteFile(filepath.Join(dir, n+".csv"), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return dir
}

// TestBatchFolder rates a folder: one table per section, an index in input
// order with bankfull discharge.
func TestBatchFolder(t *testing.T) {
	t.Parallel()
	in := batchInputs(t, "a1", "b2", "c3")
	out := filepath.Join(t.TempDir(), "ratings")
	var stdout, stderr bytes.Buffer
	e := newEnv(&stdout, &stderr, commandTable())
	if err := runArgs(t, e, "rate", in, "--slope", "0.001", "-o", out); err != nil {
		t.Fatal(err)
	}
	idx := readCSV(t, filepath.Join(out, "index.csv"))
	if len(idx) != 4 {
		t.Fatalf("index has %d lines, want 4:\n%v", len(idx), idx)
	}
	for i, want := range []string{"a1", "b2", "c3"} {
		if idx[i+1][0] != want {
			t.Errorf("index row %d is %q, want %q (input order)", i+1, idx[i+1][0], want)
		}
	}
	col := func(name string) int {
		for i, h := range idx[0] {
			if h == name {
				return i
			}
		}
		t.Fatalf("no column %s", name)
		return -1
	}
	// Bankfull is the lower bank top, elevation 3 (+ the shift of 1 for b2).
	if got := idx[2][col("bankfull_stage")]; got != "4" {
		t.Errorf("bankfull stage %q, want 4", got)
	}
	if idx[1][col("bankfull_discharge")] == "" || idx[1][col("rows")] == "0" {
		t.Errorf("row for a1 lacks rows or bankfull discharge: %v", idx[1])
	}
	for _, n := range []string{"a1.csv", "b2.csv", "c3.csv"} {
		recs := readCSV(t, filepath.Join(out, n))
		if recs[0][0] != "stage" || len(recs) < 3 {
			t.Errorf("%s: not a rating table: %v", n, recs[:1])
		}
	}
	if !strings.Contains(stderr.String(), "rated 3 of 3 sections") || !strings.Contains(stderr.String(), "caution:") {
		t.Errorf("stderr:\n%s", stderr.String())
	}
}

// TestBatchFailedWritesNothing rates a folder, makes one survey bad and
// rates it again into the same places: the run exits 1, lists every
// failed section on standard error with file, row and column, and leaves
// the earlier folder and long table byte for byte as they were (a run
// into a new folder creates none).
func TestBatchFailedWritesNothing(t *testing.T) {
	t.Parallel()
	in := batchInputs(t, "a1", "b2", "c3")
	tmp := t.TempDir()
	out, long, fresh := filepath.Join(tmp, "ratings"), filepath.Join(tmp, "long.csv"), filepath.Join(tmp, "new")
	for _, args := range [][]string{{"-o", out}, {"--long", "-o", long}} {
		if err := runArgs(t, newEnv(&bytes.Buffer{}, &bytes.Buffer{}, commandTable()), append([]string{"rate", in, "--slope", "0.001"}, args...)...); err != nil {
			t.Fatal(err)
		}
	}
	before := map[string][]byte{}
	for _, p := range []string{"ratings/a1.csv", "ratings/b2.csv", "ratings/c3.csv", "ratings/index.csv", "long.csv"} {
		b, err := os.ReadFile(filepath.Join(tmp, p))
		if err != nil {
			t.Fatal(err)
		}
		before[p] = b
	}
	for _, n := range []string{"b2", "c3"} { // two bad sections, both reported
		p := filepath.Join(in, n+".csv")
		b, _ := os.ReadFile(p)
		if err := os.WriteFile(p, []byte(strings.Replace(string(b), "\n8,", "\n8,x", 1)), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	for _, args := range [][]string{{"-o", out}, {"--long", "-o", long}, {"-o", fresh}, {"--long"}} {
		var stdout, stderr bytes.Buffer
		err := runArgs(t, newEnv(&stdout, &stderr, commandTable()), append([]string{"rate", in, "--slope", "0.001"}, args...)...)
		if err == nil || !strings.Contains(err.Error(), "2 of 3 sections failed") || !strings.Contains(err.Error(), "nothing was written") {
			t.Errorf("%v: err = %v, want a count of failed sections and nothing written", args, err)
		}
		if exitStatus(err, &bytes.Buffer{}) != 1 {
			t.Errorf("%v: exit status not 1", args)
		}
		for _, n := range []string{"b2", "c3"} {
			if want := "failed: " + n + ": " + filepath.Join(in, n+".csv") + ":5:2: "; !strings.Contains(stderr.String(), want) {
				t.Errorf("%v: stderr lacks %q:\n%s", args, want, stderr.String())
			}
		}
		if stdout.Len() != 0 {
			t.Errorf("%v: standard output holds %q", args, stdout.String())
		}
	}
	for p, want := range before {
		got, err := os.ReadFile(filepath.Join(tmp, p))
		if err != nil || !bytes.Equal(got, want) {
			t.Errorf("%s changed by the failed run (err %v)", p, err)
		}
	}
	if _, err := os.Stat(fresh); !os.IsNotExist(err) {
		t.Errorf("a failed run created %s (%v)", fresh, err)
	}
	ents, _ := os.ReadDir(tmp)
	if len(ents) != 2 {
		t.Errorf("left in the output folder: %v", ents)
	}
}

// TestBatchLong writes one long table with a section column, rows of each
// section together and sections in input order, for files given one by one.
func TestBatchLong(t *testing.T) {
	t.Parallel()
	in := batchInputs(t, "z9", "a1")
	var stdout, stderr bytes.Buffer
	e := newEnv(&stdout, &stderr, commandTable())
	err := runArgs(t, e, "rate", filepath.Join(in, "z9.csv"), filepath.Join(in, "a1.csv"),
		"--slope", "0.001", "--long", "--from", "0", "--to", "5", "--step", "1")
	if err != nil {
		t.Fatal(err, stderr.String())
	}
	recs, err := csv.NewReader(&stdout).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if recs[0][0] != "section" || recs[0][1] != "stage" {
		t.Fatalf("header %v", recs[0])
	}
	var order []string
	for _, r := range recs[1:] {
		if len(order) == 0 || order[len(order)-1] != r[0] {
			order = append(order, r[0])
		}
	}
	if strings.Join(order, ",") != "z9,a1" || len(recs) != 13 {
		t.Errorf("sections in order %v with %d lines, want z9,a1 with 13", order, len(recs))
	}
}

// TestBatchWorkbookSheets rates every survey sheet of a workbook.
func TestBatchWorkbookSheets(t *testing.T) {
	t.Parallel()
	f := excelize.NewFile()
	f.SetSheetName("Sheet1", "XS-1")
	f.NewSheet("remarks")
	f.SetSheetRow("remarks", "A1", &[]any{"date", "crew"})
	f.NewSheet("XS-2")
	for _, sh := range []string{"XS-1", "XS-2"} {
		r := csv.NewReader(strings.NewReader(surveyCSV(0)))
		recs, _ := r.ReadAll()
		for i, rec := range recs {
			row := make([]any, len(rec))
			for j, c := range rec {
				row[j] = c
			}
			cell, _ := excelize.CoordinatesToCellName(1, i+1)
			f.SetSheetRow(sh, cell, &row)
		}
	}
	dir := t.TempDir()
	book := filepath.Join(dir, "reach.xlsx")
	if err := f.SaveAs(book); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "out")
	var stdout, stderr bytes.Buffer
	if err := runArgs(t, newEnv(&stdout, &stderr, commandTable()), "rate", book, "--all-sheets", "--slope", "0.002", "-o", out); err != nil {
		t.Fatal(err, stderr.String())
	}
	idx := readCSV(t, filepath.Join(out, "index.csv"))
	if len(idx) != 3 || idx[1][0] != "XS-1" || idx[2][0] != "XS-2" || idx[2][1] != book+"['XS-2']" {
		t.Errorf("index %v", idx)
	}
}

// TestBatchProgress shows a progress line on a terminal.
func TestBatchProgress(t *testing.T) {
	t.Parallel()
	in := batchInputs(t, "a", "b", "c")
	for _, tty := range []bool{true, false} {
		var stdout, stderr bytes.Buffer
		err := runArgs(t, ttyEnv(&stdout, &stderr, tty), "rate", in, "--slope", "0.001", "--long")
		if err != nil {
			t.Fatal(err)
		}
		if got := strings.Contains(stderr.String(), "\rrating: 3 of 3 sections"); got != tty {
			t.Errorf("terminal %v: progress shown %v:\n%q", tty, got, stderr.String())
		}
	}
}

// TestBatchUsage checks the command-line errors of batch mode.
func TestBatchUsage(t *testing.T) {
	t.Parallel()
	in := batchInputs(t, "a", "b")
	tests := []struct {
		args []string
		want string
	}{
		{[]string{"rate", in, "--slope", "0.001"}, "give -o DIR"},
		{[]string{"rate", in, "-o", "x"}, "--slope"},
		{[]string{"rate", in, "--slope", "0.001", "--long", "--format", "json"}, "--format"},
		{[]string{"rate", in, "--slope", "0.001", "--long", "--stages", "1", "--step", "1"}, "not both"},
	}
	for _, tt := range tests {
		var out bytes.Buffer
		err := runArgs(t, newEnv(&out, &out, commandTable()), tt.args...)
		var ue usageError
		if !errors.As(err, &ue) || !strings.Contains(err.Error(), tt.want) {
			t.Errorf("%v: err %v, want a usage error with %q", tt.args, err, tt.want)
		}
	}
}

// TestBatchRefusesInputs: a batch told to write into its input folder
// (which it would replace whole) is refused before anything is written,
// and the folder is left as it was.
func TestBatchRefusesInputs(t *testing.T) {
	t.Parallel()
	in := batchInputs(t, "a", "b")
	before, _ := os.ReadFile(filepath.Join(in, "a.csv"))
	var out bytes.Buffer
	err := runArgs(t, newEnv(&out, &out, commandTable()), "rate", in, "--slope", "0.001", "-o", in)
	if err == nil {
		t.Fatal("writing tables over the inputs succeeded")
	}
	after, _ := os.ReadFile(filepath.Join(in, "a.csv"))
	if !bytes.Equal(before, after) {
		t.Errorf("input changed")
	}
	if !errors.Is(err, output.ErrInput) || !strings.Contains(err.Error(), in) {
		t.Errorf("err = %v, want ErrInput naming the folder", err)
	}
	if _, err := os.Stat(filepath.Join(in, "index.csv")); !os.IsNotExist(err) {
		t.Errorf("an index was written into the input folder: %v", err)
	}
	ents, _ := os.ReadDir(filepath.Dir(in))
	if len(ents) != 1 {
		t.Errorf("left beside the input folder: %v", ents)
	}
}

// TestDemoBatch runs the demo and checks its batch step: the reach's three
// sections rated without error, with bankfull discharges.
func TestDemoBatch(t *testing.T) {
	t.Parallel()
	dir, _ := demoOutput(t)
	idx := readCSV(t, filepath.Join(dir, "tallow-reach-ratings", "index.csv"))
	if len(idx) != 1+len(demoGaugeReach) {
		t.Fatalf("index %v", idx)
	}
	for _, r := range idx[1:] {
		if r[len(r)-1] != "" || r[7] == "" {
			t.Errorf("section %s: error %q, bankfull discharge %q", r[0], r[len(r)-1], r[7])
		}
	}
}

// TestBatchFolderWarnings rates the demo's reach folder into a folder: the
// sections' warnings (pockets behind higher ground at tallow-xs1 and
// tallow-xs3, the demo's invented ground) are on standard error, each
// after its section, as a CSV table's warnings are (README, Outputs), and
// still in the index's warnings column.
func TestBatchFolderWarnings(t *testing.T) {
	t.Parallel()
	dir, _ := demoOutput(t)
	out := filepath.Join(t.TempDir(), "reach-ratings")
	_, errs, code := runCLI(t, "rate", filepath.Join(dir, "tallow-reach"), "--slope", "0.0012", "-o", out)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	idx := readCSV(t, filepath.Join(out, "index.csv"))
	for _, r := range idx[1:] {
		ws := r[8]
		if (r[0] == "tallow-xs2") != (ws == "") {
			t.Errorf("index: %s has warnings %q", r[0], ws)
		}
		for _, w := range strings.Split(ws, " | ") {
			if w != "" && !strings.Contains(errs, "warning: "+r[0]+": "+w+"\n") {
				t.Errorf("stderr lacks %s's warning %q:\n%s", r[0], w, errs)
			}
		}
	}
	if !strings.Contains(errs, "pockets behind higher ground") {
		t.Errorf("stderr names no pocket:\n%s", errs)
	}
}

// TestBatchMissingFile lists a survey that cannot be opened as a failed
// section; the others are still rated, and no table is written.
func TestBatchMissingFile(t *testing.T) {
	t.Parallel()
	in := batchInputs(t, "a")
	var stdout, stderr bytes.Buffer
	err := runArgs(t, newEnv(&stdout, &stderr, commandTable()), "rate", filepath.Join(in, "a.csv"), filepath.Join(in, "gone.csv"),
		"--slope", "0.001", "--long")
	if err == nil || !strings.Contains(err.Error(), "1 of 2 sections failed") {
		t.Fatalf("err = %v", err)
	}
	if !strings.Contains(stderr.String(), "failed: gone:") || stdout.Len() != 0 {
		t.Errorf("stdout:\n%s\nstderr:\n%s", stdout.String(), stderr.String())
	}
}

// TestBatchFieldTemplate rates a field workbook whose blank cross-section
// sheets (a header, no rows: two cross-section sheets and the coordinate
// sheet) are skipped with a note, not failed; a
// workbook of blank sheets alone rates nothing and fails saying so,
// writing no table (not even a header).
func TestBatchFieldTemplate(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	survey := filepath.Join(dir, "xs.csv")
	if err := os.WriteFile(survey, []byte(surveyCSV(0)), 0o644); err != nil {
		t.Fatal(err)
	}
	field, blank := filepath.Join(dir, "field.xlsx"), filepath.Join(dir, "blank.xlsx")
	for _, args := range [][]string{{"template", "-o", field, "--survey", survey}, {"template", "-o", blank}} {
		if _, errs, code := runCLI(t, args...); code != 0 {
			t.Fatalf("%v: exit %d: %s", args, code, errs)
		}
	}
	out := filepath.Join(dir, "out")
	_, errs, code := runCLI(t, "rate", field, "--all-sheets", "--slope", "0.001", "-o", out)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if !strings.Contains(errs, "rated 1 of 4 sections") || !strings.Contains(errs, "; 3 skipped") ||
		!strings.Contains(errs, "skipped: XS-1: a header and no survey rows") || strings.Contains(errs, "failed") {
		t.Errorf("summary:\n%s", errs)
	}
	idx := readCSV(t, filepath.Join(out, "index.csv"))
	if len(idx) != 5 || idx[1][0] != "xs" || idx[1][2] != "xs.csv" || idx[2][0] != "XS-1" || idx[2][2] != "" ||
		!strings.HasPrefix(idx[2][8], "skipped: ") || idx[2][9] != "" {
		t.Errorf("index %q", idx)
	}
	stdout, errs, code := runCLI(t, "rate", blank, "--all-sheets", "--slope", "0.001", "--long")
	if code != 1 || !strings.Contains(errs, "nothing was rated") || stdout != "" {
		t.Errorf("blank workbook: exit %d, standard output %q:\n%s", code, stdout, errs)
	}
}

// TestRateDefaultStepRaised: a default step finer than the 4 decimals
// stages are written to is raised to 0.0001 with a warning, in a batch
// (per section) as in a single run, so a section 2 mm deep gets a table
// of 21 stages (0.002/0.0001 + 1, by hand), each written apart.
func TestRateDefaultStepRaised(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	in := filepath.Join(dir, "in")
	if err := os.Mkdir(in, 0o755); err != nil {
		t.Fatal(err)
	}
	shallow := filepath.Join(in, "shallow.csv")
	if err := os.WriteFile(shallow, []byte("station,elevation,n\n0,10.002,0.03\n1,10,0.03\n2,10,0.03\n3,10.002,\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(in, "deep.csv"), []byte(surveyCSV(0)), 0o644); err != nil {
		t.Fatal(err)
	}
	const note = "laid out 0.0001 apart instead (21 rows)"
	stagesApart := func(t *testing.T, table string) {
		t.Helper()
		recs := readCSV(t, table)
		if len(recs) != 22 {
			t.Errorf("%s: %d rows, want a header and 21 stages", table, len(recs))
		}
		seen := map[string]bool{}
		for _, r := range recs[1:] {
			if seen[r[0]] {
				t.Errorf("%s: stage %s written twice", table, r[0])
			}
			seen[r[0]] = true
		}
	}

	out := filepath.Join(dir, "out")
	_, errs, code := runCLI(t, "rate", in, "--slope", "0.001", "-o", out)
	if code != 0 {
		t.Fatalf("batch: exit %d: %s", code, errs)
	}
	stagesApart(t, filepath.Join(out, "shallow.csv"))
	index, err := os.ReadFile(filepath.Join(out, "index.csv"))
	if err != nil {
		t.Fatal(err)
	}
	if strings.Count(string(index), note) != 1 {
		t.Errorf("the index does not warn once of the raised step:\n%s", index)
	}

	one := filepath.Join(dir, "shallow-rating.csv")
	_, errs, code = runCLI(t, "rate", shallow, "--slope", "0.001", "-o", one)
	if code != 0 {
		t.Fatalf("single run: exit %d: %s", code, errs)
	}
	stagesApart(t, one)
	if !strings.Contains(errs, "warning: the stage range from 10 to 10.002 is too short for about 50 rows") || !strings.Contains(errs, note) {
		t.Errorf("single run: no warning of the raised step:\n%s", errs)
	}
}

// TestRateNoDepth: with default stages, a flat section (every point at one
// elevation) and one shallower than the 0.0001 its table writes stages
// apart are faults of the survey: exit 1, naming the file and that the
// section has no depth to rate, alone or in a batch. Asked for with
// --from/--to, the same too-narrow range stays a command-line mistake.
func TestRateNoDepth(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	flat := filepath.Join(dir, "flat.csv")
	shallow := filepath.Join(dir, "shallow.csv")
	for p, text := range map[string]string{
		flat:    "station,elevation,n\n0,10,0.03\n1,10,0.03\n2,10,0.03\n",
		shallow: "station,elevation,n\n0,10.00005,0.03\n1,10,0.03\n2,10.00005,0.03\n",
	} {
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	for _, tc := range []struct {
		args []string
		code int
		want []string
	}{
		{[]string{flat}, 1, []string{"wetline: " + flat + ": the section has no depth to rate"}},
		{[]string{shallow}, 1, []string{"wetline: " + shallow + ": the section has no depth to rate", "5e-05 below"}},
		{[]string{flat, shallow, "--long"}, 1, []string{"failed: flat: " + flat + ": the section has no depth to rate",
			"failed: shallow: " + shallow + ": the section has no depth to rate"}},
		{[]string{shallow, "--from", "10", "--to", "10.00005"}, 2, []string{"give a wider --from/--to range"}},
	} {
		_, errs, code := runCLI(t, append([]string{"rate", "--slope", "0.001"}, tc.args...)...)
		if code != tc.code {
			t.Errorf("%v: exit %d, want %d:\n%s", tc.args, code, tc.code, errs)
		}
		for _, w := range tc.want {
			if !strings.Contains(errs, w) {
				t.Errorf("%v: stderr lacks %q:\n%s", tc.args, w, errs)
			}
		}
		if tc.code == 1 && strings.Contains(errs, "--from/--to") {
			t.Errorf("%v: a survey fault blamed on a range flag:\n%s", tc.args, errs)
		}
	}
}
