package record

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
)

// DefaultStageTolerance returns the default stage tolerance of the
// gauge-height check (Options.StageTolerance) in unit system u: 0.02 m in
// SI, 0.06 ft in US customary units (common practice: a gauging's gauge
// height and the recorder's stage at its time are expected to agree to
// about two centimetres, a tenth of a foot being a large difference; a
// larger one points at the gauge, the logger or the datum).
func DefaultStageTolerance(u rating.Units) float64 {
	if u == rating.US {
		return 0.06
	}
	return 0.02
}

// ErrStageTolerance is the cause of an unusable stage tolerance.
var ErrStageTolerance = errors.New("the stage tolerance must be a positive finite length")

// GaugeStage is a gauging's gauge height set against the stage record at
// its time: the office check that the gauge read during the measurement
// and the record agree.
type GaugeStage struct {
	// Recorded is the record's stage at the gauging's time (length unit):
	// the reading's own at a reading's time, else linear in time between
	// the readings either side; NaN when the gauging falls in a gap longer
	// than the maximum gap (InGap), as the record bridges none.
	Recorded float64
	// Difference is the gauging's gauge height minus Recorded (length
	// unit; NaN without Recorded).
	Difference float64
	// Before and After are the 0-based indices into Result.Units of the
	// readings either side of the gauging's time (equal at a reading's
	// time).
	Before, After int
	// InGap reports a gauging in a gap the record does not bridge.
	InGap bool
	// Beyond reports a Difference larger in size than the stage tolerance
	// (Result.StageTolerance); one within round-off of it (a part in 10⁹)
	// is not.
	Beyond bool
}

// stageTolerance resolves Options.StageTolerance: the default of the unit
// system when 0, ErrStageTolerance when negative or not finite.
func (o Options) stageTolerance() (float64, error) {
	tol := o.StageTolerance
	if tol == 0 {
		return DefaultStageTolerance(o.UnitSystem), nil
	}
	if !(tol > 0) || math.IsInf(tol, 0) {
		return 0, fmt.Errorf("%w: %v", ErrStageTolerance, tol)
	}
	return tol, nil
}

// recordedStage returns the record's stage at time t from the unit values
// us (in time order, their gaps marked), and false when t lies outside the
// record's span (before its first reading or after its last).
func recordedStage(us []UnitValue, t time.Time) (GaugeStage, bool) {
	nan := math.NaN()
	n := len(us)
	if n == 0 {
		return GaugeStage{}, false
	}
	sec, ns := t.Unix(), t.Nanosecond()
	if sec < us[0].Time || sec > us[n-1].Time || sec == us[n-1].Time && ns > 0 {
		return GaugeStage{}, false
	}
	j := sort.Search(n, func(k int) bool { return us[k].Time >= sec })
	if us[j].Time == sec {
		if ns == 0 {
			return GaugeStage{Recorded: us[j].Stage, Difference: nan, Before: j, After: j}, true
		}
		j++ // just after reading j: between it and the next
	}
	i := j - 1
	g := GaugeStage{Recorded: nan, Difference: nan, Before: i, After: j}
	if us[j].Flags&Gap != 0 {
		g.InGap = true
		return g, true
	}
	f := (float64(sec-us[i].Time) + float64(ns)/1e9) / float64(us[j].Time-us[i].Time)
	g.Recorded = us[i].Stage + f*(us[j].Stage-us[i].Stage)
	return g, true
}

// checkGaugings sets the gaugings gs against the record: those outside its
// span are left out and counted in one warning; the others are measured
// against the history (Result.Gaugings) and their gauge heights against
// the recorded stage (Result.GaugeStages), each difference beyond tol and
// each gauging in a gap warned of.
func (res *Result) checkGaugings(r *gauged.Rater, gs []gauged.Gauging, tol float64) error {
	var in []gauged.Gauging
	var stages []GaugeStage
	before, after := 0, 0
	for _, g := range gs {
		s, ok := recordedStage(res.Units, g.Time)
		switch {
		case ok:
			in, stages = append(in, g), append(stages, s)
		case len(res.Units) > 0 && g.Time.Before(time.Unix(res.Units[0].Time, 0)):
			before++
		default:
			after++
		}
	}
	if left := before + after; left > 0 {
		res.Warnings = append(res.Warnings, res.leftOutWarning(left, len(gs), before, after))
	}
	res.GaugingsLeftOut = before + after
	if len(in) == 0 {
		return nil
	}
	check, err := r.CheckGaugings(in, gauged.CheckOptions{Units: res.UnitSystem, UTCOffset: res.UTCOffset})
	if err != nil {
		return err
	}
	res.Gaugings = &check
	// The check's warnings begin with the rater's, stated already.
	res.Warnings = append(res.Warnings, check.Warnings[len(r.Warnings):]...)
	for k, g := range in {
		s := &stages[k]
		if !s.InGap {
			s.Difference = g.Stage - s.Recorded
			s.Beyond = math.Abs(s.Difference) > tol*(1+1e-9)
		}
		if w := res.gaugeStageWarning(g, *s, tol); w != "" {
			res.Warnings = append(res.Warnings, w)
		}
	}
	res.GaugeStages = stages
	return nil
}

// leftOutWarning words the count of gaugings left out of the check for
// lying outside the record's span.
func (res *Result) leftOutWarning(left, of, before, after int) string {
	n := len(res.Units)
	if n == 0 {
		return fmt.Sprintf("%d of %s %s not checked against the record: it keeps no reading", left, rating.Counted(of, "gauging", "gaugings"), rating.Agree(left, "is", "are"))
	}
	return fmt.Sprintf("%d of %s %s outside the record's span, from %s to %s, and %s not checked against it (%d before its first reading, %d after its last)",
		left, rating.Counted(of, "gauging", "gaugings"), rating.Agree(left, "lies", "lie"), res.at(res.Units[0].Time), res.at(res.Units[n-1].Time),
		rating.Agree(left, "is", "are"), before, after)
}

// at writes Unix seconds in the result's zone.
func (res *Result) at(sec int64) string {
	return time.Unix(sec, 0).In(res.Zone).Format(time.RFC3339)
}

// gaugeStageWarning words a gauging whose gauge height differs from the
// recorded stage by more than tol, or that falls in a gap; "" otherwise.
func (res *Result) gaugeStageWarning(g gauged.Gauging, s GaugeStage, tol float64) string {
	label := "gauging"
	if g.Source != "" {
		label = g.Source + ": gauging"
	}
	when := g.Time.In(res.Zone).Format(time.RFC3339)
	b, a := res.Units[s.Before], res.Units[s.After]
	L := res.UnitSystem.Length()
	if s.InGap {
		return fmt.Sprintf("%s of %s: no recorded stage to check its gauge height %g %s against: it falls in a gap of %s between the readings of %s and %s, longer than %s",
			label, when, g.Stage, L, formatSeconds(a.Time-b.Time), res.at(b.Time), res.at(a.Time), FormatDuration(res.MaxGap))
	}
	if !s.Beyond {
		return ""
	}
	from := fmt.Sprintf("the reading of %s", res.at(b.Time))
	if s.Before != s.After {
		from = fmt.Sprintf("linear between the readings of %s (%g %s) and %s (%g %s)", res.at(b.Time), b.Stage, L, res.at(a.Time), a.Stage, L)
	}
	return fmt.Sprintf("%s of %s read gauge height %g %s where the record gives %.3f %s (%s): gauging − record = %+.3f %s, more than the tolerance %g %s: "+
		"check the gauge, the logger and its datum before using the gauging or the record",
		label, when, g.Stage, L, s.Recorded, L, from, s.Difference, L, tol, L)
}
