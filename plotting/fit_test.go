package plotting_test

import (
	"bytes"
	"image"
	"image/png"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"wetline/plotting"
	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/subdivide"
)

// fitReport returns a gaugings report on a built compound section
// (invented gaugings from its own Manning rating with seeded noise, the
// lower part only, one excluded by its own text).
func fitReport(t *testing.T, m gauged.Method) *gauged.Report {
	t.Helper()
	s, err := subdivide.ParseShape("compound:bottom=10,side=2,depth=2,floodplain=30,outer=2,floodn=0.06,height=4")
	if err != nil {
		t.Fatal(err)
	}
	g, err := s.Build(subdivide.PerRegion{Channel: 0.035})
	if err != nil {
		t.Fatal(err)
	}
	c := rating.HydraulicCurve{Geometry: g, Options: rating.Options{Slope: 0.001}}
	rng := rand.New(rand.NewPCG(3, 3))
	var gs []gauged.Gauging
	for i := range 16 {
		h := 0.3 + 0.14*float64(i)
		q, err := c.Discharge(h)
		if err != nil {
			t.Fatal(err)
		}
		gs = append(gs, gauged.Gauging{Stage: h, Discharge: q * math.Exp(0.02*rng.NormFloat64()), Quality: []rating.Quality{rating.Excellent, rating.Good, rating.Fair, rating.Poor}[i%4]})
	}
	gs[6].Exclude = "debris"
	rep, err := gauged.Analyze(gs, gauged.Options{Hydraulic: &c, Method: m, Floodplain: true,
		Controls: gauged.ControlOptions{Controls: []gauged.ControlSpec{{Kind: gauged.ChannelControl}}},
		Bayes:    gauged.BayesOptions{Chains: 2, Draws: 1500, Seed: 1}})
	if err != nil {
		t.Fatal(err)
	}
	return rep
}

// The fit figure of either method decodes at the default size with ink in
// its panels, and is drawn in the band's colours above the highest
// gauging: both bands are shaded along the whole table.
func TestDrawFitFigure(t *testing.T) {
	for _, m := range []gauged.Method{gauged.LeastSquares, gauged.Bayesian} {
		rep := fitReport(t, m)
		figs, warn, err := plotting.DrawFit(rep, "Test site", "test", plotting.Size{})
		if err != nil || len(figs) != 1 {
			t.Fatalf("%s: %d figures, %v", m, len(figs), err)
		}
		if len(warn) > 0 {
			t.Logf("%s: %q", m, warn)
		}
		checkPNG(t, figs[0].Name, figs[0].PNG, plotting.DefaultWidth, plotting.DefaultHeight)
		img, err := png.Decode(bytes.NewReader(figs[0].PNG))
		if err != nil {
			t.Fatal(err)
		}
		// The upper half of the linear panel lies above every gauging (the
		// highest at 2.4 m of a table to 4 m): band colours must be there.
		b := img.Bounds()
		upper := image.Rect(b.Dx()/20, b.Dy()/6, b.Dx()/2, b.Dy()/3)
		rp := plotting.FitPlot(rep, "Test site")
		rp.Band, rp.TotalBand = nil, nil
		var bare bytes.Buffer
		if _, err := plotting.Rating(&bare, rp); err != nil {
			t.Fatal(err)
		}
		plain, err := png.Decode(&bare)
		if err != nil {
			t.Fatal(err)
		}
		with, without := bandPixels(img, upper), bandPixels(plain, upper)
		t.Logf("%s: %d band-coloured pixels, %d without the bands", m, with, without)
		if with < minBandPixels+without {
			t.Errorf("%s: %d band-coloured pixels in the upper part of the linear panel, %d without the bands", m, with, without)
		}
	}
}

// minBandPixels is the least number of band-coloured pixels the bands add
// to the upper part of the linear panel (a band a few pixels wide over a
// few hundred pixels of height; the measured counts are logged).
const minBandPixels = 1000

// bandPixels counts the pixels of r tinted like the bands: light copper,
// red clearly above blue, not grey and not white.
func bandPixels(img image.Image, r image.Rectangle) int {
	n := 0
	for y := r.Min.Y; y < r.Max.Y; y++ {
		for x := r.Min.X; x < r.Max.X; x++ {
			cr, cg, cb, _ := img.At(x, y).RGBA()
			if cr > 0xe000 && cr > cb+0x1800 && cg > cb && !(cr > 0xf800 && cg > 0xf800 && cb > 0xf800) {
				n++
			}
		}
	}
	return n
}

// The legend says what each line is: no line calls the hydraulic
// extension a fitted equation.
func TestDrawFitLabels(t *testing.T) {
	rep := fitReport(t, gauged.LeastSquares)
	rp := plotting.FitPlot(rep, "Test site")
	if !strings.Contains(rp.Fitted.Label, "fitted controls") || !strings.Contains(rp.Extension.Label, "conveyance-slope") ||
		!strings.Contains(rp.TotalBandLabel, "prediction") || !strings.Contains(rp.BandLabel, "mean relation") {
		t.Errorf("labels %q, %q, %q, %q", rp.Fitted.Label, rp.Extension.Label, rp.BandLabel, rp.TotalBandLabel)
	}
	for _, l := range []string{rp.Fitted.Label, rp.Extension.Label, rp.Hydraulic.Label} {
		if strings.Contains(l, "C(h − e)^b") {
			t.Errorf("label %q", l)
		}
	}
	top := rep.Table.Rows[len(rep.Table.Rows)-1].Stage
	if rp.TotalBand[len(rp.TotalBand)-1].Stage != top || len(rp.Extension.Points) == 0 || rp.Extension.Points[len(rp.Extension.Points)-1].Stage != top {
		t.Errorf("the total band or the extension stops short of the table's top %g", top)
	}
	excluded := 0
	for i, g := range rp.Gaugings {
		if g.Excluded {
			excluded++
		}
		if want := rep.Gaugings[i].UncertaintyPercent(); g.Uncertainty != want {
			t.Errorf("gauging %d: bar %g %%, want %g", i, g.Uncertainty, want)
		}
	}
	if excluded != 1 {
		t.Errorf("%d gaugings drawn hollow, want 1", excluded)
	}
	bayes := plotting.FitPlot(fitReport(t, gauged.Bayesian), "")
	if len(bayes.Prior.Points) == 0 || !strings.Contains(bayes.Prior.Label, "prior") || !strings.Contains(bayes.TotalBandLabel, "remnant") {
		t.Errorf("Bayesian: prior %q with %d points, total band %q", bayes.Prior.Label, len(bayes.Prior.Points), bayes.TotalBandLabel)
	}
}
