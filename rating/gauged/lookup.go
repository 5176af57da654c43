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
	lo := t.Rows[0].Stage
	return lookupAt(lo, t.Rows[len(t.Rows)-1].Stage, func(h float64) (FitRow, error) {
		return t.At(f, c, math.Max(h, lo))
	})
}

// lookupAt evaluates at every hundredth of stage from lo (a table's first
// row, its gauge height of zero flow or first offset) to hi, for a printed
// lookup sheet (rating.LookupStages): the hundredths below lo are left out
// (no flow, left blank). at gives the row of a hundredth; its first error
// is returned alone.
func lookupAt[R any](lo, hi float64, at func(h float64) (R, error)) ([]R, error) {
	stages, err := rating.LookupStages(lo, hi)
	if err != nil {
		return nil, err
	}
	out := make([]R, 0, len(stages))
	for _, h := range stages {
		if h < lo-lookupEdge {
			continue
		}
		row, err := at(h)
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
