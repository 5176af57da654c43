package plotting

import (
	"fmt"
	"io"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"wetline/rating"
	"wetline/rating/gauged"
)

// styleA and styleB are the lines of the two sides of a comparison: A dark
// and solid, B copper and dashed, so a greyscale print keeps them apart.
func styleA() draw.LineStyle { return lineStyle(colInk, 2.0) }
func styleB() draw.LineStyle { return lineStyle(colFitted, 2.0, vg.Points(7), vg.Points(3)) }

// DrawRatingComparison draws two ratings compared: both curves over their
// whole tables (stage against discharge) and the percent difference
// 100·(B − A)/A against stage over their common range. site titles it
// (base when it is blank); base starts its file name.
func DrawRatingComparison(c *gauged.RatingComparison, site, base string, size Size) ([]rating.Figure, []string, error) {
	site = siteOrBase(site, base)
	return oneFigure(base, "compare", "the two ratings and their percent difference against stage", func(w io.Writer) (Result, error) {
		return ratingComparisonFigure(w, c, site, size)
	})
}

// tableXY is the line of a rating table compared: discharge against
// stage at its rows and, where the table is read log-linearly (it has a
// gauge height of zero flow), between them as it is read (readAsRated).
func tableXY(t gauged.RatingTable) plotter.XYs {
	c := Curve{Points: make([]RatingPoint, 0, len(t.Points))}
	for _, p := range t.Points {
		c.Points = append(c.Points, RatingPoint{Stage: p.Stage, Discharge: p.Discharge})
	}
	pts := readAsRated(cleanCurve(c), t.ZeroFlow, t.HasZeroFlow)
	xy := make(plotter.XYs, 0, len(pts))
	for _, p := range pts {
		xy = append(xy, plotter.XY{X: p.Discharge, Y: p.Stage})
	}
	return xy
}

func addLine(p *plot.Plot, xy plotter.XYs, label string, ls draw.LineStyle) {
	if len(xy) < 2 {
		return
	}
	l, err := plotter.NewLine(xy)
	if err != nil {
		return
	}
	l.LineStyle = ls
	p.Add(l)
	if label != "" {
		p.Legend.Add(label, l)
	}
}

// percentFloor is the least fraction of its greatest value in the range
// that A must carry for a percent difference to set the percent axis: near
// zero flow or a dry bed the percent grows without bound and would hide
// the rest (those points run off the panel, as the subtitle says).
const percentFloor = 0.01

// percentRange returns the percent axis's bounds: the extremes of the
// percents whose base is at least percentFloor of the greatest base, and
// whether any percent lies beyond them.
func percentRange(base, pct []float64) (lo, hi float64, clipped bool) {
	top := 0.0
	for _, b := range base {
		if finite(b) {
			top = math.Max(top, b)
		}
	}
	lo, hi = math.Inf(1), math.Inf(-1)
	for i, p := range pct {
		if finite(p) && base[i] >= percentFloor*top {
			lo, hi = math.Min(lo, p), math.Max(hi, p)
		}
	}
	if lo > hi {
		return 0, 0, false
	}
	lo, hi = math.Min(lo, 0), math.Max(hi, 0)
	for i, p := range pct {
		if finite(p) && base[i] < percentFloor*top && (p < lo || p > hi) {
			clipped = true
		}
	}
	pad := math.Max((hi-lo)*0.06, 0.5)
	return lo - pad, hi + pad, clipped
}

// renderComparison draws a comparison figure into w: its two panels side
// by side under the title and subtitle, and the foot of compareFoot in
// the caution's colour.
func renderComparison(w io.Writer, size Size, title, subtitle string, clipped bool, left, right *plot.Plot) error {
	fig := figure{title: title, subtitle: subtitle, foot: compareFoot(clipped), footColor: colCaution}
	return render(w, size, fig, func(cv draw.Canvas) error {
		return drawRow(cv, []*plot.Plot{left, right}, vg.Points(22))
	})
}

// compareFoot is the foot of a comparison figure: a note when percents
// near zero run off the panel, and the caution.
func compareFoot(clipped bool) []string {
	if !clipped {
		return []string{DefaultCaution}
	}
	return []string{fmt.Sprintf("Percent differences where A is below %g %% of its greatest value in the range grow without bound near zero and run off the panel.", 100*percentFloor),
		DefaultCaution}
}

// ratingComparisonSubtitle is the second line of a rating comparison: the
// common range and the largest percent difference of B from A with its
// sign, as the report gives it (gauged.RatingComparison.MaxPercentSigned).
func ratingComparisonSubtitle(c *gauged.RatingComparison, un unitNames) string {
	return fmt.Sprintf("common range %s to %s %s; largest difference 100·(B − A)/A %s %% at %s %s", fmtStage(c.From), fmtStage(c.To), un.length,
		fmtSigned(c.MaxPercentSigned(), 2), fmtStage(c.MaxStage), un.length)
}

func ratingComparisonFigure(w io.Writer, c *gauged.RatingComparison, site string, size Size) (Result, error) {
	var res Result
	un := names(c.Units)
	if len(c.Rows) == 0 {
		return res, fmt.Errorf("%w: the comparison has no rows", ErrNoData)
	}
	left := newPanel("The two ratings", "Discharge, "+un.discharge, "Stage, "+un.length)
	addGrid(left)
	addLine(left, tableXY(c.TableA), "A: "+c.A, styleA())
	addLine(left, tableXY(c.TableB), "B: "+c.B, styleB())
	left.Legend.Top, left.Legend.Left = true, true
	left.Legend.XOffs = vg.Points(8)
	if left.X.Min > 0 {
		left.X.Min = 0
	}
	left.X.Tick.Marker, left.Y.Tick.Marker = linearTicks{}, linearTicks{}

	right := newPanel("Difference of B from A", "100·(B − A)/A, %", "Stage, "+un.length)
	addGrid(right)
	right.Add(zeroLine{vertical: true})
	var xy plotter.XYs
	var base, pct []float64
	for _, r := range c.Rows {
		if finite(r.Percent) {
			xy = append(xy, plotter.XY{X: r.Percent, Y: r.Stage})
		}
		base, pct = append(base, r.A), append(pct, r.Percent)
	}
	plo, phi, clipped := percentRange(base, pct)
	if len(xy) > 1 {
		l, s, err := plotter.NewLinePoints(xy)
		if err == nil {
			l.LineStyle = lineStyle(colHydraulic, 1.6)
			s.GlyphStyle = draw.GlyphStyle{Color: colHydraulic, Radius: vg.Points(2.2), Shape: draw.CircleGlyph{}}
			right.Add(l, s)
		}
	} else {
		res.Warnings = append(res.Warnings, "no percent difference to draw (A carries no flow in the common range)")
	}
	right.Y.Min, right.Y.Max = left.Y.Min, left.Y.Max
	if phi > plo {
		right.X.Min, right.X.Max = plo, phi
	}
	right.X.Tick.Marker, right.Y.Tick.Marker = linearTicks{}, linearTicks{}
	err := renderComparison(w, size, titleOf(site, "", "two ratings compared"), ratingComparisonSubtitle(c, un), clipped, left, right)
	return res, err
}

// DrawSectionComparison draws two surveys of one section overlaid, the
// ground lines of A and B with the stages compared marked, and the
// percent differences of area and conveyance, B from A, against stage.
// site titles it; base starts its file name.
func DrawSectionComparison(c *rating.SectionComparison, site, base string, size Size) ([]rating.Figure, []string, error) {
	return oneFigure(base, "overlay", "the two surveys overlaid, and the differences of area and conveyance against stage", func(w io.Writer) (Result, error) {
		return sectionComparisonFigure(w, c, site, size)
	})
}

func groundXY(g rating.Ground) plotter.XYs {
	xy := make(plotter.XYs, 0, len(g.Section.Points))
	for _, p := range g.Section.Points {
		if finite(p.Station, p.Elevation) {
			xy = append(xy, plotter.XY{X: p.Station, Y: p.Elevation})
		}
	}
	return xy
}

func sectionComparisonFigure(w io.Writer, c *rating.SectionComparison, site string, size Size) (Result, error) {
	var res Result
	un := names(c.Units)
	ga, gb := groundXY(c.GroundA), groundXY(c.GroundB)
	if len(ga) < 2 && len(gb) < 2 && len(c.Rows) == 0 {
		return res, fmt.Errorf("%w: neither survey has a ground line", ErrNoData)
	}
	left := newPanel("The two surveys", "Station, "+un.length, "Elevation, "+un.length)
	addGrid(left)
	if len(ga) < 2 || len(gb) < 2 {
		res.Warnings = append(res.Warnings, "a survey without a ground line (a built conduit) is not drawn")
	}
	addLine(left, ga, "A: "+c.A, styleA())
	addLine(left, gb, "B: "+c.B, styleB())
	left.Legend.Top = true
	left.X.Tick.Marker, left.Y.Tick.Marker = linearTicks{}, linearTicks{}

	right := newPanel("Difference of B from A", "100·(B − A)/A, %", "Stage, "+un.length)
	addGrid(right)
	right.Add(zeroLine{vertical: true})
	var area, conv plotter.XYs
	for _, r := range c.Rows {
		if r.A.Area > 0 && finite(r.Difference.Area) {
			area = append(area, plotter.XY{X: 100 * r.Difference.Area / r.A.Area, Y: r.Stage})
		}
		if finite(r.ConveyancePercent) {
			conv = append(conv, plotter.XY{X: r.ConveyancePercent, Y: r.Stage})
		}
	}
	plo, phi, clipped := differenceRange(c.Rows)
	addLine(right, area, "area", lineStyle(colWater, 1.8))
	addLine(right, conv, "conveyance", lineStyle(colHydraulic, 1.8, vg.Points(6), vg.Points(3)))
	right.Legend.Top = true
	if len(c.Rows) > 0 {
		lo, hi := c.Rows[0].Stage, c.Rows[len(c.Rows)-1].Stage
		right.Y.Min, right.Y.Max = math.Min(lo, hi), math.Max(lo, hi)
	}
	if phi > plo {
		right.X.Min, right.X.Max = plo, phi
	}
	right.X.Tick.Marker, right.Y.Tick.Marker = linearTicks{}, linearTicks{}
	err := renderComparison(w, size, titleOf(site, "", "two surveys of one section compared"),
		"B − A: more area or conveyance in B means scour (or a lower control) since A, less means fill", clipped, left, right)
	return res, err
}

// differenceRange is the percent axis of the differences: it follows the
// larger of the area and conveyance percents at each stage, each weighed
// by its own base against the largest (see percentRange).
func differenceRange(rows []rating.SectionDifference) (lo, hi float64, clipped bool) {
	var bases, pcts []float64
	areaTop, convTop := 0.0, 0.0
	for _, r := range rows {
		areaTop, convTop = math.Max(areaTop, r.A.Area), math.Max(convTop, r.A.Conveyance)
	}
	for _, r := range rows {
		if r.A.Area > 0 {
			bases, pcts = append(bases, r.A.Area/areaTop), append(pcts, 100*r.Difference.Area/r.A.Area)
		}
		if finite(r.ConveyancePercent) && convTop > 0 {
			bases, pcts = append(bases, r.A.Conveyance/convTop), append(pcts, r.ConveyancePercent)
		}
	}
	return percentRange(bases, pcts)
}
