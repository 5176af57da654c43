package plotting

import (
	"fmt"
	"strings"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"wetline/rating"
	"wetline/rating/reach"
)

// FlagMark is the rows of a rating table that carry one flag, drawn as
// marks over its curve with a legend entry.
type FlagMark struct {
	// Flag is the row flag (reach.FlagUnsettled, reach.FlagCriticalStage,
	// rating.FlagAboveEnd).
	Flag string
	// Points are the flagged rows' stages and discharges.
	Points []RatingPoint
	// Runs are the stages bounding each run of consecutive flagged rows,
	// in the table's order (length unit).
	Runs []StageRun
}

// StageRun is a run of consecutive rows of a table, from stage Low to
// stage High (equal for one row).
type StageRun struct{ Low, High float64 }

// markedFlags are the row flags a rating figure marks, in drawing order.
func markedFlags() []string {
	return []string{reach.FlagUnsettled, reach.FlagCriticalStage, rating.FlagAboveEnd}
}

// flagGlyph is the mark of a row flag, as the step-backwater figures
// draw it: a ring for a read still depending on the boundary (the rating
// figure of backwater), a cross for a stage at critical depth (its
// profiles figure), a square for a stage above an end of the section.
// It returns its legend words too.
func flagGlyph(flag string) (draw.GlyphStyle, string) {
	switch flag {
	case reach.FlagUnsettled:
		return unsettledGlyph(), "still depending on the boundary (unsettled)"
	case reach.FlagCriticalStage:
		return criticalGlyph(), "stage at critical depth (critical_stage)"
	}
	return draw.GlyphStyle{Color: colBank, Radius: vg.Points(3.5), Shape: draw.SquareGlyph{}},
		"above an end of the section (above_end)"
}

// FlagMarks gathers the rows of t with a stage and discharge that carry
// each marked flag (unsettled, critical_stage, above_end), in that order;
// a flag no row carries is left out.
func FlagMarks(t rating.Table) []FlagMark {
	var out []FlagMark
	for _, f := range markedFlags() {
		m := FlagMark{Flag: f}
		in := false // the row before carries the flag
		for _, r := range t.Rows {
			if !finite(r.Stage, r.Discharge) || !hasFlag(r.Flags, f) {
				in = false
				continue
			}
			m.Points = append(m.Points, RatingPoint{Stage: r.Stage, Discharge: r.Discharge})
			if in {
				m.Runs[len(m.Runs)-1].High = r.Stage
			} else {
				m.Runs = append(m.Runs, StageRun{Low: r.Stage, High: r.Stage})
			}
			in = true
		}
		if len(m.Points) > 0 {
			out = append(out, m)
		}
	}
	return out
}

func hasFlag(flags []string, f string) bool {
	for _, g := range flags {
		if g == f {
			return true
		}
	}
	return false
}

// maxRunsNamed bounds the runs of flagged rows a note names one by one;
// more are summed up by their count and extent.
const maxRunsNamed = 3

// FlagNote says how many rows carry each marked flag, at which stages
// and how they are marked: "rows flagged in the table: 124 unsettled at
// 51.04 and 53.57 to 54.67 m (ringed: still depending on the boundary);
// ...", "" when none is.
func FlagNote(marks []FlagMark, u rating.Units) string {
	var parts []string
	for _, m := range marks {
		var at []string
		for _, r := range m.Runs {
			s := fmtStage(r.Low)
			if r.High > r.Low {
				s += " to " + fmtStage(r.High)
			}
			at = append(at, s)
		}
		stages := rating.JoinAnd(at)
		if n := len(at); n > maxRunsNamed {
			stages = fmt.Sprintf("%d runs from %s to %s", n, fmtStage(m.Runs[0].Low), fmtStage(m.Runs[n-1].High))
		}
		_, words := flagGlyph(m.Flag)
		parts = append(parts, fmt.Sprintf("%d %s at %s %s (%s: %s)", len(m.Points), m.Flag, stages, u.Length(),
			flagMarkWord(m.Flag), strings.TrimSuffix(words, " ("+m.Flag+")")))
	}
	if len(parts) == 0 {
		return ""
	}
	return "rows flagged in the table: " + strings.Join(parts, "; ")
}

// flagMarkWord names a flag's mark in a note.
func flagMarkWord(flag string) string {
	switch flag {
	case reach.FlagUnsettled:
		return "ringed"
	case reach.FlagCriticalStage:
		return "crossed"
	}
	return "squares"
}
