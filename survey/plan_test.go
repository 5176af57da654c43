package survey

import (
	"math"
	"strings"
	"testing"

	"wetline/rating"
)

// Two section lines' distance apart (closed form: the perpendicular
// spacing of parallel lines; 0 along one line; a line turned about the
// other's middle lies 0 off at the middles), and the warning beyond the
// resurvey distance (common practice), given in the survey's unit.
func TestLinesApart(t *testing.T) {
	east := PlanLine{MidE: 1000, MidN: 2000, DirE: 1, DirN: 0}
	diag := math.Sqrt(0.5)
	for _, tc := range []struct {
		name string
		b    PlanLine
		want float64
	}{
		{"same line", east, 0},
		{"along the line, longer", PlanLine{MidE: 1040, MidN: 2000, DirE: -1, DirN: 0}, 0},
		{"parallel 450 apart", PlanLine{MidE: 1200, MidN: 2450, DirE: 1, DirN: 0}, 450},
		{"parallel 3 apart", PlanLine{MidE: 990, MidN: 1997, DirE: -1, DirN: 0}, 3},
		{"turned about the middle", PlanLine{MidE: 1000, MidN: 2000, DirE: diag, DirN: diag}, 0},
		// B's middle lies 100 north of A's line; A's middle lies
		// 100·sin 45° off B's line.
		{"turned, 100 off", PlanLine{MidE: 1000, MidN: 2100, DirE: diag, DirN: diag}, 100},
	} {
		if got := LinesApart(east, tc.b); math.Abs(got-tc.want) > 1e-9 {
			t.Errorf("%s: %g apart, want %g", tc.name, got, tc.want)
		}
	}
	far := PlanLine{MidE: 1000, MidN: 2450, DirE: 1, DirN: 0}
	if w := ResurveyWarning(east, far, "a.csv", "b.csv", rating.US); !strings.Contains(w, "lie 450 ft apart") || !strings.Contains(w, "more than the 15 ft") {
		t.Errorf("warning %q", w)
	}
	near := PlanLine{MidE: 1000, MidN: 2004, DirE: 1, DirN: 0}
	if w := ResurveyWarning(east, near, "a.csv", "b.csv", rating.SI); w != "" {
		t.Errorf("4 m apart warned: %q", w)
	}
	if w := ResurveyWarning(east, PlanLine{MidE: 1000, MidN: 2006, DirE: 1, DirN: 0}, "a.csv", "b.csv", rating.SI); !strings.Contains(w, "6 m apart") {
		t.Errorf("6 m apart not warned: %q", w)
	}
	// Two coordinate systems: millions of metres apart, written plainly
	// (5.4e+06 is read by few).
	if w := ResurveyWarning(east, PlanLine{MidE: 1000, MidN: 5402000, DirE: 1, DirN: 0}, "a.csv", "b.csv", rating.SI); !strings.Contains(w, "lie 5400000 m apart") {
		t.Errorf("5 400 km apart: %q", w)
	}
}

// A section of a reach whose line points against the others' is warned
// of (invented azimuths: three lines at about 225°, one at 45°); lines a
// few degrees apart are not; two opposite lines are both named; surveys
// by station are not judged.
func TestOppositeLines(t *testing.T) {
	sv := func(az float64) Survey { return Survey{Projection: Projection{Line: LineFromPrinAx, Azimuth: az}} }
	names := []string{"XS-1", "XS-2", "XS-3", "XS-4"}
	for _, tc := range []struct {
		name string
		svs  []Survey
		want []string
	}{
		{"one mirrored", []Survey{sv(224), sv(44.5), sv(226), sv(230)}, []string{"section XS-2:"}},
		{"all alike", []Survey{sv(224), sv(219), sv(226), sv(232)}, nil},
		{"two opposite", []Survey{sv(224), sv(43)}, []string{"sections XS-1 and XS-2"}},
		{"by station not judged", []Survey{sv(224), {}, sv(226)}, nil},
		{"only one with coordinates", []Survey{sv(224), {}}, nil},
	} {
		got := OppositeLines(tc.svs, names[:len(tc.svs)])
		if len(got) != len(tc.want) {
			t.Errorf("%s: %q, want %d warnings", tc.name, got, len(tc.want))
			continue
		}
		for k, w := range tc.want {
			if !strings.HasPrefix(got[k], w) {
				t.Errorf("%s: %q, want it to start %q", tc.name, got[k], w)
			}
		}
	}
}
