package survey

import (
	"errors"
	"testing"

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
