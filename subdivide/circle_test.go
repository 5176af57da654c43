package subdivide

import (
	"errors"
	"math"
	"testing"
)

// tableTol is the tolerance against values printed to four decimals in a
// published table: half a unit in the last place plus round-off.
const tableTol = 0.6e-4

func TestConduitTable(t *testing.T) {
	// Elements of a circular section by relative depth y/D: A/D² and R/D
	// as printed (four decimals) in tables of circular-section elements,
	// e.g. Chow (1959), Open-Channel Hydraulics, appendix table of
	// geometric elements for circular channel sections. Values from memory.
	tests := []struct{ yd, ad2, rd float64 }{
		{0.10, 0.0409, 0.0635},
		{0.25, 0.1535, 0.1466},
		{0.50, 0.3927, 0.2500},
		{0.75, 0.6319, 0.3017},
		{0.80, 0.6736, 0.3042},
		{0.90, 0.7445, 0.2980},
	}
	for _, d := range []float64{1, 0.45, 3} {
		c := &Conduit{Diameter: d, Invert: 10, N: 0.013}
		for _, tt := range tests {
			w, err := c.At(10+tt.yd*d, Options{AllPools: true})
			if err != nil {
				t.Fatal(err)
			}
			if got := w.Area / (d * d); math.Abs(got-tt.ad2) > tableTol {
				t.Errorf("D %g y/D %g: A/D² %.5f, table %.4f", d, tt.yd, got, tt.ad2)
			}
			if got := w.HydraulicRadius / d; math.Abs(got-tt.rd) > tableTol {
				t.Errorf("D %g y/D %g: R/D %.5f, table %.4f", d, tt.yd, got, tt.rd)
			}
		}
	}
}

func TestConduitClosedForm(t *testing.T) {
	c := &Conduit{Diameter: 2, N: 0.013}
	// Half full: A = πr²/2, P = πr, T = D, centroid 4r/(3π) below the
	// surface (centroid of a semicircle; plane geometry).
	w, err := c.At(1, Options{AllPools: true})
	if err != nil {
		t.Fatal(err)
	}
	for _, ck := range []struct {
		name      string
		got, want float64
	}{
		{"area", w.Area, math.Pi / 2}, {"perimeter", w.WettedPerimeter, math.Pi},
		{"top width", w.TopWidth, 2}, {"centroid", w.CentroidDepth, 4 / (3 * math.Pi)},
	} {
		if math.Abs(ck.got-ck.want) > 1e-12 {
			t.Errorf("half full %s %g, want %g", ck.name, ck.got, ck.want)
		}
	}
	// Full: whole circumference, zero top width, Full set.
	w, err = c.At(2, Options{AllPools: true})
	if err != nil {
		t.Fatal(err)
	}
	if !w.Full || w.TopWidth != 0 || math.Abs(w.WettedPerimeter-2*math.Pi) > 1e-12 || math.Abs(w.Area-math.Pi) > 1e-12 {
		t.Errorf("full: %+v", w)
	}
	if _, err := c.At(2.01, Options{AllPools: true}); !errors.Is(err, ErrAboveCrown) {
		t.Errorf("above the crown: %v, want ErrAboveCrown", err)
	}
	if w, _ := c.At(-1, Options{AllPools: true}); w.Area != 0 || w.Pools != 0 {
		t.Errorf("below the invert: %+v", w)
	}
}

// TestConduitPolygon checks the exact circle against a fine inscribed
// polygon computed by the ground-line engine (an independent path): the
// polygon's area and perimeter converge to the circle's as O(1/m²).
func TestConduitPolygon(t *testing.T) {
	const m = 4000 // polygon sides over the lower half
	d := 1.0
	var pts []Point
	for i := 0; i <= m; i++ {
		phi := math.Pi * float64(i) / m // from the left end round the bottom
		pts = append(pts, Point{Station: 0.5 - 0.5*math.Cos(phi), Elevation: 0.5 - 0.5*math.Sin(phi)})
	}
	p, err := Compile(Section{Points: pts})
	if err != nil {
		t.Fatal(err)
	}
	c := &Conduit{Diameter: d}
	const polyTol = 1e-6 // O((π/m)²) chord error
	for _, y := range []float64{0.01, 0.2, 0.37, 0.5} {
		wc, _ := c.At(y, Options{AllPools: true})
		wp, _ := p.At(y, Options{AllPools: true})
		if math.Abs(wc.Area-wp.Area) > polyTol || math.Abs(wc.WettedPerimeter-wp.WettedPerimeter) > polyTol ||
			math.Abs(wc.TopWidth-wp.TopWidth) > polyTol || math.Abs(wc.CentroidDepth-wp.CentroidDepth) > polyTol {
			t.Errorf("y %g: circle %v %v %v %v, polygon %v %v %v %v", y, wc.Area, wc.WettedPerimeter, wc.TopWidth, wc.CentroidDepth,
				wp.Area, wp.WettedPerimeter, wp.TopWidth, wp.CentroidDepth)
		}
	}
}

func TestSegmentAngleSeries(t *testing.T) {
	// The series and the direct form agree where both are accurate.
	for _, th := range []float64{0.009, 0.0099} {
		direct := th - math.Sin(th)
		if got := SegmentAngle(th); math.Abs(got-direct) > 1e-9*direct {
			t.Errorf("θ %g: series %g, direct %g", th, got, direct)
		}
	}
}
