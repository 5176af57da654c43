package survey

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"wetline/subdivide"
)

// skewedLine lays points on a straight section line through (e0, n0) at
// azimuth az (degrees clockwise from grid north), at stations st with
// offsets off (positive to the right of increasing station), and writes
// them as a coordinate survey CSV. The coordinates are the closed-form
// ones: point = origin + station·d + offset·r, with d = (sin az, cos az)
// in (east, north) and r = (cos az, −sin az) its right-hand normal.
func skewedLine(e0, n0, az float64, st, off, z []float64, n []string, marks []string) string {
	th := az * math.Pi / 180
	dx, dy := math.Sin(th), math.Cos(th)
	var b strings.Builder
	b.WriteString("easting,northing,elevation,n,mark,note\n")
	for i := range st {
		e := e0 + st[i]*dx + off[i]*dy
		nn := n0 + st[i]*dy - off[i]*dx
		fmt.Fprintf(&b, "%.17g,%.17g,%g,%s,%s,point %d\n", e, nn, z[i], n[i], marks[i], i+1)
	}
	return b.String()
}

var (
	skewSt    = []float64{0, 3.5, 9, 14, 20.5, 27, 31, 38}
	skewOff   = []float64{0, 0.12, -0.31, 0.05, 0.4, -0.22, 0.08, 0}
	skewZ     = []float64{104.2, 102.9, 101.1, 100.2, 100.0, 101.4, 102.8, 104.5}
	skewN     = []string{"0.06", "", "0.035", "", "", "0.07", "", ""}
	skewMarks = []string{"left pin", "", "bank", "", "", "bank", "", "right pin"}
)

// The projection of points laid on a known skewed line gives back their
// stations and offsets (closed form, to 1e-9 relative), with the left
// end told by the pins, and keeps the n, mark and note columns.
func TestCoordinateSurveyKnownLine(t *testing.T) {
	for _, az := range []float64{0, 37, 90, 143.5, 200, 271, 359} {
		text := skewedLine(512345.678, 4123456.789, az, skewSt, skewOff, skewZ, skewN, skewMarks)
		sv, err := ParseSection(strings.NewReader(text), "xs.csv", SectionOptions{})
		if err != nil {
			t.Fatalf("az %g: %v", az, err)
		}
		pr := sv.Projection
		if pr.Line != LineFromPins || pr.Left != LeftFromPins {
			t.Errorf("az %g: line %q, left %q", az, pr.Line, pr.Left)
		}
		for i, p := range sv.Section.Points {
			if !closeRel(p.Station, skewSt[i], 1e-9, 1e-9) {
				t.Errorf("az %g point %d: station %.12g, want %g", az, i, p.Station, skewSt[i])
			}
			if !closeRel(pr.Offsets[i], skewOff[i], 1e-9, 1e-9) {
				t.Errorf("az %g point %d: offset %.12g, want %g", az, i, pr.Offsets[i], skewOff[i])
			}
			if p.Elevation != skewZ[i] || sv.Notes[i] != fmt.Sprintf("point %d", i+1) {
				t.Errorf("az %g point %d: elevation %g note %q", az, i, p.Elevation, sv.Notes[i])
			}
		}
		if !closeRel(pr.Azimuth, math.Mod(az, 360), 1e-9, 1e-9) {
			t.Errorf("az %g: azimuth %.12g", az, pr.Azimuth)
		}
		sec := sv.Section
		if !sec.HasBanks || sec.LeftBank != sv.Section.Points[2].Station || sec.RightBank != sv.Section.Points[5].Station {
			t.Errorf("az %g: banks %v %g %g", az, sec.HasBanks, sec.LeftBank, sec.RightBank)
		}
		if want := []float64{0.06, 0.06, 0.035, 0.035, 0.035, 0.07, 0.07}; fmt.Sprint(sec.N) != fmt.Sprint(want) {
			t.Errorf("az %g: n %v, want %v", az, sec.N, want)
		}
		if sv.Labels[0] != "left pin" || sv.Labels[7] != "right pin" {
			t.Errorf("az %g: labels %q", az, sv.Labels)
		}
		if !closeRel(pr.MaxOffset, 0.4, 1e-9, 1e-9) || pr.Tolerance != DefaultOffsetSI {
			t.Errorf("az %g: max offset %g tolerance %g", az, pr.MaxOffset, pr.Tolerance)
		}
	}
}

func closeRel(got, want, rel, abs float64) bool {
	return math.Abs(got-want) <= math.Max(abs, rel*math.Abs(want))
}

// The coordinate survey and the same survey given as stations compile to
// the same geometry: equal area, wetted perimeter, top width and
// subsection areas at every stage (to 1e-9 relative).
func TestCoordinateSurveySameAsStations(t *testing.T) {
	text := skewedLine(300000, 5000000, 63, skewSt, skewOff, skewZ, skewN, skewMarks)
	sv, err := ParseSection(strings.NewReader(text), "xs.csv", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	var b strings.Builder
	b.WriteString("station,elevation,n,mark\n")
	for i := range skewSt {
		m := skewMarks[i]
		if strings.HasSuffix(m, "pin") {
			m = ""
		}
		fmt.Fprintf(&b, "%g,%g,%s,%s\n", skewSt[i], skewZ[i], skewN[i], m)
	}
	st, err := ParseSection(strings.NewReader(b.String()), "st.csv", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	g1, err := subdivide.Compile(sv.Section)
	if err != nil {
		t.Fatal(err)
	}
	g2, err := subdivide.Compile(st.Section)
	if err != nil {
		t.Fatal(err)
	}
	for stage := 100.05; stage < 104.2; stage += 0.25 {
		w1, err1 := g1.At(stage, subdivide.Options{})
		w2, err2 := g2.At(stage, subdivide.Options{})
		if err1 != nil || err2 != nil || len(w1.Subs) != len(w2.Subs) {
			t.Fatalf("stage %g: %v %v, %d and %d subsections", stage, err1, err2, len(w1.Subs), len(w2.Subs))
		}
		checks := [][3]any{{"area", w1.Area, w2.Area}, {"wetted perimeter", w1.WettedPerimeter, w2.WettedPerimeter},
			{"top width", w1.TopWidth, w2.TopWidth}}
		for j := range w1.Subs {
			checks = append(checks, [3]any{fmt.Sprintf("subsection %d area", j), w1.Subs[j].Area, w2.Subs[j].Area})
		}
		for _, c := range checks {
			if a, b := c[1].(float64), c[2].(float64); !closeRel(a, b, 1e-9, 1e-12) {
				t.Errorf("stage %g: %s %.12g from coordinates, %.12g from stations", stage, c[0], a, b)
			}
		}
	}
}

// Without pins: the principal axis of points whose offsets are balanced
// (sum zero, uncorrelated with station) is the line itself, so stations
// and offsets come back exactly; left is the first point, or the bank on
// the left looking along the flow direction given.
func TestCoordinateSurveyPrincipalAxis(t *testing.T) {
	st := []float64{0, 10, 20, 30, 40}
	off := []float64{0.2, -0.1, -0.2, -0.1, 0.2} // Σo = 0, Σ(s−s̄)o = 0
	z := []float64{3, 1, 0, 1, 3}
	n := []string{"0.03", "", "", "", ""}
	marks := make([]string, 5)
	text := skewedLine(1000, 2000, 120, st, off, z, n, marks)
	tests := []struct {
		name     string
		opt      CoordinateOptions
		reversed bool
		left     string
	}{
		{"survey order", CoordinateOptions{}, false, LeftFromOrder},
		// Section azimuth 120°: flowing at 30° (north-east) the right
		// bank lies at 120°, so the first point is on the left.
		{"flow 30", CoordinateOptions{FlowAzimuth: 30, FlowGiven: true}, false, LeftFromFlow},
		// Flowing at 210° the first point is on the right bank.
		{"flow 210", CoordinateOptions{FlowAzimuth: 210, FlowGiven: true}, true, LeftFromFlow},
	}
	for _, tt := range tests {
		sv, err := ParseSection(strings.NewReader(text), "xs.csv", SectionOptions{Coordinates: tt.opt})
		if err != nil {
			t.Fatalf("%s: %v", tt.name, err)
		}
		pr := sv.Projection
		if pr.Line != LineFromPrinAx || pr.Left != tt.left || pr.Reversed != tt.reversed {
			t.Errorf("%s: line %q left %q reversed %v", tt.name, pr.Line, pr.Left, pr.Reversed)
		}
		for k, p := range sv.Section.Points {
			i, sign := k, 1.0
			if tt.reversed {
				i, sign = len(st)-1-k, -1
			}
			want := st[i]
			if tt.reversed {
				want = 40 - st[i]
			}
			if !closeRel(p.Station, want, 1e-9, 1e-9) || !closeRel(pr.Offsets[k], sign*off[i], 1e-9, 1e-9) {
				t.Errorf("%s point %d: station %.12g offset %.12g, want %g %g", tt.name, k, p.Station, pr.Offsets[k], want, sign*off[i])
			}
		}
	}
}

// A line given on the command line counts stations from its left end: its
// first point, or, when the pins put that on the right bank, its second,
// with a warning. The two lines below are one line written both ways
// round, so their stations and offsets are the same (by construction).
func TestCoordinateSurveyLineGiven(t *testing.T) {
	st := []float64{2, 5, 9, 12}
	off := []float64{0.1, 0, -0.1, 0.3}
	th := 45 * math.Pi / 180
	far := [2]float64{10 + 50*math.Sin(th), 20 + 50*math.Cos(th)}
	for _, tc := range []struct {
		name   string
		marks  []string
		line   [4]float64
		turned bool
	}{
		{"from its left end", make([]string, 4), [4]float64{10, 20, far[0], far[1]}, false},
		{"from its right end, by the pins", []string{"left pin", "", "", "right pin"}, [4]float64{far[0], far[1], 10, 20}, true},
	} {
		text := skewedLine(10, 20, 45, st, off, []float64{5, 1, 1, 5}, []string{"0.04", "", "", ""}, tc.marks)
		sv, err := ParseSection(strings.NewReader(text), "xs.csv", SectionOptions{Coordinates: CoordinateOptions{Given: true, Line: tc.line}})
		if err != nil {
			t.Fatal(err)
		}
		for i, p := range sv.Section.Points {
			if !closeRel(p.Station, st[i], 1e-9, 1e-9) || !closeRel(sv.Projection.Offsets[i], off[i], 1e-9, 1e-9) {
				t.Errorf("%s: point %d: station %.12g offset %.12g, want %g %g", tc.name, i, p.Station, sv.Projection.Offsets[i], st[i], off[i])
			}
		}
		if sv.Projection.Line != LineGiven {
			t.Errorf("%s: line %q", tc.name, sv.Projection.Line)
		}
		warned := strings.Contains(strings.Join(sv.Warnings, "\n"), "the line given starts on the right bank")
		if sv.Projection.LineTurned != tc.turned || warned != tc.turned {
			t.Errorf("%s: turned %v, warnings %q", tc.name, sv.Projection.LineTurned, sv.Warnings)
		}
	}
	// A point on the turned line's left end is at station 0, not −0
	// (which messages would write "-0").
	east := "easting,northing,elevation,n\n0,0,5,0.035\n10,0.2,1,\n20,-0.1,1,\n30,0,5,\n"
	sv, err := ParseSection(strings.NewReader(east), "e.csv", SectionOptions{Coordinates: CoordinateOptions{Given: true, Line: [4]float64{0, 0, 30, 0}, FlowAzimuth: 180, FlowGiven: true}})
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range sv.Section.Points {
		if math.Signbit(p.Station) {
			t.Errorf("station %g has its sign bit set", p.Station)
		}
	}
}

// Points far off the line are warned about, at their row and column,
// with their unit (metres: the headers name none and feet were not asked
// for; the default tolerance 0.5 m).
func TestCoordinateSurveyOffsetWarning(t *testing.T) {
	off := append([]float64(nil), skewOff...)
	off[3] = 1.7
	text := skewedLine(0, 0, 10, skewSt, off, skewZ, skewN, skewMarks)
	sv, err := ParseSection(strings.NewReader(text), "xs.csv", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	w := strings.Join(sv.Warnings, "\n")
	if !strings.Contains(w, "xs.csv:5:1: easting ") || !strings.Contains(w, "the point lies 1.7 m off the section line, more than the tolerance 0.5 m") {
		t.Errorf("warnings:\n%s", w)
	}
	if n := sv.ProjectionNote; !strings.Contains(n.Text, "projected from eastings and northings onto "+LineFromPins) || n.At != "xs.csv:1" || strings.Contains(w, "projected from") {
		t.Errorf("projection note %+v, warnings:\n%s: the note is the survey's own, not a warning", n, w)
	}
	sv, err = ParseSection(strings.NewReader(text), "xs.csv", SectionOptions{Coordinates: CoordinateOptions{OffsetTolerance: 2}})
	if err != nil {
		t.Fatal(err)
	}
	if strings.Contains(strings.Join(sv.Warnings, "\n"), "more than the tolerance") {
		t.Errorf("warned within a tolerance of 2: %q", sv.Warnings)
	}
}

// Surveys that cannot be projected are refused at the row at fault.
func TestCoordinateSurveyErrors(t *testing.T) {
	fold := append([]float64(nil), skewSt...)
	fold[4] = 12 // after 14: folds back
	pins2 := append([]string(nil), skewMarks...)
	pins2[3] = "left pin"
	tests := []struct {
		name, text string
		opt        CoordinateOptions
		want       error
		at         string
	}{
		{"fold back", skewedLine(0, 0, 30, fold, skewOff, skewZ, skewN, skewMarks), CoordinateOptions{}, ErrFoldBack, "xs.csv:6:1: easting"},
		{"two left pins", skewedLine(0, 0, 30, skewSt, skewOff, skewZ, skewN, pins2), CoordinateOptions{}, ErrPins, "xs.csv:5:5: mark"},
		{"flow along the line", skewedLine(0, 0, 30, skewSt, skewOff, skewZ, skewN, make([]string, 8)), CoordinateOptions{FlowAzimuth: 210, FlowGiven: true}, ErrFlowAlong, "xs.csv:1"},
		{"line of no length", skewedLine(0, 0, 30, skewSt, skewOff, skewZ, skewN, make([]string, 8)), CoordinateOptions{Given: true, Line: [4]float64{1, 1, 1, 1}}, ErrLineLength, "xs.csv:1"},
		{"bad northing", "easting,northing,elevation\n1,2,3\n4,x,5\n", CoordinateOptions{}, ErrNotNumber, "xs.csv:3:2: northing"},
	}
	for _, tt := range tests {
		_, err := ParseSection(strings.NewReader(tt.text), "xs.csv", SectionOptions{Coordinates: tt.opt})
		if !errors.Is(err, tt.want) || !strings.HasPrefix(err.Error(), tt.at) {
			t.Errorf("%s: got %v, want %v at %s", tt.name, err, tt.want, tt.at)
		}
	}
}

// x, y and z name easting, northing and elevation; a header unit on any
// of them is read.
func TestCoordinateSurveyXYZ(t *testing.T) {
	text := "x (ft),y (ft),z (ft),n\n0,0,10,0.04\n3,4,2,\n6,8,10,\n"
	sv, err := ParseSection(strings.NewReader(text), "xs.csv", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if got := []float64{sv.Section.Points[1].Station, sv.Section.Points[2].Station}; got[0] != 5 || got[1] != 10 {
		t.Errorf("stations %v, want 5 10 (3-4-5 triangle)", got)
	}
	if !sv.Units.Found || sv.Units.Text != "ft" || sv.Projection.Tolerance != DefaultOffsetUS {
		t.Errorf("units %+v tolerance %g", sv.Units, sv.Projection.Tolerance)
	}
}

// A survey taken right to left (right pin first) comes out in station
// order with the same stations, banks and n of each stretch of ground:
// n on a point applies to the ground from it to the next point surveyed.
func TestCoordinateSurveyRightToLeft(t *testing.T) {
	forward, err := ParseSection(strings.NewReader(skewedLine(7000, 9000, 250, skewSt, skewOff, skewZ, skewN, skewMarks)), "f.csv", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	m := len(skewSt)
	rev := func(v []float64) []float64 {
		out := make([]float64, m)
		for i := range v {
			out[i] = v[m-1-i]
		}
		return out
	}
	var revN, revMarks []string
	for i := m - 1; i >= 0; i-- {
		n := ""
		if i > 0 {
			n = fmt.Sprint(forward.Section.N[i-1]) // the ground from point i back to point i−1
		}
		revN, revMarks = append(revN, n), append(revMarks, skewMarks[i])
	}
	revN[len(revN)-1] = "" // the last point surveyed starts no stretch
	text := skewedLine(7000, 9000, 250, rev(skewSt), rev(skewOff), rev(skewZ), revN, revMarks)
	back, err := ParseSection(strings.NewReader(text), "r.csv", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if !back.Projection.Reversed {
		t.Error("not reported as reversed")
	}
	if fmt.Sprint(back.Section.N) != fmt.Sprint(forward.Section.N) {
		t.Errorf("n %v, want %v", back.Section.N, forward.Section.N)
	}
	for i := range skewSt {
		if !closeRel(back.Section.Points[i].Station, skewSt[i], 1e-9, 1e-9) || back.Section.Points[i].Elevation != skewZ[i] {
			t.Errorf("point %d: %+v", i, back.Section.Points[i])
		}
	}
	if !closeRel(back.Section.LeftBank, forward.Section.LeftBank, 1e-9, 1e-9) || !closeRel(back.Section.RightBank, forward.Section.RightBank, 1e-9, 1e-9) {
		t.Errorf("banks %g %g, want %g %g", back.Section.LeftBank, back.Section.RightBank, forward.Section.LeftBank, forward.Section.RightBank)
	}
}

// A flow direction that contradicts the pins wins, with a warning.
func TestCoordinateSurveyPinsDisagree(t *testing.T) {
	// Section azimuth 37°: the right bank looking along a flow at 307°
	// lies at 37°, so the pins agree; flowing at 127° they do not.
	text := skewedLine(0, 0, 37, skewSt, skewOff, skewZ, skewN, skewMarks)
	for _, tt := range []struct {
		flow     float64
		disagree bool
	}{{307, false}, {127, true}} {
		sv, err := ParseSection(strings.NewReader(text), "xs.csv", SectionOptions{Coordinates: CoordinateOptions{FlowAzimuth: tt.flow, FlowGiven: true}})
		if err != nil {
			t.Fatal(err)
		}
		warned := strings.Contains(strings.Join(sv.Warnings, "\n"), "puts the point marked left pin on the right bank")
		if sv.Projection.PinsDisagree != tt.disagree || warned != tt.disagree || sv.Projection.Reversed != tt.disagree {
			t.Errorf("flow %g: disagree %v warned %v reversed %v", tt.flow, sv.Projection.PinsDisagree, warned, sv.Projection.Reversed)
		}
	}
}

// TestCoordinateSurveyOnTheLine: points exactly on a line at grid
// azimuth 36.87° (a 3-4-5 triangle, so stations 0, 5, 25, 30 by hand)
// have offsets of round-off size from the projection; below 1e-9 of the
// line's length they are 0, and the warning says the farthest lies 0 off.
func TestCoordinateSurveyOnTheLine(t *testing.T) {
	text := "easting (ft),northing (ft),elevation (ft),n\n1000,5000,10,0.035\n1003,5004,0,0.035\n1015,5020,0,0.035\n1018,5024,10,0.035\n"
	sv, err := ParseSection(strings.NewReader(text), "xs.csv", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	for k, want := range []float64{0, 5, 25, 30} {
		if p := sv.Section.Points[k]; !closeRel(p.Station, want, 1e-9, 1e-9) || sv.Projection.Offsets[k] != 0 {
			t.Errorf("point %d: station %.12g offset %g, want %g and 0", k, p.Station, sv.Projection.Offsets[k], want)
		}
	}
	if !strings.Contains(sv.ProjectionNote.Text, "the farthest point lies 0 ft off the line") {
		t.Errorf("projection note %+v", sv.ProjectionNote)
	}
}

// The end pins are read under the forms crews write (LPIN, L PIN,
// left-pin, left_pin, L.PIN, left end pin, and the right's alike; not LP
// and RP, since RP is a surveyor's reference point): the
// section line runs through them and they say the left bank, so a survey
// written from the right pin has its stations from the left pin. A mark
// that is no pin word leaves the principal axis. The data are invented:
// points on the line north = 0 with the pins on it, so the stations are
// the eastings counted from the left pin (closed form).
func TestPinWords(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		left, right string
		pins        bool
	}{
		{"left pin", "right pin", true}, {"LPIN", "RPIN", true}, {"L PIN", "R PIN", true}, {"left-pin", "right-pin", true},
		{"left_pin", "right_pin", true}, {"L.PIN", "R.PIN", true}, {"left end pin", "right end pin", true}, {"Left End-Pin", "R. End Pin", true},
		{"L.P.", "R.P.", false}, {"LP", "RP", false}, {"lp", "rp", false},
		{"pin", "pin", false}, {"LP1", "RP1", false},
	} {
		in := fmt.Sprintf("easting,northing,elevation,mark\n40,0,3,%s\n30,0.2,1,\n20,-0.1,0,\n10,0.1,1,\n0,0,3,%s\n", tc.right, tc.left)
		sv, err := ParseSection(strings.NewReader(in), "xs.csv", SectionOptions{})
		if err != nil {
			t.Errorf("%s/%s: %v", tc.left, tc.right, err)
			continue
		}
		if got := sv.Projection.Line == LineFromPins; got != tc.pins {
			t.Errorf("%s/%s: line %q, want the pins' line %v", tc.left, tc.right, sv.Projection.Line, tc.pins)
		}
		if tc.pins && (sv.Section.Points[0].Station != 0 || sv.Mark(0) != tc.left) {
			t.Errorf("%s/%s: first point station %g mark %q, want the left pin at 0", tc.left, tc.right, sv.Section.Points[0].Station, sv.Mark(0))
		}
	}
}

// A mark holding the word pin that is no pin word is warned of at its
// cell when the section line falls to the principal axis; pin words and
// other marks are not. The data are invented.
func TestPinLikeWarned(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		left, right string
		warned      int
	}{
		{"L pin 2", "R pin 2", 2}, {"pin left", "GRD", 1}, {"LPIN", "RPIN", 0}, {"GRD", "GRD", 0},
	} {
		in := fmt.Sprintf("easting,northing,elevation,mark\n0,0,3,%s\n10,0.1,1,\n20,-0.1,0,\n30,0.2,1,\n40,0,3,%s\n", tc.left, tc.right)
		sv, err := ParseSection(strings.NewReader(in), "xs.csv", SectionOptions{})
		if err != nil {
			t.Errorf("%s/%s: %v", tc.left, tc.right, err)
			continue
		}
		n := 0
		for _, w := range sv.Warnings {
			if strings.Contains(w, "not read as an end pin") {
				n++
			}
		}
		if n != tc.warned || n > 0 && !strings.Contains(strings.Join(sv.Warnings, "\n"), `xs.csv:2:4: mark "`+tc.left+`": not read as an end pin`) {
			t.Errorf("%s/%s: warnings %q, want %d pin warning(s)", tc.left, tc.right, sv.Warnings, tc.warned)
		}
	}
}

// No pin word is a bank word, in either of the forms marks are matched
// in (with their spaces or without them), so no mark reads as both.
func TestPinWordsAreNoBankWords(t *testing.T) {
	t.Parallel()
	for _, p := range PinWords() {
		if _, ok := readBankMark(p); ok {
			t.Errorf("pin word %q reads as a bank mark", p)
		}
		if side, ok := readPinMark(p); !ok || side == eitherBank {
			t.Errorf("pin word %q reads as side %v, %v", p, side, ok)
		}
	}
	for _, b := range BankWords() {
		if _, ok := readPinMark(b); ok {
			t.Errorf("bank word %q reads as a pin", b)
		}
	}
}

// A survey without pin words whose left end falls to the first point
// surveyed warns, at the cell, of each short mark that may name an end's
// side (LP1, R.P.2, RHP): the survey run from the right bank is mirrored
// unless the pins are read. Marks naming nothing of the kind are not
// warned of. The data are invented: the survey runs east from the
// right-hand end.
func TestSideLikeMarkWarnedWhenLeftIsFirstPoint(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		first, last string
		warned      int
	}{
		{"RP1", "LP1", 2}, {"R.P.2", "GRD", 1}, {"RHP", "LHP", 2}, {"rebar", "lip of bank", 0}, {"GRD", "thalweg", 0},
	} {
		in := fmt.Sprintf("easting,northing,elevation,mark\n0,0,3,%s\n10,0.1,1,\n20,-0.1,0,\n30,0.2,1,\n40,0,3,%s\n", tc.first, tc.last)
		sv, err := ParseSection(strings.NewReader(in), "xs.csv", SectionOptions{})
		if err != nil {
			t.Errorf("%s/%s: %v", tc.first, tc.last, err)
			continue
		}
		if sv.Projection.Left != LeftFromOrder {
			t.Errorf("%s/%s: left from %q, want the survey order", tc.first, tc.last, sv.Projection.Left)
		}
		n := 0
		for _, w := range sv.Warnings {
			if strings.Contains(w, "not read as an end pin") && strings.Contains(w, "the left end is the first point surveyed (row 2)") {
				n++
			}
		}
		if n != tc.warned || n > 0 && !strings.Contains(strings.Join(sv.Warnings, "\n"), `xs.csv:2:4: mark "`+tc.first+`": not read as an end pin`) {
			t.Errorf("%s/%s: warnings %q, want %d", tc.first, tc.last, sv.Warnings, tc.warned)
		}
	}
}

// Eleven points far off the line: ten are warned of one by one, and the
// one more is counted as one ("1 more point lies", not "1 more points
// lie"). An invented V of 13 points, 3 m apart.
func TestCoordinateSurveyOffsetWarningsCounted(t *testing.T) {
	var st, off, z []float64
	var n, marks []string
	for i := 0; i <= 12; i++ {
		st, z = append(st, 3*float64(i)), append(z, 100+math.Abs(float64(i)-6)/2)
		d := 1.0
		if i == 0 || i == 12 {
			d = 0
		}
		off, n, marks = append(off, d), append(n, ""), append(marks, "")
	}
	n[0], marks[0], marks[12] = "0.04", "left pin", "right pin"
	sv, err := ParseSection(strings.NewReader(skewedLine(0, 0, 10, st, off, z, n, marks)), "xs.csv", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	w := strings.Join(sv.Warnings, "\n")
	if !strings.Contains(w, "xs.csv:1: 1 more point lies off the section line by more than 0.5 m") {
		t.Errorf("warnings:\n%s", w)
	}
}
