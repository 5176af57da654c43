package plotting

import (
	"fmt"
	"io"
	"math"
	"sort"
	"strings"
	"time"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/rating/record"
)

// DrawShifts draws the figures of a shift check: each gauging's measured
// shift against time and against stage, by quality, those outside their
// quality band on the base rating circled, with the shift the diagrams
// apply at each gauging (time figure) and every applied and proposed
// diagram as a line (stage figure). site titles them (base
// when it is blank); base starts their file names.
func DrawShifts(c *gauged.ShiftCheck, site, base string, size Size) ([]rating.Figure, []string, error) {
	set := &figureSet{base: base}
	site = siteOrBase(site, base)
	for _, f := range []struct {
		kind, caption string
		draw          func(io.Writer, *gauged.ShiftCheck, string, Size) (Result, error)
	}{
		{"shift-time", "measured shifts against time, with the shifts the diagrams apply and the rating periods", shiftTimeFigure},
		{"shift-stage", "measured shifts against stage, with the applied and proposed shift diagrams", shiftStageFigure},
	} {
		if err := set.add(f.kind, f.caption, func(w io.Writer) (Result, error) { return f.draw(w, c, site, size) }); err != nil {
			return nil, nil, err
		}
	}
	return set.figs, set.warnings, nil
}

// shiftFigure is the page of a shift figure: the subtitle counts the
// gaugings used that have a measured shift apart from the excluded ones
// (drawn hollow and grey), and the foot notes the excluded gaugings left
// off the axes.
func shiftFigure(c *gauged.ShiftCheck, site, what string, clipped []gauged.GaugingShift) figure {
	measured, excluded := 0, 0
	for _, g := range c.Gaugings {
		switch {
		case g.Excluded:
			excluded++
		case finite(g.Shift):
			measured++
		}
	}
	used, excl := rating.Counted(len(c.Gaugings), "gauging", "gaugings"), ""
	if excluded > 0 {
		used, excl = rating.Counted(len(c.Gaugings)-excluded, "gauging used", "gaugings used"), fmt.Sprintf(", %d excluded (hollow)", excluded)
	}
	foot := []string{}
	if n := clippedNote(clipped, c.UTCOffset, names(c.Units).length); n != "" {
		foot = append(foot, n)
	}
	return figure{
		title: titleOf(site, "", what),
		subtitle: fmt.Sprintf("%d of %s with a measured shift%s, %s; shift = what is added to the gauge height for the rating to pass through the gauging",
			measured, used, excl, rating.Counted(len(c.Visits), "visit", "visits")),
		foot:      append(foot, DefaultCaution),
		footColor: colCaution,
	}
}

// clippedNote words the note of the excluded gaugings beyond a shift
// figure's axes, which are set by the gaugings used: how many, and the
// first few by time and shift ("" for none).
func clippedNote(gs []gauged.GaugingShift, off time.Duration, unit string) string {
	if len(gs) == 0 {
		return ""
	}
	z := time.UTC
	if off != 0 {
		z = time.FixedZone(offsetName(off), int(off/time.Second))
	}
	var parts []string
	for i, g := range gs {
		if i == maxClippedNamed {
			parts = append(parts, fmt.Sprintf("%d more", len(gs)-i))
			break
		}
		parts = append(parts, fmt.Sprintf("%s, shift %s %s", g.Time.In(z).Format("2006-01-02 15:04"), fmtSigned(g.Shift, 3), unit))
	}
	return fmt.Sprintf("Beyond the axes, not drawn: %s (%s)", rating.Counted(len(gs), "excluded gauging", "excluded gaugings"), strings.Join(parts, "; "))
}

// maxClippedNamed is how many excluded gaugings beyond the axes the note
// names one by one.
const maxClippedNamed = 3

// excludedMarks splits the excluded gaugings of a figure, at their (x, y),
// into those within the axes' ranges, to be drawn, and those beyond them.
func excludedMarks(p *plot.Plot, gs []gauged.GaugingShift, at func(gauged.GaugingShift) (float64, float64)) ([]gaugingPoint, []gauged.GaugingShift) {
	var in []gaugingPoint
	var out []gauged.GaugingShift
	for _, g := range gs {
		x, y := at(g)
		if !finite(x, y) {
			continue
		}
		if x < p.X.Min || x > p.X.Max || y < p.Y.Min || y > p.Y.Max {
			out = append(out, g)
			continue
		}
		in = append(in, gaugingPoint{x, y, g.Quality})
	}
	return in, out
}

// axisSpan is a plotter that draws nothing and only widens the axes to
// its points.
type axisSpan plotter.XYs

// Plot draws nothing.
func (axisSpan) Plot(draw.Canvas, *plot.Plot) {}

// DataRange is the range of the points.
func (e axisSpan) DataRange() (xmin, xmax, ymin, ymax float64) {
	return plotter.XYRange(plotter.XYs(e))
}

// addExcludedPoints draws excluded gaugings hollow and grey, in the shape
// of their quality, with one legend entry, keeping the axes' ranges.
func addExcludedPoints(p *plot.Plot, pts []gaugingPoint) {
	x0, x1, y0, y1 := p.X.Min, p.X.Max, p.Y.Min, p.Y.Max
	defer func() { p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = x0, x1, y0, y1 }()
	labelled := false
	for _, q := range qualityOrder {
		var xy plotter.XYs
		for _, g := range pts {
			if g.q == q || (q == rating.Unrated && g.q.String() == "") {
				xy = append(xy, plotter.XY{X: g.x, Y: g.y})
			}
		}
		if len(xy) == 0 {
			continue
		}
		s, err := plotter.NewScatter(xy)
		if err != nil {
			continue
		}
		s.GlyphStyle = hollowStyle(q)
		p.Add(s)
		if !labelled {
			p.Legend.Add(excludedLabel, s)
			labelled = true
		}
	}
}

// excludedLabel is the legend entry of the excluded gaugings.
const excludedLabel = "excluded"

// shiftTimeFigure draws measured and applied shifts against time.
func shiftTimeFigure(w io.Writer, c *gauged.ShiftCheck, site string, size Size) (Result, error) {
	var res Result
	p, fig, err := shiftTimePanel(c, site)
	if err != nil {
		return res, err
	}
	err = render(w, size, fig, func(cv draw.Canvas) error {
		return drawPanel(p, cv)
	})
	return res, err
}

// shiftTimePanel lays out the shift-against-time figure. Its time axis
// spans every gauging, its shift axis the gaugings used; the excluded ones are drawn hollow where they fall
// within them and noted at the foot where they do not.
func shiftTimePanel(c *gauged.ShiftCheck, site string) (*plot.Plot, figure, error) {
	un := names(c.Units)
	z := time.UTC
	if c.UTCOffset != 0 {
		z = time.FixedZone(offsetName(c.UTCOffset), int(c.UTCOffset/time.Second))
	}
	p := newPanel("Shift against time", "Time ("+zoneName(z)+")", "Shift, "+un.length)
	addGrid(p)
	p.Add(zeroLine{})
	var pts []gaugingPoint
	var outside, applied plotter.XYs
	var excluded []gauged.GaugingShift
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, g := range c.Gaugings {
		t := float64(g.Time.Unix())
		if len(c.History.Shifts) > 0 && finite(g.Applied) && finite(g.Shift) {
			applied = append(applied, plotter.XY{X: t, Y: g.Applied})
		}
		lo, hi = math.Min(lo, t), math.Max(hi, t) // time spans every gauging
		if g.Excluded {
			excluded = append(excluded, g)
			continue
		}
		if !finite(g.Shift) {
			continue
		}
		pts = append(pts, gaugingPoint{t, g.Shift, g.Quality})
		if g.Outside {
			outside = append(outside, plotter.XY{X: t, Y: g.Shift})
		}
	}
	if len(pts) == 0 {
		// Every gauging with a shift is excluded: they set the axes, drawn
		// hollow, rather than the run failing for want of a figure.
		var xy plotter.XYs
		for _, g := range excluded {
			if t := float64(g.Time.Unix()); finite(t, g.Shift) {
				xy = append(xy, plotter.XY{X: t, Y: g.Shift})
			}
		}
		if len(xy) == 0 {
			return nil, figure{}, fmt.Errorf("%w: no gauging has a measured shift", ErrNoData)
		}
		p.Add(axisSpan(xy))
	}
	if len(applied) > 0 {
		sort.Slice(applied, func(i, j int) bool { return applied[i].X < applied[j].X })
		for k, run := range splitAt(applied, shiftBreaks(c)) {
			l, s, err := plotter.NewLinePoints(run)
			if err != nil {
				continue
			}
			l.LineStyle = lineStyle(colWater, 1.2, vg.Points(4), vg.Points(2))
			s.GlyphStyle = draw.GlyphStyle{Color: colWater, Radius: vg.Points(2.2), Shape: draw.BoxGlyph{}}
			p.Add(l, s)
			if k == 0 {
				p.Legend.Add("shift applied by the diagrams at the gauging", l, s)
			}
		}
	}
	addGaugingPoints(p, pts, true)
	ringPoints(p, outside, "outside its band on the base rating")
	froms, ns := periodStarts(c.History.Periods)
	periodLines(p, froms, ns, z, true)
	if hi > lo {
		pad := (hi - lo) * 0.03
		p.X.Min, p.X.Max = lo-pad, hi+pad
	} else {
		p.X.Min, p.X.Max = lo-86400, hi+86400
	}
	padAxis(&p.Y, shiftPad)
	drawn, clipped := excludedMarks(p, excluded, func(g gauged.GaugingShift) (float64, float64) { return float64(g.Time.Unix()), g.Shift })
	addExcludedPoints(p, drawn)
	p.X.Tick.Marker = timeTicks{z}
	p.Y.Tick.Marker = linearTicks{}
	p.Legend.Top = true
	legendCorner(p, append(append(gaugingXYs(pts), gaugingXYs(drawn)...), applied...))
	return p, shiftFigure(c, site, "shifts against time", clipped), nil
}

// shiftBreaks returns the times (Unix seconds) at which the applied shift
// does not run on from the gauging before: the start of each rating period
// after the first, where the shifts of the rating before end, and each
// abrupt diagram, which takes effect at once instead of being prorated.
func shiftBreaks(c *gauged.ShiftCheck) []float64 {
	var out []float64
	for i, pd := range c.History.Periods {
		if i > 0 && !pd.From.IsZero() {
			out = append(out, float64(pd.From.Unix()))
		}
	}
	for _, d := range c.History.Shifts {
		if d.Abrupt && !d.Time.IsZero() {
			out = append(out, float64(d.Time.Unix()))
		}
	}
	return out
}

// splitAt splits points sorted by X into runs that no break crosses: a
// new run starts at a point when a break lies after the point before it
// and at or before the point itself, so a line joins only points between
// which the applied shift runs on.
func splitAt(pts plotter.XYs, breaks []float64) []plotter.XYs {
	var runs []plotter.XYs
	start := 0
	for i := 1; i < len(pts); i++ {
		for _, b := range breaks {
			if pts[i-1].X < b && b <= pts[i].X {
				runs = append(runs, pts[start:i])
				start = i
				break
			}
		}
	}
	return append(runs, pts[start:])
}

// offsetName names a fixed offset as ISO 8601 writes it.
func offsetName(off time.Duration) string {
	return "UTC" + record.FormatOffset(off)
}

// diagramLine lays a diagram out as points (shift, stage) over stages lo
// to hi: its points and taper, and its constant ends.
func diagramLine(d gauged.ShiftDiagram, lo, hi float64) plotter.XYs {
	hs := []float64{lo, hi}
	for _, p := range d.Points {
		if finite(p.Stage) && p.Stage > lo && p.Stage < hi {
			hs = append(hs, p.Stage)
		}
	}
	if d.HasTaper && d.Taper > lo && d.Taper < hi {
		hs = append(hs, d.Taper)
	}
	sort.Float64s(hs)
	xy := make(plotter.XYs, 0, len(hs))
	for _, h := range hs {
		xy = append(xy, plotter.XY{X: d.At(h), Y: h})
	}
	return xy
}

// shiftStageFigure draws measured shifts against stage with the diagrams.
func shiftStageFigure(w io.Writer, c *gauged.ShiftCheck, site string, size Size) (Result, error) {
	var res Result
	p, fig, err := shiftStagePanel(c, site)
	if err != nil {
		return res, err
	}
	err = render(w, size, fig, func(cv draw.Canvas) error {
		return drawPanel(p, cv)
	})
	return res, err
}

// shiftStagePanel lays out the shift-against-stage figure. Its axes are
// set by the gaugings used and the diagrams; the excluded gaugings are
// drawn hollow where they fall within them and noted at the foot where
// they do not.
func shiftStagePanel(c *gauged.ShiftCheck, site string) (*plot.Plot, figure, error) {
	un := names(c.Units)
	p := newPanel("Shift against stage", "Shift, "+un.length, "Gauge height, "+un.length)
	addGrid(p)
	p.Add(zeroLine{vertical: true})
	var pts []gaugingPoint
	var outside plotter.XYs
	var excluded []gauged.GaugingShift
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, g := range c.Gaugings {
		if g.Excluded {
			excluded = append(excluded, g)
			continue
		}
		if !finite(g.Shift, g.Stage) {
			continue
		}
		lo, hi = math.Min(lo, g.Stage), math.Max(hi, g.Stage)
		pts = append(pts, gaugingPoint{g.Shift, g.Stage, g.Quality})
		if g.Outside {
			outside = append(outside, plotter.XY{X: g.Shift, Y: g.Stage})
		}
	}
	if len(pts) == 0 {
		// Every gauging with a shift is excluded: they set the axes, drawn
		// hollow, rather than the run failing for want of a figure.
		var xy plotter.XYs
		for _, g := range excluded {
			if finite(g.Shift, g.Stage) {
				xy = append(xy, plotter.XY{X: g.Shift, Y: g.Stage})
				lo, hi = math.Min(lo, g.Stage), math.Max(hi, g.Stage)
			}
		}
		if len(xy) == 0 {
			return nil, figure{}, fmt.Errorf("%w: no gauging has a measured shift", ErrNoData)
		}
		p.Add(axisSpan(xy))
	}
	for _, d := range c.History.Shifts {
		for _, q := range d.Points {
			if finite(q.Stage) {
				lo, hi = math.Min(lo, q.Stage), math.Max(hi, q.Stage)
			}
		}
	}
	pad := math.Max((hi-lo)*0.1, 0.05)
	lo, hi = lo-pad, hi+pad
	addDiagrams(p, c, lo, hi)
	addGaugingPoints(p, pts, true)
	ringPoints(p, outside, "outside its band on the base rating")
	p.Y.Min, p.Y.Max = lo, hi
	padAxis(&p.X, shiftPad)
	drawn, clipped := excludedMarks(p, excluded, func(g gauged.GaugingShift) (float64, float64) { return g.Shift, g.Stage })
	addExcludedPoints(p, drawn)
	p.X.Tick.Marker = linearTicks{}
	p.Y.Tick.Marker = linearTicks{}
	p.Legend.Top, p.Legend.Left = true, true
	legendCorner(p, append(gaugingXYs(pts), gaugingXYs(drawn)...))
	return p, shiftFigure(c, site, "shifts against stage", clipped), nil
}

// addDiagrams draws the applied shift diagrams across the stages lo to hi
// and each visit's proposal over the stages of its gaugings.
func addDiagrams(p *plot.Plot, c *gauged.ShiftCheck, lo, hi float64) {
	lines := []struct {
		ds    []gauged.ShiftDiagram
		label string
		style draw.LineStyle
	}{
		{c.History.Shifts, "applied shift diagram", lineStyle(colWater, 1.4)},
		{proposals(c), "proposed diagram (one per visit)", lineStyle(colFitted, 1.2, vg.Points(5), vg.Points(3))},
	}
	for k, set := range lines {
		for i, d := range set.ds {
			a, b := lo, hi
			if k == 1 { // a proposal is drawn over the stages of its gaugings only
				a, b = proposalSpan(d, (hi-lo)*proposalReach)
			}
			l, err := plotter.NewLine(diagramLine(d, a, b))
			if err != nil {
				continue
			}
			l.LineStyle = set.style
			p.Add(l)
			if i == 0 {
				p.Legend.Add(set.label, l)
			}
		}
	}
}

// shiftPad widens a shift axis beyond its data, as a fraction of the
// range, and proposalReach is how far beyond its gaugings a proposed
// diagram is drawn, as a fraction of the stage range.
const (
	shiftPad      = 0.08
	proposalReach = 0.04
)

// padAxis widens an axis by a fraction of its range on each side (by a
// little when the range is empty).
func padAxis(ax *plot.Axis, f float64) {
	d := (ax.Max - ax.Min) * f
	if !(d > 0) {
		d = math.Max(math.Abs(ax.Max), 1) * f
	}
	ax.Min, ax.Max = ax.Min-d, ax.Max+d
}

// proposalSpan is the stage span of a proposed diagram's points, widened
// by reach.
func proposalSpan(d gauged.ShiftDiagram, reach float64) (float64, float64) {
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, p := range d.Points {
		lo, hi = math.Min(lo, p.Stage), math.Max(hi, p.Stage)
	}
	return lo - reach, hi + reach
}

// proposals returns the visits' proposed diagrams.
func proposals(c *gauged.ShiftCheck) []gauged.ShiftDiagram {
	var out []gauged.ShiftDiagram
	for _, v := range c.Visits {
		if len(v.Proposal.Points) > 0 {
			out = append(out, v.Proposal)
		}
	}
	return out
}
