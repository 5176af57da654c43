package gauged

import (
	"math"
	"slices"
	"strings"

	"wetline/rating"
	"wetline/subdivide"
)

// joinPartTolerance is the relative change of a share of the discharge
// across a join below which that share does not step (round-off).
const joinPartTolerance = 1e-9

// partWords names the share of the discharge a prior is fitted to.
var partWords = map[Part]string{WholeSection: "the whole", ChannelPart: "the channel's share", OverbankPart: "the overbanks' share"}

// dropJoinWarnings removes a hydraulic table's own warnings of the stages
// at which pockets join the flow (rating.JoinWarnings, worded at
// elevations), which the report words once at gauge heights with what
// the fit makes of each (joinWarnings).
func dropJoinWarnings(t rating.Table, u rating.Units) []string {
	own := rating.JoinWarnings(t.Joins, rating.JoinWording{}, u)
	return slices.DeleteFunc(slices.Clone(t.Warnings), func(w string) bool { return slices.Contains(own, w) })
}

// joinWarnings words, once for the report, the stages at which water
// standing behind higher ground joins the section's flow and the
// hydraulic rating steps (rating.PocketJoins) by rating.JoinStepWarned or
// more, as a table's are (rating.WarnedJoins: the largest one by one,
// the rest in one line), and what the fit makes of each worded alone
// where its table spans the stage: a least-squares table's
// conveyance-slope extension, Q = K·√S on the section's conveyance,
// steps with it; a Bayesian prior fitted to the rating across it smooths
// it.
func (r *Report) joinWarnings() []string {
	c := r.Hydraulic
	if c == nil {
		return nil
	}
	u := c.Options.Units
	w := rating.JoinWording{Stage: func(z float64) string { return rating.GaugeHeightWords(z, c.Datum, u) }, Subject: "the section's hydraulic discharge"}
	each, rolled := rating.WarnedJoins(r.joins)
	var out []string
	for _, j := range each {
		h := rating.DecimalDifference(j.Stage, c.Datum)
		msg := rating.JoinStepWords(j, w, u)
		if r.Fit != nil && r.Table != nil && r.tableSpans(h) {
			msg += r.joinFit(j, h)
		}
		out = append(out, msg)
	}
	if s := rating.JoinRollUp(rolled, w, u); s != "" {
		out = append(out, s)
	}
	return out
}

// priorSpan is where a control's prior was fitted to the section's
// hydraulic rating (HydraulicPrior): over gauge heights from..to, to the
// share of the discharge part; ok is false for a prior that is not.
type priorSpan struct {
	from, to float64
	part     Part
	ok       bool
}

// partDischarge is the share part of a row's discharge (see Part).
func partDischarge(r rating.Row, part Part) float64 {
	if part == WholeSection {
		return r.Discharge
	}
	var q float64
	for _, s := range r.Subs {
		if (s.Region == subdivide.Channel) == (part == ChannelPart) {
			q += s.Discharge
		}
	}
	return q
}

// tableSpans reports a fitted table with rows at or below gauge height h
// and above it.
func (r *Report) tableSpans(h float64) bool {
	rows := r.Table.Rows
	return len(rows) > 0 && rows[0].Stage <= h && rows[len(rows)-1].Stage > h
}

// joinFit says what the fit's table makes of the step at gauge height h.
func (r *Report) joinFit(j rating.PocketJoin, h float64) string {
	f, t := r.Fit, r.Table
	u := r.Hydraulic.Options.Units
	switch {
	case t.Extension != nil && t.Extension.Join != nil && h >= t.Extension.Join.Stage:
		lo, _, _, _, _ := t.Extension.At(h, j.Before.Conveyance)
		hi, _, _, _, _ := t.Extension.At(h, j.After.Conveyance)
		return sayf("; the conveyance-slope extension above the gaugings rests on the section's conveyance and follows the step, from %s to %s %s there", rating.PlainFigures(lo, 4), rating.PlainFigures(hi, 4), u.Discharge())
	case f.Method == Bayesian && f.Posterior != nil:
		var across []string
		for k, s := range f.Posterior.spans {
			if !s.ok || !(s.from < h && h < s.to) {
				continue
			}
			before, after := partDischarge(j.Before, s.part), partDischarge(j.After, s.part)
			if math.Abs(after-before) <= joinPartTolerance*math.Max(math.Abs(before), math.Abs(after)) {
				continue // the step is in another share of the discharge
			}
			across = append(across, sayf("control %d, a power law fitted to %s of this rating from %s to %s %s,", k+1, partWords[s.part], gh(s.from), gh(s.to), u.Length()))
		}
		if len(across) == 0 {
			return "; no control's prior is fitted to a share of this rating that steps there, and the table does not step there"
		}
		return sayf("; the Bayesian %s of %s %s the step: the table does not step there",
			rating.Agree(len(across), "prior", "priors"), strings.Join(across, " and "), rating.Agree(len(across), "smooths", "smooth"))
	case h < f.HighStage:
		return "; it lies within the gaugings, and the fitted rating does not step there"
	}
	return "; the table carries the fitted controls on above the gaugings, and does not step there"
}
