package survey

import (
	"fmt"
	"strings"
	"testing"

	"wetline/rating"
)

// TestGaugingSpanWarnings: gauge heights spanning more than any river
// rises at a gauge (gauge heights in cm read as m) are warned of in the
// unit system resolved for the gaugings (their headers', else --units),
// not the headers' alone: 64 ft of a large river in a file naming no
// unit, read with --units us, are within MaxGaugedSpanFeet. The limits
// are common practice (see MaxGaugedSpan); the data are invented
// (testdata/gaugings-us-bigriver.csv among them).
func TestGaugingSpanWarnings(t *testing.T) {
	t.Parallel()
	const head = "time,gauge_height%s,discharge\n"
	for _, tc := range []struct {
		name, unit, rows string
		units            rating.Units // as resolved
		want             []string     // substrings of the one warning expected
	}{
		{"ordinary", "", "2024-03-05T10:00,0.62,1.2\n2024-06-01T10:00,3.35,60.1\n", rating.SI, nil},
		{"centimetres", "", "2024-03-05T10:00,62,1.2\n2024-06-01T10:00,335,60.1\n", rating.SI,
			[]string{"span 273 m (from 62 at g.csv:2 to 335 at g.csv:3)", "centimetres", "(50 m)"}},
		{"feet wide but plausible", " (ft)", "2024-03-05T10:00,2,120\n2024-06-01T10:00,102,9100\n", rating.US, nil},
		{"feet too wide", " (ft)", "2024-03-05T10:00,2,120\n2024-06-01T10:00,202,9100\n", rating.US,
			[]string{"span 200 ft", "(160 ft)"}},
		{"feet by --units", "", "2024-03-05T10:00,8,232\n2024-06-01T10:00,72,33403\n", rating.US, nil},
		{"feet by --units, too wide", "", "2024-03-05T10:00,2,120\n2024-06-01T10:00,202,9100\n", rating.US,
			[]string{"span 200 ft", "(160 ft)"}},
		{"metres by default", "", "2024-03-05T10:00,8,232\n2024-06-01T10:00,72,33403\n", rating.SI, []string{"span 64 m", "(50 m)"}},
	} {
		gs, err := ParseGaugings(strings.NewReader(fmt.Sprintf(head, tc.unit)+tc.rows), "g.csv")
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		if len(gs.Warnings) != 0 {
			t.Errorf("%s: the reader warns %q before the units are resolved", tc.name, gs.Warnings)
		}
		got := gs.SpanWarnings(tc.units)
		if len(got) != min(1, len(tc.want)) {
			t.Errorf("%s: warnings %q, want %d", tc.name, got, min(1, len(tc.want)))
			continue
		}
		for _, w := range tc.want {
			if !strings.Contains(got[0], w) {
				t.Errorf("%s: warning %q: want %q", tc.name, got[0], w)
			}
		}
	}
	gs, err := ReadGaugings("testdata/gaugings-us-bigriver.csv", "")
	if err != nil {
		t.Fatal(err)
	}
	if w := gs.SpanWarnings(rating.US); len(w) != 0 {
		t.Errorf("gaugings-us-bigriver.csv in us units: %q", w)
	}
}
