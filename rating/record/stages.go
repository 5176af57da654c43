package record

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"time"
)

// Stages is a record of gauge heights in compact arrays (a 30-year record
// of 15-minute readings is about a million of them).
type Stages struct {
	// Name identifies the record in reports (its file).
	Name string
	// Time holds the readings' times as Unix seconds, strictly ascending.
	Time []int64
	// Stage holds the gauge heights (length unit), finite.
	Stage []float64
	// Quality, when not nil, holds each reading's quality as an index into
	// Qualities (0 for none).
	Quality []uint16
	// Qualities are the distinct quality words of the record; the first is
	// "" (no quality).
	Qualities []string
	// Missing holds the times (Unix seconds, strictly ascending, none of
	// them in Time) of the record's missing readings: times written with
	// no gauge height. They are listed in the unit values, flagged
	// Missing, and take no part in any computation.
	Missing []int64
	// MissingQuality, when not nil, holds each missing reading's quality
	// as an index into Qualities (0 for none), one per Missing, so that
	// the unit values list it as they list a reading's.
	MissingQuality []uint16
}

// Len is the number of readings.
func (s *Stages) Len() int { return len(s.Time) }

// Causes of a stage record that cannot be used, for errors.Is.
var (
	ErrStagesLength = errors.New("the arrays of a stage record differ in length")
	ErrStagesOrder  = errors.New("times of a stage record must increase from reading to reading")
	ErrStageValue   = errors.New("a gauge height must be a finite number")
	ErrQualityIndex = errors.New("a reading's quality is not among the record's qualities")
	ErrNoReadings   = errors.New("the stage record has no readings")
	ErrStagesSpan   = errors.New("the stage record spans more than 500 years")
	ErrStagesTime   = errors.New("a reading's time must lie in the years 0001 to 9999")
)

// MaxSpan bounds the time from a record's first reading to its last, in
// seconds: 500 years of 365.25 days. The survey readers take times of the
// years 1800 to 2200 only, so every record read from a file lies within
// it; the bound keeps the daily table, one value a day, within 182 625
// days, and every interval between readings far within int64 seconds.
const MaxSpan int64 = 500 * 36525 * 864

// minTime and maxTime bound a reading's time (Unix seconds): the years
// 0001 to 9999, which RFC 3339 writes.
var (
	minTime = time.Date(1, 1, 1, 0, 0, 0, 0, time.UTC).Unix()
	maxTime = time.Date(9999, 12, 31, 23, 59, 59, 0, time.UTC).Unix()
)

// A StagesError reports a reading of a stage record that cannot be used.
type StagesError struct {
	// Index is the 0-based reading, -1 for the whole record.
	Index int
	Err   error
}

func (e *StagesError) Error() string {
	if e.Index < 0 {
		return e.Err.Error()
	}
	return fmt.Sprintf("reading %d: %v", e.Index+1, e.Err)
}

func (e *StagesError) Unwrap() error { return e.Err }

// Validate checks the record and returns the first problem as a
// *StagesError, or nil: arrays of unequal length, times outside the years
// 0001 to 9999 (ErrStagesTime) or not ascending, a first and a last reading
// more than MaxSpan apart (ErrStagesSpan), gauge heights not finite,
// qualities not among Qualities (of the readings or the missing readings,
// whose qualities, when given, are one per missing reading).
func (s *Stages) Validate() error {
	n := len(s.Time)
	if n == 0 {
		return &StagesError{Index: -1, Err: ErrNoReadings}
	}
	if len(s.Stage) != n || s.Quality != nil && len(s.Quality) != n {
		return &StagesError{Index: -1, Err: fmt.Errorf("%w: %d times, %d stages, %d qualities", ErrStagesLength, n, len(s.Stage), len(s.Quality))}
	}
	for i, t := range s.Time {
		if t < minTime || t > maxTime {
			return &StagesError{Index: i, Err: fmt.Errorf("%w: %d seconds from 1970-01-01T00:00:00Z", ErrStagesTime, t)}
		}
		if i > 0 && t <= s.Time[i-1] {
			return &StagesError{Index: i, Err: fmt.Errorf("%w: %s after %s", ErrStagesOrder, utc(t), utc(s.Time[i-1]))}
		}
		if h := s.Stage[i]; math.IsNaN(h) || math.IsInf(h, 0) {
			return &StagesError{Index: i, Err: ErrStageValue}
		}
		if s.Quality != nil && int(s.Quality[i]) >= max(1, len(s.Qualities)) {
			return &StagesError{Index: i, Err: ErrQualityIndex}
		}
	}
	if s.MissingQuality != nil && len(s.MissingQuality) != len(s.Missing) {
		return &StagesError{Index: -1, Err: fmt.Errorf("%w: %d missing readings, %d qualities", ErrStagesLength, len(s.Missing), len(s.MissingQuality))}
	}
	for i, q := range s.MissingQuality {
		if int(q) >= max(1, len(s.Qualities)) {
			return &StagesError{Index: -1, Err: fmt.Errorf("missing reading %d: %w", i+1, ErrQualityIndex)}
		}
	}
	for i, t := range s.Missing {
		if t < minTime || t > maxTime {
			return &StagesError{Index: -1, Err: fmt.Errorf("missing reading %d: %w: %d seconds from 1970-01-01T00:00:00Z", i+1, ErrStagesTime, t)}
		}
		if i > 0 && t <= s.Missing[i-1] {
			return &StagesError{Index: -1, Err: fmt.Errorf("missing reading %d: %w: %s after %s", i+1, ErrStagesOrder, utc(t), utc(s.Missing[i-1]))}
		}
	}
	if first, last := s.Time[0], s.Time[n-1]; last-first > MaxSpan {
		return &StagesError{Index: n - 1, Err: fmt.Errorf("%w: from %s to %s", ErrStagesSpan, utc(first), utc(last))}
	}
	return nil
}

// QualityOf returns the quality word of reading i ("" when none).
func (s *Stages) QualityOf(i int) string {
	if s.Quality == nil || int(s.Quality[i]) >= len(s.Qualities) {
		return ""
	}
	return s.Qualities[s.Quality[i]]
}

func utc(sec int64) string { return time.Unix(sec, 0).UTC().Format(time.RFC3339) }

// Flag marks a unit or daily value. Flags combine as bits.
type Flag uint16

// Flags of unit and daily values.
const (
	// AboveGaugings: the effective stage is above the highest gauging of
	// the rating in force.
	AboveGaugings Flag = 1 << iota
	// BelowZeroFlow: the effective stage is at or below the rating's gauge
	// height of zero flow; the discharge is zero.
	BelowZeroFlow
	// OutsideRating: the effective stage is outside the rating table; no
	// discharge.
	OutsideRating
	// Extrapolated: the effective stage is outside the rating table and
	// the discharge was extrapolated, as the rating asked.
	Extrapolated
	// Gap: on a unit value, the reading before it is more than the maximum
	// gap away; on a daily value, such a gap falls in the day.
	Gap
	// NoRating: no rating is in force (outside every rating period, or in a
	// period without a rating); no discharge.
	NoRating
	// Partial: on a daily value, less than the whole day is covered.
	Partial
	// Missing: on a unit value, a missing reading (a time with no gauge
	// height, or a missing-value code read as a stage): no shift,
	// effective stage or discharge, and no part in the daily values.
	Missing
)

// flagWords are the words of the flags, in bit order.
var flagWords = [...]string{"above_gaugings", "below_zero_flow", "outside_rating", "extrapolated", "gap", "no_rating", "partial", "missing"}

// FlagWords returns the words of every flag, in bit order. The slice is new
// on every call.
func FlagWords() []string { return append([]string(nil), flagWords[:]...) }

// Words returns the words of the flags set, in bit order.
func (f Flag) Words() []string {
	var out []string
	for i, w := range flagWords {
		if f&(1<<i) != 0 {
			out = append(out, w)
		}
	}
	return out
}

// String returns the words of the flags set, separated by spaces ("" when
// none).
func (f Flag) String() string { return strings.Join(f.Words(), " ") }
