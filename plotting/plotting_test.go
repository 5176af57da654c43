package plotting_test

import (
	"bytes"
	"errors"
	"fmt"
	"image"
	"image/png"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"wetline/plotting"
	"wetline/rating"
	"wetline/subdivide"
)

// Acceptance thresholds of a drawn figure, in the manner of gonum/plot's
// cmpimg checks (decode, size, ink) rather than byte equality.
const (
	// minColours is the fewest distinct colours a real figure has
	// (text and lines are anti-aliased; a blank or one-colour image fails).
	minColours = 64
	// minInk is the smallest fraction of non-white pixels in the middle
	// of the figure, where the panels are.
	minInk = 0.02
	// sparseInk is the least ink of a figure with only a few points.
	sparseInk = 0.005
)

// checkPNG decodes a figure and checks its size and that it is not blank.
func checkPNG(t *testing.T, name string, data []byte, w, h int) {
	t.Helper()
	checkPNGInk(t, name, data, w, h, minInk)
}

// checkPNGInk is checkPNG with its own least ink fraction.
func checkPNGInk(t *testing.T, name string, data []byte, w, h int, least float64) {
	t.Helper()
	img, err := png.Decode(bytes.NewReader(data))
	if err != nil {
		t.Fatalf("%s: not a PNG: %v", name, err)
	}
	if b := img.Bounds(); b.Dx() != w || b.Dy() != h {
		t.Errorf("%s: size %d×%d, want %d×%d", name, b.Dx(), b.Dy(), w, h)
	}
	colours := map[[4]uint32]bool{}
	b := img.Bounds()
	for y := b.Min.Y; y < b.Max.Y; y += 2 {
		for x := b.Min.X; x < b.Max.X; x += 2 {
			r, g, bl, a := img.At(x, y).RGBA()
			colours[[4]uint32{r, g, bl, a}] = true
		}
	}
	if len(colours) < minColours {
		t.Errorf("%s: %d distinct colours, want at least %d", name, len(colours), minColours)
	}
	if f := inkFraction(img, image.Rect(b.Dx()/5, b.Dy()/5, b.Dx()*4/5, b.Dy()*4/5)); f < least {
		t.Errorf("%s: ink covers %.4f of the plot area, want at least %g", name, f, least)
	}
}

func inkFraction(img image.Image, r image.Rectangle) float64 {
	ink, all := 0, 0
	for y := r.Min.Y; y < r.Max.Y; y++ {
		for x := r.Min.X; x < r.Max.X; x++ {
			cr, cg, cb, _ := img.At(x, y).RGBA()
			if cr < 0xf000 || cg < 0xf000 || cb < 0xf000 {
				ink++
			}
			all++
		}
	}
	return float64(ink) / float64(all)
}

type figureCase struct {
	name string
	draw func(w io.Writer, size plotting.Size) (plotting.Result, error)
}

// demoFigures returns one case per figure, drawn from the invented demo
// section and an invented reach and gaugings.
func demoFigures(t testing.TB) []figureCase {
	sv := demoSection(t)
	tab := demoTable(t, sv.Section)
	bf, ok := sv.Section.Bankfull()
	if !ok {
		t.Fatal("demo section has no banks")
	}
	fit, band := invented(tab)
	reach := inventedReach(sv.Section)
	site := "Tallow Creek at Mill Lane"
	return []figureCase{
		{"rating", func(w io.Writer, s plotting.Size) (plotting.Result, error) {
			return plotting.Rating(w, plotting.RatingPlot{Site: site, Section: sv.Section.Name, Size: s,
				Hydraulic: plotting.CurveFromTable(tab, ""), Fitted: fit, Band: band, Gaugings: inventedGaugings,
				Notes: []string{"Fitted curve and gaugings are invented for this test; above 103 m the fit is extrapolated."}})
		}},
		{"rating-bare", func(w io.Writer, s plotting.Size) (plotting.Result, error) {
			return plotting.Rating(w, plotting.RatingPlot{Site: site, Size: s, Hydraulic: plotting.CurveFromTable(tab, "")})
		}},
		{"section", func(w io.Writer, s plotting.Size) (plotting.Result, error) {
			return plotting.CrossSection(w, plotting.SectionPlot{Site: site, Section: sv.Section, Marks: sv.Labels, Size: s,
				Water: []plotting.WaterSurface{{Stage: bf, Label: "bankfull", Shade: true}, {Stage: 103.4, Label: "flood"}}})
		}},
		{"properties", func(w io.Writer, s plotting.Size) (plotting.Result, error) {
			return plotting.Properties(w, plotting.PropertiesPlot{Site: site, Section: sv.Section.Name, Size: s,
				Rows: plotting.PropertiesFromTable(tab), Bankfull: bf, HasBankfull: true})
		}},
		{"reach-profile", func(w io.Writer, s plotting.Size) (plotting.Result, error) {
			reach.Size = s
			return plotting.ReachProfile(w, reach)
		}},
		{"reach-sections", func(w io.Writer, s plotting.Size) (plotting.Result, error) {
			reach.Size = s
			return plotting.ReachSections(w, reach)
		}},
	}
}

// inventedGaugings are demo measurements; the first lies below the
// hydraulic rating's gauge height of zero flow (100.30 m).
var inventedGaugings = []plotting.Gauging{
	{Stage: 100.2, Discharge: 0.01, Quality: rating.Poor}, {Stage: 100.6, Discharge: 1.2, Quality: rating.Good},
	{Stage: 101.0, Discharge: 5.5, Quality: rating.Excellent}, {Stage: 101.5, Discharge: 14, Quality: rating.Fair},
	{Stage: 102.1, Discharge: 38, Quality: rating.Good}, {Stage: 102.6, Discharge: 70},
}

// invented returns a made-up fitted power law with a ±10 % band,
// extrapolated above 103 m.
func invented(tab rating.Table) (plotting.Curve, []plotting.BandPoint) {
	var fit plotting.Curve
	var band []plotting.BandPoint
	for _, r := range tab.Rows {
		q := 14 * math.Pow(math.Max(r.Stage-100.35, 0), 1.9)
		fit.Points = append(fit.Points, plotting.RatingPoint{Stage: r.Stage, Discharge: q, Extrapolated: r.Stage > 103})
		band = append(band, plotting.BandPoint{Stage: r.Stage, Low: q * 0.9, High: q * 1.1})
	}
	return fit, band
}

func inventedReach(sec subdivide.Section) plotting.ReachPlot {
	var secs []plotting.ReachSection
	for i, d := range []float64{0, 85, 190} {
		var g []subdivide.Point
		for _, p := range sec.Points {
			g = append(g, subdivide.Point{Station: p.Station*(1+0.1*float64(i)) + 3*float64(i), Elevation: p.Elevation - 0.0015*d})
		}
		ws := 103.2 - 0.0016*d
		secs = append(secs, plotting.ReachSection{ID: fmt.Sprintf("XS-%d", i+1), Distance: d, Ground: g, WaterSurface: ws,
			VelocityHead: 0.08 + 0.02*float64(i),
			Marks:        []plotting.HighWaterMark{{Side: plotting.Left, Elevation: ws + 0.04}, {Side: plotting.Right, Elevation: ws - 0.05}}})
	}
	return plotting.ReachPlot{Site: "Tallow Creek", Reach: "Mill Lane reach", Sections: secs,
		Notes: []string{"Invented reach for a test: discharge not computed."}}
}

func TestFiguresDecode(t *testing.T) {
	for _, size := range []plotting.Size{{}, {Width: 900, Height: 600, DPI: 100}} {
		for _, fc := range demoFigures(t) {
			w, h := size.Width, size.Height
			if w == 0 {
				w, h = plotting.DefaultWidth, plotting.DefaultHeight
			}
			name := fmt.Sprintf("%s-%dx%d", fc.name, w, h)
			t.Run(name, func(t *testing.T) {
				var buf bytes.Buffer
				if _, err := fc.draw(&buf, size); err != nil {
					t.Fatal(err)
				}
				checkPNG(t, name, buf.Bytes(), w, h)
				keep(t, name+".png", buf.Bytes())
			})
		}
	}
}

// TestRatingLogViewOmits draws gaugings and curve points at, below and
// far below the gauge height of zero flow, and with zero or negative
// discharge: the figure must draw, and count exactly those left out.
func TestRatingLogViewOmits(t *testing.T) {
	const e = 10.0
	curve := plotting.Curve{Points: []plotting.RatingPoint{
		{Stage: 9.5, Discharge: 0},   // below e, dry: left out, not warned
		{Stage: 9.8, Discharge: 0.5}, // flowing below e: left out, warned
		{Stage: 10, Discharge: 0},    // the curve's own origin: left out, not warned
		{Stage: 10.5, Discharge: 3}, {Stage: 11, Discharge: 9}, {Stage: 12, Discharge: 30},
	}}
	for _, tc := range []struct {
		name         string
		gaugings     []plotting.Gauging
		wantOmitted  int
		wantGaugings string // count in the gauging warning, "" for none
	}{
		{"none out", []plotting.Gauging{{Stage: 10.6, Discharge: 4, Quality: rating.Good}}, 3, ""},
		{"at e", []plotting.Gauging{{Stage: 10, Discharge: 1}, {Stage: 11, Discharge: 8}}, 4, "1 gauging"},
		{"below e", []plotting.Gauging{{Stage: 9, Discharge: 1}, {Stage: -5, Discharge: 1}}, 5, "2 gauging"},
		{"zero and negative discharge", []plotting.Gauging{{Stage: 11, Discharge: 0}, {Stage: 11.5, Discharge: -3}}, 5, "2 gauging"},
		{"not finite", []plotting.Gauging{{Stage: math.NaN(), Discharge: 1}, {Stage: 11, Discharge: math.Inf(1)}}, 3, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var buf bytes.Buffer
			res, err := plotting.Rating(&buf, plotting.RatingPlot{Section: "test", Hydraulic: curve, Gaugings: tc.gaugings,
				ZeroFlow: e, HasZeroFlow: true, Size: plotting.Size{Width: 600, Height: 400, DPI: 72}})
			if err != nil {
				t.Fatal(err)
			}
			if res.Omitted != tc.wantOmitted {
				t.Errorf("omitted %d, want %d (warnings %q)", res.Omitted, tc.wantOmitted, res.Warnings)
			}
			all := strings.Join(res.Warnings, "\n")
			if tc.wantGaugings != "" && !strings.Contains(all, tc.wantGaugings) {
				t.Errorf("warnings %q do not mention %q", all, tc.wantGaugings)
			}
			if !strings.Contains(all, "1 rating point") {
				t.Errorf("warnings %q do not count the rating point below e", all)
			}
			checkPNG(t, tc.name, buf.Bytes(), 600, 400)
		})
	}
}

// TestRatingLogViewEmpty: nothing above the gauge height of zero flow
// leaves the log panel out with a warning, never a panic.
func TestRatingLogViewEmpty(t *testing.T) {
	var buf bytes.Buffer
	res, err := plotting.Rating(&buf, plotting.RatingPlot{
		Gaugings: []plotting.Gauging{{Stage: 1, Discharge: 2}, {Stage: 0.5, Discharge: 1}},
		ZeroFlow: 3, HasZeroFlow: true})
	if err != nil {
		t.Fatal(err)
	}
	if res.Omitted != 2 || !strings.Contains(strings.Join(res.Warnings, "\n"), "panel left out") {
		t.Errorf("got %+v", res)
	}
	// Two points and the grid: little ink, but some.
	checkPNGInk(t, "empty log", buf.Bytes(), plotting.DefaultWidth, plotting.DefaultHeight, sparseInk)
	// A single point on log axes (gonum panics on a zero-width log range).
	buf.Reset()
	if _, err := plotting.Rating(&buf, plotting.RatingPlot{Gaugings: []plotting.Gauging{{Stage: 4, Discharge: 2}},
		ZeroFlow: 3, HasZeroFlow: true}); err != nil {
		t.Fatal(err)
	}
	checkPNGInk(t, "one point", buf.Bytes(), plotting.DefaultWidth, plotting.DefaultHeight, sparseInk)
}

func TestErrors(t *testing.T) {
	for _, tc := range []struct {
		name string
		draw func(io.Writer) error
		want error
	}{
		{"rating without data", func(w io.Writer) error { _, err := plotting.Rating(w, plotting.RatingPlot{}); return err }, plotting.ErrNoData},
		{"too small", func(w io.Writer) error {
			_, err := plotting.Rating(w, plotting.RatingPlot{Gaugings: []plotting.Gauging{{Stage: 1, Discharge: 1}},
				Size: plotting.Size{Width: 10, Height: 10}})
			return err
		}, plotting.ErrSize},
		{"too large", func(w io.Writer) error {
			_, err := plotting.Properties(w, plotting.PropertiesPlot{Rows: []plotting.PropertyRow{{Stage: 1, Area: 1}},
				Size: plotting.Size{Width: 100_000, Height: 1000}})
			return err
		}, plotting.ErrSize},
		{"properties without rows", func(w io.Writer) error { _, err := plotting.Properties(w, plotting.PropertiesPlot{}); return err }, plotting.ErrNoData},
		{"reach without sections", func(w io.Writer) error { _, err := plotting.ReachProfile(w, plotting.ReachPlot{}); return err }, plotting.ErrNoData},
		{"overlay without ground", func(w io.Writer) error {
			_, err := plotting.ReachSections(w, plotting.ReachPlot{Sections: []plotting.ReachSection{{ID: "a", WaterSurface: 1}}})
			return err
		}, plotting.ErrNoData},
		{"section without points", func(w io.Writer) error {
			_, err := plotting.CrossSection(w, plotting.SectionPlot{})
			return err
		}, subdivide.ErrTooFewPoints},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var buf bytes.Buffer
			err := tc.draw(&buf)
			if !errors.Is(err, tc.want) {
				t.Fatalf("error %v, want %v", err, tc.want)
			}
			if buf.Len() != 0 {
				t.Errorf("wrote %d bytes on error", buf.Len())
			}
		})
	}
}

// TestRatingReference draws the published Patuxent River rating with the
// agency's own measurements (testdata/reference, USGS 01594440, public
// domain) in US units with the published gauge height of zero flow of
// 2.0 ft. The reference README states the measurements span gauge
// heights 3.5–21.1 ft, all above 2.0 ft: none may be left out.
func TestRatingReference(t *testing.T) {
	ref := referenceDir(t)
	var curve plotting.Curve
	rc, rows := csvTable(t, filepath.Join(ref, "rating-01594440.csv"))
	for _, r := range rows {
		curve.Points = append(curve.Points, plotting.RatingPoint{Stage: number(t, r[rc["gauge_height"]]), Discharge: number(t, r[rc["discharge"]])})
	}
	gc, rows := csvTable(t, filepath.Join(ref, "gaugings-01594440.csv"))
	var gs []plotting.Gauging
	for _, r := range rows {
		q, _ := rating.ParseQuality(r[gc["quality"]])
		gs = append(gs, plotting.Gauging{Stage: number(t, r[gc["gauge_height"]]), Discharge: number(t, r[gc["discharge"]]), Quality: q})
	}
	if len(gs) != 142 || len(curve.Points) != 11 {
		t.Fatalf("read %d gaugings and %d breakpoints, want 142 and 11 (reference README)", len(gs), len(curve.Points))
	}
	var buf bytes.Buffer
	res, err := plotting.Rating(&buf, plotting.RatingPlot{Site: "Patuxent River near Bowie, MD", Section: "USGS 01594440",
		Subtitle: "published base rating (valid from 2015-10-01) and field measurements 2000–2020, public-domain USGS data",
		Units:    rating.US, Fitted: plotting.Curve{Label: "published rating", Points: curve.Points},
		Gaugings: gs, ZeroFlow: 2.0, HasZeroFlow: true})
	if err != nil {
		t.Fatal(err)
	}
	if res.Omitted != 0 || len(res.Warnings) != 0 {
		t.Errorf("reference figure left out %d points: %q", res.Omitted, res.Warnings)
	}
	checkPNG(t, "reference", buf.Bytes(), plotting.DefaultWidth, plotting.DefaultHeight)
	keep(t, "reference.png", buf.Bytes())
}

func BenchmarkRating(b *testing.B) {
	figs := demoFigures(b)
	for b.Loop() {
		if _, err := figs[0].draw(io.Discard, plotting.Size{}); err != nil {
			b.Fatal(err)
		}
	}
}

// referenceDir is the copy of the public-domain USGS reference data kept
// at the top of the module (testdata/reference, copied from the agency files with their source headers).
func referenceDir(t *testing.T) string {
	t.Helper()
	dir := filepath.Join("..", "testdata", "reference")
	if _, err := os.Stat(filepath.Join(dir, "rating-01594440.csv")); err != nil {
		t.Fatalf("reference data: %v", err)
	}
	return dir
}

// TestTableLabel checks that a rating table's curve is named by what the
// table is: its kind when it has one (a step-backwater rating even where
// its rows' friction slopes agree), Manning's for a table with a friction
// slope (a uniform-flow rating), else neutrally.
func TestTableLabel(t *testing.T) {
	for _, tc := range []struct {
		name  string
		table rating.Table
		want  string
	}{
		{"uniform flow", rating.Table{Slope: 0.0012}, "hydraulic rating (Manning)"},
		{"fitted", rating.Table{Slope: math.NaN(), Kind: "fitted rating"}, "fitted rating"},
		{"step-backwater, its flags read", rating.Table{Slope: math.NaN(), Kind: rating.KindBackwater}, "step-backwater rating"},
		{"step-backwater whose slopes agree", rating.Table{Slope: 0.0015, Kind: rating.KindBackwater}, "step-backwater rating"},
		{"step-backwater, no single slope", rating.Table{Slope: math.NaN()}, "rating table"},
		{"stage and discharge only", rating.Table{}, "rating table"},
	} {
		if got := plotting.TableLabel(tc.table); got != tc.want {
			t.Errorf("%s: label %q, want %q", tc.name, got, tc.want)
		}
	}
}
