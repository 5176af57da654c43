package results_test

import (
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"wetline/rating"
	"wetline/subdivide"
	"wetline/survey"
	"wetline/survey/results"
)

// Tolerances of the bankfull discharge read from a rating against the
// discharge computed at the bankfull stage itself (relative), read from
// stages a tenth of a metre apart and a hundredth apart (the lookup
// table). The runs of this test on the demo section give 5.1e-5 and
// 1.1e-7; the tolerances are set a little above.
const (
	bankfullCoarse = 1e-4
	bankfullFine   = 1e-6
)

// bankfullReport rates the demo survey (invented data) with its left bank
// mark moved to station left, at 0.1 m stages and at every hundredth,
// and returns the report and the discharge computed at the bankfull
// stage itself by rating.Compute (the independent reference: Manning's
// equation at that stage, no interpolation).
func bankfullReport(t *testing.T, left float64, gauge bool, datum float64) (rating.RatingReport, float64) {
	t.Helper()
	sv, err := survey.ReadSection("../../testdata/tallow-xs1.csv", "", survey.SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	sv.Section.LeftBank = left
	p, err := subdivide.Compile(sv.Section)
	if err != nil {
		t.Fatal(err)
	}
	hb, ok := sv.Section.Bankfull()
	if !ok {
		t.Fatal("no bankfull stage")
	}
	opt := rating.Options{Slope: 0.0012}
	at, err := rating.Compute(p, []float64{hb}, opt)
	if err != nil {
		t.Fatal(err)
	}
	var stages []float64
	for h := 100.3; h <= 104.85; h += 0.1 {
		stages = append(stages, math.Round((h-datum)*1000)/1000)
	}
	rep, err := rating.Rate(p, stages, rating.RateOptions{Options: opt, Lookup: true, GaugeHeights: gauge, Datum: datum})
	if err != nil {
		t.Fatal(err)
	}
	rep.Ground = rating.Ground{Section: sv.Section}
	return rep, at.Rows[0].Discharge
}

func TestBankfullOf(t *testing.T) {
	for _, tc := range []struct {
		name     string
		left     float64 // left bank station; bank top at 102.5 − 0.45·(left − 46)
		gauge    bool
		datum    float64
		noLookup bool
		stage    float64 // want, in the table's stages
		from, to float64 // the rated stages it is read from
		tol      float64
	}{
		// 102.275 m: between hundredths of the lookup table, read from
		// the two below.
		{"between hundredths", 46.5, false, 0, false, 102.275, 102.26, 102.27, bankfullFine},
		// Without the lookup table: from the 0.1 m stages below.
		{"between tenths", 46.5, false, 0, true, 102.275, 102.1, 102.2, bankfullCoarse},
		// 102.05 m: a stage of the lookup table.
		{"on a hundredth", 47, false, 0, false, 102.05, 102.05, 102.05, 0},
		// The demo's own banks: 102.5 m is a rated stage of both tables.
		{"on a rated stage", 46, false, 0, false, 102.5, 102.5, 102.5, 0},
		// Gauge heights on a gauge whose zero is at 100 m.
		{"gauge heights", 46.5, true, 100, false, 2.275, 2.26, 2.27, bankfullFine},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rep, want := bankfullReport(t, tc.left, tc.gauge, tc.datum)
			if tc.noLookup {
				rep.Lookup = rating.Table{}
			}
			bf := results.BankfullOf(rep)
			if !bf.Known || math.Abs(bf.Stage-tc.stage) > 1e-9 || math.Abs(bf.From-tc.from) > 1e-9 || math.Abs(bf.To-tc.to) > 1e-9 {
				t.Fatalf("bankfull %+v, want stage %g read from %g and %g", bf, tc.stage, tc.from, tc.to)
			}
			if math.Abs(bf.Elevation-(tc.stage+tc.datum)) > 1e-9 {
				t.Errorf("bankfull elevation %g, want %g", bf.Elevation, tc.stage+tc.datum)
			}
			if rel := math.Abs(bf.Discharge-want) / want; rel > tc.tol || (tc.tol == 0 && bf.Discharge != want) {
				t.Errorf("bankfull discharge %.6g, computed at the stage %.6g (relative %.2g, tolerance %g)", bf.Discharge, want, rel, tc.tol)
			}
		})
	}
}

// The summary of a rating workbook gives the bankfull stage and
// discharge, says how the discharge was found, and says "no bank marks"
// for a section without them or "not rated" above the rated stages.
func TestBankfullSummary(t *testing.T) {
	between, _ := bankfullReport(t, 46.5, false, 0)
	noBanks, _ := bankfullReport(t, 46.5, false, 0)
	noBanks.Ground.Section.HasBanks = false
	above, _ := bankfullReport(t, 46.5, false, 0)
	above.Table.Rows = above.Table.Rows[:10] // up to 101.2 m
	above.Lookup = rating.Table{}
	for _, tc := range []struct {
		name string
		rep  rating.RatingReport
		want map[string]string
	}{
		{"between", between, map[string]string{
			"bankfull stage":          "102.275|m",
			"bankfull stage from":     "the lower of the two bank tops|",
			"bankfull discharge from": "power law in the depth through the rated stages 102.260 and 102.270 m",
		}},
		{"no banks", noBanks, map[string]string{"bankfull stage": "no bank marks|", "bankfull discharge": "no bank marks|"}},
		{"above", above, map[string]string{"bankfull discharge": "not rated: the bankfull stage is outside the rated stages (100.300 to 101.200 m)"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			items := summaryItems(t, writeResults(t, tc.rep))
			for item, want := range tc.want {
				if !strings.Contains(items[item], want) {
					t.Errorf("summary %q = %q, want %q", item, items[item], want)
				}
			}
		})
	}
	items := summaryItems(t, writeResults(t, between))
	v, unit, _ := strings.Cut(items["bankfull discharge"], "|")
	q, err := strconv.ParseFloat(v, 64)
	if want := results.BankfullOf(between).Discharge; err != nil || unit != "m3/s" || q != reported(want, false) {
		t.Errorf("bankfull discharge %q, want %g m3/s", items["bankfull discharge"], want)
	}
}

// summaryItems reads a summary sheet as item → "value|unit".
func summaryItems(t *testing.T, f *excelize.File) map[string]string {
	t.Helper()
	rows, err := f.GetRows(results.SheetSummary)
	if err != nil {
		t.Fatal(err)
	}
	items := map[string]string{}
	for _, r := range rows[1:] {
		for len(r) < 3 {
			r = append(r, "")
		}
		items[r[0]] = r[1] + "|" + r[2]
	}
	return items
}

// bankfullAcross is the tolerance (relative) of a bankfull discharge
// interpolated between rated stages 0.1 m apart on both sides of
// bankfull, where the law changes (this test's run gives 1.6e-3).
const bankfullAcross = 2e-3

// With a single rated stage below bankfull, the discharge is interpolated
// between it and the next one above.
func TestBankfullOneStageBelow(t *testing.T) {
	rep, want := bankfullReport(t, 46.5, false, 0)
	rep.Lookup = rating.Table{}
	var rows []rating.Row
	for _, r := range rep.Table.Rows {
		if r.Stage > 102.15 {
			rows = append(rows, r)
		}
	}
	rep.Table.Rows = rows
	bf := results.BankfullOf(rep)
	if math.Abs(bf.From-102.2) > 1e-9 || math.Abs(bf.To-102.3) > 1e-9 {
		t.Fatalf("read from %g and %g, want 102.2 and 102.3", bf.From, bf.To)
	}
	if rel := math.Abs(bf.Discharge-want) / want; rel > bankfullAcross {
		t.Errorf("bankfull discharge %.6g, computed at the stage %.6g (relative %.2g)", bf.Discharge, want, rel)
	}
	items := summaryItems(t, writeResults(t, rep))
	if got := items["bankfull discharge from"]; !strings.HasPrefix(got, "interpolated between the rated stages 102.200 and 102.300 m") {
		t.Errorf("bankfull discharge from %q", got)
	}
}
