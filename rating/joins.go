package rating

import (
	"cmp"
	"fmt"
	"math"
	"slices"
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

// JoinStepWarned is the least relative step of the discharge (or of the
// conveyance) across a join, up or down, that is warned: 2 %. A project
// choice, not a published figure: a smaller step is within the
// uncertainty of a good gauging (a few per cent, common practice), so
// neither a reader of the table nor a fit to gaugings would see it, and
// survey scatter on a floodplain
// (crests and hollows of a centimetre or two) makes many such joins, each
// adding a little wetted perimeter and next to no water.
const JoinStepWarned = 0.02

// JoinsWarnedEach is the most joins worded one by one, those of the
// largest steps; the rest of those warned are rolled up in one line
// (JoinRollUp). A project choice, as the pools' warning is one line
// however many stages it covers.
const JoinsWarnedEach = 3

// JoinWording says how a join's warning words it.
type JoinWording struct {
	// Stage words a stage, an elevation: nil words it as the elevation
	// with its unit ("103.6 m"); GaugeHeightWords gives a gauge height.
	Stage func(z float64) string
	// Conveyance words the step as the section's conveyance K, in its
	// unit (K = Q/√S, so the relative step is the discharge's), for
	// tables rated without a slope; else as discharge.
	Conveyance bool
	// Subject names the discharge ("the discharge" when ""), unused with
	// Conveyance.
	Subject string
}

// stage words a stage z.
func (w JoinWording) stage(z float64, u Units) string {
	if w.Stage != nil {
		return w.Stage(z)
	}
	return PlainFigures(z, 7) + " " + u.Length()
}

// values returns what steps at join j (before and after) and its name and
// unit.
func (w JoinWording) values(j PocketJoin, u Units) (before, after float64, subject, unit string) {
	if w.Conveyance {
		return j.Before.Conveyance, j.After.Conveyance, "the conveyance", u.Conveyance()
	}
	subject = w.Subject
	if subject == "" {
		subject = "the discharge"
	}
	return j.Before.Discharge, j.After.Discharge, subject, u.Discharge()
}

// stepSize is the size of a join's step, a fall or a rise, for ranking:
// +Inf from no flow, 0 when nothing flows on either side.
func stepSize(j PocketJoin) float64 {
	s := math.Abs(j.Step())
	if math.IsNaN(s) {
		return 0
	}
	return s
}

// Warned reports whether join j steps by JoinStepWarned or more, up or
// down.
func (j PocketJoin) Warned() bool {
	return stepSize(j) >= JoinStepWarned
}

// WarnedJoins splits joins (in ascending order of stage, as PocketJoins
// gives them) into those worded one by one, each, and the rest of those
// warned, rolled up in one line (JoinRollUp), both in ascending order of
// stage. Only joins that step by JoinStepWarned or more are warned; each
// holds at most JoinsWarnedEach, those of the largest steps in size.
func WarnedJoins(joins []PocketJoin) (each, rolled []PocketJoin) {
	var warned []int
	for i, j := range joins {
		if j.Warned() {
			warned = append(warned, i)
		}
	}
	byStep := slices.Clone(warned)
	slices.SortStableFunc(byStep, func(a, b int) int { return cmp.Compare(stepSize(joins[b]), stepSize(joins[a])) })
	if len(byStep) > JoinsWarnedEach {
		byStep = byStep[:JoinsWarnedEach]
	}
	for _, i := range warned {
		if slices.Contains(byStep, i) {
			each = append(each, joins[i])
		} else {
			rolled = append(rolled, joins[i])
		}
	}
	return each, rolled
}

// JoinStepWords words what happens at join j, the head of its warning:
// "at 103.6 m the water standing behind the crest at station 78 m
// (stations 78 to 115 m) joins the flow as the crest is overtopped: the
// discharge steps up from 109.7 m3/s at the crest to 122.5 m3/s just
// above it (+12 %)". A fall is worded as one, with its cause: the pocket
// holds little water for the wetted perimeter its ground adds (Manning's
// Q ∝ A^(5/3)/P^(2/3) falls where P grows by more than 5/2 of A's
// relative growth).
func JoinStepWords(j PocketJoin, w JoinWording, u Units) string {
	before, after, subject, unit := w.values(j, u)
	s := after/before - 1
	how, why := "steps up", ""
	if s < 0 {
		how, why = "falls", ", the pocket holding little water for the wetted perimeter its ground adds"
	}
	return fmt.Sprintf("at %s %s joins the flow as the crest is overtopped: %s %s from %s %s at the crest to %s %s just above it (%s)%s",
		w.stage(j.Stage, u), j.JoinWhere(u), subject, how, PlainFigures(before, 4), unit, PlainFigures(after, 4), unit, stepPercent(s), why)
}

// JoinRollUp words in one line the joins rolled up by WarnedJoins (in
// ascending order of stage): how many stages, their range, and the
// largest step; "" for none.
func JoinRollUp(rolled []PocketJoin, w JoinWording, u Units) string {
	if len(rolled) == 0 {
		return ""
	}
	big, falls := rolled[0], 0
	for _, j := range rolled {
		if stepSize(j) > stepSize(big) {
			big = j
		}
		if j.Step() < 0 {
			falls++
		}
	}
	before, after, subject, unit := w.values(big, u)
	where := w.stage(rolled[0].Stage, u)
	if n := len(rolled); n > 1 {
		where = "from " + where + " to " + w.stage(rolled[n-1].Stage, u)
	}
	var kinds []string
	if rises := len(rolled) - falls; rises > 0 {
		kinds = append(kinds, Counted(rises, "rise", "rises"))
	}
	if falls > 0 {
		kinds = append(kinds, Counted(falls, "fall", "falls"))
	}
	return fmt.Sprintf("at %d more %s, %s, water standing behind a crest joins the flow as the crest is overtopped and %s steps by %s or more (%s): the largest step is %s, at %s, from %s to %s %s",
		len(rolled), Agree(len(rolled), "stage", "stages"), where, subject, percentSize(JoinStepWarned), JoinAnd(kinds),
		stepKind(big.Step()), w.stage(big.Stage, u), PlainFigures(before, 4), PlainFigures(after, 4), unit)
}

// stepKind words a relative step as a rise or a fall: "a rise of 12 %",
// "a fall of 4 %", "a rise from no flow".
func stepKind(r float64) string {
	switch {
	case math.IsInf(r, 1) || math.IsNaN(r):
		return "a rise from no flow"
	case r < 0:
		return "a fall of " + percentSize(r)
	}
	return "a rise of " + percentSize(r)
}

// percentSize words the size of a relative step as a percentage: "4 %".
func percentSize(r float64) string {
	return fmt.Sprintf("%.0f %%", 100*math.Abs(r))
}

// JoinWarnings words the warnings of joins (in ascending order of stage)
// for a table: one for each of WarnedJoins' each, with what follows for
// the rating, and one rolling up the rest; none for a join that steps by
// less than JoinStepWarned.
func JoinWarnings(joins []PocketJoin, w JoinWording, u Units) []string {
	each, rolled := WarnedJoins(joins)
	var out []string
	for _, j := range each {
		msg := JoinStepWords(j, w, u)
		switch {
		case w.Conveyance:
		case j.Step() < 0:
			msg += "; the rating falls with it"
		default:
			msg += ", and the rating with it"
		}
		out = append(out, msg)
	}
	if s := JoinRollUp(rolled, w, u); s != "" {
		out = append(out, s)
	}
	return out
}

// rewordJoins replaces the join warnings Compute gave t (JoinWarnings at
// elevations, of the discharge) with those worded by w.
func (t *Table) rewordJoins(w JoinWording, u Units) {
	old := JoinWarnings(t.Joins, JoinWording{}, u)
	if len(old) == 0 {
		return
	}
	k := slices.Index(t.Warnings, old[0])
	if k < 0 || k+len(old) > len(t.Warnings) || !slices.Equal(t.Warnings[k:k+len(old)], old) {
		return
	}
	t.Warnings = slices.Replace(t.Warnings, k, k+len(old), JoinWarnings(t.Joins, w, u)...)
}

// stepPercent words a relative step as a percentage, signed.
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
