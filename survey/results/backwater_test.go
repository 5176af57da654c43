package results_test

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/reach"
	"wetline/subdivide"
	"wetline/survey"
	"wetline/survey/results"
)

// bwReport computes a step-backwater report on an invented prismatic
// reach: six trapezoidal sections (bed 5 m, sides 2:1, n 0.03) 400 m
// apart on a bed falling 0.001, held by a pool at 51.2 m, with a mark of
// good quality at the upstream section.
func bwReport(t *testing.T, verify float64) reach.BackwaterReport {
	t.Helper()
	secs := make([]reach.Section, 6)
	for i := range secs {
		sh, err := subdivide.ParseShape(fmt.Sprintf("trapezoid:bottom=5,side=2,invert=%g", 50-0.4*float64(i)))
		if err != nil {
			t.Fatal(err)
		}
		g, err := sh.Build(subdivide.Uniform(0.03))
		if err != nil {
			t.Fatal(err)
		}
		secs[i] = reach.Section{ID: fmt.Sprintf("S%d", i+1), Geometry: g, Distance: 400 * float64(i), Left: math.NaN(), Right: math.NaN()}
	}
	secs[0].Left, secs[0].Quality = 52.2, rating.Good
	rep, err := reach.StepBackwater(secs, []float64{10, 25}, reach.Boundary{Kind: reach.KnownStage, Stage: 51.2},
		reach.BackwaterReportOptions{Verify: verify})
	if err != nil {
		t.Fatal(err)
	}
	rep.Name, rep.Provenance = "reach.csv", rating.Provenance{Program: "wetline test"}
	return rep
}

// jsonKeys returns the keys of the JSON object at the start of data, in
// the order written.
func jsonKeys(t *testing.T, data []byte) []string {
	t.Helper()
	dec := json.NewDecoder(bytes.NewReader(data))
	if tok, err := dec.Token(); err != nil || tok != json.Delim('{') {
		t.Fatalf("not an object: %v %v", tok, err)
	}
	var keys []string
	for dec.More() {
		tok, err := dec.Token()
		if err != nil {
			t.Fatal(err)
		}
		keys = append(keys, tok.(string))
		var skip json.RawMessage
		if err := dec.Decode(&skip); err != nil {
			t.Fatal(err)
		}
	}
	return keys
}

// The JSON keys come in the documented order, at every level.
func TestWriteBackwaterJSONOrder(t *testing.T) {
	var buf bytes.Buffer
	if err := results.WriteBackwaterJSON(&buf, bwReport(t, 25)); err != nil {
		t.Fatal(err)
	}
	// field returns the raw value at a path of keys and array indices.
	field := func(path ...any) json.RawMessage {
		raw := json.RawMessage(buf.Bytes())
		for _, p := range path {
			switch k := p.(type) {
			case string:
				var m map[string]json.RawMessage
				if err := json.Unmarshal(raw, &m); err != nil {
					t.Fatalf("%v: %v", path, err)
				}
				raw = m[k]
			case int:
				var a []json.RawMessage
				if err := json.Unmarshal(raw, &a); err != nil || k >= len(a) {
					t.Fatalf("%v: %v", path, err)
				}
				raw = a[k]
			}
		}
		return raw
	}
	for _, c := range []struct {
		what string
		data []byte
		want []string
	}{
		{"report", buf.Bytes(), []string{"boundary", "profiles", "rating", "warnings", "caution"}},
		{"profile", field("profiles", 0), []string{"discharge", "sections"}},
		{"profile section", field("profiles", 0, "sections", 0), []string{"id", "distance", "water_surface", "energy_grade", "velocity_head", "froude", "critical", "spread"}},
		{"rating", field("rating"), []string{"section", "rows"}},
		{"rating row", field("rating", "rows", 1), []string{"discharge", "stage", "spread"}},
		{"boundary", field("boundary"), []string{"kind", "description", "stage"}},
	} {
		got := jsonKeys(t, c.data)
		if len(got) < len(c.want) || !slices.Equal(got[:len(c.want)], c.want) {
			t.Errorf("%s keys %q, want them to start %q", c.what, got, c.want)
		}
	}
	if v := field("verification", "marks", 0); !bytes.Contains(v, []byte(`"outside"`)) {
		t.Errorf("verification mark %s", v)
	}
	var note string
	if err := json.Unmarshal(field("note"), &note); err != nil || note != results.BackwaterNote {
		t.Errorf("note %q (%v), want the step-backwater note", note, err)
	}
}

// The CSV is a rating table that reads back as one: the rating reader of
// plot and fit finds each computed stage and discharge.
func TestWriteBackwaterCSVReadsBack(t *testing.T) {
	rep := bwReport(t, 0)
	var buf bytes.Buffer
	if err := results.WriteBackwaterCSV(&buf, rep); err != nil {
		t.Fatal(err)
	}
	if !strings.HasPrefix(buf.String(), strings.Join(results.RatingColumns(), ",")+",") {
		t.Errorf("header %q", strings.SplitN(buf.String(), "\n", 2)[0])
	}
	tab, err := survey.ParseRatingCSV(&buf, "S1-rating.csv", survey.UnitChoice{})
	if err != nil {
		t.Fatal(err)
	}
	for i, rd := range rep.Result.Rating.Rows {
		r := tab.Rows[i]
		// Written to 4 decimals (results.LengthDecimals) and 6 digits.
		if math.Abs(r.Stage-rd.Stage) > 0.5e-4 || math.Abs(r.Discharge-rd.Discharge) > 1e-5*rd.Discharge {
			t.Errorf("row %d: %g m, %g m3/s; computed %g m, %g m3/s", i, r.Stage, r.Discharge, rd.Stage, rd.Discharge)
		}
	}
}

func TestWriteBackwaterText(t *testing.T) {
	var buf bytes.Buffer
	if err := results.WriteBackwaterText(&buf, bwReport(t, 25)); err != nil {
		t.Fatal(err)
	}
	out := buf.String()
	for _, want := range []string{"Step-backwater profiles and rating: reach.csv", "Rating at S1", "Q = 25 m3/s", "Verification",
		"unsettled", results.BackwaterNote, "Caution: " + rating.Caution} {
		if !strings.Contains(out, want) {
			t.Errorf("text lacks %q", want)
		}
	}
}

func TestWriteBackwaterWorkbook(t *testing.T) {
	rep := bwReport(t, 25)
	var buf bytes.Buffer
	if err := results.WriteBackwaterWorkbook(&buf, rep); err != nil {
		t.Fatal(err)
	}
	f := openWritten(t, &buf)
	want := []string{results.SheetSummary, results.SheetRating, results.SheetConvergence, results.SheetProfiles,
		results.SheetSubsections, results.SheetVerification}
	if got := f.GetSheetList(); !slices.Equal(got, want) {
		t.Fatalf("sheets %q, want %q", got, want)
	}
	rows, err := f.GetRows(results.SheetProfiles)
	if err != nil {
		t.Fatal(err)
	}
	if got := len(rows) - 1; got != 2*6 {
		t.Errorf("%d profile rows, want 12", got)
	}
	head, _ := f.GetRows(results.SheetRating)
	if !strings.HasPrefix(head[0][0], "stage") || !strings.HasPrefix(head[0][7], "discharge") {
		t.Errorf("rating header %q", head[0])
	}
	// Both reads are unsettled (the pool is not forgotten in 2 km): marked.
	if fill := cellFill(t, f, results.SheetConvergence, "A2"); fill == "" {
		t.Error("unsettled read not marked")
	}
}

// The console summary of a backwater run gives the rating section's stage
// range, or its one stage when every read is the same, and counts the
// reads with their noun.
func TestWriteBackwaterSummary(t *testing.T) {
	for _, tc := range []struct {
		name   string
		stages []float64
		want   string
	}{
		{"one discharge", []float64{53.8321}, "; at S1 stage 53.832 m, 0 of 1 read unsettled\n"},
		{"equal stages", []float64{53.8321, 53.8324}, "; at S1 stage 53.832 m, 0 of 2 reads unsettled\n"},
		{"a range", []float64{53.8321, 54.1}, "; at S1 stages 53.832 to 54.100 m, 0 of 2 reads unsettled\n"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rep := reach.BackwaterReport{Result: reach.Backwater{Boundary: reach.Boundary{Kind: reach.KnownStage, Stage: 51.2},
				Rating: reach.BackwaterRating{Section: "S1"}}}
			for i, h := range tc.stages {
				rep.Result.Profiles = append(rep.Result.Profiles, reach.SurfaceProfile{})
				rep.Result.Rating.Rows = append(rep.Result.Rating.Rows, reach.RatingRead{Discharge: 10 * float64(i+1), Stage: h})
			}
			var b strings.Builder
			if err := results.WriteBackwaterSummary(&b, rep, "out.csv"); err != nil {
				t.Fatal(err)
			}
			if first, _, _ := strings.Cut(b.String(), "\n"); !strings.HasSuffix(first+"\n", tc.want) {
				t.Errorf("summary %q, want its first line to end %q", b.String(), tc.want)
			}
		})
	}
}
