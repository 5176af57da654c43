package survey

import (
	"errors"
	"fmt"
	"strings"

	"wetline/rating"
	"wetline/rating/gauged"
)

// Columns a rating fit writes beside stage and discharge (survey/results
// writes them; read back here for redrawing).
const (
	ColFitBasis           = "basis"
	ColFitParametricLower = "parametric_lower_95"
	ColFitParametricUpper = "parametric_upper_95"
	ColFitTotalLower      = "total_lower_95"
	ColFitTotalUpper      = "total_upper_95"
	// ColFitLower and ColFitUpper bound the band of the relation in tables
	// written before the parametric columns (the same band).
	ColFitLower = "lower_95"
	ColFitUpper = "upper_95"
)

// fitOnlyColumns are the columns only a rating fit's table has: its basis
// and its bands. A rating table may have an extrapolated column of its own
// (rows above the highest gauging), so that column alone does not make a
// table a fit's.
func fitOnlyColumns() []string {
	return []string{ColFitBasis, ColFitParametricLower, ColFitParametricUpper, ColFitTotalLower, ColFitTotalUpper, ColFitLower, ColFitUpper}
}

// IsFitTable reports whether t has a column only a rating fit's table has
// (fitOnlyColumns: basis or a band bound).
func IsFitTable(t *Table) bool {
	for _, c := range fitOnlyColumns() {
		if t.Column(c) >= 0 {
			return true
		}
	}
	return false
}

// ErrFitBasis is the cause of a basis cell that names no basis a fit
// writes.
var ErrFitBasis = errors.New("not a basis of a fitted row")

// fitBases are the bases a fit writes, by their words.
func fitBases() []gauged.Basis {
	return []gauged.Basis{gauged.WithinGaugings, gauged.BelowGaugings, gauged.HydraulicAbove, gauged.FitAboveGaugings, gauged.ConveyanceSlopeAbove}
}

// FitRowsFromTable reads back what a rating fit's table says of each row
// beside its stage and discharge, for a table rt that RatingFromTable
// read from t without error: what the row rests on (its basis column,
// else its extrapolated column: an extrapolated row before the first one
// within the gaugings lies below them, after it above), and the bounds
// of the 95 % bands of the relation (parametric_lower_95 and
// parametric_upper_95, else lower_95 and upper_95) and of one discharge
// (total_lower_95 and total_upper_95), NaN where blank or absent. It
// returns nil for a table with neither a basis nor an extrapolated
// column (not a fit's). A basis no fit writes is ErrFitBasis, an extrapolated cell of another
// word ErrExtrapolatedWord, a bad
// bound a number error and a bound or hydraulic discharge beyond
// ±rating.MaxDischarge ErrImplausible, each a *ParseError at its cell.
func FitRowsFromTable(t *Table, rt rating.Table) ([]gauged.ControlRow, error) {
	cb, cx := t.Column(ColFitBasis), t.Column(ColRatingExtrapolated)
	if cb < 0 && cx < 0 {
		return nil, nil
	}
	if len(t.Records) != len(rt.Rows) {
		return nil, &ParseError{File: t.File, Sheet: t.Sheet, Err: fmt.Errorf("%d rows read of %d: read the table with RatingFromTable first", len(rt.Rows), len(t.Records))}
	}
	lower, upper := ColFitParametricLower, ColFitParametricUpper
	if t.Column(lower) < 0 && t.Column(upper) < 0 {
		lower, upper = ColFitLower, ColFitUpper
	}
	cells := rowCells{t: t}
	rows := make([]gauged.ControlRow, len(rt.Rows))
	within := false // a row within the gaugings read
	for i, rec := range t.Records {
		r := gauged.ControlRow{Stage: rt.Rows[i].Stage, Discharge: rt.Rows[i].Discharge,
			ParametricLower: cells.optional(rec, lower, rating.MaxDischarge), ParametricUpper: cells.optional(rec, upper, rating.MaxDischarge),
			TotalLower: cells.optional(rec, ColFitTotalLower, rating.MaxDischarge), TotalUpper: cells.optional(rec, ColFitTotalUpper, rating.MaxDischarge),
			Hydraulic: cells.optional(rec, "hydraulic", rating.MaxDischarge)}
		word, known := strings.TrimSpace(t.Cell(rec, cb)), false
		for _, b := range fitBases() {
			if word != "" && strings.EqualFold(word, b.String()) {
				r.Basis, known = b, true
			}
		}
		if x := t.Cell(rec, cx); cx >= 0 && !yesWord(x) && !noWord(x) {
			cells.errs = append(cells.errs, t.At(rec, cx, fmt.Errorf("%q: %w", x, ErrExtrapolatedWord)))
		}
		switch {
		case word != "" && !known:
			cells.errs = append(cells.errs, t.At(rec, cb, fmt.Errorf("%w: %q (a fit writes %s)", ErrFitBasis, word, basisWords())))
		case known:
		case cx >= 0 && yesWord(t.Cell(rec, cx)) && within:
			r.Basis = gauged.FitAboveGaugings
		case cx >= 0 && yesWord(t.Cell(rec, cx)):
			r.Basis = gauged.BelowGaugings
		}
		within = within || !r.Extrapolated()
		rows[i] = r
	}
	if err := cells.errs.err(); err != nil {
		return nil, err
	}
	return rows, nil
}

// basisWords lists the bases a fit writes, quoted.
func basisWords() string {
	var w []string
	for _, b := range fitBases() {
		w = append(w, fmt.Sprintf("%q", b.String()))
	}
	return strings.Join(w, ", ")
}
