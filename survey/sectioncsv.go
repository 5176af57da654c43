package survey

import (
	"bufio"
	"encoding/csv"
	"io"
	"strconv"
	"strings"

	"wetline/rating"
	"wetline/subdivide"
)

// WriteSectionCSV writes a section whose lengths are in the unit system u
// as a survey CSV that ReadSection reads back to the same section, in the
// same unit system: comment lines (each prefixed "# "), then the columns
// station and elevation with their unit ("station (ft)"), n (when the
// section has n per segment) and mark, with "bank" on the points at the
// bank stations. Numbers are written exactly (shortest form that reads
// back to the same float64).
func WriteSectionCSV(w io.Writer, s subdivide.Section, u rating.Units, comments []string) error {
	bw := bufio.NewWriter(w)
	for _, c := range comments {
		for _, line := range strings.Split(c, "\n") {
			bw.WriteString("# " + line + "\n")
		}
	}
	L := " (" + u.Length() + ")"
	cols := []string{ColStation + L, ColElevation + L}
	if s.N != nil {
		cols = append(cols, ColN)
	}
	cols = append(cols, ColMark)
	cw := csv.NewWriter(bw)
	cw.Write(cols)
	exact := func(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
	leftDone, rightDone := false, false
	for i, p := range s.Points {
		rec := []string{exact(p.Station), exact(p.Elevation)}
		if s.N != nil {
			n := ""
			if i < len(s.N) {
				n = exact(s.N[i])
			}
			rec = append(rec, n)
		}
		mark := ""
		switch {
		case s.HasBanks && !leftDone && p.Station == s.LeftBank:
			mark, leftDone = MarkBank, true
		case s.HasBanks && !rightDone && p.Station == s.RightBank:
			mark, rightDone = MarkBank, true
		}
		cw.Write(append(rec, mark))
	}
	cw.Flush()
	if err := cw.Error(); err != nil {
		return err
	}
	return bw.Flush()
}
