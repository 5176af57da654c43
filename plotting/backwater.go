package plotting

import (
	"fmt"
	"image/color"
	"io"
	"math"
	"sort"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"wetline/rating"
)

// ProfilePoint is a computed water surface at one section.
type ProfilePoint struct {
	// Distance is along the channel, increasing downstream; WaterSurface
	// and EnergyGrade are elevations (length unit).
	Distance, WaterSurface, EnergyGrade float64
	// Critical marks a stage at critical depth (no subcritical stage
	// balances the energy equation there).
	Critical bool
}

// ProfileLine is the water-surface profile of one discharge.
type ProfileLine struct {
	// Discharge labels the profile (discharge unit).
	Discharge float64
	// Points in any order; drawn by distance.
	Points []ProfilePoint
	// Verified marks the profile of a flood set against its high-water
	// marks: drawn heavier, with its energy grade line.
	Verified bool
}

// DefaultBackwaterCaution is the line at the foot of the step-backwater
// figures when the caller gives none.
const DefaultBackwaterCaution = "Caution: a step-backwater rating is an estimate resting on the surveyed sections, " +
	"the n values and the boundary; verify it against marks or gaugings before use."

// BackwaterPlot describes the computed profiles of a reach.
type BackwaterPlot struct {
	// Site and Reach name the place in the title; Subtitle is an optional
	// second line (the boundary).
	Site, Reach, Subtitle string
	// Units is the unit system of every value.
	Units rating.Units
	// Sections give the thalweg (Ground or Bed) and the high-water marks;
	// their WaterSurface and VelocityHead are not used.
	Sections []ReachSection
	// At is the id of the rating section, labelled as such.
	At string
	// Profiles are drawn lightest for the least discharge.
	Profiles []ProfileLine
	// Notes are extra lines at the foot.
	Notes []string
	// Caution is the last line at the foot; "" gives
	// DefaultBackwaterCaution.
	Caution string
	// Size is the pixel size (zero value: the default).
	Size Size
}

// MaxProfileLabels is the number of profiles up to which each has its own
// legend entry; above it only the least and the greatest discharge do.
const MaxProfileLabels = 6

// BackwaterProfiles draws the water-surface profiles of a reach as a PNG
// into w: the thalweg, every profile (shaded from light for the least
// discharge to dark for the greatest), the stages at critical depth, the
// high-water marks on each bank, and a verified profile with its energy
// grade line, against distance downstream.
func BackwaterProfiles(w io.Writer, r BackwaterPlot) (Result, error) {
	var res Result
	secs := append([]ReachSection(nil), r.Sections...)
	if len(secs) == 0 || len(r.Profiles) == 0 {
		return res, fmt.Errorf("%w: a profile figure needs sections and profiles", ErrNoData)
	}
	for _, x := range secs {
		if !finite(x.Distance) {
			return res, fmt.Errorf("plotting: section %q: distance must be a finite number", x.ID)
		}
	}
	sort.SliceStable(secs, func(i, j int) bool { return secs[i].Distance < secs[j].Distance })
	un := names(r.Units)
	p := newPanel("", "Distance downstream, "+un.length, "Elevation, "+un.length)
	addGrid(p)
	p.X.Tick.Marker, p.Y.Tick.Marker = linearTicks{}, linearTicks{}
	ext := newExtent()
	leg := &legendLabels{legend: &p.Legend}
	addReachBed(p, leg, secs, r.At, ext)
	res.Warnings = append(res.Warnings, addProfiles(p, leg, r.Profiles, un, ext)...)
	res.Warnings = append(res.Warnings, addMarks(p, leg, secs, ext)...)
	setProfileRanges(p, secs, ext.lo, ext.hi, 0.12)
	sub := r.Subtitle
	if sub == "" {
		sub = rating.Counted(len(r.Profiles), "profile", "profiles") + " through " + rating.Counted(len(secs), "section", "sections")
	}
	fig := figure{title: titleOf(r.Site, r.Reach, "step-backwater profiles"), subtitle: sub,
		foot: append(append([]string(nil), r.Notes...), orDefault(r.Caution, DefaultBackwaterCaution))}
	err := render(w, r.Size, fig, func(c draw.Canvas) error {
		if err := drawable(p); err != nil {
			return err
		}
		drawSideLegend(c, p, leg.labels)
		return nil
	})
	return res, err
}

// addReachBed names the sections along the distance axis (the rating
// section marked so) and draws the thalweg line through them.
func addReachBed(p *plot.Plot, leg *legendLabels, secs []ReachSection, at string, ext *extent) {
	labelled := make([]ReachSection, len(secs))
	var bed plotter.XYs
	for i, s := range secs {
		labelled[i] = ReachSection{ID: s.ID, Distance: s.Distance}
		if s.ID == at && at != "" {
			labelled[i].ID = s.ID + " (rating)"
		}
		if t := s.thalweg(); finite(t.Elevation) {
			bed = append(bed, plotter.XY{X: s.Distance, Y: t.Elevation})
			ext.add(t.Elevation)
		}
	}
	p.Add(sectionTicks{secs: labelled})
	if len(bed) > 0 {
		if l, sc, err := plotter.NewLinePoints(bed); err == nil {
			l.LineStyle = lineStyle(colGround, 2.2)
			sc.GlyphStyle = draw.GlyphStyle{Color: colGround, Radius: vg.Points(3.2), Shape: draw.BoxGlyph{}}
			p.Add(l, sc)
			leg.add("thalweg (lowest ground)", l, sc)
		}
	}
}

// MaxLegendShare is the largest share of a figure's width given to a
// legend drawn beside its panel.
const MaxLegendShare = 0.4

// drawSideLegend draws p with its legend to the right of the panel, where
// it hides nothing.
func drawSideLegend(c draw.Canvas, p *plot.Plot, labels []string) {
	leg := p.Legend
	p.Legend = plot.NewLegend()
	width := vg.Length(0)
	for _, e := range labels {
		width = max(width, leg.TextStyle.Width(e))
	}
	width += leg.ThumbnailWidth + 2*leg.Padding + vg.Points(12)
	width = min(width, vg.Length(MaxLegendShare)*(c.Max.X-c.Min.X))
	split := c.Max.X - width
	p.Draw(draw.Crop(c, 0, split-c.Max.X, 0, 0))
	leg.Top, leg.Left = true, true
	leg.XOffs = vg.Points(10)
	leg.Draw(draw.Crop(c, split-c.Min.X, 0, 0, -vg.Points(18)))
}

// legendLabels adds entries to a legend and keeps their labels, so that
// the legend's width is known.
type legendLabels struct {
	legend *plot.Legend
	labels []string
}

func (l *legendLabels) add(label string, thumbs ...plot.Thumbnailer) {
	l.legend.Add(label, thumbs...)
	l.labels = append(l.labels, label)
}

// extent tracks the range of the elevations drawn.
type extent struct{ lo, hi float64 }

func newExtent() *extent { return &extent{lo: math.Inf(1), hi: math.Inf(-1)} }

func (e *extent) add(v float64) {
	if finite(v) {
		e.lo, e.hi = math.Min(e.lo, v), math.Max(e.hi, v)
	}
}

// profileColor shades profile k of n from a light to a dark water blue.
func profileColor(k, n int) color.NRGBA {
	t := 1.0
	if n > 1 {
		t = float64(k) / float64(n-1)
	}
	light := color.NRGBA{R: 0x9c, G: 0xc4, B: 0xe8, A: 0xff}
	dark := color.NRGBA{R: 0x0d, G: 0x2f, B: 0x5e, A: 0xff}
	mix := func(a, b uint8) uint8 { return uint8(math.Round(float64(a) + t*(float64(b)-float64(a)))) }
	return color.NRGBA{R: mix(light.R, dark.R), G: mix(light.G, dark.G), B: mix(light.B, dark.B), A: 0xff}
}

// addProfiles draws every profile and the critical stages on p.
func addProfiles(pl *plot.Plot, leg *legendLabels, profiles []ProfileLine, un unitNames, ext *extent) []string {
	var warnings []string
	order := make([]int, len(profiles))
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(a, b int) bool { return profiles[order[a]].Discharge < profiles[order[b]].Discharge })
	plain := 0
	for _, i := range order {
		if !profiles[i].Verified {
			plain++
		}
	}
	var crit plotter.XYs
	k := 0
	for _, i := range order {
		pr := profiles[i]
		ws, egl := profileXYs(pr, &crit, ext)
		if len(ws) < 2 {
			warnings = append(warnings, fmt.Sprintf("the profile of %s %s has fewer than two points: left out", fmtNum(pr.Discharge), un.discharge))
			continue
		}
		l, err := plotter.NewLine(ws)
		if err != nil {
			continue
		}
		label := fmt.Sprintf("water surface, Q = %s %s", fmtNum(pr.Discharge), un.discharge)
		if pr.Verified {
			addVerifiedProfile(pl, leg, l, egl, label)
			continue
		}
		l.LineStyle = lineStyle(profileColor(k, plain), 1.6)
		pl.Add(l)
		if plain <= MaxProfileLabels || k == 0 || k == plain-1 {
			leg.add(label, l)
		}
		k++
	}
	if len(crit) > 0 {
		if sc, err := plotter.NewScatter(crit); err == nil {
			sc.GlyphStyle = criticalGlyph()
			pl.Add(sc)
			leg.add(criticalLabel, sc)
		}
	}
	return warnings
}

// criticalLabel names the stages at critical depth in the legends of the
// profile and rating figures.
const criticalLabel = "stage at critical depth"

// criticalGlyph is the marker of a stage at critical depth, in the
// profile figure and the rating figure alike.
func criticalGlyph() draw.GlyphStyle {
	return draw.GlyphStyle{Color: colEnergy, Radius: vg.Points(4.5), Shape: draw.CrossGlyph{}}
}

// unsettledGlyph is the marker of a rating read still depending on the
// downstream boundary, in the backwater rating figure and in a redrawn
// table alike.
func unsettledGlyph() draw.GlyphStyle {
	return draw.GlyphStyle{Color: colEnergy, Radius: vg.Points(4), Shape: draw.RingGlyph{}}
}

// profileXYs returns a profile's water surface and, for the verified
// profile, its energy grade line, downstream in distance; stages at
// critical depth are added to crit and every value drawn to ext.
func profileXYs(pr ProfileLine, crit *plotter.XYs, ext *extent) (ws, egl plotter.XYs) {
	pts := append([]ProfilePoint(nil), pr.Points...)
	sort.SliceStable(pts, func(a, b int) bool { return pts[a].Distance < pts[b].Distance })
	for _, q := range pts {
		if !finite(q.Distance, q.WaterSurface) {
			continue
		}
		ws = append(ws, plotter.XY{X: q.Distance, Y: q.WaterSurface})
		ext.add(q.WaterSurface)
		if q.Critical {
			*crit = append(*crit, plotter.XY{X: q.Distance, Y: q.WaterSurface})
		}
		if pr.Verified && finite(q.EnergyGrade) {
			egl = append(egl, plotter.XY{X: q.Distance, Y: q.EnergyGrade})
			ext.add(q.EnergyGrade)
		}
	}
	return ws, egl
}

// addVerifiedProfile draws the verified profile heavy, with its energy
// grade line dashed.
func addVerifiedProfile(pl *plot.Plot, leg *legendLabels, l *plotter.Line, egl plotter.XYs, label string) {
	l.LineStyle = lineStyle(colFitted, 2.6)
	pl.Add(l)
	leg.add(label+" (verification)", l)
	if len(egl) > 1 {
		if e, err := plotter.NewLine(egl); err == nil {
			e.LineStyle = lineStyle(colEnergy, 1.6, vg.Points(8), vg.Points(4))
			pl.Add(e)
			leg.add("its energy grade line", e)
		}
	}
}

// addMarks draws the high-water marks of the sections on p, by bank.
func addMarks(p *plot.Plot, leg *legendLabels, secs []ReachSection, ext *extent) []string {
	var warnings []string
	marks := map[string]plotter.XYs{}
	for _, s := range secs {
		for _, m := range s.Marks {
			if !finite(m.Elevation) {
				warnings = append(warnings, fmt.Sprintf("section %s: a high-water mark without elevation left out", s.ID))
				continue
			}
			side := m.Side
			if side != Left && side != Right {
				side = "unknown side"
			}
			marks[side] = append(marks[side], plotter.XY{X: s.Distance, Y: m.Elevation})
			ext.add(m.Elevation)
		}
	}
	for _, ms := range []struct {
		side, label string
		style       draw.GlyphStyle
	}{
		{Left, "high-water mark, left bank", draw.GlyphStyle{Color: colInk, Radius: vg.Points(4.5), Shape: draw.TriangleGlyph{}}},
		{Right, "high-water mark, right bank", draw.GlyphStyle{Color: colBank, Radius: vg.Points(4.5), Shape: downTriangle{}}},
		{"unknown side", "high-water mark, side not given", draw.GlyphStyle{Color: colMuted, Radius: vg.Points(4), Shape: draw.RingGlyph{}}},
	} {
		if xy := marks[ms.side]; len(xy) > 0 {
			if sc, err := plotter.NewScatter(xy); err == nil {
				sc.GlyphStyle = ms.style
				p.Add(sc)
				leg.add(ms.label, sc)
			}
		}
	}
	return warnings
}

// StageBand is the range of stage a rating read may take at one discharge.
type StageBand struct {
	// Discharge (discharge unit); Low and High bound the stage (length
	// unit).
	Discharge, Low, High float64
}

// RatingComparison is a figure of several ratings at one section on
// linear axes: stage against discharge.
type RatingComparison struct {
	// Site and Section name the place in the title; Subtitle is a second
	// line.
	Site, Section, Subtitle string
	// Units is the unit system of every value.
	Units rating.Units
	// Curves are the ratings, the first drawn heaviest; extrapolated
	// points are drawn dashed.
	Curves []Curve
	// Band is a stage band about the first curve, drawn shaded, named by
	// BandLabel.
	Band      []StageBand
	BandLabel string
	// Marked are points drawn as rings, named by MarkedLabel (reads that
	// still depend on the boundary, say).
	Marked      []RatingPoint
	MarkedLabel string
	// Critical are points drawn as crosses, as the profile figure marks a
	// stage at critical depth, named by CriticalLabel ("" gives "stage at
	// critical depth").
	Critical      []RatingPoint
	CriticalLabel string
	// What ends the title ("" gives "ratings compared").
	What string
	// Notes are extra lines at the foot; Caution the last ("" gives
	// DefaultBackwaterCaution).
	Notes   []string
	Caution string
	// Size is the pixel size (zero value: the default).
	Size Size
}

// CompareRatings draws ratings at one section together as a PNG into w,
// with a shaded stage band about the first, marked points (rings) and
// points at critical depth (crosses). The axes
// reach a little beyond the data on every side (discharge from zero), so
// that a point at an end, a rating of one discharge included, is drawn
// whole with its marker.
func CompareRatings(w io.Writer, r RatingComparison) (Result, error) {
	p, fig, res, err := comparePanel(r)
	if err != nil {
		return res, err
	}
	err = render(w, r.Size, fig, func(c draw.Canvas) error {
		return drawPanel(p, c)
	})
	return res, err
}

// markerPad is the share of an axis's range left beyond the data at each
// end of a rating comparison, so that the markers at the ends (up to 4.5
// points in radius, the cross at critical depth) lie inside the frame: 3 %
// of a panel 300 pixels wide at 72 dots per inch is 9 pixels, more than
// the 4.5 of the largest marker.
const markerPad = 0.03

// comparePanel lays out the panel and the frame of a rating comparison.
func comparePanel(r RatingComparison) (*plot.Plot, figure, Result, error) {
	var res Result
	un := names(r.Units)
	p := newPanel("", "Discharge, "+un.discharge, "Stage, "+un.length)
	addGrid(p)
	p.X.Tick.Marker, p.Y.Tick.Marker = linearTicks{}, linearTicks{}
	if poly := stageBandPolygon(r.Band); poly != nil {
		p.Add(poly)
		p.Legend.Add(orDefault(r.BandLabel, "stage band"), poly)
	}
	drawn := 0
	for i, c := range r.Curves {
		pts := cleanCurve(c)
		if len(pts) == 0 {
			res.Warnings = append(res.Warnings, fmt.Sprintf("curve %q has no point to draw: left out", c.Label))
			continue
		}
		sty := seriesStyles[i%len(seriesStyles)]
		width := 1.8
		if i == 0 {
			sty.color, width = colWater, 2.4
		} else if sty.color == colWater {
			sty.color = colHydraulic
		}
		drawn += addCurve(p, pts, orDefault(c.Label, fmt.Sprintf("rating %d", i+1)), sty.color, width, 0, false)
	}
	if drawn == 0 {
		return nil, figure{}, res, fmt.Errorf("%w: the rating comparison needs a curve", ErrNoData)
	}
	var marked plotter.XYs
	for _, m := range r.Marked {
		if finite(m.Stage, m.Discharge) {
			marked = append(marked, plotter.XY{X: m.Discharge, Y: m.Stage})
		}
	}
	if len(marked) > 0 {
		if sc, err := plotter.NewScatter(marked); err == nil {
			sc.GlyphStyle = unsettledGlyph()
			p.Add(sc)
			p.Legend.Add(orDefault(r.MarkedLabel, "marked reads"), sc)
		}
	}
	var crit plotter.XYs
	for _, m := range r.Critical {
		if finite(m.Stage, m.Discharge) {
			crit = append(crit, plotter.XY{X: m.Discharge, Y: m.Stage})
		}
	}
	if len(crit) > 0 {
		if sc, err := plotter.NewScatter(crit); err == nil {
			sc.GlyphStyle = criticalGlyph()
			p.Add(sc)
			p.Legend.Add(orDefault(r.CriticalLabel, criticalLabel), sc)
		}
	}
	fromZero := p.X.Min >= 0
	padAxis(&p.X, markerPad)
	if p.Y.Min == p.Y.Max {
		p.Y.Min, p.Y.Max = p.Y.Min-1, p.Y.Max+1 // one stage: a unit either side
	} else {
		padAxis(&p.Y, markerPad)
	}
	if fromZero {
		p.X.Min = 0 // discharge from zero: no point lies left of it
	}
	p.Legend.Top, p.Legend.Left = true, true
	p.Legend.XOffs, p.Legend.YOffs = vg.Points(8), -vg.Points(6)
	fig := figure{title: titleOf(r.Site, r.Section, orDefault(r.What, "ratings compared")), subtitle: r.Subtitle,
		foot: append(append([]string(nil), r.Notes...), orDefault(r.Caution, DefaultBackwaterCaution))}
	return p, fig, res, nil
}

// stageBandPolygon builds a shaded band between the low and high stages
// of a band, by discharge; nil with fewer than two usable points.
func stageBandPolygon(b []StageBand) *plotter.Polygon {
	var pts []StageBand
	for _, q := range b {
		if finite(q.Discharge, q.Low, q.High) && q.Low <= q.High {
			pts = append(pts, q)
		}
	}
	if len(pts) < 2 {
		return nil
	}
	sort.SliceStable(pts, func(i, j int) bool { return pts[i].Discharge < pts[j].Discharge })
	ring := make(plotter.XYs, 0, 2*len(pts))
	for _, q := range pts {
		ring = append(ring, plotter.XY{X: q.Discharge, Y: q.Low})
	}
	for i := len(pts) - 1; i >= 0; i-- {
		ring = append(ring, plotter.XY{X: pts[i].Discharge, Y: pts[i].High})
	}
	poly, err := plotter.NewPolygon(ring)
	if err != nil {
		return nil
	}
	poly.Color = color.NRGBA{R: 0x5b, G: 0x9b, B: 0xd5, A: 0x50}
	poly.LineStyle.Width = 0
	return poly
}
