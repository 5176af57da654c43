package plotting

import (
	"fmt"
	"io"
	"math"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"wetline/rating"
	"wetline/subdivide"
)

// WaterSurface is a water level drawn across a cross-section.
type WaterSurface struct {
	// Stage is the water-surface elevation (length unit).
	Stage float64
	// Label is printed beside the level ("bankfull", "peak of 2024").
	Label string
	// Shade fills the wetted area below this level and states its area
	// and top width at the foot of the figure.
	Shade bool
}

// SectionPlot is a cross-section figure: the ground line with its
// points, subsection dividers labelled with their n, bank stations, the
// thalweg, and water surfaces.
type SectionPlot struct {
	// Site names the place; the section's own Name follows it in the title.
	Site string
	// Subtitle is an optional second line under the title.
	Subtitle string
	// Section is the surveyed ground line with n and banks.
	Section subdivide.Section
	// Units is the unit system of the section.
	Units rating.Units
	// Marks optionally labels points (one per Section.Points; "" none).
	Marks []string
	// Water are the water surfaces to draw, in any order.
	Water []WaterSurface
	// Geometry says which pools count and whether ends are extended, as
	// for the rating (see subdivide.Options); shading follows it.
	Geometry subdivide.Options
	// Caution is the last line at the foot; "" gives DefaultCaution.
	Caution string
	// Size is the pixel size (zero value: the default).
	Size Size
}

// Vertical-exaggeration steps: the elevation axis is stretched so the
// exaggeration is one of these times a power of ten.
var exaggerationSteps = []float64{1, 1.5, 2, 2.5, 3, 4, 5, 6, 8}

// CrossSection draws a cross-section figure as a PNG into w: the ground
// line with its points, the subsection dividers labelled with their n,
// the bank stations, the thalweg and the water surfaces, the wetted area
// of each surface with Shade filled and its area, top width and wetted
// perimeter stated at the foot above the caution. Stations and elevations
// are in the length unit of s.Units. The elevation axis is widened so that the vertical
// exaggeration is a round number, stated under the station axis. A water
// surface without a finite stage or at or below the lowest ground is left
// out with a warning. The error names the section when it does not
// compile (subdivide.Compile), and wraps ErrSize or ErrDraw when the
// figure cannot be drawn.
func CrossSection(w io.Writer, s SectionPlot) (Result, error) {
	var res Result
	prof, err := subdivide.Compile(s.Section)
	if err != nil {
		return res, fmt.Errorf("plotting: section %q: %w", s.Section.Name, err)
	}
	un := names(s.Units)
	pts := s.Section.Points
	zlo, zhi := math.Inf(1), math.Inf(-1)
	for _, p := range pts {
		zlo, zhi = math.Min(zlo, p.Elevation), math.Max(zhi, p.Elevation)
	}
	water := drawableWater(s.Water, zlo, un, &res)
	for _, ws := range water {
		zhi = math.Max(zhi, ws.Stage)
	}

	p := newPanel("", "Station from the left end, looking downstream, "+un.length, "Elevation, "+un.length)
	addGrid(p)
	p.Add(groundFill{pts: pts})
	foot := addWaterSurfaces(p, prof, s, water, un, &res)
	if err := addGroundLine(p, pts); err != nil {
		return res, fmt.Errorf("plotting: section %q: %w", s.Section.Name, err)
	}
	subs, low := prof.Subsections(), thalwegIndex(pts)
	p.Add(sectionDecor{subs: subs, pts: pts, sec: s.Section, thalweg: pts[low], marks: s.Marks, unit: un.length})

	// Ranges: all of the ground and water, with headroom for the n labels.
	span := zhi - zlo
	if span <= 0 {
		span = 1
	}
	p.X.Min, p.X.Max = pts[0].Station, pts[len(pts)-1].Station
	p.Y.Min, p.Y.Max = zlo-0.08*span, zhi+0.22*span
	p.X.Padding, p.Y.Padding = 0, 0
	p.X.Tick.Marker, p.Y.Tick.Marker = linearTicks{}, linearTicks{}

	fig := figure{title: titleOf(s.Site, s.Section.Name, "cross-section"), subtitle: s.subtitle(len(subs), low, un),
		foot: append(foot, orDefault(s.Caution, DefaultCaution)), footColor: colCaution}
	err = render(w, s.Size, fig, func(c draw.Canvas) error {
		setExaggeration(p, c)
		return drawPanel(p, c)
	})
	return res, err
}

// drawableWater returns the water surfaces with a finite stage above the
// lowest ground zlo, warning in res of each one left out.
func drawableWater(water []WaterSurface, zlo float64, un unitNames, res *Result) []WaterSurface {
	var out []WaterSurface
	for _, ws := range water {
		if !finite(ws.Stage) {
			res.Warnings = append(res.Warnings, "a water surface without a finite stage was left out")
			continue
		}
		if ws.Stage <= zlo {
			res.Warnings = append(res.Warnings, fmt.Sprintf("water surface %s %s is at or below the lowest ground: not drawn", fmtStage(ws.Stage), un.length))
			continue
		}
		out = append(out, ws)
	}
	return out
}

// waterDashes are the dash patterns of successive water surfaces.
func waterDashes(i int) []vg.Length {
	return [][]vg.Length{nil, {vg.Points(8), vg.Points(3)}, {vg.Points(3), vg.Points(2)}, {vg.Points(10), vg.Points(3), vg.Points(2), vg.Points(3)}}[i%4]
}

// addWaterSurfaces draws each water surface across its wetted reaches
// (the pools that count, as s.Geometry says), shading those with Shade;
// it returns the foot lines stating the shaded areas, and warns in res
// of a shaded stage whose wetted area cannot be computed.
func addWaterSurfaces(p *plot.Plot, prof *subdivide.Profile, s SectionPlot, water []WaterSurface, un unitNames, res *Result) []string {
	var foot []string
	for i, ws := range water {
		pools := wetPools(s.Section.Points, ws.Stage, !s.Geometry.NoExtend)
		if !s.Geometry.AllPools {
			pools = mainPool(pools, s.Section)
		}
		if ws.Shade {
			shadePools(p, pools)
			if wt, err := prof.At(ws.Stage, s.Geometry); err == nil {
				foot = append(foot, shadedLine(ws, wt, un))
			} else {
				res.Warnings = append(res.Warnings, fmt.Sprintf("wetted area at %s: %v", fmtStage(ws.Stage), err))
			}
		}
		p.Add(waterLine{pools: pools, stage: ws.Stage, label: fmtStage(ws.Stage) + labelSuffix(ws.Label), style: lineStyle(colWater, 1.6, waterDashes(i)...)})
	}
	return foot
}

// shadePools fills each wetted pool.
func shadePools(p *plot.Plot, pools []plotter.XYs) {
	for _, pool := range pools {
		poly, err := plotter.NewPolygon(pool)
		if err != nil {
			continue
		}
		poly.Color = colWaterFill
		poly.LineStyle.Width = 0
		p.Add(poly)
	}
}

// shadedLine states the wetted area, top width and wetted perimeter of a
// shaded water surface, its separate pools and extended ends.
func shadedLine(ws WaterSurface, wt subdivide.Wetted, un unitNames) string {
	line := fmt.Sprintf("Shaded: wetted area at %s %s%s — area %s %s, top width %s %s, wetted perimeter %s %s",
		fmtStage(ws.Stage), un.length, labelSuffix(ws.Label), fmtNum(wt.Area), un.area,
		fmtNum(wt.TopWidth), un.length, fmtNum(wt.WettedPerimeter), un.length)
	if wt.Pools > 1 {
		line += fmt.Sprintf(", %d separate pools", wt.Pools)
	}
	if wt.ExtendedLeft > 0 || wt.ExtendedRight > 0 {
		line += "; the section's ends are extended by vertical walls"
	}
	return line
}

// addGroundLine draws the ground line with its surveyed points.
func addGroundLine(p *plot.Plot, pts []subdivide.Point) error {
	ground := make(plotter.XYs, len(pts))
	for i, q := range pts {
		ground[i] = plotter.XY{X: q.Station, Y: q.Elevation}
	}
	gl, gs, err := plotter.NewLinePoints(ground)
	if err != nil {
		return err
	}
	gl.LineStyle = lineStyle(colGround, 2)
	gs.GlyphStyle = draw.GlyphStyle{Color: colGround, Radius: vg.Points(2.3), Shape: draw.CircleGlyph{}}
	p.Add(gl, gs)
	return nil
}

// thalwegIndex returns the index of the lowest point (the first, when
// several tie).
func thalwegIndex(pts []subdivide.Point) int {
	low := 0
	for i, q := range pts {
		if q.Elevation < pts[low].Elevation {
			low = i
		}
	}
	return low
}

// subtitle is s.Subtitle, or else the section's points, subsections,
// bank stations and thalweg (pts[low]).
func (s SectionPlot) subtitle(nsubs, low int, un unitNames) string {
	if s.Subtitle != "" {
		return s.Subtitle
	}
	pts := s.Section.Points
	banks := "no bank stations"
	if s.Section.HasBanks {
		banks = fmt.Sprintf("banks at stations %s and %s %s", fmtNum(s.Section.LeftBank), fmtNum(s.Section.RightBank), un.length)
	}
	return fmt.Sprintf("%s, %s, %s; thalweg %s %s at station %s",
		rating.Counted(len(pts), "surveyed point", "surveyed points"), rating.Counted(nsubs, "subsection", "subsections"), banks, fmtStage(pts[low].Elevation), un.length, fmtNum(pts[low].Station))
}

func labelSuffix(l string) string {
	if l = strings.TrimSpace(l); l != "" {
		return " (" + l + ")"
	}
	return ""
}

// setExaggeration widens the elevation axis so the vertical
// exaggeration (vertical scale over horizontal scale) is a round number,
// and states it in the station axis label.
func setExaggeration(p *plot.Plot, c draw.Canvas) {
	ve := func() float64 {
		dc := p.DataCanvas(c)
		w, h := float64(dc.Max.X-dc.Min.X), float64(dc.Max.Y-dc.Min.Y)
		return (h / (p.Y.Max - p.Y.Min)) / (w / (p.X.Max - p.X.Min))
	}
	natural := ve()
	if !(natural > 0) || !finite(natural) {
		return
	}
	exp := math.Pow(10, math.Floor(math.Log10(natural)))
	target := exp
	for _, m := range exaggerationSteps {
		if m*exp <= natural*(1+tickEpsilon) {
			target = m * exp
		}
	}
	// Tick labels change the axis width a little as the range grows, so
	// the widening is repeated until the drawn exaggeration settles.
	lo, hi := p.Y.Min, p.Y.Max
	got := natural
	for range exaggerationPasses {
		if math.Abs(got-target) <= exaggerationTolerance*target/2 {
			break
		}
		grow := (p.Y.Max - p.Y.Min) * (got/target - 1)
		p.Y.Min = math.Min(p.Y.Min-0.3*grow, lo)
		p.Y.Max = math.Max(p.Y.Max+0.7*grow, hi)
		got = ve()
	}
	p.X.Label.Text += fmt.Sprintf("        (vertical exaggeration %s×)", fmtNum(roundTo(got, target)))
}

// exaggerationPasses bounds the widening passes of setExaggeration.
const exaggerationPasses = 4

// exaggerationTolerance is the relative difference within which the
// drawn exaggeration is stated as the round target.
const exaggerationTolerance = 0.02

func roundTo(got, target float64) float64 {
	if math.Abs(got-target) <= exaggerationTolerance*target {
		return target
	}
	return math.Round(got*10) / 10
}

// wetPools returns the wetted reaches of a ground line at a stage as
// closed rings (ground points below the stage and the two surface
// ends). With extend, an end below the stage is closed by a vertical wall.
func wetPools(pts []subdivide.Point, stage float64, extend bool) []plotter.XYs {
	var pools []plotter.XYs
	var cur plotter.XYs
	if pts[0].Elevation < stage && extend {
		cur = plotter.XYs{{X: pts[0].Station, Y: stage}, {X: pts[0].Station, Y: pts[0].Elevation}}
	}
	for i := 0; i+1 < len(pts); i++ {
		a, b := pts[i], pts[i+1]
		aw, bw := a.Elevation < stage, b.Elevation < stage
		cross := func() plotter.XY {
			t := (stage - a.Elevation) / (b.Elevation - a.Elevation)
			return plotter.XY{X: a.Station + t*(b.Station-a.Station), Y: stage}
		}
		switch {
		case aw && bw:
			if cur == nil { // left end not extended
				cur = plotter.XYs{{X: a.Station, Y: stage}, {X: a.Station, Y: a.Elevation}}
			}
			cur = append(cur, plotter.XY{X: b.Station, Y: b.Elevation})
		case aw && !bw:
			if cur == nil {
				cur = plotter.XYs{{X: a.Station, Y: stage}, {X: a.Station, Y: a.Elevation}}
			}
			cur = append(cur, cross())
			pools = append(pools, cur)
			cur = nil
		case !aw && bw:
			cur = plotter.XYs{cross(), {X: b.Station, Y: b.Elevation}}
		}
	}
	if cur != nil {
		last := pts[len(pts)-1]
		cur = append(cur, plotter.XY{X: last.Station, Y: stage})
		pools = append(pools, cur)
	}
	return pools
}

// mainPool keeps the pool holding the main channel's lowest point (the
// lowest point between the banks, or of the section without banks).
func mainPool(pools []plotter.XYs, s subdivide.Section) []plotter.XYs {
	low := -1
	for i, q := range s.Points {
		if s.HasBanks && (q.Station < s.LeftBank || q.Station > s.RightBank) {
			continue
		}
		if low < 0 || q.Elevation < s.Points[low].Elevation {
			low = i
		}
	}
	if low < 0 {
		return pools
	}
	x := s.Points[low].Station
	for _, p := range pools {
		if p[0].X <= x && x <= p[len(p)-1].X {
			return []plotter.XYs{p}
		}
	}
	return nil
}

// groundFill shades the earth below the ground line.
type groundFill struct{ pts []subdivide.Point }

func (g groundFill) Plot(c draw.Canvas, p *plot.Plot) {
	tx, ty := p.Transforms(&c)
	var path vg.Path
	path.Move(vg.Point{X: tx(g.pts[0].Station), Y: c.Min.Y})
	for _, q := range g.pts {
		path.Line(vg.Point{X: tx(q.Station), Y: ty(q.Elevation)})
	}
	path.Line(vg.Point{X: tx(g.pts[len(g.pts)-1].Station), Y: c.Min.Y})
	path.Close()
	c.SetColor(colEarth)
	c.Fill(path)
}

// waterLine draws a water surface across each wetted reach, labelled at
// the right end of the last one.
type waterLine struct {
	pools []plotter.XYs
	stage float64
	label string
	style draw.LineStyle
}

func (wl waterLine) Plot(c draw.Canvas, p *plot.Plot) {
	tx, ty := p.Transforms(&c)
	y := ty(wl.stage)
	right := vg.Length(math.Inf(-1))
	for _, pool := range wl.pools {
		x0, x1 := tx(pool[0].X), tx(pool[len(pool)-1].X)
		c.StrokeLine2(wl.style, x0, y, x1, y)
		// A small inverted triangle marks the level, as on survey drawings.
		mid := (x0 + x1) / 2
		if x1-x0 > vg.Points(30) {
			downTriangle{}.DrawGlyph(&c, draw.GlyphStyle{Color: wl.style.Color, Radius: vg.Points(4)}, vg.Point{X: mid, Y: y + vg.Points(4)})
		}
		right = max(right, x1)
	}
	if len(wl.pools) == 0 || wl.label == "" {
		return
	}
	st := textStyle(sans(sizeNote), wl.style.Color)
	st.YAlign = draw.YBottom
	x := right + vg.Points(4)
	if x+st.Width(wl.label) > c.Max.X {
		st.XAlign = draw.XRight
		x = right - vg.Points(4)
	}
	haloText(c, st, vg.Point{X: x, Y: y + vg.Points(4.5)}, wl.label)
}

func (wl waterLine) DataRange() (xmin, xmax, ymin, ymax float64) {
	return math.Inf(1), math.Inf(-1), wl.stage, wl.stage
}

// downTriangle is a triangle glyph pointing down, its tip at the point's
// base: the mark of a water level or of the thalweg.
type downTriangle struct{}

func (downTriangle) DrawGlyph(c *draw.Canvas, sty draw.GlyphStyle, pt vg.Point) {
	c.SetLineStyle(draw.LineStyle{Color: sty.Color, Width: vg.Points(0.8)})
	r := sty.Radius
	var path vg.Path
	path.Move(vg.Point{X: pt.X, Y: pt.Y - r})
	path.Line(vg.Point{X: pt.X - r, Y: pt.Y + r*0.8})
	path.Line(vg.Point{X: pt.X + r, Y: pt.Y + r*0.8})
	path.Close()
	c.SetColor(sty.Color)
	c.Fill(path)
}

// sectionDecor draws the subsection dividers, bank lines, n labels,
// point marks and the thalweg mark.
type sectionDecor struct {
	subs    []subdivide.Subsection
	pts     []subdivide.Point
	sec     subdivide.Section
	thalweg subdivide.Point
	marks   []string
	unit    string
}

func (d sectionDecor) groundAt(x float64) float64 {
	if z := subdivide.GroundAt(d.pts, x); !math.IsNaN(z) {
		return z
	}
	return d.pts[len(d.pts)-1].Elevation
}

func (d sectionDecor) Plot(c draw.Canvas, p *plot.Plot) {
	tx, ty := p.Transforms(&c)
	d.drawDividers(c, tx, ty)
	d.drawNLabels(c, tx)
	d.drawMarks(c, tx, ty)
	d.drawThalweg(c, tx, ty)
}

// drawDividers draws the subsection dividers from the ground up to the
// panel's top, the banks heavier and named.
func (d sectionDecor) drawDividers(c draw.Canvas, tx, ty func(float64) vg.Length) {
	top := c.Max.Y
	divider := lineStyle(colDivider, 0.9, vg.Points(2), vg.Points(2.5))
	bank := lineStyle(colBank, 1.6, vg.Points(7), vg.Points(3))
	for i := 0; i+1 < len(d.subs); i++ {
		x := d.subs[i].To
		isBank := d.sec.HasBanks && (x == d.sec.LeftBank || x == d.sec.RightBank)
		ls := divider
		if isBank {
			ls = bank
		}
		cx := tx(x)
		c.StrokeLine2(ls, cx, ty(d.groundAt(x)), cx, top)
	}
	if !d.sec.HasBanks {
		return
	}
	for _, b := range []struct {
		x    float64
		name string
	}{{d.sec.LeftBank, "left bank"}, {d.sec.RightBank, "right bank"}} {
		st := textStyle(sansBold(sizeNote), colBank)
		st.Rotation = math.Pi / 2
		st.XAlign = draw.XLeft
		st.YAlign = draw.YBottom
		cx := tx(b.x)
		gy := ty(d.groundAt(b.x))
		if (b.x != d.sec.LeftBank && b.x != d.sec.RightBank) || !finite(b.x) {
			continue
		}
		if !d.isDivider(b.x) {
			c.StrokeLine2(bank, cx, gy, cx, top)
		}
		haloText(c, st, vg.Point{X: cx - vg.Points(3.5), Y: gy + vg.Points(6)}, b.name)
	}
}

// drawNLabels writes each subsection's n on up to three staggered rows
// under the top edge.
func (d sectionDecor) drawNLabels(c draw.Canvas, tx func(float64) vg.Length) {
	top := c.Max.Y
	st := textStyle(sans(sizeNote), colInk)
	st.XAlign = draw.XCenter
	st.YAlign = draw.YTop
	rowH := st.Rectangle("Mg").Size().Y + vg.Points(2)
	var rowEnd [3]vg.Length
	for i := range rowEnd {
		rowEnd[i] = vg.Length(math.Inf(-1))
	}
	for _, s := range d.subs {
		label := fmt.Sprintf("n %.3f", s.N)
		if !(s.N > 0) {
			label = "n ?"
		}
		cx := (tx(s.From) + tx(s.To)) / 2
		w := st.Width(label)
		row := 0
		for row < len(rowEnd)-1 && cx-w/2 < rowEnd[row]+vg.Points(4) {
			row++
		}
		rowEnd[row] = cx + w/2
		haloText(c, st, vg.Point{X: cx, Y: top - vg.Points(4) - vg.Length(row)*rowH}, label)
	}
}

// drawMarks writes the survey's point marks, small and slanted above their
// point.
func (d sectionDecor) drawMarks(c draw.Canvas, tx, ty func(float64) vg.Length) {
	ms := textStyle(sansItalic(sizeNote-1), colMuted)
	ms.Rotation = math.Pi / 6
	for i, m := range d.marks {
		m = strings.TrimSpace(m)
		if m == "" || i >= len(d.pts) || strings.EqualFold(m, "thalweg") {
			continue
		}
		q := d.pts[i]
		c.FillText(ms, vg.Point{X: tx(q.Station) + vg.Points(3), Y: ty(q.Elevation) + vg.Points(5)}, m)
	}
}

// drawThalweg marks the lowest point from below with its elevation.
func (d sectionDecor) drawThalweg(c draw.Canvas, tx, ty func(float64) vg.Length) {
	x, y := tx(d.thalweg.Station), ty(d.thalweg.Elevation)
	downTriangle{}.DrawGlyph(&c, draw.GlyphStyle{Color: colInk, Radius: vg.Points(4.5)}, vg.Point{X: x, Y: y - vg.Points(9)})
	ts := textStyle(sansBold(sizeNote), colInk)
	ts.XAlign = draw.XCenter
	ts.YAlign = draw.YTop
	haloText(c, ts, vg.Point{X: x, Y: y - vg.Points(15)}, "thalweg "+fmtStage(d.thalweg.Elevation)+" "+d.unit)
}

func (d sectionDecor) isDivider(x float64) bool {
	for i := 0; i+1 < len(d.subs); i++ {
		if d.subs[i].To == x {
			return true
		}
	}
	return false
}
