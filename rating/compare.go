package rating

import (
	"fmt"
	"math"
	"strings"

	"wetline/subdivide"
)

// SectionGeometry is what a comparison of two surveys shows of one survey
// at a stage.
type SectionGeometry struct {
	// Area (length unit²), WettedPerimeter and TopWidth (length unit).
	Area, WettedPerimeter, TopWidth float64
	// Conveyance is Manning's K = Σ (k/n)·A·R^(2/3) over the subsections
	// (discharge unit: K = Q/√S).
	Conveyance float64
}

// SectionDifference is two surveys of one section at one stage.
type SectionDifference struct {
	// Stage is the water-surface elevation (length unit).
	Stage float64
	// A and B are the two surveys; Difference is B − A, field by field.
	A, B, Difference SectionGeometry
	// ConveyancePercent is 100·(K_B − K_A)/K_A (NaN where K_A is zero).
	ConveyancePercent float64
}

// SectionComparison is two surveys of one section over a range of stage:
// scour or fill between them, the usual cause of a shift. It is the report
// of a comparison of two surveys, in every format.
type SectionComparison struct {
	// Provenance says what was read and by what (set by the caller).
	Provenance Provenance
	// A and B name the surveys.
	A, B string
	// GroundA and GroundB are the surveys as read, for the figure that
	// overlays them (set by the caller; no points for none).
	GroundA, GroundB Ground
	// Units is the unit system of every value.
	Units Units
	// Rows are in increasing stage, each stage once, whatever the order
	// of the stages given.
	Rows []SectionDifference
	// Warnings gather both tables' warnings, each prefixed with its survey.
	Warnings []string
	// Figures are the report's pictures (none until drawn).
	Figures []Figure
	// DatumA and DatumB are the datums the surveys name (their site
	// keys; "" when not named), set by SetDatums.
	DatumA, DatumB string
	// SiteA and SiteB are what each survey says of its site (its date
	// above all), as read; set by SetSites.
	SiteA, SiteB Site
}

// SetSites records what surveys A and B say of their site and their
// datums (SetDatums). When both give a survey date and the dates differ,
// the date of Provenance.Site is cleared, as a datum is: the comparison
// was surveyed on neither date alone, and SiteA and SiteB carry both.
func (c *SectionComparison) SetSites(a, b Site) {
	c.SiteA, c.SiteB = a, b
	if x, y := strings.TrimSpace(a.Surveyed), strings.TrimSpace(b.Surveyed); x != "" && y != "" && x != y {
		c.Provenance.Site.Surveyed = ""
	}
	c.SetDatums(a.Datum, b.Datum)
}

// SetDatums records the datums surveys A and B name (free text, "" when
// not named) and, when both are named and differ (ignoring case and
// surrounding blanks), adds a warning naming both and clears the datum of
// Provenance.Site (it is neither survey's alone): the differences of the
// comparison then mix a change of datum with scour or fill.
func (c *SectionComparison) SetDatums(a, b string) {
	c.DatumA, c.DatumB = a, b
	if c.DatumsDiffer() {
		c.Provenance.Site.Datum = ""
		c.Warnings = append(c.Warnings, fmt.Sprintf("the surveys name different datums (%s: %q; %s: %q): the comparison takes their elevations as one datum, so bring both to one before reading the differences as scour or fill",
			c.A, strings.TrimSpace(a), c.B, strings.TrimSpace(b)))
	}
}

// DatumsDiffer reports whether both surveys name a datum and the two
// differ (ignoring case and surrounding blanks).
func (c *SectionComparison) DatumsDiffer() bool {
	a, b := strings.TrimSpace(c.DatumA), strings.TrimSpace(c.DatumB)
	return a != "" && b != "" && !strings.EqualFold(a, b)
}

// CompareSections computes area, wetted perimeter, top width and
// conveyance of two surveys of one section (before and after a flood, say)
// at each stage, with Compute, and their differences B − A. Both surveys
// are in one datum and unit system. The stages are compared in increasing
// order with repeats dropped (as StageSpec lays out a list); stages itself
// is not changed. Nil stages mean a default range: from
// the lower of the two lowest points to the lower of the two sections'
// tops, in a round step (as DefaultStages lays out one section). The slope
// in opt is not needed (conveyance does not depend on it); when it is not
// given, 1 is used internally, and the tables' warnings of pockets joining
// the flow word their steps as conveyance. Errors are those of Compute (ErrNoN for a
// wetted subsection without Manning's n, among others).
func CompareSections(a, b subdivide.Geometry, stages []float64, opt Options) (SectionComparison, error) {
	c := SectionComparison{A: geometryName(a, "A"), B: geometryName(b, "B"), Units: opt.Units}
	if stages == nil {
		stages = commonStages(a, b)
	} else {
		stages = SortedStages(stages)
	}
	noSlope := !(opt.Slope > 0)
	if noSlope {
		opt.Slope = 1
	}
	ta, err := Compute(a, stages, opt)
	if err != nil {
		return c, fmt.Errorf("%s: %w", c.A, err)
	}
	tb, err := Compute(b, stages, opt)
	if err != nil {
		return c, fmt.Errorf("%s: %w", c.B, err)
	}
	if noSlope { // the discharges are at the slope 1 used within: word the joins' steps as conveyance
		ta.rewordJoins(JoinWording{Conveyance: true}, opt.Units)
		tb.rewordJoins(JoinWording{Conveyance: true}, opt.Units)
	}
	for _, w := range ta.Warnings {
		c.Warnings = append(c.Warnings, c.A+": "+w)
	}
	for _, w := range tb.Warnings {
		c.Warnings = append(c.Warnings, c.B+": "+w)
	}
	for i, h := range stages {
		ga, gb := geometryOf(ta.Rows[i]), geometryOf(tb.Rows[i])
		d := SectionDifference{Stage: h, A: ga, B: gb, ConveyancePercent: math.NaN(), Difference: SectionGeometry{
			Area: gb.Area - ga.Area, WettedPerimeter: gb.WettedPerimeter - ga.WettedPerimeter,
			TopWidth: gb.TopWidth - ga.TopWidth, Conveyance: gb.Conveyance - ga.Conveyance,
		}}
		if ga.Conveyance > 0 {
			d.ConveyancePercent = 100 * d.Difference.Conveyance / ga.Conveyance
		}
		c.Rows = append(c.Rows, d)
	}
	return c, nil
}

func geometryOf(r Row) SectionGeometry {
	return SectionGeometry{Area: r.Area, WettedPerimeter: r.WettedPerimeter, TopWidth: r.TopWidth, Conveyance: r.Conveyance}
}

func geometryName(g subdivide.Geometry, fallback string) string {
	if p, ok := g.(interface{ Name() string }); ok && p.Name() != "" {
		return p.Name()
	}
	return fallback
}

// commonStages lays out round stages from the lower bottom to the lower
// top of two geometries.
func commonStages(a, b subdivide.Geometry) []float64 {
	lo, hi := math.Min(a.Bottom(), b.Bottom()), math.Min(a.Top(), b.Top())
	if !(hi > lo) {
		return []float64{lo}
	}
	step := NiceStep((hi - lo) / MaxDefaultRows)
	start := math.Ceil(lo/step-StageEpsilon) * step
	out := []float64{lo}
	for i := 0; ; i++ {
		h := start + float64(i)*step
		if h >= hi-step*StageEpsilon {
			break
		}
		if h > lo+step*StageEpsilon {
			out = append(out, h)
		}
	}
	return append(out, hi)
}
