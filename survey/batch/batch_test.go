package batch_test

import (
	"archive/zip"
	"bytes"
	"context"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"maps"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"wetline/rating"
	"wetline/survey/batch"
	"wetline/survey/output"
	"wetline/survey/results"
)

// trapezoid is an invented section: a trapezoidal channel 4 m wide at the
// bed, 1 m deep, side slopes 1:1, bank marks at its top (elevation 1),
// then flat overbanks to walls at elevation 2.
const trapezoid = `station,elevation,n,mark
0,2,0.05,
1,1,0.05,
5,1,0.03,bank
6,0,0.03,
10,0,0.03,
11,1,0.05,bank
15,1,0.05,
16,2,,
`

// headerOnly is a survey table with a header and no rows, as the field
// workbook's blank cross-section sheets are.
const headerOnly = "station,elevation,n,mark\n"

// writeFile writes a test input file.
func writeFile(t *testing.T, path, text string) {
	t.Helper()
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
}

// writeBook writes a workbook with one sheet per {name, CSV text}.
func writeBook(t *testing.T, path string, sheets ...[2]string) {
	t.Helper()
	f := excelize.NewFile()
	defer f.Close()
	for i, sh := range sheets {
		if i == 0 {
			f.SetSheetName("Sheet1", sh[0])
		} else if _, err := f.NewSheet(sh[0]); err != nil {
			t.Fatal(err)
		}
		recs, err := csv.NewReader(strings.NewReader(sh[1])).ReadAll()
		if err != nil {
			t.Fatal(err)
		}
		for r, rec := range recs {
			row := make([]any, len(rec))
			for j, c := range rec {
				row[j] = c
			}
			cell, _ := excelize.CoordinatesToCellName(1, r+1)
			if err := f.SetSheetRow(sh[0], cell, &row); err != nil {
				t.Fatal(err)
			}
		}
	}
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
}

// spoilSheet replaces the XML of sheet n (1-based) of a workbook with a
// row whose number is not a number, so that reading that sheet fails and
// the others still read.
func spoilSheet(t *testing.T, path string, n int) {
	t.Helper()
	spoiled := fmt.Sprintf("xl/worksheets/sheet%d.xml", n)
	rewriteBook(t, path, nil, func(name string, b []byte) []byte {
		if name == spoiled {
			return []byte(`<worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData><row r="x"><c r="A1"><v>1</v></c></row></sheetData></worksheet>`)
		}
		return b
	})
}

// linkBook adds to a workbook the parts of a link to another workbook
// (an external link and its relationship naming the file), as a
// spreadsheet program saves a formula reading a cell of another file.
func linkBook(t *testing.T, path, other string) {
	t.Helper()
	rewriteBook(t, path, map[string]string{
		"xl/externalLinks/externalLink1.xml": `<?xml version="1.0"?><externalLink xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><externalBook/></externalLink>`,
		"xl/externalLinks/_rels/externalLink1.xml.rels": `<?xml version="1.0"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">` +
			`<Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/externalLinkPath" Target="` + other + `" TargetMode="External"/></Relationships>`,
	}, nil)
}

// rewriteBook rewrites the zip of a workbook, each part through edit (when
// not nil), and adds the parts of extra.
func rewriteBook(t *testing.T, path string, extra map[string]string, edit func(name string, b []byte) []byte) {
	t.Helper()
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	zr, err := zip.NewReader(bytes.NewReader(data), int64(len(data)))
	if err != nil {
		t.Fatal(err)
	}
	var out bytes.Buffer
	zw := zip.NewWriter(&out)
	put := func(name string, b []byte) {
		w, err := zw.Create(name)
		if err != nil {
			t.Fatal(err)
		}
		if _, err := w.Write(b); err != nil {
			t.Fatal(err)
		}
	}
	for _, zf := range zr.File {
		rc, err := zf.Open()
		if err != nil {
			t.Fatal(err)
		}
		b, err := io.ReadAll(rc)
		rc.Close()
		if err != nil {
			t.Fatal(err)
		}
		if edit != nil {
			b = edit(zf.Name, b)
		}
		put(zf.Name, b)
	}
	for _, name := range slices.Sorted(maps.Keys(extra)) {
		put(name, []byte(extra[name]))
	}
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, out.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
}

// jobWords writes jobs as "name→output" (with "!" when the job already
// failed), for comparing listings.
func jobWords(jobs []batch.Job) []string {
	var out []string
	for _, j := range jobs {
		w := j.Name + "→" + j.Output
		if j.Err != nil {
			w += "!"
		}
		out = append(out, w)
	}
	return out
}

func TestList(t *testing.T) {
	root := t.TempDir()
	// A folder: CSV files and a workbook in name order; hidden files,
	// sub-folders and other files left out; a workbook gives its survey
	// sheets (blank ones too: they are skipped when rated), not its notes.
	field := filepath.Join(root, "field")
	writeFile(t, filepath.Join(field, "b.csv"), trapezoid)
	writeFile(t, filepath.Join(field, "a.csv"), trapezoid)
	writeFile(t, filepath.Join(field, ".hidden.csv"), trapezoid)
	writeFile(t, filepath.Join(field, "readme.txt"), "notes")
	writeFile(t, filepath.Join(field, "sub", "c.csv"), trapezoid)
	writeBook(t, filepath.Join(field, "m.xlsx"), [2]string{"XS-1", trapezoid}, [2]string{"notes", "what,who\n"}, [2]string{"XS-2", headerOnly})
	// Names alike in two folders, and a section named like the index.
	again := filepath.Join(root, "again")
	writeFile(t, filepath.Join(again, "a.csv"), trapezoid)
	writeFile(t, filepath.Join(again, "index.csv"), trapezoid)
	writeFile(t, filepath.Join(again, "A.csv"), trapezoid)
	// A workbook with no survey sheet, and one whose second sheet cannot
	// be read.
	noSurvey := filepath.Join(root, "notes.xlsx")
	writeBook(t, noSurvey, [2]string{"notes", "what,who\n"})
	spoiled := filepath.Join(root, "spoiled.xlsx")
	writeBook(t, spoiled, [2]string{"XS-1", trapezoid}, [2]string{"XS-2", trapezoid}, [2]string{"XS-3", trapezoid})
	spoilSheet(t, spoiled, 2)
	empty := filepath.Join(root, "empty")
	if err := os.Mkdir(empty, 0o755); err != nil {
		t.Fatal(err)
	}

	tests := []struct {
		name  string
		args  []string
		sheet string
		want  []string
		err   error
	}{
		{"folder", []string{field}, "", []string{"a→a.csv", "b→b.csv", "XS-1→XS-1.csv", "XS-2→XS-2.csv"}, nil},
		{"names alike", []string{filepath.Join(field, "a.csv"), again}, "",
			// A.csv and a.csv clash on a file system that folds case.
			[]string{"a→a.csv", "A (A-2)→A-2.csv", "a (a-3)→a-3.csv", "index (index-2)→index-2.csv"}, nil},
		{"named sheet", []string{filepath.Join(field, "m.xlsx")}, "XS-2", []string{"XS-2→XS-2.csv"}, nil},
		{"no survey sheet", []string{noSurvey}, "", []string{"notes→notes.csv!"}, nil},
		{"a sheet that cannot be read fails alone", []string{spoiled}, "", []string{"XS-1→XS-1.csv", "XS-2→XS-2.csv!", "XS-3→XS-3.csv"}, nil},
		{"missing file: fails when rated", []string{filepath.Join(root, "gone.csv")}, "", []string{"gone→gone.csv"}, nil},
		{"empty folder", []string{empty}, "", nil, batch.ErrNoSurveys},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			jobs, files, err := batch.List(tc.args, tc.sheet, "csv")
			if !errors.Is(err, tc.err) {
				t.Fatalf("err %v, want %v", err, tc.err)
			}
			if err != nil {
				return
			}
			if got := jobWords(jobs); !slices.Equal(got, tc.want) {
				t.Errorf("jobs %q, want %q", got, tc.want)
			}
			for _, j := range jobs {
				if !slices.Contains(files, j.Path) {
					t.Errorf("input %s of job %s not among the files %q", j.Path, j.Name, files)
				}
			}
		})
	}

	jobs, _, _ := batch.List([]string{noSurvey}, "", "csv")
	if !errors.Is(jobs[0].Err, batch.ErrNoSurveySheet) {
		t.Errorf("workbook without surveys: %v, want ErrNoSurveySheet", jobs[0].Err)
	}
	jobs, _, _ = batch.List([]string{spoiled}, "", "csv")
	if e := jobs[1].Err; e == nil || !strings.Contains(e.Error(), "XS-2") {
		t.Errorf("the spoiled sheet's error %v does not name it", e)
	}
}

// rateOptions rates at 0.25 m steps from the bed to 2 m.
func rateOptions() batch.Options {
	return batch.Options{Stages: rating.StageSpec{From: 0, To: 2, FromSet: true, ToSet: true, Step: 0.25},
		Rating: rating.Options{Slope: 0.001}, Workers: 2}
}

// Rate rates a survey, skips one with a header and no rows (CSV file or
// sheet, stations or coordinates), and fails the others with their error.
func TestRate(t *testing.T) {
	dir := t.TempDir()
	book := filepath.Join(dir, "field.xlsx")
	writeBook(t, book, [2]string{"XS-1", trapezoid}, [2]string{"XS-2", headerOnly})
	files := map[string]string{
		"good.csv":   trapezoid,
		"blank.csv":  headerOnly,
		"coords.csv": "easting,northing,elevation\n",
		"one.csv":    "station,elevation\n0,1\n",
		"bad.csv":    strings.Replace(trapezoid, "6,0,", "6,x,", 1),
		"nohead.csv": "a,b\n",
	}
	for name, text := range files {
		writeFile(t, filepath.Join(dir, name), text)
	}
	tests := []struct {
		job     batch.Job
		rows    int    // rated rows; 0 when skipped or failed
		skipped bool   // skipped with SkippedNote
		err     string // in the error, "" when none
	}{
		{batch.Job{Path: filepath.Join(dir, "good.csv"), Name: "good"}, 9, false, ""},
		{batch.Job{Path: book, Sheet: "XS-1", Name: "XS-1"}, 9, false, ""},
		{batch.Job{Path: filepath.Join(dir, "blank.csv"), Name: "blank"}, 0, true, ""},
		{batch.Job{Path: book, Sheet: "XS-2", Name: "XS-2"}, 0, true, ""},
		{batch.Job{Path: filepath.Join(dir, "coords.csv"), Name: "coords"}, 0, true, ""},
		// One point is a survey begun, not a blank sheet: it fails.
		{batch.Job{Path: filepath.Join(dir, "one.csv"), Name: "one"}, 0, false, "at least two points"},
		{batch.Job{Path: filepath.Join(dir, "bad.csv"), Name: "bad"}, 0, false, "bad.csv:5:2"},
		{batch.Job{Path: filepath.Join(dir, "nohead.csv"), Name: "nohead"}, 0, false, "station"},
		{batch.Job{Path: filepath.Join(dir, "gone.csv"), Name: "gone"}, 0, false, "gone.csv"},
		{batch.Job{Path: book, Sheet: "XS-9", Name: "XS-9"}, 0, false, "no such sheet"},
		{batch.Job{Path: book, Name: "listed", Err: errors.New("found bad while listing")}, 0, false, "found bad while listing"},
	}
	for _, tc := range tests {
		t.Run(tc.job.Name, func(t *testing.T) {
			r := batch.Rate(tc.job, rateOptions())
			en := r.Entry
			if en.Section != tc.job.Name || en.Source != tc.job.Source() {
				t.Errorf("entry names %q from %q", en.Section, en.Source)
			}
			if en.Rows != tc.rows || len(r.Table.Rows) != tc.rows {
				t.Errorf("%d rows (table %d), want %d", en.Rows, len(r.Table.Rows), tc.rows)
			}
			if (en.Skipped == batch.SkippedNote) != tc.skipped || (!tc.skipped && en.Skipped != "") {
				t.Errorf("skipped %q, want skipped %v", en.Skipped, tc.skipped)
			}
			if (tc.err == "") != (en.Err == "") || !strings.Contains(en.Err, tc.err) {
				t.Errorf("error %q, want one with %q", en.Err, tc.err)
			}
			if strings.Contains(en.Err, "\n") {
				t.Errorf("error on several lines: %q", en.Err)
			}
		})
	}
}

// The index entry of a rated section: its stage range, and its bankfull
// stage (the lower bank top) and the discharge computed there, checked
// against Manning's equation for the full trapezoid (Chow, 1959): area
// A = (4 + 1)·1 = 5 m², wetted perimeter P = 4 + 2√2 m, and
// Q = (1/n)·A·(A/P)^(2/3)·√S.
func TestRateBankfull(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "xs.csv")
	writeFile(t, path, trapezoid)
	r := batch.Rate(batch.Job{Path: path, Name: "xs"}, rateOptions())
	en := r.Entry
	if en.Err != "" {
		t.Fatal(en.Err)
	}
	a, p := 5.0, 4+2*math.Sqrt2
	want := a * math.Pow(a/p, 2.0/3) * math.Sqrt(0.001) / 0.03
	const closeQ = 1e-9 // relative: the same formula, summed in another order
	if en.BankfullStage != 1 || math.Abs(en.BankfullDischarge-want) > closeQ*want {
		t.Errorf("bankfull %g m, %g m3/s; want 1 m, %g m3/s", en.BankfullStage, en.BankfullDischarge, want)
	}
	if en.StageMin != 0 || en.StageMax != 2 {
		t.Errorf("stages %g to %g, want 0 to 2", en.StageMin, en.StageMax)
	}
}

// TestSummaryErr: a batch is clean (its output may be put in place)
// exactly when it ends without an error.
func TestSummaryErr(t *testing.T) {
	rated := results.IndexEntry{Section: "a"}
	failed := results.IndexEntry{Section: "b", Err: "bad cell"}
	skipped := results.IndexEntry{Section: "c", Skipped: batch.SkippedNote}
	for _, tc := range []struct {
		name    string
		entries []results.IndexEntry
		want    error
		words   string
	}{
		{"all rated", []results.IndexEntry{rated, rated}, nil, ""},
		{"some skipped", []results.IndexEntry{rated, skipped}, nil, ""},
		{"one failed", []results.IndexEntry{rated, failed, skipped}, batch.ErrFailed, "1 of 3 sections failed (each is listed with its error above)"},
		{"all skipped", []results.IndexEntry{skipped, skipped}, batch.ErrNothingRated, "2 skipped"},
		{"none", nil, nil, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var s batch.Summary
			for _, en := range tc.entries {
				s.Entries = append(s.Entries, en)
				switch {
				case en.Err != "":
					s.Failed++
				case en.Skipped != "":
					s.Skipped++
				}
			}
			err := s.Err("above")
			if !errors.Is(err, tc.want) || (tc.want == nil) != (err == nil) || (err != nil && !strings.Contains(err.Error(), tc.words)) {
				t.Errorf("err %v, want %v with %q", err, tc.want, tc.words)
			}
			// A batch ending with an error is never put in place.
			if s.Clean() != (err == nil) {
				t.Errorf("Clean() = %v with err %v", s.Clean(), err)
			}
		})
	}
}

// readIndex reads an index table as rows of cells by column name.
func readIndex(t *testing.T, path string) []map[string]string {
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
	if !slices.Equal(recs[0], results.IndexColumns()) {
		t.Fatalf("index header %q", recs[0])
	}
	var out []map[string]string
	for _, rec := range recs[1:] {
		m := map[string]string{}
		for i, c := range rec {
			m[recs[0][i]] = c
		}
		out = append(out, m)
	}
	return out
}

// folderInputs writes a folder of surveys: two rated, a blank field
// workbook sheet beside a filled one, and a bad cell.
func folderInputs(t *testing.T) string {
	t.Helper()
	in := filepath.Join(t.TempDir(), "in")
	writeFile(t, filepath.Join(in, "a.csv"), trapezoid)
	writeFile(t, filepath.Join(in, "b.csv"), strings.Replace(trapezoid, "6,0,", "6,x,", 1))
	writeBook(t, filepath.Join(in, "field.xlsx"), [2]string{"XS-1", trapezoid}, [2]string{"XS-2", headerOnly})
	return in
}

// Folder writes one table per rated section and an index listing every
// section in input order (output, rows, bankfull, warnings with the
// skipped note, errors), reaching the destination only at Commit.
func TestFolder(t *testing.T) {
	in := folderInputs(t)
	jobs, inputs, err := batch.List([]string{in}, "", "csv")
	if err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(t.TempDir(), "ratings")
	files := output.New(inputs...)
	sum, err := batch.Folder(context.Background(), files, out, "csv", jobs, rateOptions())
	if err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(out); !os.IsNotExist(err) {
		t.Fatalf("the folder exists before Commit: %v", err)
	}
	if err := files.Commit(); err != nil {
		t.Fatal(err)
	}
	if sum.Failed != 1 || sum.Skipped != 1 || len(sum.Entries) != 4 {
		t.Errorf("summary: %d failed, %d skipped of %d", sum.Failed, sum.Skipped, len(sum.Entries))
	}
	if err := sum.Err("in the index"); !errors.Is(err, batch.ErrFailed) {
		t.Errorf("err %v, want ErrFailed", err)
	}
	idx := readIndex(t, filepath.Join(out, batch.IndexFile))
	want := []struct{ section, output, rows, warning, err string }{
		{"a", "a.csv", "9", "", ""},
		{"b", "", "0", "", "b.csv:5:2"},
		{"XS-1", "XS-1.csv", "9", "", ""},
		{"XS-2", "", "0", "skipped: " + batch.SkippedNote, ""},
	}
	if len(idx) != len(want) {
		t.Fatalf("index has %d rows, want %d", len(idx), len(want))
	}
	for i, w := range want {
		r := idx[i]
		if r["section"] != w.section || r["output"] != w.output || r["rows"] != w.rows ||
			!strings.HasPrefix(r["warnings"], w.warning) || (w.err == "") != (r["error"] == "") || !strings.Contains(r["error"], w.err) {
			t.Errorf("index row %d: %v, want %+v", i+1, r, w)
		}
	}
	if idx[0]["bankfull_stage"] != "1" || idx[0]["bankfull_discharge"] == "" {
		t.Errorf("bankfull of a: %q, %q", idx[0]["bankfull_stage"], idx[0]["bankfull_discharge"])
	}
	ents, err := os.ReadDir(out)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, e := range ents {
		names = append(names, e.Name())
	}
	if !slices.Equal(names, []string{"XS-1.csv", "a.csv", batch.IndexFile}) {
		t.Errorf("folder holds %q", names)
	}
}

// IndexedFiles reads the output column of an index, wherever it stands;
// a table without one is not an index.
func TestIndexedFiles(t *testing.T) {
	for _, c := range []struct {
		index, want string
		err         error
	}{
		{"section,source,output,rows\nXS-1,a.csv,XS-1.csv,3\nXS-2,b.csv,,0\n", "[XS-1.csv]", nil},
		{"output\na.json\nb.json\n", "[a.json b.json]", nil},
		{"\ufeffoutput,section\na.csv,a\n", "[a.csv]", nil},
		{"site,photo\nmill lane,1\n", "[]", batch.ErrIndex},
		{"", "[]", batch.ErrIndex},
	} {
		got, err := batch.IndexedFiles([]byte(c.index))
		if !errors.Is(err, c.err) || (err == nil && fmt.Sprint(got) != c.want) {
			t.Errorf("IndexedFiles(%q) = %v, %v; want %s, %v", c.index, got, err, c.want, c.err)
		}
	}
}

// The folder swap: an earlier batch output (holding an index) is replaced
// whole at Commit, a run discarded leaves it as it was, and a folder that
// is not a batch output is refused before anything is rated.
func TestFolderSwap(t *testing.T) {
	in := folderInputs(t)
	jobs, inputs, err := batch.List([]string{filepath.Join(in, "a.csv")}, "", "json")
	if err != nil {
		t.Fatal(err)
	}
	base := t.TempDir()
	earlier := filepath.Join(base, "earlier")
	writeFile(t, filepath.Join(earlier, batch.IndexFile), "section,source,output\nold,old.csv,old.csv\n")
	writeFile(t, filepath.Join(earlier, "old.csv"), "stage,discharge\n")
	foreign := filepath.Join(base, "foreign")
	writeFile(t, filepath.Join(foreign, "notes.txt"), "keep me")

	// Discarded: the earlier output stays whole.
	files := output.New(inputs...)
	if _, err := batch.Folder(context.Background(), files, earlier, "json", jobs, rateOptions()); err != nil {
		t.Fatal(err)
	}
	files.Discard()
	if _, err := os.Stat(filepath.Join(earlier, "old.csv")); err != nil {
		t.Errorf("a discarded run changed the earlier output: %v", err)
	}
	// Committed: replaced whole.
	files = output.New(inputs...)
	if _, err := batch.Folder(context.Background(), files, earlier, "json", jobs, rateOptions()); err != nil {
		t.Fatal(err)
	}
	if err := files.Commit(); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(earlier, "old.csv")); !os.IsNotExist(err) {
		t.Errorf("old.csv survived the swap: %v", err)
	}
	if idx := readIndex(t, filepath.Join(earlier, batch.IndexFile)); len(idx) != 1 || idx[0]["output"] != "a.json" {
		t.Errorf("index after the swap %v", idx)
	}
	if b, err := os.ReadFile(filepath.Join(earlier, "a.json")); err != nil || !bytes.HasPrefix(b, []byte("{")) {
		t.Errorf("a.json: %v", err)
	}
	// Refused: not a batch output.
	files = output.New(inputs...)
	rated := 0
	opt := rateOptions()
	opt.Progress = func(int, int) { rated++ }
	if _, err := batch.Folder(context.Background(), files, foreign, "csv", jobs, opt); !errors.Is(err, output.ErrForeignFolder) {
		t.Errorf("err %v, want ErrForeignFolder", err)
	}
	files.Discard()
	if rated != 0 {
		t.Errorf("%d sections rated into a refused folder", rated)
	}
	if b, _ := os.ReadFile(filepath.Join(foreign, "notes.txt")); string(b) != "keep me" {
		t.Errorf("the foreign folder changed")
	}
	// The input folder itself is refused: it would be replaced whole.
	files = output.New(inputs...)
	if _, err := batch.Folder(context.Background(), files, in, "csv", jobs, rateOptions()); !errors.Is(err, output.ErrInput) {
		t.Errorf("err %v, want ErrInput", err)
	}
	files.Discard()
}

// Long writes the rows of rated sections only, section by section in
// input order, and lists every section in its summary.
func TestLong(t *testing.T) {
	in := folderInputs(t)
	jobs, _, err := batch.List([]string{in}, "", "csv")
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	sum, err := batch.Long(context.Background(), &buf, jobs, rateOptions())
	if err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(&buf).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	var order []string
	for _, r := range recs[1:] {
		if len(order) == 0 || order[len(order)-1] != r[0] {
			order = append(order, r[0])
		}
	}
	if !slices.Equal(order, []string{"a", "XS-1"}) || len(recs) != 1+2*9 {
		t.Errorf("sections %q in %d lines, want a and XS-1 in 19", order, len(recs))
	}
	if sum.Failed != 1 || sum.Skipped != 1 || len(sum.Entries) != 4 {
		t.Errorf("summary: %d failed, %d skipped of %d", sum.Failed, sum.Skipped, len(sum.Entries))
	}
}

// Run emits results in input order whatever the number of workers, and
// stops when emit fails.
func TestRunOrderAndStop(t *testing.T) {
	dir := t.TempDir()
	var jobs []batch.Job
	for i := range 12 {
		p := filepath.Join(dir, fmt.Sprintf("s%02d.csv", i))
		writeFile(t, p, trapezoid)
		jobs = append(jobs, batch.Job{Path: p, Name: fmt.Sprintf("s%02d", i)})
	}
	for _, workers := range []int{1, 3, 8} {
		opt := rateOptions()
		opt.Workers = workers
		var got []string
		err := batch.Run(context.Background(), jobs, opt, func(i int, r batch.Result) error {
			got = append(got, r.Entry.Section)
			return nil
		})
		if err != nil || len(got) != len(jobs) || !slices.IsSorted(got) {
			t.Errorf("%d workers: %q (%v)", workers, got, err)
		}
	}
	stop := errors.New("stop")
	n := 0
	err := batch.Run(context.Background(), jobs, rateOptions(), func(i int, r batch.Result) error {
		if n++; n == 3 {
			return stop
		}
		return nil
	})
	if !errors.Is(err, stop) || n != 3 {
		t.Errorf("after emit failed: %v, %d emitted", err, n)
	}
	// A context cancelled midway stops the batch with its cause, so that
	// the caller can tell an interrupt from a failure.
	why := errors.New("interrupted by a signal")
	ctx, cancel := context.WithCancelCause(context.Background())
	n = 0
	err = batch.Run(ctx, jobs, rateOptions(), func(i int, r batch.Result) error {
		if n++; n == 2 {
			cancel(why)
		}
		return nil
	})
	if !errors.Is(err, why) || n != 2 {
		t.Errorf("after the context was cancelled: %v, %d emitted", err, n)
	}
}

// feetBox is the QA survey of a section in feet: a rectangle 20 ft wide
// with walls 10 ft high, n 0.03, its units in the headers.
const feetBox = `# site: Owl Run near Hobb's Ford
station (ft),elevation (ft),n
0,10,0.03
0,0,0.03
20,0,0.03
20,10,
`

// metreBox is the same rectangle with its headers in metres.
var metreBox = strings.ReplaceAll(feetBox, "(ft)", "(m)")

// Every section of a batch is rated in the units its headers name, as a
// single run rates it; a section in another system than the first one
// rated fails, naming its column, and --units the headers contradict
// fails naming the column.
//
// Hand value (Manning's equation, Chow 1959, eq. 5-7, US customary
// k = 1.486): stage 2 ft in the 20 ft rectangle, A = 40 ft2,
// P = 20 + 2*2 = 24 ft, R = 40/24 = 1.6667 ft, R^(2/3) = 1.40572;
// Q = 1.486/0.03 * 40 * 1.40572 * sqrt(0.001) = 49.5333 * 40 * 1.40572 *
// 0.0316228 = 88.08 ft3/s (with k = 1, as the defect did: 59.27).
func TestBatchHeaderUnits(t *testing.T) {
	dir := t.TempDir()
	writeFile(t, filepath.Join(dir, "ft.csv"), feetBox)
	writeFile(t, filepath.Join(dir, "ft2.csv"), feetBox)
	writeFile(t, filepath.Join(dir, "m.csv"), metreBox)
	writeFile(t, filepath.Join(dir, "plain.csv"), strings.ReplaceAll(feetBox, " (ft)", ""))
	book := filepath.Join(dir, "field.xlsx")
	sheet := feetBox[strings.Index(feetBox, "\n")+1:] // without the site comment
	writeBook(t, book, [2]string{"XS-1", sheet}, [2]string{"XS-2", sheet})
	const wantQ = 88.08  // ft3/s, the hand value above
	const closeQ = 0.005 // ft3/s: the hand value's last digit
	type want struct {
		units rating.Units // of a rated section
		err   string       // in the failed section's error, "" when rated
	}
	for _, tc := range []struct {
		name  string
		args  []string
		units string // --units, "" when not given
		want  []want
	}{
		{"two files in feet", []string{"ft.csv", "ft2.csv"}, "", []want{{rating.US, ""}, {rating.US, ""}}},
		{"workbook in feet", []string{"field.xlsx"}, "", []want{{rating.US, ""}, {rating.US, ""}}},
		{"--units us agrees", []string{"ft.csv", "ft2.csv"}, "us", []want{{rating.US, ""}, {rating.US, ""}}},
		{"feet then metres", []string{"ft.csv", "m.csv"}, "", []want{{rating.US, ""}, {0, "m.csv:2:1: column \"station (m)\" says m (si units), but the first section rated in this batch is in us units (" + filepath.Join(dir, "ft.csv") + ":2:1: column \"station (ft)\" says ft (us units))"}}},
		{"feet then no units", []string{"ft.csv", "plain.csv"}, "", []want{{rating.US, ""}, {0, "plain.csv: its headers name no unit, so si units, but the first section rated in this batch is in us units"}}},
		{"--units si contradicted", []string{"ft.csv"}, "si", []want{{0, "ft.csv:2:1: station (ft): the header's unit is not the unit system asked for"}}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var args []string
			for _, a := range tc.args {
				args = append(args, filepath.Join(dir, a))
			}
			jobs, _, err := batch.List(args, "", "csv")
			if err != nil {
				t.Fatal(err)
			}
			opt := batch.Options{Stages: rating.StageSpec{List: []float64{2}}, Rating: rating.Options{Slope: 0.001}, Workers: 2}
			if tc.units != "" {
				u, err := rating.ParseUnits(tc.units)
				if err != nil {
					t.Fatal(err)
				}
				opt.Request.Units, opt.Request.UnitsGiven = u, true
			}
			var got []batch.Result
			if err := batch.Run(context.Background(), jobs, opt, func(i int, r batch.Result) error {
				got = append(got, r)
				return nil
			}); err != nil {
				t.Fatal(err)
			}
			if len(got) != len(tc.want) {
				t.Fatalf("%d results, want %d", len(got), len(tc.want))
			}
			for i, w := range tc.want {
				r := got[i]
				if w.err != "" {
					if !strings.Contains(r.Entry.Err, w.err) || len(r.Table.Rows) != 0 {
						t.Errorf("section %d: error %q (%d rows), want one holding %q", i+1, r.Entry.Err, len(r.Table.Rows), w.err)
					}
					continue
				}
				if r.Entry.Err != "" || len(r.Table.Rows) != 1 {
					t.Fatalf("section %d: error %q, %d rows", i+1, r.Entry.Err, len(r.Table.Rows))
				}
				if q := r.Table.Rows[0].Discharge; r.Table.Units != w.units || math.Abs(q-wantQ) > closeQ {
					t.Errorf("section %d: %g in %s units, want %g in %s", i+1, q, r.Table.Units, wantQ, w.units)
				}
			}
		})
	}
}

// Every sheet of a workbook passes over hidden survey sheets, naming them
// in a warning; a hidden sheet named is listed with a warning.
func TestListHiddenSheets(t *testing.T) {
	f := excelize.NewFile()
	f.SetSheetName("Sheet1", "old")
	for _, s := range []string{"XS-1", "XS-2"} {
		f.NewSheet(s)
	}
	for _, s := range []string{"old", "XS-1", "XS-2"} {
		f.SetSheetRow(s, "A1", &[]any{"station", "elevation", "n"})
		f.SetSheetRow(s, "A2", &[]any{0, 1, 0.03})
		f.SetSheetRow(s, "A3", &[]any{1, 0, 0.03})
		f.SetSheetRow(s, "A4", &[]any{2, 1})
	}
	f.SetActiveSheet(1) // excelize does not hide the active sheet
	if err := f.SetSheetVisible("old", false); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "reach.xlsx")
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		sheet     string
		wantJobs  []string
		wantWarns int
	}{
		{"", []string{"XS-1", "XS-2"}, 1},
		{"XS-2", []string{"XS-2"}, 0},
		{"old", []string{"old"}, 0}, // the section's reader warns, once
	} {
		jobs, _, warnings, err := batch.ListWarn([]string{path}, c.sheet, "csv")
		if err != nil {
			t.Fatal(err)
		}
		var got []string
		for _, j := range jobs {
			got = append(got, j.Sheet)
		}
		if !slices.Equal(got, c.wantJobs) {
			t.Errorf("sheet %q: jobs %q, want %q", c.sheet, got, c.wantJobs)
		}
		if len(warnings) != c.wantWarns || (c.wantWarns > 0 && !strings.Contains(warnings[0], "'old'")) {
			t.Errorf("sheet %q: warnings %q, want %d naming 'old'", c.sheet, warnings, c.wantWarns)
		}
		if c.sheet == "old" {
			r := batch.Rate(jobs[0], batch.Options{Rating: rating.Options{Slope: 0.001}})
			hidden := 0
			for _, w := range r.Entry.Warnings {
				if strings.Contains(w, "the sheet is hidden") {
					hidden++
				}
			}
			if hidden != 1 {
				t.Errorf("a named hidden sheet read with warnings %q, want one saying it is hidden", r.Entry.Warnings)
			}
		}
	}
}

// TestRateShallowSection: a section only millimetres deep, rated at its
// default stages, gets a table whose stages are at least 0.0001 apart (the
// precision tables are written to; the round step over its 2 mm would be
// 5e-5) and a warning saying so; one shallower than 0.0001 fails, as its
// table would write its stages alike. 0.002/0.0001 + 1 = 21 stages (by
// hand).
func TestRateShallowSection(t *testing.T) {
	dir := t.TempDir()
	shallow := filepath.Join(dir, "shallow.csv")
	writeFile(t, shallow, "station,elevation,n\n0,10.002,0.03\n1,10,0.03\n2,10,0.03\n3,10.002,\n")
	flat := filepath.Join(dir, "flat.csv")
	writeFile(t, flat, "station,elevation,n\n0,10.00004,0.03\n1,10,0.03\n2,10,0.03\n3,10.00004,\n")
	opt := batch.Options{Rating: rating.Options{Slope: 0.001}}

	r := batch.Rate(batch.Job{Path: shallow, Name: "shallow"}, opt)
	if r.Entry.Err != "" {
		t.Fatal(r.Entry.Err)
	}
	var stages []float64
	for _, row := range r.Table.Rows {
		stages = append(stages, row.Stage)
	}
	if len(stages) != 21 {
		t.Errorf("%d stages, want 21: %v", len(stages), stages)
	}
	if err := results.CheckStagesApart(stages); err != nil {
		t.Error(err)
	}
	raised := false
	for _, w := range r.Entry.Warnings {
		raised = raised || strings.Contains(w, "laid out 0.0001 apart instead (21 rows)")
	}
	if !raised {
		t.Errorf("no warning of the raised step among %q", r.Entry.Warnings)
	}

	r = batch.Rate(batch.Job{Path: flat, Name: "flat"}, opt)
	if !strings.Contains(r.Entry.Err, "would both be written 10") || len(r.Table.Rows) != 0 {
		t.Errorf("a section 0.00004 deep: error %q with %d rows, want stages written alike", r.Entry.Err, len(r.Table.Rows))
	}
}

// A folder holding a reach table, gaugings and a rating table beside its
// surveys is rated, those files skipped with one warning naming them
// (the whole batch failed on the reach table); a coordinate survey and
// the survey by station projected from it are both rated, with a warning
// that the section is rated twice. A folder of nothing but such tables
// holds no survey.
func TestListSkipsTablesThatAreNotSurveys(t *testing.T) {
	dir := t.TempDir()
	files := map[string]string{
		"a.csv":        "station,elevation,n\n0,104,0.04\n10,100,0.04\n20,104,0.04\n",
		"b-coords.csv": "easting,northing,elevation,n,mark\n500,800,104,0.04,left pin\n505,800,100,0.04,\n510,800,104,0.04,right pin\n",
		"b.csv":        "# b, projected\nstation,elevation,n,mark,note,easting,northing,offset,row\n0,104,0.04,left pin,,500,800,0,2\n5,100,0.04,,,505,800,0,3\n10,104,0.04,right pin,,510,800,0,4\n",
		"reach.csv":    "section,survey,distance,ws_left,ws_right\nA,a.csv,0,103,103\nB,b.csv,100,102.9,102.9\n",
		"visits.csv":   "time,stage,discharge\n2024-01-01,101,3\n",
		"rating.csv":   "stage,discharge\n100,0\n101,3\n",
	}
	for name, text := range files {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	jobs, _, warnings, err := batch.ListWarn([]string{dir}, "", "csv")
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, j := range jobs {
		names = append(names, j.Name)
	}
	if got := strings.Join(names, " "); got != "a b-coords b" {
		t.Errorf("jobs %s, want a b-coords b", got)
	}
	w := strings.Join(warnings, "\n")
	if !strings.Contains(w, "skipped 3 files that are not surveys: rating.csv (a rating table), reach.csv (a reach table), visits.csv (a table of gaugings)") {
		t.Errorf("warnings:\n%s", w)
	}
	if !strings.Contains(w, "b-coords.csv and "+filepath.Join(dir, "b.csv")+" hold one section") || !strings.Contains(w, "rated twice") {
		t.Errorf("no warning of the section rated twice:\n%s", w)
	}
	// Named on its own, a reach table is rated, and fails as a section.
	jobs, _, _, err = batch.ListWarn([]string{filepath.Join(dir, "reach.csv"), filepath.Join(dir, "a.csv")}, "", "csv")
	if err != nil || len(jobs) != 2 {
		t.Errorf("named files: %d jobs, %v", len(jobs), err)
	}
	only := t.TempDir()
	if err := os.WriteFile(filepath.Join(only, "reach.csv"), []byte(files["reach.csv"]), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, _, _, err := batch.ListWarn([]string{only}, "", "csv"); !errors.Is(err, batch.ErrNoSurveys) {
		t.Errorf("a folder of a reach table alone: %v, want ErrNoSurveys", err)
	}
}

// A workbook that takes values from other workbooks is warned of once
// when its sheets are listed, not again with each sheet rated (before,
// every sheet's index line and warnings repeated it); a sheet named with
// --sheet is warned of the same way.
func TestLinkedWorkbookWarnedOnce(t *testing.T) {
	dir := t.TempDir()
	book := filepath.Join(dir, "field.xlsx")
	writeBook(t, book, [2]string{"XS-1", trapezoid}, [2]string{"XS-2", trapezoid}, [2]string{"XS-3", trapezoid})
	linkBook(t, book, "file:///D:/crew/levels.xlsx")
	const linked = "takes values from other workbooks (file:///D:/crew/levels.xlsx)"
	for _, sheet := range []string{"", "XS-2"} {
		t.Run("sheet "+sheet, func(t *testing.T) {
			jobs, _, warnings, err := batch.ListWarn([]string{book}, sheet, "csv")
			if err != nil {
				t.Fatal(err)
			}
			if n := strings.Count(strings.Join(warnings, "\n"), linked); n != 1 {
				t.Errorf("the listing warns of the links %d times, want once: %q", n, warnings)
			}
			var buf bytes.Buffer
			sum, err := batch.Long(context.Background(), &buf, jobs, rateOptions())
			if err != nil {
				t.Fatal(err)
			}
			if sum.Failed > 0 || len(sum.Entries) != len(jobs) {
				t.Fatalf("%d of %d failed: %+v", sum.Failed, len(sum.Entries), sum.Entries)
			}
			for _, en := range sum.Entries {
				if w := strings.Join(en.Warnings, "\n"); strings.Contains(w, linked) {
					t.Errorf("%s repeats the links: %q", en.Section, en.Warnings)
				}
			}
		})
	}
}

// A folder holding a stage record or a table of shift diagrams (inputs of
// record and shifts) beside a survey rates the survey and skips the other
// with the one warning naming it (before, each was read as a survey and
// failed the batch: "station: missing column").
func TestListSkipsStageRecordsAndShiftTables(t *testing.T) {
	for _, tc := range []struct {
		name, file, text, kind string
	}{
		{"stage record", "stage-2025.csv",
			"# 15-minute gauge heights (invented)\ntime,stage (m)\n2024-10-01T00:00,0.655\n2024-10-01T00:15,0.654\n", "a stage record"},
		{"stage record by gauge height", "logger.csv", "time,gauge_height,quality\n2024-10-01T00:00,0.655,good\n", "a stage record"},
		{"shift diagrams", "shifts-2025.csv",
			"time,stage,shift,taper,abrupt,note\n2024-10-09T10:30,0.65,0.000,1.3,,visit 1\n2024-10-09T10:30,0.9,0.02,,,\n", "a table of shift diagrams"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			writeFile(t, filepath.Join(dir, "xs.csv"), trapezoid)
			writeFile(t, filepath.Join(dir, tc.file), tc.text)
			jobs, _, warnings, err := batch.ListWarn([]string{dir}, "", "csv")
			if err != nil {
				t.Fatal(err)
			}
			if len(jobs) != 1 || jobs[0].Name != "xs" {
				t.Errorf("jobs %q, want xs alone", jobWords(jobs))
			}
			want := fmt.Sprintf("skipped 1 file that is not a survey: %s (%s)", tc.file, tc.kind)
			if !slices.Contains(warnings, want) {
				t.Errorf("warnings %q, want %q", warnings, want)
			}
			// Alone in a folder, it leaves no survey to rate.
			only := t.TempDir()
			writeFile(t, filepath.Join(only, tc.file), tc.text)
			if _, _, _, err := batch.ListWarn([]string{only}, "", "csv"); !errors.Is(err, batch.ErrNoSurveys) {
				t.Errorf("a folder of %s alone: %v, want ErrNoSurveys", tc.kind, err)
			}
		})
	}
}

// Every sheet of a workbook not rated is named in one warning with its
// reason: tables of other kinds, sheets whose first row names no survey
// columns, and sheets refused.
func TestListNamesSheetsNotRated(t *testing.T) {
	f := excelize.NewFile()
	f.SetSheetName("Sheet1", "XS-1")
	f.SetSheetRow("XS-1", "A1", &[]any{"station", "elevation", "n"})
	f.SetSheetRow("XS-1", "A2", &[]any{0, 1, 0.03})
	f.SetSheetRow("XS-1", "A3", &[]any{1, 0})
	f.SetSheetRow("XS-1", "A4", &[]any{2, 1})
	f.NewSheet("reach")
	f.SetSheetRow("reach", "A1", &[]any{"section", "survey", "distance"})
	f.NewSheet("instructions")
	f.SetSheetRow("instructions", "A1", &[]any{"topic", "what to enter"})
	path := filepath.Join(t.TempDir(), "book.xlsx")
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	jobs, _, warnings, err := batch.ListWarn([]string{path}, "", "csv")
	if err != nil {
		t.Fatal(err)
	}
	if len(jobs) != 1 || jobs[0].Sheet != "XS-1" {
		t.Errorf("jobs %+v, want XS-1", jobs)
	}
	if len(warnings) != 1 || !strings.Contains(warnings[0], "2 sheets not rated") ||
		!strings.Contains(warnings[0], "'reach' (not a survey table: a reach table)") ||
		!strings.Contains(warnings[0], "'instructions' (not a survey table: its first row") {
		t.Errorf("warnings %q, want one naming reach and instructions with their reasons", warnings)
	}
}

// One survey file named twice in a batch (by another spelling, a hard
// link, or in a folder also named) is warned of: it would be rated twice
// under two names. Two files of the same content are two surveys.
func TestListWarnsOfOneFileTwice(t *testing.T) {
	dir := t.TempDir()
	xs := filepath.Join(dir, "xs.csv")
	if err := os.WriteFile(xs, []byte(trapezoid), 0o644); err != nil {
		t.Fatal(err)
	}
	copyOf := filepath.Join(dir, "sub", "xs-copy.csv")
	if err := os.MkdirAll(filepath.Dir(copyOf), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(copyOf, []byte(trapezoid), 0o644); err != nil {
		t.Fatal(err)
	}
	hard := filepath.Join(dir, "sub", "hard.csv")
	if err := os.Link(xs, hard); err != nil {
		t.Skip("no hard links:", err)
	}
	for _, tc := range []struct {
		name  string
		args  []string
		twice string // "" for no warning
	}{
		{"another spelling", []string{xs, dir + "/./xs.csv"}, xs + " and " + dir + "/./xs.csv"},
		{"a hard link", []string{xs, hard}, xs + " and " + hard},
		{"in a folder named too", []string{dir, xs}, xs + " is named twice"},
		{"a copy", []string{xs, copyOf}, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, _, warnings, err := batch.ListWarn(tc.args, "", "csv")
			if err != nil {
				t.Fatal(err)
			}
			w := strings.Join(warnings, "\n")
			said := strings.Contains(w, "the same survey file")
			if tc.twice == "" {
				if said {
					t.Errorf("warned of two files:\n%s", w)
				}
				return
			}
			if !said || !strings.Contains(w, tc.twice) || !strings.Contains(w, "rated twice") {
				t.Errorf("want a warning naming %s, got:\n%s", tc.twice, w)
			}
		})
	}
}
