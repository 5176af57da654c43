package gauged

import (
	"errors"
	"math"

	"wetline/rating"
)

// ErrImplausibleN is the cause of a calibration whose best factor makes a
// scaled n implausible: the gaugings, the slope or the datum are then
// wrong for the section rather than its n.
var ErrImplausibleN = errors.New("calibrated n outside the plausible range")

// NRange bounds a plausible Manning's n (dimensionless).
type NRange struct{ Min, Max float64 }

// PlausibleN is the range of a plausible Manning's n, rating.MinN to
// rating.MaxN: the range every n read is held to, and that a calibrated
// n must keep.
var PlausibleN = NRange{Min: rating.MinN, Max: rating.MaxN}

// Check returns an error wrapping ErrImplausibleN when cal's best factor
// is not a finite number above zero, or when the n of a scaled
// subsection of c (every subsection, or the channel's with
// cal.ChannelOnly) times the factor leaves r, naming the factor and the
// n it gives: the gaugings, the slope or the datum are then wrong for
// the section rather than its n. Both calibrate's refusal and fit's
// warning are this error.
func (r NRange) Check(cal Calibration, c rating.HydraulicCurve) error {
	const advice = "check the slope, the datum (elevation = gauge height + datum) and the gaugings' units"
	used := rating.Counted(cal.Used, "gauging", "gaugings")
	if !(cal.Factor > 0) || math.IsInf(cal.Factor, 0) {
		return errorf("%w: the best factor on n from %s is %g, which scales no n: %s", ErrImplausibleN, used, cal.Factor, advice)
	}
	scaled := rating.ScaledN{Geometry: c.Geometry, Factor: cal.Factor, ChannelOnly: cal.ChannelOnly}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, s := range scaled.Subsections() {
		if scaled.Scales(s.Region) && s.N > 0 {
			lo, hi = math.Min(lo, s.N), math.Max(hi, s.N)
		}
	}
	if lo < r.Min || hi > r.Max {
		return errorf("%w: the best factor on n, %.4g from %s, makes n %.4g to %.4g, not %g to %g: %s",
			ErrImplausibleN, cal.Factor, used, lo, hi, r.Min, r.Max, advice)
	}
	return nil
}

// CalibratedGeometry back-calculates n on gaugings (Calibrate) and returns
// the section of c with every n, or only the channel's, multiplied by the
// best factor, the calibration as a rating report states it, and the
// calibration's warnings with a sentence stating it (the number of
// gaugings used, source, datum, the factor with its own standard error,
// and the gaugings' scatter about the calibrated rating, both "not
// estimated" from one gauging) for every report of the calibrated
// section. source names where the gaugings came from.
//
// Errors: Calibrate's; ErrImplausibleN when a scaled n times the factor
// leaves plausible (naming the factor and the n it gives).
func CalibratedGeometry(gs []Gauging, c rating.HydraulicCurve, channelOnly bool, source string, plausible NRange) (rating.ScaledN, *rating.NCalibration, []string, error) {
	cal, err := Calibrate(gs, c, channelOnly)
	if err != nil {
		return rating.ScaledN{}, nil, nil, err
	}
	if err := plausible.Check(cal, c); err != nil {
		return rating.ScaledN{}, nil, nil, err
	}
	scaled := rating.ScaledN{Geometry: c.Geometry, Factor: cal.Factor, ChannelOnly: channelOnly}
	which := "every n"
	if channelOnly {
		which = "the channel's n"
	}
	u := c.Options.Units
	ses := " (standard errors not estimated from one gauging)"
	if !math.IsNaN(cal.StandardErrorPercent) {
		ses = sayf(" (standard error of the factor %.2f %%); the gaugings scatter %.2f %% about the calibrated rating (standard error of estimate)",
			cal.FactorStandardErrorPercent, cal.StandardErrorPercent)
	}
	plural := "s"
	if cal.Used == 1 {
		plural = ""
	}
	notes := append([]string(nil), cal.Warnings...)
	notes = append(notes, sayf(
		"n calibrated on %d gauging%s in %s (gauge datum: elevation = gauge height %s %s): %s multiplied by %.4f%s",
		cal.Used, plural, source, rating.DatumTerm(c.Datum), u.Length(), which, cal.Factor, ses))
	state := &rating.NCalibration{Source: source, Gaugings: cal.Used, ChannelOnly: channelOnly, Factor: cal.Factor,
		FactorStandardErrorPercent: cal.FactorStandardErrorPercent, StandardErrorPercent: cal.StandardErrorPercent}
	return scaled, state, notes, nil
}
