package subdivide

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

// shapeTol is the relative tolerance of closed-form geometry checks: the
// engine sums exact segment areas, so only round-off separates them.
const shapeTol = 1e-12

func TestParseShape(t *testing.T) {
	tests := []struct {
		spec string
		want Shape
	}{
		{"rectangle:width=3", Shape{Kind: Rectangle, Bottom: 3}},
		{" Rectangle : Width = 3 , invert=100.5,height=2", Shape{Kind: Rectangle, Bottom: 3, Invert: 100.5, Height: 2}},
		{"trapezoid:bottom=3,side=2", Shape{Kind: Trapezoid, Bottom: 3, Left: 2, Right: 2}},
		{"trapezoid:bottom=3,left=1.5,right=0", Shape{Kind: Trapezoid, Bottom: 3, Left: 1.5, Right: 0}},
		{"trapezoid:bottom=3,side=2,right=3", Shape{Kind: Trapezoid, Bottom: 3, Left: 2, Right: 3}},
		// angle 45° is Z = 1 (closed form: cot 45° = 1).
		{"trapezoid:bottom=3,angle=45", Shape{Kind: Trapezoid, Bottom: 3, Left: 1 / math.Tan(math.Pi/4), Right: 1 / math.Tan(math.Pi/4)}},
		{"trapezoid:bottom=3,angle=90", Shape{Kind: Trapezoid, Bottom: 3}},
		{"triangle:side=1.5", Shape{Kind: Triangle, Left: 1.5, Right: 1.5}},
		{"circle:diameter=0.6", Shape{Kind: Circle, Diameter: 0.6}},
		{"compound:bottom=2,side=1,depth=1.5,floodplain=20", Shape{Kind: Compound, Bottom: 2, Left: 1, Right: 1, Depth: 1.5, Floodplain: 20, Outer: 1}},
		{"compound:bottom=2,side=1,depth=1.5,floodplain=20,outer=3,floodn=0.06", Shape{Kind: Compound, Bottom: 2, Left: 1, Right: 1, Depth: 1.5, Floodplain: 20, Outer: 3, FloodN: 0.06}},
	}
	for _, tt := range tests {
		got, err := ParseShape(tt.spec)
		if err != nil {
			t.Errorf("ParseShape(%q): %v", tt.spec, err)
			continue
		}
		if got != tt.want {
			t.Errorf("ParseShape(%q) = %+v, want %+v", tt.spec, got, tt.want)
		}
		again, err := ParseShape(got.String())
		if err != nil || again != got {
			t.Errorf("ParseShape(%q.String() = %q) = %+v, %v", tt.spec, got.String(), again, err)
		}
	}
}

func TestParseShapeErrors(t *testing.T) {
	tests := []struct {
		spec, key string
		cause     error
	}{
		{"hexagon:width=3", "kind", ErrShapeKind},
		{"", "kind", ErrShapeKind},
		{"rectangle", "width", ErrShapeMissing},
		{"rectangle:width=0", "width", ErrShapePositive},
		{"rectangle:width=-2", "width", ErrShapePositive},
		{"rectangle:width=abc", "width", ErrShapeValue},
		{"rectangle:width=NaN", "width", ErrShapeValue},
		{"rectangle:width=3,width=4", "width", ErrShapeRepeated},
		{"rectangle:width=3,side=2", `"side"`, ErrShapeKey},
		{"trapezoid:bottom=3", "side", ErrShapeMissing},
		{"trapezoid:bottom=3,left=2", "right", ErrShapeMissing},
		{"trapezoid:side=2", "bottom", ErrShapeMissing},
		{"trapezoid:bottom=3,side=-1", "left", ErrShapeNegative},
		{"trapezoid:bottom=3,angle=0", "angle", ErrShapeAngle},
		{"trapezoid:bottom=3,angle=120", "angle", ErrShapeAngle},
		{"circle:diameter=0", "diameter", ErrShapePositive},
		{"circle:diameter=1,height=2", `"height"`, ErrShapeKey},
		{"compound:bottom=2,side=1,floodplain=20", "depth", ErrShapeMissing},
		{"compound:bottom=2,side=1,depth=2,floodplain=20,height=1", "height", nil},
		{"rectangle:width=3,height=0", "height", ErrShapePositive},
		{"rectangle:width=1e9", "width", ErrShapeSize},
		{"trapezoid:bottom=1e9,side=1", "bottom", ErrShapeSize},
		{"circle:diameter=2e5", "diameter", ErrShapeSize},
	}
	for _, tt := range tests {
		_, err := ParseShape(tt.spec)
		var se *ShapeError
		if !errors.As(err, &se) {
			t.Errorf("ParseShape(%q) error = %v, want a *ShapeError", tt.spec, err)
			continue
		}
		if se.Key != tt.key {
			t.Errorf("ParseShape(%q) key = %q, want %q (%v)", tt.spec, se.Key, tt.key, err)
		}
		if tt.cause != nil && !errors.Is(err, tt.cause) {
			t.Errorf("ParseShape(%q) = %v, want cause %v", tt.spec, err, tt.cause)
		}
		if !strings.Contains(err.Error(), ShapeForms) {
			t.Errorf("ParseShape(%q) error does not list the accepted forms: %v", tt.spec, err)
		}
	}
}

// trapezoidElements are the closed forms for a trapezoid of bottom b and
// side slopes zl, zr at depth y (Chow, 1959, table 2-1):
// A = (b + (zl+zr)y/2)·y, P = b + y(√(1+zl²) + √(1+zr²)), T = b + (zl+zr)y.
func trapezoidElements(b, zl, zr, y float64) (a, p, t float64) {
	return (b + (zl+zr)*y/2) * y, b + y*(math.Hypot(1, zl)+math.Hypot(1, zr)), b + (zl+zr)*y
}

func TestPrismClosedForm(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 1))
	for i := 0; i < 200; i++ {
		b := 0.5 + 20*rng.Float64()
		zl, zr := 3*rng.Float64(), 3*rng.Float64()
		kind := Trapezoid
		if i%4 == 0 {
			kind, b = Triangle, 0
			zl += 0.1
		}
		if i%4 == 1 {
			kind, zl, zr = Rectangle, 0, 0
		}
		inv := 100 * (rng.Float64() - 0.5)
		s := Shape{Kind: kind, Bottom: b, Left: zl, Right: zr, Invert: inv}
		g, err := s.Build(PerRegion{Channel: 0.03})
		if err != nil {
			t.Fatal(err)
		}
		// Depths up to four times the nominal top: above it the sides go on.
		y := 4 * s.NominalHeight() * rng.Float64()
		w, err := g.At(inv+y, Options{AllPools: true, NoExtend: true})
		if err != nil {
			t.Fatalf("%s at depth %g: %v", s, y, err)
		}
		a, p, tw := trapezoidElements(b, zl, zr, y)
		for _, c := range []struct {
			name      string
			got, want float64
		}{{"area", w.Area, a}, {"perimeter", w.WettedPerimeter, p}, {"top width", w.TopWidth, tw}} {
			if math.Abs(c.got-c.want) > shapeTol*(1+math.Abs(c.want))*100 {
				t.Errorf("%s depth %g: %s %g, closed form %g", s, y, c.name, c.got, c.want)
			}
		}
		if w.ExtendedLeft != 0 || w.ExtendedRight != 0 {
			t.Errorf("%s depth %g: ends extended on an open-ended shape", s, y)
		}
	}
}

func TestPrismHeight(t *testing.T) {
	// With height= the shape ends there: above it, vertical walls (or an
	// error with NoExtend) as for a survey.
	s, err := ParseShape("trapezoid:bottom=2,side=1,height=1")
	if err != nil {
		t.Fatal(err)
	}
	g, _ := s.Build(PerRegion{Channel: 0.02})
	if g.Top() != 1 {
		t.Errorf("top %g, want 1", g.Top())
	}
	w, err := g.At(1.5, Options{AllPools: true})
	if err != nil {
		t.Fatal(err)
	}
	// Closed form: trapezoid to depth 1 (A = 3, T = 4) plus 0.5 m of a
	// 4 m wide rectangle above it.
	if math.Abs(w.Area-5) > 1e-12 || w.ExtendedLeft != 0.5 || w.ExtendedRight != 0.5 {
		t.Errorf("area %g, walls %g %g; want 5, 0.5, 0.5", w.Area, w.ExtendedLeft, w.ExtendedRight)
	}
	if _, err := g.At(1.5, Options{AllPools: true, NoExtend: true}); !errors.Is(err, ErrAboveEnds) {
		t.Errorf("NoExtend above the top: %v, want ErrAboveEnds", err)
	}
}

func TestCompoundShape(t *testing.T) {
	s, err := ParseShape("compound:bottom=2,side=1,depth=1.5,floodplain=20,outer=3,floodn=0.06")
	if err != nil {
		t.Fatal(err)
	}
	sec, err := s.Section(PerRegion{Channel: 0.035})
	if err != nil {
		t.Fatal(err)
	}
	if !sec.HasBanks || sec.RightBank-sec.LeftBank != 2+2*1.5 {
		t.Errorf("banks %v %g %g, want 5 apart", sec.HasBanks, sec.LeftBank, sec.RightBank)
	}
	g, _ := s.Build(PerRegion{Channel: 0.035})
	subs := g.Subsections()
	if len(subs) != 3 || subs[0].N != 0.06 || subs[1].N != 0.035 || subs[2].N != 0.06 {
		t.Fatalf("subsections %+v", subs)
	}
	// Closed form at depth 2.5 (1 m over the floodplains): channel strip
	// A = trapezoid to 1.5 plus 5 m × 1 m; each floodplain a trapezoid of
	// bottom 20, one side slope 3 (outer) and one vertical side, depth 1.
	w, err := g.At(2.5, Options{AllPools: true, NoExtend: true})
	if err != nil {
		t.Fatal(err)
	}
	ac, pc, _ := trapezoidElements(2, 1, 1, 1.5)
	ac += 5 * 1
	af, _, _ := trapezoidElements(20, 3, 0, 1)
	pf := 20 + math.Hypot(1, 3)
	if math.Abs(w.Subs[1].Area-ac) > 1e-12 || math.Abs(w.Subs[1].WettedPerimeter-pc) > 1e-12 {
		t.Errorf("channel %g %g, want %g %g", w.Subs[1].Area, w.Subs[1].WettedPerimeter, ac, pc)
	}
	if math.Abs(w.Subs[0].Area-af) > 1e-12 || math.Abs(w.Subs[0].WettedPerimeter-pf) > 1e-12 {
		t.Errorf("floodplain %g %g, want %g %g", w.Subs[0].Area, w.Subs[0].WettedPerimeter, af, pf)
	}
	// Above the nominal top (3 m) the outer banks go on at slope 3.
	w, err = g.At(4, Options{AllPools: true, NoExtend: true})
	if err != nil {
		t.Fatal(err)
	}
	if want := 2 + 2*1.5 + 2*20 + 2*3*2.5; math.Abs(w.TopWidth-want) > 1e-12 {
		t.Errorf("top width at 4 m: %g, want %g", w.TopWidth, want)
	}
}

func TestCircleHasNoSection(t *testing.T) {
	s, _ := ParseShape("circle:diameter=1")
	if _, err := s.Section(PerRegion{Channel: 0.013}); !errors.Is(err, ErrShapeKind) {
		t.Errorf("circle Section: %v", err)
	}
}
