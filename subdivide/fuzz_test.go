package subdivide

import (
	"errors"
	"math"
	"testing"
)

// FuzzParseShape checks that no spec panics, that errors are *ShapeError,
// and that an accepted shape writes back to a spec naming the same shape
// and builds a geometry that wets without error from invert to top.
func FuzzParseShape(f *testing.F) {
	for _, s := range []string{
		"rectangle:width=3", "trapezoid:bottom=3,side=2", "trapezoid:bottom=3,left=1,right=2,invert=100",
		"trapezoid:bottom=1,angle=60,height=2", "triangle:side=1.5", "circle:diameter=0.6",
		"compound:bottom=2,side=1,depth=1.5,floodplain=20,outer=3,floodn=0.06", "circle", ":", "=,=",
	} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, spec string) {
		s, err := ParseShape(spec)
		if err != nil {
			var se *ShapeError
			if !errors.As(err, &se) {
				t.Fatalf("ParseShape(%q): %v is not a *ShapeError", spec, err)
			}
			return
		}
		again, err := ParseShape(s.String())
		if err != nil || again != s {
			t.Fatalf("ParseShape(%q): String %q reads back as %+v, %v", spec, s.String(), again, err)
		}
		g, err := s.Build(PerRegion{Channel: 0.03, Left: 0.05, Right: 0.05})
		if err != nil {
			// Dimensions so extreme that the ground line overflows.
			return
		}
		for _, frac := range []float64{0, 0.3, 1} {
			h := g.Bottom() + frac*(g.Top()-g.Bottom())
			if math.IsInf(h, 0) || math.IsNaN(h) {
				return
			}
			if _, err := g.At(h, Options{AllPools: true}); err != nil && !errors.Is(err, ErrNotFinite) {
				t.Fatalf("%s at %g: %v", s, h, err)
			}
		}
	})
}
