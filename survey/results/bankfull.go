package results

import (
	"fmt"
	"math"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/survey/workbook"
)

// SameStage is the distance (length unit) within which a rated stage is
// taken for the bankfull stage itself: far finer than any survey.
const SameStage = 1e-9

// Bankfull is a section's bankfull stage and the discharge there, as a
// rating report gives them.
type Bankfull struct {
	// Known reports that the section has two bank marks.
	Known bool
	// Stage is the bankfull stage in the table's stages (a gauge height
	// when the table's are), and Elevation the same in the survey's datum
	// (length unit).
	Stage, Elevation float64
	// Discharge is the rated discharge at Stage (discharge unit); NaN when
	// Stage lies outside the rated stages (none is carried beyond them).
	Discharge float64
	// From and To are the rated stages Discharge was read from (length
	// unit): both Stage when a row was rated there, else the two rated
	// stages below it whose power law was carried up to it (From < To <
	// Stage), or, with a single rated stage below, that one and the next
	// above it (From < Stage < To).
	From, To float64
}

// BankfullOf returns the bankfull stage of a report's section (the lower
// of its two bank tops: subdivide.Section.Bankfull) and the discharge
// there, read from the finer of the report's lookup table and its table.
// It is the row rated at that stage when there is one. Otherwise the
// power law in the depth above the lowest ground e through the two rated
// stages h₁ < h₂ just below bankfull is carried up to it, as a rating
// table's end interval is (gauged.TableRating.Discharge):
//
//	Q = Q₂·((h − e)/(h₂ − e))^b,   b = ln(Q₂/Q₁) / ln((h₂ − e)/(h₁ − e)).
//
// The stages below are used, not the ones around bankfull, because the
// hydraulics change there: just above it water spills onto the lower
// overbank, and a law through stages on both sides misses the channel
// full. Where the lower stage carries no flow, or only one stage is rated
// below bankfull, the discharge is interpolated (linearly, or by the
// power law) between the rated stages around it instead.
//
// References:
//
//	Kennedy, E.J., 1984, Discharge ratings at gaging stations: USGS
//	Techniques of Water-Resources Investigations, book 3, chap. A10.
func BankfullOf(rep rating.RatingReport) Bankfull {
	nan := math.NaN()
	hb, ok := rep.Ground.Section.Bankfull()
	if !ok {
		return Bankfull{Stage: nan, Elevation: nan, Discharge: nan, From: nan, To: nan}
	}
	t := rep.Table
	bf := Bankfull{Known: true, Elevation: hb, Stage: hb, Discharge: nan, From: nan, To: nan}
	if t.GaugeHeights {
		bf.Stage = hb - t.Datum
	}
	gap := math.Inf(1)
	for _, tab := range []rating.Table{rep.Lookup, t} {
		from, to, q, ok := readAt(tab, bf.Stage)
		if ok && math.Max(bf.Stage, to)-from < gap {
			bf.Discharge, bf.From, bf.To, gap = q, from, to, math.Max(bf.Stage, to)-from
		}
	}
	return bf
}

// readAt reads the discharge of table t at stage h (see BankfullOf), and
// the rated stages it was read from.
func readAt(t rating.Table, h float64) (from, to, q float64, ok bool) {
	var below []rating.Row // the two nearest below, nearest last
	var above *rating.Row
	for i, r := range t.Rows {
		switch {
		case math.IsNaN(r.Discharge) || math.IsInf(r.Discharge, 0):
		case math.Abs(r.Stage-h) <= SameStage:
			return r.Stage, r.Stage, r.Discharge, true
		case r.Stage < h:
			below = nearestBelow(below, r)
		case above == nil || r.Stage < above.Stage:
			above = &t.Rows[i]
		}
	}
	n := len(below)
	if n == 0 || above == nil {
		return 0, 0, math.NaN(), false // outside the rated stages
	}
	if n == 2 && below[0].Discharge > 0 && t.Bottom < below[0].Stage && below[1].Discharge > below[0].Discharge {
		q, ok := powerLaw(below[0], below[1], t.Bottom, h)
		return below[0].Stage, below[1].Stage, q, ok
	}
	q, ok = powerLaw(below[n-1], *above, t.Bottom, h)
	return below[n-1].Stage, above.Stage, q, ok
}

// nearestBelow keeps the two rows of highest stage, in ascending order.
func nearestBelow(below []rating.Row, r rating.Row) []rating.Row {
	switch {
	case len(below) < 2:
		below = append(below, r)
		if len(below) == 2 && below[0].Stage > below[1].Stage {
			below[0], below[1] = below[1], below[0]
		}
	case r.Stage > below[1].Stage:
		below[0], below[1] = below[1], r
	case r.Stage > below[0].Stage:
		below[0] = r
	}
	return below
}

// powerLaw reads the discharge at h from the two rows a and b (a below
// b) as a rating table of those two rows with zero flow at stage bottom
// reads it, carrying the law on beyond b (see BankfullOf); linearly when
// a carries no flow.
func powerLaw(a, b rating.Row, bottom, h float64) (float64, bool) {
	rt := gauged.RatingTable{Points: []gauged.RatingPoint{{Stage: a.Stage, Discharge: a.Discharge}, {Stage: b.Stage, Discharge: b.Discharge}},
		Extrapolate: true}
	if a.Discharge > 0 && bottom < a.Stage {
		rt.HasZeroFlow, rt.ZeroFlow = true, bottom
	}
	r, err := rt.Compile()
	if err != nil {
		return math.NaN(), false // discharge falling with stage: no reading
	}
	q, _ := r.Discharge(h)
	return q, !math.IsNaN(q)
}

// bankfullItems are the summary items of a report's bankfull stage and
// discharge.
func bankfullItems(b *workbook.Book, rep rating.RatingReport) ([]SummaryItem, error) {
	bf := BankfullOf(rep)
	if !bf.Known {
		return []SummaryItem{{"bankfull stage", "no bank marks", ""}, {"bankfull discharge", "no bank marks", ""}}, nil
	}
	t := rep.Table
	u := t.Units
	var err error
	items := []SummaryItem{{"bankfull stage", b.NumberOnce("0.000", bf.Stage, &err), u.Length()}}
	where := "the lower of the two bank tops"
	if t.GaugeHeights {
		where += fmt.Sprintf(", at elevation %.3f %s: a gauge height", bf.Elevation, u.Length())
	}
	items = append(items, SummaryItem{"bankfull stage from", where, ""})
	if math.IsNaN(bf.Discharge) {
		lo, hi, _ := t.StageRange()
		items = append(items, SummaryItem{"bankfull discharge",
			fmt.Sprintf("not rated: the bankfull stage is outside the rated stages (%.3f to %.3f %s)", lo, hi, u.Length()), ""})
		return items, err
	}
	how := "rated at the bankfull stage"
	switch {
	case bf.To < bf.Stage:
		how = fmt.Sprintf("power law in the depth through the rated stages %.3f and %.3f %s, carried up to the bankfull stage", bf.From, bf.To, u.Length())
	case bf.From != bf.To:
		how = fmt.Sprintf("interpolated between the rated stages %.3f and %.3f %s", bf.From, bf.To, u.Length())
	}
	q, e := b.Sig3(bf.Discharge)
	if err == nil {
		err = e
	}
	items = append(items, SummaryItem{"bankfull discharge", q, u.Discharge()}, SummaryItem{"bankfull discharge from", how, ""})
	return items, err
}
