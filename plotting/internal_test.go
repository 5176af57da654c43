package plotting

import (
	"errors"
	"io"
	"math"
	"testing"

	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"wetline/rating"
	"wetline/subdivide"
)

// shoelace is the area of a closed ring (closed form).
func shoelace(r plotter.XYs) float64 {
	var a float64
	for i := range r {
		j := (i + 1) % len(r)
		a += r[i].X*r[j].Y - r[j].X*r[i].Y
	}
	return math.Abs(a) / 2
}

// areaTolerance is the relative difference allowed between two exact
// area computations that differ only in rounding.
const areaTolerance = 1e-12

// TestWetPools checks the shaded rings against the geometry engine: the
// sum of their areas (shoelace formula) equals subdivide's flow area, and
// their count its pool count.
func TestWetPools(t *testing.T) {
	w := func(v ...float64) []subdivide.Point {
		var p []subdivide.Point
		for i := 0; i+1 < len(v); i += 2 {
			p = append(p, subdivide.Point{Station: v[i], Elevation: v[i+1]})
		}
		return p
	}
	for _, tc := range []struct {
		name   string
		pts    []subdivide.Point
		stage  float64
		pools  int
		extend bool
		area   float64 // closed form where stated, else 0 (subdivide only)
	}{
		// A V of half-width 2 and depth 2 at stage 2: area 2·2 = 4.
		{"vee", w(0, 2, 2, 0, 4, 2), 2, 1, true, 4},
		{"two pools behind a levee", w(0, 3, 2, 0, 4, 0, 5, 2.5, 6, 1, 8, 3), 2, 2, true, 0},
		// Two triangles of base 1.5 (0.5 to 2, 2 to 3.5) and depth 1: 2 × 0.75.
		{"vertex at the stage", w(0, 3, 1, 1, 2, 2, 3, 1, 4, 3), 2, 2, true, 1.5},
		// A rectangle 4 wide and 2 deep.
		{"vertical walls", w(0, 3, 0, 0, 4, 0, 4, 3), 2, 1, true, 8},
		// Walls at both ends: 2·4 minus the ground's trapezoids (1 + 1.5).
		{"over both ends", w(0, 1, 2, 0, 4, 1.5), 2, 1, true, 5.5},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rings := wetPools(tc.pts, tc.stage, tc.extend)
			var got float64
			for _, r := range rings {
				got += shoelace(r)
			}
			p, err := subdivide.Compile(subdivide.Section{Points: tc.pts})
			if err != nil {
				t.Fatal(err)
			}
			want, err := p.At(tc.stage, subdivide.Options{AllPools: true})
			if err != nil {
				t.Fatal(err)
			}
			if tc.area > 0 && math.Abs(want.Area-tc.area) > areaTolerance*tc.area {
				t.Errorf("subdivide area %v, closed form %v", want.Area, tc.area)
			}
			if math.Abs(got-want.Area) > areaTolerance*want.Area || len(rings) != tc.pools || want.Pools != tc.pools {
				t.Errorf("rings %d with area %v; subdivide %d pools, area %v; want %d pools", len(rings), got, want.Pools, want.Area, tc.pools)
			}
		})
	}
}

// TestRenderRecovers: a panic inside drawing comes back as ErrDraw.
func TestRenderRecovers(t *testing.T) {
	err := render(io.Discard, Size{Width: 300, Height: 200}, figure{title: "t"}, func(draw.Canvas) error {
		panic("plotting: a drawing bug") // as gonum/plot does on a bad axis

	})
	if !errors.Is(err, ErrDraw) {
		t.Fatalf("error %v, want ErrDraw", err)
	}
}

// TestExaggeration: the elevation axis is widened to a round vertical
// exaggeration, measured on the drawn data area.
func TestExaggeration(t *testing.T) {
	for _, ve := range []float64{0.37, 1, 7.3, 12, 48} {
		p := newPanel("", "x", "y")
		p.X.Min, p.X.Max = 0, 100
		p.Y.Min, p.Y.Max = 0, 1
		c := draw.Canvas{Rectangle: vgRect(600, 400)}
		// Choose the y range so the natural exaggeration is ve.
		dc := p.DataCanvas(c)
		w, h := float64(dc.Max.X-dc.Min.X), float64(dc.Max.Y-dc.Min.Y)
		p.Y.Max = (h / w) * 100 / ve
		setExaggeration(p, c)
		dc = p.DataCanvas(c)
		w, h = float64(dc.Max.X-dc.Min.X), float64(dc.Max.Y-dc.Min.Y)
		got := (h / (p.Y.Max - p.Y.Min)) / (w / (p.X.Max - p.X.Min))
		if got > ve*(1+exaggerationTolerance) {
			t.Errorf("natural %g: drawn exaggeration %g is larger", ve, got)
		}
		if !containsRound(got) {
			t.Errorf("natural %g: drawn exaggeration %g is not a round step", ve, got)
		}
	}
}

func containsRound(v float64) bool {
	exp := math.Pow(10, math.Floor(math.Log10(v)+exaggerationTolerance))
	for _, m := range append(exaggerationSteps, 10) {
		if math.Abs(v-m*exp) <= exaggerationTolerance*m*exp {
			return true
		}
	}
	return false
}

func vgRect(w, h float64) (r vg.Rectangle) {
	r.Max.X, r.Max.Y = vg.Length(w), vg.Length(h)
	return r
}

// TestRatingAxesHoldErrorBars: both panels of a rating figure span every
// gauging's error bar end to end, Q·(1 ∓ U/100), not only the points.
// Curve Q = 8·(h − 0.3)² from 0.5 to 2.7 m (invented, 46.08 m³/s at the
// top); the top gauging there at ±12 % reaches 46.08·1.12 = 51.61 m³/s,
// past the log panel's round top of 50; the lowest, 0.1 m³/s at ±12 %,
// reaches down to 0.088, below its round bottom of 0.1 (hand values).
func TestRatingAxesHoldErrorBars(t *testing.T) {
	var curve []RatingPoint
	for h := 0.5; h <= 2.7+1e-9; h += 0.1 {
		curve = append(curve, RatingPoint{Stage: h, Discharge: 8 * (h - 0.3) * (h - 0.3)})
	}
	gs := []Gauging{
		{Stage: 0.5, Discharge: 0.1, Quality: rating.Poor, Uncertainty: 12},
		{Stage: 1.5, Discharge: 11.5, Quality: rating.Good},
		{Stage: 2.7, Discharge: 46.08, Quality: rating.Poor, Uncertainty: 12},
		{Stage: 2.0, Discharge: 23.1, Quality: rating.Unrated}, // the fair band, as a fit weights it
	}
	r := RatingPlot{Units: rating.SI, Fitted: Curve{Points: curve}, Gaugings: gs, ZeroFlow: 0.3, HasZeroFlow: true}
	d, _ := cleanRatingLines(r)
	un := names(rating.SI)
	lin := linearRatingPanel(r, d, un, 0.3, true)
	var res Result
	lg := logRatingPanel(d, un, 0.3, &res)
	if lg == nil {
		t.Fatal("no log panel")
	}
	for _, g := range gs {
		lo, hi, ok := g.barEnds()
		if !ok {
			continue
		}
		if lo < lin.X.Min || hi > lin.X.Max {
			t.Errorf("linear panel %g to %g does not hold the bar %g to %g of the gauging at %g m", lin.X.Min, lin.X.Max, lo, hi, g.Stage)
		}
		if lo < lg.X.Min || hi > lg.X.Max {
			t.Errorf("log panel %g to %g does not hold the bar %g to %g of the gauging at %g m", lg.X.Min, lg.X.Max, lo, hi, g.Stage)
		}
	}
	// An unrated gauging without an uncertainty is drawn with the band it
	// is weighted and judged by: the fair band, 23.1·(1 ± 0.08).
	if lo, hi, ok := gs[3].barEnds(); !ok || math.Abs(lo-23.1*(1-rating.FairBandPercent/100)) > 1e-9 || math.Abs(hi-23.1*(1+rating.FairBandPercent/100)) > 1e-9 {
		t.Errorf("unrated gauging's bar %g to %g (%v), want the fair band about 23.1", lo, hi, ok)
	}
}

// A figure with no site known is titled by its input's name, so that a
// figure printed alone still says what it shows.
func TestTitleWithoutSite(t *testing.T) {
	for _, tc := range []struct{ site, base, want string }{
		{"", "visits-2025", "visits-2025 — shifts against time"},
		{"  ", "r7-vs-r8", "r7-vs-r8 — shifts against time"},
		{"Tallow Creek", "visits-2025", "Tallow Creek — shifts against time"},
	} {
		if got := titleOf(siteOrBase(tc.site, tc.base), "", "shifts against time"); got != tc.want {
			t.Errorf("site %q, base %q: %q, want %q", tc.site, tc.base, got, tc.want)
		}
	}
}

// A table of stage and discharge alone (a fitted rating) draws its rating
// figure and says plainly why there is no properties figure.
func TestNoPropertiesFigureSaid(t *testing.T) {
	nan := math.NaN()
	tab := rating.Table{Name: "fit", Units: rating.SI, Bottom: 0.5, Top: 2, Slope: nan}
	for _, p := range [][2]float64{{0.5, 0}, {1, 2.5}, {1.5, 6}, {2, 11}} {
		tab.Rows = append(tab.Rows, rating.Row{Stage: p[0], Discharge: p[1], Depth: nan, Area: nan, WettedPerimeter: nan, TopWidth: nan,
			HydraulicRadius: nan, Conveyance: nan, MeanVelocity: nan, Alpha: nan, Froude: nan, HydraulicDepth: nan, Beta: nan, ShearStress: nan})
	}
	figs, warnings, err := DrawRating(RatingFigures{Base: "fit", Table: tab, ZeroFlow: nan})
	if err != nil {
		t.Fatal(err)
	}
	said := false
	for _, w := range warnings {
		said = said || w == "no properties figure: the table has no area, top width or conveyance columns to draw"
	}
	if len(figs) != 1 || !said {
		t.Errorf("%d figures, warnings %q", len(figs), warnings)
	}
}
