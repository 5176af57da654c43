package subdivide

import (
	"math"
	"testing"
)

// TestJoins checks the stages at which pockets join the main channel
// against the ground line: each is the surveyed elevation of the crest
// between pocket and channel, exactly, and the flow area at it and just
// above differs by the pocket's area at the crest, summed by hand from the
// trapezoids under the crest's level (A = dx·(d1+d2)/2 on each straight
// piece of ground; Chow, 1959, Open-Channel Hydraulics, Table 2-1).
func TestJoins(t *testing.T) {
	// Channel from 0 to 20 with its bed at 10; a crest at (20, 3.6) and a
	// pocket behind it to (35, 5): 3.6→1 over 5 m, 1 flat for 5 m, 1→5
	// over 5 m, wet to z = 3.6 at x = 33.25.
	levee := Section{Points: []Point{{0, 5}, {10, 0}, {20, 3.6}, {25, 1}, {30, 1}, {35, 5}}}
	pocket := 5*(0+2.6)/2 + 5*2.6 + 3.25*2.6/2
	// The same with a second, higher crest and pocket beyond the first,
	// and a pocket on the left whose crest is at 2.
	nested := Section{Points: []Point{{-20, 6}, {-10, 0.5}, {-5, 2}, {0, 1.5}, {10, 0}, {20, 3.6}, {25, 1}, {30, 4.5}, {40, 2}, {50, 7}}}
	cases := []struct {
		name   string
		sec    Section
		want   []Join // Above is checked separately
		pocket []float64
	}{
		{"no pocket", trapezoid(3, 1.5, 4), nil, nil},
		{"flat-topped levee, nothing behind it", Section{Points: []Point{{0, 5}, {10, 0}, {20, 3}, {25, 3}, {30, 5}}}, nil, nil},
		{"levee", levee, []Join{{Stage: 3.6, Crest: 20, From: 20, To: 35}}, []float64{pocket}},
		{"pocket falling to the end", Section{Points: []Point{{0, 5}, {10, 0}, {20, 3.6}, {30, 1}}},
			[]Join{{Stage: 3.6, Crest: 20, From: 20, To: 30}}, []float64{10 * 2.6 / 2}},
		{"nested", nested, []Join{
			{Stage: 2, Crest: -5, From: -20, To: -5},
			{Stage: 3.6, Crest: 20, From: 20, To: 30},
			{Stage: 4.5, Crest: 30, From: 30, To: 50},
		}, nil},
	}
	// The nested pockets' areas at their crests, by hand: on the left,
	// from where the slope (-20, 6)→(-10, 0.5) is at 2 down to 0.5 and up
	// to 2 at -5; in the middle 3.6→1 over 5 m, then 1→4.5 over 5 m wet
	// for 5·2.6/3.5 m; on the right 4.5→2 over 10 m, then 2→7 over 10 m
	// wet for 10·2.5/5 m.
	xl := -20 + 10*(6-2)/5.5
	cases[len(cases)-1].pocket = []float64{
		(-10-xl)*1.5/2 + 5*1.5/2,
		5*2.6/2 + 5*2.6/3.5*2.6/2,
		10*2.5/2 + 10*2.5/5*2.5/2,
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			p := mustCompile(t, c.sec)
			got := p.Joins()
			if len(got) != len(c.want) {
				t.Fatalf("joins %+v, want %+v", got, c.want)
			}
			for i, j := range got {
				w := c.want[i]
				if j.Stage != w.Stage || j.Crest != w.Crest || j.From != w.From || j.To != w.To {
					t.Errorf("join %d: %+v, want %+v", i, j, w)
				}
				if !(j.Above > j.Stage) || j.Above-j.Stage > 1e-12*math.Max(1, math.Abs(j.Stage)) {
					t.Errorf("join %d: above %v is not the next stage up from %v", i, j.Above, j.Stage)
				}
				at, err := p.At(j.Stage, Options{})
				if err != nil {
					t.Fatal(err)
				}
				up, err := p.At(j.Above, Options{})
				if err != nil {
					t.Fatal(err)
				}
				if d := up.Area - at.Area; !near(d, c.pocket[i], 1e-12) {
					t.Errorf("join %d at %v: the area steps by %v, want the pocket's %v", i, j.Stage, d, c.pocket[i])
				}
				if at.Ponded < c.pocket[i]*(1-1e-12) {
					t.Errorf("join %d at %v: ponded %v, want at least the pocket's %v", i, j.Stage, at.Ponded, c.pocket[i])
				}
			}
		})
	}
}

// A crest far from the section's lowest point in magnitude (a shift that
// rounds coarser than the crest's own last bit) still gives a stage just
// above it at which the pocket counts, found without stepping bit by bit.
func TestJoinAboveCoarseShift(t *testing.T) {
	p := mustCompile(t, Section{Points: []Point{{0, 5e-300}, {10, -1e10}, {20, 1e-300}, {25, -1}, {30, 5e-300}}})
	js := p.Joins()
	if len(js) != 1 || js[0].Stage != 1e-300 {
		t.Fatalf("joins %+v, want one at the crest 1e-300", js)
	}
	j := js[0]
	at, _ := p.At(j.Stage, Options{})
	up, _ := p.At(j.Above, Options{})
	if !(j.Above > j.Stage) || !(j.Above < 1e-4) || !(up.Area > at.Area) {
		t.Errorf("above %v: area %v at the crest, %v above", j.Above, at.Area, up.Area)
	}
}
