package survey_test

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

// headerRow returns the row of a field workbook sheet's column headers.
func headerRow(sheet string) int {
	switch sheet {
	case survey.FieldSheetReach, survey.FieldSheetInstructions:
		return 1
	}
	return survey.SectionHeaderRow
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
			[]string{"XS-1", "XS-2", "XS-3", "coordinates", "reach", "gaugings", "instructions"},
			[]string{"station (m)", "elevation (m)", "n", "mark", "note"},
			[]string{"time", "stage (m)", "discharge (m3/s)", "quality", "uncertainty (%)", "exclude", "note"}},
		{"one section, US", survey.TemplateOptions{Sections: 1, Units: rating.US, Rows: 20},
			[]string{"XS-1", "coordinates", "reach", "gaugings", "instructions"},
			[]string{"station (ft)", "elevation (ft)", "n", "mark", "note"},
			[]string{"time", "stage (ft)", "discharge (ft3/s)", "quality", "uncertainty (%)", "exclude", "note"}},
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
				"XS-1":        tc.xsHeader,
				"coordinates": {"easting (" + L + ")", "northing (" + L + ")", "elevation (" + L + ")", "n", "mark", "note"},
				"reach": {"section", "survey", "distance (" + L + ")", "ws_left (" + L + ")", "ws_right (" + L + ")", "quality",
					"left_length (" + L + ")", "channel_length (" + L + ")", "right_length (" + L + ")", "structure", "note"},
				"gaugings": tc.gauging,
			}
			// Validation rules by sheet: type per column letter.
			rules := map[string]map[string]string{
				"XS-1":        {"A": "decimal", "B": "decimal", "C": "decimal", "D": "list"},
				"coordinates": {"A": "decimal", "B": "decimal", "C": "decimal", "D": "decimal", "E": "list"},
				"reach":       {"C": "decimal", "D": "decimal", "E": "decimal", "F": "list", "G": "decimal", "H": "decimal", "I": "decimal", "J": "list"},
				"gaugings":    {"A": "date", "B": "decimal", "C": "decimal", "D": "list", "E": "decimal"},
			}
			for sheet, want := range headers {
				hr := headerRow(sheet)
				got, err := f.GetRows(sheet)
				if err != nil {
					t.Fatal(err)
				}
				if len(got) != hr || !slices.Equal(got[hr-1], want) {
					t.Errorf("%s: rows %q, want only the header %q in row %d", sheet, got, want, hr)
					continue
				}
				for i, k := range survey.MetaKeys()[:hr-1] {
					if !slices.Equal(got[i], []string{k}) {
						t.Errorf("%s: row %d %q, want the key %q", sheet, i+1, got[i], k)
					}
				}
				panes, err := f.GetPanes(sheet)
				if err != nil {
					t.Fatal(err)
				}
				if !panes.Freeze || panes.YSplit != hr {
					t.Errorf("%s: header not frozen: %+v", sheet, panes)
				}
				style, err := f.GetCellStyle(sheet, "A"+strconv.Itoa(hr))
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
				first, last := strconv.Itoa(hr+1)+":", strconv.Itoa(hr+rows)
				for _, dv := range dvs {
					if hr > 1 && !strings.Contains(dv.Sqref, ":") {
						continue // a site block cell, checked in TestTemplateSiteBlock
					}
					found[strings.SplitN(dv.Sqref, first, 2)[0]] = dv
					if !strings.HasSuffix(dv.Sqref, first+dv.Sqref[:1]+last) {
						t.Errorf("%s: rule on %s, want rows %d to %d", sheet, dv.Sqref, hr+1, hr+rows)
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
			for sheet, want := range map[string]string{"XS-1": "bank", "coordinates": "left pin,right pin,bank"} {
				dvs, _ := f.GetDataValidations(sheet)
				for _, dv := range dvs {
					if dv.Type == "list" {
						if !strings.Contains(dv.Formula1, want) || dv.ShowErrorMessage {
							t.Errorf("%s: mark list %q, error alert %v: want %s and free labels", sheet, dv.Formula1, dv.ShowErrorMessage, want)
						}
					}
				}
			}
			dvs, _ := f.GetDataValidations("gaugings")
			for _, dv := range dvs {
				switch {
				case dv.Type == "list":
					if dv.Formula1 != `"excellent,good,fair,poor,E,G,F,P"` || !dv.ShowErrorMessage {
						t.Errorf("quality list %q, error alert %v", dv.Formula1, dv.ShowErrorMessage)
					}
				case strings.HasPrefix(dv.Sqref, "E"):
					// The reader takes uncertainties strictly between 0 and 100 %.
					lo, _ := strconv.ParseFloat(dv.Formula1, 64)
					hi, _ := strconv.ParseFloat(dv.Formula2, 64)
					if !(lo > 0 && lo < 1e-6 && hi < survey.MaxUncertaintyPercent && hi > survey.MaxUncertaintyPercent-1e-6) || !dv.ShowErrorMessage {
						t.Errorf("uncertainty rule %q to %q, error alert %v", dv.Formula1, dv.Formula2, dv.ShowErrorMessage)
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
			for _, want := range []string{rating.Caution, L, tc.opt.Units.Discharge(), "bank", "left pin", "uncertainty", "exclude",
				"channel_length", "structure", "site id"} {
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
		"XS-2":        {"station", "elevation", "n", "mark", "note"},
		"coordinates": {"easting", "northing", "elevation", "n", "mark", "note"},
		"reach": {"section", "survey", "distance", "ws_left", "ws_right", "quality",
			"left_length", "channel_length", "right_length", "structure", "note"},
		"gaugings": {"time", "stage", "discharge", "quality", "uncertainty", "exclude", "note"},
	} {
		tab, err := survey.ReadTable(path, sheet)
		if err != nil {
			t.Fatal(err)
		}
		if tab.HeaderRow != headerRow(sheet) || len(tab.Records) != 0 {
			t.Errorf("%s: header row %d, %d records", sheet, tab.HeaderRow, len(tab.Records))
		}
		for i, c := range cols {
			if got := tab.Column(c); got != i {
				t.Errorf("%s: column %q at %d, want %d", sheet, c, got, i)
			}
		}
	}
	for _, sheet := range []string{"XS-1", "coordinates"} {
		_, err := survey.ReadSection(path, sheet, survey.SectionOptions{})
		if !errors.Is(err, subdivide.ErrTooFewPoints) {
			t.Errorf("blank %s: %v, want ErrTooFewPoints", sheet, err)
		}
	}
	// The site blocks do not hide the surveys' headers.
	got, err := survey.SectionSheets(path)
	if want := []string{"XS-1", "XS-2", "XS-3", "coordinates"}; err != nil || !slices.Equal(got, want) {
		t.Errorf("section sheets %q %v, want %q", got, err, want)
	}
}

func TestTemplateOptionsBounds(t *testing.T) {
	for _, opt := range []survey.TemplateOptions{{Sections: -1}, {Sections: survey.MaxTemplateSections + 1}, {Rows: -5}} {
		if err := survey.WriteTemplate(&bytes.Buffer{}, opt); err == nil {
			t.Errorf("%+v: no error", opt)
		}
	}
}

// fillSheet writes rows of values from row startRow down.
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
	hr := survey.SectionHeaderRow
	if err := f.SetCellValue("XS-2", "F"+strconv.Itoa(hr), "crew"); err != nil { // extra column
		t.Fatal(err)
	}
	fillSheet(t, f, "XS-2", hr+1, [][]any{
		{0.0, 10.5, 0.05, "", "left pin", "AB"},
		{"4.0", "9.25", nil, "bank", "", "AB"}, // numbers stored as text
		{},                                     // blank row
		{8.0, 8.1, 0.035, "thalweg", "", ""},
		{" 12 ", 9.3, 0.06, "Bank", "", ""},
		{16.0, 10.4, nil, nil, "right pin", ""},
	})
	dt := time.Date(2026, 3, 14, 9, 30, 0, 0, time.UTC)
	gr := headerRow(survey.FieldSheetGaugings)
	fillSheet(t, f, "gaugings", gr+1, [][]any{
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
	if want := []int{hr + 1, hr + 2, hr + 4, hr + 5, hr + 6}; !slices.Equal(sv.Rows, want) {
		t.Errorf("rows %v, want %v (row %d blank)", sv.Rows, want, hr+3)
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
	if !errors.As(err, &pe) || !errors.Is(err, survey.ErrISOTime) {
		t.Fatalf("day-first date: %v, want ErrISOTime", err)
	}
	if want := fmt.Sprintf("field.xlsx['gaugings']!A%d", gr+4); !strings.HasSuffix(pe.Position(), want) {
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
	rows[12][2] = "0,04" // C19: decimal comma
	rows[5][1] = "1O2.5" // B12: letter O for zero
	fillSheet(t, f, "XS-2", survey.SectionHeaderRow+1, rows)
	if err := f.Save(); err != nil {
		t.Fatal(err)
	}
	f.Close()
	_, err = survey.ReadSection(path, "XS-2", survey.SectionOptions{})
	if err == nil {
		t.Fatal("no error")
	}
	for _, want := range []string{
		path + `['XS-2']!B12: elevation (m) "1O2.5": not a number`,
		path + `['XS-2']!C19: n "0,04": decimal comma`,
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
		{"03/14/2026", false, time.Time{}, survey.ErrISOTime},
		{"-3", false, time.Time{}, survey.ErrISOTime},
		{"1e9", false, time.Time{}, survey.ErrISOTime},
		{"NaN", false, time.Time{}, survey.ErrISOTime},
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
	if got, want := f.GetSheetList(), []string{"tallow-xs1", "XS-1", "XS-2", "XS-3", "coordinates", "reach", "gaugings", "instructions"}; !slices.Equal(got, want) {
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
	hr := survey.SectionHeaderRow
	if err != nil || len(dvs) == 0 || dvs[0].Sqref != "A"+strconv.Itoa(hr+1)+":A"+strconv.Itoa(len(orig.Section.Points)+hr) {
		t.Errorf("rules %v %v", dvs, err)
	}
	if _, err := survey.ReadSection(path, "XS-3", survey.SectionOptions{}); !errors.Is(err, subdivide.ErrTooFewPoints) {
		t.Errorf("XS-3 should be blank: %v", err)
	}
}

// The site block holds one key row per metadata key above the header, so
// the header row follows it.
func TestSectionHeaderRowFollowsSiteBlock(t *testing.T) {
	if got, want := survey.SectionHeaderRow, len(survey.MetaKeys())+1; got != want {
		t.Errorf("SectionHeaderRow %d, want %d (one row per metadata key, then the header)", got, want)
	}
}

// TestTemplateSiteBlock writes a survey carrying a site into a template
// and reads the sheet back: the same site and the same section, through
// ReadSection and the sheet lister. Blank sheets have blank site blocks
// whose value cells prompt for the value.
func TestTemplateSiteBlock(t *testing.T) {
	orig, err := survey.ReadSection("../testdata/tallow-xs1.csv", "", survey.SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	orig.Site = rating.Site{Name: "Tallow Creek at Mill Lane (invented)", ID: "0412", Surveyed: "2026-05-14",
		Datum: "local, BM-3 at 105.000", Crew: "AB, CD; level and staff"}
	path := writeTemplate(t, survey.TemplateOptions{Surveys: []survey.Survey{orig}, Rows: 10})
	got, err := survey.ReadSection(path, "tallow-xs1", survey.SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if got.Site != orig.Site {
		t.Errorf("site %+v, want %+v", got.Site, orig.Site)
	}
	a, b := got.Section, orig.Section
	if !slices.Equal(a.Points, b.Points) || !slices.Equal(a.N, b.N) || a.HasBanks != b.HasBanks ||
		a.LeftBank != b.LeftBank || a.RightBank != b.RightBank || !slices.Equal(got.Labels, orig.Labels) || !slices.Equal(got.Notes, orig.Notes) {
		t.Errorf("section read back %+v, want %+v", a, b)
	}
	if want := survey.SectionHeaderRow + 1; got.Rows[0] != want {
		t.Errorf("first point in row %d, want %d", got.Rows[0], want)
	}
	tab, err := survey.ReadTable(path, "XS-1")
	if err != nil {
		t.Fatal(err)
	}
	if tab.Site() != (rating.Site{}) || len(tab.Meta) != len(survey.MetaKeys()) {
		t.Errorf("blank sheet: site %+v, meta %q", tab.Site(), tab.Meta)
	}
	f := openBook(t, path)
	for _, sheet := range []string{"tallow-xs1", "XS-1", "coordinates", survey.FieldSheetGaugings} {
		dvs, err := f.GetDataValidations(sheet)
		if err != nil {
			t.Fatal(err)
		}
		prompts := map[string]string{}
		for _, dv := range dvs {
			if dv.ShowInputMessage && dv.Prompt != nil && dv.PromptTitle != nil {
				prompts[dv.Sqref] = *dv.PromptTitle
			}
		}
		for i, k := range survey.MetaKeys() {
			if cell := "B" + strconv.Itoa(i+1); prompts[cell] != k {
				t.Errorf("%s!%s: prompt %q, want one for %q", sheet, cell, prompts[cell], k)
			}
		}
		// A date typed as a value stays text: the value cells are text.
		id, err := f.GetCellStyle(sheet, "B3")
		if err != nil {
			t.Fatal(err)
		}
		if st, err := f.GetStyle(id); err != nil || st.CustomNumFmt == nil || *st.CustomNumFmt != "@" {
			t.Errorf("%s!B3: style %+v %v, want text", sheet, st, err)
		}
	}
}

// A survey whose headers name feet is refused by an SI template: its
// numbers would be labelled metres.
func TestTemplateRefusesOtherUnits(t *testing.T) {
	sv, err := survey.ParseSection(strings.NewReader("station (ft),elevation (ft)\n0,3\n10,0\n20,3\n"), "feet.csv", survey.SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if err := survey.WriteTemplate(&bytes.Buffer{}, survey.TemplateOptions{Surveys: []survey.Survey{sv}}); !errors.Is(err, survey.ErrUnitsDisagree) {
		t.Errorf("feet survey in an SI template: %v, want ErrUnitsDisagree", err)
	}
	if err := survey.WriteTemplate(&bytes.Buffer{}, survey.TemplateOptions{Surveys: []survey.Survey{sv}, Units: rating.US}); err != nil {
		t.Errorf("feet survey in a US template: %v", err)
	}
}

// templateStationTol bounds the difference between a projected station
// and its closed-form value (m): the coordinates are exact to about 1e-10
// at 4e6 m.
const templateStationTol = 1e-6

// TestTemplateCoordinateSheet fills the coordinate sheet the way a total
// station's export is pasted in, with its site block, and reads it back
// as a coordinate survey. The points lie on a line of direction (3/5, 4/5)
// from the left pin, so station s and offset o give the closed form
// (E, N) = (E0 + 0.6 s + 0.8 o, N0 + 0.8 s − 0.6 o).
func TestTemplateCoordinateSheet(t *testing.T) {
	path := writeTemplate(t, survey.TemplateOptions{Rows: 20})
	f, err := excelize.OpenFile(path)
	if err != nil {
		t.Fatal(err)
	}
	const e0, n0 = 512000.0, 4123000.0
	st := []float64{0, 4, 9, 15, 21, 25}
	off := []float64{0, 0.2, -0.1, 0, 0.3, 0}
	z := []float64{104.1, 102.0, 100.4, 100.2, 102.2, 104.4}
	marks := []any{"left pin", "bank", "", "thalweg", "bank", "Right Pin"}
	rows := make([][]any, len(st))
	for i := range st {
		var n any
		if i == 0 {
			n = 0.05
		} else if i == 1 {
			n = "0.035" // typed as text
		}
		rows[i] = []any{e0 + 0.6*st[i] + 0.8*off[i], n0 + 0.8*st[i] - 0.6*off[i], z[i], n, marks[i], fmt.Sprintf("shot %d", i+1)}
	}
	fillSheet(t, f, survey.FieldSheetCoordinates, survey.SectionHeaderRow+1, rows)
	for i, v := range []string{"Larch Brook at the ford (invented)", "LB-07"} {
		if err := f.SetCellStr(survey.FieldSheetCoordinates, "B"+strconv.Itoa(i+1), v); err != nil {
			t.Fatal(err)
		}
	}
	if err := f.Save(); err != nil {
		t.Fatal(err)
	}
	f.Close()

	sv, err := survey.ReadSection(path, survey.FieldSheetCoordinates, survey.SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if pr := sv.Projection; pr.Line != survey.LineFromPins || pr.Left != survey.LeftFromPins || pr.Reversed {
		t.Errorf("projection %q, %q, reversed %v", pr.Line, pr.Left, pr.Reversed)
	}
	for i, p := range sv.Section.Points {
		if math.Abs(p.Station-st[i]) > templateStationTol || p.Elevation != z[i] {
			t.Errorf("point %d: station %.9g elevation %g, want %g and %g", i, p.Station, p.Elevation, st[i], z[i])
		}
		if math.Abs(sv.Projection.Offsets[i]-off[i]) > templateStationTol {
			t.Errorf("point %d: offset %.9g, want %g", i, sv.Projection.Offsets[i], off[i])
		}
	}
	if !sv.Section.HasBanks || math.Abs(sv.Section.LeftBank-4) > templateStationTol || math.Abs(sv.Section.RightBank-21) > templateStationTol {
		t.Errorf("banks %v %g %g, want 4 and 21", sv.Section.HasBanks, sv.Section.LeftBank, sv.Section.RightBank)
	}
	if want := []float64{0.05, 0.035, 0.035, 0.035, 0.035}; !slices.Equal(sv.Section.N, want) {
		t.Errorf("n %v, want %v", sv.Section.N, want)
	}
	if sv.Site.Name != "Larch Brook at the ford (invented)" || sv.Site.ID != "LB-07" || sv.Notes[3] != "shot 4" || sv.Labels[3] != "thalweg" {
		t.Errorf("site %+v, notes %q, labels %q", sv.Site, sv.Notes, sv.Labels)
	}
	if sv.Section.Name != survey.FieldSheetCoordinates {
		t.Errorf("section name %q", sv.Section.Name)
	}
}

// TestTemplateGaugingsSiteBlock: the gaugings sheet has the site block
// of the section sheets, which ReadGaugings reads into Gaugings.Site: the
// template's site when one is given, else what the crew writes beside the
// keys.
func TestTemplateGaugingsSiteBlock(t *testing.T) {
	site := rating.Site{Name: "Tallow Creek at Mill Lane (invented)", ID: "0412", Datum: "gauge zero 100.000 (invented)"}
	d := time.Date(2026, 3, 14, 9, 30, 0, 0, time.UTC)
	gaugings := [][]any{{d, 1.25, 3.4, "good"}, {d.Add(48 * time.Hour), 1.6, 7.9, "fair"}}
	for _, tc := range []struct {
		name  string
		opt   survey.TemplateOptions
		typed map[string]string // cells the crew fills in the site block
		want  rating.Site
	}{
		{"from the template's site", survey.TemplateOptions{Site: site, Rows: 10}, nil, site},
		{"typed by the crew", survey.TemplateOptions{Rows: 10}, map[string]string{"B1": "Heron Brook (invented)", "B3": "2026-03-14", "B5": "EF"},
			rating.Site{Name: "Heron Brook (invented)", Surveyed: "2026-03-14", Crew: "EF"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			path := writeTemplate(t, tc.opt)
			f, err := excelize.OpenFile(path)
			if err != nil {
				t.Fatal(err)
			}
			for cell, v := range tc.typed {
				if err := f.SetCellStr(survey.FieldSheetGaugings, cell, v); err != nil {
					t.Fatal(err)
				}
			}
			fillSheet(t, f, survey.FieldSheetGaugings, survey.SectionHeaderRow+1, gaugings)
			if err := f.Save(); err != nil {
				t.Fatal(err)
			}
			f.Close()
			gs, err := survey.ReadGaugings(path, survey.FieldSheetGaugings)
			if err != nil {
				t.Fatal(err)
			}
			if gs.Site != tc.want || len(gs.Gaugings) != len(gaugings) {
				t.Errorf("site %+v and %d gaugings, want %+v and %d", gs.Site, len(gs.Gaugings), tc.want, len(gaugings))
			}
			if want := fmt.Sprintf("field.xlsx['gaugings'] row %d", survey.SectionHeaderRow+1); !strings.HasSuffix(gs.Gaugings[0].Source, want) {
				t.Errorf("first gauging from %q, want …%s", gs.Gaugings[0].Source, want)
			}
		})
	}
}

// TestTemplateGaugingColumns fills the gaugings sheet's optional columns:
// the uncertainty overrides the grade's band, any exclude text is kept as
// the reason; an uncertainty of 100 % is refused at its cell.
func TestTemplateGaugingColumns(t *testing.T) {
	path := writeTemplate(t, survey.TemplateOptions{Rows: 10})
	f, err := excelize.OpenFile(path)
	if err != nil {
		t.Fatal(err)
	}
	d := time.Date(2026, 3, 14, 9, 30, 0, 0, time.UTC)
	gr := headerRow(survey.FieldSheetGaugings)
	fillSheet(t, f, survey.FieldSheetGaugings, gr+1, [][]any{
		{d, 1.25, 3.4, "good", 6.5, "", "wading"},
		{d.Add(48 * time.Hour), 1.6, 7.9, "fair", nil, "weed on the control", ""},
		{d.Add(96 * time.Hour), 1.1, 2.0, "poor", "12", "", ""},
	})
	if err := f.Save(); err != nil {
		t.Fatal(err)
	}
	gs, err := survey.ReadGaugings(path, "")
	if err != nil {
		t.Fatal(err)
	}
	if len(gs.Gaugings) != 3 {
		t.Fatalf("%d gaugings", len(gs.Gaugings))
	}
	for i, want := range []struct {
		unc       float64
		excl      string
		note      string
		discharge float64
	}{{6.5, "", "wading", 3.4}, {0, "weed on the control", "", 7.9}, {12, "", "", 2.0}} {
		g := gs.Gaugings[i]
		if g.Uncertainty != want.unc || g.Exclude != want.excl || g.Note != want.note || g.Discharge != want.discharge {
			t.Errorf("gauging %d: uncertainty %g exclude %q note %q discharge %g, want %+v", i, g.Uncertainty, g.Exclude, g.Note, g.Discharge, want)
		}
	}
	e := "E" + strconv.Itoa(gr+2) // the second gauging's uncertainty
	if err := f.SetCellFloat(survey.FieldSheetGaugings, e, 100, -1, 64); err != nil {
		t.Fatal(err)
	}
	if err := f.Save(); err != nil {
		t.Fatal(err)
	}
	f.Close()
	_, err = survey.ReadGaugings(path, "")
	if !errors.Is(err, survey.ErrUncertainty) || !strings.Contains(err.Error(), "['gaugings']!"+e) {
		t.Errorf("uncertainty 100: %v, want ErrUncertainty at %s", err, e)
	}
}

// TestTemplateReachColumns fills the reach sheet's flow lengths and the
// sections' surveys on sheets of the same workbook, and reads the reach
// for step-backwater: the lengths read back; a structure is kept and
// refused by OpenChannel at its cell.
func TestTemplateReachColumns(t *testing.T) {
	path := writeTemplate(t, survey.TemplateOptions{Sections: 2, Rows: 10})
	f, err := excelize.OpenFile(path)
	if err != nil {
		t.Fatal(err)
	}
	ground := [][]any{{0.0, 103.0, 0.05, ""}, {3.0, 102.1, nil, ""}, {6.0, 101.0, 0.035, "bank"}, {10.0, 100.0, nil, ""},
		{14.0, 101.1, 0.05, "bank"}, {17.0, 102.0, nil, ""}, {20.0, 103.2, nil, ""}}
	fillSheet(t, f, "XS-1", survey.SectionHeaderRow+1, ground)
	ground[3] = []any{10.0, 99.8, nil, ""} // XS-2 is another place: its bed lies lower (the same ground is warned of)
	fillSheet(t, f, "XS-2", survey.SectionHeaderRow+1, ground)
	fillSheet(t, f, survey.FieldSheetReach, 2, [][]any{
		{"XS-1", "XS-1", 0.0, nil, nil, "", 180.0, 150.0, "", "", "upstream"},
		{"XS-2", "XS-2", 150.0, nil, nil, "", nil, nil, nil, "bridge", ""},
	})
	if err := f.Save(); err != nil {
		t.Fatal(err)
	}
	f.Close()
	r, err := survey.ReadReachWith(path, survey.FieldSheetReach, survey.ReachOptions{MarksOptional: true})
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Rows) != 2 || len(r.Surveys) != 2 || len(r.Warnings) != 0 {
		t.Fatalf("rows %+v, %d surveys, warnings %q", r.Rows, len(r.Surveys), r.Warnings)
	}
	up := r.Rows[0]
	if up.LeftLength != 180 || up.ChannelLength != 150 || !math.IsNaN(up.RightLength) || up.Structure != "" || up.Note != "upstream" {
		t.Errorf("upstream row %+v", up)
	}
	if r.Rows[1].Structure != "bridge" || len(r.Surveys[1].Section.Points) != len(ground) {
		t.Errorf("downstream row %+v", r.Rows[1])
	}
	if err := r.OpenChannel(); !errors.Is(err, survey.ErrStructure) || !strings.Contains(err.Error(), "['reach']!J3") {
		t.Errorf("structure: %v, want ErrStructure at J3", err)
	}
}

// TestTemplateElevationRules checks that every elevation column of the
// field workbook is validated to the bound the readers refuse beyond
// (±MaxElevation), not a looser one, and that the prompts place
// elevations on the survey's datum rather than a gauge datum.
func TestTemplateElevationRules(t *testing.T) {
	path := writeTemplate(t, survey.TemplateOptions{Sections: 1, Rows: 10})
	f := openBook(t, path)
	for _, tc := range []struct {
		sheet, col string
		prompt     string // wanted in the input prompt; "" when not checked
	}{
		{"XS-1", "B", "survey's datum"},
		{survey.FieldSheetCoordinates, "C", "survey's datum"},
		{survey.FieldSheetReach, "D", ""},
		{survey.FieldSheetReach, "E", ""},
		{survey.FieldSheetGaugings, "B", ""},
	} {
		t.Run(tc.sheet+"!"+tc.col, func(t *testing.T) {
			dv := columnRule(t, f, tc.sheet, tc.col)
			lo, errLo := strconv.ParseFloat(dv.Formula1, 64)
			hi, errHi := strconv.ParseFloat(dv.Formula2, 64)
			if errLo != nil || errHi != nil || lo != -survey.MaxElevation || hi != survey.MaxElevation || !dv.ShowErrorMessage {
				t.Errorf("rule %q to %q (error alert %v), want %g to %g", dv.Formula1, dv.Formula2, dv.ShowErrorMessage, -survey.MaxElevation, survey.MaxElevation)
			}
			if tc.prompt == "" {
				return
			}
			if dv.Prompt == nil || !strings.Contains(*dv.Prompt, tc.prompt) || strings.Contains(*dv.Prompt, "gauge datum") {
				p := "<none>"
				if dv.Prompt != nil {
					p = *dv.Prompt
				}
				t.Errorf("prompt %q, want it to say %q and not the gauge datum", p, tc.prompt)
			}
		})
	}
}

// The template's station, distance and flow-length rules take every value
// the readers take (±MaxCoordinate), so a survey the readers accept, such
// as one on projected stations of 1 500 000 m, can be prefilled without
// breaking its own sheet's rules.
func TestTemplateCoordinateRules(t *testing.T) {
	path := writeTemplate(t, survey.TemplateOptions{Sections: 1, Rows: 10})
	f := openBook(t, path)
	for _, tc := range []struct {
		sheet, col string
		lo, hi     float64
	}{
		{"XS-1", "A", -survey.MaxCoordinate, survey.MaxCoordinate},
		{survey.FieldSheetReach, "C", -survey.MaxCoordinate, survey.MaxCoordinate},
		{survey.FieldSheetReach, "G", 0, survey.MaxCoordinate},
		{survey.FieldSheetReach, "H", 0, survey.MaxCoordinate},
		{survey.FieldSheetReach, "I", 0, survey.MaxCoordinate},
	} {
		t.Run(tc.sheet+"!"+tc.col, func(t *testing.T) {
			dv := columnRule(t, f, tc.sheet, tc.col)
			lo, errLo := strconv.ParseFloat(dv.Formula1, 64)
			hi, errHi := strconv.ParseFloat(dv.Formula2, 64)
			if errLo != nil || errHi != nil || lo != tc.lo || hi != tc.hi {
				t.Errorf("rule %q to %q, want %g to %g", dv.Formula1, dv.Formula2, tc.lo, tc.hi)
			}
			if dv.Error == nil || !strings.Contains(*dv.Error, "100000000") {
				msg := "<none>"
				if dv.Error != nil {
					msg = *dv.Error
				}
				t.Errorf("error message %q does not give the bound", msg)
			}
		})
	}
}

// The template's rule on a gauging's time takes the dates the readers take
// and no later: its upper end, a workbook date serial, is the last second
// of MaxYear by excelize's conversion, read as a gauging's time; a second
// later is refused by the reader. Its lower end is serial 1, 1900-01-01.
func TestTemplateTimeRule(t *testing.T) {
	path := writeTemplate(t, survey.TemplateOptions{Sections: 1, Rows: 10})
	dv := columnRule(t, openBook(t, path), survey.FieldSheetGaugings, "A")
	lo, errLo := strconv.ParseFloat(dv.Formula1, 64)
	hi, errHi := strconv.ParseFloat(dv.Formula2, 64)
	if errLo != nil || errHi != nil || lo != 1 {
		t.Fatalf("rule %q to %q", dv.Formula1, dv.Formula2)
	}
	last, err := survey.ParseTime(dv.Formula2, true, false)
	if want := time.Date(survey.MaxYear, 12, 31, 23, 59, 59, 0, time.UTC); err != nil || !last.Equal(want) {
		t.Errorf("upper end %s read as %v, %v; want %v", dv.Formula2, last, err, want)
	}
	if _, err := survey.ParseTime(strconv.FormatFloat(hi+1.0/86400, 'f', -1, 64), true, false); !errors.Is(err, survey.ErrYear) {
		t.Errorf("a second after the upper end: %v, want ErrYear", err)
	}
}

// columnRule returns the validation rule on a template sheet's column,
// from the first row below its header; the test fails when there is none.
func columnRule(t *testing.T, f *excelize.File, sheet, col string) *excelize.DataValidation {
	t.Helper()
	dvs, err := f.GetDataValidations(sheet)
	if err != nil {
		t.Fatal(err)
	}
	for _, d := range dvs {
		if strings.HasPrefix(d.Sqref, col+strconv.Itoa(headerRow(sheet)+1)+":") {
			return d
		}
	}
	t.Fatalf("no rule on column %s of %s", col, sheet)
	return nil
}

// TestTemplateStructureRule: the reach sheet's structure column offers
// exactly the words the reach reader takes and stops any other (a word the
// reader refuses could otherwise be typed and saved), with the reader's
// own message; each word offered reads back through the reach reader.
func TestTemplateStructureRule(t *testing.T) {
	path := writeTemplate(t, survey.TemplateOptions{Sections: 1, Rows: 10})
	f := openBook(t, path)
	dv := columnRule(t, f, survey.FieldSheetReach, "J")
	words := append(survey.StructureWords(), survey.OpenChannelWords()...)
	if want := `"` + strings.Join(words, ",") + `"`; dv.Type != "list" || dv.Formula1 != want {
		t.Errorf("rule %s %s, want the list %s", dv.Type, dv.Formula1, want)
	}
	if !dv.ShowErrorMessage || dv.ErrorStyle == nil || *dv.ErrorStyle != "stop" {
		t.Errorf("error alert %v, style %v: want a stop alert", dv.ShowErrorMessage, dv.ErrorStyle)
	}
	if dv.Error == nil || *dv.Error != survey.ErrStructureWord.Error() {
		t.Errorf("error message %v, want the reader's %q", dv.Error, survey.ErrStructureWord.Error())
	}
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "xs.csv"), []byte("station,elevation,n\n0,2,0.03\n5,0,0.03\n10,2,\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	offered := strings.Split(strings.Trim(dv.Formula1, `"`), ",")
	var b strings.Builder
	b.WriteString("section,survey,distance,structure\n")
	for i, w := range offered {
		fmt.Fprintf(&b, "S%d,xs.csv,%d,%s\n", i, 10*i, w)
	}
	reach := filepath.Join(dir, "reach.csv")
	if err := os.WriteFile(reach, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := survey.ReadReachWith(reach, "", survey.ReachOptions{MarksOptional: true}); err != nil {
		t.Errorf("the words offered do not all read back: %v", err)
	}
}

// The template's number columns show every digit a crew types to the
// precision read (station to 0.0001, n to 0.0001, elevations to 0.0001),
// so a printed sheet shows what wetline reads: a format such as 0.000
// would print n 0.0355 as 0.036.
func TestTemplateShowsTypedDigits(t *testing.T) {
	f, err := excelize.OpenFile(writeTemplate(t, survey.TemplateOptions{}))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sheet := f.GetSheetList()[0]
	rows, err := f.GetRows(sheet)
	if err != nil {
		t.Fatal(err)
	}
	header := rows[len(rows)-1]
	for name, want := range map[string]string{"station": "0.00##", "n": "0.000#", "elevation": "0.000#"} {
		i := slices.IndexFunc(header, func(h string) bool { return h == name || strings.HasPrefix(h, name+" ") })
		if i < 0 {
			t.Fatalf("%s: no %s column in %q", sheet, name, header)
		}
		col, _ := excelize.ColumnNumberToName(i + 1)
		id, err := f.GetColStyle(sheet, col)
		if err != nil {
			t.Fatal(err)
		}
		st, err := f.GetStyle(id)
		if err != nil || st.CustomNumFmt == nil || *st.CustomNumFmt != want {
			t.Errorf("%s column %s: format %v, want %q (%v)", sheet, name, st.CustomNumFmt, want, err)
		}
	}
}

// instructionText is what the instructions sheet of template f says of
// the last topic that is picks out ("" when none is).
func instructionText(t *testing.T, f *excelize.File, is func(topic string) bool) string {
	t.Helper()
	instr, err := f.GetRows(survey.FieldSheetInstructions)
	if err != nil {
		t.Fatal(err)
	}
	var text string
	for _, r := range instr {
		if len(r) > 1 && is(r[0]) {
			text = r[1]
		}
	}
	return text
}

// The template says what the reader does with the exclude column: each of
// KeepWords, typed in a gauging's exclude cell, keeps the gauging, and the
// gaugings sheet's instructions list every one of them (its help once
// said only a blank keeps it).
func TestTemplateExcludeKeepWords(t *testing.T) {
	path := writeTemplate(t, survey.TemplateOptions{Rows: 10})
	f, err := excelize.OpenFile(path)
	if err != nil {
		t.Fatal(err)
	}
	d := time.Date(2026, 3, 14, 9, 30, 0, 0, time.UTC)
	var rows [][]any
	for i, w := range survey.KeepWords() {
		rows = append(rows, []any{d.Add(time.Duration(i) * time.Hour), 1 + 0.1*float64(i), 2 + float64(i), "good", nil, strings.ToUpper(w)})
	}
	fillSheet(t, f, survey.FieldSheetGaugings, headerRow(survey.FieldSheetGaugings)+1, rows)
	text := instructionText(t, f, func(topic string) bool { return topic == survey.FieldSheetGaugings })
	if err := f.Save(); err != nil {
		t.Fatal(err)
	}
	f.Close()
	for _, w := range survey.KeepWords() {
		if !strings.Contains(text, "'"+w+"'") {
			t.Errorf("instructions of %s do not name %q: %q", survey.FieldSheetGaugings, w, text)
		}
	}
	gs, err := survey.ReadGaugings(path, "")
	if err != nil {
		t.Fatal(err)
	}
	if len(gs.Gaugings) != len(rows) {
		t.Fatalf("%d gaugings, want %d", len(gs.Gaugings), len(rows))
	}
	for _, g := range gs.Gaugings {
		if g.Exclude != "" {
			t.Errorf("gauging at %v: excluded for %q", g.Time, g.Exclude)
		}
	}
}

// The template's instructions name every word the reader takes as a bank
// mark, and a cross-section sheet marked with two of them, typed in
// another case, is read with its banks there.
func TestTemplateBankWords(t *testing.T) {
	path := writeTemplate(t, survey.TemplateOptions{Rows: 10})
	f, err := excelize.OpenFile(path)
	if err != nil {
		t.Fatal(err)
	}
	fillSheet(t, f, survey.SectionSheetName(1), survey.SectionHeaderRow+1, [][]any{
		{0, 5, 0.05, nil}, {4, 3, nil, "Left Top of Bank"}, {8, 0, 0.03, nil}, {12, 3, 0.05, "RB"}, {16, 5, nil, nil}})
	text := instructionText(t, f, func(topic string) bool { return strings.HasPrefix(topic, survey.SectionSheetName(1)) })
	if err := f.Save(); err != nil {
		t.Fatal(err)
	}
	f.Close()
	for _, w := range survey.BankWords() {
		if !strings.Contains(text, w) {
			t.Errorf("instructions of the cross-section sheets do not name %q: %q", w, text)
		}
	}
	sv, err := survey.ReadSection(path, survey.SectionSheetName(1), survey.SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if s := sv.Section; !s.HasBanks || s.LeftBank != 4 || s.RightBank != 12 {
		t.Errorf("banks %v at %g, %g; want 4 and 12", s.HasBanks, s.LeftBank, s.RightBank)
	}
}
