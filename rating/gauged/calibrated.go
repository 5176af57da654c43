package gauged

import (
	"fmt"
	"strconv"

	"wetline/rating"
)

// CalibratedGeometry back-calculates n on gaugings (Calibrate) and returns
// the section of c with every n, or only the channel's, multiplied by the
// best factor, with the calibration's warnings and a sentence stating it
// (the number of gaugings, source, datum and factor) for every report of
// the calibrated section. source names where the gaugings came from.
func CalibratedGeometry(gs []Gauging, c rating.HydraulicCurve, channelOnly bool, source string) (rating.ScaledN, []string, error) {
	cal, err := Calibrate(gs, c, channelOnly)
	if err != nil {
		return rating.ScaledN{}, nil, err
	}
	which := "every n"
	if channelOnly {
		which = "the channel's n"
	}
	u := c.Options.Units
	notes := append([]string(nil), cal.Warnings...)
	notes = append(notes, fmt.Sprintf(
		"n calibrated on %d gaugings in %s (gauge datum: elevation = gauge height + %s %s): %s multiplied by %.4f; standard error against them %.1f %%",
		len(gs), source, strconv.FormatFloat(c.Datum, 'g', 6, 64), u.Length(), which, cal.Factor, cal.StandardErrorPercent))
	return rating.ScaledN{Geometry: c.Geometry, Factor: cal.Factor, ChannelOnly: channelOnly}, notes, nil
}
