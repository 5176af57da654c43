package main

import (
	"context"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"wetline/survey/output"
)

// demoGaugeReach lists the surveyed sections of the demo reach, upstream first.
var demoGaugeReach = []string{"tallow-xs2.csv", demoSurvey, "tallow-xs3.csv"}

// demoBatch copies the reach's three sections into a folder and rates them
// all at once, as `wetline rate DIR -o OUT` does.
func demoBatch(ctx context.Context, e *env, dir string) error {
	reach := filepath.Join(dir, "tallow-reach")
	if err := os.MkdirAll(reach, 0o755); err != nil {
		return err
	}
	for _, name := range demoGaugeReach {
		data, err := demoFiles.ReadFile("demodata/" + name)
		if err != nil {
			return err
		}
		if err := output.WriteFile(filepath.Join(reach, name), nil, func(w io.Writer) error {
			_, err := w.Write(data)
			return err
		}); err != nil {
			return err
		}
	}
	fmt.Fprintf(e.stdout, "  %-28s %s\n", "tallow-reach/", fmt.Sprintf("%d surveyed sections of Tallow Creek around the gauge", len(demoGaugeReach)))
	out := filepath.Join(dir, "tallow-reach-ratings")
	f := &rateFlags{sectionFlags: sectionFlags{units: "si"}, slope: demoSlope,
		from: math.NaN(), to: math.NaN(), step: math.NaN(), output: out}
	quiet := &env{stdout: io.Discard, stderr: io.Discard}
	if err := runBatch(ctx, quiet, f, []string{reach}); err != nil {
		return err
	}
	fmt.Fprintf(e.stdout, "  %-28s %s\n", "tallow-reach-ratings/", "their rating tables at once (batch mode) and index.csv with bankfull discharges")
	return nil
}
