package plotting

import (
	"fmt"
	"io"
	"math"
	"sort"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"wetline/rating"
	"wetline/subdivide"
)

// Bank sides of a high-water mark.
const (
	Left  = "left"
	Right = "right"
)

// HighWaterMark is a flood mark surveyed at a section.
type HighWaterMark struct {
	// Side is Left or Right (looking downstream); anything else is drawn
	// as a mark of unknown side.
	Side string
	// Elevation of the mark (length unit).
	Elevation float64
}

// ReachSection is one cross-section of a slope-area reach.
type ReachSection struct {
	// ID names the section ("XS-2").
	ID string
	// Distance is along the channel from the reach's origin, increasing
	// downstream (length unit).
	Distance float64
	// Ground is the section's ground line, left to right looking
	// downstream. The profile takes the thalweg from it; the overlay
	// needs it.
	Ground []subdivide.Point
	// Bed is the thalweg elevation used when Ground is empty (length unit).
	Bed float64
	// Marks are the high-water marks surveyed at the section.
	Marks []HighWaterMark
	// WaterSurface is the water-surface elevation used in the computation
	// (length unit), usually the mean of the marks.
	WaterSurface float64
	// VelocityHead is α·V²/(2g) at the section (length unit); the energy
	// grade line is WaterSurface + VelocityHead and is drawn when any
	// section has a positive velocity head.
	VelocityHead float64
}

// DefaultReachCaution is the line at the foot of the reach figures when
// the caller gives none.
const DefaultReachCaution = "Caution: a slope-area peak is an indirect estimate with a large uncertainty; " +
	"review the marks, n values and checks before it is published."

// ReachPlot describes a slope-area reach for the profile and overlay
// figures.
type ReachPlot struct {
	// Site and Reach name the place in the title.
	Site, Reach string
	// Subtitle is an optional second line under the title.
	Subtitle string
	// Units is the unit system of every value.
	Units rating.Units
	// Sections in any order; they are drawn by distance.
	Sections []ReachSection
	// Notes are extra lines at the foot (the discharge and its band).
	Notes []string
	// Caution is the last line at the foot; "" gives DefaultReachCaution.
	Caution string
	// Size is the pixel size (zero value: the default).
	Size Size
}

func (r ReachPlot) sorted() ([]ReachSection, error) {
	s := append([]ReachSection(nil), r.Sections...)
	if len(s) == 0 {
		return nil, fmt.Errorf("%w: a reach figure needs sections", ErrNoData)
	}
	for _, x := range s {
		if !finite(x.Distance, x.WaterSurface) {
			return nil, fmt.Errorf("plotting: section %q: distance and water surface must be finite numbers", x.ID)
		}
	}
	sort.SliceStable(s, func(i, j int) bool { return s[i].Distance < s[j].Distance })
	return s, nil
}

// thalweg returns the lowest ground point of a section (station NaN
// without ground).
func (x ReachSection) thalweg() subdivide.Point {
	if len(x.Ground) == 0 {
		return subdivide.Point{Station: math.NaN(), Elevation: x.Bed}
	}
	low := x.Ground[0]
	for _, p := range x.Ground {
		if finite(p.Elevation) && p.Elevation < low.Elevation {
			low = p
		}
	}
	return low
}

// ReachProfile draws the longitudinal profile of a slope-area reach as a
// PNG into w: thalweg, water surface, high-water marks on each bank and
// the energy grade line (water surface plus velocity head, drawn when any
// section has a positive velocity head) against distance downstream,
// every elevation and distance in the length unit of r.Units. Sections
// are drawn by distance; a mark without a finite elevation is left out
// with a warning. The error wraps ErrNoData without sections, is a
// plain error for a section without a finite distance or water surface,
// and wraps ErrSize or ErrDraw when the figure cannot be drawn.
func ReachProfile(w io.Writer, r ReachPlot) (Result, error) {
	var res Result
	secs, err := r.sorted()
	if err != nil {
		return res, err
	}
	un := names(r.Units)
	lines := profileLinesOf(secs, &res)
	p := newPanel("", "Distance downstream, "+un.length, "Elevation, "+un.length)
	addGrid(p)
	p.X.Tick.Marker, p.Y.Tick.Marker = linearTicks{}, linearTicks{}
	p.Add(sectionTicks{secs: secs})
	lines.draw(p)
	lines.setRanges(p, secs)
	p.Legend.Top, p.Legend.Left = true, false
	p.Legend.XOffs = -vg.Points(36)
	fig := figure{title: titleOf(r.Site, r.Reach, "slope-area reach profile"), subtitle: r.profileSubtitle(secs, un), foot: r.foot()}
	err = render(w, r.Size, fig, func(c draw.Canvas) error {
		// Between the water surface near the top and the bed below.
		p.Legend.YOffs = -0.3 * (c.Max.Y - c.Min.Y)
		return drawPanel(p, c)
	})
	return res, err
}

// profileLines are the lines of a reach profile, in distance order.
type profileLines struct {
	// bed is the thalweg, ws the water surface and egl the energy grade
	// line of every section.
	bed, ws, egl plotter.XYs
	// marks are the high-water marks by side: Left, Right or "unknown side".
	marks map[string]plotter.XYs
	// anyHead reports a positive velocity head at some section.
	anyHead bool
}

// profileLinesOf gathers the profile's lines from sections sorted by
// distance, warning in res of each mark without elevation.
func profileLinesOf(secs []ReachSection, res *Result) profileLines {
	l := profileLines{marks: map[string]plotter.XYs{}}
	for _, s := range secs {
		t := s.thalweg()
		if finite(t.Elevation) {
			l.bed = append(l.bed, plotter.XY{X: s.Distance, Y: t.Elevation})
		}
		l.ws = append(l.ws, plotter.XY{X: s.Distance, Y: s.WaterSurface})
		if finite(s.VelocityHead) && s.VelocityHead > 0 {
			l.anyHead = true
		}
		h := s.VelocityHead
		if !finite(h) || h < 0 {
			h = 0
		}
		l.egl = append(l.egl, plotter.XY{X: s.Distance, Y: s.WaterSurface + h})
		for _, m := range s.Marks {
			if !finite(m.Elevation) {
				res.Warnings = append(res.Warnings, fmt.Sprintf("section %s: a high-water mark without elevation left out", s.ID))
				continue
			}
			side := strings.ToLower(strings.TrimSpace(m.Side))
			if side != Left && side != Right {
				side = "unknown side"
			}
			l.marks[side] = append(l.marks[side], plotter.XY{X: s.Distance, Y: m.Elevation})
		}
	}
	return l
}

// draw adds the thalweg, the energy grade line, the water surface and
// the marks of each side to p, each with its legend entry.
func (l profileLines) draw(p *plot.Plot) {
	if len(l.bed) > 0 {
		ln, sc, err := plotter.NewLinePoints(l.bed)
		if err == nil {
			ln.LineStyle = lineStyle(colGround, 2.2)
			sc.GlyphStyle = draw.GlyphStyle{Color: colGround, Radius: vg.Points(3.2), Shape: draw.BoxGlyph{}}
			p.Add(ln, sc)
			p.Legend.Add("thalweg (lowest ground)", ln, sc)
		}
	}
	if l.anyHead {
		ln, err := plotter.NewLine(l.egl)
		if err == nil {
			ln.LineStyle = lineStyle(colEnergy, 1.8, vg.Points(8), vg.Points(4))
			p.Add(ln)
			p.Legend.Add("energy grade line (water surface + velocity head)", ln)
		}
	}
	if ln, sc, err := plotter.NewLinePoints(l.ws); err == nil {
		ln.LineStyle = lineStyle(colWater, 2)
		sc.GlyphStyle = draw.GlyphStyle{Color: colWater, Radius: vg.Points(3), Shape: draw.CircleGlyph{}}
		p.Add(ln, sc)
		p.Legend.Add("water surface used", ln, sc)
	}
	markStyles := []struct {
		side  string
		label string
		style draw.GlyphStyle
	}{
		{Left, "high-water mark, left bank", draw.GlyphStyle{Color: colInk, Radius: vg.Points(4.5), Shape: draw.TriangleGlyph{}}},
		{Right, "high-water mark, right bank", draw.GlyphStyle{Color: colBank, Radius: vg.Points(4.5), Shape: downTriangle{}}},
		{"unknown side", "high-water mark, side not given", draw.GlyphStyle{Color: colMuted, Radius: vg.Points(4), Shape: draw.RingGlyph{}}},
	}
	for _, ms := range markStyles {
		if xy := l.marks[ms.side]; len(xy) > 0 {
			sc, err := plotter.NewScatter(xy)
			if err != nil {
				continue
			}
			sc.GlyphStyle = ms.style
			p.Add(sc)
			p.Legend.Add(ms.label, sc)
		}
	}
}

// setRanges sets the axes to every line and mark, with room above for
// the section labels and the legend, and a margin at both ends of the
// reach.
func (l profileLines) setRanges(p *plot.Plot, secs []ReachSection) {
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, set := range []plotter.XYs{l.bed, l.ws, l.egl} {
		for _, q := range set {
			lo, hi = math.Min(lo, q.Y), math.Max(hi, q.Y)
		}
	}
	for _, set := range l.marks {
		for _, q := range set {
			lo, hi = math.Min(lo, q.Y), math.Max(hi, q.Y)
		}
	}
	setProfileRanges(p, secs, lo, hi, 0.18)
}

// setProfileRanges sets the axes of a profile against distance
// downstream: elevations lo to hi with 5 % of their span below and top
// (a fraction of it) above, for the section labels and the legend, and
// the sections' distances (secs sorted downstream) with 4 % of the
// reach's length at both ends. A span that is not positive counts as 1.
func setProfileRanges(p *plot.Plot, secs []ReachSection, lo, hi, top float64) {
	span := hi - lo
	if !(span > 0) {
		span = 1
	}
	p.Y.Min, p.Y.Max = lo-0.05*span, hi+top*span
	xspan := secs[len(secs)-1].Distance - secs[0].Distance
	if !(xspan > 0) {
		xspan = 1
	}
	p.X.Min, p.X.Max = secs[0].Distance-0.04*xspan, secs[len(secs)-1].Distance+0.04*xspan
}

// profileSubtitle is r.Subtitle, or else the number of sections, the
// reach length and the water-surface fall and slope.
func (r ReachPlot) profileSubtitle(secs []ReachSection, un unitNames) string {
	if r.Subtitle != "" {
		return r.Subtitle
	}
	first, last := secs[0], secs[len(secs)-1]
	sub := fmt.Sprintf("%d sections over %s %s; water-surface fall %s %s", len(secs),
		fmtNum(last.Distance-first.Distance), un.length, fmtNum(first.WaterSurface-last.WaterSurface), un.length)
	if d := last.Distance - first.Distance; d > 0 {
		sub += fmt.Sprintf(" (slope %.3g)", (first.WaterSurface-last.WaterSurface)/d)
	}
	return sub
}

// sectionTicks draws a thin vertical line at each section with its id.
type sectionTicks struct{ secs []ReachSection }

func (s sectionTicks) Plot(c draw.Canvas, p *plot.Plot) {
	tx, _ := p.Transforms(&c)
	ls := lineStyle(colDivider, 0.9, vg.Points(2), vg.Points(2.5))
	st := textStyle(sansBold(sizeNote), colInk)
	st.XAlign = draw.XCenter
	st.YAlign = draw.YTop
	for _, x := range s.secs {
		cx := tx(x.Distance)
		c.StrokeLine2(ls, cx, c.Min.Y, cx, c.Max.Y-vg.Points(16))
		haloText(c, st, vg.Point{X: cx, Y: c.Max.Y - vg.Points(3)}, x.ID)
	}
}

// ReachSections draws the sections of a reach overlaid as a PNG into w:
// each ground line shifted so its thalweg is at station zero, with its
// water surface across its wetted width. Sections without a ground line
// are left out with a warning.
func ReachSections(w io.Writer, r ReachPlot) (Result, error) {
	var res Result
	secs, err := r.sorted()
	if err != nil {
		return res, err
	}
	un := names(r.Units)
	p := newPanel("", "Station from each section's thalweg, looking downstream, "+un.length, "Elevation, "+un.length)
	addGrid(p)
	p.X.Tick.Marker, p.Y.Tick.Marker = linearTicks{}, linearTicks{}
	drawn := 0
	lo, hi := math.Inf(1), math.Inf(-1)
	for i, s := range secs {
		var ground []subdivide.Point
		for _, q := range s.Ground {
			if finite(q.Station, q.Elevation) {
				ground = append(ground, q)
			}
		}
		if len(ground) < 2 {
			res.Warnings = append(res.Warnings, fmt.Sprintf("section %s has no ground line: left out of the overlay", s.ID))
			continue
		}
		if addOverlaidSection(p, i, s, ground, un, &lo, &hi) {
			drawn++
		}
	}
	if drawn == 0 {
		return res, fmt.Errorf("%w: no section has a ground line", ErrNoData)
	}
	span := hi - lo
	if !(span > 0) {
		span = 1
	}
	p.Y.Min, p.Y.Max = lo-0.05*span, hi+0.35*span
	p.Legend.Top, p.Legend.Left = true, true
	p.Legend.XOffs, p.Legend.YOffs = vg.Points(8), -vg.Points(6)
	sub := r.Subtitle
	if sub == "" {
		sub = "Sections overlaid at their thalweg, elevations as surveyed; each water surface drawn across its wetted width"
	}
	fig := figure{title: titleOf(r.Site, r.Reach, "slope-area sections overlaid"), subtitle: sub, foot: r.foot()}
	err = render(w, r.Size, fig, func(c draw.Canvas) error {
		return drawPanel(p, c)
	})
	return res, err
}

// addOverlaidSection draws section i's ground (finite points only) and
// its water surface, shifted to put the thalweg at station 0, widening
// lo and hi to them; it reports whether anything was drawn.
func addOverlaidSection(p *plot.Plot, i int, s ReachSection, ground []subdivide.Point, un unitNames, lo, hi *float64) bool {
	sty := seriesStyle(i)
	t := s.thalweg()
	xy := make(plotter.XYs, len(ground))
	shifted := make([]subdivide.Point, len(ground))
	for k, q := range ground {
		xy[k] = plotter.XY{X: q.Station - t.Station, Y: q.Elevation}
		shifted[k] = subdivide.Point{Station: q.Station - t.Station, Elevation: q.Elevation}
		*lo, *hi = math.Min(*lo, q.Elevation), math.Max(*hi, q.Elevation)
	}
	l, err := plotter.NewLine(xy)
	if err != nil {
		return false
	}
	l.LineStyle = lineStyle(sty.color, 1.8, sty.dashes...)
	sc, _ := plotter.NewScatter(xy)
	sc.GlyphStyle = draw.GlyphStyle{Color: sty.color, Radius: vg.Points(2.6), Shape: sty.glyph}
	p.Add(l, sc)
	p.Legend.Add(overlayLabel(i, s, un), l, sc)
	pools := wetPools(shifted, s.WaterSurface, true)
	p.Add(waterLine{pools: pools, stage: s.WaterSurface, style: lineStyle(sty.color, 1.2, sty.dashes...)})
	*hi = math.Max(*hi, s.WaterSurface)
	return true
}

// overlayLabel is the legend entry of section i of the overlay: its id
// (else its number), distance and water surface, each with its unit.
func overlayLabel(i int, s ReachSection, un unitNames) string {
	return fmt.Sprintf("%s at %s %s, water surface %s %s", orDefault(s.ID, fmt.Sprintf("section %d", i+1)),
		fmtNum(s.Distance), un.length, fmtStage(s.WaterSurface), un.length)
}

func (r ReachPlot) foot() []string {
	return append(append([]string(nil), r.Notes...), orDefault(r.Caution, DefaultReachCaution))
}
