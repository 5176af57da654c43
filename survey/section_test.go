package survey

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"wetline/subdivide"
)

func TestParseSectionGood(t *testing.T) {
	in := "\ufeff# comment line\nStation,Elevation,N,Mark,Note\n0,3,0.05,,\n2,1,,bank,left bank\n4,0,0.03,,\n6,1,,BANK,\n8,3,,, end\n"
	sv, err := ParseSection(strings.NewReader(in), "xs.csv", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	s := sv.Section
	if len(s.Points) != 5 || !s.HasBanks || s.LeftBank != 2 || s.RightBank != 6 {
		t.Errorf("section %+v", s)
	}
	// Blank n carries the previous value; n of point i applies to segment i.
	want := []float64{0.05, 0.05, 0.03, 0.03}
	for i, n := range want {
		if s.N[i] != n {
			t.Errorf("n[%d] = %g, want %g", i, s.N[i], n)
		}
	}
	if sv.Notes[1] != "left bank" || sv.Rows[0] != 3 || s.Name != "xs" {
		t.Errorf("notes %q rows %v name %q", sv.Notes, sv.Rows, s.Name)
	}
}

// TestParseSectionErrors checks that every kind of bad input names its file,
// row and column, and that nothing panics.
func TestParseSectionErrors(t *testing.T) {
	cases := []struct {
		name, in string
		want     string // substring of the message: file:line:column
		is       error
	}{
		{"decimal comma", "station,elevation\n0,1\n1,\"0,5\"\n", `xs.csv:3:2: elevation "0,5": decimal comma`, ErrDecimalComma},
		{"not a number", "station,elevation\n0,1\nabc,0\n", `xs.csv:3:1: station "abc": not a number`, ErrNotNumber},
		{"nan", "station,elevation\n0,1\n1,NaN\n", `xs.csv:3:2: elevation "NaN": value is not a finite number`, subdivide.ErrNotFinite},
		{"inf", "station,elevation\n0,1\n1,+Inf\n", `xs.csv:3:2`, subdivide.ErrNotFinite},
		{"blank elevation", "station,elevation\n0,1\n1,\n", `xs.csv:3:2`, ErrNotNumber},
		{"one point", "station,elevation\n0,1\n", `xs.csv:1: a section needs at least two points`, subdivide.ErrTooFewPoints},
		{"missing column", "station,height\n0,1\n1,0\n", `xs.csv:1: elevation: missing column`, ErrMissingColumn},
		{"n zero", "station,elevation,n\n0,1,0\n1,0,0.03\n", `xs.csv:2:3: n "0": roughness must be a positive number`, ErrNotPositive},
		{"n negative", "station,elevation,n\n0,1,0.03\n1,0,-0.03\n2,1,\n", `xs.csv:3:3`, ErrNotPositive},
		{"overhang", "station,elevation\n0,1\n2,0\n1,1\n", `xs.csv:4:1: station "1": station decreases (an overhang)`, subdivide.ErrOverhang},
		{"three banks", "station,elevation,mark\n0,1,bank\n1,0,bank\n2,1,bank\n", `xs.csv:4:3`, ErrBankMarks},
		{"one bank", "station,elevation,mark\n0,1,bank\n1,0,\n2,1,\n", `xs.csv:2:3`, ErrBankMarks},
		{"empty file", "", `xs.csv: empty file`, nil},
		{"only comments", "# nothing\n", `xs.csv: empty file`, nil},
		{"semicolons", "station;elevation\n0;1,5\n", `xs.csv:1: the file is separated by semicolons`, ErrSemicolon},
		{"zero width", "station,elevation\n1,1\n1,0\n", `xs.csv:3:1`, nil},
		{"bad quoting", "station,elevation\n0,\"1\n", `xs.csv:2`, nil},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := ParseSection(strings.NewReader(c.in), "xs.csv", SectionOptions{})
			if err == nil {
				t.Fatal("no error")
			}
			if !strings.Contains(err.Error(), c.want) {
				t.Errorf("error %q does not contain %q", err, c.want)
			}
			if c.is != nil && !errors.Is(err, c.is) {
				t.Errorf("error %v is not %v", err, c.is)
			}
		})
	}
}

// TestAllBadRowsReported checks that every bad row is reported together.
func TestAllBadRowsReported(t *testing.T) {
	_, err := ParseSection(strings.NewReader("station,elevation\n0,x\n1,y\n2,1\n"), "xs.csv", SectionOptions{})
	if err == nil || !strings.Contains(err.Error(), "xs.csv:2:2") || !strings.Contains(err.Error(), "xs.csv:3:2") {
		t.Errorf("error %v should name rows 2 and 3", err)
	}
}

func TestParseSectionWarnings(t *testing.T) {
	in := "station,elevation,n\n0,3,0.25\n1,1,0.03\n2,0,\n100,3,\n"
	sv, err := ParseSection(strings.NewReader(in), "xs.csv", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	all := strings.Join(sv.Warnings, "\n")
	if !strings.Contains(all, "xs.csv:2:3") || !strings.Contains(all, "above 0.20") {
		t.Errorf("no high-n warning naming the cell: %q", all)
	}
	if !strings.Contains(all, "xs.csv:5: gap of 98") {
		t.Errorf("no station-gap warning: %q", all)
	}
}

func TestIgnoreBankMarks(t *testing.T) {
	in := "station,elevation,mark\n0,1,bank\n1,0,\n2,1,\n"
	if _, err := ParseSection(strings.NewReader(in), "xs.csv", SectionOptions{IgnoreBankMarks: true}); err != nil {
		t.Errorf("marks should be ignored: %v", err)
	}
}

func TestParseErrorSheet(t *testing.T) {
	e := &ParseError{File: "field.xlsx", Sheet: "XS-2", Row: 14, Column: 3, Name: "n", Text: "x", Err: ErrNotNumber}
	if got, want := e.Error(), `field.xlsx['XS-2']!C14: n "x": not a number`; got != want {
		t.Errorf("got %q, want %q", got, want)
	}
}

// The station-gap warning writes its numbers to the millimetre with their
// unit, and is not given for a section the shape command wrote (its
// comment begins with BuiltPrefix). Gaps worked by hand: 20.000426 -
// 12.999714 = 7.000712 m, written 7.001 between 13 and 20; the QA
// rectangle in feet has one gap of 20 ft between stations 0 and 20.
func TestGapWarning(t *testing.T) {
	for _, tc := range []struct {
		name string
		in   string
		opt  SectionOptions
		want string // in the warnings; "" for no gap warning
	}{
		{"rounded, metres by default", "station,elevation,n\n0,3,0.03\n12.999713992767719,0,\n20.000426020459436,0,\n21,3,\n",
			SectionOptions{}, "xs.csv:4: gap of 7.001 m between stations 13 and 20 is over 25 %"},
		{"feet from the headers", "station (ft),elevation (ft),n\n0,10,0.03\n0,0,0.03\n20,0,0.03\n20,10,\n",
			SectionOptions{}, "xs.csv:4: gap of 20 ft between stations 0 and 20"},
		{"feet asked for", "station,elevation,n\n0,10,0.03\n0,0,0.03\n20,0,0.03\n20,10,\n",
			SectionOptions{Coordinates: CoordinateOptions{Feet: true}}, "gap of 20 ft"},
		{"built by shape", "# " + BuiltPrefix + "rectangle:width=5,height=3, lengths in m; invert at elevation 0.\nstation (m),elevation (m),n,mark\n0,3,0.04,\n0,0,0.04,\n5,0,0.04,\n5,3,,\n",
			SectionOptions{}, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			sv, err := ParseSection(strings.NewReader(tc.in), "xs.csv", tc.opt)
			if err != nil {
				t.Fatal(err)
			}
			all := strings.Join(sv.Warnings, "\n")
			if tc.want == "" && strings.Contains(all, "gap of") || !strings.Contains(all, tc.want) {
				t.Errorf("warnings %q, want %q", all, tc.want)
			}
		})
	}
}

// A section the shape command wrote, opened in a spreadsheet program and
// saved as a workbook, keeps its comment line as a row (split at its
// commas) and so escapes the station-gap warning as its CSV file does; the
// same sheet without that row is warned of.
func TestGapWarningBuiltSheet(t *testing.T) {
	points := [][]any{{"station (m)", "elevation (m)", "n", "mark"}, {0, 3, 0.04}, {0, 0, 0.04}, {5, 0, 0.04}, {5, 3}}
	built := append([][]any{{"# " + BuiltPrefix + "rectangle:width=5", "height=3", " lengths in m; invert at elevation 0."}}, points...)
	for _, tc := range []struct {
		name   string
		rows   [][]any
		warned bool
	}{
		{"built", built, false},
		{"surveyed", points, true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			path := filepath.Join(t.TempDir(), "xs.xlsx")
			if err := os.WriteFile(path, unsavedBook(t, tc.rows), 0o644); err != nil {
				t.Fatal(err)
			}
			sv, err := ReadSection(path, "xs", SectionOptions{})
			if err != nil {
				t.Fatal(err)
			}
			if warned := len(sv.Gaps) > 0 && strings.Contains(strings.Join(sv.Warnings, "\n"), "gap of 5 m"); warned != tc.warned {
				t.Errorf("gap warned %v, want %v: %q", warned, tc.warned, sv.Warnings)
			}
		})
	}
}
