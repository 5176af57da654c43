package rating

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"

	"wetline/subdivide"
)

func mustShape(t testing.TB, spec string, n float64) subdivide.Geometry {
	t.Helper()
	s, err := subdivide.ParseShape(spec)
	if err != nil {
		t.Fatal(err)
	}
	g, err := s.Build(subdivide.Uniform(n))
	if err != nil {
		t.Fatal(err)
	}
	return g
}

// closeDepth reports whether stage got is within DepthTolerance of the
// depth of stage want above bottom.
func closeDepth(got, want, bottom float64) bool {
	return math.Abs(got-want) <= DepthTolerance*math.Max(want-bottom, 1e-9)
}

// TestCircularPartFull checks the classic part-full relations of a
// circular conduit with constant n against a fine stage grid (not the
// solver): the discharge peaks at y/D ≈ 0.938 with Q/Qfull ≈ 1.076, the
// velocity at y/D ≈ 0.81 with V/Vfull ≈ 1.14 (the hydraulic-elements
// chart for circular sections of sewer design manuals, e.g. ASCE Manual of
// Practice 37; values from memory, three figures); at half depth Q/Qfull = 0.5 and
// V/Vfull = 1 (closed form: R is D/4 at half and at full depth).
func TestCircularPartFull(t *testing.T) {
	for _, d := range []float64{0.3, 1, 2.4} {
		g := mustShape(t, "circle:diameter="+ftoa(d), 0.013)
		opt := Options{Slope: 0.004}
		const m = 20000
		stages := make([]float64, m+1)
		for i := range stages {
			stages[i] = d * float64(i) / m
		}
		tab, err := Compute(g, stages, opt)
		if err != nil {
			t.Fatal(err)
		}
		full := tab.Rows[m]
		if !full.Full || full.TopWidth != 0 {
			t.Fatalf("D %g: the last row is not full: %+v", d, full)
		}
		qi, vi := 1, 1
		for i, r := range tab.Rows {
			if r.Discharge > tab.Rows[qi].Discharge {
				qi = i
			}
			if r.MeanVelocity > tab.Rows[vi].MeanVelocity {
				vi = i
			}
		}
		checks := []struct {
			name      string
			got, want float64
			tol       float64
		}{
			{"y/D at peak discharge", stages[qi] / d, 0.938, 0.001},               // from memory
			{"Qmax/Qfull", tab.Rows[qi].Discharge / full.Discharge, 1.076, 0.001}, // from memory
			{"y/D at peak velocity", stages[vi] / d, 0.81, 0.005},                 // from memory
			{"Vmax/Vfull", tab.Rows[vi].MeanVelocity / full.MeanVelocity, 1.14, 0.005},
			{"Q/Qfull at half depth", tab.Rows[m/2].Discharge / full.Discharge, 0.5, 1e-12},     // closed form
			{"V/Vfull at half depth", tab.Rows[m/2].MeanVelocity / full.MeanVelocity, 1, 1e-12}, // closed form
		}
		for _, c := range checks {
			if math.Abs(c.got-c.want) > c.tol {
				t.Errorf("D %g: %s = %.5f, want %.4f ± %g", d, c.name, c.got, c.want, c.tol)
			}
		}
		// The solver's peak agrees with the grid.
		h, q, err := PeakDischarge(g, opt)
		if err != nil {
			t.Fatal(err)
		}
		if q < tab.Rows[qi].Discharge || math.Abs(h-stages[qi]) > d/m {
			t.Errorf("D %g: PeakDischarge %g at %g, grid %g at %g", d, q, h, tab.Rows[qi].Discharge, stages[qi])
		}
		// Between full and peak discharge there are two normal stages, one
		// on each branch, each carrying the discharge.
		target := (full.Discharge + q) / 2
		roots, err := NormalStages(g, target, opt)
		if err != nil {
			t.Fatal(err)
		}
		if len(roots) != 2 || !roots[0].Rising || roots[1].Rising || !(roots[0].Stage < h && h < roots[1].Stage) {
			t.Fatalf("D %g: roots %+v around peak %g", d, roots, h)
		}
		for _, r := range roots {
			tr, _ := Compute(g, []float64{r.Stage}, opt)
			if math.Abs(tr.Rows[0].Discharge-target) > 1e-9*target {
				t.Errorf("D %g: root %g carries %g, want %g", d, r.Stage, tr.Rows[0].Discharge, target)
			}
		}
		// Above the peak there is none.
		if _, err := NormalStages(g, q*1.001, opt); err == nil {
			t.Errorf("D %g: a normal stage for more than the peak discharge", d)
		}
	}
}

func ftoa(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// TestTrapezoidNormalDepth: Chow (1959), Open-Channel Hydraulics, the
// worked example of section 6-5 (b = 20 ft, z = 2, S = 0.0016, n = 0.025,
// Q = 400 ft³/s gives yn = 3.36 ft; from memory). Then Manning's equation
// with the trapezoid's closed-form A and P (Chow table 2-1) holds at every
// returned depth, for several channels.
func TestTrapezoidNormalDepth(t *testing.T) {
	g := mustShape(t, "trapezoid:bottom=20,side=2", 0.025)
	roots, err := NormalStages(g, 400, Options{Slope: 0.0016, Units: US})
	if err != nil {
		t.Fatal(err)
	}
	if len(roots) != 1 || math.Abs(roots[0].Depth-3.36) > 0.005 {
		t.Errorf("Chow's trapezoid: normal depths %+v, want 3.36 ft", roots)
	}
	tests := []struct {
		b, z, n, s, q float64
		u             Units
	}{
		{20, 2, 0.025, 0.0016, 400, US},
		{3, 1.5, 0.015, 0.001, 12, SI},
		{0.8, 0.5, 0.03, 0.02, 0.4, SI},
		{10, 3, 0.035, 0.0002, 150, SI},
	}
	for _, tt := range tests {
		g := mustShape(t, "trapezoid:bottom="+ftoa(tt.b)+",side="+ftoa(tt.z), tt.n)
		roots, err := NormalStages(g, tt.q, Options{Slope: tt.s, Units: tt.u})
		if err != nil || len(roots) != 1 {
			t.Fatalf("%+v: %v %v", tt, roots, err)
		}
		y := roots[0].Depth
		a := (tt.b + tt.z*y) * y
		p := tt.b + 2*y*math.Sqrt(1+tt.z*tt.z)
		q := tt.u.ManningK() / tt.n * a * math.Pow(a/p, 2.0/3) * math.Sqrt(tt.s) // Manning, Chow eq. 5-7
		if math.Abs(q-tt.q) > 1e-8*tt.q {
			t.Errorf("%+v: depth %g carries %g by the closed form", tt, y, q)
		}
	}
}

// TestCriticalDepthClosedForm: a rectangle's critical depth is
// yc = (q²/g)^(1/3) with q the discharge per unit width, and a
// trapezoid's satisfies Q²/g = A³/T with the closed-form A and T (Chow,
// 1959, section 4-3 and eq. 4-8).
func TestCriticalDepthClosedForm(t *testing.T) {
	for _, tt := range []struct {
		width, q float64
		u        Units
	}{{3, 12, SI}, {0.5, 0.05, SI}, {20, 400, US}} {
		g := mustShape(t, "rectangle:width="+ftoa(tt.width), 0.02)
		roots, err := CriticalStages(g, tt.q, Options{Units: tt.u})
		if err != nil || len(roots) != 1 {
			t.Fatalf("%+v: %v %v", tt, roots, err)
		}
		qw := tt.q / tt.width
		want := math.Cbrt(qw * qw / tt.u.Gravity())
		if !closeDepth(roots[0].Depth, want, 0) {
			t.Errorf("rectangle %+v: yc %g, closed form %g", tt, roots[0].Depth, want)
		}
		// Minimum specific energy of a rectangle is 1.5 yc (Chow 1959, sect. 3-2).
		e, err := MinSpecificEnergy(g, tt.q, Options{Units: tt.u})
		if err != nil || math.Abs(e.Energy-1.5*want) > 1e-9*want || math.Abs(e.Depth-want) > 1e-6*want {
			t.Errorf("rectangle %+v: least energy %+v, want 1.5·yc = %g at %g", tt, e, 1.5*want, want)
		}
	}
	for _, tt := range []struct{ b, z, q float64 }{{20, 2, 400}, {3, 1.5, 12}, {0.5, 1, 0.2}} {
		g := mustShape(t, "trapezoid:bottom="+ftoa(tt.b)+",side="+ftoa(tt.z), 0.02)
		roots, err := CriticalStages(g, tt.q, Options{})
		if err != nil || len(roots) != 1 {
			t.Fatalf("%+v: %v %v", tt, roots, err)
		}
		y := roots[0].Depth
		a, tw := (tt.b+tt.z*y)*y, tt.b+2*tt.z*y
		if lhs, rhs := tt.q*tt.q/SI.Gravity(), a*a*a/tw; math.Abs(lhs-rhs) > 1e-9*rhs {
			t.Errorf("trapezoid %+v: yc %g gives A³/T %g, Q²/g %g", tt, y, rhs, lhs)
		}
		qc, err := CriticalDischarge(g, y, Options{})
		if err != nil || math.Abs(qc-tt.q) > 1e-8*tt.q {
			t.Errorf("trapezoid %+v: critical discharge at yc %g, want %g (%v)", tt, qc, tt.q, err)
		}
	}
}

// compoundFroude2 is α·Q²·T/(g·A³) for a rectangular main channel of
// width b and depth d with a horizontal floodplain of width f on each side
// bounded by vertical walls, n = nc in the channel and nf on the
// floodplains, subdivided at the banks (closed form, written out here
// independently of the engine; α as in Chow 1959 section 2-7).
func compoundFroude2(y, q, b, d, f, nc, nf float64) float64 {
	g := SI.Gravity()
	if y <= d {
		a, t := b*y, b
		return q * q * t / (g * a * a * a)
	}
	ac, pc := b*y, b+2*d
	af, pf := f*(y-d), f+(y-d)
	kc := ac * math.Pow(ac/pc, 2.0/3) / nc
	kf := af * math.Pow(af/pf, 2.0/3) / nf
	at, kt := ac+2*af, kc+2*kf
	alpha := (kc*kc*kc/(ac*ac) + 2*kf*kf*kf/(af*af)) / (kt * kt * kt / (at * at))
	t := b + 2*f
	return alpha * q * q * t / (g * at * at * at)
}

// TestCompoundCriticalDepths: a compound section where the discharge has
// two critical depths (two minima of specific energy, one in the main
// channel and one over the floodplains; Blalock & Sturm 1981, J. Hydraulics
// Div. ASCE 107(HY6)). Every crossing of F = 1 found by a fine brute-force
// scan of the closed form above must be found by CriticalStages.
func TestCompoundCriticalDepths(t *testing.T) {
	const b, d, f, nc, nf = 4.0, 2.0, 40.0, 0.03, 0.06
	g := mustShape(t, "compound:bottom=4,side=0,depth=2,floodplain=40,outer=0,floodn=0.06", nc)
	for _, q := range []float64{10, 20, 30} {
		roots, err := CriticalStages(g, q, Options{})
		if err != nil {
			t.Fatal(err)
		}
		// Brute force: sign changes of F² − 1 on a fine grid.
		const m = 200000
		const top = 8.0
		var want []float64
		prev := compoundFroude2(top/m, q, b, d, f, nc, nf) - 1
		for i := 2; i <= m; i++ {
			y := top * float64(i) / m
			v := compoundFroude2(y, q, b, d, f, nc, nf) - 1
			if (v < 0) != (prev < 0) {
				want = append(want, y)
			}
			prev = v
		}
		if len(want) != len(roots) {
			t.Fatalf("Q %g: %d critical stages %+v, brute force %v", q, len(roots), roots, want)
		}
		minima := 0
		for i, r := range roots {
			if math.Abs(r.Depth-want[i]) > top/m {
				t.Errorf("Q %g: critical depth %g, brute force %g", q, r.Depth, want[i])
			}
			if r.Rising {
				minima++
				// A true crossing (not the jump at bankfull): F = 1 there.
				if f2 := compoundFroude2(r.Depth, q, b, d, f, nc, nf); math.Abs(f2-1) > 1e-9 {
					t.Errorf("Q %g: at %g F² = %g", q, r.Depth, f2)
				}
			}
		}
		if minima != 2 {
			t.Errorf("Q %g: %d critical depths at energy minima, want 2: %+v", q, minima, roots)
		}
	}
}

// TestCriticalStagesAboveLowerEnd: the compound section of
// compoundFroude2 surveyed with its left floodplain ending level with the
// floodplain, so that the section's top (its lower end) is bankfull and
// the floodplain walls above it are the vertical wall raised at the left
// end and the surveyed wall at the right end. Every critical stage over
// the floodplains lies above the lower end and must be found, as a fine
// brute-force scan of the closed form finds them (critical condition
// Chow, 1959, section 4-2; two or more critical depths in a compound
// channel, Blalock & Sturm, 1981, J. Hydraulics Div. ASCE 107(HY6), from
// memory). With NoExtend the search stops at the lower end.
func TestCriticalStagesAboveLowerEnd(t *testing.T) {
	const b, d, f, nc, nf = 4.0, 2.0, 40.0, 0.03, 0.06
	sec := subdivide.Section{Name: "low left end",
		Points: subdivide.XZ(0, d, f, d, f, 0, f+b, 0, f+b, d, 2*f+b, d, 2*f+b, 8),
		N:      []float64{nf, nc, nc, nc, nf, nf},
		// Banks at the channel's top corners, so that the subsections are
		// the floodplains and the channel, as in the closed form.
		HasBanks: true, LeftBank: f, RightBank: f + b}
	g, err := subdivide.Compile(sec)
	if err != nil {
		t.Fatal(err)
	}
	if g.Top() != d {
		t.Fatalf("top %g, want the lower end %g", g.Top(), d)
	}
	for _, q := range []float64{10, 20, 30} {
		const m = 200000
		const top = 8.0
		var want []float64
		prev := compoundFroude2(top/m, q, b, d, f, nc, nf) - 1
		for i := 2; i <= m; i++ {
			y := top * float64(i) / m
			v := compoundFroude2(y, q, b, d, f, nc, nf) - 1
			if (v < 0) != (prev < 0) {
				want = append(want, y)
			}
			prev = v
		}
		if len(want) < 2 || want[len(want)-1] <= d {
			t.Fatalf("Q %g: the closed form has no critical depth above bankfull: %v", q, want)
		}
		roots, err := CriticalStages(g, q, Options{})
		if err != nil {
			t.Fatal(err)
		}
		if len(roots) != len(want) {
			t.Fatalf("Q %g: %d critical stages %+v, brute force %v", q, len(roots), roots, want)
		}
		for i, r := range roots {
			if math.Abs(r.Depth-want[i]) > top/m {
				t.Errorf("Q %g: critical depth %g, brute force %g", q, r.Depth, want[i])
			}
		}
		// With no stage above the lower end computed, only those below.
		roots, err = CriticalStages(g, q, Options{Geometry: subdivide.Options{NoExtend: true}})
		if err != nil {
			t.Fatal(err)
		}
		for _, r := range roots {
			if r.Stage > d {
				t.Errorf("Q %g, NoExtend: critical stage %g above the top %g", q, r.Stage, d)
			}
		}
	}
}

// randomSection returns a random geometry: a built shape or a random
// surveyed ground line with n changing along it.
func randomSection(rng *rand.Rand, i int) (subdivide.Geometry, string) {
	n := 0.01 + 0.08*rng.Float64()
	switch i % 5 {
	case 0:
		s := subdivide.Shape{Kind: subdivide.Trapezoid, Bottom: 0.2 + 30*rng.Float64(), Left: 4 * rng.Float64(), Right: 4 * rng.Float64(), Invert: 50 * rng.Float64()}
		g, _ := s.Build(subdivide.PerRegion{Channel: n})
		return g, s.String()
	case 1:
		s := subdivide.Shape{Kind: subdivide.Circle, Diameter: 0.1 + 4*rng.Float64(), Invert: 10 * rng.Float64()}
		g, _ := s.Build(subdivide.PerRegion{Channel: n})
		return g, s.String()
	case 2:
		s := subdivide.Shape{Kind: subdivide.Compound, Bottom: 0.5 + 10*rng.Float64(), Left: 2 * rng.Float64(), Right: 2 * rng.Float64(),
			Depth: 0.3 + 3*rng.Float64(), Floodplain: 1 + 80*rng.Float64(), Outer: 5 * rng.Float64(), FloodN: 0.03 + 0.1*rng.Float64()}
		g, _ := s.Build(subdivide.Uniform(n))
		return g, s.String()
	}
	m := 3 + rng.IntN(15)
	sec := subdivide.Section{Name: "random"}
	x := 0.0
	for j := 0; j < m; j++ {
		z := 5 * rng.Float64()
		if j == 0 || j == m-1 {
			z = 6 + rng.Float64()
		}
		sec.Points = append(sec.Points, subdivide.Point{Station: x, Elevation: z})
		x += 0.5 + 10*rng.Float64()
		if j > 0 {
			sec.N = append(sec.N, 0.015+0.08*rng.Float64())
		}
	}
	p, err := subdivide.Compile(sec)
	if err != nil {
		panic(err)
	}
	return p, "random survey"
}

// TestRoundTrips: stage → Q → stage and stage → A → stage return the
// start within DepthTolerance over many random sections and stages
// (property test; the forward direction is the engine's exact geometry).
func TestRoundTrips(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 1))
	for i := 0; i < 150; i++ {
		g, name := randomSection(rng, i)
		lo, hi := g.Bottom(), g.Top()
		h := lo + (0.02+0.97*rng.Float64())*(hi-lo)
		if i%5 > 2 && rng.IntN(2) == 0 {
			lo = h // surveys: also stages in separate pools
		}
		opt := Options{Slope: math.Pow(10, -1-3*rng.Float64()), Units: Units(rng.IntN(2)), Composite: Composite(rng.IntN(4))}
		tab, err := Compute(g, []float64{h}, opt)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		r := tab.Rows[0]
		roots, err := NormalStages(g, r.Discharge, opt)
		if err != nil {
			t.Fatalf("%s stage %g Q %g: %v", name, h, r.Discharge, err)
		}
		found := false
		for _, x := range roots {
			found = found || closeDepth(x.Stage, h, g.Bottom())
		}
		if !found {
			t.Errorf("%s (%v): stage %g → Q %g → stages %+v", name, opt.Composite, h, r.Discharge, roots)
		}
		ar, err := StageForArea(g, r.Area, opt)
		if err != nil || !closeDepth(ar.Stage, h, g.Bottom()) {
			t.Errorf("%s: stage %g → A %g → stage %g (%v)", name, h, r.Area, ar.Stage, err)
		}
		if r.TopWidth > 0 {
			qc, err := CriticalDischarge(g, h, opt)
			if err != nil {
				t.Fatal(err)
			}
			crit, err := CriticalStages(g, qc, opt)
			if err != nil {
				t.Fatalf("%s: stage %g → Qc %g: %v", name, h, qc, err)
			}
			found = false
			for _, x := range crit {
				found = found || closeDepth(x.Stage, h, g.Bottom())
			}
			if !found {
				t.Errorf("%s: stage %g → Qc %g → critical stages %+v", name, h, qc, crit)
			}
		}
	}
}

func TestSpecificEnergy(t *testing.T) {
	// E = y + V²/2g in a rectangle (Chow 1959, eq. 3-3 with α = 1).
	g := mustShape(t, "rectangle:width=2", 0.02)
	e, err := SpecificEnergy(g, 0.5, 3, Options{})
	v := 3 / (2 * 0.5)
	if want := 0.5 + v*v/(2*SI.Gravity()); err != nil || math.Abs(e-want) > 1e-12 {
		t.Errorf("E %g, want %g (%v)", e, want, err)
	}
}

func TestSolveRegime(t *testing.T) {
	g := mustShape(t, "trapezoid:bottom=3,side=2", 0.025)
	for _, tt := range []struct {
		slope float64
		want  string
	}{{0.0008, "subcritical"}, {0.05, "supercritical"}} {
		sol, err := Solve(g, 12, Options{Slope: tt.slope})
		if err != nil {
			t.Fatal(err)
		}
		if sol.Normal[0].Regime != tt.want {
			t.Errorf("slope %g: %s (F %g)", tt.slope, sol.Normal[0].Regime, sol.Normal[0].Row.Froude)
		}
		// Closed form: regime follows from normal versus critical depth.
		if (sol.Normal[0].Depth > sol.Critical[0].Depth) != (tt.want == "subcritical") {
			t.Errorf("slope %g: normal %g critical %g", tt.slope, sol.Normal[0].Depth, sol.Critical[0].Depth)
		}
	}
}

// TestUnsubdividedCompoundRoots: a compound ground line without banks and
// with one n is a single subsection; just above bankfull the wetted
// perimeter jumps faster than the area, so discharge falls before it rises
// again (the known artefact of not subdividing a compound section). Every
// crossing is returned, agreeing with a brute-force scan of the engine's
// own forward computation; the smooth ones carry the discharge and the
// drop at the level floodplain is marked as a jump.
func TestUnsubdividedCompoundRoots(t *testing.T) {
	sec := subdivide.Section{Name: "two-stage", Points: []subdivide.Point{
		{Station: 0, Elevation: 4}, {Station: 1, Elevation: 2}, {Station: 61, Elevation: 2}, {Station: 62, Elevation: 0},
		{Station: 66, Elevation: 0}, {Station: 67, Elevation: 2}, {Station: 127, Elevation: 2}, {Station: 128, Elevation: 4},
	}}
	sec.NByRegion.Channel = 0.03
	p, err := subdivide.Compile(sec)
	if err != nil {
		t.Fatal(err)
	}
	opt := Options{Slope: 0.001}
	bank, err := Compute(p, []float64{2}, opt)
	if err != nil {
		t.Fatal(err)
	}
	q := 0.9 * bank.Rows[0].Discharge
	roots, err := NormalStages(p, q, opt)
	if err != nil {
		t.Fatal(err)
	}
	const m = 20000
	stages := make([]float64, m+1)
	for i := range stages {
		stages[i] = 4 * float64(i) / m
	}
	tab, _ := Compute(p, stages, opt)
	var want []float64
	for i := 1; i <= m; i++ {
		if (tab.Rows[i].Discharge < q) != (tab.Rows[i-1].Discharge < q) {
			want = append(want, stages[i])
		}
	}
	if len(want) != 3 || len(roots) != 3 {
		t.Fatalf("roots %+v, brute force %v: want three", roots, want)
	}
	for i, r := range roots {
		// The middle one is the jump at the level floodplain, stage 2.
		if math.Abs(r.Stage-want[i]) > 4.0/m || r.Rising != (i != 1) || r.Jump != (i == 1) {
			t.Errorf("root %d: %+v, brute force %g", i, r, want[i])
		}
		if r.Jump {
			continue
		}
		rt, _ := Compute(p, []float64{r.Stage}, opt)
		if math.Abs(rt.Rows[0].Discharge-q) > 1e-9*q {
			t.Errorf("root %g carries %g, want %g", r.Stage, rt.Rows[0].Discharge, q)
		}
	}
}

func BenchmarkNormalStagesSurvey(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 1))
	g, _ := randomSection(rng, 3)
	opt := Options{Slope: 0.001}
	tab, _ := Compute(g, []float64{(g.Bottom() + g.Top()) / 2}, opt)
	for b.Loop() {
		if _, err := NormalStages(g, tab.Rows[0].Discharge, opt); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkSolveConduit(b *testing.B) {
	g := mustShape(b, "circle:diameter=0.6", 0.013)
	for b.Loop() {
		if _, err := Solve(g, 0.45, Options{Slope: 0.005}); err != nil {
			b.Fatal(err)
		}
	}
}

// TestSearchAboveTop: an open-ended built shape is searched above its
// nominal top even with NoExtend (its sides go on exactly), while a survey
// with NoExtend is not.
func TestSearchAboveTop(t *testing.T) {
	g := mustShape(t, "trapezoid:bottom=1,side=1", 0.03) // nominal top 1 m
	opt := Options{Slope: 0.001, Geometry: subdivide.Options{AllPools: true, NoExtend: true}}
	roots, err := NormalStages(g, 50, opt)
	if err != nil || len(roots) != 1 || !(roots[0].Depth > 1) {
		t.Fatalf("open-ended trapezoid: %+v, %v", roots, err)
	}
	// Closed form check of Manning's equation (Chow 1959, eq. 5-7 and table 2-1).
	y := roots[0].Depth
	a, p := (1+y)*y, 1+2*y*math.Sqrt2
	if q := a * math.Pow(a/p, 2.0/3) / 0.03 * math.Sqrt(0.001); math.Abs(q-50) > 1e-8*50 {
		t.Errorf("depth %g carries %g", y, q)
	}
	sec := subdivide.Section{Points: []subdivide.Point{{Station: 0, Elevation: 1}, {Station: 1, Elevation: 0}, {Station: 2, Elevation: 0}, {Station: 3, Elevation: 1}},
		N: []float64{0.03, 0.03, 0.03}}
	p2, _ := subdivide.Compile(sec)
	if _, err := NormalStages(p2, 50, opt); err == nil {
		t.Error("survey with NoExtend: a stage above its ends was returned")
	}
}

// Answer warns of every stage it reports above an end of the section, as
// Rate does; a conduit given more than it carries part full reports its
// critical stage, with a warning that there is no normal stage.
//
// Hand values, the rectangle 5 m wide with walls 3 m high (n 0.04):
//   - area 100 m2 is held at stage 100/5 = 20 m, walls 17 m high added;
//   - stage 10 m is 7 m above the walls' tops;
//   - 200 m3/s: q = 40 m2/s, critical depth (q^2/g)^(1/3) =
//     (1600/9.80665)^(1/3) = 5.4643 m (Chow 1959, eq. 3-11; g the
//     standard 9.80665 m/s2), 2.4643 m above
//     the walls' tops.
//
// The circle 1.2 m across, n 0.013, slope 0.003: the greatest part-full
// discharge is 2.297 m3/s, below 2.6 m3/s, so there is no normal stage;
// the critical stage yc is checked against Q^2/g = A^3/T with the circular
// segment's A = r^2 (θ - sin θ)/2, T = 2 sqrt(yc (D - yc)),
// θ = 2 acos(1 - yc/r) (Chow 1959, table 2-1), computed here.
func TestAnswerAboveEnds(t *testing.T) {
	rect := mustShape(t, "rectangle:width=5,height=3", 0.04)
	nan := math.NaN()
	for _, tc := range []struct {
		name  string
		q     Query
		slope float64
		want  []string
	}{
		{"area", Query{Discharge: nan, Area: 100, Stage: nan}, 0, []string{"stage 20.0000 m is above an end of the section: vertical walls were added there (up to 17.0000 m high)"}},
		{"stage", Query{Discharge: nan, Area: nan, Stage: 10}, 0.001, []string{"stage 10.0000 m is above an end of the section: vertical walls were added there (up to 7.0000 m high)"}},
		{"critical", Query{Discharge: 200, Area: nan, Stage: nan}, 0.001, []string{"critical stage 5.4643 m is above an end of the section: vertical walls were added there (up to 2.4643 m high)", "normal stage"}},
		// The rectangle's invert is at 0: no water below it, Q = 0.
		{"stage below the invert", Query{Discharge: nan, Area: nan, Stage: -0.5}, 0.001, []string{"stage -0.5000 m is below the lowest point of the section (0.0000 m): no water stands there, so nothing flows"}},
		{"stage at the invert", Query{Discharge: nan, Area: nan, Stage: 0}, 0.001, []string{"stage 0.0000 m is at the lowest point of the section (0.0000 m)"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rep, err := Answer(rect, tc.q, Options{Slope: tc.slope})
			if err != nil {
				t.Fatal(err)
			}
			text := strings.Join(rep.Warnings, "\n")
			for _, w := range tc.want {
				if !strings.Contains(text, w) {
					t.Errorf("warnings %q lack %q", rep.Warnings, w)
				}
			}
		})
	}
	t.Run("conduit over capacity", func(t *testing.T) {
		const d, q = 1.2, 2.6
		rep, err := Answer(mustShape(t, "circle:diameter=1.2", 0.013), Query{Discharge: q, Area: nan, Stage: nan}, Options{Slope: 0.003})
		if err != nil {
			t.Fatal(err)
		}
		sol := rep.Discharge
		if len(sol.Normal) != 0 || len(sol.Critical) != 1 {
			t.Fatalf("%d normal, %d critical stages", len(sol.Normal), len(sol.Critical))
		}
		if !strings.Contains(strings.Join(rep.Warnings, "\n"), "more than the conduit carries part full at slope 0.003 (at most 2.297 m3/s, at stage 1.1258 m): there is no normal stage") {
			t.Errorf("warnings %q", rep.Warnings)
		}
		yc, r := sol.Critical[0].Stage, d/2
		th := 2 * math.Acos(1-yc/r)
		a := r * r * (th - math.Sin(th)) / 2
		w := 2 * math.Sqrt(yc*(d-yc))
		const closeCritical = 1e-3 // relative, of the stage's tolerance
		if got := q * q * w / (9.80665 * a * a * a); math.Abs(got-1) > closeCritical {
			t.Errorf("critical stage %g: Q²T/(gA³) = %g, want 1", yc, got)
		}
	})
}

// DatumTerm writes the sign of the datum as a word of the equation,
// never "+ -10" (values by hand).
func TestDatumTerm(t *testing.T) {
	for _, tc := range []struct {
		d    float64
		want string
	}{{100, "+ 100"}, {-10, "- 10"}, {0, "+ 0"}, {-0.1234567, "- 0.123457"}} {
		if got := DatumTerm(tc.d); got != tc.want {
			t.Errorf("DatumTerm(%g) = %q, want %q", tc.d, got, tc.want)
		}
	}
}

// TestConduitFallingBranchWords checks the words for the two branches of
// a circular pipe, 0.6 m across, n 0.013, slope 0.005: the discharge
// flowing just full is Q = (1/n)·A·R^(2/3)·√S with A = πD²/4, R = D/4
// (Manning's equation, Chow 1959, eq. 5-7), computed here, and the
// greatest part-full discharge lies at 0.938 of the diameter (from
// memory). A discharge between the two is carried at two normal stages,
// a smaller one at one; the rating table flags the stages above the peak
// and says the crown closes, while a compound section rated without
// subdivision (the case of TestConveyanceDropFlag) keeps the words about
// bank stations and n.
func TestConduitFallingBranchWords(t *testing.T) {
	const d, n, s = 0.6, 0.013, 0.005
	full := math.Pi * d * d / 4 * math.Pow(d/4, 2.0/3) * math.Sqrt(s) / n
	pipe := mustShape(t, "circle:diameter=0.6", n)
	nan := math.NaN()
	crown := []string{"as the crown closes", "0.938 of the height", fmt.Sprintf("%.4g m3/s (flowing just full)", full)}
	for _, tc := range []struct {
		name       string
		q          float64
		want, lack []string
	}{
		{"two stages", 0.45, append([]string{"2 normal stages carry 0.45 m3/s", "on the rising branch", "on the falling branch"}, crown...),
			[]string{"does not grow steadily"}},
		{"one stage", 0.3, nil, []string{"normal stages carry", "crown closes"}},
	} {
		t.Run("solve "+tc.name, func(t *testing.T) {
			rep, err := Answer(pipe, Query{Discharge: tc.q, Area: nan, Stage: nan}, Options{Slope: s})
			if err != nil {
				t.Fatal(err)
			}
			checkWarnings(t, rep.Warnings, tc.want, tc.lack)
		})
	}
	compound := compile(t, subdivide.Section{
		Points: subdivide.XZ(0, 4, 0, 2, 100, 2, 100, 0, 110, 0, 110, 2, 210, 2, 210, 4),
		N:      []float64{0.04, 0.04, 0.04, 0.04, 0.04, 0.04, 0.04},
	})
	for _, tc := range []struct {
		name       string
		g          subdivide.Geometry
		stages     []float64
		want, lack []string
	}{
		{"pipe", pipe, []float64{0.3, 0.5, 0.56, 0.58, 0.6}, []string{"at 2 stages, from 0.5800 m up to the crown at 0.6000 m", "as the crown closes",
			"0.938 of its diameter 0.6 m", fmt.Sprintf("%.4g m3/s (flowing just full)", full)}, []string{"bank stations"}},
		{"compound", compound, []float64{1.9, 2.0, 2.05, 2.1, 3.5}, []string{"the subdivision may not suit the section; check bank stations and n"}, []string{"crown"}},
	} {
		t.Run("table "+tc.name, func(t *testing.T) {
			tab, err := Compute(tc.g, tc.stages, Options{Slope: s})
			if err != nil {
				t.Fatal(err)
			}
			checkWarnings(t, tab.Warnings, tc.want, tc.lack)
		})
	}
}

// TestCriticalStageExtremum checks what the specific energy is said to do
// at each critical stage. In a rectangle 2 m wide carrying 5 m3/s the one
// critical depth is yc = (q²/g)^(1/3) with q = 2.5 m2/s, and the least
// specific energy 1.5·yc (Chow 1959, section 3-2 and eq. 3-11; g the
// standard 9.80665 m/s2): a local minimum, the least. In a compound
// section (channel 4 m wide and 2 m deep, floodplains 40 m wide at n
// 0.06, carrying 20 m3/s) α jumps above the channel's banks, the
// criterion α·Q²·T/(g·A³) = 1 holds at three stages and the specific
// energy is extreme off the upper two: each stage labelled a minimum or
// maximum must be one, each labelled neither must see the energy rise (or
// fall) through it, and each listed local minimum must be lower than the
// energy a centimetre either side (the definition, evaluated here).
func TestCriticalStageExtremum(t *testing.T) {
	const g = 9.80665
	yc := math.Cbrt(2.5 * 2.5 / g)
	compound := mustShape(t, "compound:bottom=4,side=0,depth=2,floodplain=40,outer=0,floodn=0.06", 0.03)
	shallowRect, err := subdivide.Compile(subdivide.Section{Points: subdivide.XZ(0, 1, 0, 0, 2, 0, 2, 1), N: []float64{0.015, 0.015, 0.015}})
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name      string
		geom      subdivide.Geometry
		q         float64
		extrema   []string
		least     []bool
		minEnergy float64 // NaN: not checked against a closed form
		minima    int
	}{
		{"rectangle", mustShape(t, "rectangle:width=2", 0.015), 5, []string{EnergyMinimum}, []bool{true}, 1.5 * yc, 1},
		{"compound", compound, 20, []string{EnergyMinimum, EnergyNoExtremum, EnergyNoExtremum}, []bool{true, false, false}, math.NaN(), 2},
		// A rectangle 2 m wide and 1 m deep carrying 25 m³/s: its critical
		// depth, cbrt(12.5²/g) = 2.52 m, stands in the walls above its
		// ends, which keep it a 2 m rectangle, so Emin = 1.5·yc still
		// (closed form for a rectangle: Chow 1959, section 3-2).
		{"rectangle, critical stage in the walls", shallowRect, 25, []string{EnergyMinimum}, []bool{true}, 1.5 * math.Cbrt(12.5*12.5/g), 1},
	} {
		t.Run(tc.name, func(t *testing.T) {
			sol, err := Solve(tc.geom, tc.q, Options{})
			if err != nil {
				t.Fatal(err)
			}
			if len(sol.Critical) != len(tc.extrema) || len(sol.EnergyMinima) != tc.minima {
				t.Fatalf("%d critical stages, %d local minima; want %d and %d", len(sol.Critical), len(sol.EnergyMinima), len(tc.extrema), tc.minima)
			}
			energy := func(h float64) float64 {
				e, err := SpecificEnergy(tc.geom, h, tc.q, Options{})
				if err != nil {
					t.Fatal(err)
				}
				return e
			}
			const probe = 0.01 // m, either side
			for i, c := range sol.Critical {
				if c.Extremum != tc.extrema[i] || c.Least != tc.least[i] {
					t.Errorf("critical stage %g: %q, least %v; want %q, %v", c.Stage, c.Extremum, c.Least, tc.extrema[i], tc.least[i])
				}
				below, above := energy(c.Stage-probe), energy(c.Stage+probe)
				switch c.Extremum {
				case EnergyMinimum:
					if !(below > c.Energy && above > c.Energy) {
						t.Errorf("critical stage %g called a minimum: E %g, %g, %g", c.Stage, below, c.Energy, above)
					}
				case EnergyNoExtremum:
					if (below-c.Energy)*(above-c.Energy) >= 0 {
						t.Errorf("critical stage %g called no extremum: E %g, %g, %g", c.Stage, below, c.Energy, above)
					}
				}
			}
			for _, m := range sol.EnergyMinima {
				if !(energy(m.Stage-probe) > m.Energy && energy(m.Stage+probe) > m.Energy) {
					t.Errorf("local minimum %g m at %g m is not one", m.Energy, m.Stage)
				}
			}
			if !math.IsNaN(tc.minEnergy) {
				const closeEnergy = 1e-6 // relative
				if math.Abs(sol.MinEnergy.Energy/tc.minEnergy-1) > closeEnergy || math.Abs(sol.EnergyMinima[0].Energy/tc.minEnergy-1) > closeEnergy {
					t.Errorf("least specific energy %g, local minimum %g; want 1.5·yc = %g", sol.MinEnergy.Energy, sol.EnergyMinima[0].Energy, tc.minEnergy)
				}
			}
		})
	}
}

// At the crown a conduit flows full: no discharge is critical (NaN, with a
// warning), and uniform flow is Manning's full-flow discharge
// Q = (1/n)·(πD²/4)·(D/4)^(2/3)·√S (closed form: Manning's equation with
// the full circle's area πD²/4 and hydraulic radius D/4).
func TestAnswerAtCrown(t *testing.T) {
	const d, n, s = 1.5, 0.013, 0.002
	pipe := mustShape(t, "circle:diameter=1.5", n)
	rep, err := Answer(pipe, Query{Discharge: math.NaN(), Area: math.NaN(), Stage: d}, Options{Slope: s})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Stage == nil || !math.IsNaN(rep.Stage.CriticalDischarge) {
		t.Fatalf("answer at the crown %+v, want no critical discharge", rep.Stage)
	}
	full := 1 / n * math.Pi * d * d / 4 * math.Pow(d/4, 2.0/3) * math.Sqrt(s)
	if got := rep.Stage.UniformDischarge; math.Abs(got-full) > 1e-9*full {
		t.Errorf("uniform discharge at the crown %.9g, want the full-flow %.9g", got, full)
	}
	if text := strings.Join(rep.Warnings, "\n"); !strings.Contains(text, "flows full, with no free surface") {
		t.Errorf("warnings %q do not say the conduit flows full", rep.Warnings)
	}
}

// checkWarnings fails the test when a warning wanted is missing from
// warnings, or one to lack is there (each matched as a substring).
func checkWarnings(t *testing.T, warnings, want, lack []string) {
	t.Helper()
	text := strings.Join(warnings, "\n")
	for _, w := range want {
		if !strings.Contains(text, w) {
			t.Errorf("warnings %q lack %q", warnings, w)
		}
	}
	for _, w := range lack {
		if strings.Contains(text, w) {
			t.Errorf("warnings %q say %q", warnings, w)
		}
	}
}

// TestNoRootSaysTheRangeSearched: a discharge no stage carries names the
// section's own top, how far above it the search went and how, and what
// the section carries at its top. A rectangle 20 ft wide and 10 ft high,
// n = 0.035, S = 0.001 (US units), full at its top: A = 200 ft²,
// P = 40 ft, R = 5 ft, Q = (1.486/0.035)·200·5^(2/3)·√0.001 = 785.2 ft³/s
// (Manning's equation evaluated by hand; Chow 1959, eq. 6-1). The search
// doubles the depth six times (MaxSearchDoublings): up to 10·2⁶ = 640 ft.
func TestNoRootSaysTheRangeSearched(t *testing.T) {
	rect := mustShape(t, "rectangle:width=20,height=10", 0.035)
	trap := mustShape(t, "trapezoid:bottom=5,side=2", 0.03)
	for _, c := range []struct {
		name string
		g    subdivide.Geometry
		q    float64
		opt  Options
		want []string
	}{
		{"walls", rect, 1e5, Options{Slope: 0.001, Units: US}, []string{
			"discharge 100000 ft3/s: no stage in the section's range: searched from the lowest point, 0 ft, to the section's top, 10 ft, and on above it between vertical walls raised at its ends up to 640 ft",
			"the discharge is more than the section carries at its top (785.2 ft3/s) and at 640 ft between the walls"}},
		{"no extension", rect, 1e5, Options{Slope: 0.001, Units: US, Geometry: subdivide.Options{NoExtend: true}}, []string{
			"to the section's top, 10 ft (no stage above its ends is computed); the discharge is more than the section carries at its top (785.2 ft3/s)"}},
		{"shape continued", trap, 1e7, Options{Slope: 0.001, Units: SI}, []string{"and on above it, the shape continued, up to", "with the shape continued"}},
	} {
		_, err := NormalStages(c.g, c.q, c.opt)
		if !errors.Is(err, ErrNoRoot) {
			t.Fatalf("%s: %v, want ErrNoRoot", c.name, err)
		}
		for _, w := range c.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: %q lacks %q", c.name, err, w)
			}
		}
	}
}

// With Options.NoExtend a discharge whose critical stage lies inside the
// section is solved whole: the scan of specific energy and the probe
// either side of the critical stage stop at the section's top instead of
// asking for a stage above its ends. A rectangle b = 10 m wide between
// vertical walls 10 m high: y_c = (q²/(g·b²))^(1/3) and E_min = 1.5·y_c
// at y_c (closed form, Chow 1959, section 3-2 and eq. 3-11). The
// discharges are 846 m³/s (y_c = 9.0037 m) and those of y_c = 9.98 m,
// inside the last step of the scan below the top, and y_c = 9.9995 m,
// closer to the top than the probe; q = b·√(g·y_c³) from the same closed
// form. A critical stage above the top stays an error.
func TestNoExtendEnergyScanStopsAtTop(t *testing.T) {
	const b, g = 10.0, 9.80665
	rect, err := subdivide.Compile(subdivide.Section{Points: subdivide.XZ(0, 10, 0, 0, b, 0, b, 10), N: []float64{0.03, 0.03, 0.03}})
	if err != nil {
		t.Fatal(err)
	}
	opt := Options{Slope: 0.05, Geometry: subdivide.Options{NoExtend: true}}
	discharge := func(yc float64) float64 { return b * math.Sqrt(g*yc*yc*yc) }
	for _, q := range []float64{846, discharge(9.98), discharge(9.9995)} {
		yc := math.Cbrt(q * q / (g * b * b))
		t.Run(fmt.Sprintf("y_c %.4f m", yc), func(t *testing.T) {
			sol, err := Solve(rect, q, opt)
			if err != nil {
				t.Fatal(err)
			}
			if len(sol.Critical) != 1 || !closeDepth(sol.Critical[0].Stage, yc, 0) || sol.Critical[0].Extremum != EnergyMinimum || !sol.Critical[0].Least {
				t.Fatalf("critical stages %+v, want one at %.6f m, the least energy", sol.Critical, yc)
			}
			const closeEnergy = 1e-9 // relative
			if math.Abs(sol.MinEnergy.Energy/(1.5*yc)-1) > closeEnergy || !closeDepth(sol.MinEnergy.Stage, yc, 0) {
				t.Errorf("least specific energy %+v, want 1.5·y_c = %.6f m at %.6f m", sol.MinEnergy, 1.5*yc, yc)
			}
			if len(sol.EnergyMinima) != 1 || math.Abs(sol.EnergyMinima[0].Energy/(1.5*yc)-1) > closeEnergy {
				t.Errorf("local minima %+v, want one, 1.5·y_c = %.6f m", sol.EnergyMinima, 1.5*yc)
			}
			e, err := MinSpecificEnergy(rect, q, opt)
			if err != nil || math.Abs(e.Energy/(1.5*yc)-1) > closeEnergy {
				t.Errorf("MinSpecificEnergy %+v, %v; want 1.5·y_c = %.6f m", e, err, 1.5*yc)
			}
		})
	}
	if _, err := Solve(rect, discharge(10.5), opt); !errors.Is(err, ErrNoRoot) {
		t.Errorf("critical stage 10.5 m above the top: %v, want ErrNoRoot", err)
	}
}
