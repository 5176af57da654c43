package rating_test

import (
	"math"
	"slices"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
)

// TestCompareSections: a rectangular channel 10 m wide, n = 0.03, surveyed
// before (bed at 0) and after a flood scoured it 0.5 m (bed at −0.5).
// Closed forms at stage 1 m:
//
//	before: A = 10·1 = 10 m², P = 10 + 2·1 = 12 m, T = 10 m, K = (1/0.03)·10·(10/12)^(2/3)
//	after:  A = 10·1.5 = 15 m², P = 10 + 2·1.5 = 13 m, T = 10 m, K = (1/0.03)·15·(15/13)^(2/3)
//	differences: +5 m², +1 m, 0 m.
func TestCompareSections(t *testing.T) {
	mk := func(name string, bed float64) subdivide.Geometry {
		p, err := subdivide.Compile(subdivide.Section{Name: name, Points: subdivide.XZ(0, 3, 0, bed, 10, bed, 10, 3), N: []float64{0.03, 0.03, 0.03}})
		if err != nil {
			t.Fatal(err)
		}
		return p
	}
	c, err := rating.CompareSections(mk("2023", 0), mk("2024", -0.5), []float64{1}, rating.Options{})
	if err != nil {
		t.Fatal(err)
	}
	ka := 10 / 0.03 * math.Pow(10.0/12, 2.0/3)
	kb := 15 / 0.03 * math.Pow(15.0/13, 2.0/3)
	r := c.Rows[0]
	const tol = 1e-9 // round-off on values near 10 to 600 (relative)
	for _, v := range []struct {
		what      string
		got, want float64
	}{
		{"area A", r.A.Area, 10}, {"area B", r.B.Area, 15}, {"area difference", r.Difference.Area, 5},
		{"perimeter A", r.A.WettedPerimeter, 12}, {"perimeter difference", r.Difference.WettedPerimeter, 1},
		{"top width difference", r.Difference.TopWidth, 0},
		{"conveyance A", r.A.Conveyance, ka}, {"conveyance B", r.B.Conveyance, kb},
		{"conveyance percent", r.ConveyancePercent, 100 * (kb - ka) / ka},
	} {
		if math.Abs(v.got-v.want) > tol*math.Max(1, math.Abs(v.want)) {
			t.Errorf("%s = %v, want %v", v.what, v.got, v.want)
		}
	}
	if c.A != "2023" || c.B != "2024" {
		t.Errorf("names %q %q", c.A, c.B)
	}
	// Default stages: from the lower bed (−0.5) to the lower top (3).
	d, err := rating.CompareSections(mk("2023", 0), mk("2024", -0.5), nil, rating.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if first, last := d.Rows[0].Stage, d.Rows[len(d.Rows)-1].Stage; first != -0.5 || last != 3 {
		t.Errorf("default stages %g to %g", first, last)
	}
}

// TestCompareSectionsStageOrder: the rows of a comparison are in increasing
// stage, each stage once, whatever the order of the stages given, and the
// area at each is the rectangle's closed form 10·(h − bed) (channel 10 m
// wide, beds at 0 and −0.5).
func TestCompareSectionsStageOrder(t *testing.T) {
	mk := func(name string, bed float64) subdivide.Geometry {
		p, err := subdivide.Compile(subdivide.Section{Name: name, Points: subdivide.XZ(0, 3, 0, bed, 10, bed, 10, 3), N: []float64{0.03, 0.03, 0.03}})
		if err != nil {
			t.Fatal(err)
		}
		return p
	}
	const tol = 1e-12 // round-off on areas near 10 (relative)
	for _, tt := range []struct {
		given, want []float64
	}{
		{[]float64{1, 2}, []float64{1, 2}},
		{[]float64{1.02, 1.01, 1.01}, []float64{1.01, 1.02}},
		{[]float64{2, 1, 2, 0.5, 1}, []float64{0.5, 1, 2}},
		{[]float64{1.5}, []float64{1.5}},
	} {
		given := slices.Clone(tt.given)
		c, err := rating.CompareSections(mk("2023", 0), mk("2024", -0.5), given, rating.Options{})
		if err != nil {
			t.Fatal(err)
		}
		var got []float64
		for _, r := range c.Rows {
			got = append(got, r.Stage)
			if math.Abs(r.A.Area-10*r.Stage) > tol*10 || math.Abs(r.B.Area-10*(r.Stage+0.5)) > tol*10 {
				t.Errorf("stages %v, row %g: areas %g and %g, want %g and %g", tt.given, r.Stage, r.A.Area, r.B.Area, 10*r.Stage, 10*(r.Stage+0.5))
			}
		}
		if !slices.Equal(got, tt.want) {
			t.Errorf("stages %v: rows at %v, want %v", tt.given, got, tt.want)
		}
		if !slices.Equal(given, tt.given) {
			t.Errorf("stages %v were changed to %v", tt.given, given)
		}
	}
}

// TestSectionComparisonDatums: two surveys naming different datums are
// warned of, naming both, and the site keeps neither; the same datum (in
// any case, with blanks around it) or a datum left unnamed is not.
func TestSectionComparisonDatums(t *testing.T) {
	for _, tt := range []struct {
		a, b   string
		differ bool
	}{
		{"local datum A", "AHD", true},
		{"AHD", "AHD", false},
		{"AHD", " ahd ", false},
		{"", "AHD", false},
		{"", "", false},
	} {
		c := rating.SectionComparison{A: "2019.csv", B: "2025.csv", Provenance: rating.Provenance{Site: rating.Site{Datum: tt.a}}}
		c.SetDatums(tt.a, tt.b)
		if c.DatumsDiffer() != tt.differ {
			t.Errorf("%q, %q: differ %v, want %v", tt.a, tt.b, c.DatumsDiffer(), tt.differ)
		}
		warned := len(c.Warnings) == 1 && strings.Contains(c.Warnings[0], `2019.csv: "local datum A"; 2025.csv: "AHD"`)
		if warned != tt.differ || (!tt.differ && len(c.Warnings) != 0) {
			t.Errorf("%q, %q: warnings %q", tt.a, tt.b, c.Warnings)
		}
		if want := map[bool]string{true: "", false: tt.a}[tt.differ]; c.Provenance.Site.Datum != want {
			t.Errorf("%q, %q: site datum %q, want %q", tt.a, tt.b, c.Provenance.Site.Datum, want)
		}
	}
}
