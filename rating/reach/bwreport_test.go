package reach

import (
	"errors"
	"math"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
)

// The report's table is the section's hydraulics at each computed stage:
// in the trapezoid of the examples (bed 5 m, sides 2:1) the flow area at
// depth y is (5 + 2y)·y (Chow 1959, Table 2-1), and each row's Manning
// discharge at its own friction slope (Q/K)² is the profile's discharge.
func TestStepBackwaterTable(t *testing.T) {
	secs := prismReach(t, "trapezoid:bottom=5,side=2", subdivide.Uniform(0.03), 6, 400, 0.001)
	qs := []float64{5, 15, 30}
	rep, err := StepBackwater(secs, qs, Boundary{Kind: NormalDepth, Slope: 0.001}, BackwaterReportOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Verification != nil {
		t.Error("verification without Verify")
	}
	if len(rep.Table.Rows) != len(qs) || !math.IsNaN(rep.Table.Slope) {
		t.Fatalf("table: %d rows, slope %g", len(rep.Table.Rows), rep.Table.Slope)
	}
	for i, r := range rep.Table.Rows {
		rd := rep.Result.Rating.Rows[i]
		y := rd.Stage - secs[0].Geometry.Bottom()
		if r.Stage != rd.Stage || math.Abs(r.Area-(5+2*y)*y) > saClosedFormTol*r.Area {
			t.Errorf("row %d: stage %g (read %g), area %g, want %g", i, r.Stage, rd.Stage, r.Area, (5+2*y)*y)
		}
		if math.Abs(r.Discharge-qs[i]) > saClosedFormTol*qs[i] {
			t.Errorf("row %d: discharge %g, want %g", i, r.Discharge, qs[i])
		}
	}
	for _, w := range rep.Result.Warnings {
		if !strings.Contains(strings.Join(rep.Warnings, "\n"), w) {
			t.Errorf("report lacks the warning %q", w)
		}
	}
}

// A verification sets each departure against the band of its marks'
// quality: a good mark 0.10 ft (Koenig and others 2016, from memory) =
// 0.03048 m.
func TestStepBackwaterVerify(t *testing.T) {
	secs := prismReach(t, "trapezoid:bottom=5,side=2", subdivide.Uniform(0.03), 6, 400, 0.001)
	bd := Boundary{Kind: NormalDepth, Slope: 0.001}
	if _, err := StepBackwater(secs, []float64{25}, bd, BackwaterReportOptions{Verify: 25}); !errors.Is(err, ErrNoMarks) {
		t.Errorf("no marks: %v", err)
	}
	if _, err := StepBackwater(secs, []float64{25}, bd, BackwaterReportOptions{Verify: -1}); !errors.Is(err, ErrDischarge) {
		t.Errorf("negative verification discharge: %v", err)
	}
	res, err := ComputeBackwater(secs, []float64{25}, bd, BackwaterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	ps := res.Profiles[0].Sections
	secs[0].Left, secs[0].Quality = ps[0].WaterSurface-0.02, rating.Good
	secs[3].Right, secs[3].Quality = ps[3].WaterSurface-0.05, rating.Good
	secs[4].Right = ps[4].WaterSurface + 0.3 // unrated: no band
	rep, err := StepBackwater(secs, []float64{10, 25}, bd, BackwaterReportOptions{Verify: 25})
	if err != nil {
		t.Fatal(err)
	}
	v := rep.Verification
	if v == nil || len(v.Marks) != 3 {
		t.Fatalf("verification %+v", v)
	}
	const goodBand = 0.10 * 0.3048
	if m := v.Marks[0]; math.Abs(m.Band-goodBand) > saClosedFormTol || m.Outside {
		t.Errorf("mark 0: band %g, outside %v", m.Band, m.Outside)
	}
	if m := v.Marks[1]; !m.Outside {
		t.Errorf("mark 1: departure %g not outside its band %g", m.Departure, m.Band)
	}
	if m := v.Marks[2]; !math.IsNaN(m.Band) || m.Outside {
		t.Errorf("unrated mark: band %g, outside %v", m.Band, m.Outside)
	}
	w := strings.Join(rep.Warnings, "\n")
	if !strings.Contains(w, "misses the marks by more than their quality band at 1 section: P3") {
		t.Errorf("warnings %s", w)
	}
}
