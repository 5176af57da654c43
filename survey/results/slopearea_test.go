package results_test

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/reach"
	"wetline/survey/results"
)

// The heading of the slope-area text report says what the subreaches give
// alone: the range and spread when all solve, else which solved and which
// have no real discharge alone (never "- to -").
func TestSlopeAreaTextSubreaches(t *testing.T) {
	nan := math.NaN()
	sub := func(from, to string, q float64) reach.Subreach {
		return reach.Subreach{From: from, To: to, Discharge: q}
	}
	for _, tc := range []struct {
		name     string
		subs     []reach.Subreach
		min, max float64
		want     string
	}{
		{"all solve", []reach.Subreach{sub("A", "B", 90), sub("B", "C", 110)}, 90, 110,
			"  subreaches    90 to 110 m3/s alone (spread 20.0 % of the peak)"},
		{"one of two", []reach.Subreach{sub("A", "B", nan), sub("B", "C", 117.2)}, nan, nan,
			"  subreaches    1 of 2 solves alone: B to C 117.2 m3/s; no real discharge alone: A to B"},
		{"two of three", []reach.Subreach{sub("A", "B", 95.5), sub("B", "C", nan), sub("C", "D", 101)}, nan, nan,
			"  subreaches    2 of 3 solve alone: A to B 95.5 m3/s, C to D 101 m3/s; no real discharge alone: B to C"},
		{"none", []reach.Subreach{sub("A", "B", nan), sub("B", "C", nan)}, nan, nan,
			"  subreaches    none has a real discharge alone (A to B, B to C): only the whole reach gives one"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			res := reach.SlopeArea{Method: reach.MethodSlopeArea, Units: rating.SI, Discharge: 100,
				Subreaches: tc.subs, SubreachMin: tc.min, SubreachMax: tc.max, SubreachSpread: (tc.max - tc.min) / 100}
			var b bytes.Buffer
			if err := results.WriteSlopeAreaText(&b, reach.Report{Result: res}); err != nil {
				t.Fatal(err)
			}
			var got string
			for _, line := range strings.Split(b.String(), "\n") {
				if strings.HasPrefix(line, "  subreaches ") {
					got = line
				}
			}
			if got != tc.want {
				t.Errorf("got  %q\nwant %q", got, tc.want)
			}
		})
	}
}

// The band line and the marks line of the uncertainty follow what was
// drawn: no band when no draw solved, and marks held when their standard
// deviation is zero (no mark varied, rated or not).
func TestSlopeAreaTextUncertaintyWords(t *testing.T) {
	nan := math.NaN()
	for _, tc := range []struct {
		name string
		un   reach.Uncertainty
		want []string
	}{
		{"band", reach.Uncertainty{Draws: 200, Failed: 10, MarkSD: 0.03, P05: 90, P50: 100, P95: 110},
			[]string{"  90 % band     90 to 110 m3/s (5th to 95th percentile, median 100, 190 draws)",
				"  marks          normal about each mark, standard deviation 0.03 m per mark unless its quality says otherwise"}},
		{"no band", reach.Uncertainty{Draws: 200, Failed: 200, MarkSD: 0.03, P05: nan, P50: nan, P95: nan},
			[]string{"  90 % band     none: no draw of 200 had a solution"}},
		{"marks held", reach.Uncertainty{Draws: 200, MarkSD: 0, P05: 90, P50: 100, P95: 110},
			[]string{"  marks          not varied: every mark held at its elevation, its quality rating set aside"}},
		{"n shared by region", reach.Uncertainty{Draws: 200, NCV: 0.15, NErrors: reach.NSharedByRegion, P05: 90, P50: 100, P95: 110},
			[]string{"  Manning's n    log-normal, median the surveyed n, coefficient of variation 0.15; one error per region " +
				"(left overbank, channel, right overbank) shared by every section"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			res := reach.SlopeArea{Method: reach.MethodSlopeArea, Units: rating.SI, Discharge: 100,
				SubreachMin: nan, SubreachMax: nan, SubreachSpread: nan}
			var b bytes.Buffer
			if err := results.WriteSlopeAreaText(&b, reach.Report{Result: res, Uncertainty: &tc.un}); err != nil {
				t.Fatal(err)
			}
			lines := strings.Split(b.String(), "\n")
			for _, w := range tc.want {
				found := false
				for _, l := range lines {
					found = found || l == w
				}
				if !found {
					t.Errorf("no line %q in\n%s", w, b.String())
				}
			}
		})
	}
}

// Distances and lengths are written with the decimals the reach needs (one
// at least), so that sections a millimetre apart do not both read 165.0.
func TestSlopeAreaTextLengthDecimals(t *testing.T) {
	nan := math.NaN()
	for _, tc := range []struct {
		name      string
		distances []float64
		want      []string
	}{
		{"whole metres", []float64{0, 165, 340}, []string{"  XS-2  165.0", "  XS-2 to XS-3  175.0", "length 340.0 m"}},
		{"a millimetre", []float64{0, 165, 165.001}, []string{"  XS-2  165.000", "  XS-3  165.001", "  XS-2 to XS-3  0.001", "length 165.001 m"}},
		{"finer than the written decimals", []float64{0, 10.00001, 20}, []string{"  XS-2  10.0", "  XS-1 to XS-2  10.0"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			res := reach.SlopeArea{Method: reach.MethodSlopeArea, Units: rating.SI, Discharge: 100,
				SubreachMin: nan, SubreachMax: nan, SubreachSpread: nan}
			for i, d := range tc.distances {
				id := fmt.Sprintf("XS-%d", i+1)
				res.Sections = append(res.Sections, reach.SectionResult{ID: id, Distance: d, Left: nan, Right: nan})
				if i > 0 {
					res.Subreaches = append(res.Subreaches, reach.Subreach{From: res.Sections[i-1].ID, To: id,
						Length: d - tc.distances[i-1], Discharge: 100})
				}
			}
			res.Length = tc.distances[len(tc.distances)-1] - tc.distances[0]
			var b bytes.Buffer
			if err := results.WriteSlopeAreaText(&b, reach.Report{Result: res}); err != nil {
				t.Fatal(err)
			}
			// Table cells are padded: compare with runs of spaces squeezed.
			text := strings.Join(strings.Fields(strings.ReplaceAll(b.String(), "\n", " \n ")), " ")
			for _, w := range tc.want {
				if !strings.Contains(text, strings.Join(strings.Fields(w), " ")) {
					t.Errorf("no %q in\n%s", w, b.String())
				}
			}
		})
	}
}

// A subreach whose velocity heads are equal (no change) reads uniform in
// the text and JSON reports, not contracting; expanding and contracting
// ones keep their words.
func TestSlopeAreaFlowWords(t *testing.T) {
	nan := math.NaN()
	res := reach.SlopeArea{Method: reach.MethodSlopeArea, Units: rating.SI, Discharge: 100,
		SubreachMin: nan, SubreachMax: nan, SubreachSpread: nan,
		Subreaches: []reach.Subreach{
			{From: "A", To: "B", Discharge: nan, VelocityHeadChange: 0},
			{From: "B", To: "C", Discharge: nan, VelocityHeadChange: -0.2},
			{From: "C", To: "D", Discharge: nan, VelocityHeadChange: 0.2, Expanding: true, EddyK: 0.5},
		}}
	var text, js bytes.Buffer
	if err := results.WriteSlopeAreaText(&text, reach.Report{Result: res}); err != nil {
		t.Fatal(err)
	}
	if err := results.WriteSlopeAreaJSON(&js, reach.Report{Result: res}); err != nil {
		t.Fatal(err)
	}
	var notes struct{ Caution, Note string }
	if err := json.Unmarshal(js.Bytes(), &notes); err != nil || notes.Caution != rating.Caution || notes.Note != rating.IndirectNote {
		t.Errorf("caution %q, note %q (%v): want the caution and the note on indirect estimates", notes.Caution, notes.Note, err)
	}
	for i, want := range []string{"uniform", "contracting", "expanding"} {
		sr := res.Subreaches[i]
		found := false
		for _, line := range strings.Split(text.String(), "\n") {
			f := strings.Fields(line)
			if len(f) > 5 && strings.Join(f[:3], " ") == sr.From+" to "+sr.To {
				found = true
				if f[6] != want {
					t.Errorf("text row %q: flow %q, want %q", line, f[6], want)
				}
			}
		}
		if !found {
			t.Errorf("no text row for %s to %s", sr.From, sr.To)
		}
		if n := strings.Count(js.String(), `"flow": "`+want+`"`); n != 1 {
			t.Errorf("JSON has %d subreaches of flow %q, want 1", n, want)
		}
	}
}

// The console summaries write discharges in plain decimal to four
// significant figures, never with an exponent: 1362 ft3/s, band 1178 to
// 1558, not 1.36e+03 (1.18e+03 to 1.56e+03); a rating's top discharge
// 4184, not 4.18e+03.
func TestSummaryDischargesPlain(t *testing.T) {
	un := reach.Uncertainty{Draws: 5000, P05: 1177.51, P50: 1356.4, P95: 1557.68}
	rep := reach.Report{Result: reach.SlopeArea{Method: reach.MethodSlopeArea, Units: rating.US, Discharge: 1362.097}, Uncertainty: &un}
	var b bytes.Buffer
	if err := results.WriteSlopeAreaSummary(&b, rep, "out.txt"); err != nil {
		t.Fatal(err)
	}
	if want := "wrote out.txt: slope-area peak discharge 1362 ft3/s (90 % band 1178 to 1558 ft3/s), 0 of 0 checks warn\n"; !strings.HasPrefix(b.String(), want) {
		t.Errorf("got  %q\nwant %q", b.String(), want)
	}
	// Warnings beside the checks (one survey read for two sections) are
	// counted on the line, so "0 of 0 checks warn" does not read as all
	// clear.
	rep.Warnings = []string{"sections B and C read the same survey file b.csv"}
	b.Reset()
	if err := results.WriteSlopeAreaSummary(&b, rep, "out.txt"); err != nil {
		t.Fatal(err)
	}
	if want := "0 of 0 checks warn; 1 warning below\nwarning: sections B and C"; !strings.Contains(b.String(), want) {
		t.Errorf("got  %q\nwant %q in it", b.String(), want)
	}
	tab := rating.Table{Units: rating.US, Slope: 0.002, Rows: []rating.Row{{Stage: 400.6, Discharge: 0}, {Stage: 411, Discharge: 4184.2}}}
	b.Reset()
	if err := results.WriteRatingSummary(&b, rating.RatingReport{Table: tab}, "r.csv"); err != nil {
		t.Fatal(err)
	}
	if want := "wrote r.csv: 2 stages from 400.600 to 411.000 ft, discharge 0 to 4184 ft3/s (slope 0.002, us units)\n"; !strings.HasPrefix(b.String(), want) {
		t.Errorf("got  %q\nwant %q", b.String(), want)
	}
}

// The reach line says which marks set the water surfaces as they were
// used: a section missing the mark asked for uses the one it has, and
// the summary names it rather than claiming the side asked for.
func TestSlopeAreaTextSurfaceWords(t *testing.T) {
	nan := math.NaN()
	both := [][2]float64{{10.5, 10.4}, {10.3, 10.2}, {10.1, 10.0}}
	leftOnly := [][2]float64{{10.5, nan}, {10.3, nan}, {10.1, nan}}
	oneGap := [][2]float64{{10.5, 10.4}, {10.3, nan}, {10.1, 10.0}}
	for _, tc := range []struct {
		name  string
		side  reach.Side
		marks [][2]float64
		want  string
	}{
		{"right, all right", reach.RightSide, both, "water surface from the right marks"},
		{"right, no right", reach.RightSide, leftOnly, "water surface from the left marks (no section has a right mark)"},
		{"mean, no right", reach.MeanSide, leftOnly, "water surface from the left marks (no section has a right mark)"},
		{"right, one missing", reach.RightSide, oneGap, "water surface from the right marks; the left mark alone at B (no right mark)"},
		{"mean, one missing", reach.MeanSide, oneGap, "water surface from the mean of the left and right marks; the left mark alone at B (no right mark)"},
		{"left, one right missing", reach.LeftSide, oneGap, "water surface from the left marks"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			res := reach.SlopeArea{Method: reach.MethodSlopeArea, Units: rating.SI, Discharge: 100, Side: tc.side,
				SubreachMin: nan, SubreachMax: nan, SubreachSpread: nan}
			for i, m := range tc.marks {
				res.Sections = append(res.Sections, reach.SectionResult{ID: string(rune('A' + i)), Left: m[0], Right: m[1]})
			}
			var b bytes.Buffer
			if err := results.WriteSlopeAreaText(&b, reach.Report{Result: res}); err != nil {
				t.Fatal(err)
			}
			if !strings.Contains(b.String(), tc.want+"\n") {
				t.Errorf("no %q in\n%s", tc.want, b.String())
			}
		})
	}
}
