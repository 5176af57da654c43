package survey_test

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"wetline/rating"
	"wetline/subdivide"
	"wetline/survey"
)

// writeTemplate writes a blank field workbook into a temporary folder.
func writeTemplate(t *testing.T, opt survey.TemplateOptions) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), "field.xlsx")
	var buf bytes.Buffer
	if err := survey.WriteTemplate(&buf, opt); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func openBook(t *testing.T, path string) *excelize.File {
	t.Helper()
	f, err := excelize.OpenFile(path, excelize.Options{RawCellValue: true})
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { f.Close() })
	return f
}

func TestTemplateSheets(t *testing.T) {
	for _, tc := range []struct {
		name     string
		opt      survey.TemplateOptions
		sheets   []string
		xsHeader []string
		gauging  []string
	}{
		{"default SI", survey.TemplateOptions{},
			[]string{"XS-1", "XS-2", "XS-3", "reach", "gaugings", "instructions"},
			[]string{"station (m)", "elevation (m)", "n", "mark", "note"},
			[]string{"time", "stage (m)", "discharge (m3/s)", "quality", "note"}},
		{"one section, US", survey.TemplateOptions{Sections: 1, Units: rating.US, Rows: 20},
			[]string{"XS-1", "reach", "gaugings", "instructions"},
			[]string{"station (ft)", "elevation (ft)", "n", "mark", "note"},
			[]string{"time", "stage (ft)", "discharge (ft3/s)", "quality", "note"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			f := openBook(t, writeTemplate(t, tc.opt))
			if got := f.GetSheetList(); !slices.Equal(got, tc.sheets) {
				t.Fatalf("sheets %v, want %v", got, tc.sheets)
			}
			if got := f.GetSheetName(f.GetActiveSheetIndex()); got != "instructions" {
				t.Errorf("opens on %q, want instructions", got)
			}
			rows := tc.opt.Rows
			if rows == 0 {
				rows = survey.DefaultTemplateRows
			}
			L := tc.opt.Units.Length()
			headers := map[string][]string{
				"XS-1":     tc.xsHeader,
				"reach":    {"section", "survey", "distance (" + L + ")", "ws_left (" + L + ")", "ws_right (" + L + ")", "quality", "note"},
				"gaugings": tc.gauging,
			}
			// Validation rules by sheet: type per column letter.
			rules := map[string]map[string]string{
				"XS-1":     {"A": "decimal", "B": "decimal", "C": "decimal", "D": "list"},
				"reach":    {"C": "decimal", "D": "decimal", "E": "decimal", "F": "list"},
				"gaugings": {"A": "date", "B": "decimal", "C": "decimal", "D": "list"},
			}
			for sheet, want := range headers {
				got, err := f.GetRows(sheet)
				if err != nil {
					t.Fatal(err)
				}
				if len(got) != 1 || !slices.Equal(got[0], want) {
					t.Errorf("%s: rows %q, want only the header %q", sheet, got, want)
				}
				panes, err := f.GetPanes(sheet)
				if err != nil {
					t.Fatal(err)
				}
				if !panes.Freeze || panes.YSplit != 1 {
					t.Errorf("%s: header not frozen: %+v", sheet, panes)
				}
				style, err := f.GetCellStyle(sheet, "A1")
				if err != nil {
					t.Fatal(err)
				}
				st, err := f.GetStyle(style)
				if err != nil {
					t.Fatal(err)
				}
				if st.Font == nil || !st.Font.Bold || len(st.Fill.Color) == 0 {
					t.Errorf("%s: header cell not styled: %+v", sheet, st)
				}
				for i := range want {
					col, _ := excelize.ColumnNumberToName(i + 1)
					if w, _ := f.GetColWidth(sheet, col); w < 8 {
						t.Errorf("%s: column %s width %g", sheet, col, w)
					}
				}
				dvs, err := f.GetDataValidations(sheet)
				if err != nil {
					t.Fatal(err)
				}
				found := map[string]*excelize.DataValidation{}
				for _, dv := range dvs {
					found[strings.SplitN(dv.Sqref, "2:", 2)[0]] = dv
					if !strings.HasSuffix(dv.Sqref, "2:"+dv.Sqref[:1]+strconv.Itoa(rows+1)) {
						t.Errorf("%s: rule on %s, want rows 2 to %d", sheet, dv.Sqref, rows+1)
					}
				}
				for col, typ := range rules[sheet] {
					dv := found[col]
					if dv == nil {
						t.Errorf("%s: no validation rule on column %s", sheet, col)
						continue
					}
					if dv.Type != typ {
						t.Errorf("%s!%s: rule type %q, want %q", sheet, col, dv.Type, typ)
					}
				}
			}
			// Drop-down lists: marks suggest (no error alert: free labels
			// allowed); qualities are strict.
			dvs, _ := f.GetDataValidations("XS-1")
			for _, dv := range dvs {
				if dv.Type == "list" {
					if !strings.Contains(dv.Formula1, "bank") || dv.ShowErrorMessage {
						t.Errorf("mark list %q, error alert %v: want bank and free labels", dv.Formula1, dv.ShowErrorMessage)
					}
				}
			}
			dvs, _ = f.GetDataValidations("gaugings")
			for _, dv := range dvs {
				if dv.Type == "list" {
					if dv.Formula1 != `"excellent,good,fair,poor"` || !dv.ShowErrorMessage {
						t.Errorf("quality list %q, error alert %v", dv.Formula1, dv.ShowErrorMessage)
					}
				}
			}
			instr, err := f.GetRows("instructions")
			if err != nil {
				t.Fatal(err)
			}
			text := ""
			for _, r := range instr {
				text += strings.Join(r, " ") + "\n"
			}
			for _, want := range []string{rating.Caution, L, tc.opt.Units.Discharge(), "bank"} {
				if !strings.Contains(text, want) {
					t.Errorf("instructions lack %q", want)
				}
			}
		})
	}
}

// TestTemplateEmptyReads checks that every blank sheet reads back through
// ReadTable with its columns found and no records.
func TestTemplateEmptyReads(t *testing.T) {
	path := writeTemplate(t, survey.TemplateOptions{})
	for sheet, cols := range map[string][]string{
		"XS-2":     {"station", "elevation", "n", "mark", "note"},
		"reach":    {"section", "survey", "distance", "ws_left", "ws_right", "quality", "note"},
		"gaugings": {"time", "stage", "discharge", "quality", "note"},
	} {
		tab, err := survey.ReadTable(path, sheet)
		if err != nil {
			t.Fatal(err)
		}
		if tab.HeaderRow != 1 || len(tab.Records) != 0 {
			t.Errorf("%s: header row %d, %d records", sheet, tab.HeaderRow, len(tab.Records))
		}
		for i, c := range cols {
			if got := tab.Column(c); got != i {
				t.Errorf("%s: column %q at %d, want %d", sheet, c, got, i)
			}
		}
	}
	_, err := survey.ReadSection(path, "XS-1", survey.SectionOptions{})
	if !errors.Is(err, subdivide.ErrTooFewPoints) {
		t.Errorf("blank section: %v, want ErrTooFewPoints", err)
	}
}

func TestTemplateOptionsBounds(t *testing.T) {
	for _, opt := range []survey.TemplateOptions{{Sections: -1}, {Sections: survey.MaxTemplateSections + 1}, {Rows: -5}} {
		if err := survey.WriteTemplate(&bytes.Buffer{}, opt); err == nil {
			t.Errorf("%+v: no error", opt)
		}
	}
}

// fillSheet writes rows of values from A2 down.
func fillSheet(t *testing.T, f *excelize.File, sheet string, startRow int, rows [][]any) {
	t.Helper()
	for i, r := range rows {
		cell, _ := excelize.CoordinatesToCellName(1, startRow+i)
		if err := f.SetSheetRow(sheet, cell, &r); err != nil {
			t.Fatal(err)
		}
	}
}

// TestFilledTemplateReads fills a template the way crews do: numbers typed
// as text, a blank row in the middle, an extra column, dates as serials
// and as text.
func TestFilledTemplateReads(t *testing.T) {
	path := writeTemplate(t, survey.TemplateOptions{})
	f, err := excelize.OpenFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if err := f.SetCellValue("XS-2", "F1", "crew"); err != nil { // extra column
		t.Fatal(err)
	}
	fillSheet(t, f, "XS-2", 2, [][]any{
		{0.0, 10.5, 0.05, "", "left pin", "AB"},
		{"4.0", "9.25", nil, "bank", "", "AB"}, // numbers stored as text
		{},                                     // blank row
		{8.0, 8.1, 0.035, "thalweg", "", ""},
		{" 12 ", 9.3, 0.06, "Bank", "", ""},
		{16.0, 10.4, nil, nil, "right pin", ""},
	})
	dt := time.Date(2026, 3, 14, 9, 30, 0, 0, time.UTC)
	fillSheet(t, f, "gaugings", 2, [][]any{
		{dt, 1.25, 3.4, "good", ""},
		{"2026-04-02 16:45", "1.6", "7.9", "fair", "text date"},
		{},
		{"14/03/2026", 1.1, 2.0, "poor", "ambiguous date"},
	})
	if err := f.Save(); err != nil {
		t.Fatal(err)
	}
	f.Close()

	sv, err := survey.ReadSection(path, "XS-2", survey.SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	wantX := []float64{0, 4, 8, 12, 16}
	for i, p := range sv.Section.Points {
		if p.Station != wantX[i] {
			t.Errorf("point %d station %g, want %g", i, p.Station, wantX[i])
		}
	}
	if !sv.Section.HasBanks || sv.Section.LeftBank != 4 || sv.Section.RightBank != 12 {
		t.Errorf("banks %v %g %g, want 4 and 12", sv.Section.HasBanks, sv.Section.LeftBank, sv.Section.RightBank)
	}
	if want := []float64{0.05, 0.05, 0.035, 0.06}; !slices.Equal(sv.Section.N, want) {
		t.Errorf("n %v, want %v", sv.Section.N, want)
	}
	if want := []int{2, 3, 5, 6, 7}; !slices.Equal(sv.Rows, want) {
		t.Errorf("rows %v, want %v (row 4 blank)", sv.Rows, want)
	}
	if sv.Section.Name != "XS-2" || sv.Labels[2] != "thalweg" {
		t.Errorf("name %q, labels %q", sv.Section.Name, sv.Labels)
	}

	tab, err := survey.ReadTable(path, "gaugings")
	if err != nil {
		t.Fatal(err)
	}
	ct, cs := tab.Column(survey.GaugingColumns()[0]), tab.Column(survey.GaugingColumns()[1])
	want := []time.Time{dt, time.Date(2026, 4, 2, 16, 45, 0, 0, time.UTC)}
	for i, w := range want {
		got, ok, err := tab.Time(tab.Records[i], ct)
		if err != nil || !ok || !got.Equal(w) {
			t.Errorf("gauging %d: time %v %v %v, want %v", i, got, ok, err, w)
		}
		if h, ok, err := tab.Float(tab.Records[i], cs); err != nil || !ok || h != []float64{1.25, 1.6}[i] {
			t.Errorf("gauging %d: stage %g %v %v", i, h, ok, err)
		}
	}
	_, _, err = tab.Time(tab.Records[2], ct)
	var pe *survey.ParseError
	if !errors.As(err, &pe) || !errors.Is(err, survey.ErrBadTime) {
		t.Fatalf("day-first date: %v, want ErrNotTime", err)
	}
	if want := "field.xlsx['gaugings']!A5"; !strings.HasSuffix(pe.Position(), want) {
		t.Errorf("position %q, want …%s", pe.Position(), want)
	}
}

// TestWorkbookCellErrors checks that a bad cell is reported by sheet, row
// and column, every bad cell of a sheet at once.
func TestWorkbookCellErrors(t *testing.T) {
	path := writeTemplate(t, survey.TemplateOptions{})
	f, err := excelize.OpenFile(path)
	if err != nil {
		t.Fatal(err)
	}
	rows := make([][]any, 13)
	for i := range rows {
		rows[i] = []any{float64(i), 100 - float64(i%3), 0.04}
	}
	rows[12][2] = "0,04" // C14: decimal comma
	rows[5][1] = "1O2.5" // B7: letter O for zero
	fillSheet(t, f, "XS-2", 2, rows)
	if err := f.Save(); err != nil {
		t.Fatal(err)
	}
	f.Close()
	_, err = survey.ReadSection(path, "XS-2", survey.SectionOptions{})
	if err == nil {
		t.Fatal("no error")
	}
	for _, want := range []string{
		path + `['XS-2']!B7: elevation (m) "1O2.5": not a number`,
		path + `['XS-2']!C14: n "0,04": decimal comma`,
	} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("error\n%s\nlacks\n%s", err, want)
		}
	}
	var pe *survey.ParseError
	if !errors.As(err, &pe) || pe.Sheet != "XS-2" {
		t.Errorf("not a ParseError with the sheet: %#v", err)
	}
}

// A bare number in a CSV file is no date: only a workbook cell holds
// serials.
func TestTableTimeSerialInCSV(t *testing.T) {
	tab := &survey.Table{File: "g.csv", Header: []string{"time"}, Records: []survey.Record{{Row: 2, Cells: []string{"45000"}}}}
	if _, _, err := tab.Time(tab.Records[0], 0); !errors.Is(err, survey.ErrSerialInCSV) {
		t.Errorf("serial in CSV: %v, want ErrSerialInCSV", err)
	}
}

func TestTableTime(t *testing.T) {
	// Serial day numbers per ECMA-376 Part 1, 18.17.4.1: in the 1900 date
	// system day 1 is 1900-01-01 and, because of the phantom 1900-02-29,
	// serial s ≥ 61 is s days after 1899-12-30; in the 1904 system serial s
	// is s days after 1904-01-01.
	base1900 := time.Date(1899, 12, 30, 0, 0, 0, 0, time.UTC)
	base1904 := time.Date(1904, 1, 1, 0, 0, 0, 0, time.UTC)
	for _, tc := range []struct {
		cell     string
		date1904 bool
		want     time.Time
		err      error
	}{
		{"45000", false, base1900.AddDate(0, 0, 45000), nil},
		{"45000.5", false, base1900.AddDate(0, 0, 45000).Add(12 * time.Hour), nil},
		{"45000", true, base1904.AddDate(0, 0, 45000), nil},
		{"2026-03-14 09:30", false, time.Date(2026, 3, 14, 9, 30, 0, 0, time.UTC), nil},
		{"2026-03-14T09:30:15", false, time.Date(2026, 3, 14, 9, 30, 15, 0, time.UTC), nil},
		{"2026-03-14T09:30:00-05:00", false, time.Date(2026, 3, 14, 14, 30, 0, 0, time.UTC), nil},
		{"2026-03-14", false, time.Date(2026, 3, 14, 0, 0, 0, 0, time.UTC), nil},
		{"03/14/2026", false, time.Time{}, survey.ErrBadTime},
		{"-3", false, time.Time{}, survey.ErrBadTime},
		{"1e9", false, time.Time{}, survey.ErrBadTime},
		{"NaN", false, time.Time{}, survey.ErrBadTime},
	} {
		tab := &survey.Table{File: "g.xlsx", Sheet: "gaugings", Header: []string{"time"}, Date1904: tc.date1904,
			Records: []survey.Record{{Row: 2, Cells: []string{tc.cell}}}}
		got, ok, err := tab.Time(tab.Records[0], 0)
		if tc.err != nil {
			if !errors.Is(err, tc.err) || ok {
				t.Errorf("%q: %v %v, want %v", tc.cell, ok, err, tc.err)
			}
			continue
		}
		if err != nil || !ok || !got.Equal(tc.want) {
			t.Errorf("%q (1904 %v): %v %v %v, want %v", tc.cell, tc.date1904, got, ok, err, tc.want)
		}
	}
}

// TestTemplatePrefilled writes the demo survey (invented data) into a
// field workbook and reads it back: the same points, n, banks, labels and
// notes.
func TestTemplatePrefilled(t *testing.T) {
	orig, err := survey.ReadSection("../testdata/tallow-xs1.csv", "", survey.SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	odd := orig
	odd.Section.Name = "bad/name"
	path := writeTemplate(t, survey.TemplateOptions{Surveys: []survey.Survey{orig, odd, orig}, Sections: 4, Rows: 10})
	f := openBook(t, path)
	if got, want := f.GetSheetList(), []string{"tallow-xs1", "XS-1", "XS-2", "XS-3", "reach", "gaugings", "instructions"}; !slices.Equal(got, want) {
		t.Fatalf("sheets %v, want %v", got, want)
	}
	for _, sheet := range []string{"tallow-xs1", "XS-1", "XS-2"} {
		got, err := survey.ReadSection(path, sheet, survey.SectionOptions{})
		if err != nil {
			t.Fatal(err)
		}
		a, b := got.Section, orig.Section
		if !slices.Equal(a.Points, b.Points) || !slices.Equal(a.N, b.N) || a.HasBanks != b.HasBanks ||
			a.LeftBank != b.LeftBank || a.RightBank != b.RightBank ||
			!slices.Equal(got.Labels, orig.Labels) || !slices.Equal(got.Notes, orig.Notes) {
			t.Errorf("%s: read back %+v, want %+v", sheet, got, orig)
		}
	}
	// Validation rules cover every prefilled row even when Rows is smaller.
	dvs, err := f.GetDataValidations("tallow-xs1")
	if err != nil || len(dvs) == 0 || dvs[0].Sqref != "A2:A"+strconv.Itoa(len(orig.Section.Points)+1) {
		t.Errorf("rules %v %v", dvs, err)
	}
	if _, err := survey.ReadSection(path, "XS-3", survey.SectionOptions{}); !errors.Is(err, subdivide.ErrTooFewPoints) {
		t.Errorf("XS-3 should be blank: %v", err)
	}
}
