package survey

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/reach"
	"wetline/subdivide"
)

const reachSurveyCSV = `station,elevation,n,mark
0,12,0.05,
10,10.5,0.04,bank
14,9,0.04,
20,10.4,0.06,bank
30,12,,
`

// reachFiles writes name → content into a new temporary folder.
func reachFiles(t *testing.T, files map[string]string) string {
	t.Helper()
	dir := t.TempDir()
	for name, text := range files {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return dir
}

func TestReadReachCSV(t *testing.T) {
	dir := reachFiles(t, map[string]string{
		"reach.csv": "# a reach\nSection,Survey,Distance (m),WS_Left,ws_right,quality,note\n" +
			"A,a.csv,0,10.9,10.8,Good,upstream\n" +
			"B,sub/b.csv,120.5,,10.6,,\n",
		"a.csv": reachSurveyCSV,
	})
	os.Mkdir(filepath.Join(dir, "sub"), 0o755)
	os.WriteFile(filepath.Join(dir, "sub", "b.csv"), []byte(reachSurveyCSV), 0o644)
	r, err := ReadReach(filepath.Join(dir, "reach.csv"), "", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Rows) != 2 || len(r.Surveys) != 2 {
		t.Fatalf("%d rows, %d surveys", len(r.Rows), len(r.Surveys))
	}
	a, b := r.Rows[0], r.Rows[1]
	if a.ID != "A" || a.Distance != 0 || a.WSLeft != 10.9 || a.WSRight != 10.8 || a.Quality != rating.Good || a.Note != "upstream" || a.Row != 3 {
		t.Errorf("row A = %+v", a)
	}
	if b.Path != filepath.Join(dir, "sub", "b.csv") || !math.IsNaN(b.WSLeft) || b.WSRight != 10.6 || b.Distance != 120.5 {
		t.Errorf("row B = %+v", b)
	}
	if r.Surveys[1].Section.Name != "B" || !r.Surveys[0].Section.HasBanks {
		t.Errorf("surveys %+v", r.Surveys[1].Section)
	}
	if got := r.Inputs(); len(got) != 3 {
		t.Errorf("inputs %q", got)
	}
	secs, err := r.ReachSections(rating.SI)
	if err != nil {
		t.Fatal(err)
	}
	// good mark: 0.10 ft (Koenig and others 2016, from memory) in metres.
	if math.Abs(secs[0].MarkSD-0.10*0.3048) > 1e-12 || secs[1].MarkSD != 0 {
		t.Errorf("mark SD %g %g", secs[0].MarkSD, secs[1].MarkSD)
	}
	if _, err := reach.SolveSlopeArea(secs, reach.SlopeAreaOptions{}); err != nil {
		t.Errorf("solve: %v", err)
	}
}

func TestReadReachWorkbook(t *testing.T) {
	dir := reachFiles(t, map[string]string{"xs3.csv": reachSurveyCSV})
	surveyRows := [][]any{{"station", "elevation", "n"}, {0, 12, 0.05}, {10, 10, 0.04}, {14, 9, 0.04}, {20, 10.4, 0.06}, {30, 12, nil}}
	path := writeBook(t, dir, map[string][][]any{
		"notes": {{"field notes"}},
		"reach": {
			{"section", "survey", "distance", "ws_left", "ws_right"},
			{"XS1", "XS-1", 0, 11.0, 10.96},
			{"XS2", "XS-2", 150, 10.8, nil},
			{"XS3", "xs3.csv", 290, 10.6, 10.62},
		},
		"XS-1": surveyRows, "XS-2": surveyRows,
	}, []string{"notes", "reach", "XS-1", "XS-2"})
	r, err := ReadReach(path, "reach", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if r.Rows[0].Path != path || r.Rows[0].Sheet != "XS-1" || r.Rows[2].Path != filepath.Join(dir, "xs3.csv") || r.Rows[2].Sheet != "" {
		t.Errorf("rows %+v", r.Rows)
	}
	if r.Surveys[1].Sheet != "XS-2" || len(r.Surveys[1].Section.Points) != 5 {
		t.Errorf("survey 2 = %+v", r.Surveys[1])
	}
	// An unknown sheet name is looked for as a file, and reported at the cell.
	path2 := writeBook(t, t.TempDir(), map[string][][]any{
		"reach": {{"section", "survey", "distance", "ws_left", "ws_right"}, {"XS1", "XS-9", 0, 11.0, nil}},
	}, []string{"reach"})
	_, err = ReadReach(path2, "", SectionOptions{})
	if !errors.Is(err, ErrSurveyAbsent) || !strings.Contains(err.Error(), "['reach']!B2") {
		t.Errorf("unknown sheet: %v", err)
	}
}

func TestReachErrors(t *testing.T) {
	const head = "section,survey,distance,ws_left,ws_right,quality\n"
	for _, tc := range []struct {
		name, reach string
		want        error
		where       string // position expected in the message
	}{
		{"missing column", "section,survey,distance,ws_left\nA,a.csv,0,10\n", ErrMissingColumn, "reach.csv:1"},
		{"no rows", head, ErrEmpty, "reach.csv:1"},
		{"blank id", head + ",a.csv,0,10,,\n", ErrSectionID, "reach.csv:2:1"},
		{"duplicate id", head + "A,a.csv,0,10,,\nA,a.csv,5,9,,\n", ErrDuplicateSection, "reach.csv:3:1"},
		{"blank survey", head + "A,,0,10,,\n", ErrNoSurvey, "reach.csv:2:2"},
		{"bad distance", head + "A,a.csv,zero,10,,\n", ErrNotNumber, "reach.csv:2:3"},
		{"blank distance", head + "A,a.csv,,10,,\n", ErrDistanceBlank, "reach.csv:2:3"},
		// Bounds: MaxCoordinate for distances, MaxElevation for marks.
		{"huge distance", head + "A,a.csv,0,10,,\nB,a.csv,1e308,9,,\n", ErrImplausible, `reach.csv:3:3: distance "1e308": distance 1e+308 is not a plausible value (beyond ±1e+08)`},
		{"huge negative distance", head + "A,a.csv,-1e9,10,,\nB,a.csv,0,9,,\n", ErrImplausible, "reach.csv:2:3"},
		{"huge mark", head + "A,a.csv,0,10,,\nB,a.csv,5,,2e5,\n", ErrImplausible, `reach.csv:3:5: ws_right "2e5": high-water mark 200000 is not a plausible value (beyond ±100000)`},
		{"distance not increasing", head + "A,a.csv,100,10,,\nB,a.csv,100,9,,\n", ErrDistanceOrder, "reach.csv:3:3"},
		{"distance decreasing", head + "A,a.csv,100,10,,\nB,a.csv,50,9,,\n", ErrDistanceOrder, "reach.csv:3:3"},
		{"no marks", head + "A,a.csv,0,,,\n", ErrNoHighWaterMark, "reach.csv:2:4"},
		{"decimal comma", head + "A,a.csv,0,\"10,5\",,\n", ErrDecimalComma, "reach.csv:2:4"},
		{"bad quality", head + "A,a.csv,0,10,,splendid\n", ErrMarkQuality, "reach.csv:2:6"},
		{"unknown survey file", head + "A,nothere.csv,0,10,,\n", ErrSurveyAbsent, "reach.csv:2:2"},
		{"bad survey", head + "A,bad.csv,0,10,,\n", ErrNotNumber, "bad.csv:2:2"},
		// The refusal names the flag that allows such a survey.
		{"survey outside the folder", head + "A,../a.csv,0,10,,\n", ErrSurveyOutside, "reach.csv:2:2: survey \"../a.csv\": the survey lies outside " +
			"the reach table's folder: keep the surveys beside the table, or give --surveys-anywhere to allow it"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := reachFiles(t, map[string]string{"reach.csv": tc.reach, "a.csv": reachSurveyCSV,
				"bad.csv": "station,elevation,n\n0,x,0.03\n5,1,\n"})
			_, err := ReadReach(filepath.Join(dir, "reach.csv"), "", SectionOptions{})
			if !errors.Is(err, tc.want) {
				t.Fatalf("err = %v, want %v", err, tc.want)
			}
			if !strings.Contains(err.Error(), tc.where) {
				t.Errorf("err = %v, want position %s", err, tc.where)
			}
		})
	}
}

// A table out of order, a row without marks and other bad cells give one
// error line each: the table listed downstream first is one error at its
// first offending row, naming the order wanted.
func TestReachErrorLines(t *testing.T) {
	const head = "section,survey,distance,ws_left,ws_right\n"
	for _, tc := range []struct {
		name, reach string
		want        error
		lines       []string // the error's lines, in order
	}{
		{"no marks", head + "A,a.csv,0,,\nB,a.csv,10,9.9,\n", ErrNoHighWaterMark,
			[]string{"reach.csv:2:4: ws_left: give a high-water mark in ws_left or ws_right"}},
		{"no marks, blank cells", head + "A,a.csv,0,\" \",\"\"\nB,a.csv,10,9.9,\n", ErrNoHighWaterMark,
			[]string{"reach.csv:2:4: ws_left: give a high-water mark in ws_left or ws_right"}},
		{"downstream first", head + "C,a.csv,300,9.7,\nB,a.csv,150,9.8,\nA,a.csv,0,9.9,\n", ErrDistanceOrder,
			[]string{"reach.csv:3:3: distance \"150\": distances must increase downstream, row by row (150 after 300): " +
				"the table lists its sections downstream first; list the upstream section first"}},
		{"two sections downstream first", head + "B,a.csv,150,9.8,\nA,a.csv,0,9.9,\n", ErrDistanceOrder,
			[]string{"reach.csv:3:3: distance \"0\": distances must increase downstream, row by row (0 after 150): " +
				"the table lists its sections downstream first; list the upstream section first"}},
		{"one row out of order", head + "A,a.csv,0,9.9,\nB,a.csv,200,9.8,\nC,a.csv,100,9.7,\nD,a.csv,300,9.6,\n", ErrDistanceOrder,
			[]string{"reach.csv:4:3: distance \"100\": distances must increase downstream, row by row (100 after 200)"}},
		{"rows out of order among other errors", head + "A,a.csv,0,9.9,\nB,a.csv,200,,\nC,a.csv,100,9.7,\nD,a.csv,50,9.6,\nE,,400,9.5,\n",
			ErrDistanceOrder, []string{
				"reach.csv:3:4: ws_left: give a high-water mark in ws_left or ws_right",
				"reach.csv:4:3: distance \"100\": distances must increase downstream, row by row (100 after 200; 2 rows out of order)",
				"reach.csv:6:2: survey: the section needs a survey (a file, or a sheet of this workbook)"}},
		{"equal distances", head + "A,a.csv,0,9.9,\nB,a.csv,0,9.8,\n", ErrDistanceOrder,
			[]string{"reach.csv:3:3: distance \"0\": distances must increase downstream, row by row (0 after 0)"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := reachFiles(t, map[string]string{"reach.csv": tc.reach, "a.csv": reachSurveyCSV})
			_, err := ReadReach(filepath.Join(dir, "reach.csv"), "", SectionOptions{})
			if !errors.Is(err, tc.want) {
				t.Fatalf("err = %v, want %v", err, tc.want)
			}
			got := strings.Split(err.Error(), "\n")
			for i := range got {
				got[i] = strings.TrimPrefix(got[i], dir+string(filepath.Separator))
			}
			if !slices.Equal(got, tc.lines) {
				t.Errorf("error lines:\n%s\nwant:\n%s", strings.Join(got, "\n"), strings.Join(tc.lines, "\n"))
			}
		})
	}
}

func TestReachSectionsNoN(t *testing.T) {
	dir := reachFiles(t, map[string]string{
		"reach.csv": "section,survey,distance,ws_left,ws_right\nA,a.csv,0,10,\nB,a.csv,10,9.9,\n",
		"a.csv":     "station,elevation\n0,11\n5,8\n10,11\n",
	})
	r, err := ReadReach(filepath.Join(dir, "reach.csv"), "", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := r.ReachSections(rating.SI); !errors.Is(err, ErrNoNColumn) {
		t.Errorf("err = %v", err)
	}
}

// A section error of the computation is placed on the reach table's cell.
func TestReachSectionErrorPosition(t *testing.T) {
	dir := reachFiles(t, map[string]string{
		"reach.csv": "section,survey,distance,ws_left,ws_right\nA,a.csv,0,10.5,\nB,a.csv,10,8.5,\n",
		"a.csv":     reachSurveyCSV,
	})
	r, err := ReadReach(filepath.Join(dir, "reach.csv"), "", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	secs, err := r.ReachSections(rating.SI)
	if err != nil {
		t.Fatal(err)
	}
	_, err = reach.SolveSlopeArea(secs, reach.SlopeAreaOptions{})
	err = r.PlaceError(err)
	if !errors.Is(err, reach.ErrDrySection) || !strings.Contains(err.Error(), "reach.csv:3:4") {
		t.Errorf("err = %v", err)
	}
}

// FuzzReachFromTable checks that no reach table makes the reader panic and
// that an accepted table keeps its promises.
func FuzzReachFromTable(f *testing.F) {
	f.Add([]byte("section,survey,distance,ws_left,ws_right\nA,a.csv,0,10,\nB,b.csv,5,9,9.1\n"))
	f.Add([]byte("section,survey,distance,ws_left,ws_right,quality,note\nA,a,0,,1,poor,x\n"))
	f.Add([]byte("\ufeffSection;Survey\n"))
	f.Add([]byte("section,survey,distance,ws_left,ws_right\nA,a.csv,0,10,\nB,b.csv,1e308,9,1e300\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		tab, err := ParseCSV(bytes.NewReader(data), "fuzz.csv")
		if err != nil {
			return
		}
		r, err := ReachFromTable(tab)
		if err != nil {
			if err.Error() == "" {
				t.Error("empty error message")
			}
			return
		}
		if len(r.Rows) == 0 {
			t.Fatal("accepted a reach without rows")
		}
		for i, row := range r.Rows {
			if row.ID == "" || row.Survey == "" {
				t.Errorf("row %d: blank id or survey accepted", i)
			}
			if math.IsNaN(row.WSLeft) && math.IsNaN(row.WSRight) {
				t.Errorf("row %d: no marks accepted", i)
			}
			if math.Abs(row.Distance) > MaxCoordinate || math.Abs(row.WSLeft) > MaxElevation || math.Abs(row.WSRight) > MaxElevation {
				t.Errorf("row %d: implausible distance %g or marks %g, %g accepted", i, row.Distance, row.WSLeft, row.WSRight)
			}
			if i > 0 && !(row.Distance > r.Rows[i-1].Distance) {
				t.Errorf("row %d: distance %g after %g accepted", i, row.Distance, r.Rows[i-1].Distance)
			}
		}
	})
}

// A reach table names survey files in its own folder: a path outside it
// (absolute, or climbing out with ..) is refused at its cell unless
// allowed, and nothing of the file is read.
func TestReachSurveyOutsideFolder(t *testing.T) {
	root := t.TempDir()
	dir := filepath.Join(root, "reach")
	if err := os.Mkdir(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	secret := filepath.Join(root, "secret.csv")
	if err := os.WriteFile(secret, []byte("station,elevation,n\n0,5,0.03\n10,0,0.03\n20,5,0.03\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, ref := range []string{"../secret.csv", secret} {
		table := filepath.Join(dir, "reach.csv")
		body := "section,survey,distance,ws_left,ws_right\nA," + ref + ",0,3,\nB," + ref + ",100,2.9,\n"
		if err := os.WriteFile(table, []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
		_, err := ReadReach(table, "", SectionOptions{})
		if !errors.Is(err, ErrSurveyOutside) || !strings.Contains(err.Error(), "reach.csv:2:2") {
			t.Errorf("survey %s: %v, want ErrSurveyOutside at reach.csv:2:2", ref, err)
		}
		if _, err := ReadReach(table, "", SectionOptions{SurveysAnywhere: true}); err != nil {
			t.Errorf("survey %s allowed: %v", ref, err)
		}
	}
}

// A step-backwater reach: marks optional (no mark columns at all), flow
// lengths by path, blank ones meaning the distance.
func TestReadReachBackwater(t *testing.T) {
	dir := reachFiles(t, map[string]string{
		"reach.csv": "section,survey,distance,left_length,channel_length (m),right_length,structure\n" +
			"A,a.csv,0,90,120,,\n" +
			"B,a.csv,120,,,,\n" +
			"C,a.csv,250,5,,,\n",
		"a.csv": reachSurveyCSV,
	})
	path := filepath.Join(dir, "reach.csv")
	if _, err := ReadReach(path, "", SectionOptions{}); !errors.Is(err, ErrMissingColumn) {
		t.Errorf("slope-area reader without marks: %v", err)
	}
	r, err := ReadReachWith(path, "", ReachOptions{MarksOptional: true})
	if err != nil {
		t.Fatal(err)
	}
	a := r.Rows[0]
	if a.LeftLength != 90 || a.ChannelLength != 120 || !math.IsNaN(a.RightLength) || !math.IsNaN(a.WSLeft) || a.Structure != "" {
		t.Errorf("row A = %+v", a)
	}
	if !strings.Contains(r.Warnings[0], "reach.csv:4") || !strings.Contains(r.Warnings[0], "flow lengths are not used") {
		t.Errorf("warnings %q", r.Warnings)
	}
	secs, err := r.ReachSections(rating.SI)
	if err != nil {
		t.Fatal(err)
	}
	if got := secs[0].FlowLengths; got.Left != 90 || got.Channel != 120 || got.Right != 0 || !math.IsNaN(secs[0].Left) {
		t.Errorf("flow lengths %+v, marks %g", got, secs[0].Left)
	}
	if secs[1].FlowLengths != (subdivide.PerRegion{}) {
		t.Errorf("blank lengths %+v", secs[1].FlowLengths)
	}
	if err := r.OpenChannel(); err != nil {
		t.Errorf("open channel: %v", err)
	}
}

// A zero flow length at the last section is not used, like any there:
// it is warned of, not refused.
func TestReachZeroLengthAtLastSection(t *testing.T) {
	dir := reachFiles(t, map[string]string{"reach.csv": "section,survey,distance,channel_length\nA,a.csv,0,10\nB,a.csv,10,0\n",
		"a.csv": reachSurveyCSV})
	r, err := ReadReachWith(filepath.Join(dir, "reach.csv"), "", ReachOptions{MarksOptional: true})
	if err != nil {
		t.Fatal(err)
	}
	if !slices.ContainsFunc(r.Warnings, func(w string) bool {
		return strings.Contains(w, "reach.csv:3: section B is the last of the reach: its flow lengths are not used")
	}) {
		t.Errorf("warnings %q", r.Warnings)
	}
}

// Bad cells of the backwater columns are reported at their cells; a
// structure is refused where it is named.
func TestReachBackwaterErrors(t *testing.T) {
	const head = "section,survey,distance,ws_left,channel_length,structure\n"
	for _, tc := range []struct {
		name, reach string
		want        error
		where       string
	}{
		{"negative length", head + "A,a.csv,0,,-5,\nB,a.csv,10,,,\n", ErrFlowLengthValue, "reach.csv:2:5"},
		{"zero length", head + "A,a.csv,0,,0,\nB,a.csv,10,,,\n", ErrFlowLengthValue, "reach.csv:2:5"},
		{"zero length mid-reach", head + "A,a.csv,0,,10,\nB,a.csv,10,,0.0,\nC,a.csv,20,,,\n", ErrFlowLengthValue, "reach.csv:3:5"},
		{"huge length", head + "A,a.csv,0,,1e308,\nB,a.csv,10,,,\n", ErrImplausible, `reach.csv:2:5: channel_length "1e308": flow length 1e+308 is not a plausible value (above 1e+08)`},
		{"length just beyond the bound", head + "A,a.csv,0,,100000001,\nB,a.csv,10,,,\n", ErrImplausible, "reach.csv:2:5"},
		{"length not a number", head + "A,a.csv,0,,far,\nB,a.csv,10,,,\n", ErrNotNumber, "reach.csv:2:5"},
		{"bad mark", head + "A,a.csv,0,high,,\nB,a.csv,10,,,\n", ErrNotNumber, "reach.csv:2:4"},
		{"distance order", head + "A,a.csv,10,,,\nB,a.csv,10,,,\n", ErrDistanceOrder, "reach.csv:3:3"},
		{"structure", head + "A,a.csv,0,,,\nB,a.csv,10,,,bridge\n", ErrStructure, "reach.csv:3:6"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := reachFiles(t, map[string]string{"reach.csv": tc.reach, "a.csv": reachSurveyCSV})
			r, err := ReadReachWith(filepath.Join(dir, "reach.csv"), "", ReachOptions{MarksOptional: true})
			if err == nil {
				err = r.OpenChannel()
			}
			if !errors.Is(err, tc.want) {
				t.Fatalf("err = %v, want %v", err, tc.want)
			}
			if !strings.Contains(err.Error(), tc.where) {
				t.Errorf("err = %v, want position %s", err, tc.where)
			}
		})
	}
}

// The structure column: blank and the open-channel words mean no
// structure, the structure words are refused by OpenChannel, and any other
// word is refused at its cell when the table is read.
func TestReachStructureWords(t *testing.T) {
	const head = "section,survey,distance,structure\n"
	for _, tc := range []struct {
		cell  string
		read  error  // from reading the table
		open  error  // from OpenChannel
		where string // position of the error
	}{
		{"", nil, nil, ""},
		{"no", nil, nil, ""},
		{"None", nil, nil, ""},
		{"0", nil, nil, ""},
		{" FALSE ", nil, nil, ""},
		{"bridge", nil, ErrStructure, "reach.csv:3:4"},
		{"Culvert", nil, ErrStructure, "reach.csv:3:4"},
		{"weir", nil, ErrStructure, "reach.csv:3:4"},
		{"dam", nil, ErrStructure, "reach.csv:3:4"},
		{"yes", nil, ErrStructure, "reach.csv:3:4"},
		{"1", nil, ErrStructure, "reach.csv:3:4"},
		{"true", nil, ErrStructure, "reach.csv:3:4"},
		{"footbridge deck", ErrStructureWord, nil, "reach.csv:3:4: structure \"footbridge deck\": structure must be one of bridge, culvert"},
		{"n", ErrStructureWord, nil, "reach.csv:3:4"},
		{"-", ErrStructureWord, nil, "reach.csv:3:4"},
	} {
		t.Run(tc.cell, func(t *testing.T) {
			dir := reachFiles(t, map[string]string{"reach.csv": head + "A,a.csv,0,\nB,a.csv,10,\"" + tc.cell + "\"\n", "a.csv": reachSurveyCSV})
			r, err := ReadReachWith(filepath.Join(dir, "reach.csv"), "", ReachOptions{MarksOptional: true})
			if !errors.Is(err, tc.read) || (err == nil) != (tc.read == nil) {
				t.Fatalf("read: %v, want %v", err, tc.read)
			}
			if err == nil {
				if err = r.OpenChannel(); !errors.Is(err, tc.open) || (err == nil) != (tc.open == nil) {
					t.Fatalf("open channel: %v, want %v", err, tc.open)
				}
				if want := strings.TrimSpace(tc.cell); tc.open == nil && r.Rows[1].Structure != "" || tc.open != nil && r.Rows[1].Structure != want {
					t.Errorf("structure %q, want %q", r.Rows[1].Structure, want)
				}
			}
			if err != nil && !strings.Contains(err.Error(), tc.where) {
				t.Errorf("err = %v, want %s", err, tc.where)
			}
		})
	}
}

// A flow-length error of the computation is placed on the channel-length
// cell.
func TestReachFlowLengthErrorPosition(t *testing.T) {
	dir := reachFiles(t, map[string]string{
		"reach.csv": "section,survey,distance,channel_length\nA,a.csv,0,\nB,a.csv,10,\n",
		"a.csv":     reachSurveyCSV,
	})
	r, err := ReadReachWith(filepath.Join(dir, "reach.csv"), "", ReachOptions{MarksOptional: true})
	if err != nil {
		t.Fatal(err)
	}
	err = r.PlaceError(&reach.SectionError{Index: 1, ID: "B", Field: "flow_lengths", Err: reach.ErrFlowLength})
	if !errors.Is(err, reach.ErrFlowLength) || !strings.Contains(err.Error(), "reach.csv:3:4") {
		t.Errorf("err = %v", err)
	}
}

// The rating table rate writes starts at the dry bed; of the dry rows the
// last is kept.
func TestReadBoundaryRating(t *testing.T) {
	dir := reachFiles(t, map[string]string{
		"xs3-rating.csv": "stage,depth,discharge,flags\n100.05,0,0,\n100.1,0.05,0,\n100.5,0.45,1.2,\n101,0.95,6.5,pools\n",
	})
	b, err := ReadBoundaryRating(filepath.Join(dir, "xs3-rating.csv"), "")
	if err != nil {
		t.Fatal(err)
	}
	want := []reach.StageDischarge{{Stage: 100.1, Discharge: 0}, {Stage: 100.5, Discharge: 1.2}, {Stage: 101, Discharge: 6.5}}
	if len(b.Points) != 3 || b.Points[0] != want[0] || b.Points[2] != want[2] || b.Rows[0] != 3 {
		t.Errorf("points %v rows %v", b.Points, b.Rows)
	}
}

// A boundary rating is read as every rating table is: where it begins dry
// at stage e, log-linearly in (h − e) between rows, so that between rows
// (hᵢ, Qᵢ) and (hᵢ₊₁, Qᵢ₊₁) the stage of q is
// e + (hᵢ − e)·(q/Qᵢ)^(1/b), b = ln(Qᵢ₊₁/Qᵢ)/ln((hᵢ₊₁ − e)/(hᵢ − e))
// (Kennedy 1984, USGS TWRI 3-A10; the inverse in closed form); with no dry
// row, linearly. A discharge beyond the rows is reach.ErrBoundaryRange.
func TestBoundaryRatingStages(t *testing.T) {
	const tol = 1e-9 // m: both laws are inverted in closed form
	logStage := func(e, h0, q0, h1, q1, q float64) float64 {
		b := math.Log(q1/q0) / math.Log((h1-e)/(h0-e))
		return e + (h0-e)*math.Pow(q/q0, 1/b)
	}
	for _, tc := range []struct {
		name, text string
		q, want    float64
		linear     bool // warned of as read linearly
	}{
		{"dry foot, log-linear", "stage,discharge\n100,0\n101,10\n103,80\n", 40, logStage(100, 101, 10, 103, 80, 40), false},
		{"dry foot, a row", "stage,discharge\n100,0\n101,10\n103,80\n", 80, 103, false},
		{"no dry row, linear", "stage,discharge\n101,10\n103,80\n", 40, 101 + 2*30.0/70, true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := reachFiles(t, map[string]string{"r.csv": tc.text})
			br, err := ReadBoundaryRating(filepath.Join(dir, "r.csv"), "")
			if err != nil {
				t.Fatal(err)
			}
			b, err := br.Boundary()
			if err != nil {
				t.Fatal(err)
			}
			if b.Kind != reach.StageRating || len(b.Rating) != len(br.Points) || b.StageOf == nil {
				t.Fatalf("boundary %+v", b)
			}
			warned := len(b.Warnings) == 1 && strings.Contains(b.Warnings[0], "r.csv: the boundary rating has no row without flow, so it is read linearly in stage between rows; "+
				"begin it with a row of discharge 0 at its gauge height of zero flow")
			if warned != tc.linear || !tc.linear && len(b.Warnings) > 0 {
				t.Errorf("warnings %q, want a warning of a linear reading: %v", b.Warnings, tc.linear)
			}
			h, err := b.StageOf(tc.q)
			if err != nil || math.Abs(h-tc.want) > tol {
				t.Errorf("stage of %g: %.9f (%v), want %.9f", tc.q, h, err, tc.want)
			}
			if _, err := b.StageOf(81); !errors.Is(err, reach.ErrBoundaryRange) {
				t.Errorf("beyond the table: %v", err)
			}
		})
	}
}

func TestBoundaryRatingErrors(t *testing.T) {
	for _, tc := range []struct {
		name, text string
		want       error
		where      string
	}{
		{"no discharge column", "stage,flow\n1,2\n", ErrMissingColumn, "r.csv:1"},
		{"blank discharge", "stage,discharge\n1,\n2,3\n", ErrNotNumber, "r.csv:2:2"},
		{"negative", "stage,discharge\n1,-1\n2,3\n", ErrNegativeFlow, "r.csv:2:2"},
		{"stage falls", "stage,discharge\n1,1\n0.5,3\n", ErrBoundaryOrder, "r.csv:3:1"},
		{"discharge flat", "stage,discharge\n1,1\n2,1\n", ErrBoundaryOrder, "r.csv:3:2"},
		{"one row", "stage,discharge\n1,1\n", ErrBoundaryPoints, "r.csv:1"},
		{"decimal comma", "stage,discharge\n1,\"1,5\"\n2,3\n", ErrDecimalComma, "r.csv:2:2"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := reachFiles(t, map[string]string{"r.csv": tc.text})
			_, err := ReadBoundaryRating(filepath.Join(dir, "r.csv"), "")
			if !errors.Is(err, tc.want) {
				t.Fatalf("err = %v, want %v", err, tc.want)
			}
			if !strings.Contains(err.Error(), tc.where) {
				t.Errorf("err = %v, want position %s", err, tc.where)
			}
		})
	}
}

// FuzzReachTableBackwater checks the step-backwater reading of a reach
// table: no panic, and an accepted table keeps its promises.
func FuzzReachTableBackwater(f *testing.F) {
	f.Add([]byte("section,survey,distance,left_length,channel_length,right_length\nA,a,0,5,,7\nB,b,10,,,\n"))
	f.Add([]byte("section,survey,distance,structure\nA,a,0,bridge\n"))
	f.Add([]byte("section,survey,distance,left_length,channel_length,right_length\nA,a,0,1e308,1e300,7\nB,b,1e308,,,\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		tab, err := ParseCSV(bytes.NewReader(data), "fuzz.csv")
		if err != nil {
			return
		}
		r, err := ReachTable(tab, ReachOptions{MarksOptional: true})
		if err != nil {
			if err.Error() == "" {
				t.Error("empty error message")
			}
			return
		}
		for i, row := range r.Rows {
			for _, l := range []float64{row.LeftLength, row.ChannelLength, row.RightLength} {
				if l < 0 || l > MaxCoordinate {
					t.Errorf("row %d: flow length %g accepted", i, l)
				}
			}
			if math.Abs(row.Distance) > MaxCoordinate || math.Abs(row.WSLeft) > MaxElevation || math.Abs(row.WSRight) > MaxElevation {
				t.Errorf("row %d: implausible distance %g or marks %g, %g accepted", i, row.Distance, row.WSLeft, row.WSRight)
			}
			if i > 0 && !(row.Distance > r.Rows[i-1].Distance) {
				t.Errorf("row %d: distance %g after %g accepted", i, row.Distance, r.Rows[i-1].Distance)
			}
		}
	})
}

// FuzzBoundaryRatingFromTable checks that an accepted boundary rating
// increases in stage and discharge, and makes a boundary (its own zero
// flow, from a depth column or its dry row, fits its rows).
func FuzzBoundaryRatingFromTable(f *testing.F) {
	f.Add([]byte("stage,discharge\n100,0\n100.5,0\n101,2\n102,9\n"))
	f.Add([]byte("stage,depth,discharge\n100,0,0\n100.3,0,0\n100.4,0.03,0.004\n100.5,0.13,0.12\n"))
	f.Add([]byte("stage,depth,discharge\n100.3,0.3,0\n100.4,0.4,0.004\n100.5,x,0.12\n"))
	f.Add([]byte("Stage (m),Discharge (m3/s)\n1,1\n"))
	f.Add([]byte("stage,discharge\n1,0\n2e5,1e308\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		tab, err := ParseCSV(bytes.NewReader(data), "fuzz.csv")
		if err != nil {
			return
		}
		b, err := BoundaryRatingFromTable(tab)
		if err != nil {
			return
		}
		if len(b.Points) < 2 {
			t.Fatalf("%d points accepted", len(b.Points))
		}
		for i := 1; i < len(b.Points); i++ {
			p, q := b.Points[i-1], b.Points[i]
			if !(q.Stage > p.Stage && q.Discharge > p.Discharge) || p.Discharge < 0 {
				t.Errorf("points %d, %d: %v then %v", i-1, i, p, q)
			}
		}
		for _, p := range b.Points {
			if math.Abs(p.Stage) > MaxElevation || p.Discharge > rating.MaxDischarge {
				t.Errorf("implausible point %v accepted", p)
			}
		}
		if _, err := b.Boundary(); err != nil {
			t.Errorf("accepted rating makes no boundary: %v", err)
		}
	})
}

// The slope-area method takes the distance between sections as each
// subreach's length (Dalrymple and Benson 1967, TWRI 3-A2): flow lengths
// in a reach table are not used (backwater reads them), and one warning
// says so, naming the columns given and the sections (the last section's
// are warned by ReachTable as unused for every method). A table without them, or with
// them blank, gives no such warning; a structure is warned as before.
func TestReachSlopeAreaWarnings(t *testing.T) {
	for _, tc := range []struct {
		name, table string
		want        []string
	}{
		{"none", "section,survey,distance,ws_left,ws_right\nA,a.csv,0,10.9,10.8\nB,a.csv,100,10.7,10.6\n", nil},
		{"blank", "section,survey,distance,ws_left,ws_right,left_length,channel_length,right_length\nA,a.csv,0,10.9,10.8,,,\nB,a.csv,100,10.7,10.6,,,\n", nil},
		{"channel and right", "section,survey,distance,ws_left,ws_right,left_length,channel_length,right_length\n" +
			"A,a.csv,0,10.9,10.8,,110,\nB,a.csv,100,10.7,10.6,,,95\nC,a.csv,200,10.5,10.4,,,\n",
			[]string{"reach.csv: the flow lengths in channel_length, right_length (sections A, B) are read by backwater only, not here: " +
				"the slope-area method takes the distance between sections as the length of each subreach (Dalrymple and Benson 1967)"}},
		{"structure", "section,survey,distance,ws_left,ws_right,structure\nA,a.csv,0,10.9,10.8,weir\nB,a.csv,100,10.7,10.6,\n",
			[]string{"section A is marked as at a structure (weir): the slope-area method assumes an open channel between the sections"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := reachFiles(t, map[string]string{"reach.csv": tc.table, "a.csv": reachSurveyCSV})
			r, err := ReadReach(filepath.Join(dir, "reach.csv"), "", SectionOptions{})
			if err != nil {
				t.Fatal(err)
			}
			got := r.SlopeAreaWarnings()
			for i := range got {
				got[i] = strings.ReplaceAll(got[i], filepath.Join(dir, "reach.csv"), "reach.csv")
			}
			if strings.Join(got, "\n") != strings.Join(tc.want, "\n") {
				t.Errorf("warnings\n%q\nwant\n%q", got, tc.want)
			}
		})
	}
}

// When neither the caller nor the reach table's headers name a unit
// system, the first survey whose headers name one decides (surveys in ft
// read as US units, not refused as "si units were asked for"), and a
// survey naming no unit beside it is refused (ErrUnitsUnnamed: alone it
// would be si units); a unit asked for, or named by the reach table,
// still decides, and a survey that disagrees is refused.
func TestReachResolveUnits(t *testing.T) {
	ft := "station (ft),elevation (ft),n\n0,12,0.05\n10,9,0.05\n20,12,\n"
	for _, tc := range []struct {
		name, head, a string
		u             rating.Units
		given         bool
		want          rating.Units
		resolveErr    error // of ResolveUnits
		err           bool  // of ReachSections
	}{
		{"surveys decide", "section,survey,distance,ws_left,ws_right", ft, rating.SI, false, rating.US, nil, false},
		{"a survey naming no unit beside feet", "section,survey,distance,ws_left,ws_right", reachSurveyCSV, rating.SI, false, rating.SI, ErrUnitsUnnamed, false},
		{"asked for", "section,survey,distance,ws_left,ws_right", reachSurveyCSV, rating.SI, true, rating.SI, nil, true},
		{"table decides", "section,survey,distance (m),ws_left,ws_right", reachSurveyCSV, rating.SI, false, rating.SI, ErrUnitsDisagree, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := reachFiles(t, map[string]string{"reach.csv": tc.head + "\nA,a.csv,0,11,11\nB,b.csv,100,10.9,10.9\n",
				"a.csv": tc.a, "b.csv": ft})
			r, err := ReadReach(filepath.Join(dir, "reach.csv"), "", SectionOptions{})
			if err != nil {
				t.Fatal(err)
			}
			u, err := r.ResolveUnits(tc.u, tc.given)
			if tc.resolveErr != nil {
				if !errors.Is(err, tc.resolveErr) {
					t.Fatalf("ResolveUnits: %v, want %v", err, tc.resolveErr)
				}
				return
			}
			if err != nil || u != tc.want {
				t.Fatalf("units %v, %v; want %v", u, err, tc.want)
			}
			_, err = r.ReachSections(u)
			if (err != nil) != tc.err || (err != nil && !errors.Is(err, ErrUnitsDisagree)) {
				t.Errorf("ReachSections(%v): %v, want an error %v", u, err, tc.err)
			}
		})
	}
}

// A reach table naming no site takes the site its surveys name, when they
// all name one (as the sheets of one field workbook do); surveys naming
// two sites give it none.
func TestReachSiteFromSurveys(t *testing.T) {
	dir := t.TempDir()
	write := func(name, text string) {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	xs := "station,elevation,n\n0,3,0.035\n4,0,0.035\n8,3\n"
	write("a.csv", "# site: Reedy Creek at Sawpit (invented)\n# surveyed: 2026-03-02\n"+xs)
	write("b.csv", "# site: Reedy Creek at Sawpit (invented)\n"+xs)
	write("c.csv", xs)
	write("d.csv", "# site: Another Creek (invented)\n"+xs)
	head := "section,survey,distance,ws_left,ws_right\n"
	write("same.csv", head+"XS-1,a.csv,0,2,2\nXS-2,b.csv,100,1.9,1.9\nXS-3,c.csv,200,1.8,1.8\n")
	write("two.csv", head+"XS-1,a.csv,0,2,2\nXS-2,d.csv,100,1.9,1.9\n")
	r, err := ReadReach(filepath.Join(dir, "same.csv"), "", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if r.Site != (rating.Site{Name: "Reedy Creek at Sawpit (invented)"}) {
		t.Errorf("site %+v, want the surveys' name alone", r.Site)
	}
	r, err = ReadReach(filepath.Join(dir, "two.csv"), "", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if r.Site.Known() {
		t.Errorf("surveys of two sites give the reach %+v", r.Site)
	}
}

// TestReachSameSurvey checks that two sections reading one survey, or
// surveys with the same ground, are warned of, naming both sections, and
// that distinct surveys are not.
func TestReachSameSurvey(t *testing.T) {
	other := strings.Replace(reachSurveyCSV, "14,9,", "15,8.6,", 1)
	for _, c := range []struct {
		name, b, c string
		files      map[string]string
		want       string
	}{
		{"same file", "a.csv", "b.csv", map[string]string{"b.csv": other}, "sections A and B read the same survey file"},
		{"same file other spelling", "b.csv", "./b.csv", map[string]string{"a.csv": reachSurveyCSV}, "sections B and C read the same survey file"},
		{"same ground", "b.csv", "c.csv", map[string]string{"a.csv": reachSurveyCSV, "c.csv": other}, "sections B and C have the same ground points"},
		{"distinct", "b.csv", "c.csv", map[string]string{"a.csv": reachSurveyCSV, "c.csv": reachSurveyCSV + "40,13,,\n"}, ""},
	} {
		t.Run(c.name, func(t *testing.T) {
			files := map[string]string{"a.csv": reachSurveyCSV, "b.csv": other,
				"reach.csv": "section,survey,distance,ws_left,ws_right\nA,a.csv,0,11,11\nB," + c.b + ",100,10.9,10.9\nC," + c.c + ",200,10.8,10.8\n"}
			for k, v := range c.files {
				files[k] = v
			}
			if c.name == "same file" {
				files["reach.csv"] = "section,survey,distance,ws_left,ws_right\nA,a.csv,0,11,11\nB,a.csv,100,10.9,10.9\nC,b.csv,200,10.8,10.8\n"
			}
			r, err := ReadReach(filepath.Join(reachFiles(t, files), "reach.csv"), "", SectionOptions{})
			if err != nil {
				t.Fatal(err)
			}
			var got []string
			for _, w := range r.Warnings {
				if strings.Contains(w, "two sections of a reach are two places") {
					got = append(got, w)
				}
			}
			switch {
			case c.want == "" && len(got) > 0:
				t.Errorf("warned %q", got)
			case c.want != "" && (len(got) != 1 || !strings.Contains(got[0], c.want)):
				t.Errorf("warnings %q, want one containing %q", got, c.want)
			}
		})
	}
}

// TestReachBackslashSurvey checks that a survey written with Windows
// folder separators is found with them read as '/', and that one found
// neither way is reported as written, not quoted with its backslashes
// doubled.
func TestReachBackslashSurvey(t *testing.T) {
	other := strings.Replace(reachSurveyCSV, "14,9,", "15,8.6,", 1)
	for _, c := range []struct {
		name, survey, want string
	}{
		{"found", `sub\b.csv`, ""},
		{"absent", `nowhere\b.csv`, `survey: nowhere\b.csv: no such survey file or sheet (looked for `},
	} {
		t.Run(c.name, func(t *testing.T) {
			dir := reachFiles(t, map[string]string{"a.csv": reachSurveyCSV,
				"reach.csv": "section,survey,distance,ws_left,ws_right\nA,a.csv,0,11,11\nB," + c.survey + ",100,10.9,10.9\n"})
			os.Mkdir(filepath.Join(dir, "sub"), 0o755)
			os.WriteFile(filepath.Join(dir, "sub", "b.csv"), []byte(other), 0o644)
			r, err := ReadReach(filepath.Join(dir, "reach.csv"), "", SectionOptions{})
			switch {
			case c.want == "" && err != nil:
				t.Fatal(err)
			case c.want == "":
				if got := r.Rows[1].Path; got != filepath.Join(dir, "sub", "b.csv") {
					t.Errorf("path %s", got)
				}
			case err == nil || !strings.Contains(err.Error(), c.want) || strings.Contains(err.Error(), `\\`) || !errors.Is(err, ErrSurveyAbsent):
				t.Errorf("error %v, want one containing %q, errors.Is ErrSurveyAbsent", err, c.want)
			}
		})
	}
}

// TestReachOtherSheetNamed checks that a workbook read without a sheet
// whose first sheet is not a reach table names the sheet holding one, and
// names none when no sheet does.
func TestReachOtherSheetNamed(t *testing.T) {
	surveyRows := [][]any{{"station", "elevation", "n"}, {0, 12, 0.05}, {10, 10, 0.04}, {20, 12, nil}}
	reachRows := [][]any{{"section", "survey", "distance", "ws_left", "ws_right"}, {"XS1", "XS-1", 0, 11.0, 10.96}}
	for _, c := range []struct {
		name   string
		sheets map[string][][]any
		order  []string
		want   string
	}{
		{"reach sheet later", map[string][][]any{"XS-1": surveyRows, "high water": reachRows}, []string{"XS-1", "high water"},
			"sheet high water holds one: give --sheet 'high water'"},
		{"no reach sheet", map[string][][]any{"XS-1": surveyRows, "XS-2": surveyRows}, []string{"XS-1", "XS-2"}, ""},
	} {
		t.Run(c.name, func(t *testing.T) {
			path := writeBook(t, t.TempDir(), c.sheets, c.order)
			_, err := ReadReach(path, "", SectionOptions{})
			if !errors.Is(err, ErrMissingColumn) {
				t.Fatalf("error %v, want ErrMissingColumn", err)
			}
			if named := strings.Contains(err.Error(), "--sheet"); named != (c.want != "") || !strings.Contains(err.Error(), c.want) {
				t.Errorf("error %v, want %q", err, c.want)
			}
		})
	}
}

// TestReachOppositeLine: a reach of three coordinate surveys across a
// river flowing south (invented), two shot from the east bank and one
// from the west with bank marks naming no side, so that its left is the
// first point surveyed and its banks come out swapped: the reach reader
// warns of that section alone (its line points 180° from the others').
func TestReachOppositeLine(t *testing.T) {
	section := func(north float64, fromEast bool) string {
		xs := []float64{40, 30, 22, 18, 10, 0}
		zs := []float64{14, 12, 9, 9.2, 12, 14}
		marks := []string{"", "bank", "", "", "bank", ""}
		var b strings.Builder
		b.WriteString("easting,northing,elevation,mark\n")
		for k := range xs {
			i := k
			if !fromEast {
				i = len(xs) - 1 - k
			}
			fmt.Fprintf(&b, "%g,%g,%g,%s\n", 1000+xs[i], 5000+north, zs[i]-north/1000, marks[i])
		}
		return b.String()
	}
	files := map[string]string{"a.csv": section(0, true), "b.csv": section(-100, false), "c.csv": section(-200, true),
		"reach.csv": "section,survey,distance,ws_left,ws_right\nA,a.csv,0,11,11\nB,b.csv,100,10.9,10.9\nC,c.csv,200,10.8,10.8\n"}
	r, err := ReadReach(filepath.Join(reachFiles(t, files), "reach.csv"), "", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, w := range r.Warnings {
		if strings.Contains(w, "point") && strings.Contains(w, "swapped") {
			got = append(got, w)
		}
	}
	if len(got) != 1 || !strings.HasPrefix(got[0], "section B:") {
		t.Errorf("warnings %q: want one naming section B", r.Warnings)
	}
}

// The station-gap warnings of a reach are rolled up into one line when
// more than one section has them, naming the first RolledSections; a
// section written by the shape command (its comment line kept) has none,
// and one gapped section keeps its own lines.
func TestReadReachGapsRolledUp(t *testing.T) {
	// Each section is set i × 0.1 m lower, so that no two have the same
	// ground points.
	const (
		gapped = "station,elevation,n\n0,6,0.03\n12,0,0.03\n22,0,0.03\n34,6,\n" // gaps 12, 10, 12 of 34 > 8.5
		dense  = "station,elevation,n\n0,6,0.03\n4,4,0.03\n8,2,0.03\n12,0,0.03\n17,0,0.03\n22,0,0.03\n26,2,0.03\n30,4,0.03\n34,6,\n"
		built  = "# " + BuiltPrefix + "trapezoid:bottom=10,left=2,right=2,height=6, lengths in m; invert at elevation 0.\n" + gapped
	)
	lowered := func(text string, by float64) string {
		lines := strings.Split(text, "\n")
		for j, l := range lines {
			if f := strings.Split(l, ","); len(f) == 3 {
				if z, err := strconv.ParseFloat(f[1], 64); err == nil {
					f[1] = strconv.FormatFloat(z-by, 'f', 1, 64)
					lines[j] = strings.Join(f, ",")
				}
			}
		}
		return strings.Join(lines, "\n")
	}
	for _, c := range []struct {
		name    string
		surveys []string
		lines   int    // warnings naming a single gap
		rolled  string // in the one rolled-up warning; "" for none
		absent  string // in no warning
	}{
		{"one gapped section", []string{gapped, dense, built}, 3, "", "sections have gaps"},
		{"five gapped sections", []string{gapped, gapped, built, gapped, gapped, gapped},
			0, "5 sections have gaps between consecutive stations over 25 % of the section width: " +
				"S0 (3 gaps, up to 12 m; s0.csv:3), S1 (3 gaps, up to 12 m; s1.csv:3), S3 (3 gaps, up to 12 m; s3.csv:3) and 2 more: check for missing points", "S2"},
	} {
		t.Run(c.name, func(t *testing.T) {
			files := map[string]string{}
			table := "section,survey,distance\n"
			for i, sv := range c.surveys {
				files[fmt.Sprintf("s%d.csv", i)] = lowered(sv, 0.1*float64(i))
				table += fmt.Sprintf("S%d,s%d.csv,%d\n", i, i, 100*i)
			}
			files["reach.csv"] = table
			dir := reachFiles(t, files)
			r, err := ReadReachWith(filepath.Join(dir, "reach.csv"), "", ReachOptions{Section: SectionOptions{IgnoreBankMarks: true}, MarksOptional: true})
			if err != nil {
				t.Fatal(err)
			}
			lines, rolled := 0, []string{}
			for _, w := range r.Warnings {
				if strings.Contains(w, "gap of") {
					lines++
				}
				if strings.Contains(w, "sections have gaps") {
					rolled = append(rolled, w)
				}
				if c.absent != "" && strings.Contains(w, c.absent) && strings.Contains(w, "gap") {
					t.Errorf("warning %q names %s", w, c.absent)
				}
			}
			all := strings.Join(r.Warnings, "\n")
			if lines != c.lines {
				t.Errorf("%d single-gap warnings, want %d:\n%s", lines, c.lines, all)
			}
			if c.rolled == "" && len(rolled) > 0 || c.rolled != "" && (len(rolled) != 1 || !strings.Contains(strings.ReplaceAll(rolled[0], dir+string(filepath.Separator), ""), c.rolled)) {
				t.Errorf("rolled-up warnings %q, want one with %q", rolled, c.rolled)
			}
		})
	}
}

// A reach table's survey names a sheet of its workbook in any case, as
// spreadsheet programs match sheet names; two sheets differing only in
// case are refused as ambiguous (names edited into the workbook, as
// spreadsheet programs and the library do not make such a pair).
func TestReachSurveySheetAnyCase(t *testing.T) {
	surveyRows := [][]any{{"station", "elevation", "n"}, {0, 12, 0.05}, {10, 10, 0.04}, {20, 12, nil}}
	reachRows := [][]any{{"section", "survey", "distance", "ws_left", "ws_right"}, {"XS3", "xs-3 ford", 0, 11.0, 10.96}}
	path := writeBook(t, t.TempDir(), map[string][][]any{"reach": reachRows, "XS-3 Ford": surveyRows, "XS-4": surveyRows},
		[]string{"reach", "XS-3 Ford", "XS-4"})
	r, err := ReadReach(path, "reach", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if r.Rows[0].Sheet != "XS-3 Ford" {
		t.Errorf("survey sheet %q, want XS-3 Ford", r.Rows[0].Sheet)
	}

	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	twin := rewriteZip(t, data, func(name string, b []byte) []byte {
		if name == "xl/workbook.xml" {
			return bytes.Replace(b, []byte(`name="XS-4"`), []byte(`name="xs-3 FORD"`), 1)
		}
		return b
	})
	path = filepath.Join(t.TempDir(), "twin.xlsx")
	if err := os.WriteFile(path, twin, 0o644); err != nil {
		t.Fatal(err)
	}
	_, err = ReadReach(path, "reach", SectionOptions{})
	var pe *ParseError
	if !errors.Is(err, ErrSurveySheetAmbiguous) || !errors.As(err, &pe) || pe.Row != 2 {
		t.Errorf("two sheets alike but for case: %v, want ErrSurveySheetAmbiguous at row 2", err)
	}
}
