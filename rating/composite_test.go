package rating

import (
	"math"
	"strings"
	"testing"

	"wetline/subdivide"
)

// TestCompositeN checks each method against its formula written out
// independently here (Chow, 1959, Open-Channel Hydraulics, section 6-7).
func TestCompositeN(t *testing.T) {
	p := []float64{3.2, 1.1, 0, 4.0}
	a := []float64{2.5, 0.4, 0, 3.1}
	n := []float64{0.025, 0.06, 0.5, 0.035}
	// Horton-Einstein: n = [(3.2·0.025^1.5 + 1.1·0.06^1.5 + 4·0.035^1.5)/8.3]^(2/3).
	horton := math.Pow((3.2*math.Pow(0.025, 1.5)+1.1*math.Pow(0.06, 1.5)+4.0*math.Pow(0.035, 1.5))/8.3, 2.0/3)
	// Pavlovskii: n = [(3.2·0.025² + 1.1·0.06² + 4·0.035²)/8.3]^(1/2).
	pavlovskii := math.Sqrt((3.2*0.025*0.025 + 1.1*0.06*0.06 + 4.0*0.035*0.035) / 8.3)
	// Lotter: n = P·R^(5/3) / Σ(Pi·Ri^(5/3)/ni), R = 6/8.3.
	lotter := 8.3 * math.Pow(6/8.3, 5.0/3) /
		(3.2*math.Pow(2.5/3.2, 5.0/3)/0.025 + 1.1*math.Pow(0.4/1.1, 5.0/3)/0.06 + 4.0*math.Pow(3.1/4.0, 5.0/3)/0.035)
	const tol = 1e-15 // same arithmetic, different order
	for _, tt := range []struct {
		c    Composite
		want float64
	}{{HortonEinstein, horton}, {Pavlovskii, pavlovskii}, {Lotter, lotter}} {
		if got := CompositeN(tt.c, p, a, n); math.Abs(got-tt.want) > tol {
			t.Errorf("%v: %.17g, formula %.17g", tt.c, got, tt.want)
		}
		// One n throughout is that n (Lotter's only where every Ri is alike).
		if got := CompositeN(tt.c, p, a, []float64{0.03, 0.03, 0.03, 0.03}); tt.c != Lotter && math.Abs(got-0.03) > 1e-15 {
			t.Errorf("%v of equal n: %g", tt.c, got)
		}
	}
	if got := CompositeN(Pavlovskii, []float64{1}, []float64{1}, []float64{0}); got != 0 {
		t.Errorf("missing n gives %g, want 0", got)
	}
}

func TestParseComposite(t *testing.T) {
	for s, want := range map[string]Composite{"": Split, "Split": Split, "horton": HortonEinstein, "Horton-Einstein": HortonEinstein,
		"pavlovskii": Pavlovskii, "LOTTER": Lotter} {
		if got, err := ParseComposite(s); err != nil || got != want {
			t.Errorf("ParseComposite(%q) = %v, %v", s, got, err)
		}
	}
	if _, err := ParseComposite("manning"); err == nil {
		t.Error("ParseComposite(manning): no error")
	}
}

// TestCompositeGeometry: a channel whose bed and banks differ in n is one
// subsection under a composite method, and Lotter's n reproduces the
// split's total conveyance (the method is the sum of conveyances).
func TestCompositeGeometry(t *testing.T) {
	sec := subdivide.Section{
		Name:   "lined",
		Points: []subdivide.Point{{Station: 0, Elevation: 3}, {Station: 3, Elevation: 0}, {Station: 7, Elevation: 0}, {Station: 10, Elevation: 3}},
		N:      []float64{0.04, 0.015, 0.04},
	}
	p, err := subdivide.Compile(sec)
	if err != nil {
		t.Fatal(err)
	}
	opt := Options{Slope: 0.001}
	split, err := Compute(p, []float64{1, 2.5}, opt)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []Composite{HortonEinstein, Pavlovskii, Lotter} {
		opt.Composite = c
		tab, err := Compute(p, []float64{1, 2.5}, opt)
		if err != nil {
			t.Fatal(err)
		}
		if tab.Name != "lined" || len(tab.Subsections) != 1 || len(tab.Rows[0].Subs) != 1 {
			t.Fatalf("%v: name %q, %d subsections", c, tab.Name, len(tab.Subsections))
		}
		for i, r := range tab.Rows {
			w, _ := p.At(r.Stage, subdivide.Options{AllPools: true})
			var ps, as, ns []float64
			for _, s := range w.Subs {
				ps, as, ns = append(ps, s.WettedPerimeter), append(as, s.Area), append(ns, s.N)
			}
			if want := CompositeN(c, ps, as, ns); r.Subs[0].N != want {
				t.Errorf("%v stage %g: n %g, want %g", c, r.Stage, r.Subs[0].N, want)
			}
			if r.Alpha != 1 {
				t.Errorf("%v: α %g in one subsection", c, r.Alpha)
			}
			if c == Lotter && math.Abs(r.Conveyance-split.Rows[i].Conveyance) > 1e-12*r.Conveyance {
				t.Errorf("Lotter stage %g: K %g, split %g", r.Stage, r.Conveyance, split.Rows[i].Conveyance)
			}
		}
	}
}

// TestCompositeWalls: a vertical wall with its own n has wetted perimeter
// but no area. Rectangle 8 m wide at depth y = 1 m, S = 0.001 (SI), walls of
// n_w, bed n 0.02 from 0 to 4 and 0.04 from 4 to 8; each wall conveys with
// the bed part it faces (Horton–Einstein, Chow 1959, eq. 6-17), giving two
// parts of A_i = 4, P_i = 5 and
//
//	n_i = ((4·n_bed^1.5 + 1·n_w^1.5)/5)^(2/3),
//
// so Lotter (Chow 1959, eq. 6-19) by hand is, with P = 10, R = 8/10,
//
//	n = 10·0.8^(5/3) / Σ 5·0.8^(5/3)/n_i = 2 / Σ 1/n_i,
//
// K = 8·0.8^(2/3)/n; Horton–Einstein over bed and walls is
// n = ((4·0.02^1.5 + 4·0.04^1.5 + 2·n_w^1.5)/10)^(2/3) and Pavlovskii
// n = ((4·0.02² + 4·0.04² + 2·n_w²)/10)^(1/2). Lotter's K equals the
// split's, and a rougher wall lowers K by every method.
func TestCompositeWalls(t *testing.T) {
	box := func(nw float64) *subdivide.Profile {
		return compile(t, subdivide.Section{Points: []subdivide.Point{{Station: 0, Elevation: 3}, {Station: 0, Elevation: 0},
			{Station: 4, Elevation: 0}, {Station: 8, Elevation: 0}, {Station: 8, Elevation: 3}}, N: []float64{nw, 0.02, 0.04, nw}})
	}
	he := func(nb, nw float64) float64 { return math.Pow((4*math.Pow(nb, 1.5)+math.Pow(nw, 1.5))/5, 2.0/3) }
	const tol = 1e-12 // relative; the same formulas evaluated in another order
	kOf := func(n float64) float64 { return 8 * math.Pow(0.8, 2.0/3) / n }
	last := map[Composite]float64{}                  // K with the previous, smoother walls
	for _, nw := range []float64{0.015, 0.04, 0.1} { // increasing
		lotter := 2 / (1/he(0.02, nw) + 1/he(0.04, nw))
		horton := math.Pow((4*math.Pow(0.02, 1.5)+4*math.Pow(0.04, 1.5)+2*math.Pow(nw, 1.5))/10, 2.0/3)
		pavlovskii := math.Sqrt((4*0.02*0.02 + 4*0.04*0.04 + 2*nw*nw) / 10)
		split := rowAt(t, box(nw), 1, 0.001, SI)
		for _, tt := range []struct {
			c    Composite
			want float64 // composite n
		}{{Lotter, lotter}, {HortonEinstein, horton}, {Pavlovskii, pavlovskii}} {
			tab, err := Compute(box(nw), []float64{1}, Options{Slope: 0.001, Composite: tt.c})
			if err != nil {
				t.Fatal(err)
			}
			r := tab.Rows[0]
			if len(r.Subs) != 1 || relErr(r.Subs[0].N, tt.want) > tol {
				t.Errorf("walls n %g, %v: subsections %d, n %.6g, want %.6g", nw, tt.c, len(r.Subs), r.Subs[0].N, tt.want)
			}
			if relErr(r.Conveyance, kOf(tt.want)) > tol {
				t.Errorf("walls n %g, %v: K %.6g, want %.6g", nw, tt.c, r.Conveyance, kOf(tt.want))
			}
			if relErr(r.WettedPerimeter, 10) > tol || relErr(r.Subs[0].WettedPerimeter, 10) > tol {
				t.Errorf("walls n %g, %v: perimeter %g (subsection %g), want 10", nw, tt.c, r.WettedPerimeter, r.Subs[0].WettedPerimeter)
			}
			if tt.c == Lotter && relErr(r.Conveyance, split.Conveyance) > tol {
				t.Errorf("walls n %g: Lotter K %.6g, split %.6g", nw, r.Conveyance, split.Conveyance)
			}
			if k, ok := last[tt.c]; ok && !(r.Conveyance < k) {
				t.Errorf("walls n %g, %v: K %g, not below %g of smoother walls", nw, tt.c, r.Conveyance, k)
			}
			last[tt.c] = r.Conveyance
		}
	}
}

// alternatingBed is an invented main channel 12 m wide surveyed at every
// metre between its bank tops (at 11.0 m): a bank face, a gravel bar, a
// pool, a bank face.
var alternatingBed = []float64{11.0, 10.4, 10.0, 9.9, 9.9, 10.0, 9.6, 9.2, 9.0, 9.2, 9.7, 10.4, 11.0}

// bedSection is a section of the ground z (stations 0, 1, 2, ...) with n
// per segment, banks at its ends unless banks gives them.
func bedSection(t *testing.T, z, n []float64, banks ...float64) *subdivide.Profile {
	t.Helper()
	sec := subdivide.Section{N: n, HasBanks: true, LeftBank: 0, RightBank: float64(len(z) - 1)}
	for i, v := range z {
		sec.Points = append(sec.Points, subdivide.Point{Station: float64(i), Elevation: v})
	}
	if len(banks) == 2 {
		sec.LeftBank, sec.RightBank = banks[0], banks[1]
	}
	p, err := subdivide.Compile(sec)
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// repeatN returns n each written over k segments in turn.
func repeatN(k int, n ...float64) []float64 {
	var out []float64
	for _, v := range n {
		for range k {
			out = append(out, v)
		}
	}
	return out
}

// A main channel whose n is written point by point (six strips or more,
// going back and forth, n changing at more than half of the points inside
// the channel) is warned of; the channel zoned by its bed (bank, bar,
// pool, bank), even surveyed with one segment a zone, is not, nor a
// channel whose n only rises, nor alternating overbanks or walls. The n
// values are invented patterns.
func TestAlternatingChannelWarning(t *testing.T) {
	flat := func(n int) []float64 { return repeatN(n+1, 1)[:n+1] }
	pointByPoint := repeatN(1, 0.036, 0.044, 0.036, 0.044, 0.036, 0.044, 0.036, 0.044, 0.036, 0.044, 0.036, 0.044)
	wall := []subdivide.Subsection{{From: 0, To: 1, N: 0.03}, {From: 1, To: 2, N: 0.04}, {From: 2, To: 2, N: 0.1, Wall: 1},
		{From: 2, To: 3, N: 0.03}, {From: 3, To: 4, N: 0.04}, {From: 4, To: 5, N: 0.03}}
	for _, tc := range []struct {
		name string
		p    *subdivide.Profile // the section, or nil for subs and pts
		subs []subdivide.Subsection
		pts  []subdivide.Point
		want string // "" for no warning
	}{
		{"n point by point", bedSection(t, alternatingBed, pointByPoint), nil, nil, "split into 12 subsections whose n goes back and forth (0.036 to 0.044)"},
		{"bank bar pool bank, zoned", bedSection(t, alternatingBed, repeatN(1, 0.040, 0.040, 0.032, 0.032, 0.032, 0.032, 0.045, 0.045, 0.045, 0.045, 0.040, 0.040)), nil, nil, ""},
		{"bank bar pool bank, a segment a zone", bedSection(t, flat(4), []float64{0.040, 0.032, 0.045, 0.040}), nil, nil, ""},
		{"two threads and a bar, a segment a zone", bedSection(t, flat(5), []float64{0.040, 0.045, 0.032, 0.045, 0.040}), nil, nil, ""},
		{"six zones of two segments", bedSection(t, flat(12), repeatN(2, 0.040, 0.032, 0.045, 0.032, 0.045, 0.040)), nil, nil, ""},
		{"six strips point by point", bedSection(t, flat(6), []float64{0.03, 0.04, 0.03, 0.04, 0.03, 0.04}), nil, nil, "split into 6 subsections"},
		{"rising only", bedSection(t, flat(6), []float64{0.03, 0.032, 0.035, 0.04, 0.045, 0.05}), nil, nil, ""},
		{"one turn in seven", bedSection(t, flat(7), []float64{0.03, 0.035, 0.04, 0.045, 0.04, 0.035, 0.03}), nil, nil, ""},
		{"overbank alternating", bedSection(t, flat(8), []float64{0.05, 0.06, 0.05, 0.06, 0.05, 0.06, 0.035, 0.035}, 6, 8), nil, nil, ""},
		{"walls are no strips", nil, wall, bedSection(t, flat(5), []float64{1, 1, 1, 1, 1}).Points(), ""},
		{"no ground line", nil, bedSection(t, flat(6), []float64{0.03, 0.04, 0.03, 0.04, 0.03, 0.04}).Subsections(), nil, ""},
	} {
		if tc.p != nil {
			tc.subs, tc.pts = tc.p.Subsections(), tc.p.Points()
		}
		got := AlternatingChannelWarning(tc.subs, tc.pts)
		if (tc.want == "") != (got == "") || !strings.Contains(got, tc.want) {
			t.Errorf("%s: %q, want %q", tc.name, got, tc.want)
		}
	}
}

// The conveyance the split adds at bankfull over the channel taken whole
// with one composite n (Horton–Einstein, the warning's remedy), on the
// invented channel alternatingBed: zoned by its bed it is what
// subdivision is for (a pool and a bar of their own depths, Chow 1959,
// section 6-4); n written point by point rates the channel slice by
// slice and adds more. The figures are this project's computation
// (Manning, SI), kept to 0.1 %.
func TestAlternatingChannelConveyance(t *testing.T) {
	extra := func(n []float64) float64 {
		w, err := bedSection(t, alternatingBed, n).At(11.0, subdivide.Options{})
		if err != nil {
			t.Fatal(err)
		}
		split := 0.0
		var p, a, ns []float64
		for _, s := range w.Subs {
			split += Conveyance(s.Area, s.WettedPerimeter, s.N, SI)
			p, a, ns = append(p, s.WettedPerimeter), append(a, s.Area), append(ns, s.N)
		}
		whole := Conveyance(w.Area, w.WettedPerimeter, CompositeN(HortonEinstein, p, a, ns), SI)
		return 100 * (split/whole - 1)
	}
	zoned := extra(repeatN(1, 0.040, 0.040, 0.032, 0.032, 0.032, 0.032, 0.045, 0.045, 0.045, 0.045, 0.040, 0.040))
	byPoint := extra(repeatN(1, 0.036, 0.044, 0.036, 0.044, 0.036, 0.044, 0.036, 0.044, 0.036, 0.044, 0.036, 0.044))
	t.Logf("split over whole at bankfull: zoned %+.1f %%, n point by point %+.1f %%", zoned, byPoint)
	if math.Abs(zoned-9.6) > 0.1 || math.Abs(byPoint-14.5) > 0.1 {
		t.Errorf("split adds %.2f %% zoned and %.2f %% point by point, want 9.6 and 14.5", zoned, byPoint)
	}
}
