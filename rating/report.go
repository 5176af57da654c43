package rating

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"wetline/subdivide"
)

// Provenance says what a report was computed from and by what, so that
// every format of it can state it.
type Provenance struct {
	// Program names the program and its version, as "wetline 0.2.0".
	Program string
	// Inputs are the files read, as given; a workbook sheet follows its
	// file in brackets: field.xlsx['XS-2'].
	Inputs []string
	// Site is what is known of the site (blank fields unknown).
	Site Site
	// Notes are facts of the inputs a reviewer should see that are not
	// warnings, each with its position (how a coordinate survey's
	// stations were made from eastings and northings).
	Notes []string
}

// Site is what a survey or a command line says of a site: its name and
// identifier, the date of the survey, the datum of its elevations and the
// crew. Every field is free text as given; blank when unknown.
type Site struct {
	Name, ID, Surveyed, Datum, Crew string
}

// Known reports whether anything is known of the site.
func (s Site) Known() bool { return s != Site{} }

// Merge returns s with its blank fields taken from o.
func (s Site) Merge(o Site) Site {
	pick := func(a, b string) string {
		if a != "" {
			return a
		}
		return b
	}
	return Site{Name: pick(s.Name, o.Name), ID: pick(s.ID, o.ID), Surveyed: pick(s.Surveyed, o.Surveyed),
		Datum: pick(s.Datum, o.Datum), Crew: pick(s.Crew, o.Crew)}
}

// String writes the site in one line: "Tallow Creek at Mill Lane (id
// 0412), surveyed 2026-05-14, datum local, crew AB"; "" when unknown.
func (s Site) String() string {
	var parts []string
	head := s.Name
	if s.ID != "" {
		if head != "" {
			head += " "
		}
		head += "(id " + s.ID + ")"
	}
	if head != "" {
		parts = append(parts, head)
	}
	for _, f := range []struct{ label, v string }{{"surveyed", s.Surveyed}, {"datum", s.Datum}, {"crew", s.Crew}} {
		if f.v != "" {
			parts = append(parts, f.label+" "+f.v)
		}
	}
	return strings.Join(parts, ", ")
}

// Figure is a picture of a report: a PNG image, the file name it is
// written under, and a caption saying what it shows.
type Figure struct {
	Name, Caption string
	PNG           []byte
}

// Ground is a surveyed section as it was read, for the reports that show
// it: the ground line with its n and banks after any overrides, and each
// point's label (a mark other than bank) and note.
type Ground struct {
	// Section is the ground line; no points for a built closed conduit.
	Section subdivide.Section
	// Labels and Notes hold one entry per point ("" for none); either may
	// be nil.
	Labels, Notes []string
	// Source names the survey: its file (and sheet), or a shape's spec.
	Source string
}

// RatingReport is the report of a section's stage–discharge rating: the
// table as asked for, the same section rated at every hundredth for a
// printed lookup sheet, the ground, the warnings and the figures.
type RatingReport struct {
	Provenance Provenance
	// Table is the rating at the stages asked for, in their order.
	Table Table
	// Lookup is the rating at every hundredth of a unit of stage over the
	// table's range (LookupStages); no rows when not asked for or when the
	// range is too long.
	Lookup Table
	// Ground is the section as surveyed.
	Ground Ground
	// Warnings gathers the warnings of the survey and the table.
	Warnings []string
	// Figures are the report's pictures (none until drawn).
	Figures []Figure
	// Calibration says how the section's n was calibrated on gaugings
	// before rating; nil when it was not.
	Calibration *NCalibration
}

// NCalibration states a calibration of a section's n on gaugings: the
// factor every n (or the channel's) was multiplied by, with its standard
// error and the scatter of the gaugings about the calibrated rating.
type NCalibration struct {
	// Source names the gaugings (their file).
	Source string
	// Gaugings is the number of gaugings the factor was fitted on.
	Gaugings int
	// ChannelOnly reports that only the channel's n was scaled.
	ChannelOnly bool
	// Factor is the factor on n (dimensionless).
	Factor float64
	// FactorStandardErrorPercent is the factor's standard error in percent
	// of it; NaN from one gauging.
	FactorStandardErrorPercent float64
	// StandardErrorPercent is the standard error of estimate of the
	// calibrated rating against the gaugings, in percent (their scatter
	// about it); NaN from one gauging.
	StandardErrorPercent float64
}

// RateOptions configure Rate. The zero value of Lookup leaves the lookup
// table out; that of GaugeHeights rates elevations.
type RateOptions struct {
	Options
	// Lookup also rates every hundredth of stage over the table's range.
	Lookup bool
	// GaugeHeights makes the stages given, and those of the table, gauge
	// heights on a gauge whose zero lies at elevation Datum (length unit):
	// the section is rated at elevation = gauge height + Datum.
	GaugeHeights bool
	Datum        float64
}

// Rate computes the rating report of geometry g at the given stages
// (Compute; gauge heights with opt.GaugeHeights), and with opt.Lookup the
// lookup table at every hundredth over the same range (a range too long
// for it gives a warning and no lookup table). The report's Ground, Provenance and Figures are left for the
// caller. Errors are Compute's.
func Rate(g subdivide.Geometry, stages []float64, opt RateOptions) (RatingReport, error) {
	t, err := opt.compute(g, stages)
	rep := RatingReport{Table: t, Warnings: append([]string(nil), t.Warnings...)}
	if err != nil || !opt.Lookup {
		return rep, err
	}
	lo, hi, ok := t.StageRange()
	if !ok {
		return rep, nil
	}
	fine, err := LookupStages(lo, hi)
	if err != nil {
		rep.Warnings = append(rep.Warnings, fmt.Sprintf("no lookup table: %v", err))
		return rep, nil
	}
	if rep.Lookup, err = opt.compute(g, fine); err != nil {
		return rep, fmt.Errorf("lookup table: %w", err)
	}
	return rep, nil
}

// compute rates g at stages, as gauge heights when asked.
func (opt RateOptions) compute(g subdivide.Geometry, stages []float64) (Table, error) {
	if !opt.GaugeHeights {
		return Compute(g, stages, opt.Options)
	}
	elev := make([]float64, len(stages))
	for i, h := range stages {
		elev[i] = DecimalDifference(h, -opt.Datum) // 0.7 + 100 is 100.7, as typed
	}
	t, err := Compute(g, elev, opt.Options)
	t.GaugeHeights, t.Datum = true, opt.Datum
	t.Bottom = DecimalDifference(t.Bottom, opt.Datum)
	t.Top = DecimalDifference(t.Top, opt.Datum)
	for i := range t.Rows {
		t.Rows[i].Stage = stages[i]
	}
	t.rewordJoins(JoinWording{Stage: func(z float64) string { return GaugeHeightWords(z, opt.Datum, opt.Units) }}, opt.Units) // at the table's gauge heights
	return t, err
}

// StageRange returns the lowest and highest stage of the table's rows;
// ok is false for a table without rows.
func (t Table) StageRange() (lo, hi float64, ok bool) {
	l, h, ok := t.Extremes()
	if !ok {
		return math.NaN(), math.NaN(), false
	}
	return l.Stage, h.Stage, true
}

// Bottom mismatch tolerances of BottomMismatch, by unit system: 0.5 m and
// 1.5 ft (about 0.46 m). Chosen, not published: more than the scour or fill
// between two surveys of one section usually is (a few tenths of a metre),
// less than a gauge datum offset mistaken or forgotten (whole metres or
// feet, often tens).
const (
	BottomMismatchSI = 0.5 // m
	BottomMismatchUS = 1.5 // ft
)

// BottomMismatch compares the bottom of a table read back with a depth
// column, the elevation stage − depth (plus Datum for gauge heights) of
// its first row with a positive depth, with lowest, the lowest ground
// elevation of the section drawn with it (length unit). It returns a
// warning naming both, of a datum mismatch, when they differ by more than
// BottomMismatchSI or BottomMismatchUS; "" when they agree or when
// lowest is not finite. When no row has a positive depth (a table with no
// depth column: a fit's, or any stage–discharge table) there is no bottom
// to compare, and the warning says that the check cannot be made.
// section names the survey in the warning.
func (t Table) BottomMismatch(lowest float64, section string) string {
	if !finiteAll(lowest) {
		return ""
	}
	for _, r := range t.Rows {
		if !(r.Depth > 0) {
			continue
		}
		bottom, how := r.Stage-r.Depth, "stage − depth"
		if t.GaugeHeights {
			bottom += t.Datum
			how += " + datum"
		}
		tol := BottomMismatchSI
		if t.Units == US {
			tol = BottomMismatchUS
		}
		if d := bottom - lowest; finiteAll(d) && math.Abs(d) > tol {
			l := t.Units.Length()
			return fmt.Sprintf("the table's bottom, elevation %.3f %s (%s), lies %.3f %s %s the lowest point of %s (%.3f %s), more than %g %s: check the datum of the table's stages (for gauge heights, the elevation of the gauge's zero) and that the section is the table's",
				bottom, l, how, math.Abs(d), l, map[bool]string{true: "above", false: "below"}[d > 0], section, lowest, l, tol, l)
		}
		return ""
	}
	return fmt.Sprintf("the table has no depth column, so its datum cannot be checked against the lowest point of %s (%.3f %s): check that the table is the section's and, for gauge heights, the elevation of the gauge's zero",
		section, lowest, t.Units.Length())
}

// Extremes returns the rows of the lowest and the highest stage (the
// first of equal stages); ok is false for a table without rows.
func (t Table) Extremes() (lo, hi Row, ok bool) {
	if len(t.Rows) == 0 {
		return Row{}, Row{}, false
	}
	lo, hi = t.Rows[0], t.Rows[0]
	for _, r := range t.Rows[1:] {
		if r.Stage < lo.Stage {
			lo = r
		}
		if r.Stage > hi.Stage {
			hi = r
		}
	}
	return lo, hi, true
}

// MaxLookupStages bounds the stages of a lookup table (a tenth as many
// printed rows).
const MaxLookupStages = 200_000

// ErrLookupRange is returned by LookupStages for a range too long to print.
var ErrLookupRange = errors.New("stage range too long for a lookup table")

// maxExactInteger is the largest integer a float64 holds exactly, 2^53.
const maxExactInteger = 1 << 53

// lookupRound absorbs round-off when a stage is turned into hundredths:
// a stage within lookupRound hundredths of one is taken to be on it.
const lookupRound = 1e-6

// LookupStages returns the stages of a lookup table from bottom to top:
// every hundredth of a unit, k/100 for integer k, starting at the tenth at
// or below bottom (stages below the ground are dry: zero discharge) and
// ending at the last hundredth at or below top. A range of more than
// MaxLookupStages stages, or one that is not finite, is ErrLookupRange.
func LookupStages(bottom, top float64) ([]float64, error) {
	if !finiteAll(bottom, top) || top < bottom {
		return nil, fmt.Errorf("%w: from %g to %g", ErrLookupRange, bottom, top)
	}
	if math.Abs(bottom)*100 > maxExactInteger || math.Abs(top)*100 > maxExactInteger {
		return nil, fmt.Errorf("%w: stages of %g to %g are too large to count in hundredths", ErrLookupRange, bottom, top)
	}
	k0 := int64(math.Floor(bottom*10+lookupRound)) * 10
	k1 := int64(math.Floor(top*100 + lookupRound))
	if k1-k0+1 > MaxLookupStages {
		return nil, fmt.Errorf("%w: %d stages from %g to %g is more than %d", ErrLookupRange, k1-k0+1, bottom, top, MaxLookupStages)
	}
	out := make([]float64, 0, k1-k0+1)
	for k := k0; k <= k1; k++ {
		out = append(out, float64(k)/100)
	}
	return out, nil
}

// Hundredths returns a stage as an integer number of hundredths of a unit,
// and whether it lies on one (within round-off).
func Hundredths(h float64) (int64, bool) {
	k := math.Round(h * 100)
	return int64(k), math.Abs(h*100-k) <= lookupRound*100
}

// StageSpec is how the stages of a table are asked for: a list, or a
// range from From to To in steps of Step. A bound not set defaults to the
// lowest ground point or the lower end of the section, a zero Step to a
// round step giving about MaxDefaultRows rows. The zero value asks for
// DefaultStages.
type StageSpec struct {
	// List holds explicit stages (length unit), any order: a table is
	// laid out in increasing stage, repeats once.
	List []float64
	// From and To bound a range (length unit) when FromSet and ToSet.
	From, To       float64
	FromSet, ToSet bool
	// Step is the range's step (length unit; zero: a round step).
	Step float64
	// Datum, for stages that are gauge heights, is the elevation of the
	// gauge's zero: defaults are laid out from bottom − Datum to top −
	// Datum (zero: stages are elevations).
	Datum float64
	// MinStep, when positive, is the finest step a table writes apart
	// (length unit; 0.0001 for stages written to 4 decimals): a round
	// default step finer than it is raised to it, and no default stage is
	// laid out closer than it to the range's ends (StagesWarn). Zero: no
	// bound.
	MinStep float64
}

// ErrStageSpec is returned for a list given together with a range.
var ErrStageSpec = errors.New("give a list of stages or a range, not both")

// ErrNoLowPoint is returned for default stages of a section whose lower
// end is its lowest point: it holds no water below its ends.
var ErrNoLowPoint = errors.New("the section's lower end is its lowest point, so it holds no water below its ends: ask for stages above it (the ends are then extended with vertical walls)")

// Stages returns the stages the spec asks for in geometry g: the list
// sorted into increasing stage with repeats dropped (a rating table's
// stages increase from row to row), DefaultStages, or StageRange over the range with its defaults
// filled. Errors wrap ErrStageSpec or ErrStages. See StagesWarn for
// MinStep.
func (s StageSpec) Stages(g subdivide.Geometry) ([]float64, error) {
	st, _, err := s.StagesWarn(g)
	return st, err
}

// StagesWarn is Stages, and also returns a warning for a reviewer when
// the round default step (about MaxDefaultRows rows over the range) is
// finer than MinStep and was raised to it. With MinStep set, no stage of a
// default layout lies closer than MinStep to the first or the last, so a
// table that writes its stages to MinStep writes each default stage apart
// (the ends excepted, when the whole range is shorter than MinStep). A
// given Step and a List are used as given.
func (s StageSpec) StagesWarn(g subdivide.Geometry) ([]float64, []string, error) {
	ranged := s.FromSet || s.ToSet || s.Step != 0
	if len(s.List) > 0 {
		if ranged {
			return nil, nil, ErrStageSpec
		}
		for _, h := range s.List {
			if !finiteAll(h) {
				return nil, nil, fmt.Errorf("%w: %v is not a finite stage", ErrStages, h)
			}
		}
		return SortedStages(s.List), nil, nil
	}
	if !ranged {
		if !(g.Top() > g.Bottom()) {
			return nil, nil, fmt.Errorf("%w (lowest point and lower end at %g)", ErrNoLowPoint, s.gaugeHeight(g.Bottom()))
		}
		lo, hi := s.gaugeHeight(g.Bottom()), s.gaugeHeight(g.Top())
		step := s.defaultStep(lo, hi)
		st := s.apart(defaultStages(lo, hi, step))
		return st, s.raised(lo, hi, len(st)), nil
	}
	from, to, step := s.From, s.To, s.Step
	if !s.FromSet {
		from = s.gaugeHeight(g.Bottom())
	}
	if !s.ToSet {
		to = s.gaugeHeight(g.Top())
	}
	if step != 0 {
		st, err := StageRange(from, to, step)
		return st, nil, err
	}
	st, err := StageRange(from, to, s.defaultStep(from, to))
	if err != nil {
		return nil, nil, err
	}
	st = s.apart(st)
	return st, s.raised(from, to, len(st)), nil
}

// gaugeHeight is the stage of an elevation: elevation − Datum, as the
// float64 nearest the exact decimal difference (100.3 − 100 is 0.3, not
// 0.29999999999999716), so the ends of a default layout are the values a
// script matching stages looks for.
func (s StageSpec) gaugeHeight(elevation float64) float64 {
	if s.Datum == 0 {
		return elevation
	}
	return DecimalDifference(elevation, s.Datum)
}

// roundStep is the round default step from lo to hi: about MaxDefaultRows
// rows.
func roundStep(lo, hi float64) float64 { return NiceStep((hi - lo) / MaxDefaultRows) }

// defaultStep is the round step from lo to hi, raised to MinStep when
// finer.
func (s StageSpec) defaultStep(lo, hi float64) float64 {
	if s.finer(roundStep(lo, hi)) {
		return s.MinStep
	}
	return roundStep(lo, hi)
}

// finer reports whether step is finer than MinStep, beyond round-off.
func (s StageSpec) finer(step float64) bool { return step < s.MinStep*(1-minStepTolerance) }

// raised returns the warning that the round step from lo to hi was raised
// to MinStep, giving rows stages; nil when it was not.
func (s StageSpec) raised(lo, hi float64, rows int) []string {
	step := roundStep(lo, hi)
	if !s.finer(step) {
		return nil
	}
	return []string{fmt.Sprintf("the stage range from %g to %g is too short for about %d rows: its round step, %.4g, is finer than %g, "+
		"the finest step its table writes apart, so its stages are laid out %g apart instead (%d rows)",
		lo, hi, MaxDefaultRows, step, s.MinStep, s.MinStep, rows)}
}

// apart drops, when MinStep is set, the stages between the first and the
// last of a default layout that lie closer than MinStep to either.
func (s StageSpec) apart(st []float64) []float64 {
	if !(s.MinStep > 0) || len(st) < 3 {
		return st
	}
	gap := s.MinStep * (1 - minStepTolerance)
	lo, hi := st[0], st[len(st)-1]
	out := append(make([]float64, 0, len(st)), lo)
	for _, h := range st[1 : len(st)-1] {
		if h-lo >= gap && hi-h >= gap {
			out = append(out, h)
		}
	}
	return append(out, hi)
}

// minStepTolerance is the relative round-off allowed when a gap between
// two laid-out stages is held to MinStep: multiples of a decimal step sit
// a few ulps either side of it.
const minStepTolerance = 1e-6

// DefaultStageSpec asks for the default stages (see StageSpec): it is the
// zero value.
func DefaultStageSpec() StageSpec { return StageSpec{} }
