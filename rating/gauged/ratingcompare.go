package gauged

import (
	"fmt"
	"math"
	"sort"

	"wetline/rating"
)

// RatingDifference is two ratings at one gauge height.
type RatingDifference struct {
	// Stage is the gauge height (length unit).
	Stage float64
	// A and B are the two ratings' discharges (discharge unit).
	A, B float64
	// Difference is B − A (discharge unit); Percent is 100·(B − A)/A
	// (NaN where A is zero).
	Difference, Percent float64
	// Shift is the gauge-height shift that makes A give B's discharge at
	// this stage, A(Stage + Shift) = B, as a shift is added to the gauge
	// height (length unit; NaN where B is zero or outside A's rows): B
	// read as A shifted, the form a channel change takes at a section
	// control.
	Shift float64
}

// RatingComparison is two ratings over the range of stage they share: the
// report of a comparison of two ratings, in every format.
type RatingComparison struct {
	// Provenance says what was read and by what (set by the caller).
	Provenance rating.Provenance
	// Units label the values (CompareOptions.Units); nothing is converted.
	Units rating.Units
	// A and B name the ratings.
	A, B string
	// TableA and TableB are the two rating tables as compared.
	TableA, TableB RatingTable
	// From and To bound the common range of stage (length unit).
	From, To float64
	// Rows ascend in stage.
	Rows []RatingDifference
	// MaxPercent is the largest absolute percent difference (percent) and
	// MaxStage its gauge height (length unit); NaN when no row has one.
	// Near zero flow a small difference is a large percentage, so
	// MaxDifference, the largest absolute B − A (discharge unit), and its
	// gauge height MaxDifferenceStage are given beside it.
	MaxPercent, MaxStage float64
	// MaxDifference is the B − A of the largest absolute size (discharge
	// unit) and MaxDifferenceStage its gauge height (length unit).
	MaxDifference, MaxDifferenceStage float64
	// ExtrapolatedA and ExtrapolatedB say where in the common range each
	// table is extrapolated above the highest gauging it rests on (rows
	// marked extrapolated; RatingTable.HighGauging).
	ExtrapolatedA, ExtrapolatedB Extrapolation
	// Warnings are facts a reviewer should see.
	Warnings []string
	// Figures are the report's pictures (none until drawn).
	Figures []rating.Figure
}

// MaxPercentSigned is the percent difference 100·(B − A)/A of the row at
// MaxStage, with its sign (MaxPercent is its size): negative where B
// gives less than A. NaN when no row has a percent difference.
func (c *RatingComparison) MaxPercentSigned() float64 {
	for _, r := range c.Rows {
		if r.Stage == c.MaxStage && !math.IsNaN(r.Percent) {
			return r.Percent
		}
	}
	return c.MaxPercent
}

// Extrapolation is the part of a comparison's common range where one
// table lies above its highest gauging.
type Extrapolation struct {
	// Known says whether the table's highest gauging is known
	// (RatingTable.HasHighGauging); without it nothing is said.
	Known bool
	// From and To bound the stages of the common range above the highest
	// gauging (length unit): From is the highest gauging, or the start of
	// the range when that lies below it; both NaN when no stage of the
	// range is above it.
	From, To float64
}

// Any reports stages of the common range above the highest gauging.
func (e Extrapolation) Any() bool { return e.Known && e.From < e.To }

// extrapolationOf returns where, in from..to, the stages lie above r's
// highest gauging.
func extrapolationOf(r *TableRating, from, to float64) Extrapolation {
	t := r.table
	e := Extrapolation{Known: t.HasHighGauging, From: math.NaN(), To: math.NaN()}
	if e.Known && t.HighGauging < to {
		e.From, e.To = math.Max(from, t.HighGauging), to
	}
	return e
}

// CompareOptions configure CompareRatings. The zero value compares at
// every row stage of either table within the common range.
type CompareOptions struct {
	// Step is the stage step (length unit, ≥ 0; 0 = every row stage of
	// either table in the common range). The ends of the range are always
	// compared.
	Step float64
	// Units label the values in reports (default SI); nothing is converted.
	Units rating.Units
}

// CompareRatings sets two ratings side by side at every stage of the range
// both tables cover (a rating revision, say): each discharge, the
// difference B − A and the percent difference 100·(B − A)/A. Neither
// table is read beyond its rows: the range is where both have rows. Rows
// above a table's highest gauging are extrapolated beyond the
// measurements, and the comparison says where in the range they lie
// (ExtrapolatedA, ExtrapolatedB). Each row also gives the shift of A's
// gauge height that carries B's discharge (RatingDifference.Shift). Ratings
// that share no range give ErrNoCommonRange.
func CompareRatings(a, b *TableRating, opt CompareOptions) (RatingComparison, error) {
	alo, ahi := a.Range()
	blo, bhi := b.Range()
	nan := math.NaN()
	c := RatingComparison{Units: opt.Units, A: a.Name(), B: b.Name(), TableA: a.Table(), TableB: b.Table(),
		From: math.Max(alo, blo), To: math.Min(ahi, bhi), MaxPercent: nan, MaxStage: nan, MaxDifference: nan, MaxDifferenceStage: nan}
	if !(c.From < c.To) {
		return c, fmt.Errorf("%w: %g to %g and %g to %g", ErrNoCommonRange, alo, ahi, blo, bhi)
	}
	c.ExtrapolatedA, c.ExtrapolatedB = extrapolationOf(a, c.From, c.To), extrapolationOf(b, c.From, c.To)
	stages, err := c.stages(a, b, opt.Step)
	if err != nil {
		return c, err
	}
	for _, h := range stages {
		qa, _ := a.Discharge(h)
		qb, _ := b.Discharge(h)
		d := RatingDifference{Stage: h, A: qa, B: qb, Difference: qb - qa, Percent: nan, Shift: nan}
		if qa > 0 {
			d.Percent = 100 * (qb - qa) / qa
			if math.IsNaN(c.MaxPercent) || math.Abs(d.Percent) > c.MaxPercent {
				c.MaxPercent, c.MaxStage = math.Abs(d.Percent), h
			}
		}
		if math.IsNaN(c.MaxDifference) || math.Abs(d.Difference) > math.Abs(c.MaxDifference) {
			c.MaxDifference, c.MaxDifferenceStage = d.Difference, h
		}
		if ha, err := a.Stage(qb); err == nil {
			d.Shift = ha - h
		}
		c.Rows = append(c.Rows, d)
	}
	return c, nil
}

// stages lays out the comparison's stages.
func (c *RatingComparison) stages(a, b *TableRating, step float64) ([]float64, error) {
	if step > 0 {
		return roundStages(c.From, c.To, step)
	}
	if step < 0 || math.IsNaN(step) {
		return nil, fmt.Errorf("%w: step %g", rating.ErrStages, step)
	}
	out := []float64{c.From, c.To}
	for _, r := range []*TableRating{a, b} {
		for _, h := range r.h {
			if h > c.From && h < c.To {
				out = append(out, h)
			}
		}
	}
	sort.Float64s(out)
	return rating.SortedStages(out), nil
}

// roundStages returns from, the multiples of step strictly between from
// and to, and to: a comparison at round gauge heights (0.5, 1.0, …) whose
// ends are the common range's. More than rating.MaxStages stages is
// rating.ErrStepTooFine.
func roundStages(from, to, step float64) ([]float64, error) {
	k0, k1 := math.Floor(from/step)+1, math.Ceil(to/step)-1
	if n := k1 - k0 + 3; !(n <= rating.MaxStages) {
		return nil, fmt.Errorf("%w: %.3g stages from %g to %g is more than %d", rating.ErrStepTooFine, n, from, to, rating.MaxStages)
	}
	out := []float64{from}
	for k := k0; k <= k1; k++ {
		// k·step rounded to the step's own decimals, so 0.1·3 is 0.3.
		h := roundTo(k*step, step)
		if h > from && h < to {
			out = append(out, h)
		}
	}
	return append(out, to), nil
}

// roundTo rounds x to the decimals step is written with (up to 9).
func roundTo(x, step float64) float64 {
	p := 1.0
	for i := 0; i < 9 && math.Abs(step*p-math.Round(step*p)) > 1e-9*step*p; i++ {
		p *= 10
	}
	return math.Round(x*p) / p
}
