package results_test

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/reach"
	"wetline/survey/results"
)

// Counts of one read right in the reports' lines: "1 stage", "its one
// subreach", "1 of 2 checks warns", "1 of 2 passes", "1 of 1 section",
// "1 subsection".
// A reach of two sections (one subreach, invented) with one check passing
// and one warning.
func TestCountWordsOfOne(t *testing.T) {
	rep := reach.Report{Result: reach.SlopeArea{
		Method: reach.MethodSlopeArea, Units: rating.SI, Discharge: 12.5, Fall: 0.2, Length: 100,
		Sections:   []reach.SectionResult{{ID: "A", WaterSurface: 10.2}, {ID: "B", Distance: 100, WaterSurface: 10}},
		Subreaches: []reach.Subreach{{From: "A", To: "B", Length: 100, Fall: 0.2, Discharge: 12.5}},
		Checks: []reach.Check{{Name: "froude A", Value: 0.5, Limit: 1, Relation: "<", Pass: true, Source: "test"},
			{Name: "froude B", Value: 1.2, Limit: 1, Relation: "<", Source: "test"}},
	}}
	nan := math.NaN()
	for _, tc := range []struct {
		name  string
		write func(*bytes.Buffer) error
		want  []string
	}{
		{"comparison summary", func(b *bytes.Buffer) error {
			return results.WriteComparisonSummary(b, "A against B", 1, nil, "out.csv")
		},
			[]string{"wrote out.csv: A against B, 1 stage\n"}},
		{"slope-area text", func(b *bytes.Buffer) error { return results.WriteSlopeAreaText(b, rep) },
			[]string{"slope-area, its one subreach (Dalrymple", "Quality checks (1 of 2 passes)"}},
		{"slope-area summary", func(b *bytes.Buffer) error { return results.WriteSlopeAreaSummary(b, rep, "out.txt") },
			[]string{", 1 of 2 checks warns\n"}},
		{"workbook too long", func(b *bytes.Buffer) error {
			_, err := b.WriteString(results.CheckRatingWorkbook(2_000_000, 1).Error())
			return err
		}, []string{"2000000 stages × 1 subsection is 2000000 rows"}},
		{"batch summary", func(b *bytes.Buffer) error {
			return results.WriteBatchSummary(b, []results.IndexEntry{{Section: "XS-1", StageMin: nan, StageMax: nan, BankfullStage: nan, BankfullDischarge: nan}}, "out", "")
		}, []string{"rated 1 of 1 section into out"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var b bytes.Buffer
			if err := tc.write(&b); err != nil {
				t.Fatal(err)
			}
			for _, w := range tc.want {
				if !strings.Contains(b.String(), w) {
					t.Errorf("%q lacks %q", b.String(), w)
				}
			}
		})
	}
}
