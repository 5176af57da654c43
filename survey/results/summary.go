package results

import (
	"bufio"
	"fmt"
	"io"
	"math"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/rating/reach"
)

// The summaries are what a command says on the console after writing its
// report to a file: what was written, the few numbers a user checks
// first, the warnings and the caution. Each returns the first write error.

// WriteWarnings writes each warning on a line of its own, "warning: ...".
func WriteWarnings(w io.Writer, warnings []string) error {
	bw := bufio.NewWriter(w)
	for _, s := range warnings {
		fmt.Fprintln(bw, "warning: "+s)
	}
	return bw.Flush()
}

// WriteInputNotes writes each input note (a fact of an input that is not
// a warning, such as how a coordinate survey was projected) on a line of
// its own, "input: ...".
func WriteInputNotes(w io.Writer, notes []string) error {
	bw := bufio.NewWriter(w)
	writeInputNotes(bw, notes)
	return bw.Flush()
}

// writeInputNotes writes the input notes, "input: ...", skipping empty ones.
func writeInputNotes(w *bufio.Writer, notes []string) {
	for _, n := range notes {
		if n != "" {
			fmt.Fprintf(w, "input: %s\n", n)
		}
	}
}

// WriteCaution writes the caution line.
func WriteCaution(w io.Writer) error {
	_, err := fmt.Fprintln(w, "caution: "+rating.Caution)
	return err
}

// endSummary writes the warnings and the caution, a line each, after a
// summary or the rating text report (WriteRatingText), and flushes w.
func endSummary(w *bufio.Writer, warnings []string) error {
	for _, s := range warnings {
		fmt.Fprintln(w, "warning: "+s)
	}
	fmt.Fprintln(w, "caution: "+rating.Caution)
	return w.Flush()
}

// WriteRatingSummary says that a rating report was written to path: its
// stages, discharges, slope and units.
func WriteRatingSummary(w io.Writer, rep rating.RatingReport, path string) error {
	bw := bufio.NewWriter(w)
	t := rep.Table
	u := t.Units
	fmt.Fprintf(bw, "wrote %s: %s", path, rating.Counted(len(t.Rows), "stage", "stages"))
	if lo, hi, ok := t.Extremes(); ok {
		fmt.Fprintf(bw, " from %.3f to %.3f %s, discharge %s to %s %s",
			lo.Stage, hi.Stage, u.Length(), rating.PlainFigures(lo.Discharge, 4), rating.PlainFigures(hi.Discharge, 4), u.Discharge())
	}
	fmt.Fprintf(bw, " (slope %g, %s units)\n", t.Slope, u)
	return endSummary(bw, rep.Warnings)
}

// WriteFitSummary says that a gaugings report was written to path: the
// datum, the fit, the comparison and the calibration.
func WriteFitSummary(w io.Writer, r *gauged.Report, path string) error {
	bw := bufio.NewWriter(w)
	if f := r.Fit; f != nil && f.N != len(r.Gaugings) {
		fmt.Fprintf(bw, "wrote %s: %s fitted of %d read", path, rating.Counted(f.N, "gauging", "gaugings"), len(r.Gaugings))
	} else {
		fmt.Fprintf(bw, "wrote %s: %s", path, rating.Counted(len(r.Gaugings), "gauging", "gaugings"))
	}
	switch {
	case r.Hydraulic != nil:
		fmt.Fprintf(bw, "; gauge datum: elevation = gauge height %s %s", rating.DatumTerm(r.Datum), r.Units.Length())
	case r.HydraulicTable != nil:
		fmt.Fprintf(bw, "; stages are gauge heights, hydraulic rating from the %s", r.HydraulicSource)
	default:
		fmt.Fprint(bw, "; stages are gauge heights as read (no section)")
	}
	fmt.Fprintln(bw)
	if f := r.Fit; f != nil {
		se := fmt.Sprintf("weighted standard error %s %% (%s)", fixed(f.StandardErrorPercent, 1), rating.Counted(f.StandardErrorDF, "degree of freedom", "degrees of freedom"))
		if f.StandardErrorDF <= 0 || math.IsNaN(f.StandardErrorLog) {
			se = fmt.Sprintf("weighted standard error not defined (%s for %s of the rating)", rating.Counted(f.N, "gauging", "gaugings"),
				rating.Counted(f.N-f.StandardErrorDF, "parameter", "parameters"))
		}
		fmt.Fprintf(bw, "  %s fit, %s, first offset %.3f %s (%s), %s\n",
			f.Method, rating.Counted(len(f.Controls), "control", "controls"), f.Controls[0].B, r.Units.Length(), f.OffsetSource, se)
	}
	if r.Fit != nil {
		fmt.Fprintf(bw, "  uncertainty convention: %s\n", gauged.UncertaintyConvention())
	}
	if c := r.Comparison; c != nil {
		which := ""
		if c.LeftOut > 0 {
			which = fmt.Sprintf(" (the gaugings selected only, %d left out)", c.LeftOut)
		}
		fmt.Fprintf(bw, "  against the hydraulic rating%s: %d of %d compared outside their quality bands\n", which, c.Outside, c.Compared())
	}
	if c := r.Calibration; c != nil {
		fmt.Fprintf(bw, "  best factor on n: %.3f\n", c.Factor)
	}
	if t := r.Table; t != nil && len(t.Rows) > 0 {
		top := t.Rows[len(t.Rows)-1]
		band := fmt.Sprintf("total 95 %% band %s to %s", sig(top.TotalLower, 4), sig(top.TotalUpper, 4))
		switch {
		case t.BandsWithheld:
			band = "bands withheld (the chains disagree)"
		case math.IsNaN(top.TotalLower) || math.IsNaN(top.TotalUpper):
			band = "no total band there"
		}
		fmt.Fprintf(bw, "  table to %.3f %s: %s %s, %s",
			top.Stage, r.Units.Length(), sig(top.Discharge, 4), r.Units.Discharge(), band)
		if !math.IsNaN(top.Multiple) {
			fmt.Fprintf(bw, " (%.1f times the largest gauged discharge)", top.Multiple)
		}
		fmt.Fprintln(bw)
	}
	return endSummary(bw, r.Warnings)
}

// WriteSlopeAreaSummary says that a slope-area report was written to
// path: the peak, its band, how many checks warn and how many warnings
// follow (a check is one of the method's own tests; a warning may be of
// the inputs, such as one survey read for two sections).
func WriteSlopeAreaSummary(w io.Writer, rep reach.Report, path string) error {
	bw := bufio.NewWriter(w)
	r := rep.Result
	fmt.Fprintf(bw, "wrote %s: %s peak discharge %s %s", path, r.Method, rating.PlainFigures(r.Discharge, 4), r.Units.Discharge())
	if u := rep.Uncertainty; u != nil {
		fmt.Fprintf(bw, " (90 %% band %s to %s %s)", rating.PlainFigures(u.P05, 4), rating.PlainFigures(u.P95, 4), r.Units.Discharge())
	}
	warn := 0
	for _, c := range r.Checks {
		if !c.Pass {
			warn++
		}
	}
	fmt.Fprintf(bw, ", %d of %s %s", warn, rating.Counted(len(r.Checks), "check", "checks"), rating.Agree(warn, "warns", "warn"))
	if n := len(rep.Warnings); n > 0 { // warnings beside the checks (a survey read twice, marks rising)
		fmt.Fprintf(bw, "; %s below", rating.Counted(n, "warning", "warnings"))
	}
	fmt.Fprintln(bw)
	return endSummary(bw, rep.Warnings)
}

// WriteBackwaterSummary says that a step-backwater report was written to
// path: the discharges, the rating section's stage range (one stage when
// every read is the same to the three decimals shown) and how many reads
// still depend on the boundary.
func WriteBackwaterSummary(w io.Writer, rep reach.BackwaterReport, path string) error {
	bw := bufio.NewWriter(w)
	r := rep.Result
	u := r.Units
	fmt.Fprintf(bw, "wrote %s: %s from %s", path, rating.Counted(len(r.Profiles), "profile", "profiles"), BackwaterBoundaryWords(rep))
	lo, hi := math.Inf(1), math.Inf(-1)
	unsettled := 0
	for _, rd := range r.Rating.Rows {
		lo, hi = math.Min(lo, rd.Stage), math.Max(hi, rd.Stage)
		if rd.Unsettled {
			unsettled++
		}
	}
	if len(r.Rating.Rows) > 0 {
		if l, h := fmt.Sprintf("%.3f", lo), fmt.Sprintf("%.3f", hi); l == h {
			fmt.Fprintf(bw, "; at %s stage %s %s", r.Rating.Section, l, u.Length())
		} else {
			fmt.Fprintf(bw, "; at %s stages %s to %s %s", r.Rating.Section, l, h, u.Length())
		}
	}
	fmt.Fprintf(bw, ", %d of %s unsettled\n", unsettled, rating.Counted(len(r.Rating.Rows), "read", "reads"))
	if v := BackwaterVerificationLine(rep); v != "" {
		fmt.Fprintf(bw, "  %s\n", v)
	}
	return endBackwater(bw, rep.Warnings)
}

// WriteBackwaterConsole writes what the console says after a
// step-backwater table written to standard output, which carries no
// comment lines (CSV): the verification's line, the warnings, and the
// caution with the step-backwater note.
func WriteBackwaterConsole(w io.Writer, rep reach.BackwaterReport) error {
	bw := bufio.NewWriter(w)
	if v := BackwaterVerificationLine(rep); v != "" {
		fmt.Fprintln(bw, v)
	}
	return endBackwater(bw, rep.Warnings)
}

// endBackwater is endSummary for a step-backwater report: the warnings,
// then the caution with BackwaterNote before it, as the text report
// states them.
func endBackwater(w *bufio.Writer, warnings []string) error {
	for _, s := range warnings {
		fmt.Fprintln(w, "warning: "+s)
	}
	fmt.Fprintln(w, "caution: "+BackwaterNote)
	fmt.Fprintln(w, "caution: "+rating.Caution)
	return w.Flush()
}

// BackwaterVerificationLine sums up a step-backwater report's verification
// in one line: the discharge, the sections with marks, the mean departure
// and the largest, with its section, and how many lie outside their
// marks' quality band; "" without a verification. The departure at each
// section is in the text, JSON and workbook reports, not in the CSV table.
func BackwaterVerificationLine(rep reach.BackwaterReport) string {
	v := rep.Verification
	if v == nil || len(v.Marks) == 0 {
		return ""
	}
	u := rep.Result.Units
	L := u.Length()
	at := ""
	for _, m := range v.Marks {
		if m.Departure == v.MaxDeparture {
			at = " at " + m.ID
			break
		}
	}
	outside := 0
	for _, m := range v.Marks {
		if m.Outside {
			outside++
		}
	}
	line := fmt.Sprintf("verification: the profile of %s %s against the high-water marks of %s: mean departure %s %s, largest %s %s%s",
		rating.PlainFigures(v.Discharge, 4), u.Discharge(), rating.Counted(len(v.Marks), "section", "sections"),
		saSigned3(v.MeanDeparture), L, saSigned3(v.MaxDeparture), L, at)
	if outside > 0 {
		line += fmt.Sprintf(", %d outside %s quality band", outside, rating.Agree(outside, "its", "their"))
	}
	return line + " (computed − mark)"
}

// MaxListed bounds how many failed sections a batch summary lists, and
// how many skipped ones.
const MaxListed = 20

// WriteBatchSummary says where a batch was written and lists the
// sections that failed, the rated sections' warnings ("warning: SECTION:
// WARNING", one a line) and the sections skipped, at most MaxListed of
// each, then how many more. index is the batch's index file, whose
// warnings column holds every warning: the line counting the warnings not
// listed points at it ("" for a batch written without one, such as one
// long table).
func WriteBatchSummary(w io.Writer, entries []IndexEntry, where, index string) error {
	bw := bufio.NewWriter(w)
	failed, skipped := 0, 0
	for _, en := range entries {
		switch {
		case en.Err != "":
			failed++
		case en.Skipped != "":
			skipped++
		}
	}
	fmt.Fprintf(bw, "rated %d of %s into %s", len(entries)-failed-skipped, rating.Counted(len(entries), "section", "sections"), where)
	if skipped > 0 {
		fmt.Fprintf(bw, "; %d skipped", skipped)
	}
	fmt.Fprintln(bw)
	list := func(word string, entries []IndexEntry, note func(IndexEntry) string, rest string) {
		shown, more := 0, 0
		for _, en := range entries {
			switch n := note(en); {
			case n == "":
			case shown < MaxListed:
				fmt.Fprintf(bw, "%s: %s: %s\n", word, en.Section, n)
				shown++
			default:
				more++
			}
		}
		if more > 0 {
			fmt.Fprintf(bw, "%s: and %d more%s\n", word, more, rest)
		}
	}
	list("failed", entries, func(en IndexEntry) string { return en.Err }, "")
	// One entry a warning, so that each is a line of its own.
	var ws []IndexEntry
	for _, en := range entries {
		if en.Err != "" || en.Skipped != "" {
			continue
		}
		for _, wn := range en.Warnings {
			ws = append(ws, IndexEntry{Section: en.Section, Warnings: []string{wn}})
		}
	}
	rest := ""
	if index != "" {
		rest = ", every one in the warnings column of " + index
	}
	list("warning", ws, func(en IndexEntry) string { return en.Warnings[0] }, rest)
	list("skipped", entries, func(en IndexEntry) string {
		if en.Err != "" {
			return ""
		}
		return en.Skipped
	}, "")
	return endSummary(bw, nil)
}

// WriteBatchFailures lists every failed section of a batch, one line
// each ("failed: SECTION: ERROR", the error naming file, row and column
// where it has them), for a batch that wrote nothing because some failed.
func WriteBatchFailures(w io.Writer, entries []IndexEntry) error {
	bw := bufio.NewWriter(w)
	for _, en := range entries {
		if en.Err != "" {
			fmt.Fprintf(bw, "failed: %s: %s\n", en.Section, en.Err)
		}
	}
	return bw.Flush()
}

// WriteWrote says that a file was written, with the caution.
func WriteWrote(w io.Writer, path string, warnings []string) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "wrote %s\n", path)
	return endSummary(bw, warnings)
}
