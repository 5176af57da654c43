package reach

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
)

// Tolerances of the slope-area tests.
const (
	// saClosedFormTol is the relative tolerance against a closed form: the
	// engine's geometry is exact, so only round-off differs.
	saClosedFormTol = 1e-9
	// saBisectTol is the relative tolerance against a root found by
	// bisection in the test.
	saBisectTol = 1e-7
)

// saTrapezoid returns a prismatic trapezoidal section with bed width b, side
// slopes z (horizontal per vertical), bed elevation bed, banks high enough
// for depth top, and one n.
func saTrapezoid(t testing.TB, b, z, bed, top, n float64) subdivide.Geometry {
	t.Helper()
	p, err := subdivide.Compile(subdivide.Section{
		Points: saPoints(0, bed+top, z*top, bed, z*top+b, bed, 2*z*top+b, bed+top),
		N:      []float64{n, n, n},
	})
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// saPoints builds a ground line from station, elevation pairs.
func saPoints(v ...float64) []subdivide.Point {
	out := make([]subdivide.Point, 0, len(v)/2)
	for i := 0; i+1 < len(v); i += 2 {
		out = append(out, subdivide.Point{Station: v[i], Elevation: v[i+1]})
	}
	return out
}

// saTrapezoidAKT is the closed-form area, conveyance and top width of a
// trapezoid at depth y in SI (Chow, 1959, table 2-1; Manning, eq. 6-9).
func saTrapezoidAKT(b, z, y, n float64) (a, k, top float64) {
	a = (b + z*y) * y
	p := b + 2*y*math.Sqrt(1+z*z)
	return a, a * math.Pow(a/p, 2.0/3.0) / n, b + 2*z*y
}

func saRelErr(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }

// Two identical prismatic sections with equal depths: no velocity-head
// change, so the slope-area discharge is uniform flow Q = K·√(F/L)
// (Manning's equation, Chow 1959, eq. 6-9, with S = F/L).
func TestSlopeAreaUniformFlow(t *testing.T) {
	for _, tc := range []struct {
		name             string
		b, z, y, n, f, l float64
	}{
		{"rectangle", 12, 0, 1.5, 0.035, 0.3, 200},
		{"trapezoid", 8, 2, 2.2, 0.045, 0.25, 310},
		{"steep small", 3, 1, 0.6, 0.05, 0.9, 90},
	} {
		t.Run(tc.name, func(t *testing.T) {
			g1 := saTrapezoid(t, tc.b, tc.z, 100, 5, tc.n)
			g2 := saTrapezoid(t, tc.b, tc.z, 100-tc.f, 5, tc.n)
			secs := []Section{
				{ID: "A", Geometry: g1, Distance: 0, Left: 100 + tc.y, Right: 100 + tc.y},
				{ID: "B", Geometry: g2, Distance: tc.l, Left: 100 - tc.f + tc.y, Right: math.NaN()},
			}
			res, err := SolveSlopeArea(secs, SlopeAreaOptions{})
			if err != nil {
				t.Fatal(err)
			}
			_, k, _ := saTrapezoidAKT(tc.b, tc.z, tc.y, tc.n)
			want := k * math.Sqrt(tc.f/tc.l) // Chow 1959, eq. 6-9: uniform flow
			if saRelErr(res.Discharge, want) > saClosedFormTol {
				t.Errorf("Q = %.9g, uniform flow %.9g", res.Discharge, want)
			}
			if saRelErr(res.Subreaches[0].Discharge, want) > saClosedFormTol {
				t.Errorf("subreach Q = %.9g, uniform flow %.9g", res.Subreaches[0].Discharge, want)
			}
			if res.Subreaches[0].Expanding {
				t.Error("equal sections reported expanding")
			}
			if saRelErr(res.Subreaches[0].FrictionLoss, tc.f) > saClosedFormTol {
				t.Errorf("friction loss %g, want the whole fall %g", res.Subreaches[0].FrictionLoss, tc.f)
			}
		})
	}
}

// Two rectangular sections of different width. The test solves the energy
// equation of Dalrymple & Benson (1967, TWRI 3-A2) by hand for rectangles
// (α = 1, A = b·y, R = b·y/(b+2y)):
//
//	h1 + Q²/(2gA1²) = h2 + Q²/(2gA2²) + Q²L/(K1K2) + k·(Q²/(2gA1²) − Q²/(2gA2²))
//
// with k = 0.5 only when the flow expands (A2 > A1), else 0.
func TestSlopeAreaRectangularExpandingContracting(t *testing.T) {
	const g = 9.80665
	for _, tc := range []struct {
		name          string
		b1, b2        float64
		y1, y2        float64
		n, l, fall    float64
		wantExpanding bool
	}{
		{"expanding", 10, 16, 2.0, 1.9, 0.03, 150, 0.20, true},
		{"contracting", 16, 10, 2.0, 1.9, 0.03, 150, 0.20, false},
		{"strong expansion", 6, 20, 1.5, 1.6, 0.04, 100, 0.15, true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			secs := []Section{
				{ID: "up", Geometry: saTrapezoid(t, tc.b1, 0, 50, 6, tc.n), Distance: 1000, Left: 50 + tc.y1, Right: 50 + tc.y1},
				{ID: "down", Geometry: saTrapezoid(t, tc.b2, 0, 50+tc.y1-tc.fall-tc.y2, 6, tc.n), Distance: 1000 + tc.l,
					Left: 50 + tc.y1 - tc.fall, Right: 50 + tc.y1 - tc.fall},
			}
			res, err := SolveSlopeArea(secs, SlopeAreaOptions{})
			if err != nil {
				t.Fatal(err)
			}
			a1, k1, _ := saTrapezoidAKT(tc.b1, 0, tc.y1, tc.n)
			a2, k2, _ := saTrapezoidAKT(tc.b2, 0, tc.y2, tc.n)
			k := 0.0
			if a2 > a1 {
				k = 0.5 // Dalrymple & Benson 1967: half the velocity-head drop when expanding
			}
			// Hand solution: Q² (L/(K1K2) − (1−k)(1/A1² − 1/A2²)/(2g)) = fall.
			q := math.Sqrt(tc.fall / (tc.l/(k1*k2) - (1-k)*(1/(a1*a1)-1/(a2*a2))/(2*g)))
			if saRelErr(res.Discharge, q) > saClosedFormTol {
				t.Errorf("Q = %.9g, hand solution %.9g", res.Discharge, q)
			}
			sr := res.Subreaches[0]
			if sr.Expanding != tc.wantExpanding || sr.EddyK != k {
				t.Errorf("expanding %v k %g, want %v k %g", sr.Expanding, sr.EddyK, tc.wantExpanding, k)
			}
			// The energy equation balances at the solution.
			hv1, hv2 := q*q/(2*g*a1*a1), q*q/(2*g*a2*a2)
			resid := (tc.fall + hv1 - hv2) - (q*q*tc.l/(k1*k2) + k*(hv1-hv2))
			if math.Abs(resid) > saClosedFormTol*tc.fall {
				t.Errorf("energy residual %g", resid)
			}
			if saRelErr(res.Sections[0].VelocityHead, hv1) > saClosedFormTol || saRelErr(res.Sections[1].VelocityHead, hv2) > saClosedFormTol {
				t.Errorf("velocity heads %g %g, want %g %g", res.Sections[0].VelocityHead, res.Sections[1].VelocityHead, hv1, hv2)
			}
			if saRelErr(res.Sections[0].Alpha, 1) > saClosedFormTol {
				t.Errorf("alpha of a rectangle with one n = %g, want 1", res.Sections[0].Alpha)
			}
		})
	}
}

// Three trapezoidal sections, one expanding and one contracting subreach.
// The test finds Q independently: it bisects on Q until the sum of the
// energy-equation residuals of both subreaches vanishes, with geometry from
// the closed-form trapezoid (Chow 1959, table 2-1) and k chosen from the
// velocity heads as in Dalrymple & Benson (1967).
func TestSlopeAreaThreeSections(t *testing.T) {
	const g = 9.80665
	type xs struct{ b, z, bed, ws, n, dist float64 }
	reach := []xs{
		{14, 1.5, 200.0, 202.60, 0.040, 0},
		{9, 1.0, 199.7, 202.35, 0.035, 180},
		{18, 2.0, 199.9, 202.05, 0.045, 390},
	}
	var secs []Section
	for i, s := range reach {
		secs = append(secs, Section{ID: string(rune('A' + i)), Geometry: saTrapezoid(t, s.b, s.z, s.bed, 6, s.n),
			Distance: s.dist, Left: s.ws + 0.02, Right: s.ws - 0.02})
	}
	res, err := SolveSlopeArea(secs, SlopeAreaOptions{})
	if err != nil {
		t.Fatal(err)
	}
	residual := func(q float64) float64 {
		var sum float64
		for j := 0; j+1 < len(reach); j++ {
			u, d := reach[j], reach[j+1]
			au, ku, _ := saTrapezoidAKT(u.b, u.z, u.ws-u.bed, u.n)
			ad, kd, _ := saTrapezoidAKT(d.b, d.z, d.ws-d.bed, d.n)
			hvu, hvd := q*q/(2*g*au*au), q*q/(2*g*ad*ad)
			k := 0.0
			if hvu > hvd {
				k = 0.5
			}
			sum += (u.ws + hvu) - (d.ws + hvd) - q*q*(d.dist-u.dist)/(ku*kd) - k*(hvu-hvd)
		}
		return sum
	}
	lo, hi := 1.0, 1e5
	for range 200 {
		mid := (lo + hi) / 2
		if residual(mid) > 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	if want := (lo + hi) / 2; saRelErr(res.Discharge, want) > saBisectTol {
		t.Errorf("Q = %.9g, bisection %.9g", res.Discharge, want)
	}
	if !(res.Subreaches[0].Expanding == false && res.Subreaches[1].Expanding) {
		t.Errorf("expanding = %v, %v; want contracting then expanding", res.Subreaches[0].Expanding, res.Subreaches[1].Expanding)
	}
	// Water surface is the mean of the two marks.
	if saRelErr(res.Sections[1].WaterSurface, 202.35) > saClosedFormTol || res.Sections[1].MarksUsed != 2 {
		t.Errorf("water surface %g from %d marks", res.Sections[1].WaterSurface, res.Sections[1].MarksUsed)
	}
	if !(res.SubreachMin <= res.Discharge*1.5 && res.SubreachMax >= res.Discharge/1.5) {
		t.Errorf("subreach discharges %g..%g far from %g", res.SubreachMin, res.SubreachMax, res.Discharge)
	}
}

// The α and conveyance of a section computed for the slope-area method
// equal those of the rating hydraulics at the same stage (both Chow 1959,
// section 2-7), for a compound section with three n values.
func TestSlopeAreaSectionMatchesHydraulics(t *testing.T) {
	g, err := subdivide.Compile(subdivide.Section{
		Points: saPoints(0, 5, 20, 3, 30, 2.8, 32, 0.5, 40, 0, 45, 0.4, 47, 2.9, 70, 3.5, 80, 5),
		N:      []float64{0.06, 0.06, 0.06, 0.035, 0.035, 0.035, 0.08, 0.08},
	})
	if err != nil {
		t.Fatal(err)
	}
	var st saSectionState
	if err := saState(g, 3.6, nil, subdivide.Options{AllPools: true}, rating.SI, &st); err != nil {
		t.Fatal(err)
	}
	w, _ := g.At(3.6, subdivide.Options{AllPools: true})
	row, err := rating.Hydraulics(w, g.Bottom(), 0.001, rating.SI)
	if err != nil {
		t.Fatal(err)
	}
	if saRelErr(st.k, row.Conveyance) > saClosedFormTol || saRelErr(st.alpha, row.Alpha) > saClosedFormTol {
		t.Errorf("K %g α %g, hydraulics K %g α %g", st.k, st.alpha, row.Conveyance, row.Alpha)
	}
	if !(st.alpha > 1) {
		t.Errorf("α of a compound section = %g, want > 1", st.alpha)
	}
}

func TestSlopeAreaSides(t *testing.T) {
	g1 := saTrapezoid(t, 10, 1, 100, 5, 0.04)
	g2 := saTrapezoid(t, 10, 1, 99.8, 5, 0.04)
	const (
		meanWarn  = "section B has no right mark: its water surface is the left mark alone, not a mean of two"
		rightWarn = "section B has no right mark: the left mark is used"
	)
	for _, tc := range []struct {
		side Side
		want float64
		warn string // "" for none about B's marks
	}{
		{MeanSide, 102.05, meanWarn},
		{LeftSide, 102.0, ""},
		{RightSide, 102.1, rightWarn},
	} {
		secs := []Section{
			{ID: "A", Geometry: g1, Distance: 0, Left: 102.0, Right: 102.1},
			{ID: "B", Geometry: g2, Distance: 150, Left: 101.8, Right: math.NaN()},
		}
		res, err := SolveSlopeArea(secs, SlopeAreaOptions{Side: tc.side})
		if err != nil {
			t.Fatal(err)
		}
		if saRelErr(res.Sections[0].WaterSurface, tc.want) > saClosedFormTol {
			t.Errorf("side %v: water surface %g, want %g", tc.side, res.Sections[0].WaterSurface, tc.want)
		}
		if res.Sections[1].WaterSurface != 101.8 || res.Sections[1].MarksUsed != 1 {
			t.Errorf("side %v: B's water surface %g from %d marks, want the left mark 101.8 alone",
				tc.side, res.Sections[1].WaterSurface, res.Sections[1].MarksUsed)
		}
		var about []string
		for _, w := range res.Warnings {
			if strings.HasPrefix(w, "section B has no") {
				about = append(about, w)
			}
		}
		if tc.warn == "" && len(about) > 0 || tc.warn != "" && (len(about) != 1 || about[0] != tc.warn) {
			t.Errorf("side %v: warnings about B's marks %q, want %q", tc.side, about, tc.warn)
		}
	}
}

// checkedReach is a reach that fails most checks: marks 0.3 m apart at A
// (tolerance 0.15 m), an expanding subreach, a short reach (L = 60 m
// against 75 × about 1.9 m).
func checkedReach(t *testing.T) []Section {
	t.Helper()
	return []Section{
		{ID: "A", Geometry: saTrapezoid(t, 8, 0, 10, 5, 0.035), Distance: 0, Left: 12.15, Right: 11.85},
		{ID: "B", Geometry: saTrapezoid(t, 12, 0, 9.9, 5, 0.035), Distance: 60, Left: 11.9, Right: 11.9},
	}
}

func TestSlopeAreaChecks(t *testing.T) {
	secs := checkedReach(t)
	res, err := SolveSlopeArea(secs, SlopeAreaOptions{})
	if err != nil {
		t.Fatal(err)
	}
	got := map[string]Check{}
	for _, c := range res.Checks {
		got[c.Name] = c
		if c.Source == "" || c.Relation == "" {
			t.Errorf("check %s has no source or relation", c.Name)
		}
	}
	for name, pass := range map[string]bool{
		"mark spread A":                         false,
		"mark spread B":                         true,
		"expansion A to B (velocity-head drop)": false,
		"reach length vs mean depth":            false,
		"fall A to B":                           false, // fall 0.1 m < 0.15 m
		"sections in the reach":                 false, // two sections
		"conveyance ratio A to B":               false, // widths 8 and 12
		"froude A":                              true,
	} {
		c, ok := got[name]
		if !ok {
			t.Errorf("no check %q", name)
			continue
		}
		if c.Pass != pass {
			t.Errorf("check %s: pass %v (value %g, limit %g), want %v", name, c.Pass, c.Value, c.Limit, pass)
		}
	}
	if c := got["mark spread A"]; saRelErr(c.Value, 0.3) > saClosedFormTol || c.Limit != MarkSpreadSI {
		t.Errorf("mark spread A = %g limit %g", c.Value, c.Limit)
	}
	if len(res.Warnings) < 5 {
		t.Errorf("failing checks gave %d warnings: %q", len(res.Warnings), res.Warnings)
	}
}

// TestSlopeAreaCheckWording reads the warnings of failed checks as a
// user does: the one of an expanding subreach says the subreach expands,
// and the conveyance ratio's quotes in its source the limit it was held
// to (1/0.7, the symmetric reading of Dalrymple and Benson's 0.7, printed
// to four figures as every value is).
func TestSlopeAreaCheckWording(t *testing.T) {
	secs := checkedReach(t)
	res, err := SolveSlopeArea(secs, SlopeAreaOptions{})
	if err != nil {
		t.Fatal(err)
	}
	warning := func(part string) string {
		for _, w := range res.Warnings {
			if strings.Contains(w, part) {
				return w
			}
		}
		t.Fatalf("no warning of %q among %q", part, res.Warnings)
		return ""
	}
	if w := warning("velocity-head drop"); !strings.Contains(w, "A to B") || !strings.Contains(w, "expands") {
		t.Errorf("expanding subreach: %q does not say the subreach expands", w)
	}
	w := warning("conveyance ratio A to B")
	limit := saSig(MaxConveyanceRatio)
	if !strings.Contains(w, "wanted ≤ "+limit+" (") {
		t.Fatalf("conveyance ratio: %q does not hold it to %s", w, limit)
	}
	_, source, _ := strings.Cut(w, "wanted ≤ "+limit+" (")
	if !strings.Contains(source, limit) || !strings.Contains(source, "0.7") || !strings.Contains(source, "Dalrymple") {
		t.Errorf("conveyance ratio: its source %q does not quote the limit %s as 1/0.7 from Dalrymple and Benson", source, limit)
	}
}

func TestSlopeAreaErrors(t *testing.T) {
	g := saTrapezoid(t, 10, 1, 100, 3, 0.04)
	low := saTrapezoid(t, 10, 1, 99.5, 3, 0.04)
	nan := math.NaN()
	for _, tc := range []struct {
		name  string
		secs  []Section
		want  error
		field string
	}{
		{"one section", []Section{{ID: "A", Geometry: g, Left: 101, Right: nan}}, ErrTooFewSections, ""},
		{"zero fall", []Section{
			{ID: "A", Geometry: g, Distance: 0, Left: 101, Right: nan},
			{ID: "B", Geometry: low, Distance: 100, Left: 101, Right: nan}}, ErrFall, ""},
		{"negative fall", []Section{
			{ID: "A", Geometry: g, Distance: 0, Left: 101, Right: nan},
			{ID: "B", Geometry: low, Distance: 100, Left: 101.2, Right: nan}}, ErrFall, ""},
		{"distance not increasing", []Section{
			{ID: "A", Geometry: g, Distance: 100, Left: 101, Right: nan},
			{ID: "B", Geometry: low, Distance: 100, Left: 100.8, Right: nan}}, ErrDistances, "distance"},
		{"dry section", []Section{
			{ID: "A", Geometry: g, Distance: 0, Left: 101, Right: nan},
			{ID: "B", Geometry: saTrapezoid(t, 10, 1, 101, 3, 0.04), Distance: 100, Left: 100.8, Right: nan}}, ErrDrySection, "ws_left"},
		{"dry section, its right mark", []Section{
			{ID: "A", Geometry: g, Distance: 0, Left: 101, Right: nan},
			{ID: "B", Geometry: saTrapezoid(t, 10, 1, 101, 3, 0.04), Distance: 100, Left: nan, Right: 100.8}}, ErrDrySection, "ws_right"},
		{"dry section, the mean of its marks", []Section{
			{ID: "A", Geometry: g, Distance: 0, Left: 101, Right: nan},
			{ID: "B", Geometry: saTrapezoid(t, 10, 1, 101, 3, 0.04), Distance: 100, Left: 100.8, Right: 100.9}}, ErrDrySection, "water_surface"},
		{"no mark", []Section{
			{ID: "A", Geometry: g, Distance: 0, Left: nan, Right: nan},
			{ID: "B", Geometry: low, Distance: 100, Left: 100.8, Right: nan}}, ErrNoMark, "water_surface"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := SolveSlopeArea(tc.secs, SlopeAreaOptions{})
			if !errors.Is(err, tc.want) {
				t.Fatalf("err = %v, want %v", err, tc.want)
			}
			var se *SectionError
			if tc.field != "" && (!errors.As(err, &se) || se.Field != tc.field) {
				t.Errorf("err = %#v, want a SectionError on %s", err, tc.field)
			}
			if _, err := MonteCarlo(tc.secs, SlopeAreaOptions{}, MonteCarloOptions{Draws: 10}); !errors.Is(err, tc.want) {
				t.Errorf("MonteCarlo err = %v, want %v", err, tc.want)
			}
		})
	}
}

// The single-section fallback is Manning's uniform-flow discharge
// Q = K·√S (Chow 1959, eq. 6-9) and is labelled as weaker.
func TestSlopeConveyance(t *testing.T) {
	g := saTrapezoid(t, 6, 1.5, 10, 4, 0.04)
	res, err := SlopeConveyance(Section{ID: "X", Geometry: g, Left: 11.8, Right: 11.8}, 0.002, SlopeAreaOptions{})
	if err != nil {
		t.Fatal(err)
	}
	_, k, _ := saTrapezoidAKT(6, 1.5, 1.8, 0.04)
	if want := k * math.Sqrt(0.002); saRelErr(res.Discharge, want) > saClosedFormTol {
		t.Errorf("Q = %g, want K√S = %g", res.Discharge, want)
	}
	if res.Method != MethodSlopeConveyance || len(res.Warnings) == 0 || len(res.Subreaches) != 0 {
		t.Errorf("method %q warnings %q", res.Method, res.Warnings)
	}
	if _, err := SlopeConveyance(Section{ID: "X", Geometry: g, Left: 11.8}, 0, SlopeAreaOptions{}); !errors.Is(err, rating.ErrSlope) {
		t.Errorf("zero slope: err = %v", err)
	}
}

func TestParseSide(t *testing.T) {
	for in, want := range map[string]Side{"": MeanSide, "Mean": MeanSide, "left": LeftSide, " RIGHT ": RightSide} {
		if got, err := ParseSide(in); err != nil || got != want {
			t.Errorf("ParseSide(%q) = %v, %v", in, got, err)
		}
	}
	if _, err := ParseSide("middle"); !errors.Is(err, ErrSide) {
		t.Errorf("ParseSide(middle): err = %v, want ErrSide", err)
	}
}

// In US customary units the same uniform-flow case uses Manning's 1.486
// (Chow 1959, eq. 6-9) and the US defaults of the tolerances.
func TestSlopeAreaUSUnits(t *testing.T) {
	const b, y, n, f, l = 40.0, 6.0, 0.035, 0.8, 800.0
	secs := []Section{
		{ID: "A", Geometry: saTrapezoid(t, b, 0, 300, 15, n), Distance: 0, Left: 300 + y, Right: 300 + y + 0.6},
		{ID: "B", Geometry: saTrapezoid(t, b, 0, 300-f, 15, n), Distance: l, Left: 300 - f + y, Right: 300 - f + y + 0.6},
	}
	res, err := SolveSlopeArea(secs, SlopeAreaOptions{Units: rating.US, Side: LeftSide})
	if err != nil {
		t.Fatal(err)
	}
	_, k, _ := saTrapezoidAKT(b, 0, y, n)
	if want := 1.486 * k * math.Sqrt(f/l); saRelErr(res.Discharge, want) > saClosedFormTol {
		t.Errorf("Q = %g ft³/s, want %g", res.Discharge, want)
	}
	if res.MarkSpread != MarkSpreadUS || res.MinFall != MinFallUS {
		t.Errorf("tolerances %g %g", res.MarkSpread, res.MinFall)
	}
	// Marks 0.6 ft apart exceed the 0.5 ft tolerance.
	for _, c := range res.Checks {
		if c.Name == "mark spread A" && c.Pass {
			t.Error("0.6 ft mark spread passes a 0.5 ft tolerance")
		}
	}
	u, err := MonteCarlo(secs, SlopeAreaOptions{Units: rating.US}, MonteCarloOptions{Draws: 10})
	if err != nil || u.MarkSD != DefaultMarkSDUS {
		t.Errorf("US mark SD %g, %v", u.MarkSD, err)
	}
}

// The fall of each pair of sections is checked against the larger of
// 0.15 m and the velocity head (Dalrymple & Benson 1967, as quoted by
// Jarrett 1985, USGS WRI 85-4004, p. 7): a reach whose total fall passes
// can still have a pair that does not; and in a steep uniform reach the
// velocity head, Q²/(2g·A²) with Q = K·√(F/L) (Manning's equation, Chow
// 1959, eq. 6-9; α = 1 in a rectangle of one n), is the limit.
func TestSlopeAreaPairFall(t *testing.T) {
	const g = 9.80665
	t.Run("short pair", func(t *testing.T) {
		secs := []Section{
			{ID: "A", Geometry: saTrapezoid(t, 30, 2, 100, 6, 0.04), Distance: 0, Left: 102.50, Right: math.NaN()},
			{ID: "B", Geometry: saTrapezoid(t, 30, 2, 99.95, 6, 0.04), Distance: 200, Left: 102.45, Right: math.NaN()},
			{ID: "C", Geometry: saTrapezoid(t, 30, 2, 99.5, 6, 0.04), Distance: 500, Left: 102.00, Right: math.NaN()},
		}
		res, err := SolveSlopeArea(secs, SlopeAreaOptions{})
		if err != nil {
			t.Fatal(err)
		}
		got := map[string]Check{}
		for _, c := range res.Checks {
			got[c.Name] = c
		}
		ab, bc := got["fall A to B"], got["fall B to C"]
		if ab.Pass || saRelErr(ab.Value, 0.05) > saClosedFormTol || ab.Limit != MinFallSI || ab.Source != srcPairFall {
			t.Errorf("fall A to B: %+v", ab)
		}
		if !bc.Pass || saRelErr(bc.Value, 0.45) > saClosedFormTol {
			t.Errorf("fall B to C: %+v", bc)
		}
		if c := got["sections in the reach"]; !c.Pass || c.Value != 3 {
			t.Errorf("three sections: %+v", c)
		}
	})
	t.Run("velocity head", func(t *testing.T) {
		const b, y, n, f, l = 5.0, 1.0, 0.03, 0.2, 20.0
		secs := []Section{
			{ID: "A", Geometry: saTrapezoid(t, b, 0, 10, 3, n), Distance: 0, Left: 10 + y, Right: math.NaN()},
			{ID: "B", Geometry: saTrapezoid(t, b, 0, 10-f, 3, n), Distance: l, Left: 10 - f + y, Right: math.NaN()},
		}
		res, err := SolveSlopeArea(secs, SlopeAreaOptions{})
		if err != nil {
			t.Fatal(err)
		}
		a, k, _ := saTrapezoidAKT(b, 0, y, n)
		q := k * math.Sqrt(f/l)
		hv := q * q / (2 * g * a * a)
		var fall, count Check
		for _, c := range res.Checks {
			switch c.Name {
			case "fall A to B":
				fall = c
			case "sections in the reach":
				count = c
			}
		}
		if fall.Pass || saRelErr(fall.Limit, hv) > saClosedFormTol || !(hv > MinFallSI) {
			t.Errorf("fall check %+v, velocity head %g", fall, hv)
		}
		if count.Pass || count.Value != 2 || count.Limit != MinSections {
			t.Errorf("two sections: %+v", count)
		}
		warned := false
		for _, w := range res.Warnings {
			if strings.Contains(w, "fails") {
				t.Errorf("a warning says fails, the checks say warn: %q", w)
			}
			warned = warned || strings.Contains(w, `"sections in the reach": warn`) && strings.Contains(w, "three or more sections recommended")
		}
		if !warned {
			t.Errorf("no two-section warning: %q", res.Warnings)
		}
	})
}

// Each section's result carries its subsections at the peak: stations,
// n, area and conveyance, adding up to the section's.
func TestSlopeAreaSubsections(t *testing.T) {
	g, err := subdivide.Compile(subdivide.Section{
		Points:   saPoints(0, 5, 20, 3, 30, 2.8, 32, 0.5, 40, 0, 45, 0.4, 47, 2.9, 70, 3.5, 80, 5),
		HasBanks: true, LeftBank: 30, RightBank: 47, NByRegion: subdivide.PerRegion{Channel: 0.035, Left: 0.06, Right: 0.08},
	})
	if err != nil {
		t.Fatal(err)
	}
	secs := []Section{
		{ID: "A", Geometry: g, Distance: 0, Left: 3.6, Right: math.NaN()},
		{ID: "B", Geometry: g, Distance: 300, Left: 3.3, Right: math.NaN()},
	}
	res, err := SolveSlopeArea(secs, SlopeAreaOptions{})
	if err != nil {
		t.Fatal(err)
	}
	s := res.Sections[0]
	if len(s.Subs) != 3 {
		t.Fatalf("%d subsections", len(s.Subs))
	}
	var a, k float64
	for i, want := range []struct {
		from, to, n float64
	}{{0, 30, 0.06}, {30, 47, 0.035}, {47, 80, 0.08}} {
		sub := s.Subs[i]
		if sub.From != want.from || sub.To != want.to || sub.N != want.n {
			t.Errorf("subsection %d: stations %g to %g, n %g", i, sub.From, sub.To, sub.N)
		}
		a += sub.Area
		k += sub.Conveyance
	}
	if saRelErr(a, s.Area) > saClosedFormTol || saRelErr(k, s.Conveyance) > saClosedFormTol {
		t.Errorf("subsections add to area %g and K %g, section %g and %g", a, k, s.Area, s.Conveyance)
	}
}

// Eleven identical rectangular sections 10 m wide with n 0.03, 200 m
// apart on a bed falling 0.2 m per section (z = 100 − 0.2·I), marks
// 1.6456 m above each bed (parallel to it): every section has the same
// depth, area and velocity head, so no subreach expands or contracts
// (Dalrymple & Benson 1967, TWRI 3-A2: the eddy loss is k·Δhv with Δhv = 0)
// and the velocity-head change is 0, not the round-off of the elevations
// (101.0456 − 99.4 and 100.8456 − 99.2 differ in the last bits). The
// discharge is then uniform flow, Q = K·√(F/L) (Chow 1959, eq. 6-9).
func TestSlopeAreaEqualSectionsNoRoundOff(t *testing.T) {
	var secs []Section
	for i := range 11 {
		// The elevations as read from a table written in decimals: the
		// nearest doubles to 99.4, 101.0456, ...
		z := math.Round(1000-2*float64(i)) / 10
		g, err := subdivide.Compile(subdivide.Section{Points: saPoints(0, z+6, 0, z, 10, z, 10, z+6), N: []float64{0.03, 0.03, 0.03}})
		if err != nil {
			t.Fatal(err)
		}
		ws := math.Round(1e4*z+16456) / 1e4
		secs = append(secs, Section{ID: fmt.Sprintf("X%d", i), Geometry: g, Distance: 200 * float64(i), Left: ws, Right: ws})
	}
	res, err := SolveSlopeArea(secs, SlopeAreaOptions{})
	if err != nil {
		t.Fatal(err)
	}
	for _, sr := range res.Subreaches {
		if sr.Expanding || sr.VelocityHeadChange != 0 || sr.EddyLoss != 0 || sr.Flow() != FlowUniform {
			t.Errorf("%s to %s: expanding %v, velocity-head change %g, eddy loss %g: want not expanding, 0, 0",
				sr.From, sr.To, sr.Expanding, sr.VelocityHeadChange, sr.EddyLoss)
		}
	}
	for _, c := range res.Checks {
		if strings.HasPrefix(c.Name, "expansion ") && (!c.Pass || c.Value != 0) {
			t.Errorf("check %s: value %g, pass %v", c.Name, c.Value, c.Pass)
		}
	}
	_, k, _ := saTrapezoidAKT(10, 0, 1.6456, 0.03)
	if want := k * math.Sqrt(2.0/2000); saRelErr(res.Discharge, want) > saClosedFormTol {
		t.Errorf("Q = %.9g, uniform flow %.9g", res.Discharge, want)
	}
}

// A fall or a mark spread equal to its limit in the written decimals
// passes although the binary difference is a little less or more
// (50.94 − 50.79 is 0.14999999999999147 in double precision, IEEE 754);
// one a millimetre beyond the limit still warns.
func TestSlopeAreaChecksAtTheirLimit(t *testing.T) {
	up, dn := 50.94, 50.79 // variables: a constant expression would be exact
	if d := up - dn; !(d < MinFallSI) {
		t.Fatalf("50.94 - 50.79 = %.17g: the case no longer shows round-off", d)
	}
	nan := math.NaN()
	for _, tc := range []struct {
		name         string
		up, dn       [2]float64 // left, right marks
		check        string
		pass         bool
		value, limit float64
	}{
		{"fall at the limit", [2]float64{50.94, 50.94}, [2]float64{50.79, 50.79}, "fall A to B", true, 0.15, MinFallSI},
		{"fall a millimetre short", [2]float64{50.94, 50.94}, [2]float64{50.791, 50.791}, "fall A to B", false, 0.149, MinFallSI},
		{"fall at the limit, one mark", [2]float64{1234.56, nan}, [2]float64{1234.41, nan}, "fall A to B", true, 0.15, MinFallSI},
		{"spread at the limit", [2]float64{50.94, 50.79}, [2]float64{50.4, 50.4}, "mark spread A", true, 0.15, MarkSpreadSI},
		{"spread at the limit, high datum", [2]float64{4321.17, 4321.02}, [2]float64{4320.6, 4320.6}, "mark spread A", true, 0.15, MarkSpreadSI},
		{"spread a millimetre over", [2]float64{50.941, 50.79}, [2]float64{50.4, 50.4}, "mark spread A", false, 0.151, MarkSpreadSI},
	} {
		t.Run(tc.name, func(t *testing.T) {
			bed := math.Floor(tc.dn[0]) - 3
			secs := []Section{
				{ID: "A", Geometry: saTrapezoid(t, 30, 2, bed+0.1, 6, 0.04), Distance: 0, Left: tc.up[0], Right: tc.up[1]},
				{ID: "B", Geometry: saTrapezoid(t, 30, 2, bed, 6, 0.04), Distance: 165, Left: tc.dn[0], Right: tc.dn[1]},
			}
			res, err := SolveSlopeArea(secs, SlopeAreaOptions{})
			if err != nil {
				t.Fatal(err)
			}
			for _, c := range res.Checks {
				if c.Name != tc.check {
					continue
				}
				if c.Pass != tc.pass || saRelErr(c.Value, tc.value) > saClosedFormTol || c.Limit != tc.limit {
					t.Errorf("%s: pass %v value %.17g limit %g, want pass %v value %g limit %g",
						c.Name, c.Pass, c.Value, c.Limit, tc.pass, tc.value, tc.limit)
				}
				return
			}
			t.Errorf("no check %q in %+v", tc.check, res.Checks)
		})
	}
}

// Each subreach of a reach of three or more sections is checked against
// its equal share of 75 mean depths, at the hydraulic depths A/T of its
// two sections (closed form for a trapezoid, Chow 1959, table 2-1); a
// subreach of a millimetre warns, and a reach of two sections has no
// subreach check beside the reach's.
func TestSlopeAreaSubreachLength(t *testing.T) {
	const b, z, n = 20.0, 2.0, 0.04
	depth := func(y float64) float64 {
		a, _, top := saTrapezoidAKT(b, z, y, n)
		return a / top
	}
	for _, tc := range []struct {
		name      string
		distances []float64
		want      map[string]bool // check name: pass
	}{
		{"even", []float64{0, 165, 340}, map[string]bool{"subreach length A to B": true, "subreach length B to C": true}},
		{"a millimetre", []float64{0, 165, 165.001}, map[string]bool{"subreach length A to B": true, "subreach length B to C": false}},
		{"two sections", []float64{0, 340}, map[string]bool{}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			// Depth 2 m at every section, the bed and marks falling 0.3 m per section.
			var secs []Section
			for i, d := range tc.distances {
				bed := 100 - 0.3*float64(i)
				secs = append(secs, Section{ID: string(rune('A' + i)), Geometry: saTrapezoid(t, b, z, bed, 5, n),
					Distance: d, Left: bed + 2, Right: math.NaN()})
			}
			res, err := SolveSlopeArea(secs, SlopeAreaOptions{})
			if err != nil {
				t.Fatal(err)
			}
			share := MinReachDepths / float64(len(secs)-1)
			found := 0
			for _, c := range res.Checks {
				if !strings.HasPrefix(c.Name, "subreach length") {
					continue
				}
				found++
				pass, ok := tc.want[c.Name]
				if !ok {
					t.Errorf("unexpected check %+v", c)
					continue
				}
				if c.Pass != pass || saRelErr(c.Limit, share*depth(2)) > saClosedFormTol {
					t.Errorf("%s: pass %v limit %g, want pass %v limit %g", c.Name, c.Pass, c.Limit, pass, share*depth(2))
				}
				if !pass && !slices.ContainsFunc(res.Warnings, func(w string) bool { return strings.Contains(w, `"`+c.Name+`": warn`) }) {
					t.Errorf("%s warns but is not in the warnings: %q", c.Name, res.Warnings)
				}
			}
			if found != len(tc.want) {
				t.Errorf("%d subreach length checks, want %d", found, len(tc.want))
			}
		})
	}
}

// A prismatic rectangle in uniform flow, with one mark moved. Unmoved,
// the slope-area discharge is Manning's uniform flow Q = (1/n)·A·R^⅔·√S
// (Chow 1959, eq. 6-9; closed form). A mark raised or lowered so far that
// the energy grade of a subreach no longer falls by more than its eddy
// loss is refused, naming that subreach, though the whole reach still
// falls and would give a discharge (a middle mark 0.8 m high gave 1.4
// times the true peak); a mark moved less is still a real flow and solves.
func TestSlopeAreaEnergyGain(t *testing.T) {
	const (
		width, depth, n, slope, length = 6.0, 1.2, 0.03, 0.002, 250.0
	)
	a := width * depth
	r := a / (width + 2*depth)
	manning := a * math.Pow(r, 2.0/3.0) * math.Sqrt(slope) / n // Chow 1959, eq. 6-9
	for _, tc := range []struct {
		name     string
		at       int     // the section whose marks move
		move     float64 // how far they move (m)
		subreach string  // the subreach refused; "" for a solution
		q        float64 // the discharge wanted when solved (0: not checked)
	}{
		{"uniform flow", 1, 0, "", manning},
		{"middle mark a little high", 1, 0.1, "", 0},
		{"middle mark raised by a blunder", 1, 0.8, "A to B", 0},
		{"middle mark lowered by a blunder", 1, -0.8, "B to C", 0},
		{"last mark raised by a blunder", 2, 0.6, "B to C", 0},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var secs []Section
			for i, id := range []string{"A", "B", "C"} {
				bed := 100 - slope*length*float64(i)
				ws := bed + depth
				if i == tc.at {
					ws += tc.move
				}
				secs = append(secs, Section{ID: id, Geometry: saTrapezoid(t, width, 0, bed, 5, n),
					Distance: length * float64(i), Left: ws, Right: ws})
			}
			res, err := SolveSlopeArea(secs, SlopeAreaOptions{})
			if tc.subreach == "" {
				if err != nil {
					t.Fatalf("refused: %v", err)
				}
				if tc.q > 0 && saRelErr(res.Discharge, tc.q) > saClosedFormTol {
					t.Errorf("Q = %.9g, Manning's uniform flow %.9g", res.Discharge, tc.q)
				}
				return
			}
			if !errors.Is(err, ErrEnergyGain) {
				t.Fatalf("got Q %g, error %v; want ErrEnergyGain", res.Discharge, err)
			}
			if msg := err.Error(); !strings.HasPrefix(msg, "subreach "+tc.subreach+": ") || strings.Contains(msg, "\n") {
				t.Errorf("error %q: want one line naming subreach %s first", msg, tc.subreach)
			}
			if _, err := MonteCarlo(secs, SlopeAreaOptions{}, MonteCarloOptions{Draws: 100}); !errors.Is(err, ErrEnergyGain) {
				t.Errorf("MonteCarlo: %v, want ErrEnergyGain", err)
			}
		})
	}
}

// A subreach is labelled by the change of its velocity head downstream:
// a fall expands, a rise contracts, none (within VelocityHeadTolerance,
// where VelocityHeadChange is 0) is uniform, not contracting.
func TestSubreachFlow(t *testing.T) {
	for _, tc := range []struct {
		sr   Subreach
		want string
	}{
		{Subreach{Expanding: true, VelocityHeadChange: 0.3}, FlowExpanding},
		{Subreach{VelocityHeadChange: -0.3}, FlowContracting},
		{Subreach{VelocityHeadChange: 0}, FlowUniform},
	} {
		if got := tc.sr.Flow(); got != tc.want {
			t.Errorf("%+v: %s, want %s", tc.sr, got, tc.want)
		}
	}
}

// Water surfaces, falls, lengths and mark spreads are the decimals a hand
// calculation from the marks and distances gives, not their binary
// round-off: the mean of 407.45 and 407.38 is 407.415, and the fall from
// it to the mean of 405.95 and 406.02 is 1.43, not 1.42999999999995
// (hand-computed).
func TestSlopeAreaDifferencesAsDecimals(t *testing.T) {
	g := saTrapezoid(t, 20, 2, 400, 12, 0.04)
	secs := []Section{
		{ID: "A", Geometry: g, Distance: 0.1, Left: 407.45, Right: 407.38},
		{ID: "B", Geometry: g, Distance: 320.3, Left: 406.95, Right: 407.05},
		{ID: "C", Geometry: g, Distance: 900.7, Left: 405.95, Right: 406.02},
	}
	res, err := SolveSlopeArea(secs, SlopeAreaOptions{Units: rating.US})
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name      string
		got, want float64
	}{
		{"water surface A", res.Sections[0].WaterSurface, 407.415},
		{"water surface C", res.Sections[2].WaterSurface, 405.985},
		{"reach fall", res.Fall, 1.43},
		{"reach length", res.Length, 900.6},
		{"fall A to B", res.Subreaches[0].Fall, 0.415},
		{"fall B to C", res.Subreaches[1].Fall, 1.015},
		{"length A to B", res.Subreaches[0].Length, 320.2},
		{"length B to C", res.Subreaches[1].Length, 580.4},
	} {
		if tc.got != tc.want {
			t.Errorf("%s: %.17g, want %.17g", tc.name, tc.got, tc.want)
		}
	}
	for _, c := range res.Checks {
		if c.Name == "mark spread A" && c.Value != 0.07 {
			t.Errorf("mark spread A: %.17g, want 0.07", c.Value)
		}
	}
}

// saBanked is a rectangular channel bc wide and deep metres below its
// banks at bank, with flat overbanks bo wide on each side at the bank
// elevation and walls top high above them; banks at the channel's edges.
func saBanked(t testing.TB, bc, deep, bo, bank, top float64, banks bool) subdivide.Geometry {
	t.Helper()
	sec := subdivide.Section{
		Points: saPoints(0, bank+top, 0, bank, bo, bank, bo, bank-deep, bo+bc, bank-deep, bo+bc, bank, 2*bo+bc, bank, 2*bo+bc, bank+top),
		N:      []float64{0.06, 0.06, 0.035, 0.035, 0.035, 0.06, 0.06},
	}
	if banks {
		sec.HasBanks, sec.LeftBank, sec.RightBank = true, bo, bo+bc
	}
	p, err := subdivide.Compile(sec)
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// The reach-length criterion measures a reach by the depth of the flow
// that carries the discharge. In a compound section of a rectangular
// channel 30 m wide and 4 m deep with overbanks 200 m wide each, water
// 1 m over the banks, the main channel between the banks is 5 m deep
// (area over top width, closed form), while the whole section's A/T is
// (30·5 + 400·1)/430 = 1.279 m. A reach of 200 m passes 75 × 1.279 =
// 95.9 m but not 75 × 5 = 375 m; the check takes the channel's depth and
// says so. The same ground without bank stations is all channel, and its
// whole A/T is used and named. Each subreach is held to its share of the
// same depth.
func TestSlopeAreaLengthChannelDepth(t *testing.T) {
	const bc, deep, bo, ws = 30.0, 4.0, 200.0, 1.0
	whole := (bc*(deep+ws) + 2*bo*ws) / (bc + 2*bo) // closed form
	for _, tc := range []struct {
		name       string
		banks      []bool // per section
		depth      float64
		pass       bool
		words      string
		subreachOK bool
	}{
		{"banks", []bool{true, true, true}, deep + ws, false, "mean depths of the main channel (its area over its top width between the banks) averaged over the sections", false},
		{"no banks", []bool{false, false, false}, whole, true, "mean depths of the whole section (its area over its top width) averaged over the sections", true},
		{"one without", []bool{true, true, false}, (2*(deep+ws) + whole) / 3, false,
			"mean depths of the main channel (its area over its top width between the banks) at A, B and of the whole section (its area over its top width) at C", false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var secs []Section
			for i, b := range tc.banks {
				bank := 100 - 0.4*float64(i)
				secs = append(secs, Section{ID: string(rune('A' + i)), Geometry: saBanked(t, bc, deep, bo, bank, 3, b),
					Distance: 100 * float64(i), Left: bank + ws, Right: math.NaN()})
			}
			res, err := SolveSlopeArea(secs, SlopeAreaOptions{})
			if err != nil {
				t.Fatal(err)
			}
			var c Check
			for _, x := range res.Checks {
				if x.Name == "reach length vs mean depth" {
					c = x
				}
			}
			if saRelErr(c.Limit, MinReachDepths*tc.depth) > saClosedFormTol || c.Pass != tc.pass {
				t.Errorf("limit %g pass %v, want %g (75 × %g) pass %v", c.Limit, c.Pass, MinReachDepths*tc.depth, tc.depth, tc.pass)
			}
			if !strings.Contains(c.Source, tc.words) {
				t.Errorf("source %q does not say %q", c.Source, tc.words)
			}
			for _, x := range res.Checks {
				if strings.HasPrefix(x.Name, "subreach length") && x.Pass != tc.subreachOK {
					t.Errorf("%s: pass %v limit %g, want pass %v", x.Name, x.Pass, x.Limit, tc.subreachOK)
				}
			}
		})
	}
}
