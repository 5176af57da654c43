package plotting

import (
	"fmt"
	"io"
	"math"
	"time"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/rating/record"
)

// Figures of a discharge record and of shifts put time on an axis as Unix
// seconds, marked by timeTicks in the record's zone.

// timeTicks marks a time axis (Unix seconds) at round calendar steps in a
// zone: hours, days, weeks, months or years, about maxTimeTicks labels.
type timeTicks struct{ zone *time.Location }

// maxTimeTicks is the most labelled marks a time axis shows.
const maxTimeTicks = 8

// timeStep is a calendar step of a time axis and how its marks are
// labelled.
type timeStep struct {
	hours, days, months int
	layout              string
}

// timeSteps are the steps a time axis may take, finest first.
var timeSteps = [...]timeStep{
	{hours: 1, layout: "15:04"}, {hours: 3, layout: "01-02 15:04"}, {hours: 6, layout: "01-02 15:04"}, {hours: 12, layout: "01-02 15:04"},
	{days: 1, layout: "2006-01-02"}, {days: 2, layout: "2006-01-02"}, {days: 7, layout: "2006-01-02"}, {days: 14, layout: "2006-01-02"},
	{months: 1, layout: "Jan 2006"}, {months: 2, layout: "Jan 2006"}, {months: 3, layout: "Jan 2006"}, {months: 6, layout: "Jan 2006"},
	{months: 12, layout: "2006"}, {months: 24, layout: "2006"}, {months: 60, layout: "2006"}, {months: 120, layout: "2006"},
}

// approx is the step's length in seconds, to count its marks.
func (s timeStep) approx() float64 {
	return float64(s.hours)*3600 + float64(s.days)*86400 + float64(s.months)*30.44*86400
}

// first is the first mark at or after t.
func (s timeStep) first(t time.Time) time.Time {
	y, m, d := t.Date()
	var f time.Time
	switch {
	case s.months > 0:
		k := (int(m) - 1) / s.months * s.months
		if s.months >= 12 {
			k = 0
			y = y / (s.months / 12) * (s.months / 12)
		}
		f = time.Date(y, time.Month(k+1), 1, 0, 0, 0, 0, t.Location())
	case s.days > 0:
		f = time.Date(y, m, d, 0, 0, 0, 0, t.Location())
		if s.days == 7 || s.days == 14 { // weeks start on Mondays
			f = f.AddDate(0, 0, -((int(f.Weekday()) + 6) % 7))
		}
	default:
		f = time.Date(y, m, d, t.Hour()/s.hours*s.hours, 0, 0, 0, t.Location())
	}
	for f.Before(t) {
		f = s.next(f)
	}
	return f
}

// next is the mark after t.
func (s timeStep) next(t time.Time) time.Time {
	switch {
	case s.months > 0:
		return t.AddDate(0, s.months, 0)
	case s.days > 0:
		return t.AddDate(0, 0, s.days)
	}
	return t.Add(time.Duration(s.hours) * time.Hour)
}

func (tt timeTicks) Ticks(lo, hi float64) []plot.Tick {
	if !finite(lo, hi) || !(hi > lo) {
		return nil
	}
	z := tt.zone
	if z == nil {
		z = time.UTC
	}
	step := timeSteps[len(timeSteps)-1]
	for _, s := range timeSteps {
		if (hi-lo)/s.approx() <= maxTimeTicks {
			step = s
			break
		}
	}
	var out []plot.Tick
	end := time.Unix(int64(math.Floor(hi)), 0)
	for t := step.first(time.Unix(int64(math.Ceil(lo)), 0).In(z)); !t.After(end); t = step.next(t) {
		out = append(out, plot.Tick{Value: float64(t.Unix()), Label: t.Format(step.layout)})
	}
	return out
}

// vline is a vertical reference line at x with a small label at its top.
type vline struct {
	x     float64
	style draw.LineStyle
	label string
}

func (v vline) Plot(c draw.Canvas, p *plot.Plot) {
	tx, _ := p.Transforms(&c)
	x := tx(v.x)
	if x < c.Min.X || x > c.Max.X {
		return
	}
	c.StrokeLine2(v.style, x, c.Min.Y, x, c.Max.Y)
	if v.label != "" {
		st := textStyle(sans(sizeNote), v.style.Color)
		st.XAlign, st.YAlign = draw.XLeft, draw.YTop
		haloText(c, st, vg.Point{X: x + vg.Points(3), Y: c.Max.Y - vg.Points(3)}, v.label)
	}
}

// DataRange keeps the line inside the axis range.
func (v vline) DataRange() (xmin, xmax, ymin, ymax float64) {
	return v.x, v.x, math.Inf(1), math.Inf(-1)
}

// zeroLine is a horizontal line at zero across a panel (shift figures).
type zeroLine struct{ vertical bool }

func (z zeroLine) Plot(c draw.Canvas, p *plot.Plot) {
	tx, ty := p.Transforms(&c)
	ls := lineStyle(colMuted, 0.9)
	if z.vertical {
		if x := tx(0); x >= c.Min.X && x <= c.Max.X {
			c.StrokeLine2(ls, x, c.Min.Y, x, c.Max.Y)
		}
		return
	}
	if y := ty(0); y >= c.Min.Y && y <= c.Max.Y {
		c.StrokeLine2(ls, c.Min.X, y, c.Max.X, y)
	}
}

// maxLinePoints bounds the points of a record's line: above it the unit
// values are thinned to the least and greatest of each of hydroBins
// intervals of time, which keeps every peak and trough a figure can show.
const (
	maxLinePoints = 6000
	hydroBins     = 2000
)

// run is a stretch of a record's line without a break.
type recordRun []plotter.XY

// recordRuns lays a series of the record out as runs broken at gaps and at
// values that cannot be drawn, thinned to each interval's extremes when
// long.
func recordRuns(res *record.Result, value func(record.UnitValue) float64) []recordRun {
	us := res.Units
	if len(us) == 0 {
		return nil
	}
	var runs []recordRun
	var cur recordRun
	flush := func() {
		if len(cur) > 0 {
			runs = append(runs, cur)
		}
		cur = nil
	}
	t0, t1 := float64(us[0].Time), float64(us[len(us)-1].Time)
	thin := len(us) > maxLinePoints && t1 > t0
	width := (t1 - t0) / hydroBins
	bin, lo, hi := -1, -1, -1 // current interval and the indices of its extremes
	emit := func() {
		if lo < 0 {
			return
		}
		a, b := lo, hi
		if a > b {
			a, b = b, a
		}
		cur = append(cur, plotter.XY{X: float64(us[a].Time), Y: value(us[a])})
		if b != a {
			cur = append(cur, plotter.XY{X: float64(us[b].Time), Y: value(us[b])})
		}
		lo, hi = -1, -1
	}
	for i, u := range us {
		v := value(u)
		if u.Flags&record.Gap != 0 || !finite(v) {
			emit()
			flush()
			bin = -1
			if !finite(v) {
				continue
			}
		}
		if !thin {
			cur = append(cur, plotter.XY{X: float64(u.Time), Y: v})
			continue
		}
		if k := int((float64(u.Time) - t0) / width); k != bin {
			emit()
			bin = k
		}
		if lo < 0 || v < value(us[lo]) {
			lo = i
		}
		if hi < 0 || v > value(us[hi]) {
			hi = i
		}
	}
	emit()
	flush()
	return runs
}

// addRuns draws runs as lines of one style; the first carries the legend
// entry.
func addRuns(p *plot.Plot, runs []recordRun, label string, ls draw.LineStyle) {
	for i, r := range runs {
		var l *plotter.Line
		var err error
		if len(r) == 1 {
			s, err := plotter.NewScatter(plotter.XYs{r[0]})
			if err == nil {
				s.GlyphStyle = draw.GlyphStyle{Color: ls.Color, Radius: ls.Width, Shape: draw.CircleGlyph{}}
				p.Add(s)
			}
			continue
		}
		if l, err = plotter.NewLine(plotter.XYs(r)); err != nil {
			continue
		}
		l.LineStyle = ls
		p.Add(l)
		if i == 0 && label != "" {
			p.Legend.Add(label, l)
		}
	}
}

// periodLines marks the beginning of every rating period after the first.
func periodLines(p *plot.Plot, froms []time.Time, ratingNames []string, z *time.Location, label bool) {
	for i, f := range froms {
		if i == 0 || f.IsZero() {
			continue
		}
		text := ""
		if label {
			text = fmt.Sprintf("rating period %d from %s", i+1, f.In(z).Format("2006-01-02 15:04"))
			if ratingNames[i] == "no rating" {
				text += ": no rating"
			}
		}
		p.Add(vline{x: float64(f.Unix()), style: lineStyle(colBank, 1.1, vg.Points(6), vg.Points(3)), label: text})
	}
}

// addGaugingPoints draws gaugings at (x, y) by quality, the shapes of the
// rating figure, with a legend entry per quality.
func addGaugingPoints(p *plot.Plot, pts []gaugingPoint, legend bool) {
	groups := map[rating.Quality]plotter.XYs{}
	for _, g := range pts {
		if !finite(g.x, g.y) {
			continue
		}
		q := g.q
		if q.String() == "" {
			q = rating.Unrated
		}
		groups[q] = append(groups[q], plotter.XY{X: g.x, Y: g.y})
	}
	for _, q := range qualityOrder {
		xy, ok := groups[q]
		if !ok {
			continue
		}
		s, err := plotter.NewScatter(xy)
		if err != nil {
			continue
		}
		s.GlyphStyle = gaugingStyle(q)
		p.Add(s)
		if legend {
			p.Legend.Add("gauging, "+qualityName(q), s)
		}
	}
}

// gaugingPoint is a gauging placed on a panel.
type gaugingPoint struct {
	x, y float64
	q    rating.Quality
}

// ringPoints circles points (gaugings outside their bands).
func ringPoints(p *plot.Plot, xy plotter.XYs, label string) {
	if len(xy) == 0 {
		return
	}
	s, err := plotter.NewScatter(xy)
	if err != nil {
		return
	}
	s.GlyphStyle = draw.GlyphStyle{Color: colEnergy, Radius: vg.Points(7.5), Shape: draw.RingGlyph{}}
	p.Add(s)
	p.Legend.Add(label, s)
}

// DrawRecord draws the hydrograph of a computed record: the unit
// discharges (thinned to each interval's extremes when long, broken at
// gaps and where no discharge was computed), the daily means, the gaugings
// by quality and the beginning of every rating period, over a panel of the
// gauge heights (and the effective gauge heights when a shift is
// applied). site titles it; base starts its file name.
func DrawRecord(res *record.Result, site, base string, size Size) ([]rating.Figure, []string, error) {
	return oneFigure(base, "hydrograph", "hydrograph: unit and daily mean discharge with the gaugings, and the gauge height", func(w io.Writer) (Result, error) {
		return hydrograph(w, res, site, size)
	})
}

// hydrograph draws the record's hydrograph figure: the discharge panel
// over the gauge-height panel, on one time axis spanning the record.
func hydrograph(w io.Writer, res *record.Result, site string, size Size) (Result, error) {
	var out Result
	un := names(res.UnitSystem)
	q := recordRuns(res, func(u record.UnitValue) float64 { return u.Discharge })
	if len(q) == 0 {
		return out, fmt.Errorf("%w: no reading of the record has a discharge", ErrNoData)
	}
	froms, pnames := periodsOf(res)
	top := dischargePanel(res, q, froms, pnames, un)
	bottom := gaugeHeightPanel(res, froms, pnames, un)
	lo, hi := float64(res.Units[0].Time), float64(res.Units[len(res.Units)-1].Time)
	for _, p := range []*plot.Plot{top, bottom} {
		p.X.Min, p.X.Max = lo, hi
	}
	fig := figure{
		title: titleOf(site, res.Name, "discharge record"),
		subtitle: fmt.Sprintf("%s; %s, %s; gaps longer than %s not bridged", rating.Counted(len(res.Units), "reading", "readings"),
			rating.Counted(len(res.Periods), "rating period", "rating periods"), rating.Counted(len(res.Shifts), "shift diagram", "shift diagrams"), record.FormatDuration(res.MaxGap)),
		foot: []string{"Provisional: a computed record is provisional until reviewed; check the shifts, the gaps and every flagged value.",
			DefaultCaution},
		footColor: colCaution,
	}
	err := render(w, size, fig, func(c draw.Canvas) error {
		if err := drawable(top, bottom); err != nil {
			return err
		}
		tiles := draw.Tiles{Rows: 2, Cols: 1, PadY: vg.Points(14)}
		canvases := plot.Align([][]*plot.Plot{{top}, {bottom}}, tiles, c)
		top.Draw(canvases[0][0])
		bottom.Draw(canvases[1][0])
		return nil
	})
	return out, err
}

// dischargePanel draws the unit discharges q, the daily means, the start
// of every rating period after the first (froms, named by pnames) and the
// gaugings, ringed where they lie outside their band from the record.
func dischargePanel(res *record.Result, q []recordRun, froms []time.Time, pnames []string, un unitNames) *plot.Plot {
	z := res.Zone
	top := newPanel("Discharge", "", "Discharge, "+un.discharge)
	addGrid(top)
	addRuns(top, q, "unit values", lineStyle(colHydraulic, 1.0))
	for i, r := range dailyMeanRuns(res.Daily) {
		runs := []recordRun{recordRun(r)}
		label := ""
		if i == 0 {
			label = "daily mean"
		}
		addRuns(top, runs, label, lineStyle(colFitted, 1.6))
	}
	periodLines(top, froms, pnames, z, true)
	if c := res.Gaugings; c != nil {
		var pts []gaugingPoint
		var outside plotter.XYs
		for _, g := range c.Gaugings {
			pts = append(pts, gaugingPoint{float64(g.Time.Unix()), g.Discharge, g.Quality})
			if g.OutsideShifted && finite(g.Discharge) {
				outside = append(outside, plotter.XY{X: float64(g.Time.Unix()), Y: g.Discharge})
			}
		}
		addGaugingPoints(top, pts, true)
		ringPoints(top, outside, "outside its band from the record")
	}
	top.Y.Min = math.Min(top.Y.Min, 0)
	top.Legend.Top = true
	top.Legend.XOffs = -vg.Points(6)
	top.Y.Tick.Marker = linearTicks{}
	top.X.Tick.Marker = timeTicks{z}
	return top
}

// dailyMeanRuns lays the daily means out as steps, each day's mean held
// from its start to the next day's, broken at days without a mean.
func dailyMeanRuns(days []record.DailyValue) [][]plotter.XY {
	var daily plotter.XYs
	runs := [][]plotter.XY{}
	for _, d := range days {
		if !finite(d.Mean) {
			if len(daily) > 0 {
				runs = append(runs, daily)
			}
			daily = nil
			continue
		}
		t := float64(d.Date.Unix())
		daily = append(daily, plotter.XY{X: t, Y: d.Mean}, plotter.XY{X: t + 86400, Y: d.Mean})
	}
	if len(daily) > 0 {
		runs = append(runs, daily)
	}
	return runs
}

// gaugeHeightPanel draws the gauge heights read, the effective gauge
// heights when a shift is applied, and the start of every rating period
// after the first.
func gaugeHeightPanel(res *record.Result, froms []time.Time, pnames []string, un unitNames) *plot.Plot {
	z := res.Zone
	bottom := newPanel("Gauge height", "Time ("+zoneName(z)+")", "Gauge height, "+un.length)
	addGrid(bottom)
	addRuns(bottom, recordRuns(res, func(u record.UnitValue) float64 { return u.Stage }), "gauge height read", lineStyle(colInk, 1.0))
	if len(res.Shifts) > 0 {
		addRuns(bottom, recordRuns(res, func(u record.UnitValue) float64 { return u.Effective }), "effective gauge height (shift applied)",
			lineStyle(colWater, 1.0, vg.Points(4), vg.Points(2)))
	}
	periodLines(bottom, froms, pnames, z, false)
	bottom.Legend.Top = true
	bottom.Legend.XOffs = -vg.Points(6)
	bottom.Y.Tick.Marker = linearTicks{n: 4}
	bottom.X.Tick.Marker = timeTicks{z}
	return bottom
}

// periodsOf returns the beginning and the rating name of each of the
// record's periods.
func periodsOf(res *record.Result) ([]time.Time, []string) {
	ps := make([]gauged.Period, len(res.Periods))
	for i, p := range res.Periods {
		ps[i] = p.Period
	}
	return periodStarts(ps)
}

// zoneName names a zone on an axis.
func zoneName(z *time.Location) string {
	if z == nil || z == time.UTC {
		return "UTC"
	}
	return z.String()
}

// periodStarts returns the beginning and the rating name of each period.
func periodStarts(ps []gauged.Period) ([]time.Time, []string) {
	froms := make([]time.Time, len(ps))
	ns := make([]string, len(ps))
	for i, p := range ps {
		froms[i] = p.From
		ns[i] = "no rating"
		if p.Rating != nil {
			ns[i] = p.Rating.Name
		}
	}
	return froms, ns
}
