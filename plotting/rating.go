package plotting

import (
	"fmt"
	"image/color"
	"io"
	"math"
	"sort"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"wetline/rating"
	"wetline/rating/gauged"
)

// RatingPoint is one point of a rating curve.
type RatingPoint struct {
	// Stage is the gauge height or water-surface elevation (length unit).
	Stage float64
	// Discharge is the flow at that stage (discharge unit).
	Discharge float64
	// Extrapolated marks a point beyond the range the curve is supported
	// by (above the highest or below the lowest gauging); segments
	// touching such a point are drawn dashed.
	Extrapolated bool
	// foot marks a point read between a dry row and the first row with
	// flow (readAsRated): on the log–log panel the power law it follows
	// is the line of the rows above carried down towards e, and is left
	// out there rather than stretch the axes by decades.
	foot bool
}

// Curve is a labelled rating curve. Points may come in any order; they
// are drawn in order of stage, and points with a NaN or infinite value are
// left out.
type Curve struct {
	// Label names the curve in the legend ("" gives a default).
	Label  string
	Points []RatingPoint
}

// BandPoint is the confidence band of a rating at one stage.
type BandPoint struct {
	// Stage (length unit); Low and High bound the discharge (discharge unit).
	Stage, Low, High float64
}

// Gauging is one discharge measurement drawn over a rating.
type Gauging struct {
	// Stage is the gauge height, in the same datum as the curves.
	Stage float64
	// Discharge is the measured flow (discharge unit).
	Discharge float64
	// Quality is the measurement's rated quality.
	Quality rating.Quality
	// Uncertainty is the half-width of the gauging's error bar in percent
	// of its discharge (its expanded uncertainty at 95 %); 0 draws the
	// band a fit weights the quality by (rating.Quality.WeightPercent: the
	// fair band for an unrated gauging, PoorWeightPercent for a poor one).
	Uncertainty float64
	// Excluded draws the gauging hollow and grey: left out of the fit.
	Excluded bool
}

// barPercent is the half-width of a gauging's error bar in percent, and
// false when it has none (an infinite uncertainty).
func (g Gauging) barPercent(q rating.Quality) (float64, bool) {
	if g.Uncertainty > 0 {
		return g.Uncertainty, !math.IsInf(g.Uncertainty, 0)
	}
	return q.WeightPercent(), true
}

// barEnds are the discharges at the ends of a gauging's error bar,
// Q·(1 ∓ U/100), and false when it has none.
func (g Gauging) barEnds() (lo, hi float64, ok bool) {
	pct, ok := g.barPercent(g.quality())
	if !ok {
		return 0, 0, false
	}
	return g.Discharge * (1 - pct/100), g.Discharge * (1 + pct/100), true
}

// quality is the gauging's quality, unrated when it has none.
func (g Gauging) quality() rating.Quality {
	if g.Quality.String() == "" {
		return rating.Unrated
	}
	return g.Quality
}

// Colours of the lines of a fitted rating figure beyond the style's own.
var (
	colTotalBand = color.NRGBA{R: 0xf3, G: 0xd2, B: 0xb0, A: 0x70} // paler copper, translucent
	colExtension = color.NRGBA{R: 0x7a, G: 0x3a, B: 0x12, A: 0xff} // dark copper
	colPrior     = color.NRGBA{R: 0x6f, G: 0x8f, B: 0x3a, A: 0xff} // olive
)

// RatingPlot is a stage–discharge rating figure: a panel of stage
// against discharge on linear axes and, when a gauge height of zero flow
// is known, a log–log panel of discharge against the stage above it.
type RatingPlot struct {
	// Site and Section name the place in the title.
	Site, Section string
	// Subtitle is a second line under the title (slope, method, source).
	Subtitle string
	// Units is the unit system of every value.
	Units rating.Units
	// Hydraulic is the rating computed from the section (dark solid line).
	Hydraulic Curve
	// Fitted is a fitted rating equation (copper line; extrapolated parts
	// dashed).
	Fitted Curve
	// Band is a confidence band of the fitted relation, drawn shaded.
	Band []BandPoint
	// BandLabel names the band in the legend (default "95 % confidence band").
	BandLabel string
	// TotalBand is a wider band (of a single discharge: the relation and
	// its remnant or scatter), drawn paler under Band; TotalBandLabel
	// names it (default "95 % total band").
	TotalBand      []BandPoint
	TotalBandLabel string
	// Extension is a hydraulic extension of the fitted rating above the
	// gaugings (dark copper, dash-dot), labelled by its own Label
	// (default "hydraulic extension").
	Extension Curve
	// Prior is the rating the priors describe before the gaugings (thin
	// olive dots), labelled by its Label (default "prior").
	Prior Curve
	// Gaugings are measurements drawn as points, their shape by quality,
	// with a horizontal bar spanning their quality band.
	Gaugings []Gauging
	// ZeroFlow is the gauge height of zero flow e (length unit) used by
	// the log–log panel when HasZeroFlow is true. Otherwise e is taken
	// from the hydraulic curve (the highest stage with no discharge below
	// its first flowing point), and the log panel is left out when the
	// curve gives none.
	ZeroFlow    float64
	HasZeroFlow bool
	// Bankfull, when HasBankfull is true, is marked across the linear
	// panel (length unit; see the package function Bankfull).
	Bankfull    float64
	HasBankfull bool
	// Flagged are rows of a table marked by their flags (see FlagMarks),
	// drawn over the curves in both panels, each flag with its legend
	// entry.
	Flagged []FlagMark
	// What ends the title ("" gives "stage–discharge rating").
	What string
	// Notes are extra lines at the foot, above the caution (the source of
	// an extrapolation, the fit's standard error).
	Notes []string
	// Caution is the line at the foot of the figure; "" gives DefaultCaution.
	Caution string
	// Size is the pixel size (zero value: the default).
	Size Size
	// PadEnds widens both panels' axes past their data (EndPad, EndPadLog) so that a
	// gauging at the top or at the end of a band is drawn whole, not cut
	// at the panel's edge (the fit figure sets it).
	PadEnds bool
}

// EndPad is the margin PadEnds adds at the top of a linear axis, as a
// fraction of its span, and EndPadLog the margin in decades at each end
// of a log axis beyond the data: each more than a marker's half width on
// the default size.
const (
	EndPad    = 0.03
	EndPadLog = 0.05
)

// padLinear widens a linear axis at its top by EndPad of its span (its
// foot, zero discharge or the stage of zero flow, is left as it is).
func padLinear(a *plot.Axis) { a.Max += EndPad * (a.Max - a.Min) }

// padLog widens a log axis whose ends come within EndPadLog of a decade
// of its data lo..hi, to that margin.
func padLog(a *plot.Axis, lo, hi float64) {
	f := math.Pow(10, EndPadLog)
	a.Min, a.Max = math.Min(a.Min, lo/f), math.Max(a.Max, hi*f)
}

// Rating draws a rating figure as a PNG into w: stage against discharge
// on linear axes (the hydraulic and fitted curves, the prior, the
// hydraulic extension, the bands and the gaugings with their error bars,
// the gauge height of zero flow and bankfull marked) and, when a gauge
// height of zero flow e is known, a log–log panel of discharge against
// h − e. Stages are in the length unit and discharges in the discharge
// unit of r.Units.
//
// Points with a NaN or infinite value are left out (a gauging so left
// out is warned of). The log–log panel leaves out every point at or
// below e or without positive discharge (a log axis cannot show them);
// Result.Omitted counts them, and Result.Warnings reports them, except
// curve points without flow at or below e, which every hydraulic rating
// has (the dry channel). The error wraps ErrNoData when there is no curve
// and no gauging to draw, ErrSize for a size out of range, or ErrDraw
// when drawing fails.
func Rating(w io.Writer, r RatingPlot) (Result, error) {
	var res Result
	d, dropped := cleanRatingLines(r)
	if dropped > 0 {
		res.Warnings = append(res.Warnings, fmt.Sprintf("%s with a missing stage or discharge left out", rating.Counted(dropped, "gauging", "gaugings")))
	}
	if len(d.hyd)+len(d.fit)+len(d.ext)+len(d.gaugings) == 0 {
		return res, fmt.Errorf("%w: the rating figure needs a curve or gaugings", ErrNoData)
	}
	un := names(r.Units)
	e, haveE := r.ZeroFlow, r.HasZeroFlow && finite(r.ZeroFlow)
	if !haveE {
		e, haveE = zeroFlowOf(d.hyd)
	}
	if !haveE {
		res.Warnings = append(res.Warnings, "no gauge height of zero flow known: the log–log panel is left out")
	}
	panels := ratingPanels(r, d, un, e, haveE, &res)
	caution := orDefault(r.Caution, DefaultCaution)
	fig := figure{
		title:     titleOf(r.Site, r.Section, orDefault(r.What, "stage–discharge rating")),
		subtitle:  r.Subtitle,
		foot:      append(append([]string(nil), r.Notes...), caution),
		footColor: colCaution,
	}
	err := render(w, r.Size, fig, func(c draw.Canvas) error {
		return drawRow(c, panels, vg.Points(22))
	})
	return res, err
}

// ratingPanels lays out the linear panel and, when e is known, the
// log–log one, each padded at its ends when r.PadEnds asks.
func ratingPanels(r RatingPlot, d ratingLines, un unitNames, e float64, haveE bool, res *Result) []*plot.Plot {
	lin := linearRatingPanel(r, d, un, e, haveE)
	if r.PadEnds {
		padLinear(&lin.X)
		padLinear(&lin.Y)
	}
	addFlagMarks(lin, r.Flagged, 0, false)
	panels := []*plot.Plot{lin}
	if !haveE {
		return panels
	}
	if lg := logRatingPanel(d, un, e, res); lg != nil {
		if r.PadEnds {
			xlo, xhi, ylo, yhi := logExtent(append(d.hyd, d.ext...), d.fit, append(d.band, d.total...), d.gaugings, e)
			padLog(&lg.X, xlo, xhi)
			padLog(&lg.Y, ylo, yhi)
		}
		addFlagMarks(lg, r.Flagged, e, true)
		panels = append(panels, lg)
	}
	return panels
}

// addFlagMarks draws the flagged rows on a panel, each flag in its own
// mark (flagGlyph); on the log–log panel (logv) at h − e, leaving out
// rows at or below e or without flow, and without legend entries, which
// the linear panel carries. The linear panel's axes reach markerPad of
// their range beyond the highest stage and discharge, so that a mark on
// the last row is drawn whole.
func addFlagMarks(p *plot.Plot, marks []FlagMark, e float64, logv bool) {
	if !logv && len(marks) > 0 {
		p.X.Max += markerPad * (p.X.Max - p.X.Min)
		p.Y.Max += markerPad * (p.Y.Max - p.Y.Min)
	}
	for _, m := range marks {
		xy := panelXYs(m.Points, e, logv)
		if len(xy) == 0 {
			continue
		}
		sc, err := plotter.NewScatter(xy)
		if err != nil {
			continue
		}
		style, label := flagGlyph(m.Flag)
		sc.GlyphStyle = style
		p.Add(sc)
		if !logv {
			p.Legend.Add(label, sc)
		}
	}
}

// ratingLines are the drawable parts of a rating figure: its curves
// sorted by stage, its bands and its gaugings, all finite.
type ratingLines struct {
	hyd, fit, ext, pri []RatingPoint
	band, total        []BandPoint
	gaugings           []Gauging
}

// cleanRatingLines keeps the finite points of every curve, band and
// gauging of r; it returns them with the number of gaugings left out.
func cleanRatingLines(r RatingPlot) (ratingLines, int) {
	d := ratingLines{
		hyd: cleanCurve(r.Hydraulic), fit: cleanCurve(r.Fitted),
		ext: cleanCurve(r.Extension), pri: cleanCurve(r.Prior),
		band: cleanBand(r.Band), total: cleanBand(r.TotalBand),
	}
	for _, g := range r.Gaugings {
		if finite(g.Stage, g.Discharge) {
			d.gaugings = append(d.gaugings, g)
		}
	}
	return d, len(r.Gaugings) - len(d.gaugings)
}

// priorStyle is the line of the prior rating: thin olive dots.
func priorStyle() draw.LineStyle { return lineStyle(colPrior, 1.4, vg.Points(1.5), vg.Points(3)) }

// extensionStyle is the line of the hydraulic extension: dark copper,
// dash-dot.
func extensionStyle() draw.LineStyle {
	return lineStyle(colExtension, 1.8, vg.Points(8), vg.Points(3), vg.Points(2), vg.Points(3))
}

// linearRatingPanel draws the stage–discharge panel on linear axes, with
// the legend, the line of zero flow at e (when haveE) and bankfull.
func linearRatingPanel(r RatingPlot, d ratingLines, un unitNames, e float64, haveE bool) *plot.Plot {
	lin := newPanel("Stage–discharge", "Discharge, "+un.discharge, "Stage, "+un.length)
	addGrid(lin)
	addBands(lin, d.total, d.band, orDefault(r.TotalBandLabel, "95 % total band"), orDefault(r.BandLabel, "95 % confidence band"), 0, false)
	addCurve(lin, d.hyd, orDefault(r.Hydraulic.Label, "hydraulic rating (Manning)"), colHydraulic, 2.2, 0, false)
	addStyledCurve(lin, d.pri, orDefault(r.Prior.Label, "prior"), priorStyle(), 0, false)
	addCurve(lin, d.fit, orDefault(r.Fitted.Label, "fitted rating"), colFitted, 1.8, 0, false)
	addStyledCurve(lin, d.ext, orDefault(r.Extension.Label, "hydraulic extension"), extensionStyle(), 0, false)
	addGaugings(lin, d.gaugings, 0, false)
	// A rating rises to the right: the upper left stays empty, unless a
	// fit reaches far above its gaugings with its bands; then the lower
	// right, below the curve bending over at high flows, is emptier (the
	// legend is lifted clear of the zero-flow line's label).
	lin.Legend.Top = true
	lin.Legend.Left = true
	lin.Legend.XOffs = vg.Points(8)
	lin.Legend.YOffs = -vg.Points(6)
	if len(d.band)+len(d.total)+len(d.ext) > 0 {
		lin.Legend.Top, lin.Legend.Left = false, false
		lin.Legend.XOffs, lin.Legend.YOffs = -vg.Points(8), vg.Points(20)
	}
	if lin.X.Min > 0 {
		lin.X.Min = 0 // discharge from zero, unless data lie below it
	}
	lin.Y.Tick.Marker = linearTicks{}
	lin.X.Tick.Marker = linearTicks{}
	if haveE {
		addZeroFlowLine(lin, e)
	}
	if r.HasBankfull && finite(r.Bankfull) {
		lin.Add(hline{y: r.Bankfull, style: lineStyle(colBank, 1.2, vg.Points(7), vg.Points(3)),
			label: "bankfull " + fmtStage(r.Bankfull)})
	}
	return lin
}

// logRatingPanel draws the log–log panel of discharge against h − e,
// adding to res the count of points it cannot show and the warnings
// about them. It returns nil, with a warning, when no point lies above e.
func logRatingPanel(d ratingLines, un unitNames, e float64, res *Result) *plot.Plot {
	// A short axis label: gonum places a log axis label's box by the
	// arithmetic mid-range, so a long one pads the panel needlessly.
	lg := newPanel(fmt.Sprintf("Log–log: stage above zero flow, e = %s %s", fmtStage(e), un.length),
		"Discharge, "+un.discharge, "h − e, "+un.length)
	logOmissions(d, un, e, res)
	addGrid(lg)
	addBands(lg, d.total, d.band, "", "", e, true)
	n := addCurve(lg, d.hyd, "", colHydraulic, 2.2, e, true)
	addStyledCurve(lg, d.pri, "", priorStyle(), e, true)
	n += addCurve(lg, d.fit, "", colFitted, 1.8, e, true)
	n += addStyledCurve(lg, d.ext, "", extensionStyle(), e, true)
	n += addGaugings(lg, d.gaugings, e, true)
	if n == 0 {
		res.Warnings = append(res.Warnings, "log–log panel: no point lies above the gauge height of zero flow; panel left out")
		return nil
	}
	lg.X.Scale, lg.Y.Scale = plot.LogScale{}, plot.LogScale{}
	lg.X.Tick.Marker, lg.Y.Tick.Marker = LogTicks125{}, LogTicks125{}
	xlo, xhi, ylo, yhi := logExtent(append(d.hyd, d.ext...), d.fit, append(d.band, d.total...), d.gaugings, e)
	lg.X.Min, lg.X.Max = logRange(xlo, xhi)
	lg.Y.Min, lg.Y.Max = logRange(ylo, yhi)
	return lg
}

// logOmissions counts in res.Omitted the points of the curves and the
// gaugings that the log–log panel cannot show (at or below e, or without
// positive discharge) and warns of the gaugings and of the curve points
// with flow among them.
func logOmissions(d ratingLines, un unitNames, e float64, res *Result) {
	omitted, warned, dryAbove := 0, 0, 0
	for i, c := range [][]RatingPoint{d.hyd, d.fit, d.ext} {
		for _, p := range c {
			if p.Stage-e > 0 && p.Discharge > 0 {
				continue
			}
			omitted++
			// A dry point at or below e is what a rating should
			// have, and so is the dry foot of a hydraulic rating
			// whatever e a fit puts beside it; flow at or below e,
			// or negative flow, is not, nor a dry point of a fit
			// above it.
			switch {
			case p.Discharge == 0 && (p.Stage <= e || i == 0):
			case p.Discharge == 0:
				dryAbove++
			default:
				warned++
			}
		}
	}
	gOut := 0
	for _, g := range d.gaugings {
		if !(g.Stage-e > 0 && g.Discharge > 0) {
			gOut++
		}
	}
	res.Omitted = omitted + gOut
	if gOut > 0 {
		res.Warnings = append(res.Warnings, fmt.Sprintf(
			"log–log panel: %s at or below the gauge height of zero flow (%s %s) or without positive discharge left out",
			rating.Counted(gOut, "gauging", "gaugings"), fmtStage(e), un.length))
	}
	if dryAbove > 0 {
		res.Warnings = append(res.Warnings, fmt.Sprintf(
			"log–log panel: %s without flow above the gauge height of zero flow (%s %s) left out: a row without flow above e contradicts it",
			rating.Counted(dryAbove, "rating point", "rating points"), fmtStage(e), un.length))
	}
	if warned > 0 {
		res.Warnings = append(res.Warnings, fmt.Sprintf(
			"log–log panel: %s with flow at or below the gauge height of zero flow (%s %s), or with negative discharge, left out (dry points below it are left out unsaid)",
			rating.Counted(warned, "rating point", "rating points"), fmtStage(e), un.length))
	}
}

func orDefault(s, def string) string {
	if strings.TrimSpace(s) == "" {
		return def
	}
	return s
}

// cleanCurve returns the finite points of c sorted by stage.
func cleanCurve(c Curve) []RatingPoint {
	var out []RatingPoint
	for _, p := range c.Points {
		if finite(p.Stage, p.Discharge) {
			out = append(out, p)
		}
	}
	sort.SliceStable(out, func(i, j int) bool { return out[i].Stage < out[j].Stage })
	return out
}

func cleanBand(b []BandPoint) []BandPoint {
	var out []BandPoint
	for _, p := range b {
		if finite(p.Stage, p.Low, p.High) && p.Low <= p.High {
			out = append(out, p)
		}
	}
	sort.SliceStable(out, func(i, j int) bool { return out[i].Stage < out[j].Stage })
	return out
}

// zeroFlowOf returns the highest stage of the curve's leading run of
// points without discharge: the stage where the hydraulic rating starts
// to flow.
func zeroFlowOf(c []RatingPoint) (float64, bool) {
	e, ok := 0.0, false
	for _, p := range c {
		if p.Discharge > 0 {
			break
		}
		e, ok = p.Stage, true
	}
	return e, ok
}

// logExtent returns the range of the positive values drawn on the log panel.
func logExtent(hyd, fit []RatingPoint, band []BandPoint, gs []Gauging, e float64) (xlo, xhi, ylo, yhi float64) {
	xlo, ylo = math.Inf(1), math.Inf(1)
	xhi, yhi = math.Inf(-1), math.Inf(-1)
	add := func(q, d float64) {
		if q > 0 && d > 0 && finite(q, d) {
			xlo, xhi = math.Min(xlo, q), math.Max(xhi, q)
			ylo, yhi = math.Min(ylo, d), math.Max(yhi, d)
		}
	}
	for _, c := range [][]RatingPoint{hyd, fit} {
		for _, p := range c {
			if !p.foot {
				add(p.Discharge, p.Stage-e)
			}
		}
	}
	for _, g := range gs {
		add(g.Discharge, g.Stage-e)
		if lo, hi, ok := g.barEnds(); ok && g.Discharge > 0 {
			add(lo, g.Stage-e) // a bar end at or below zero is not drawn
			add(hi, g.Stage-e)
		}
	}
	for _, b := range band {
		if b.Stage-e > 0 {
			add(b.Low, b.Stage-e)
			add(b.High, b.Stage-e)
		}
	}
	return
}

// addBands draws the total band under the narrower one, each labelled in
// the legend when its label is not empty.
func addBands(p *plot.Plot, total, band []BandPoint, totalLabel, bandLabel string, e float64, logv bool) {
	for _, b := range []struct {
		pts   []BandPoint
		label string
		c     color.Color
	}{{total, totalLabel, colTotalBand}, {band, bandLabel, colBand}} {
		if len(b.pts) < 2 {
			continue
		}
		if poly := bandPolygon(b.pts, e, logv); poly != nil {
			poly.Color = b.c
			p.Add(poly)
			if b.label != "" {
				p.Legend.Add(b.label, poly)
			}
		}
	}
}

// panelXYs are the points of a rating panel: discharge against stage, or
// on the log panel (logv) against stage − e, positive values only.
func panelXYs(pts []RatingPoint, e float64, logv bool) plotter.XYs {
	var xy plotter.XYs
	for _, q := range pts {
		y := q.Stage
		if logv {
			y -= e
			if !(y > 0 && q.Discharge > 0) || q.foot {
				continue
			}
		}
		xy = append(xy, plotter.XY{X: q.Discharge, Y: y})
	}
	return xy
}

// addStyledCurve draws a curve in one line style (on the log panel:
// discharge against stage − e, positive values only), labelled in the
// legend when label is not empty. It returns the number of points drawn.
func addStyledCurve(p *plot.Plot, pts []RatingPoint, label string, style draw.LineStyle, e float64, logv bool) int {
	xy := panelXYs(pts, e, logv)
	if len(xy) < 2 {
		return 0
	}
	l, err := plotter.NewLine(xy)
	if err != nil {
		return 0
	}
	l.LineStyle = style
	p.Add(l)
	if label != "" {
		p.Legend.Add(label, l)
	}
	return len(xy)
}

// addCurve draws a curve on p (on the log panel: discharge against
// stage − e, keeping positive values only) as solid runs and dashed
// extrapolated runs. It returns the number of points drawn.
func addCurve(p *plot.Plot, pts []RatingPoint, label string, c color.Color, width, e float64, logv bool) int {
	var xy plotter.XYs
	var ext []bool
	for _, q := range pts {
		y := q.Stage
		if logv {
			y -= e
			if !(y > 0 && q.Discharge > 0) {
				continue
			}
		}
		if logv && q.foot {
			continue
		}
		xy = append(xy, plotter.XY{X: q.Discharge, Y: y})
		ext = append(ext, q.Extrapolated)
	}
	if len(xy) == 0 {
		return 0
	}
	solid := lineStyle(c, width)
	dashed := lineStyle(c, width, vg.Points(7), vg.Points(4))
	labelledSolid, labelledDash := false, false
	for _, run := range splitRuns(ext) {
		seg := xy[run.from : run.to+1]
		if len(seg) < 2 {
			continue
		}
		l, err := plotter.NewLine(seg)
		if err != nil {
			continue
		}
		l.LineStyle = solid
		if run.extrapolated {
			l.LineStyle = dashed
		}
		p.Add(l)
		switch {
		case label == "":
		case run.extrapolated && !labelledDash:
			p.Legend.Add(label+", extrapolated", l)
			labelledDash = true
		case !run.extrapolated && !labelledSolid:
			p.Legend.Add(label, l)
			labelledSolid = true
		}
	}
	if len(xy) == 1 {
		s, err := plotter.NewScatter(xy)
		if err == nil {
			s.GlyphStyle = draw.GlyphStyle{Color: c, Radius: vg.Points(3), Shape: draw.CircleGlyph{}}
			p.Add(s)
			if label != "" {
				p.Legend.Add(label, s)
			}
		}
	}
	return len(xy)
}

type run struct {
	from, to     int // inclusive point indices
	extrapolated bool
}

// splitRuns splits a polyline into runs of segments: a segment is
// extrapolated when either end point is. Consecutive runs share their
// boundary point, so the drawn line is unbroken.
func splitRuns(ext []bool) []run {
	var out []run
	for i := 0; i+1 < len(ext); i++ {
		x := ext[i] || ext[i+1]
		if n := len(out); n > 0 && out[n-1].extrapolated == x {
			out[n-1].to = i + 1
			continue
		}
		out = append(out, run{from: i, to: i + 1, extrapolated: x})
	}
	return out
}

// bandPolygon builds the shaded band; on the log panel only stages above
// e with a positive lower bound are kept.
func bandPolygon(b []BandPoint, e float64, logv bool) *plotter.Polygon {
	var lo, hi plotter.XYs
	for _, p := range b {
		y := p.Stage
		if logv {
			y -= e
			if !(y > 0 && p.Low > 0) {
				continue
			}
		}
		lo = append(lo, plotter.XY{X: p.Low, Y: y})
		hi = append(hi, plotter.XY{X: p.High, Y: y})
	}
	if len(lo) < 2 {
		return nil
	}
	ring := append(plotter.XYs(nil), lo...)
	for i := len(hi) - 1; i >= 0; i-- {
		ring = append(ring, hi[i])
	}
	poly, err := plotter.NewPolygon(ring)
	if err != nil {
		return nil
	}
	poly.Color = colBand
	poly.LineStyle.Width = 0
	return poly
}

// gaugingStyle gives each quality its own shape, so a greyscale print
// keeps them apart.
func gaugingStyle(q rating.Quality) draw.GlyphStyle {
	r := vg.Points(4.2)
	switch q {
	case rating.Excellent:
		return draw.GlyphStyle{Color: colInk, Radius: r, Shape: draw.CircleGlyph{}}
	case rating.Good:
		return draw.GlyphStyle{Color: colWater, Radius: r * 0.9, Shape: draw.BoxGlyph{}}
	case rating.Fair:
		return draw.GlyphStyle{Color: colBank, Radius: r * 1.1, Shape: draw.PyramidGlyph{}}
	case rating.Poor:
		return draw.GlyphStyle{Color: colFitted, Radius: r, Shape: draw.CrossGlyph{}}
	}
	return draw.GlyphStyle{Color: colInk, Radius: r, Shape: draw.RingGlyph{}}
}

// qualityOrder is the order of the gaugings' legend entries.
var qualityOrder = [...]rating.Quality{rating.Excellent, rating.Good, rating.Fair, rating.Poor, rating.Unrated}

// qualityName names a quality in the legend.
func qualityName(q rating.Quality) string {
	if q == rating.Unrated {
		return "unrated"
	}
	return q.String()
}

// hollowStyle is the hollow, grey form of a quality's marker, for a
// gauging left out of the fit.
func hollowStyle(q rating.Quality) draw.GlyphStyle {
	st := gaugingStyle(q)
	st.Color = colMuted
	switch st.Shape.(type) {
	case draw.CircleGlyph:
		st.Shape = draw.RingGlyph{}
	case draw.BoxGlyph:
		st.Shape = draw.SquareGlyph{}
	case draw.PyramidGlyph:
		st.Shape = draw.TriangleGlyph{}
	}
	return st
}

// gaugingKey groups gaugings for drawing: by quality, and apart when
// excluded.
type gaugingKey struct {
	q        rating.Quality
	excluded bool
}

// addGaugings draws the gaugings grouped by quality, each with an error
// bar at its uncertainty (or quality band), those left out of the fit
// hollow and grey. It returns the number drawn.
func addGaugings(p *plot.Plot, gs []Gauging, e float64, logv bool) int {
	groups := map[gaugingKey]plotter.XYs{}
	pcts := map[gaugingKey]map[float64]bool{} // bar half-widths in each group
	var bars []hbar
	n := 0
	for _, g := range gs {
		y := g.Stage
		if logv {
			y -= e
			if !(y > 0 && g.Discharge > 0) {
				continue
			}
		}
		q := g.quality()
		k := gaugingKey{q, g.Excluded}
		st := gaugingStyle(q)
		if g.Excluded {
			st = hollowStyle(q)
		}
		groups[k] = append(groups[k], plotter.XY{X: g.Discharge, Y: y})
		if pct, ok := g.barPercent(q); ok {
			x0, x1, _ := g.barEnds()
			bars = append(bars, hbar{y: y, x0: x0, x1: x1, color: st.Color})
			if pcts[k] == nil {
				pcts[k] = map[float64]bool{}
			}
			pcts[k][pct] = true
		}
		n++
	}
	if len(bars) > 0 {
		p.Add(hbars(bars))
	}
	labelled := false
	for _, excluded := range []bool{false, true} {
		for _, q := range qualityOrder {
			xy, ok := groups[gaugingKey{q, excluded}]
			if !ok {
				continue
			}
			s, err := plotter.NewScatter(xy)
			if err != nil {
				continue
			}
			s.GlyphStyle = gaugingStyle(q)
			label := gaugingLabel(q, pcts[gaugingKey{q, excluded}])
			if excluded {
				s.GlyphStyle = hollowStyle(q)
				label = "gauging left out of the fit (hollow)"
			}
			p.Add(s)
			if !logv && !(excluded && labelled) {
				p.Legend.Add(label, s)
				labelled = labelled || excluded
			}
		}
	}
	return n
}

// gaugingLabel is the legend label of the gaugings of quality q whose
// error bars have the half-widths pcts (percent): one is written out,
// several are said to vary.
func gaugingLabel(q rating.Quality, pcts map[float64]bool) string {
	label := "gauging, " + qualityName(q)
	switch len(pcts) {
	case 0:
	case 1:
		for pct := range pcts {
			label += fmt.Sprintf(" (±%g %%)", pct)
		}
	default:
		label += " (± its uncertainty)"
	}
	return label
}

type hbar struct {
	y, x0, x1 float64
	color     color.Color
}

// hbars draws horizontal bars (a gauging's quality band) with end ticks.
type hbars []hbar

// DataRange spans every bar from end to end, so that a panel's axes hold
// the bars whole (a log panel sets its range itself: logExtent).
func (b hbars) DataRange() (xmin, xmax, ymin, ymax float64) {
	xmin, ymin = math.Inf(1), math.Inf(1)
	xmax, ymax = math.Inf(-1), math.Inf(-1)
	for _, h := range b {
		xmin, xmax = math.Min(xmin, h.x0), math.Max(xmax, h.x1)
		ymin, ymax = math.Min(ymin, h.y), math.Max(ymax, h.y)
	}
	return xmin, xmax, ymin, ymax
}

func (b hbars) Plot(c draw.Canvas, p *plot.Plot) {
	tx, ty := p.Transforms(&c)
	tick := vg.Points(2.5)
	for _, h := range b {
		if h.x0 <= 0 && p.X.Scale != nil {
			if _, isLog := p.X.Scale.(plot.LogScale); isLog {
				continue
			}
		}
		y := ty(h.y)
		x0, x1 := tx(h.x0), tx(h.x1)
		ls := lineStyle(h.color, 0.9)
		c.StrokeLine2(ls, x0, y, x1, y)
		c.StrokeLine2(ls, x0, y-tick, x0, y+tick)
		c.StrokeLine2(ls, x1, y-tick, x1, y+tick)
	}
}

// addZeroFlowLine marks the gauge height of zero flow on the linear panel.
func addZeroFlowLine(p *plot.Plot, e float64) {
	p.Add(hline{y: e, style: lineStyle(colMuted, 1, vg.Points(2), vg.Points(3)),
		label: "e = " + fmtStage(e) + " (zero flow)"})
}

// hline is a horizontal reference line across the panel with a small
// label at its right end.
type hline struct {
	y     float64
	style draw.LineStyle
	label string
}

func (h hline) Plot(c draw.Canvas, p *plot.Plot) {
	_, ty := p.Transforms(&c)
	y := ty(h.y)
	if y < c.Min.Y || y > c.Max.Y {
		return
	}
	c.StrokeLine2(h.style, c.Min.X, y, c.Max.X, y)
	if h.label != "" {
		st := textStyle(sans(sizeNote), h.style.Color)
		st.XAlign = draw.XRight
		st.YAlign = draw.YBottom
		haloText(c, st, vg.Point{X: c.Max.X - vg.Points(3), Y: y + vg.Points(4.5)}, h.label)
	}
}

// DataRange keeps the line inside the axis range.
func (h hline) DataRange() (xmin, xmax, ymin, ymax float64) {
	return math.Inf(1), math.Inf(-1), h.y, h.y
}

// CurveFromTable returns the discharge column of a rating table as a curve.
func CurveFromTable(t rating.Table, label string) Curve {
	c := Curve{Label: label, Points: make([]RatingPoint, 0, len(t.Rows))}
	for _, r := range t.Rows {
		c.Points = append(c.Points, RatingPoint{Stage: r.Stage, Discharge: r.Discharge})
	}
	return c
}

// zoneAbove shades the panel above a stage.
type zoneAbove struct {
	y     float64
	color color.Color
}

func (z zoneAbove) Plot(c draw.Canvas, p *plot.Plot) {
	_, ty := p.Transforms(&c)
	y := max(min(ty(z.y), c.Max.Y), c.Min.Y)
	c.SetColor(z.color)
	var path vg.Path
	path.Move(vg.Point{X: c.Min.X, Y: y})
	path.Line(vg.Point{X: c.Max.X, Y: y})
	path.Line(vg.Point{X: c.Max.X, Y: c.Max.Y})
	path.Line(vg.Point{X: c.Min.X, Y: c.Max.Y})
	path.Close()
	c.Fill(path)
}

// denseSteps is the number of pieces each interval between two rows of a
// table read log-linearly is drawn in: enough that the chords of the
// power law between the rows lie within a line's width of it.
const denseSteps = 16

// readAsRated returns the points of a rating table's curve (sorted by
// stage, finite, as cleanCurve gives them) as the table is read when it
// has a gauge height of zero flow e (hasE): between two rows read
// log-linearly in (h − e), the discharges the compiled table gives
// (gauged.TableRating.Discharge, the reading of the record, shifts,
// compare and fit) at denseSteps − 1 stages between them, so that the
// line drawn follows the power law between the rows rather than the
// chord. A point between two rows is extrapolated when either row is;
// one between a dry row and the first with flow is drawn on the linear
// panel only (see RatingPoint.foot).
// Without e, or when the points do not make a table the rating reads
// (gauged.RatingTable.Validate), the points are returned as they are.
func readAsRated(pts []RatingPoint, e float64, hasE bool) []RatingPoint {
	if !hasE || !finite(e) || len(pts) < 2 {
		return pts
	}
	t := gauged.RatingTable{Points: make([]gauged.RatingPoint, len(pts)), HasZeroFlow: true, ZeroFlow: e}
	for i, p := range pts {
		t.Points[i] = gauged.RatingPoint{Stage: p.Stage, Discharge: p.Discharge}
	}
	tr, err := t.Compile()
	if err != nil {
		return pts
	}
	out := make([]RatingPoint, 0, len(pts))
	for i, p := range pts {
		out = append(out, p)
		if i+1 == len(pts) {
			break
		}
		next := pts[i+1]
		if !(next.Discharge > 0 && next.Stage > e) {
			continue // dry: zero at both rows
		}
		for k := 1; k < denseSteps; k++ {
			h := p.Stage + (next.Stage-p.Stage)*float64(k)/denseSteps
			q, _ := tr.Discharge(h)
			if finite(q) {
				out = append(out, RatingPoint{Stage: h, Discharge: q, Extrapolated: p.Extrapolated || next.Extrapolated, foot: p.Discharge == 0})
			}
		}
	}
	return out
}
