package plotting

import (
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/reach"
)

// Every section of an overlay gets a look of its own, for any number of
// sections: no two share colour and dash pattern, and the first six keep
// the table's styles.
func TestSeriesStyleDistinct(t *testing.T) {
	for _, n := range []int{1, 6, 7, 12, 13, 25, 60} {
		t.Run(fmt.Sprint(n), func(t *testing.T) {
			seen := map[string]int{}
			for i := range n {
				s := seriesStyle(i)
				if i < len(seriesStyles) && (s.color != seriesStyles[i].color || !slices.Equal(s.dashes, seriesStyles[i].dashes)) {
					t.Errorf("section %d: not the table's style", i)
				}
				key := fmt.Sprint(s.color, s.dashes)
				if j, ok := seen[key]; ok {
					t.Errorf("sections %d and %d share colour and dashes %s", j, i, key)
				}
				seen[key] = i
				if i > 0 && s.glyph == seriesStyle(i-1).glyph && s.color == seriesStyle(i-1).color {
					t.Errorf("sections %d and %d look alike", i-1, i)
				}
			}
		})
	}
}

// Numbers that round to zero print without a minus sign; others keep
// theirs.
func TestZeroWithoutSign(t *testing.T) {
	negZero := math.Copysign(0, -1)
	for _, tc := range []struct {
		name string
		got  string
		want string
	}{
		{"signed -0.0001", fmtSigned(-0.0001, 3), "0.000"},
		{"signed 0.0004", fmtSigned(0.0004, 3), "0.000"},
		{"signed negative zero", fmtSigned(negZero, 3), "0.000"},
		{"signed -0.0006", fmtSigned(-0.0006, 3), "-0.001"},
		{"signed 0.012", fmtSigned(0.012, 3), "+0.012"},
		{"signed -0.212", fmtSigned(-0.212, 3), "-0.212"},
		{"stage -0.004", fmtStage(-0.004), "0.00"},
		{"stage negative zero", fmtStage(negZero), "0.00"},
		{"stage -0.006", fmtStage(-0.006), "-0.01"},
		{"number negative zero", fmtNum(negZero), "0"},
		{"number -0.00004", fmtNum(-0.00004), "-4e-05"},
		{"number -12.5", fmtNum(-12.5), "-12.5"},
	} {
		if tc.got != tc.want {
			t.Errorf("%s: %q, want %q", tc.name, tc.got, tc.want)
		}
	}
}

// The verification note of the backwater figure prints a departure that
// rounds to zero as 0.000 m, never -0.000 m.
func TestVerificationNoteZero(t *testing.T) {
	for _, tc := range []struct {
		mean, max float64
		want      string
	}{
		{-0.0002, 0.023, "verification at 38 m3/s: mean departure from the marks 0.000 m, largest +0.023 m"},
		{0.012, -0.0004, "verification at 38 m3/s: mean departure from the marks +0.012 m, largest 0.000 m"},
		{-0.107, -0.212, "verification at 38 m3/s: mean departure from the marks -0.107 m, largest -0.212 m"},
	} {
		got := verificationNote(reach.Verification{Discharge: 38, MeanDeparture: tc.mean, MaxDeparture: tc.max}, rating.SI)
		if got != tc.want {
			t.Errorf("got  %q\nwant %q", got, tc.want)
		}
	}
}

// Each overlay legend entry gives the water surface with its unit, as it
// gives the distance.
func TestOverlayLabelUnits(t *testing.T) {
	for _, tc := range []struct {
		u    rating.Units
		s    ReachSection
		want string
	}{
		{rating.SI, ReachSection{ID: "XS-2", Distance: 165, WaterSurface: 50.79}, "XS-2 at 165 m, water surface 50.79 m"},
		{rating.US, ReachSection{Distance: 540, WaterSurface: 166.6}, "section 2 at 540 ft, water surface 166.60 ft"},
	} {
		if got := overlayLabel(1, tc.s, names(tc.u)); got != tc.want {
			t.Errorf("got %q, want %q", got, tc.want)
		}
	}
}

// The profile figure's subtitle counts its discharges in agreement: "1
// discharge", not "1 discharges".
func TestBackwaterSubtitleCounted(t *testing.T) {
	for _, tc := range []struct {
		n    int
		want string
	}{
		{1, "1 discharge from the downstream boundary (critical depth"},
		{3, "3 discharges from the downstream boundary (critical depth"},
	} {
		r := reach.Backwater{Units: rating.SI, Boundary: reach.Boundary{Kind: reach.CriticalDepth}, Profiles: make([]reach.SurfaceProfile, tc.n)}
		r.Rating.Section = "XS-1"
		if got := backwaterSubtitle(r); !strings.HasPrefix(got, tc.want) || !strings.HasSuffix(got, "; rating read at XS-1") {
			t.Errorf("%d profiles: subtitle %q, want it to start %q", tc.n, got, tc.want)
		}
	}
}
