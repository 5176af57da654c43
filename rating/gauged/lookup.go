package gauged

import (
	"math"

	"wetline/rating"
)

// LookupRows evaluates a fitted table's rule (FitTable.At) at every
// hundredth of stage from its first row (the gauge height of zero flow) to
// its last, for a printed lookup sheet: hundredths below the first row are
// left out (no flow). f and c are the fit and the hydraulic rating (nil
// when none) the table was laid out with. A range longer than
// rating.MaxLookupStages is rating.ErrLookupRange.
func LookupRows(f *Fit, c *rating.HydraulicCurve, t *FitTable) ([]FitRow, error) {
	if f == nil || t == nil || len(t.Rows) == 0 {
		return nil, nil
	}
	lo, hi := t.Rows[0].Stage, t.Rows[len(t.Rows)-1].Stage
	stages, err := rating.LookupStages(lo, hi)
	if err != nil {
		return nil, err
	}
	out := make([]FitRow, 0, len(stages))
	for _, h := range stages {
		if h < lo-lookupEdge {
			continue // below e: no flow, left blank
		}
		row, err := t.At(f, c, math.Max(h, lo))
		if err != nil {
			return nil, err
		}
		out = append(out, row)
	}
	return out, nil
}

// lookupEdge is how far below the first row a hundredth may lie and
// still be taken to be on it (round-off of a stage written in hundredths).
const lookupEdge = 1e-6
