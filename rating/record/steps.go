package record

import (
	"fmt"
	"math"
	"strconv"
	"time"

	"wetline/rating"
)

// StepWindow is how long the stage must hold steady on each side of a
// one-interval step for the step to be warned of as a likely change of
// gauge datum or sensor (see datumSteps).
const StepWindow = 6 * time.Hour

// StepFactor is how many times the larger spread of the readings on
// either side of a step the step must reach to be warned of (see
// datumSteps).
const StepFactor = 5

// maxStepWarnings bounds the steps warned of one by one; the rest are
// counted.
const maxStepWarnings = 5

// datumSteps finds the one-interval steps of a stage record that look
// like a change of gauge datum or sensor rather than of flow, and returns
// one warning for each (at most maxStepWarnings, the rest counted in one
// more). units are the unit values of st's readings (for the discharges
// either side), maxGap the longest interval bridged (seconds), tol the
// stage tolerance (length unit), z the zone of the times written and u
// the unit system of the values.
//
// The criterion (common practice: a logger reset, a sensor moved or
// replaced, a datum corrected at a visit leaves the stage stepped from one
// reading to the next in otherwise steady flow, while even a fast flood
// rises over several readings and falls again): the interval from reading
// i−1 to reading i, bridged (no longer than maxGap), is a step when
//
//   - its change |hᵢ − hᵢ₋₁| is larger than tol (a change within the
//     tolerance of a gauge check is not a datum question), and
//   - the readings of the StepWindow before reading i−1 (it included) and
//     those of the StepWindow after reading i (it included) each span at
//     most |hᵢ − hᵢ₋₁|/StepFactor (max − min): the stage was steady before
//     the step and holds at its new level after it, so the change is many
//     times the record's ordinary changes around it and does not come
//     back. Both windows must be covered without a gap longer than maxGap.
//
// A flood rise spread over two readings or more, or one followed within
// the window by its fall, is not a step; a step in the middle of a flood
// or within StepWindow of the record's ends is not found.
func datumSteps(st *Stages, units []UnitValue, maxGap int64, tol float64, z *time.Location, u rating.Units) []string {
	n := len(st.Time)
	window := int64(StepWindow / time.Second)
	var out []string
	found := 0
	for i := 1; i < n; i++ {
		if st.Time[i]-st.Time[i-1] > maxGap {
			continue
		}
		step := st.Stage[i] - st.Stage[i-1]
		size := math.Abs(step)
		if !(size > tol) {
			continue
		}
		limit := size / StepFactor
		before, ok1 := steadySpan(st, i-1, -1, window, maxGap, limit)
		after, ok2 := steadySpan(st, i, 1, window, maxGap, limit)
		if !ok1 || !ok2 {
			continue
		}
		if found++; found > maxStepWarnings {
			continue
		}
		at := func(k int) string { return time.Unix(st.Time[k], 0).In(z).Format(time.RFC3339) }
		L := u.Length()
		flow := ""
		if q0, q1 := units[i-1].Discharge, units[i].Discharge; !math.IsNaN(q0) && !math.IsNaN(q1) {
			flow = fmt.Sprintf("; the discharge steps with it from %s to %s %s", rating.PlainFigures(q0, 4), rating.PlainFigures(q1, 4), u.Discharge())
		}
		out = append(out, fmt.Sprintf("the stage steps by %s %s in one interval, from %s %s at %s to %s %s at %s, and holds: "+
			"the readings of the %s before and after stay within %s %s%s. A step this much larger than the stage's changes around it "+
			"is most often a change of gauge datum or sensor (a logger reset, a sensor moved or replaced), not of flow, "+
			"unless the flow is regulated (a gate or release held at a new level): "+
			"check the logger against the gauge readings of the visits, and correct the stage record if it is not flow",
			signedStage(step), L, stageText(st.Stage[i-1]), L, at(i-1), stageText(st.Stage[i]), L, at(i),
			FormatDuration(StepWindow), stageText(max(before, after)), L, flow))
	}
	if found > maxStepWarnings {
		out = append(out, fmt.Sprintf("%s of the stage %s not listed", rating.Counted(found-maxStepWarnings, "more such step", "more such steps"), rating.Agree(found-maxStepWarnings, "is", "are")))
	}
	return out
}

// steadySpan walks from reading k in direction dir (−1 back, +1 on) over
// the readings within window seconds of it and returns their spread
// (max − min, length unit), true when the window is covered (a reading at
// or beyond its far end, no interval longer than maxGap) and the spread
// stays within limit. It stops at the first reading that breaks either.
func steadySpan(st *Stages, k, dir int, window, maxGap int64, limit float64) (float64, bool) {
	lo, hi := st.Stage[k], st.Stage[k]
	for j := k; ; {
		if d := st.Time[j] - st.Time[k]; d >= window || -d >= window {
			return hi - lo, true
		}
		next := j + dir
		if next < 0 || next >= len(st.Time) {
			return 0, false
		}
		if gap := st.Time[next] - st.Time[j]; gap > maxGap || -gap > maxGap {
			return 0, false
		}
		j = next
		lo, hi = min(lo, st.Stage[j]), max(hi, st.Stage[j])
		if hi-lo > limit {
			return 0, false
		}
	}
}

// stageText writes a gauge height for a message rounded to 0.1 mm (or
// 0.0001 ft), without the round-off of a difference (1, not
// 1.0000000000000002).
func stageText(v float64) string {
	r := math.Round(v*1e4) / 1e4
	if r == 0 {
		r = 0 // no "-0"
	}
	return strconv.FormatFloat(r, 'f', -1, 64)
}

// signedStage is stageText with its sign always written.
func signedStage(v float64) string {
	s := stageText(v)
	if v > 0 && s != "0" {
		return "+" + s
	}
	return s
}
