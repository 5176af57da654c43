package rating

import (
	"fmt"
	"math"
	"strings"

	"wetline/subdivide"
)

// PocketJoin is a stage at which water standing behind higher ground joins
// the flow of a section's main channel (subdivide.Join): below it and at
// it the pocket's water is left out as not flowing, just above it it
// conveys, so the rating steps there.
type PocketJoin struct {
	// Stage is the elevation of the crest overtopped (the surveyed
	// ground's, exactly).
	Stage float64
	// Pockets are the pockets that join at Stage (one, unless two crests
	// have the same elevation), with the stations that bound them.
	Pockets []subdivide.Join
	// Before is the hydraulics at Stage, the pockets left out; After just
	// above it (subdivide.Join.Above), the pockets counted: the limit of
	// the rating from above.
	Before, After Row
}

// Step is the relative rise of discharge at the join, After over Before
// less one (+Inf when nothing flows before).
func (j PocketJoin) Step() float64 {
	return j.After.Discharge/j.Before.Discharge - 1
}

// PocketJoins returns the stages at which pockets join the main channel's
// flow on geometry g (a surveyed section, with its n scaled or merged
// into composites), with the hydraulics of opt on either side of each, in
// ascending order of stage. It finds none with opt.Geometry.AllPools,
// which counts every pocket at every stage, or on geometry without a
// ground line. A stage the options cannot rate (above an end with
// NoExtend) is left out.
//
// The stage is the crest of the ground between pocket and channel, from
// the survey (subdivide.Profile.Joins); the discharges are Manning's on
// the section at the crest, without the pocket, and just above it, with it
// (Chow, 1959, Open-Channel Hydraulics, McGraw-Hill, section 6-4).
func PocketJoins(g subdivide.Geometry, opt Options) ([]PocketJoin, error) {
	if opt.Geometry.AllPools {
		return nil, nil
	}
	cg := CompositeGeometry(g, opt.Composite)
	var out []PocketJoin
	for _, j := range joinsOf(g) {
		if n := len(out); n > 0 && out[n-1].Stage == j.Stage {
			out[n-1].Pockets = append(out[n-1].Pockets, j)
			continue
		}
		before, err := cg.At(j.Stage, opt.Geometry)
		if err != nil {
			continue
		}
		after, err := cg.At(j.Above, opt.Geometry)
		if err != nil {
			continue
		}
		pj := PocketJoin{Stage: j.Stage, Pockets: []subdivide.Join{j}}
		if pj.Before, err = Hydraulics(before, g.Bottom(), opt.Slope, opt.Units); err != nil {
			return nil, fmt.Errorf("stage %g: %w", j.Stage, err)
		}
		if pj.After, err = Hydraulics(after, g.Bottom(), opt.Slope, opt.Units); err != nil {
			return nil, fmt.Errorf("stage %g: %w", j.Above, err)
		}
		out = append(out, pj)
	}
	return out, nil
}

// joinsOf returns the joins of the ground line under a geometry (a
// surveyed section's, through a scaled or composite n), or nil.
func joinsOf(g subdivide.Geometry) []subdivide.Join {
	switch v := g.(type) {
	case *compositeGeometry:
		return joinsOf(v.inner)
	case ScaledN:
		return joinsOf(v.Geometry)
	case interface{ Joins() []subdivide.Join }:
		return v.Joins()
	}
	return nil
}

// JoinWhere words where a join's pockets lie: "the water standing behind
// the crest at station 78 m (stations 78 to 115 m)".
func (j PocketJoin) JoinWhere(u Units) string {
	parts := make([]string, len(j.Pockets))
	for i, p := range j.Pockets {
		parts[i] = fmt.Sprintf("behind the crest at station %s %s (stations %s to %s %s)",
			PlainFigures(p.Crest, 7), u.Length(), PlainFigures(p.From, 7), PlainFigures(p.To, 7), u.Length())
	}
	return "the water standing " + strings.Join(parts, " and ")
}

// PocketJoinWarning words the warning for a rating that steps at join j:
// stage names the stage as the rating gives it (an elevation, or a gauge
// height with its elevation) and Q the discharges before and after, in
// the units u.
func PocketJoinWarning(j PocketJoin, stage string, u Units) string {
	return fmt.Sprintf("at %s %s joins the flow as the crest is overtopped: the discharge steps from %s %s at the crest to %s %s just above it (%s), and the rating with it",
		stage, j.JoinWhere(u), PlainFigures(j.Before.Discharge, 4), u.Discharge(), PlainFigures(j.After.Discharge, 4), u.Discharge(), stepPercent(j.Step()))
}

// stepPercent words a relative rise as a percentage.
func stepPercent(r float64) string {
	if math.IsInf(r, 1) || math.IsNaN(r) {
		return "from no flow"
	}
	return fmt.Sprintf("%+.0f %%", 100*r)
}

// GaugeHeightWords words an elevation z as a gauge height on a gauge whose
// zero lies at datum, with the elevation: "gauge height 3.6 m (elevation
// 103.6 m)".
func GaugeHeightWords(z, datum float64, u Units) string {
	return fmt.Sprintf("gauge height %s %s (elevation %s %s)", PlainFigures(DecimalDifference(z, datum), 7), u.Length(), PlainFigures(z, 7), u.Length())
}

// JoinWarning is PocketJoinWarning with the stage as an elevation, the
// form a Table's warnings take.
func JoinWarning(j PocketJoin, u Units) string {
	return PocketJoinWarning(j, PlainFigures(j.Stage, 7)+" "+u.Length(), u)
}

// tableJoins returns the joins that lie within a table whose rows span
// stages lo to hi: those at a stage s with lo ≤ s < hi, where the rows on
// either side of s span its step.
func tableJoins(g subdivide.Geometry, opt Options, lo, hi float64) []PocketJoin {
	if !(hi > lo) {
		return nil
	}
	joins, err := PocketJoins(g, opt)
	if err != nil {
		return nil
	}
	var out []PocketJoin
	for _, j := range joins {
		if j.Stage >= lo && j.Stage < hi {
			out = append(out, j)
		}
	}
	return out
}
