package plotting

import (
	"fmt"
	"io"
	"sort"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"wetline/rating"
)

// PropertyRow is the hydraulic geometry of a section at one stage.
// Undefined values are NaN and break the drawn line.
type PropertyRow struct {
	// Stage is the water-surface elevation (length unit).
	Stage float64
	// Area (length²), TopWidth (length), HydraulicRadius (length).
	Area, TopWidth, HydraulicRadius float64
	// Conveyance K (discharge unit at unit slope).
	Conveyance float64
	// Alpha is the energy (velocity-head) coefficient, dimensionless.
	Alpha float64
	// MeanVelocity (length/s); NaN when unknown.
	MeanVelocity float64
}

// PropertiesPlot is a small-multiples figure of hydraulic properties
// against stage, with the bankfull stage marked across every panel.
type PropertiesPlot struct {
	// Site and Section name the place in the title.
	Site, Section string
	// Subtitle is an optional second line under the title.
	Subtitle string
	// Units is the unit system of every value.
	Units rating.Units
	// Rows are the properties by stage, in any order.
	Rows []PropertyRow
	// Bankfull is the stage at which the water leaves the main channel
	// (length unit), marked when HasBankfull is true; see
	// subdivide.Section.Bankfull.
	Bankfull    float64
	HasBankfull bool
	// Caution is the line at the foot; "" gives DefaultCaution.
	Caution string
	// Size is the pixel size (zero value: the default).
	Size Size
}

// PropertiesFromTable copies the properties of a rating table.
func PropertiesFromTable(t rating.Table) []PropertyRow {
	out := make([]PropertyRow, len(t.Rows))
	for i, r := range t.Rows {
		out[i] = PropertyRow{Stage: r.Stage, Area: r.Area, TopWidth: r.TopWidth, HydraulicRadius: r.HydraulicRadius,
			Conveyance: r.Conveyance, Alpha: r.Alpha, MeanVelocity: r.MeanVelocity}
	}
	return out
}

// Properties draws area, top width, hydraulic radius, conveyance, α and
// mean velocity against stage, one panel each, as a PNG into w, in the
// units of pp.Units (stage in the length unit). Rows without a finite
// stage are left out; a NaN value breaks its panel's line, and a panel
// whose values are all undefined, or whose axis would run beyond what a
// float64 holds (see ErrRange), is left out with a warning. With a
// finite bankfull stage, the overbank zone above it is shaded and
// bankfull marked on every panel. The caution is at the foot. The error
// wraps ErrNoData when no row has a stage or no property a defined value,
// ErrRange when every panel with values was left out for its range, and
// ErrSize or ErrDraw when the figure cannot be drawn.
func Properties(w io.Writer, pp PropertiesPlot) (Result, error) {
	var res Result
	un := names(pp.Units)
	rows := stagedRows(pp.Rows)
	if len(rows) == 0 {
		return res, fmt.Errorf("%w: the properties figure needs rows with a stage", ErrNoData)
	}
	var panels []*plot.Plot
	var unDrawable error // the last panel left out by drawable
	for _, q := range propertyQuantities(un) {
		p, ok := pp.panel(q, rows)
		if !ok {
			res.Warnings = append(res.Warnings, q.title+": no defined values; panel left out")
			continue
		}
		if err := drawable(p); err != nil {
			res.Warnings = append(res.Warnings, q.title+": values span a range that cannot be drawn; panel left out")
			unDrawable = err
			continue
		}
		panels = append(panels, p)
	}
	switch {
	case len(panels) == 0 && unDrawable != nil:
		return res, unDrawable
	case len(panels) == 0:
		return res, fmt.Errorf("%w: no property has a defined value", ErrNoData)
	}
	cols := 3
	if len(panels) <= 2 {
		cols = len(panels)
	}
	nrows := (len(panels) + cols - 1) / cols
	for i, p := range panels {
		if i%cols == 0 {
			p.Y.Label.Text = "Stage, " + un.length
		}
	}
	fig := figure{title: titleOf(pp.Site, pp.Section, "hydraulic properties against stage"), subtitle: pp.subtitle(un),
		foot: []string{orDefault(pp.Caution, DefaultCaution)}, footColor: colCaution}
	err := render(w, pp.Size, fig, func(c draw.Canvas) error {
		tiles := draw.Tiles{Rows: nrows, Cols: cols, PadX: vg.Points(16), PadY: vg.Points(14)}
		for i, p := range panels {
			p.Draw(tiles.At(c, i%cols, i/cols))
		}
		return nil
	})
	return res, err
}

// propertyQuantity is one panel of the properties figure.
type propertyQuantity struct {
	title, unit string
	// fromZero starts the value axis at zero when all values are positive.
	fromZero bool
	get      func(PropertyRow) float64
}

// propertyQuantities returns the panels of the properties figure in
// their order.
func propertyQuantities(un unitNames) []propertyQuantity {
	return []propertyQuantity{
		{"Flow area A", un.area, true, func(r PropertyRow) float64 { return r.Area }},
		{"Top width T", un.length, true, func(r PropertyRow) float64 { return r.TopWidth }},
		{"Hydraulic radius R", un.length, true, func(r PropertyRow) float64 { return r.HydraulicRadius }},
		{"Conveyance K", un.discharge, true, func(r PropertyRow) float64 { return r.Conveyance }},
		{"Energy coefficient α", "dimensionless", false, func(r PropertyRow) float64 { return r.Alpha }},
		{"Mean velocity V", un.velocity, true, func(r PropertyRow) float64 { return r.MeanVelocity }},
	}
}

// stagedRows returns the rows with a finite stage, sorted by stage.
func stagedRows(in []PropertyRow) []PropertyRow {
	rows := make([]PropertyRow, 0, len(in))
	for _, r := range in {
		if finite(r.Stage) {
			rows = append(rows, r)
		}
	}
	sortRows(rows)
	return rows
}

// marksBankfull reports a bankfull stage to mark.
func (pp PropertiesPlot) marksBankfull() bool { return pp.HasBankfull && finite(pp.Bankfull) }

// panel draws quantity q against stage over the rows (sorted by stage),
// with the overbank zone and bankfull when known; false when no row has
// a defined value.
func (pp PropertiesPlot) panel(q propertyQuantity, rows []PropertyRow) (*plot.Plot, bool) {
	p := newPanel(q.title, q.unit, "")
	p.Title.TextStyle.Font = sansBold(sizeLabel)
	if pp.marksBankfull() {
		p.Add(zoneAbove{y: pp.Bankfull, color: colOverbank})
	}
	addGrid(p)
	p.X.Tick.Marker, p.Y.Tick.Marker = linearTicks{n: 4}, linearTicks{}
	if addPropertyRuns(p, rows, q.get) == 0 {
		return nil, false
	}
	if pp.marksBankfull() {
		p.Add(hline{y: pp.Bankfull, style: lineStyle(colBank, 1.4, vg.Points(7), vg.Points(3)),
			label: "bankfull " + fmtStage(pp.Bankfull)})
	}
	p.Y.Min = rows[0].Stage
	p.Y.Max = rows[len(rows)-1].Stage
	if q.fromZero && p.X.Min > 0 {
		p.X.Min = 0
	}
	return p, true
}

// addPropertyRuns draws the values get takes from the rows against stage
// as lines with points, broken where a value is undefined; it returns
// the number of points drawn.
func addPropertyRuns(p *plot.Plot, rows []PropertyRow, get func(PropertyRow) float64) int {
	n := 0
	var runXY plotter.XYs
	flush := func() {
		if len(runXY) == 0 {
			return
		}
		l, s, err := plotter.NewLinePoints(runXY)
		if err == nil {
			l.LineStyle = lineStyle(colHydraulic, 1.8)
			s.GlyphStyle = draw.GlyphStyle{Color: colHydraulic, Radius: vg.Points(1.8), Shape: draw.CircleGlyph{}}
			p.Add(l, s)
		}
		runXY = nil
	}
	for _, r := range rows {
		v := get(r)
		if !finite(v) {
			flush()
			continue
		}
		runXY = append(runXY, plotter.XY{X: v, Y: r.Stage})
		n++
	}
	flush()
	return n
}

// subtitle is pp.Subtitle, or else what the figure shows and where the
// overbanks flow.
func (pp PropertiesPlot) subtitle(un unitNames) string {
	switch {
	case pp.Subtitle != "":
		return pp.Subtitle
	case pp.marksBankfull():
		return fmt.Sprintf("Shaded above bankfull, %s %s (the lower bank top), where the overbanks flow", fmtStage(pp.Bankfull), un.length)
	}
	return "One panel per property, stage on the vertical axis"
}

func sortRows(rows []PropertyRow) {
	sort.SliceStable(rows, func(i, j int) bool { return rows[i].Stage < rows[j].Stage })
}
