package rating

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"sort"

	"wetline/subdivide"
)

// Options configure a rating table. Slope is required; the zero value of
// every other field is the default.
type Options struct {
	// Slope is the friction (energy) slope, dimensionless, > 0.
	Slope float64
	// Units is the unit system of the geometry and the results (default SI).
	Units Units
	// Geometry controls pockets and end extension (see subdivide.Options).
	Geometry subdivide.Options
	// Composite selects composite roughness by region (default Split: a
	// subsection at every n change); see CompositeGeometry.
	Composite Composite
}

// Table is a stage–discharge rating computed from section geometry.
type Table struct {
	// Name is the section's name.
	Name string
	// Units is the unit system of every value.
	Units Units
	// Slope is the friction slope used.
	Slope float64
	// Bottom is the lowest ground elevation; Top the lower end elevation
	// (as gauge heights when GaugeHeights is set).
	Bottom, Top float64
	// GaugeHeights reports a table whose stages are gauge heights read on a
	// gauge whose zero lies at elevation Datum: elevation = stage + Datum.
	// When false, stages are elevations and Datum is unused.
	GaugeHeights bool
	Datum        float64
	// Subsections is the subsection layout, in the order of Row.Subs.
	Subsections []subdivide.Subsection
	// Rows holds one row per stage, in the order the stages were given.
	Rows []Row
	// Warnings are facts a reviewer should see (ends extended, pockets).
	Warnings []string
	// Joins are the stages within the table's range at which pockets join
	// the flow and the rating steps (see PocketJoins); those that step by
	// JoinStepWarned or more are warned (JoinWarnings).
	Joins []PocketJoin
	// Kind names what the table is when its source says so (a fitted
	// rating, KindBackwater), for labels; "" when unknown.
	Kind string
}

// KindBackwater is the Kind of a step-backwater rating: its stages come
// from water-surface profiles, not from Manning's equation at one slope.
const KindBackwater = "step-backwater rating"

// MaxDefaultRows bounds the row count DefaultStages aims for.
const MaxDefaultRows = 50

// DefaultStages returns stages from the lowest ground point to the lower
// end of the section in a round step (1, 2 or 5 times a power of ten)
// giving at most about MaxDefaultRows rows. The first stage is the bottom
// rounded down to the step; the last is the top.
func DefaultStages(g subdivide.Geometry) []float64 {
	lo, hi := g.Bottom(), g.Top()
	if !(hi > lo) {
		return []float64{lo}
	}
	return defaultStages(lo, hi, NiceStep((hi-lo)/MaxDefaultRows))
}

// defaultStages lays out stages from lo to hi (lo < hi) as DefaultStages
// does, in steps of step.
func defaultStages(lo, hi, step float64) []float64 {
	k0 := math.Ceil(lo/step - StageEpsilon)
	start := multiple(k0, step)
	n := int(math.Ceil((hi-start)/step + StageEpsilon))
	out := []float64{lo}
	for _, h := range steppedStages(start, step, max(n, 0)) {
		if h >= hi-step*StageEpsilon {
			break
		}
		if h > lo+step*StageEpsilon {
			out = append(out, h)
		}
	}
	return append(out, hi)
}

// StageEpsilon is the fraction of a step within which two stages are taken
// to be the same when laying out a stage range.
const StageEpsilon = 1e-9

// NiceStep rounds x > 0 up to 1, 2 or 5 times a power of ten.
func NiceStep(x float64) float64 {
	if !(x > 0) || math.IsInf(x, 0) {
		return 1
	}
	p := math.Pow(10, math.Floor(math.Log10(x)))
	for _, m := range []float64{1, 2, 5, 10} {
		if m*p >= x*(1-StageEpsilon) {
			return m * p
		}
	}
	return 10 * p
}

// ErrStages is returned for an unusable stage range.
var ErrStages = errors.New("stage range")

// ErrStepTooFine is returned for a step that would lay out more than
// MaxStages stages over its range; it wraps ErrStages.
var ErrStepTooFine = fmt.Errorf("%w: the step is too fine", ErrStages)

// MaxStages bounds the number of stages one range may produce. A row of a
// table takes about 0.7 kB with six subsections (measured with the demo
// section: 690 bytes a row live), so the largest table takes under 1 GB;
// writers stream rows, adding little.
const MaxStages = 1_000_000

// StageRange returns stages from `from` to `to` inclusive in steps of
// `step` (> 0). The last stage is `to` even when the step does not divide
// the range. Stages of decimal steps are exact decimals: from 100.3 in
// steps of 0.1 the 34th stage is 103.6, not 103.60000000000001.
func StageRange(from, to, step float64) ([]float64, error) {
	switch {
	case !finiteAll(from, to, step):
		return nil, fmt.Errorf("%w: from %g to %g step %g: not finite", ErrStages, from, to, step)
	case to < from:
		return nil, fmt.Errorf("%w: from %g to %g: the range must rise (from ≤ to)", ErrStages, from, to)
	case !(step > 0):
		return nil, fmt.Errorf("%w: step %g: the step must be positive", ErrStages, step)
	}
	n := math.Floor((to-from)/step + StageEpsilon)
	if n+2 > MaxStages {
		return nil, fmt.Errorf("%w: %.3g stages from %g to %g is more than %d", ErrStepTooFine, n+1, from, to, MaxStages)
	}
	out := steppedStages(from, step, int(n))
	if to-out[len(out)-1] > step*StageEpsilon*10 {
		out = append(out, to)
	}
	return out, nil
}

func finiteAll(v ...float64) bool {
	for _, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}

// Compute rates geometry g at each stage: the full hydraulics of
// Hydraulics at friction slope opt.Slope (lengths, areas and discharges in
// opt.Units), with opt.Composite merging the n of each region first.
// Stages may come in any order; rows keep that order. A stage below the
// lowest ground gives a dry row; a stage above an end extends the section
// with a vertical wall, counted in the table's warnings. Where water
// standing behind higher ground joins the flow between the table's lowest
// and highest stage, the rating steps, and the warnings say where and by
// how much (PocketJoins). A vertical wall
// of the survey with its own n conveys with the subsection it faces
// (FoldWalls), which the warnings say (FoldedWallWarnings).
//
// A *subdivide.Profile is rated in one sweep over the sorted stages
// (subdivide.Profile.Sweep); any other geometry stage by stage with At.
// Either way the table, or the error of the first failing stage in the
// caller's order (with the rows before it), is the same.
//
// Preconditions: opt.Slope positive and finite (else ErrSlope). A wetted
// subsection without Manning's n is ErrNoN; geometry errors are
// subdivide's, wrapped.
//
// References:
//
//	Chow, V.T., 1959, Open-Channel Hydraulics: McGraw-Hill, sections 2-7
//	(energy and momentum coefficients) and 6-4 (conveyance of a
//	subdivided section).
func Compute(g subdivide.Geometry, stages []float64, opt Options) (Table, error) {
	g = CompositeGeometry(g, opt.Composite)
	t := Table{
		Units: opt.Units, Slope: opt.Slope,
		Bottom: g.Bottom(), Top: g.Top(),
		Subsections: g.Subsections(),
		Rows:        make([]Row, 0, len(stages)),
	}
	if p, ok := g.(interface{ Name() string }); ok {
		t.Name = p.Name()
	}
	if !(opt.Slope > 0) || math.IsInf(opt.Slope, 0) {
		return t, fmt.Errorf("slope %v: %w", opt.Slope, ErrSlope)
	}
	var maxL, maxR, maxStage, minStage, ponded float64
	pools, pondedStages := 0, 0
	maxStage, minStage = math.Inf(-1), math.Inf(1)
	add := func(r Row) {
		maxL = math.Max(maxL, r.ExtendedLeft)
		maxR = math.Max(maxR, r.ExtendedRight)
		pools = max(pools, r.Pools)
		if r.PondedPools > 0 {
			pondedStages++
			ponded = math.Max(ponded, r.PondedArea)
		}
		maxStage = math.Max(maxStage, r.Stage)
		minStage = math.Min(minStage, r.Stage)
	}
	if p, ok := g.(*subdivide.Profile); ok {
		rows, err := sweepRows(p, stages, opt, t.Bottom)
		for _, r := range rows {
			add(r)
		}
		t.Rows = rows
		if err != nil {
			return t, err
		}
	} else {
		for _, h := range stages {
			w, err := g.At(h, opt.Geometry)
			if err != nil {
				return t, err
			}
			r, err := Hydraulics(w, t.Bottom, opt.Slope, opt.Units)
			if err != nil {
				return t, fmt.Errorf("stage %g: %w", h, err)
			}
			add(r)
			t.Rows = append(t.Rows, r)
		}
	}
	if n := flagConveyanceDrops(t.Rows); n > 0 {
		t.Warnings = append(t.Warnings, conveyanceDropWarning(g, t.Rows, n, opt))
	}
	t.Warnings = append(t.Warnings, ExtensionWarnings(maxL, maxR, maxStage, opt.Units)...)
	t.Warnings = append(t.Warnings, PoolWarnings(pools, pondedStages, ponded, opt.Geometry, opt.Units)...)
	t.Joins = tableJoins(g, opt, minStage, maxStage)
	t.Warnings = append(t.Warnings, JoinWarnings(t.Joins, JoinWording{}, opt.Units)...)
	if w := ChannelLowWarning(t.Subsections, groundPoints(g), opt.Units); w != "" && !opt.Geometry.AllPools {
		t.Warnings = append(t.Warnings, w)
	}
	if w := AlternatingChannelWarning(t.Subsections, groundPoints(g)); w != "" && opt.Composite == Split {
		t.Warnings = append(t.Warnings, w)
	}
	if opt.Composite == Split {
		t.Warnings = append(t.Warnings, FoldedWallWarnings(t.Subsections, groundPoints(g), maxStage, opt.Units)...)
	}
	return t, nil
}

// ChannelLowWarning words the warning for bank stations that leave the
// section's lowest point outside the main channel (the subsections of
// region Channel of subs), or "" when the channel holds it or pts is nil.
// Water is counted as flowing only in the pool that holds the channel's
// lowest ground and in what joins it (subdivide.Options, unless every
// pool is counted), so below that ground nothing flows and the deepest
// water stands in pockets.
func ChannelLowWarning(subs []subdivide.Subsection, pts []subdivide.Point, u Units) string {
	from, to := math.Inf(1), math.Inf(-1)
	for _, s := range subs {
		if s.Region == subdivide.Channel {
			from, to = math.Min(from, s.From), math.Max(to, s.To)
		}
	}
	if len(pts) == 0 || !(to >= from) {
		return ""
	}
	low, in := pts[0], math.Min(subdivide.GroundAt(pts, from), subdivide.GroundAt(pts, to))
	for _, p := range pts {
		if p.Elevation < low.Elevation {
			low = p
		}
		if p.Station >= from && p.Station <= to {
			in = math.Min(in, p.Elevation)
		}
	}
	if !(in > low.Elevation) {
		return ""
	}
	L := u.Length()
	return fmt.Sprintf("the main channel between the bank stations %.6g and %.6g %s does not hold the section's lowest point (%.6g %s at station %.6g %s): "+
		"water is counted as flowing only where it joins the water between the banks, so below the channel's lowest ground, %.6g %s, nothing flows "+
		"and the deepest water stands in pockets (flagged pools); check the bank stations",
		from, to, L, low.Elevation, L, low.Station, L, in, L)
}

// groundPoints returns the ground line of a geometry that has one (a
// surveyed section, a shape, either with its n scaled or composite),
// else nil.
func groundPoints(g subdivide.Geometry) []subdivide.Point {
	switch p := g.(type) {
	case ScaledN:
		return groundPoints(p.Geometry)
	case *compositeGeometry:
		return groundPoints(p.inner)
	case interface{ Points() []subdivide.Point }:
		return p.Points()
	}
	return nil
}

// ExtensionWarnings words the warnings for stages above the section's ends.
func ExtensionWarnings(left, right, maxStage float64, u Units) []string {
	var out []string
	if left > 0 {
		out = append(out, fmt.Sprintf("stages up to %.3f %s are above the left end of the section: a vertical wall up to %.3f %s high was added there",
			maxStage, u.Length(), left, u.Length()))
	}
	if right > 0 {
		out = append(out, fmt.Sprintf("stages up to %.3f %s are above the right end of the section: a vertical wall up to %.3f %s high was added there",
			maxStage, u.Length(), right, u.Length()))
	}
	return out
}

// PoolWarnings words the warnings for water standing apart from the main
// channel: left out as not flowing at pondedStages stages (at most ponded
// area unit), or, when every pool is counted, counted in up to pools
// separate pools.
func PoolWarnings(pools, pondedStages int, ponded float64, g subdivide.Options, u Units) []string {
	switch {
	case g.AllPools && pools > 1:
		return []string{fmt.Sprintf(
			"at some stages the water stands in %d separate pools and all of them are counted as flowing; water in a pocket behind higher ground stores but does not convey in steady flow", pools)}
	case pondedStages > 0:
		return []string{fmt.Sprintf(
			"at %s water stands in pockets behind higher ground, apart from the main channel (up to %.4g %s, flagged %s): it is left out as not flowing until the ground between is overtopped",
			Counted(pondedStages, "stage", "stages"), ponded, u.Area(), FlagPools)}
	}
	return nil
}

// SortedStages returns a sorted copy of stages without duplicates.
func SortedStages(stages []float64) []float64 {
	out := append([]float64(nil), stages...)
	sort.Float64s(out)
	j := 0
	for i, v := range out {
		if i == 0 || v != out[j-1] {
			out[j] = v
			j++
		}
	}
	return out[:j]
}

// ConveyanceDropTolerance is the relative fall in conveyance below the
// highest conveyance at any lower stage that is flagged; smaller falls are
// round-off.
const ConveyanceDropTolerance = 1e-9

// conveyanceDropWarning words the warning for n rows flagged
// FlagConveyanceDrop. In a circular conduit the fall is the crown closing:
// the conveyance, and with it the discharge at the slope, is greatest at
// the stage PeakDischarge finds (about 0.94 of the diameter) and falls
// above it, the wetted perimeter growing faster than the area, so two
// stages carry each discharge between the full-flow one and the greatest.
// Elsewhere it is a sign that the subdivision does not suit the section.
func conveyanceDropWarning(g subdivide.Geometry, rows []Row, n int, opt Options) string {
	inner := g
	if cg, ok := g.(*compositeGeometry); ok {
		inner = cg.inner
	}
	c, pipe := inner.(*subdivide.Conduit)
	if !pipe {
		return fmt.Sprintf("conveyance falls as the stage rises at %s (flagged %s): the subdivision may not suit the section; check bank stations and n",
			Counted(n, "stage", "stages"), FlagConveyanceDrop)
	}
	L, Q := opt.Units.Length(), opt.Units.Discharge()
	from := math.Inf(1)
	for _, r := range rows {
		if slices.Contains(r.Flags, FlagConveyanceDrop) {
			from = math.Min(from, r.Stage)
		}
	}
	peak, between := "at about 0.94 of its diameter", "the full-flow discharge and the greatest"
	h, q, err := PeakDischarge(g, opt)
	if err == nil {
		peak = fmt.Sprintf("at stage %.4f %s (%.3f of its diameter %g %s; %.4g %s at slope %g)",
			h, L, (h-c.Bottom())/c.Diameter, c.Diameter, L, q, Q, opt.Slope)
		if full, err := newSolver(g, opt).row(c.Top()); err == nil {
			between = fmt.Sprintf("%.4g %s (flowing just full) and %.4g %s", full.Discharge, Q, q, Q)
		}
	}
	return fmt.Sprintf("conveyance falls as the stage rises at %s, from %.4f %s up to the crown at %.4f %s (flagged %s): "+
		"the pipe's conveyance is greatest %s and falls above it as the crown closes (the wetted perimeter grows faster than the area), "+
		"so each discharge between %s is carried at two stages",
		Counted(n, "stage", "stages"), from, L, c.Top(), L, FlagConveyanceDrop, peak, between)
}

// flagConveyanceDrops flags rows whose conveyance is below that of a lower
// stage, visiting rows in stage order; it returns how many were flagged.
func flagConveyanceDrops(rows []Row) int {
	idx := make([]int, len(rows))
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool { return rows[idx[a]].Stage < rows[idx[b]].Stage })
	best, n := 0.0, 0
	for _, i := range idx {
		k := rows[i].Conveyance
		if k < best*(1-ConveyanceDropTolerance) {
			rows[i].Flags = append(rows[i].Flags, FlagConveyanceDrop)
			n++
		}
		best = math.Max(best, k)
	}
	return n
}

// sweepRows rates a profile at every stage with one sweep and returns the
// rows in the caller's order. On failure it returns the rows before the
// first failing stage (in the caller's order) and that stage's error, as
// the stage-by-stage loop would.
func sweepRows(p *subdivide.Profile, stages []float64, opt Options, bottom float64) ([]Row, error) {
	rows := make([]Row, len(stages))
	first := len(stages) // index of the first failing stage
	var firstErr error
	err := p.Sweep(stages, opt.Geometry, func(i int, w subdivide.Wetted, err error) error {
		if i >= first {
			return nil
		}
		if err == nil {
			var r Row
			r, err = Hydraulics(w, bottom, opt.Slope, opt.Units)
			if err != nil {
				err = fmt.Errorf("stage %g: %w", stages[i], err)
			} else {
				rows[i] = r
				return nil
			}
		}
		first, firstErr = i, err
		return nil
	})
	if err != nil {
		return nil, err
	}
	if firstErr != nil {
		rows = rows[:first]
	}
	return rows, firstErr
}
