package survey

import (
	"bytes"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/reach"
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
		{"distance not increasing", head + "A,a.csv,100,10,,\nB,a.csv,100,9,,\n", ErrDistanceOrder, "reach.csv:3:3"},
		{"distance decreasing", head + "A,a.csv,100,10,,\nB,a.csv,50,9,,\n", ErrDistanceOrder, "reach.csv:3:3"},
		{"no marks", head + "A,a.csv,0,,,\n", ErrNoHighWaterMark, "reach.csv:2:4"},
		{"decimal comma", head + "A,a.csv,0,\"10,5\",,\n", ErrDecimalComma, "reach.csv:2:4"},
		{"bad quality", head + "A,a.csv,0,10,,splendid\n", ErrMarkQuality, "reach.csv:2:6"},
		{"unknown survey file", head + "A,nothere.csv,0,10,,\n", ErrSurveyAbsent, "reach.csv:2:2"},
		{"bad survey", head + "A,bad.csv,0,10,,\n", ErrNotNumber, "bad.csv:2:2"},
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
