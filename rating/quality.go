package rating

import (
	"errors"
	"math"
	"strings"
)

// Quality is the rated quality of a field observation: of a discharge
// measurement (a gauging) or of a high-water mark. The same four words rate
// both; each has its own band. The zero value is Unrated.
type Quality int

// Qualities, best first.
const (
	Unrated Quality = iota
	Excellent
	Good
	Fair
	Poor
)

// qualityWords are the words of the qualities, in the order of the
// constants (Unrated is blank).
var qualityWords = [...]string{"", "excellent", "good", "fair", "poor"}

// QualityWords returns the quality words, best first: excellent, good,
// fair, poor. The slice is new on every call.
func QualityWords() []string {
	return append([]string(nil), qualityWords[1:]...)
}

// QualityLetters returns the one-letter forms of the quality words that
// ParseQuality takes as well, best first: E, G, F, P (the first letter of
// each of QualityWords, upper case; read in any case). The slice is new on
// every call.
func QualityLetters() []string {
	var out []string
	for _, w := range qualityWords[1:] {
		out = append(out, strings.ToUpper(w[:1]))
	}
	return out
}

// AcceptedQualityWords returns every word ParseQuality takes besides a
// blank: QualityWords, then QualityLetters. The slice is new on every
// call.
func AcceptedQualityWords() []string {
	return append(QualityWords(), QualityLetters()...)
}

// QualityChoices says in prose what a quality cell may hold, from the
// lists ParseQuality reads: "excellent, good, fair or poor (or E, G, F,
// P, or blank)".
func QualityChoices() string {
	w := QualityWords()
	return strings.Join(w[:len(w)-1], ", ") + " or " + w[len(w)-1] + " (or " + strings.Join(QualityLetters(), ", ") + ", or blank)"
}

// ErrQuality is returned for an unknown quality word.
var ErrQuality = errors.New("quality must be " + QualityChoices())

// ParseQuality reads a quality word: one of QualityWords, one of
// QualityLetters, or blank for Unrated; any case. Other text is
// ErrQuality.
func ParseQuality(s string) (Quality, error) {
	w := strings.ToLower(strings.TrimSpace(s))
	if w == "" {
		return Unrated, nil
	}
	for i, word := range qualityWords[1:] {
		if w == word || w == word[:1] { // QualityLetters, lower case
			return Quality(i + 1), nil
		}
	}
	return Unrated, ErrQuality
}

// String returns the quality word ("" for Unrated).
func (q Quality) String() string {
	if q < 0 || int(q) >= len(qualityWords) {
		return ""
	}
	return qualityWords[q]
}

// Measurement-quality bands in percent of the measured discharge: the
// agency's ratings of a discharge measurement, excellent within 2 %, good
// within 5 %, fair within 8 %, poor over 8 % of the true discharge
// (Turnipseed & Sauer, 2010, Discharge measurements at gaging stations,
// USGS Techniques and Methods 3-A8; the same bands head the public
// measurement lists of the agency, as in testdata/reference).
const (
	ExcellentBandPercent = 2.0
	GoodBandPercent      = 5.0
	FairBandPercent      = 8.0
	// PoorBandPercent is the lower limit of a poor measurement's error: a
	// poor gauging's band is open above, so its departures are never flagged.
	PoorBandPercent = 8.0
	// PoorWeightPercent is the error assumed for a poor gauging when
	// weighting a fit: 1.5 times the fair band (a project choice; the agency
	// gives no upper bound).
	PoorWeightPercent = 12.0
)

// BandPercent is the quality's error band for a discharge measurement in
// percent: 2, 5, 8, 8 (poor: the lower limit of an open band) and NaN for
// Unrated.
func (q Quality) BandPercent() float64 {
	switch q {
	case Excellent:
		return ExcellentBandPercent
	case Good:
		return GoodBandPercent
	case Fair:
		return FairBandPercent
	case Poor:
		return PoorBandPercent
	}
	return math.NaN()
}

// Outside reports whether a departure (percent) of a measured discharge
// lies outside the band it is held to: its WeightPercent, the band a fit
// weights it by (the fair band for an unrated gauging). A poor gauging's
// band is open above (more than PoorBandPercent), so it is never outside.
func (q Quality) Outside(departurePercent float64) bool {
	return q != Poor && math.Abs(departurePercent) > q.WeightPercent()
}

// WeightPercent is the error in percent used to weight a gauging in a fit:
// the band for excellent, good and fair, PoorWeightPercent for poor, and
// the fair band for an unrated gauging (a project choice).
func (q Quality) WeightPercent() float64 {
	switch q {
	case Excellent, Good, Fair:
		return q.BandPercent()
	case Poor:
		return PoorWeightPercent
	}
	return FairBandPercent
}

// Weight is the relative weight of a gauging in a log-space fit, 1/σ² with
// σ the WeightPercent: a log residual's spread is proportional to the
// relative error of the measurement.
func (q Quality) Weight() float64 {
	s := q.WeightPercent()
	return 1 / (s * s)
}

// markBandFeet are the elevation bands of high-water-mark quality ratings
// in feet, by quality (Koenig and others, 2016, Identifying and preserving
// high-water mark data, USGS Techniques and Methods 3-A24: excellent
// ±0.05 ft, good ±0.10, fair ±0.20, poor ±0.40; from memory).
var markBandFeet = [...]float64{Excellent: 0.05, Good: 0.10, Fair: 0.20, Poor: 0.40}

// MarkSD returns the standard deviation of one high-water mark of quality
// q, taking the rating's elevation band as one standard deviation, in the
// length unit of u. ok is false for Unrated.
func (q Quality) MarkSD(u Units) (sd float64, ok bool) {
	if q <= Unrated || int(q) >= len(markBandFeet) {
		return 0, false
	}
	ft := markBandFeet[q]
	if u == US {
		return ft, true
	}
	return ft / FeetPerMetre, true
}
