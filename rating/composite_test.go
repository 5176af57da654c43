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

// A main channel that the split cuts into four or more strips whose n goes
// back and forth (turning at least twice) is warned of; a pool beside a
// bar (three strips, one turn), a channel whose n only rises, overbanks
// and walls are not. The n values are invented patterns.
func TestAlternatingChannelWarning(t *testing.T) {
	strips := func(r subdivide.Region, ns ...float64) []subdivide.Subsection {
		var out []subdivide.Subsection
		for i, n := range ns {
			out = append(out, subdivide.Subsection{From: float64(i), To: float64(i + 1), N: n, Region: r})
		}
		return out
	}
	wall := subdivide.Subsection{From: 2, To: 2, N: 0.1, Region: subdivide.Channel, Wall: 1}
	for _, tc := range []struct {
		name string
		subs []subdivide.Subsection
		want string // "" for no warning
	}{
		{"n point by point", strips(subdivide.Channel, 0.038, 0.042, 0.038, 0.042, 0.038, 0.042), "split into 6 subsections whose n goes back and forth (0.038 to 0.042)"},
		{"two turns in four", strips(subdivide.Channel, 0.03, 0.04, 0.03, 0.04), "split into 4 subsections"},
		{"pool between bars", strips(subdivide.Channel, 0.035, 0.033, 0.035), ""},
		{"rising only", strips(subdivide.Channel, 0.03, 0.035, 0.04, 0.045), ""},
		{"one turn in five", strips(subdivide.Channel, 0.03, 0.035, 0.04, 0.035, 0.03), ""},
		{"overbank alternating", strips(subdivide.LeftOverbank, 0.05, 0.06, 0.05, 0.06), ""},
		{"walls are no strips", append(strips(subdivide.Channel, 0.03, 0.04, 0.03), wall), ""},
	} {
		got := AlternatingChannelWarning(tc.subs)
		if (tc.want == "") != (got == "") || !strings.Contains(got, tc.want) {
			t.Errorf("%s: %q, want %q", tc.name, got, tc.want)
		}
	}
}
