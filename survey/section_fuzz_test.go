package survey

import (
	"bytes"
	"errors"
	"math"
	"os"
	"strings"
	"testing"

	"wetline/subdivide"
)

// FuzzParseSection feeds arbitrary text to the CSV survey reader. Oracles:
// it never panics; an error is a *ParseError (or a join of them) whose
// message names the file; a survey it accepts has finite points with
// stations that never decrease, one n per segment when n is given, banks
// inside the section, and compiles without error.
func FuzzParseSection(f *testing.F) {
	if data, err := os.ReadFile("../testdata/tallow-xs1.csv"); err == nil {
		f.Add(data, false)
	}
	for _, s := range []string{
		"station,elevation\n0,1\n1,0\n2,1\n",
		"station,elevation,n,mark\n0,5,0.03,bank\n1,0,,\n2,5,0.05,bank\n",
		"\ufeffStation (m),Elevation (m),N\n0,1,0.03\n1,1,0.03\n",
		"station;elevation\n0;1,5\n",
		"Wren Brook XS-3\nstation,elevation\n0,1\n1,0\n",
		"\"station, m\",\"elevation, m\"\n0,1\n1,0\n",
		"station,elevation,n,mark\n0,1,0.04,,,\n1,0,0.04,lb,,\n",
		"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1\x00\x00",
		"station,elevation\n0,1,5\n1,NaN\n",
		"# comment\n\nstation,elevation,n\n0,1,\n1,0,0.04\n1,2,\n",
		"station,elevation\n\"0\",\"1\n",
		// Hostile or mistaken files: a header padded with 2000 commas, a
		// column named twice, non-decimal numbers, a blank first n, an
		// elevation beyond any ground, tabs, UTF-16, a workbook's bytes.
		"station,elevation" + strings.Repeat(",", 2000) + "\n0,1\n1,0\n2,1\n",
		"station,elevation,station\n0,1,2\n1,0,3\n",
		"station,elevation\n0x1p3,1\n1_0,0\n",
		"station,elevation,n\n0,1,\n1,0,0.04\n2,1,\n",
		"station,elevation\n0,1e308\n1,0\n",
		"station\televation\n0\t1\n1\t0\n",
		"\xff\xfes\x00t\x00a\x00",
		"PK\x03\x04\x14\x00\x00\x00",
		// Coordinate surveys: pins, no pins, right to left, points on one
		// spot, a fold back, x y z.
		"easting,northing,elevation,n,mark\n10,20,5,0.04,left pin\n13,24,1,,bank\n16,28,1,,\n19,32,5,,right pin\n",
		"easting,northing,elevation,n\n19,32,5,\n16,28,1,0.03\n13,24,1,\n10,20,5,\n",
		"easting,northing,elevation\n1,1,5\n1,1,0\n1,1,5\n",
		"x,y,z,n\n0,0,3,0.03\n5,0,0,\n2,0.1,0,\n9,0,3,\n",
		"easting,northing,elevation,n,mark\n0,0,1,0.03,left pin\n1,0,0,,left pin\n2,0,1,,right pin\n",
		// Bank words (sides right and wrong, marks like a bank's), n with
		// a length unit, elev, site key rows, '#'-numbered lines and a
		// quoted note holding a line that starts with '#'.
		"station,elevation,n,mark\n0,5,0.04,\n1,3,,LB\n2,0,,bankfull\n3,3,,Right Top of Bank\n4,5,,\n",
		"station,elevation,n,mark\n0,5,0.04,rb\n1,0,,\n2,5,,l.b.\n",
		"E (ft),N (ft),elevation (ft),n,mark\n0,0,5,0.04,left pin\n3,4,1,,\n6,8,5,,right pin\n",
		// US survey feet as GNSS exports write them, beside other units.
		"Easting (US ft),Northing (ftUS),Elevation [US survey ft],n,mark\n0,0,5,0.04,left pin\n3,4,1,,\n6,8,5,,right pin\n",
		"station (usft),elevation (m)\n0,1\n1,0\n",
		"station,elev.,elevation\n0,1,1\n1,0,0\n",
		"site,Kowhai Stream at the ford\nsurveyed,2026-11-20\nstation,elev\n0,1\n1,0\n2,1\n",
		"station,elevation,note\n0,3,\"riffle crest\n#2 pools, riffle\"\n#2,0,x\n4,3,\n",
	} {
		f.Add([]byte(s), false)
	}
	f.Add([]byte("station,elevation,mark\n0,3,bank\n1,0,\n2,3,bank\n"), true)
	f.Fuzz(func(t *testing.T, data []byte, ignoreBanks bool) {
		sv, err := ParseSection(bytes.NewReader(data), "in.csv", SectionOptions{IgnoreBankMarks: ignoreBanks})
		if err != nil {
			var pe *ParseError
			if !errors.As(err, &pe) {
				t.Fatalf("error is not a ParseError: %T %v", err, err)
			}
			if !strings.HasPrefix(err.Error(), "in.csv") {
				t.Fatalf("error does not name the file: %v", err)
			}
			return
		}
		pts := sv.Section.Points
		if len(pts) < 2 {
			t.Fatalf("accepted %d points", len(pts))
		}
		if len(sv.Rows) != len(pts) || len(sv.Labels) != len(pts) || len(sv.Notes) != len(pts) {
			t.Fatalf("per-point slices of different length")
		}
		for i, p := range pts {
			if math.IsNaN(p.Station) || math.IsInf(p.Station, 0) || math.IsNaN(p.Elevation) || math.IsInf(p.Elevation, 0) {
				t.Fatalf("point %d not finite: %v", i, p)
			}
			if i > 0 && p.Station < pts[i-1].Station {
				t.Fatalf("overhang accepted at point %d", i)
			}
		}
		if sv.Section.N != nil && len(sv.Section.N) != len(pts)-1 {
			t.Fatalf("%d n values for %d points", len(sv.Section.N), len(pts))
		}
		for _, n := range sv.Section.N {
			if !(n > 0) {
				t.Fatalf("n %v accepted", n)
			}
		}
		if _, err := subdivide.Compile(sv.Section); err != nil {
			t.Fatalf("accepted survey does not compile: %v", err)
		}
	})
}
