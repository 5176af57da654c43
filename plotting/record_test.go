package plotting_test

import (
	"errors"
	"math"
	"testing"
	"time"

	"wetline/plotting"
	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/rating/record"
	"wetline/subdivide"
)

// inventedHistory is an invented rating with two shift diagrams.
func inventedHistory(t *testing.T) *gauged.Rater {
	t.Helper()
	rt := &gauged.RatingTable{Name: "rating 1", HasZeroFlow: true, ZeroFlow: 0.2, HasHighGauging: true, HighGauging: 1.4,
		Points: []gauged.RatingPoint{{Stage: 0.4, Discharge: 0.6}, {Stage: 0.9, Discharge: 5.2}, {Stage: 1.6, Discharge: 17.5}, {Stage: 3, Discharge: 60}}}
	day := time.Date(2024, 5, 1, 0, 0, 0, 0, time.UTC)
	r, err := gauged.History{Periods: []gauged.Period{{Rating: rt}, {From: day.AddDate(0, 0, 20), Rating: rt}},
		Shifts: []gauged.ShiftDiagram{{Time: day, Points: []gauged.ShiftPoint{{Stage: 0.6, Shift: -0.03}}, HasTaper: true, Taper: 1.2}}}.Compile()
	if err != nil {
		t.Fatal(err)
	}
	return r
}

func recordGaugings() []gauged.Gauging {
	day := time.Date(2024, 5, 1, 0, 0, 0, 0, time.UTC)
	return []gauged.Gauging{
		{Time: day.Add(10 * time.Hour), Stage: 0.7, Discharge: 2.6, Quality: rating.Good},
		{Time: day.AddDate(0, 0, 8), Stage: 1.1, Discharge: 8.1, Quality: rating.Fair},
		{Time: day.AddDate(0, 0, 25), Stage: 0.65, Discharge: 2.1, Quality: rating.Poor},
	}
}

func TestDrawRecord(t *testing.T) {
	t.Parallel()
	st := &record.Stages{Name: "invented"}
	start := time.Date(2024, 5, 1, 0, 0, 0, 0, time.UTC).Unix()
	for i := range 30 * 96 {
		if i > 1000 && i < 1100 {
			continue // an outage
		}
		st.Time = append(st.Time, start+int64(i)*900)
		st.Stage = append(st.Stage, 0.6+0.9*math.Pow(math.Sin(float64(i)/400), 6))
	}
	res, err := record.Compute(st, inventedHistory(t), record.Options{Gaugings: recordGaugings()})
	if err != nil {
		t.Fatal(err)
	}
	figs, _, err := plotting.DrawRecord(res, "Invented Creek", "invented", plotting.Size{})
	if err != nil {
		t.Fatal(err)
	}
	if len(figs) != 1 || figs[0].Name != "invented-hydrograph.png" {
		t.Fatalf("figures %v", figs)
	}
	checkPNG(t, figs[0].Name, figs[0].PNG, plotting.DefaultWidth, plotting.DefaultHeight)
	// A record without any discharge has nothing to draw (Compute refuses
	// one, record.ErrNoDischarge; a result built otherwise may hold one).
	none := &record.Stages{Name: "dry", Time: []int64{start, start + 900}, Stage: []float64{9, 9}}
	if _, err := record.Compute(none, inventedHistory(t), record.Options{}); !errors.Is(err, record.ErrNoDischarge) {
		t.Errorf("a record with no discharge computed: %v", err)
	}
	for i := range res.Units {
		res.Units[i].Discharge = math.NaN()
	}
	if _, _, err := plotting.DrawRecord(res, "", "dry", plotting.Size{}); !errors.Is(err, plotting.ErrNoData) {
		t.Errorf("no discharge: %v", err)
	}
}

func TestDrawShifts(t *testing.T) {
	t.Parallel()
	c, err := inventedHistory(t).CheckGaugings(recordGaugings(), gauged.CheckOptions{UTCOffset: 10 * time.Hour})
	if err != nil {
		t.Fatal(err)
	}
	figs, _, err := plotting.DrawShifts(&c, "Invented Creek", "visits", plotting.Size{Width: 1200, Height: 800})
	if err != nil {
		t.Fatal(err)
	}
	if len(figs) != 2 || figs[0].Name != "visits-shift-time.png" || figs[1].Name != "visits-shift-stage.png" {
		t.Fatalf("figures %v", figs)
	}
	for _, f := range figs {
		checkPNGInk(t, f.Name, f.PNG, 1200, 800, sparseInk)
	}
}

func TestDrawComparisons(t *testing.T) {
	t.Parallel()
	a, _ := gauged.RatingTable{Name: "a", Points: []gauged.RatingPoint{{Stage: 0, Discharge: 0}, {Stage: 2, Discharge: 20}}}.Compile()
	b, _ := gauged.RatingTable{Name: "b", Points: []gauged.RatingPoint{{Stage: 0.5, Discharge: 5.5}, {Stage: 3, Discharge: 33}}}.Compile()
	rc, err := gauged.CompareRatings(a, b, gauged.CompareOptions{Step: 0.1})
	if err != nil {
		t.Fatal(err)
	}
	figs, _, err := plotting.DrawRatingComparison(&rc, "", "ab", plotting.Size{})
	if err != nil {
		t.Fatal(err)
	}
	checkPNGInk(t, figs[0].Name, figs[0].PNG, plotting.DefaultWidth, plotting.DefaultHeight, sparseInk)
	ground := func(bed float64) rating.Ground {
		return rating.Ground{Section: subdivide.Section{Points: []subdivide.Point{{Station: 0, Elevation: 13}, {Station: 3, Elevation: bed},
			{Station: 7, Elevation: bed}, {Station: 10, Elevation: 13}}, N: []float64{0.03, 0.03, 0.03}}}
	}
	ga, gb := ground(10), ground(9.5)
	geo := func(g rating.Ground) subdivide.Geometry {
		c, err := subdivide.Compile(g.Section)
		if err != nil {
			t.Fatal(err)
		}
		return c
	}
	sc, err := rating.CompareSections(geo(ga), geo(gb), nil, rating.Options{})
	if err != nil {
		t.Fatal(err)
	}
	sc.GroundA, sc.GroundB = ga, gb
	figs, _, err = plotting.DrawSectionComparison(&sc, "", "xs", plotting.Size{})
	if err != nil {
		t.Fatal(err)
	}
	if figs[0].Name != "xs-overlay.png" {
		t.Errorf("name %q", figs[0].Name)
	}
	checkPNGInk(t, figs[0].Name, figs[0].PNG, plotting.DefaultWidth, plotting.DefaultHeight, sparseInk)
}
