package record

import (
	"fmt"
	"math"
	"sort"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
)

// RatingStepPercent is the step of the discharge at a change of rating
// period, in percent of the discharge before it, beyond which the change
// is warned of (common practice: a new rating that meets the old within a
// few percent at the stage of the change adds no step a reviewer need
// look at; one beyond it shows in the hydrograph and in the daily values
// of that day).
const RatingStepPercent = 5.0

// ratingBreakSteps returns a warning for each change of rating period
// within the record at which the discharge steps by more than
// RatingStepPercent: the stage at the change (the reading's at a
// reading's time, else linear in time between the readings either side;
// none in a gap longer than maxGap, nor before the first reading or after
// the last) is rated on the rating and shift in force just before it and
// on those in force from it, as the record rates it (gauged.Rater.AtUnix),
// and the step is
//
//	100·(Q_after − Q_before)/Q_before.
//
// A change with no discharge on either side (a period without a rating,
// a stage outside a table) or none before it (zero flow) gives no percent
// and is not warned of. z is the zone of the times written and u the unit
// system of the values.
func ratingBreakSteps(st *Stages, r *gauged.Rater, maxGap int64, z *time.Location, u rating.Units) []string {
	h := r.History()
	var out []string
	for i := 1; i < len(h.Periods); i++ {
		from := h.Periods[i].From
		if from.IsZero() {
			continue
		}
		b := from.Unix()
		stage, ok := stageAt(st, b, maxGap)
		if !ok {
			continue
		}
		before, after := r.AtUnix(b, stage, true), r.AtUnix(b, stage, false)
		q0, q1 := before.Discharge, after.Discharge
		if !(q0 > 0) || math.IsNaN(q1) {
			continue
		}
		pct := 100 * (q1 - q0) / q0
		if !(math.Abs(pct) > RatingStepPercent) {
			continue
		}
		L, Q := u.Length(), u.Discharge()
		out = append(out, fmt.Sprintf("the discharge steps by %+.1f %% where rating period %d begins, at %s: at the gauge height %s %s there, "+
			"%s %s on the rating before (%s, shift %s %s) and %s %s on the new one (%s, shift %s %s), beyond ±%g %%; "+
			"check that the new rating meets the old at the stage of the change, or that the change of the control explains the step",
			pct, i+1, from.In(z).Format(time.RFC3339), stageText(stage), L,
			rating.PlainFigures(q0, 4), Q, periodName(h.Periods[i-1]), stageText(before.Shift), L,
			rating.PlainFigures(q1, 4), Q, periodName(h.Periods[i]), stageText(after.Shift), L, RatingStepPercent))
	}
	return out
}

// periodName names a period's rating.
func periodName(p gauged.Period) string {
	if p.Rating == nil || p.Rating.Name == "" {
		return "unnamed"
	}
	return p.Rating.Name
}

// stageAt is the recorded stage at time t (Unix seconds): the reading's
// at a reading's time, else linear in time between the readings either
// side when they are no more than maxGap apart; false outside the record
// or in a gap.
func stageAt(st *Stages, t, maxGap int64) (float64, bool) {
	n := len(st.Time)
	k := sort.Search(n, func(i int) bool { return st.Time[i] >= t })
	switch {
	case k < n && st.Time[k] == t:
		return st.Stage[k], true
	case k == 0 || k == n:
		return 0, false
	case st.Time[k]-st.Time[k-1] > maxGap:
		return 0, false
	}
	t0, t1 := st.Time[k-1], st.Time[k]
	return st.Stage[k-1] + (st.Stage[k]-st.Stage[k-1])*float64(t-t0)/float64(t1-t0), true
}
