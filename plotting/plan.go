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
)

// PlanPlot is a plan view of a coordinate survey projected onto its
// section line: the points surveyed, the line from its left end, the
// labels of the points and the direction of flow when known.
type PlanPlot struct {
	// Site and Section title the figure.
	Site, Section string
	// Units is the unit system of the coordinates.
	Units rating.Units
	// Easting and Northing are the points (length unit), Labels an
	// optional label for each ("" none).
	Easting, Northing []float64
	Labels            []string
	// OriginE, OriginN is the left end of the line (station 0); Azimuth
	// the direction of increasing station (degrees clockwise from grid
	// north); Length the line's length drawn (the largest station).
	OriginE, OriginN, Azimuth, Length float64
	// FlowAzimuth, when FlowGiven, is the direction of flow (degrees
	// clockwise from grid north).
	FlowAzimuth float64
	FlowGiven   bool
	// Notes are lines at the foot (how the line and the left bank were
	// found, the farthest point off the line).
	Notes []string
	// Size is the pixel size (zero value: the default).
	Size Size
}

// Plan draws the plan view of a PlanPlot as a PNG into w, with equal
// scales on both axes so that distances off the line look as they are.
func Plan(w io.Writer, pp PlanPlot) (Result, error) {
	var res Result
	n := len(pp.Easting)
	if n == 0 || len(pp.Northing) != n || !finite(pp.OriginE, pp.OriginN, pp.Azimuth, pp.Length) {
		return res, fmt.Errorf("plotting: plan of %q: no points or no line", pp.Section)
	}
	un := names(pp.Units)
	th := pp.Azimuth * math.Pi / 180
	dx, dy := math.Sin(th), math.Cos(th)
	endE, endN := pp.OriginE+pp.Length*dx, pp.OriginN+pp.Length*dy

	p := newPanel("", "Easting, "+un.length, "Northing, "+un.length)
	addGrid(p)
	line, err := plotter.NewLine(plotter.XYs{{X: pp.OriginE, Y: pp.OriginN}, {X: endE, Y: endN}})
	if err != nil {
		return res, fmt.Errorf("plotting: plan of %q: %w", pp.Section, err)
	}
	line.LineStyle = lineStyle(colWater, 1.4, vg.Points(7), vg.Points(3))
	p.Add(line)
	p.Legend.Add("section line", line)
	xys := make(plotter.XYs, 0, n)
	for i := range pp.Easting {
		if finite(pp.Easting[i], pp.Northing[i]) {
			xys = append(xys, plotter.XY{X: pp.Easting[i], Y: pp.Northing[i]})
		}
	}
	sc, err := plotter.NewScatter(xys)
	if err != nil {
		return res, fmt.Errorf("plotting: plan of %q: %w", pp.Section, err)
	}
	sc.GlyphStyle = draw.GlyphStyle{Color: colGround, Radius: vg.Points(2.6), Shape: draw.CircleGlyph{}}
	p.Add(sc)
	p.Legend.Add("points surveyed", sc)
	p.Add(planLabels{pp: pp, endE: endE, endN: endN})

	squareAround(p, xys, plotter.XY{X: pp.OriginE, Y: pp.OriginN}, plotter.XY{X: endE, Y: endN})
	p.X.Tick.Marker, p.Y.Tick.Marker = linearTicks{}, linearTicks{}
	p.Legend.Top, p.Legend.Left = true, true

	sub := fmt.Sprintf("%d points; section line %s %s long at grid azimuth %.1f°", n, fmtNum(pp.Length), un.length, pp.Azimuth)
	if pp.FlowGiven {
		sub += fmt.Sprintf("; flow towards %.1f°", pp.FlowAzimuth)
	}
	fig := figure{title: titleOf(pp.Site, pp.Section, "plan of the survey"), subtitle: sub,
		foot: append(append([]string(nil), pp.Notes...), DefaultCaution)}
	err = render(w, pp.Size, fig, func(c draw.Canvas) error {
		setEqualScale(p, c)
		return drawPanel(p, c)
	})
	return res, err
}

// squareAround gives both axes of p the same span around the points and
// the line's two ends (setEqualScale then widens one to fit the panel's
// shape, for equal scales).
func squareAround(p *plot.Plot, xys plotter.XYs, a, b plotter.XY) {
	xlo, xhi := math.Min(a.X, b.X), math.Max(a.X, b.X)
	ylo, yhi := math.Min(a.Y, b.Y), math.Max(a.Y, b.Y)
	for _, q := range xys {
		xlo, xhi = math.Min(xlo, q.X), math.Max(xhi, q.X)
		ylo, yhi = math.Min(ylo, q.Y), math.Max(yhi, q.Y)
	}
	span := math.Max(math.Max(xhi-xlo, yhi-ylo), 1e-6) * 1.15
	cx, cy := (xlo+xhi)/2, (ylo+yhi)/2
	p.X.Min, p.X.Max = cx-span/2, cx+span/2
	p.Y.Min, p.Y.Max = cy-span/2, cy+span/2
	p.X.Padding, p.Y.Padding = 0, 0
}

// setEqualScale widens the axis whose data span is short for the panel's
// shape, so that one unit is as long across as up.
func setEqualScale(p *plot.Plot, c draw.Canvas) {
	for range exaggerationPasses {
		dc := p.DataCanvas(c)
		w, h := float64(dc.Max.X-dc.Min.X), float64(dc.Max.Y-dc.Min.Y)
		sx, sy := w/(p.X.Max-p.X.Min), h/(p.Y.Max-p.Y.Min) // points per unit
		if !(sx > 0 && sy > 0) || math.Abs(sx/sy-1) < 1e-3 {
			return
		}
		if sx > sy { // x is stretched: show more easting
			grow := (w/sy - (p.X.Max - p.X.Min)) / 2
			p.X.Min, p.X.Max = p.X.Min-grow, p.X.Max+grow
		} else {
			grow := (h/sx - (p.Y.Max - p.Y.Min)) / 2
			p.Y.Min, p.Y.Max = p.Y.Min-grow, p.Y.Max+grow
		}
	}
}

// planLabels writes the ends of the line, the points' labels and the
// flow arrow.
type planLabels struct {
	pp         PlanPlot
	endE, endN float64
}

func (d planLabels) Plot(c draw.Canvas, p *plot.Plot) {
	tx, ty := p.Transforms(&c)
	at := func(e, n float64) vg.Point { return vg.Point{X: tx(e), Y: ty(n)} }
	st := textStyle(sansBold(sizeNote), colBank)
	st.XAlign, st.YAlign = draw.XCenter, draw.YBottom
	off := vg.Points(6)
	o, e := at(d.pp.OriginE, d.pp.OriginN), at(d.endE, d.endN)
	c.FillText(st, vg.Point{X: o.X, Y: o.Y + off}, "left end (station 0)")
	c.FillText(st, vg.Point{X: e.X, Y: e.Y + off}, "right end")
	lt := textStyle(sans(sizeNote), colMuted)
	lt.YAlign = draw.YCenter
	for i, l := range d.pp.Labels {
		if l == "" || i >= len(d.pp.Easting) || !finite(d.pp.Easting[i], d.pp.Northing[i]) {
			continue
		}
		q := at(d.pp.Easting[i], d.pp.Northing[i])
		c.FillText(lt, vg.Point{X: q.X + vg.Points(5), Y: q.Y - vg.Points(8)}, l)
	}
	if !d.pp.FlowGiven {
		return
	}
	// An arrow of flow through the middle of the line.
	th := d.pp.FlowAzimuth * math.Pi / 180
	fx, fy := vg.Length(math.Sin(th)), vg.Length(math.Cos(th))
	mid := vg.Point{X: (o.X + e.X) / 2, Y: (o.Y + e.Y) / 2}
	r := vg.Points(28)
	from, to := vg.Point{X: mid.X - fx*r, Y: mid.Y - fy*r}, vg.Point{X: mid.X + fx*r, Y: mid.Y + fy*r}
	ls := lineStyle(colWater, 2)
	c.StrokeLine2(ls, from.X, from.Y, to.X, to.Y)
	head := vg.Points(8)
	for _, turn := range []float64{2.6, -2.6} {
		a := th + turn
		c.StrokeLine2(ls, to.X, to.Y, to.X+vg.Length(math.Sin(a))*head, to.Y+vg.Length(math.Cos(a))*head)
	}
	ft := textStyle(sansItalic(sizeNote), colWater)
	ft.XAlign, ft.YAlign = draw.XCenter, draw.YTop
	c.FillText(ft, vg.Point{X: to.X, Y: to.Y - vg.Points(4)}, "flow")
}
