package survey

import (
	"errors"
	"math"
	"os"
	"path/filepath"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
)

// ShapeN: a compound shape's floodplain n comes from its floodn key or
// from --n LEFT,CHANNEL,RIGHT, never both (one would silently override
// the other). Expected n by subsection, worked from the spec by hand: the
// compound shape is left floodplain, channel, right floodplain.
func TestShapeN(t *testing.T) {
	const compound = "compound:bottom=4,side=1,depth=1,floodplain=10"
	for _, tc := range []struct {
		name string
		spec string
		n    []float64
		want []float64 // n of each subsection, left to right; nil when refused
	}{
		{"one n", compound, []float64{0.03}, []float64{0.03, 0.03, 0.03}},
		{"floodn and one n", compound + ",floodn=0.06", []float64{0.03}, []float64{0.06, 0.03, 0.06}},
		{"three n", compound, []float64{0.05, 0.03, 0.07}, []float64{0.05, 0.03, 0.07}},
		{"floodn and three n", compound + ",floodn=0.06", []float64{0.05, 0.03, 0.05}, nil},
		{"three n on a rectangle", "rectangle:width=5,height=3", []float64{0.05, 0.03, 0.05}, nil},
	} {
		t.Run(tc.name, func(t *testing.T) {
			sh, err := subdivide.ParseShape(tc.spec)
			if err != nil {
				t.Fatal(err)
			}
			n, err := ShapeN(sh, tc.n)
			if tc.want == nil {
				if !errors.Is(err, ErrRequest) {
					t.Fatalf("err %v, want ErrRequest", err)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			g, err := sh.Build(n)
			if err != nil {
				t.Fatal(err)
			}
			subs := g.Subsections()
			if len(subs) != len(tc.want) {
				t.Fatalf("%d subsections, want %d", len(subs), len(tc.want))
			}
			for i, s := range subs {
				if s.N != tc.want[i] {
					t.Errorf("subsection %d: n %g, want %g", i+1, s.N, tc.want[i])
				}
			}
		})
	}
}

// TestBlankNColumnWithN: an n column whose every cell is blank is refused
// (ErrEmptyNColumn at the header's n cell), and one whose first cell is
// blank is refused at that cell (ErrFirstNBlank: nothing above to carry),
// unless n is given on the command line, which replaces the column's;
// then the section takes that n, and a trapezoid (bottom 10 ft, sides
// 2:1) gets Manning's conveyance K = (1.486/n)·A·R^(2/3) at a depth of
// 2 ft: A = 10·2 + 2·2² = 28 ft², P = 10 + 2·2·√5 ft (Chow 1959, table
// 2-1, trapezoid; hand evaluation).
func TestBlankNColumnWithN(t *testing.T) {
	for _, c := range []struct {
		name, text string
		want       error
		row, col   int // where want is found
	}{
		{"every n blank", "station (ft),elevation (ft),n\n0,8\n16,0\n26,0\n42,8\n", ErrEmptyNColumn, 1, 3},
		{"first n blank", "station (ft),elevation (ft),n\n0,8,\n16,0,0.05\n26,0,0.05\n42,8\n", ErrFirstNBlank, 2, 3},
		{"coordinates, first n blank", "easting (ft),northing (ft),elevation (ft),n\n1042,500,8,\n1026,500,0,0.05\n1016,500,0,0.05\n1000,500,8\n", ErrFirstNBlank, 2, 4},
	} {
		path := filepath.Join(t.TempDir(), "trap.csv")
		if err := os.WriteFile(path, []byte(c.text), 0o644); err != nil {
			t.Fatal(err)
		}
		_, err := Prepare(SectionRequest{Path: path})
		var pe *ParseError
		if !errors.Is(err, c.want) || !errors.As(err, &pe) || pe.Row != c.row || pe.Column != c.col {
			t.Errorf("%s, without --n: %v, want %v at row %d, column %d", c.name, err, c.want, c.row, c.col)
		}
		p, err := Prepare(SectionRequest{Path: path, N: []float64{0.035}})
		if err != nil {
			t.Fatalf("%s, with --n: %v", c.name, err)
		}
		const n, tol = 0.035, 1e-9
		a, wp := 28.0, 10+4*math.Sqrt(5)
		want := 1.486 / n * a * math.Pow(a/wp, 2.0/3)
		tb, err := rating.Compute(p.Geometry, []float64{2}, rating.Options{Slope: 0.002, Units: p.Units})
		if err != nil || len(tb.Rows) != 1 {
			t.Fatalf("%s: rating: %v", c.name, err)
		}
		if k := tb.Rows[0].Conveyance; p.Units != rating.US || math.Abs(k-want) > tol*want {
			t.Errorf("%s: conveyance at 2 ft: %g (%s units), want %g", c.name, k, p.Units, want)
		}
	}
}
