package survey

import (
	"fmt"
	"math"

	"wetline/rating"
)

// PlanLine is a section line in plan: the middle of its surveyed points
// along it (easting, northing, length unit) and its unit direction.
type PlanLine struct {
	MidE, MidN, DirE, DirN float64
}

// Distances beyond which the section lines of two surveys lie farther
// apart than a resurvey of one section would: a resurvey set up on the
// section's pins, or on their ties when a pin was lost, lies within a
// few metres of the first survey (common practice).
const (
	ResurveyApartSI = 5.0  // m
	ResurveyApartUS = 15.0 // ft
)

// SurveyPlanLine returns the plan line of a survey read from path (sheet
// "" for the first of a workbook): that of its projection, for a survey
// of eastings and northings, else the principal axis of the easting and
// northing columns a survey by station carries (as project writes them).
// ok is false when the survey carries no coordinates (or fewer than two
// points with both). Errors are those of ReadTable.
func SurveyPlanLine(sv Survey, path, sheet string) (PlanLine, bool, error) {
	if pr := sv.Projection; pr.Line != "" && len(sv.Section.Points) > 1 {
		pts := sv.Section.Points
		th := pr.Azimuth * math.Pi / 180
		dx, dy := math.Sin(th), math.Cos(th)
		mid := (pts[0].Station + pts[len(pts)-1].Station) / 2
		return PlanLine{MidE: pr.OriginE + mid*dx, MidN: pr.OriginN + mid*dy, DirE: dx, DirN: dy}, true, nil
	}
	t, err := ReadTable(path, sheet)
	if err != nil {
		return PlanLine{}, false, err
	}
	ce, cn, ok, err := coordinateColumns(t)
	if err != nil || !ok {
		return PlanLine{}, false, nil // the survey reader has judged its columns
	}
	var e, n []float64
	for _, rec := range t.Records {
		x, okx, errx := t.Float(rec, ce)
		y, oky, erry := t.Float(rec, cn)
		if okx && oky && errx == nil && erry == nil {
			e, n = append(e, x), append(n, y)
		}
	}
	if len(e) < 2 {
		return PlanLine{}, false, nil
	}
	x0, y0, dx, dy := principalAxis(e, n)
	lo, hi := math.Inf(1), math.Inf(-1)
	for i := range e {
		s := (e[i]-x0)*dx + (n[i]-y0)*dy
		lo, hi = math.Min(lo, s), math.Max(hi, s)
	}
	mid := (lo + hi) / 2
	return PlanLine{MidE: x0 + mid*dx, MidN: y0 + mid*dy, DirE: dx, DirN: dy}, true, nil
}

// LinesApart returns how far apart two section lines lie (length unit):
// the larger of the distances of each line's middle from the other line,
// so that two surveys along one line that reach out to different
// lengths lie 0 apart, and two parallel lines their spacing.
func LinesApart(a, b PlanLine) float64 {
	off := func(p, l PlanLine) float64 {
		return math.Abs((p.MidE-l.MidE)*l.DirN - (p.MidN-l.MidN)*l.DirE)
	}
	return math.Max(off(a, b), off(b, a))
}

// ResurveyWarning returns the warning for two surveys of one section,
// named nameA and nameB, whose section lines lie farther apart than a
// resurvey's would (ResurveyApartSI, ResurveyApartUS in units u), else
// "".
func ResurveyWarning(a, b PlanLine, nameA, nameB string, u rating.Units) string {
	limit := ResurveyApartSI
	if u == rating.US {
		limit = ResurveyApartUS
	}
	d := LinesApart(a, b)
	if !(d > limit) {
		return ""
	}
	return rating.Sayf("the section lines of %s and %s lie %.3g %s apart by their eastings and northings, more than the %g %s a resurvey of one section would (common practice): check they are surveys of one section, in one coordinate system",
		nameA, nameB, d, u.Length(), limit, u.Length())
}

// OppositeLines warns of each section of a reach whose line, taken from
// left to right looking downstream, points against the others' (their
// directions' resultant), as a section shot from the other bank with
// bank marks naming no side would, its overbanks swapped. svs are the
// reach's surveys and names their sections, aligned; only the surveys
// of eastings and northings (Projection known) are judged, and at least
// two are needed. With two that point against each other, both are
// named. A line more than 90° off the others' counts as opposite.
func OppositeLines(svs []Survey, names []string) []string {
	var idx []int
	for i, sv := range svs {
		if sv.Projection.Line != "" {
			idx = append(idx, i)
		}
	}
	if len(idx) < 2 {
		return nil
	}
	dir := func(i int) (float64, float64) {
		th := svs[i].Projection.Azimuth * math.Pi / 180
		return math.Sin(th), math.Cos(th)
	}
	if len(idx) == 2 {
		ax, ay := dir(idx[0])
		bx, by := dir(idx[1])
		if ax*bx+ay*by < 0 {
			return []string{fmt.Sprintf("sections %s and %s: their lines, left to right looking downstream, point opposite ways (grid azimuth %.1f and %.1f degrees): one has its banks swapped; mark its bank sides (ltob, rtob), its pins, or give the flow direction",
				names[idx[0]], names[idx[1]], svs[idx[0]].Projection.Azimuth, svs[idx[1]].Projection.Azimuth)}
		}
		return nil
	}
	var out []string
	for _, i := range idx {
		var sx, sy float64
		for _, j := range idx {
			if j != i {
				x, y := dir(j)
				sx, sy = sx+x, sy+y
			}
		}
		x, y := dir(i)
		if x*sx+y*sy < 0 {
			out = append(out, fmt.Sprintf("section %s: its line, left to right looking downstream, points opposite to the other sections' (grid azimuth %.1f degrees against about %.1f): its banks are likely swapped; mark its bank sides (ltob, rtob), its pins, or give the flow direction",
				names[i], svs[i].Projection.Azimuth, math.Mod(math.Atan2(sx, sy)*180/math.Pi+360, 360)))
		}
	}
	return out
}
