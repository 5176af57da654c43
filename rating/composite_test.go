package rating

import (
	"math"
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
