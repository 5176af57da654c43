package main

import (
	"fmt"
	"math"

	"github.com/spf13/pflag"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/survey"
	"wetline/survey/results"
)

// calibrateFlags let a command scale the survey's n so that its hydraulic
// rating honours a file of gaugings.
type calibrateFlags struct {
	gaugings    string
	sheet       string
	datum       float64
	channelOnly bool
}

func (c *calibrateFlags) register(fs *pflag.FlagSet) {
	fs.StringVar(&c.gaugings, "calibrate", "", "gaugings file: scale n by the factor that best fits them (least squares in ln Q)")
	fs.StringVar(&c.sheet, "gaugings-sheet", "", "workbook sheet of the gaugings (default: a sheet named gaugings, else the first)")
	fs.Float64Var(&c.datum, "datum", 0, "with --calibrate: elevation of the gauge's zero, elevation = gauge height + DATUM")
	fs.BoolVar(&c.channelOnly, "channel-only", false, "with --calibrate: scale only the main channel's n")
}

// apply calibrates n on the gaugings, when asked, and replaces the loaded
// geometry by the scaled one; the factor and the datum are stated among
// the warnings so that every report carries them.
func (c *calibrateFlags) apply(l *loaded, slope float64, changed func(string) bool) error {
	if c.gaugings == "" {
		for _, name := range []string{"gaugings-sheet", "datum", "channel-only"} {
			if changed(name) {
				return usagef("--%s needs --calibrate GAUGINGS", name)
			}
		}
		return nil
	}
	if math.IsNaN(c.datum) || math.IsInf(c.datum, 0) {
		return usagef("--datum must be a finite number")
	}
	gs, err := survey.ReadGaugings(c.gaugings, c.sheet)
	if err != nil {
		return err
	}
	curve := rating.HydraulicCurve{Geometry: l.geom, Datum: c.datum,
		Options: rating.Options{Slope: slope, Units: l.units, Geometry: l.geomOpt}}
	cal, err := gauged.Calibrate(gs.Gaugings, curve, c.channelOnly)
	if err != nil {
		return fmt.Errorf("%s: %w", c.gaugings, err)
	}
	which := "every n"
	if c.channelOnly {
		which = "the channel's n"
	}
	l.inputs = append(l.inputs, c.gaugings)
	l.warnings = append(l.warnings, gs.Warnings...)
	l.warnings = append(l.warnings, cal.Warnings...)
	l.warnings = append(l.warnings, fmt.Sprintf(
		"n calibrated on %d gaugings in %s (gauge datum: elevation = gauge height + %s %s): %s multiplied by %.4f; standard error against them %.1f %%",
		len(gs.Gaugings), c.gaugings, results.FormatFloat(c.datum), l.units.Length(), which, cal.Factor, cal.StandardErrorPercent))
	l.geom = rating.ScaledN{Geometry: l.geom, Factor: cal.Factor, ChannelOnly: c.channelOnly}
	return nil
}
