package record

import (
	"errors"
	"fmt"
	"iter"
	"math"
	"strings"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
)

// ProvisionalNote is stated by every report of a computed discharge record,
// beside rating.Caution.
const ProvisionalNote = "A computed discharge record is provisional until it has been reviewed: " +
	"check the shifts against the gaugings, the gaps and every flagged value before it is published or used."

// Options configure Compute. The zero value bridges gaps of up to
// DefaultMaxGap and takes days in UTC.
type Options struct {
	// MaxGap is the longest time between two readings that is bridged
	// (the discharge taken as linear between them); longer gaps are left
	// uncovered. Default DefaultMaxGap; > 0, whole seconds.
	MaxGap time.Duration
	// UTCOffset is the offset from UTC in which calendar days are taken
	// (east positive); default 0 (UTC); whole seconds, at most
	// MaxUTCOffset either way.
	UTCOffset time.Duration
	// Gaugings, when given, are set against the record: those within its
	// span (from its first reading to its last) are measured against the
	// history at their times (gauged.Rater.CheckGaugings; a gauging's
	// departure from the shifted rating is its departure from the computed
	// record) and their gauge heights against the recorded stage; those
	// outside it are left out, and counted.
	Gaugings []gauged.Gauging
	// StageTolerance is the largest difference between a gauging's gauge
	// height and the recorded stage at its time that is not flagged
	// (length unit; > 0, finite). Default DefaultStageTolerance of
	// UnitSystem.
	StageTolerance float64
	// UnitSystem labels the values in reports (default SI); nothing is
	// converted.
	UnitSystem rating.Units
}

// DefaultMaxGap is the default longest gap bridged between readings (a
// project choice: eight missed 15-minute readings are not bridged).
const DefaultMaxGap = 2 * time.Hour

// MaxUTCOffset bounds a UTC offset (the widest in civil use is +14 h).
const MaxUTCOffset = 14 * time.Hour

// Causes of unusable options, for errors.Is.
var (
	ErrMaxGap    = errors.New("the maximum gap must be a positive whole number of seconds")
	ErrUTCOffset = errors.New("the UTC offset must be a whole number of seconds within 14 hours of UTC")
	// ErrNoDischarge: no reading of the record has a discharge (every
	// one outside its rating table, or without a rating in force).
	ErrNoDischarge = errors.New("no reading of the stage record has a discharge")
)

// MostlyOutside is the share of the rated readings outside their rating
// table from which the record is warned of as being perhaps in another
// unit or on another datum than the rating (a project choice: a rating
// misses a few flood peaks, not nineteen readings in twenty).
const MostlyOutside = 0.95

// UnitValue is one reading of the record turned into a discharge.
type UnitValue struct {
	// Time is the reading's time in Unix seconds (see Result.Zone).
	Time int64
	// Stage is the gauge height read (length unit).
	Stage float64
	// Shift is the shift used (length unit; NaN without a rating).
	Shift float64
	// Effective is the effective gauge height Stage + Shift (length unit;
	// NaN without a rating).
	Effective float64
	// Discharge is the unit discharge (discharge unit; NaN when it cannot
	// be computed, and Flags say why).
	Discharge float64
	// Period is the 0-based index of the rating period in force (into
	// Result.Periods), -1 when none.
	Period int32
	// Quality is the reading's quality, an index into the record's
	// Qualities (0 for none).
	Quality uint16
	// Flags mark the value.
	Flags Flag
}

// DailyValue is one calendar day of the record.
type DailyValue struct {
	// Date is the midnight that begins the day, in Result.Zone.
	Date time.Time
	// Mean is the time-weighted mean discharge over the covered part of the
	// day (discharge unit; NaN when nothing is covered).
	Mean float64
	// Min and Max are the least and greatest discharges of the day, at
	// MinTime and MaxTime (the earliest of equal ones; NaN and the zero
	// time when none): of the unit discharges read in the day, of the
	// discharges interpolated at its beginning and end midnights where the
	// record is bridged across them (a reading at a midnight counts for
	// both days it bounds), and of the two discharges at each rating break
	// in the day between two readings (a new period or an abrupt shift
	// diagram: the stage interpolated in time, rated on what is in force
	// before the break and after it); at a break on a reading, that
	// reading's unit discharge stands for the break. Between readings these
	// are the corners of the discharge the mean integrates, so there no
	// discharge of it lies outside them; at a break the greatest or least
	// can be a value no reading holds. At a break on a reading the mean
	// integrates up to the discharge before the break, which the least and
	// greatest do not count.
	Min, Max         float64
	MinTime, MaxTime time.Time
	// Coverage is the fraction of the day covered by bridged intervals with
	// a discharge at both ends, 0 to 1.
	Coverage float64
	// Readings is the number of readings in the day.
	Readings int
	// Flags are the flags of the day's readings, Gap when an unbridged gap
	// falls in the day, and Partial when Coverage is below 1.
	Flags Flag
}

// PeriodUse is a rating period as the record used it.
type PeriodUse struct {
	gauged.Period
	// To is when the next period begins (the zero time for the last).
	To time.Time
	// Readings is the number of readings rated in the period.
	Readings int
}

// ShiftUse is a shift diagram as the record used it.
type ShiftUse struct {
	gauged.ShiftDiagram
	// Period is the rating period whose shifts include it, -1 when the
	// diagram is not used.
	Period int
}

// Result is a computed discharge record: the report of the record
// command, in every format.
type Result struct {
	// Provenance says what the record was computed from (set by the
	// caller).
	Provenance rating.Provenance
	// Name is the stage record's name.
	Name string
	// UnitSystem labels the values (Options.UnitSystem).
	UnitSystem rating.Units
	// Units are the unit values, one per reading, in time order.
	Units []UnitValue
	// Missing are the missing readings, in time order: the record's
	// Stages.Missing (stage NaN) and the readings read as missing-value
	// codes (their stage as read; see Compute), each flagged Missing with
	// no shift, effective stage, discharge or rating period. They are not
	// among Units, and take no part in any value computed; a unit table
	// lists them among Units (UnitRows).
	Missing []UnitValue
	// Daily are the calendar days from the first reading's to the last's.
	Daily []DailyValue
	// Qualities are the stage record's quality words (see UnitValue.Quality).
	Qualities []string
	// Periods and Shifts are the rating periods and shift diagrams used,
	// with their ratings and points, for reports to state.
	Periods []PeriodUse
	Shifts  []ShiftUse
	// MaxGap and UTCOffset are the options used; Zone is the fixed zone of
	// UTCOffset, in which times are written.
	MaxGap, UTCOffset time.Duration
	Zone              *time.Location
	// Gaugings are the Options.Gaugings within the record's span measured
	// against the history, in input order; nil when none is.
	Gaugings *gauged.ShiftCheck
	// GaugeStages are the gauge heights of Gaugings.Gaugings set against
	// the recorded stage, one per gauging in its order; nil without
	// Gaugings.
	GaugeStages []GaugeStage
	// StageTolerance is the stage tolerance used (Options.StageTolerance
	// resolved).
	StageTolerance float64
	// BelowTable and AboveTable are the readings with no discharge for
	// lying outside their rating table (flagged OutsideRating): below its
	// lowest row (and above its zero flow) and above its top row.
	BelowTable, AboveTable TableSide
	// GaugingsLeftOut is the number of Options.Gaugings outside the
	// record's span, left out of the check.
	GaugingsLeftOut int
	// Warnings are facts a reviewer should see.
	Warnings []string
	// Figures are the record's pictures (none until drawn).
	Figures []rating.Figure
}

// TableSide gathers the readings on one side of their rating tables' rows
// with no discharge (Result.BelowTable, Result.AboveTable).
type TableSide struct {
	// Readings is how many there are.
	Readings int
	// Lowest and Highest bound their effective gauge heights (shifts
	// applied; length unit).
	Lowest, Highest float64
	// First and Last are the times of the first and the last of them
	// (Unix seconds).
	First, Last int64
	// HighestStage is the greatest recorded gauge height among them, at
	// HighestAt (the earliest of equal ones; Unix seconds).
	HighestStage float64
	HighestAt    int64
}

// take counts unit value u into the side.
func (s *TableSide) take(u *UnitValue) {
	if s.Readings == 0 {
		*s = TableSide{Lowest: u.Effective, Highest: u.Effective, First: u.Time, HighestStage: u.Stage, HighestAt: u.Time}
	}
	s.Readings++
	s.Lowest, s.Highest, s.Last = min(s.Lowest, u.Effective), max(s.Highest, u.Effective), u.Time
	if u.Stage > s.HighestStage {
		s.HighestStage, s.HighestAt = u.Stage, u.Time
	}
}

// warn words the side's warning among n readings, "" when it holds none:
// side says where ("below the lowest row", "above the top row"), L is the
// length unit and times are in zone z.
func (s *TableSide) warn(n int, side, L string, z *time.Location) string {
	if s.Readings == 0 {
		return ""
	}
	at := func(t int64) string { return time.Unix(t, 0).In(z).Format(time.RFC3339) }
	where := fmt.Sprintf("gauge height (shift applied) %s %s at %s", stageText(s.Lowest), L, at(s.First))
	if s.Readings > 1 {
		where = fmt.Sprintf("gauge heights (shifts applied) %s to %s %s, from %s to %s", stageText(s.Lowest), stageText(s.Highest), L, at(s.First), at(s.Last))
	}
	return fmt.Sprintf("%d of %s %s %s of %s rating table: %s; no discharge (the rating does not allow extrapolation: --extrapolate rates them)",
		s.Readings, rating.Counted(n, "reading", "readings"), rating.Agree(s.Readings, "lies", "lie"), side, rating.Agree(s.Readings, "its", "their"), where)
}

// Compute turns a stage record into the discharge record with the rating
// history r: the unit values (shift, effective stage, discharge and flags
// at every reading) and the daily values.
//
// A reading's shift comes from the diagrams of the rating period in force
// at its time (prorated between them, see gauged.Rater.AtUnix); its
// discharge from that period's rating at the effective gauge height h + s,
// zero at or below the rating's zero-flow stage. Readings outside every
// rating period, in a period without a rating or outside the rating table
// (without extrapolation) have no discharge and are flagged; those outside
// the table are gathered and warned of apart below its lowest row and
// above its top row (Result.BelowTable, Result.AboveTable), each with the
// span of their effective gauge heights and of their times.
// Missing readings (Stages.Missing, and readings read as missing-value
// codes) are listed in Result.Missing, flagged Missing, and computed with
// nothing.
//
// A daily mean is the time-weighted mean of the unit discharges over the
// covered part of the day, by the trapezoidal rule between readings,
//
//	Q̄ = Σ ½(Qᵢ + Qᵢ₊₁)(tᵢ₊₁ − tᵢ) / Σ (tᵢ₊₁ − tᵢ),
//
// never the discharge of the mean stage. An interval longer than MaxGap, or
// with no discharge at one end, is not covered. An interval that crosses
// midnight is split there (the discharge linear in time between its
// readings); one that crosses a rating period's beginning or an abrupt
// shift diagram is split there too, the stage linear in time between its
// readings and rated on each side with what is in force there.
//
// With Options.Gaugings, every gauging within the record's span (from its
// first reading to its last, both included) is measured against the
// history (Result.Gaugings), and its gauge height h_g against the recorded
// stage at its time (Result.GaugeStages): the reading's at a reading's
// time, else linear in time between the readings either side,
//
//	h_r = hᵢ + (t − tᵢ)/(tᵢ₊₁ − tᵢ)·(hᵢ₊₁ − hᵢ),
//
// none in a gap longer than MaxGap (the record bridges none); a difference
// h_g − h_r larger in size than Options.StageTolerance is warned of, with
// the gauging's time and source, both stages and the difference. Gaugings
// outside the span are left out and counted in one warning.
//
// When at least MostlyOutside of the readings with a rating lie outside
// their rating table, a warning says so with the range of their effective
// gauge heights and of the tables, and asks whether the stage record and
// the rating are in one unit and on one gauge datum.
//
// Errors are a *StagesError for an unusable record, ErrNoDischarge when no
// reading has a discharge (a record without one is no record; the error
// says why, as the warning above does), and ErrMaxGap, ErrUTCOffset or
// ErrStageTolerance for unusable options.
//
// References:
//
//	Kennedy, E.J., 1983, Computation of continuous records of streamflow:
//	USGS Techniques of Water-Resources Investigations, book 3, chap. A13
//	(shift adjustments applied to the gauge-height record; daily mean
//	discharge from unit values over subdivided days).
func Compute(st *Stages, r *gauged.Rater, opt Options) (*Result, error) {
	if err := st.Validate(); err != nil {
		return nil, err
	}
	maxGap, off, err := opt.resolve()
	if err != nil {
		return nil, err
	}
	tol, err := opt.stageTolerance()
	if err != nil {
		return nil, err
	}
	missing, missingQ := st.Missing, st.MissingQuality
	st, units, codes, dropped := rateReadings(st, r, zone(off))
	if len(st.Time) == 0 { // every reading read as a missing-value code
		return nil, fmt.Errorf("%w: %s; so every reading is missing. Are the stage record and the rating on the same gauge datum "+
			"(a rating of elevations needs the gauge's datum), and in the same unit?", ErrNoDischarge, codes)
	}
	res := &Result{
		Name: st.Name, Units: units, Missing: missingValues(missing, missingQ, dropped), Qualities: append([]string(nil), st.Qualities...),
		MaxGap: time.Duration(maxGap) * time.Second, UTCOffset: time.Duration(off) * time.Second,
		Zone: zone(off), UnitSystem: opt.UnitSystem, StageTolerance: tol,
	}
	res.uses(r)
	if codes != "" {
		res.Warnings = append(res.Warnings, codes)
	}
	c := newCounter(res, st, off)
	res.unitValues(r, maxGap, c)
	res.Warnings = append(res.Warnings, datumSteps(st, res.Units, maxGap, tol, res.Zone, opt.UnitSystem)...)
	res.Warnings = append(res.Warnings, ratingBreakSteps(st, r, maxGap, res.Zone, opt.UnitSystem)...)
	c.integrate(st, r, maxGap)
	res.Daily = c.daily(res.Zone)
	res.summarize(c)
	if err := res.withinRatings(r); err != nil {
		return nil, err
	}
	if len(opt.Gaugings) > 0 {
		if err := res.checkGaugings(r, opt.Gaugings, tol); err != nil {
			return nil, err
		}
	}
	return res, nil
}

// resolve checks the options and returns the maximum gap and the UTC
// offset in seconds.
func (o Options) resolve() (maxGap, off int64, err error) {
	g := o.MaxGap
	if g == 0 {
		g = DefaultMaxGap
	}
	if g < 0 || g%time.Second != 0 {
		return 0, 0, fmt.Errorf("%w: %v", ErrMaxGap, o.MaxGap)
	}
	if o.UTCOffset%time.Second != 0 || o.UTCOffset > MaxUTCOffset || o.UTCOffset < -MaxUTCOffset {
		return 0, 0, fmt.Errorf("%w: %v", ErrUTCOffset, o.UTCOffset)
	}
	return int64(g / time.Second), int64(o.UTCOffset / time.Second), nil
}

// zone is the fixed zone of a UTC offset in seconds, named as ISO 8601
// writes it.
func zone(off int64) *time.Location {
	if off == 0 {
		return time.UTC
	}
	return time.FixedZone("UTC"+FormatOffset(time.Duration(off)*time.Second), int(off))
}

// FormatOffset writes a UTC offset (east positive) as ISO 8601 writes it,
// ±HH:MM: +00:00 for none, -00:30 for half an hour west; seconds within
// the minute are dropped (offsets of civil time are whole minutes).
func FormatOffset(off time.Duration) string {
	s := int64(off / time.Second)
	sign := "+"
	if s < 0 {
		sign, s = "-", -s
	}
	return fmt.Sprintf("%s%02d:%02d", sign, s/3600, s/60%60)
}

// uses states the history's periods and diagrams on the result.
func (res *Result) uses(r *gauged.Rater) {
	h := r.History()
	for i, p := range h.Periods {
		u := PeriodUse{Period: p}
		if i+1 < len(h.Periods) {
			u.To = h.Periods[i+1].From
		}
		res.Periods = append(res.Periods, u)
	}
	for i, d := range h.Shifts {
		res.Shifts = append(res.Shifts, ShiftUse{ShiftDiagram: d, Period: r.ShiftPeriod(i)})
	}
	res.Warnings = append(res.Warnings, r.Warnings...)
}

// lowReadings gathers the readings rated at or below their rating's gauge
// height of zero flow, and those far below the rating table's lowest row:
// the marks of a logger's missing-value code (such as -9999) read as a
// stage.
type lowReadings struct {
	below    int     // readings at or below zero flow
	lowest   float64 // the lowest gauge height of those
	lowestAt int64   // its time
}

// take counts unit value u, rated on the table rt (nil without a
// rating). A reading is counted below zero flow when it is flagged
// BelowZeroFlow, rated zero flow at or below the table's zero-flow stage:
// one rule for the flag and the count. Readings far below the table
// (FarBelowTable) never come here: rateReadings has left them out.
func (l *lowReadings) take(u *UnitValue, rt *gauged.TableRating) {
	if rt == nil {
		return
	}
	if _, ok := rt.ZeroFlow(); ok && u.Flags&BelowZeroFlow != 0 {
		if l.below == 0 || u.Stage < l.lowest {
			l.lowest, l.lowestAt = u.Stage, u.Time
		}
		l.below++
	}
}

// FarBelowTable is how many times its own stage range a reading must lie
// below a rating table's lowest row to be called far below it. A rating
// table spans the channel from its lowest rated water level to its highest;
// water more than that whole span below the lowest row would lie deeper
// below the channel's low point than the channel is deep, which no river
// does: such a reading is almost surely a missing-value code or a sensor
// fault (common practice: loggers write -9999 or -999 for no reading).
const FarBelowTable = 1

// warn words the warnings of the low readings among n, times in zone z.
func (l *lowReadings) warn(n int, z *time.Location, warnings []string) []string {
	at := func(t int64) string { return time.Unix(t, 0).In(z).Format(time.RFC3339) }
	if l.below > 0 {
		k := l.below
		warnings = append(warnings, fmt.Sprintf("%d of %s %s at or below the gauge height of zero flow of %s rating and %s rated 0 "+
			"(the lowest %g at %s): a reading far below zero flow may be a logger's missing-value code, which pulls daily means down; "+
			"leave the stage of a missing reading blank", k, rating.Counted(n, "reading", "readings"), rating.Agree(k, "lies", "lie"), rating.Agree(k, "its", "their"),
			rating.Agree(k, "is", "are"), l.lowest, at(l.lowestAt)))
	}
	return warnings
}

// rateReadings rates every reading of st once, into its unit value (with
// the flags of its lookup; gaps are marked later), and leaves out the
// readings that lie below the lowest row of their rating table by more
// than FarBelowTable times the table's stage range: missing-value codes,
// left out as a blank stage is, so that they add nothing to the means and
// leave their day's coverage short. It returns the readings kept (st
// itself when none is left out) and their unit values, and the warning,
// "" when none is left out, that counts them and names the first. One
// unit value a reading is all it holds.
func rateReadings(st *Stages, r *gauged.Rater, z *time.Location) (*Stages, []UnitValue, string, []UnitValue) {
	units := make([]UnitValue, len(st.Time))
	drop := make([]bool, len(st.Time))
	first, n := -1, 0
	for i, t := range st.Time {
		v := r.AtUnix(t, st.Stage[i], false)
		u := UnitValue{Time: t, Stage: st.Stage[i], Shift: v.Shift, Effective: v.Effective, Discharge: v.Discharge,
			Period: int32(v.Period), Flags: lookupFlag[v.Lookup]}
		if st.Quality != nil {
			u.Quality = st.Quality[i]
		}
		if v.AboveGaugings {
			u.Flags |= AboveGaugings
		}
		units[i] = u
		if rt := r.Rating(v.Period); rt != nil {
			lo, hi := rt.Range()
			if v.Effective < lo-FarBelowTable*(hi-lo) {
				drop[i] = true
				if first < 0 {
					first = i
				}
				n++
			}
		}
	}
	if first < 0 {
		return st, units, "", nil
	}
	out := &Stages{Name: st.Name, Qualities: st.Qualities}
	dropped := make([]UnitValue, 0, n)
	kept := units[:0] // compacted in place
	for i := range st.Time {
		if drop[i] {
			dropped = append(dropped, missingValue(st.Time[i], st.Stage[i], units[i].Quality))
			continue
		}
		out.Time = append(out.Time, st.Time[i])
		out.Stage = append(out.Stage, st.Stage[i])
		if st.Quality != nil {
			out.Quality = append(out.Quality, st.Quality[i])
		}
		kept = append(kept, units[i])
	}
	return out, kept, fmt.Sprintf("%s %s below the lowest row of %s rating table by more than the table's whole stage range "+
		"(the first %g at %s): read as missing-value codes (such as -9999), left out as missing readings (flagged missing)",
		rating.Counted(n, "reading", "readings"), rating.Agree(n, "lies", "lie"), rating.Agree(n, "its", "their"), st.Stage[first],
		time.Unix(st.Time[first], 0).In(z).Format(time.RFC3339)), dropped
}

// missingValue is the unit value of a missing reading at time t, of
// gauge height h as read (NaN for none) and quality q.
func missingValue(t int64, h float64, q uint16) UnitValue {
	return UnitValue{Time: t, Stage: h, Shift: math.NaN(), Effective: math.NaN(), Discharge: math.NaN(), Period: -1, Quality: q, Flags: Missing}
}

// missingValues merges the times of readings with no stage (and their
// qualities, when not nil, one per time) and the unit values of the
// readings left out as codes (both ascending) into the missing readings
// of a Result, in time order.
func missingValues(blank []int64, quality []uint16, codes []UnitValue) []UnitValue {
	if len(blank)+len(codes) == 0 {
		return nil
	}
	out := make([]UnitValue, 0, len(blank)+len(codes))
	i, j := 0, 0
	for i < len(blank) || j < len(codes) {
		if j == len(codes) || i < len(blank) && blank[i] < codes[j].Time {
			var q uint16
			if quality != nil {
				q = quality[i]
			}
			out = append(out, missingValue(blank[i], math.NaN(), q))
			i++
			continue
		}
		out = append(out, codes[j])
		j++
	}
	return out
}

// UnitRows returns the unit table of the record: Units and Missing merged
// in time order (no two share a time).
func (res *Result) UnitRows() iter.Seq[UnitValue] {
	return func(yield func(UnitValue) bool) {
		i, j := 0, 0
		for i < len(res.Units) || j < len(res.Missing) {
			var u UnitValue
			if j == len(res.Missing) || i < len(res.Units) && res.Units[i].Time < res.Missing[j].Time {
				u, i = res.Units[i], i+1
			} else {
				u, j = res.Missing[j], j+1
			}
			if !yield(u) {
				return
			}
		}
	}
}

// UnitRowCount is the number of rows of the unit table (UnitRows).
func (res *Result) UnitRowCount() int { return len(res.Units) + len(res.Missing) }

// unitValues finishes the unit values rateReadings made: it marks the
// gaps longer than maxGap, counts each period's readings, gathers the
// readings below zero flow and adds each value to the daily counter.
func (res *Result) unitValues(r *gauged.Rater, maxGap int64, c *counter) {
	var low lowReadings
	for i := range res.Units {
		u := &res.Units[i]
		rt := r.Rating(int(u.Period))
		low.take(u, rt)
		if u.Flags&OutsideRating != 0 && rt != nil {
			if lo, _ := rt.Range(); u.Effective < lo {
				res.BelowTable.take(u)
			} else {
				res.AboveTable.take(u)
			}
		}
		if i > 0 && u.Time-res.Units[i-1].Time > maxGap {
			u.Flags |= Gap
		}
		if u.Period >= 0 && u.Flags&NoRating == 0 {
			res.Periods[u.Period].Readings++
		}
		c.reading(*u)
	}
	res.Warnings = low.warn(len(res.Units), res.Zone, res.Warnings)
}

// lookupFlag is the flag of each way a discharge was found.
var lookupFlag = [...]Flag{
	gauged.InTable:      0,
	gauged.ZeroFlow:     BelowZeroFlow,
	gauged.Extrapolated: Extrapolated,
	gauged.OutsideTable: OutsideRating,
	gauged.NoRating:     NoRating,
}

// summarize words the warnings on what the record holds.
func (res *Result) summarize(c *counter) {
	n := len(res.Units)
	say := func(k int, one, many string) {
		if k > 0 {
			res.Warnings = append(res.Warnings, fmt.Sprintf("%d of %s %s", k, rating.Counted(n, "reading", "readings"), rating.Agree(k, one, many)))
		}
	}
	say(c.flags[bit(NoRating)], "has no rating in force: no discharge", "have no rating in force: no discharge")
	L := res.UnitSystem.Length()
	for _, w := range []string{res.BelowTable.warn(n, "below the lowest row", L, res.Zone), res.AboveTable.warn(n, "above the top row", L, res.Zone)} {
		if w != "" {
			res.Warnings = append(res.Warnings, w)
		}
	}
	say(c.flags[bit(Extrapolated)], "is outside the rating table: discharge extrapolated, as --extrapolate asks",
		"are outside the rating table: discharge extrapolated, as --extrapolate asks")
	say(c.flags[bit(AboveGaugings)], "is above the highest gauging of its rating", "are above the highest gauging of their rating")
	if c.gaps > 0 {
		res.Warnings = append(res.Warnings, fmt.Sprintf("%s longer than %s %s not bridged (the longest %s, from %s)",
			rating.Counted(c.gaps, "gap", "gaps"), FormatDuration(res.MaxGap), rating.Agree(c.gaps, "is", "are"), formatSeconds(c.longest),
			time.Unix(c.longestAt, 0).In(res.Zone).Format(time.RFC3339)))
	}
}

// FormatDuration writes a duration as reports state gaps and as a command
// line takes them, without zero minutes or seconds: 2h, 1h30m, 45m; from
// LongDuration on in days and the rest, as formatSeconds (3 days,
// 146460 days 21h59m), whole seconds.
func FormatDuration(d time.Duration) string {
	if d >= LongDuration {
		return formatSeconds(int64(d / time.Second))
	}
	s := d.String()
	if strings.HasSuffix(s, "m0s") {
		s = strings.TrimSuffix(s, "0s")
	}
	if strings.HasSuffix(s, "h0m") {
		s = strings.TrimSuffix(s, "0m")
	}
	return s
}

// LongDuration is the length of time from which FormatDuration and
// formatSeconds count days: hours beyond two days are hard to read
// (3515061h59m).
const LongDuration = 48 * time.Hour

// formatSeconds writes a length of time of sec ≥ 0 seconds as
// FormatDuration writes it (2h, 1h30m, 45m, 26h0m15s, 3 days 2h) however
// long it is, counted in int64 seconds, where a time.Duration holds at
// most 292 years: from LongDuration on as days of 24 h and the rest.
func formatSeconds(sec int64) string {
	if long := int64(LongDuration / time.Second); sec >= long {
		days, rest := sec/86400, sec%86400
		out := rating.Counted(int(days), "day", "days")
		if rest > 0 {
			out += " " + formatSeconds(rest)
		}
		return out
	}
	h, m, s := sec/3600, sec/60%60, sec%60
	switch {
	case h == 0 && m == 0:
		return fmt.Sprintf("%ds", s)
	case h == 0 && s == 0:
		return fmt.Sprintf("%dm", m)
	case h == 0:
		return fmt.Sprintf("%dm%ds", m, s)
	case m == 0 && s == 0:
		return fmt.Sprintf("%dh", h)
	case s == 0:
		return fmt.Sprintf("%dh%dm", h, m)
	}
	return fmt.Sprintf("%dh%dm%ds", h, m, s)
}

// bit is the index of a single flag's bit.
func bit(f Flag) int {
	for i := 0; i < 16; i++ {
		if f == 1<<i {
			return i
		}
	}
	panic("record: bit of a combined flag")
}

// floorDiv is a/b rounded toward −∞ (b > 0).
func floorDiv(a, b int64) int64 {
	q := a / b
	if a%b != 0 && a < 0 {
		q--
	}
	return q
}

// withinRatings warns when nearly every reading with a rating lies outside
// its rating table (see MostlyOutside), and returns ErrNoDischarge, with
// the same words, when no reading has a discharge at all.
func (res *Result) withinRatings(r *gauged.Rater) error {
	rated, outside, some := 0, 0, false
	lo, hi := math.Inf(1), math.Inf(-1)   // the outside readings' effective gauge heights
	tlo, thi := math.Inf(1), math.Inf(-1) // the tables of their periods
	for _, u := range res.Units {
		some = some || !math.IsNaN(u.Discharge)
		rt := r.Rating(int(u.Period))
		if rt == nil || u.Flags&NoRating != 0 {
			continue
		}
		rated++
		if u.Flags&(OutsideRating|Extrapolated) == 0 {
			continue
		}
		outside++
		lo, hi = min(lo, u.Effective), max(hi, u.Effective)
		a, b := rt.Range()
		tlo, thi = min(tlo, a), max(thi, b)
	}
	why := ""
	if rated > 0 && float64(outside) >= MostlyOutside*float64(rated) {
		L := res.UnitSystem.Length()
		why = fmt.Sprintf("%d of %d readings with a rating lie outside their rating table: their gauge heights (shifts applied) run from %s to %s %s, "+
			"the rating table from %s to %s %s. Are the stage record and the rating in the same unit (m, cm, ft) and on the same gauge datum?",
			outside, rated, stageText(lo), stageText(hi), L, stageText(tlo), stageText(thi), L)
	}
	if some {
		if why != "" {
			res.Warnings = append(res.Warnings, why)
		}
		return nil
	}
	if why == "" {
		why = fmt.Sprintf("%d of %d readings have no rating in force: give a rating for the record's time", len(res.Units)-rated, len(res.Units))
	}
	return fmt.Errorf("%w: %s", ErrNoDischarge, why)
}
