package survey

import (
	"errors"
	"strings"
	"testing"
)

// A header's n column with a length unit is not Manning's n: it is
// refused at its cell, asking for northing (and easting for an E column
// with a length unit), whether an n column stands beside it or not.
func TestNWithLengthUnit(t *testing.T) {
	for _, tc := range []struct {
		name, header, want string
	}{
		{"beside n", "E (ft),N (ft),elevation (ft),n,mark", `xs.csv:1:2: N (ft): a column named n with a length unit is not Manning's n, which has no unit: name it northing (or y) if it holds northings, and name E (ft) easting (or x)`},
		{"n before it", "n,E (ft),N (ft),elevation (ft)", `xs.csv:1:3: N (ft): a column named n with a length unit`},
		{"alone", "E (m),N (m),elevation (m)", `xs.csv:1:2: N (m)`},
		{"with stations", "station,elevation,n [m]", `xs.csv:1:3: n [m]: a column named n with a length unit is not Manning's n, which has no unit: name it northing (or y) if it holds northings`},
	} {
		t.Run(tc.name, func(t *testing.T) {
			in := tc.header + "\n0,1,0.03\n1,0,0.03\n2,1,0.03\n"
			_, err := ParseSection(strings.NewReader(in), "xs.csv", SectionOptions{})
			if !errors.Is(err, ErrNWithLength) || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("%v, want ErrNWithLength: %q", err, tc.want)
			}
		})
	}
	// An E column with a length unit in a survey with no station names
	// itself.
	_, err := ParseSection(strings.NewReader("E (m),northing (m),elevation (m)\n0,0,1\n1,0,0\n"), "xs.csv", SectionOptions{})
	if !errors.Is(err, ErrMissingColumn) || !strings.Contains(err.Error(), `xs.csv:1:1: E (m): missing column`) || !strings.Contains(err.Error(), `name this column "easting" (or "x")`) {
		t.Errorf("E (m): %v", err)
	}
	// n without a unit, or with one that is no length, is read as before.
	if _, err := ParseSection(strings.NewReader("station,elevation,N\n0,1,0.03\n1,0,\n"), "xs.csv", SectionOptions{}); err != nil {
		t.Errorf("N: %v", err)
	}
}

// elev and elev. are aliases of elevation, refused beside it.
func TestElevAlias(t *testing.T) {
	for _, h := range []string{"elev", "Elev.", "elev (m)", "ELEV. [ft]"} {
		sv, err := ParseSection(strings.NewReader("station,"+h+"\n0,1\n1,0\n2,1\n"), "xs.csv", SectionOptions{})
		if err != nil || sv.Section.Points[1].Elevation != 0 {
			t.Errorf("%s: %v", h, err)
		}
	}
	_, err := ParseSection(strings.NewReader("station,elevation,elev\n0,1,1\n1,0,0\n"), "xs.csv", SectionOptions{})
	if !errors.Is(err, ErrAliasColumns) || !strings.Contains(err.Error(), "xs.csv:1:3: elev: both elevation and elev: keep one") {
		t.Errorf("elevation beside elev: %v", err)
	}
	tab := &Table{Header: []string{"station", "elev."}}
	if tab.Column(elevationNames()...) != 1 {
		t.Error("elev. not found")
	}
}

// The mark column is read under the headers crews give a point's code
// (code, point code, pt code, description, desc), in a survey by station
// and in a coordinate survey alike; two of them in one header are
// refused. Of a code and a description, the one holding bank marks is
// read (else the one holding end pins, else the code); a column not read
// that holds bank marks while no bank was found is warned of, with a
// name it can take. The data are invented.
func TestMarkColumnNames(t *testing.T) {
	t.Parallel()
	stations := "0,731.4,LPIN\n10,728.1,LTOB\n20,725.2,GRD\n30,728.3,RTOB\n40,731.0,RPIN\n"
	coords := "5000,2000,731.4,left pin\n5007,2007,728.1,LTOB\n5014,2014,725.2,GRD\n5021,2021,728.3,RTOB\n5028,2028,731.0,right pin\n"
	for _, name := range []string{"mark", "code", "Code", "CODE", "point code", "Point-Code", "point_code", "pt code", "description", "Desc"} {
		for _, tc := range []struct{ kind, csv string }{
			{"stations", "station,elevation," + name + "\n" + stations},
			{"coordinates", "x,y,z," + name + "\n" + coords},
		} {
			sv, err := ParseSection(strings.NewReader(tc.csv), "s.csv", SectionOptions{})
			if err != nil {
				t.Errorf("%s %q: %v", tc.kind, name, err)
				continue
			}
			if !sv.Section.HasBanks || len(sv.Warnings) > 0 && strings.Contains(strings.Join(sv.Warnings, "\n"), "not read") {
				t.Errorf("%s %q: banks %v, warnings %q: want the banks read from the column", tc.kind, name, sv.Section.HasBanks, sv.Warnings)
			}
			if tc.kind == "coordinates" && sv.Projection.Line != LineFromPins {
				t.Errorf("%s %q: line %q, want the pins' line", tc.kind, name, sv.Projection.Line)
			}
		}
	}
	if _, err := ParseSection(strings.NewReader("station,elevation,mark,code\n0,1,bank,x\n1,0,,\n2,1,bank,\n"), "s.csv", SectionOptions{}); !errors.Is(err, ErrAliasColumns) {
		t.Errorf("mark and code: %v, want ErrAliasColumns", err)
	}
	// Two bank marks on one side, in a coordinate survey whose mark column
	// is a code: the error names that column and cell.
	two := "easting,northing,elevation,code\n100,200,10,\n101,200,9,LB\n102,200,8,\n104,200,9.1,LTOB\n105,200,10.1,\n"
	if _, err := ParseSection(strings.NewReader(two), "c.csv", SectionOptions{}); err == nil || !strings.Contains(err.Error(), `c.csv:5:4: code "LTOB"`) {
		t.Errorf("two left banks under code: %v, want the error at c.csv:5:4 code \"LTOB\"", err)
	}
	// A code column and a description column: the one holding the bank
	// marks is read, whichever it is, and the other is not warned of.
	// The layouts are those of a data collector's export (common
	// practice); the stations and elevations are invented, the second
	// layout one whose banks were once lost.
	for _, tc := range []struct {
		name, csv   string
		left, right float64
	}{
		{"code with banks, description free text",
			"station,elevation,code,description\n0,12,GND,left end\n2,11,LB,left bank top\n6,9,GND,thalweg\n10,11.1,RB,right bank top\n12,12.1,GND,\n", 2, 10},
		{"numeric code, description with banks",
			"station,elevation,n,code,description\n0,104.0,0.05,10,left pin\n5,103.1,,20,LTOB\n9,101.2,0.035,30,toe\n14,100.4,,31,thalweg\n19,100.6,,30,toe\n24,101.5,,30,\n28,103.0,0.05,21,RTOB\n34,103.9,,11,right pin\n", 5, 28},
		{"description before a numeric code",
			"station,elevation,desc,pt code\n0,12,left end,1\n2,11,LTOB,2\n6,9,thalweg,3\n10,11.1,RTOB,4\n12,12.1,right end,5\n", 2, 10},
	} {
		sv, err := ParseSection(strings.NewReader(tc.csv), "s.csv", SectionOptions{})
		switch {
		case err != nil:
			t.Errorf("%s: %v", tc.name, err)
		case !sv.Section.HasBanks || sv.Section.LeftBank != tc.left || sv.Section.RightBank != tc.right:
			t.Errorf("%s: banks %v %v %v, want %v and %v", tc.name, sv.Section.HasBanks, sv.Section.LeftBank, sv.Section.RightBank, tc.left, tc.right)
		case len(notRead(sv.Warnings)) > 0:
			t.Errorf("%s: warnings %q, want no column unread", tc.name, sv.Warnings)
		}
	}
	// Neither holds bank marks: a description holding the end pins of a
	// coordinate survey is read for them; else the code is read, and
	// another column holding bank marks is warned of with a name it can
	// take beside the code.
	sv, err := ParseSection(strings.NewReader("x,y,z,code,description\n5000,2000,731.4,1,left pin\n5007,2007,728.1,2,\n5014,2014,725.2,3,GRD\n5028,2028,731.0,4,right pin\n"), "c.csv", SectionOptions{IgnoreBankMarks: true})
	if err != nil || sv.Projection.Line != LineFromPins {
		t.Errorf("numeric code, pins in the description: %v, line %q, want the pins' line", err, sv.Projection.Line)
	}
	sv, err = ParseSection(strings.NewReader("station,elevation,code,remarks\n0,12,10,\n2,11,20,LTOB\n6,9,30,\n10,11.1,21,RTOB\n12,12.1,10,\n"), "s.csv", SectionOptions{})
	if w := notRead(sv.Warnings); err != nil || sv.Section.HasBanks || len(w) != 1 ||
		!strings.Contains(w[0], `s.csv:3:4: remarks "LTOB": this column is not read, yet holds 2 bank marks (LTOB, RTOB), and no bank was found: name it description (or desc) if it marks the points`) {
		t.Errorf("code and remarks: %v, %q", err, sv.Warnings)
	}
	sv, err = ParseSection(strings.NewReader("station,elevation,code,desc,remarks\n0,12,10,a,\n2,11,20,b,LTOB\n6,9,30,c,\n10,11.1,21,d,RTOB\n12,12.1,10,e,\n"), "s.csv", SectionOptions{})
	if w := notRead(sv.Warnings); err != nil || len(w) != 1 || !strings.Contains(w[0], `no bank was found: write its bank marks in code if it marks the points`) {
		t.Errorf("code, desc and remarks: %v, %q", err, sv.Warnings)
	}
	sv, err = ParseSection(strings.NewReader("station,elevation,pt\n"+stations), "s.csv", SectionOptions{})
	if err != nil || sv.Section.HasBanks || len(sv.Warnings) != 1 || !strings.Contains(sv.Warnings[0], `s.csv:3:3: pt "LTOB": this column is not read, yet holds 2 bank marks (LTOB, RTOB), and no bank was found`) {
		t.Errorf("unread column: %v, %q", err, sv.Warnings)
	}
}

// notRead returns the warnings of a column not read.
func notRead(warnings []string) []string {
	var out []string
	for _, w := range warnings {
		if strings.Contains(w, "this column is not read") {
			out = append(out, w)
		}
	}
	return out
}

// TestMissingColumnSuggests: a missing column's error names its aliases
// and quotes each name found (a name may hold a comma), and a header that
// is one of its names with a unit run on, or after a comma, is pointed
// at, with the bracketed form to write.
func TestMissingColumnSuggests(t *testing.T) {
	for _, tc := range []struct {
		name, csv string
		want      []string
		column    int
	}{
		{"unit run on with an underscore", "time,gauge_height_ft,discharge\n2024-01-01,1,2\n",
			[]string{`"stage" (or "gauge_height")`, `"gauge_height_ft" looks like gauge_height with its unit run on: write "gauge_height (ft)"`}, 2},
		{"unit run on with a space", "time,Stage m,discharge\n2024-01-01,1,2\n",
			[]string{`"Stage m" looks like stage with its unit run on: write "stage (m)"`}, 2},
		{"unit after a comma", "time,\"stage, m\",discharge\n2024-01-01,1,2\n",
			[]string{`"stage, m" looks like stage with its unit after a comma: write "stage (m)"`}, 2},
		{"discharge in cfs", "time,stage,discharge_cfs\n2024-01-01,1,2\n",
			[]string{`write "discharge (cfs)"`}, 3},
		{"another name", "time,level,discharge\n2024-01-01,1,2\n",
			[]string{`needs a column named "stage" (or "gauge_height") (found: "time", "level", "discharge")`}, 0},
		{"a word that is no unit", "time,stage_gauge,discharge\n2024-01-01,1,2\n",
			[]string{`(found: "time", "stage_gauge", "discharge")`}, 0},
		{"names holding commas", "\"time, local\",level,discharge\n2024-01-01,1,2\n",
			[]string{`(found: "time, local", "level", "discharge")`}, 0},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ParseGaugings(strings.NewReader(tc.csv), "g.csv")
			var pe *ParseError
			if !errors.Is(err, ErrMissingColumn) || !errors.As(err, &pe) {
				t.Fatalf("error %v, want ErrMissingColumn", err)
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q lacks %q", err, w)
				}
			}
			if pe.Column != tc.column {
				t.Errorf("column %d, want %d", pe.Column, tc.column)
			}
		})
	}
}

// A survey whose headers give their units after a comma ("station, m")
// is pointed at the bracketed form, and the names found are quoted, each
// whole.
func TestSurveyUnitAfterComma(t *testing.T) {
	for _, tc := range []struct {
		name, csv string
		want      []string
		column    int
	}{
		{"station and elevation", "\"station, m\",\"elevation, m\",n\n0,2,0.04\n5,0,0.04\n10,2,0.04\n",
			[]string{`"station, m" looks like station with its unit after a comma: write "station (m)"`}, 1},
		{"elevation only", "station,\"elevation, ft\"\n0,2\n5,0\n10,2\n",
			[]string{`"elevation, ft" looks like elevation with its unit after a comma: write "elevation (ft)"`}, 2},
		{"no station", "\"chainage, m\",elevation\n0,2\n5,0\n10,2\n",
			[]string{`(found: "chainage, m", "elevation")`}, 0},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ParseSection(strings.NewReader(tc.csv), "xs.csv", SectionOptions{})
			var pe *ParseError
			if !errors.Is(err, ErrMissingColumn) || !errors.As(err, &pe) {
				t.Fatalf("error %v, want ErrMissingColumn", err)
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q lacks %q", err, w)
				}
			}
			if pe.Column != tc.column {
				t.Errorf("column %d, want %d", pe.Column, tc.column)
			}
		})
	}
}
