package subdivide

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/integrate"
)

func mustCompile(t testing.TB, s Section) *Profile {
	t.Helper()
	p, err := Compile(s)
	if err != nil {
		t.Fatalf("Compile: %v", err)
	}
	return p
}

func near(a, b, tol float64) bool {
	return math.Abs(a-b) <= tol*math.Max(1, math.Max(math.Abs(a), math.Abs(b)))
}

// trapezoid returns a section with bottom width b, side slope z (horizontal
// per vertical) on both sides, and height top, invert at elevation 0.
func trapezoid(b, z, top float64) Section {
	return Section{Points: []Point{
		{0, top}, {z * top, 0}, {z*top + b, 0}, {2*z*top + b, top},
	}}
}

// TestClosedForm checks area, wetted perimeter, top width, hydraulic radius
// and hydraulic depth against the geometric elements of channel sections
// (Chow, 1959, Open-Channel Hydraulics, Table 2-1):
//
//	rectangle  A = b·y,        P = b + 2y,          T = b
//	trapezoid  A = (b + zy)y,  P = b + 2y√(1+z²),   T = b + 2zy
//	triangle   A = zy²,        P = 2y√(1+z²),       T = 2zy
//
// Tolerance 1e-12 relative: the formulas are exact for straight sides.
func TestClosedForm(t *testing.T) {
	type elems struct{ a, p, tw float64 }
	rect := func(b, y float64) elems { return elems{b * y, b + 2*y, b} }
	trap := func(b, z, y float64) elems {
		return elems{(b + z*y) * y, b + 2*y*math.Sqrt(1+z*z), b + 2*z*y}
	}
	tri := func(z, y float64) elems { return elems{z * y * y, 2 * y * math.Sqrt(1+z*z), 2 * z * y} }
	rectangle := Section{Points: []Point{{0, 5}, {0, 0}, {4, 0}, {4, 5}}} // vertical walls
	triangle := Section{Points: []Point{{0, 3}, {6, 0}, {12, 3}}}         // z = 2
	cases := []struct {
		name  string
		sec   Section
		stage float64
		want  elems
	}{
		{"rectangle y=0.5", rectangle, 0.5, rect(4, 0.5)},
		{"rectangle y=2.25", rectangle, 2.25, rect(4, 2.25)},
		{"rectangle y at wall top", rectangle, 5, rect(4, 5)},
		{"trapezoid y=0.3", trapezoid(3, 1.5, 4), 0.3, trap(3, 1.5, 0.3)},
		{"trapezoid y=2", trapezoid(3, 1.5, 4), 2, trap(3, 1.5, 2)},
		{"trapezoid y at top vertex", trapezoid(3, 1.5, 4), 4, trap(3, 1.5, 4)},
		{"triangle y=1", triangle, 1, tri(2, 1)},
		{"triangle y at top vertex", triangle, 3, tri(2, 3)},
	}
	const tol = 1e-12
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			w, err := mustCompile(t, c.sec).At(c.stage, Options{AllPools: true})
			if err != nil {
				t.Fatal(err)
			}
			if !near(w.Area, c.want.a, tol) || !near(w.WettedPerimeter, c.want.p, tol) || !near(w.TopWidth, c.want.tw, tol) {
				t.Errorf("A, P, T = %g, %g, %g; want %g, %g, %g", w.Area, w.WettedPerimeter, w.TopWidth, c.want.a, c.want.p, c.want.tw)
			}
			if !near(w.HydraulicRadius, c.want.a/c.want.p, tol) || !near(w.HydraulicDepth, c.want.a/c.want.tw, tol) {
				t.Errorf("R, D = %g, %g; want %g, %g", w.HydraulicRadius, w.HydraulicDepth, c.want.a/c.want.p, c.want.a/c.want.tw)
			}
		})
	}
}

// TestCentroidDepth checks the depth of the centroid below the surface:
// y/2 for a rectangle and y/3 for a triangle (closed form: centroids of a
// rectangle and of a triangle with its base at the surface).
func TestCentroidDepth(t *testing.T) {
	rect := mustCompile(t, Section{Points: []Point{{0, 5}, {0, 0}, {4, 0}, {4, 5}}})
	tri := mustCompile(t, Section{Points: []Point{{0, 3}, {6, 0}, {12, 3}}})
	for _, c := range []struct {
		p     *Profile
		y     float64
		want  float64
		label string
	}{{rect, 2, 1, "rectangle"}, {tri, 1.5, 0.5, "triangle"}} {
		w, _ := c.p.At(c.y, Options{AllPools: true})
		if !near(w.CentroidDepth, c.want, 1e-12) {
			t.Errorf("%s: centroid depth %g, want %g", c.label, w.CentroidDepth, c.want)
		}
	}
}

// TestCirclePolygon checks a circle sampled as a fine polygon against the
// circular-segment formulas (Chow, 1959, Table 2-1):
//
//	θ = 2·acos(1 − 2y/D),  A = (D²/8)(θ − sin θ),  P = Dθ/2,  T = D·sin(θ/2)
//
// An inscribed regular polygon of m sides has perimeter short of the arc by
// a relative 1 − sin(π/m)/(π/m) ≈ (π/m)²/6 and area short by about
// (2π/m)²/6 of the segment (closed form for the inscribed polygon); with
// m = 4096 both are below 5e-7, so the bound allowed is 2e-6 relative.
func TestCirclePolygon(t *testing.T) {
	const d, m = 2.0, 4096
	// The lower half of the circle as a ground line, left to right.
	var pts []Point
	for i := 0; i <= m/2; i++ {
		phi := math.Pi + math.Pi*float64(i)/(m/2) // π … 2π
		pts = append(pts, Point{d / 2 * math.Cos(phi), d/2 + d/2*math.Sin(phi)})
	}
	for i := range pts {
		pts[i].Station = -pts[len(pts)-1-i].Station
	}
	p := mustCompile(t, Section{Points: pts})
	const bound = 2e-6
	for _, y := range []float64{0.1, 0.5, 1.0} {
		theta := 2 * math.Acos(1-2*y/d)
		a := d * d / 8 * (theta - math.Sin(theta))
		per := d * theta / 2
		tw := d * math.Sin(theta/2)
		w, _ := p.At(y, Options{AllPools: true})
		if !near(w.Area, a, bound) || !near(w.WettedPerimeter, per, bound) || !near(w.TopWidth, tw, bound) {
			t.Errorf("y=%g: A, P, T = %.9g, %.9g, %.9g; want %.9g, %.9g, %.9g", y, w.Area, w.WettedPerimeter, w.TopWidth, a, per, tw)
		}
	}
}

// TestExtension checks that a stage above an end adds a vertical wall of the
// wetted height to the perimeter, and that NoExtend refuses it.
func TestExtension(t *testing.T) {
	// Rectangle of width 4 with walls only 1 high: at stage 3 the walls are
	// extended by 2 on each side, so P = 4 + 2·3 (closed form).
	p := mustCompile(t, Section{Points: []Point{{0, 1}, {0, 0}, {4, 0}, {4, 1}}})
	w, err := p.At(3, Options{AllPools: true})
	if err != nil {
		t.Fatal(err)
	}
	if w.Area != 12 || w.WettedPerimeter != 10 || w.TopWidth != 4 || w.ExtendedLeft != 2 || w.ExtendedRight != 2 {
		t.Errorf("got A=%g P=%g T=%g ext=%g,%g", w.Area, w.WettedPerimeter, w.TopWidth, w.ExtendedLeft, w.ExtendedRight)
	}
	if _, err := p.At(3, Options{AllPools: true, NoExtend: true}); !errors.Is(err, ErrAboveEnds) {
		t.Errorf("NoExtend: err = %v, want ErrAboveEnds", err)
	}
	if _, err := p.At(1, Options{AllPools: true, NoExtend: true}); err != nil {
		t.Errorf("stage at the ends with NoExtend: %v", err)
	}
}

// leveeSection has a main channel (bottom 0 at stations 4–6) and, behind a
// levee crest at elevation 3 (station 12), a back-swamp down to 1 (station 16).
func leveeSection() Section {
	return Section{
		Points:   []Point{{0, 4}, {4, 0}, {6, 0}, {10, 2}, {12, 3}, {14, 2}, {16, 1}, {18, 2}, {20, 4}},
		N:        []float64{0.03, 0.03, 0.03, 0.05, 0.05, 0.06, 0.06, 0.06},
		HasBanks: true, LeftBank: 2, RightBank: 10,
	}
}

// TestPools checks pockets: at stage 2.5 the channel and the back-swamp are
// separate pools. Both count by default; Connected keeps the channel's only.
// Areas by hand (trapezoid rule on the straight segments):
//
//	channel pool at 2.5: left side 0→4 from depth 0 to 2.5 crossing at x=1.5
//	  (area 2.5·2.5/2 = 3.125), bottom 4→6 (5), 6→10 depths 2.5→0.5 (6),
//	  10→12 depths 0.5→−0.5, wet half (0.25): total 14.375.
//	swamp pool: 12→14 wet from 13 (0.25), 14→16 (0.5+1.5)=2, 16→18 (1.5+0.5)=2,
//	  18→20 wet to 18.5 (0.125): total 4.375.
func TestPools(t *testing.T) {
	p := mustCompile(t, leveeSection())
	all, _ := p.At(2.5, Options{AllPools: true})
	conn, _ := p.At(2.5, Options{})
	if all.Pools != 2 || conn.Pools != 1 {
		t.Errorf("pools = %d (all), %d (connected); want 2, 1", all.Pools, conn.Pools)
	}
	if !near(all.Area, 14.375+4.375, 1e-12) || !near(conn.Area, 14.375, 1e-12) {
		t.Errorf("area = %g (all), %g (connected); want %g, %g", all.Area, conn.Area, 14.375+4.375, 14.375)
	}
	// Above the levee crest the two pools join: both modes agree.
	a, _ := p.At(3.5, Options{AllPools: true})
	c, _ := p.At(3.5, Options{})
	if a.Pools != 1 || !near(a.Area, c.Area, 1e-12) {
		t.Errorf("above the crest: pools %d, areas %g vs %g", a.Pools, a.Area, c.Area)
	}
	// Stage exactly at the crest: the pools touch at one point only and stay separate.
	e, _ := p.At(3, Options{AllPools: true})
	if e.Pools != 2 {
		t.Errorf("at the crest: pools %d, want 2", e.Pools)
	}
}

// TestSubsections checks the split at banks and n changes.
func TestSubsections(t *testing.T) {
	p := mustCompile(t, leveeSection())
	subs := p.Subsections()
	want := []Subsection{
		{From: 0, To: 2, N: 0.03, Region: LeftOverbank},
		{From: 2, To: 10, N: 0.03, Region: Channel},
		{From: 10, To: 14, N: 0.05, Region: RightOverbank},
		{From: 14, To: 20, N: 0.06, Region: RightOverbank},
	}
	if len(subs) != len(want) {
		t.Fatalf("subsections %+v, want %+v", subs, want)
	}
	for i := range want {
		if subs[i] != want[i] {
			t.Errorf("subsection %d = %+v, want %+v", i, subs[i], want[i])
		}
	}
	// The bank at station 2 lies inside the segment 0→4: a point is inserted
	// at its interpolated elevation 2.
	pts := p.Points()
	if pts[1] != (Point{2, 2}) {
		t.Errorf("inserted bank point %+v, want {2 2}", pts[1])
	}
}

// TestWallOnBank checks that a vertical wall standing on a bank station is
// counted with the side its wet face looks into.
func TestWallOnBank(t *testing.T) {
	// Channel 0–4 with a vertical right wall at the bank station 4 rising to
	// a floodplain at 2: the wall faces the channel.
	s := Section{Points: []Point{{0, 3}, {0, 0}, {4, 0}, {4, 2}, {10, 2}, {10, 3}},
		N: []float64{0.03, 0.03, 0.03, 0.05, 0.05}, HasBanks: true, LeftBank: 0, RightBank: 4}
	p := mustCompile(t, s)
	w, _ := p.At(1, Options{AllPools: true})
	ch := w.Subs[0]
	if ch.Region != Channel || ch.WettedPerimeter != 1+4+1 {
		t.Errorf("channel subsection %+v, want perimeter 6", ch)
	}
}

func TestValidate(t *testing.T) {
	cases := []struct {
		name string
		sec  Section
		want error
	}{
		{"one point", Section{Points: []Point{{0, 0}}}, ErrTooFewPoints},
		{"overhang", Section{Points: []Point{{0, 1}, {2, 0}, {1, 1}}}, ErrOverhang},
		{"nan", Section{Points: []Point{{0, 1}, {math.NaN(), 0}}}, ErrNotFinite},
		{"zero width", Section{Points: []Point{{1, 1}, {1, 0}}}, ErrZeroWidth},
		{"bad n", Section{Points: []Point{{0, 1}, {1, 0}}, N: []float64{0}}, ErrBadN},
		{"n length", Section{Points: []Point{{0, 1}, {1, 0}}, N: []float64{0.03, 0.03}}, ErrNLength},
		{"banks outside", Section{Points: []Point{{0, 1}, {1, 0}}, HasBanks: true, LeftBank: -1, RightBank: 1}, ErrBanks},
		{"banks reversed", Section{Points: []Point{{0, 1}, {1, 0}}, HasBanks: true, LeftBank: 1, RightBank: 0.5}, ErrBanks},
	}
	for _, c := range cases {
		if _, err := Compile(c.sec); !errors.Is(err, c.want) {
			t.Errorf("%s: err = %v, want %v", c.name, err, c.want)
		}
	}
}

// randomSection draws a ground line with walls, flats and pockets.
func randomSection(r *rand.Rand) Section {
	n := 3 + r.IntN(30)
	pts := make([]Point, n)
	x := r.Float64() * 100
	for i := range pts {
		switch r.IntN(6) {
		case 0: // vertical wall
		case 1:
			x += 0.5
		default:
			x += r.Float64() * 10
		}
		z := 100 + r.Float64()*5
		if r.IntN(5) == 0 && i > 0 {
			z = pts[i-1].Elevation // flat ground
		}
		pts[i] = Point{x, z}
	}
	if pts[n-1].Station == pts[0].Station {
		pts[n-1].Station += 1
	}
	s := Section{Points: pts, N: make([]float64, n-1)}
	for i := range s.N {
		s.N[i] = []float64{0.03, 0.05, 0.08}[r.IntN(3)]
	}
	if r.IntN(2) == 0 {
		a := pts[0].Station + r.Float64()*(pts[n-1].Station-pts[0].Station)
		b := pts[0].Station + r.Float64()*(pts[n-1].Station-pts[0].Station)
		if a > b {
			a, b = b, a
		}
		if a < b {
			s.HasBanks, s.LeftBank, s.RightBank = true, a, b
		}
	}
	return s
}

// TestProperties checks, over many random sections, invariants that hold for
// any ground line (closed-form facts of the geometry):
//   - area is non-decreasing and convex in stage, and dA/dh equals the top
//     width (the area is the integral of the top width over the stage);
//   - area equals ∫ max(h − z(x), 0) dx computed independently by gonum's
//     integrate.Trapezoidal on a fine sampling of the ground line;
//   - subsections sum to the whole.
func TestProperties(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 1))
	for k := 0; k < 300; k++ {
		s := randomSection(r)
		p := mustCompile(t, s)
		for _, opt := range []Options{{AllPools: true}, {}} {
			prevA, prevT := -1.0, -1.0
			for h := 99.9; h <= 105.3; h += 0.37 {
				w, err := p.At(h, opt)
				if err != nil {
					t.Fatal(err)
				}
				if w.Area < prevA-1e-9 || w.TopWidth < prevT-1e-9 {
					t.Fatalf("section %d %+v: area or top width decreased at %g", k, opt, h)
				}
				prevA, prevT = w.Area, w.TopWidth
				var sa, sp, st float64
				for _, sw := range w.Subs {
					sa += sw.Area
					sp += sw.WettedPerimeter
					st += sw.TopWidth
				}
				if !near(sa, w.Area, 1e-12) || !near(sp, w.WettedPerimeter, 1e-12) || !near(st, w.TopWidth, 1e-12) {
					t.Fatalf("section %d: subsections do not sum to the whole at %g", k, h)
				}
				// dA/dh from a central difference against the top width,
				// away from stages where the top width jumps (flats).
				const dh = 1e-6
				lo, _ := p.At(h-dh, opt)
				hi, _ := p.At(h+dh, opt)
				if math.Abs(hi.TopWidth-lo.TopWidth) < 1e-3 {
					if d := (hi.Area - lo.Area) / (2 * dh); !near(d, w.TopWidth, 1e-4) {
						t.Fatalf("section %d at %g: dA/dh %g, top width %g", k, h, d, w.TopWidth)
					}
				}
				if !opt.AllPools {
					// The water left out stands in the other pools: with
					// them it is all the water there is.
					all, _ := p.At(h, Options{AllPools: true})
					if !near(w.Area+w.Ponded, all.Area, 1e-12) || w.Pools+w.PondedPools != all.Pools {
						t.Fatalf("section %d at %g: area %g + ponded %g (%d + %d pools), all pools %g (%d)",
							k, h, w.Area, w.Ponded, w.Pools, w.PondedPools, all.Area, all.Pools)
					}
				}
				if opt.AllPools {
					// Sampling error bound: a few crossings × slope ≤ 10 ×
					// dx² ≤ (10/2000)² / 8, well under 1e-4.
					if ref := integrateDepth(s.Points, h); math.Abs(w.Area-ref) > 1e-4 {
						t.Fatalf("section %d at %g: area %g, integral %g", k, h, w.Area, ref)
					}
				}
			}
		}
	}
}

// integrateDepth integrates max(h − z(x), 0) over the section by sampling
// each sloping segment at 2001 points and adding gonum's trapezoidal
// estimates. Vertical walls add no area. The only error is at a crossing of
// the stage, below slope·dx²/8 per crossing (dx = segment/2000).
func integrateDepth(pts []Point, h float64) float64 {
	const m = 2000
	xs, fs := make([]float64, m+1), make([]float64, m+1)
	var sum float64
	for i := 0; i+1 < len(pts); i++ {
		a, b := pts[i], pts[i+1]
		if a.Station == b.Station {
			continue
		}
		for j := 0; j <= m; j++ {
			t := float64(j) / m
			xs[j] = a.Station + t*(b.Station-a.Station)
			fs[j] = math.Max(h-(a.Elevation+t*(b.Elevation-a.Elevation)), 0)
		}
		sum += integrate.Trapezoidal(xs, fs)
	}
	return sum
}

// TestWallSubsections: vertical walls whose n differs from the bed's are
// subsections of no width that say which way they face: a wall falling
// left to right (the left end) faces right, a rising one faces left.
func TestWallSubsections(t *testing.T) {
	p := mustCompile(t, Section{Points: []Point{{0, 3}, {0, 0}, {5, 0}, {5, 3}}, N: []float64{0.1, 0.03, 0.1}})
	want := []Subsection{
		{From: 0, To: 0, N: 0.1, Region: Channel, Wall: 1},
		{From: 0, To: 5, N: 0.03, Region: Channel},
		{From: 5, To: 5, N: 0.1, Region: Channel, Wall: -1},
	}
	got := p.Subsections()
	if len(got) != len(want) {
		t.Fatalf("subsections %+v, want %+v", got, want)
	}
	for i := range want {
		if got[i] != want[i] {
			t.Errorf("subsection %d = %+v, want %+v", i, got[i], want[i])
		}
	}
}
