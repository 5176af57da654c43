package rating_test

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
)

// rowTol is the relative difference allowed between a table computed by
// the sweep and one computed stage by stage: the geometry agrees to
// rounding (see subdivide's sweep test) and the hydraulics are the same
// formulas.
const rowTol = 1e-9

// clipOnly hides the *subdivide.Profile type so that Compute rates it
// stage by stage with At, the reference engine.
type clipOnly struct{ subdivide.Geometry }

// Points passes on the ground line, of which Compute warns whichever
// engine rates the stages.
func (c clipOnly) Points() []subdivide.Point {
	if p, ok := c.Geometry.(*subdivide.Profile); ok {
		return p.Points()
	}
	return nil
}

// Joins passes on the ground line's joins, which Compute warns of
// whichever engine rates the stages.
func (c clipOnly) Joins() []subdivide.Join {
	if p, ok := c.Geometry.(*subdivide.Profile); ok {
		return p.Joins()
	}
	return nil
}

func near(a, b float64) bool {
	if math.IsNaN(a) || math.IsNaN(b) {
		return math.IsNaN(a) && math.IsNaN(b)
	}
	return math.Abs(a-b) <= rowTol*math.Max(math.Abs(a), math.Abs(b))
}

func diffRow(a, b rating.Row) string {
	va := []float64{a.Stage, a.Depth, a.Area, a.WettedPerimeter, a.TopWidth, a.HydraulicRadius, a.HydraulicDepth,
		a.Conveyance, a.Discharge, a.MeanVelocity, a.Alpha, a.Beta, a.Froude, a.ShearStress, a.ExtendedLeft, a.ExtendedRight}
	vb := []float64{b.Stage, b.Depth, b.Area, b.WettedPerimeter, b.TopWidth, b.HydraulicRadius, b.HydraulicDepth,
		b.Conveyance, b.Discharge, b.MeanVelocity, b.Alpha, b.Beta, b.Froude, b.ShearStress, b.ExtendedLeft, b.ExtendedRight}
	for i := range va {
		if !near(va[i], vb[i]) {
			return fmt.Sprintf("value %d: %.17g vs %.17g", i, va[i], vb[i])
		}
	}
	if a.Pools != b.Pools || len(a.Subs) != len(b.Subs) {
		return "pools or subsections differ"
	}
	for i := range a.Subs {
		x, y := a.Subs[i], b.Subs[i]
		for _, p := range [][2]float64{{x.Area, y.Area}, {x.WettedPerimeter, y.WettedPerimeter}, {x.TopWidth, y.TopWidth},
			{x.Conveyance, y.Conveyance}, {x.Discharge, y.Discharge}, {x.Velocity, y.Velocity}} {
			if !near(p[0], p[1]) {
				return fmt.Sprintf("subsection %d: %.17g vs %.17g", i, p[0], p[1])
			}
		}
	}
	return ""
}

// randomProfile is a small random section with pockets, walls and banks;
// sometimes a subsection has no n, so some stages fail with ErrNoN.
func randomProfile(rng *rand.Rand) subdivide.Section {
	s := subdivide.Section{}
	x := 0.0
	for i := 0; i < 3+rng.IntN(25); i++ {
		if i > 0 && rng.IntN(8) > 0 {
			x += 0.5 + 3*rng.Float64()
		}
		s.Points = append(s.Points, subdivide.Point{Station: x, Elevation: 100 + 0.5*float64(rng.IntN(10))})
	}
	s.Points[len(s.Points)-1].Station += 1
	s.HasBanks, s.LeftBank, s.RightBank = true, x*0.3, x*0.7
	s.NByRegion = subdivide.PerRegion{Channel: 0.06, Left: 0.035, Right: []float64{0, 0.07}[rng.IntN(2)]}
	return s
}

// TestComputeSweepMatchesClip checks that Compute gives the same table,
// rows in the caller's order, and the same first error whether it sweeps a
// profile or clips it stage by stage.
func TestComputeSweepMatchesClip(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 1))
	for k := 0; k < 500; k++ {
		s := randomProfile(rng)
		p, err := subdivide.Compile(s)
		if err != nil {
			t.Fatal(err)
		}
		stages := make([]float64, 1+rng.IntN(30))
		for i := range stages {
			stages[i] = 99.5 + 0.25*float64(rng.IntN(24))
		}
		for _, gopt := range []subdivide.Options{{AllPools: true}, {}, {AllPools: true, NoExtend: true}} {
			opt := rating.Options{Slope: 0.001, Geometry: gopt}
			a, errA := rating.Compute(p, stages, opt)
			b, errB := rating.Compute(clipOnly{p}, stages, opt)
			if fmt.Sprint(errA) != fmt.Sprint(errB) {
				t.Fatalf("section %d %+v: error %v, want %v", k, gopt, errA, errB)
			}
			if len(a.Rows) != len(b.Rows) || fmt.Sprint(a.Warnings) != fmt.Sprint(b.Warnings) {
				t.Fatalf("section %d %+v: %d rows %q, want %d %q", k, gopt, len(a.Rows), a.Warnings, len(b.Rows), b.Warnings)
			}
			for i := range a.Rows {
				if d := diffRow(a.Rows[i], b.Rows[i]); d != "" {
					t.Fatalf("section %d %+v row %d (stage %g): %s", k, gopt, i, stages[i], d)
				}
			}
		}
	}
}

// A section whose lower end is its lowest point holds no water below its
// ends: default stages are refused instead of a table of zeros.
func TestDefaultStagesNoLowPoint(t *testing.T) {
	p, err := subdivide.Compile(subdivide.Section{Points: subdivide.XZ(0, 5, 10, 3, 20, 0), N: []float64{0.03, 0.03}})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := rating.DefaultStageSpec().Stages(p); !errors.Is(err, rating.ErrNoLowPoint) {
		t.Errorf("default stages of a falling ground line: %v, want ErrNoLowPoint", err)
	}
	if st, err := (rating.StageSpec{List: []float64{1, 2}}).Stages(p); err != nil || len(st) != 2 {
		t.Errorf("stages asked for: %v %v", st, err)
	}
}

// A list of stages is laid out as a rating table is read: increasing from
// row to row, each stage once, whatever order it was given in.
func TestStageListOrdered(t *testing.T) {
	p, err := subdivide.Compile(subdivide.Section{Points: subdivide.XZ(0, 5, 10, 0, 20, 5), N: []float64{0.03, 0.03}})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		list, want []float64
	}{
		{[]float64{1, 2, 3}, []float64{1, 2, 3}},
		{[]float64{3, 1, 2}, []float64{1, 2, 3}},
		{[]float64{2, 1, 2, 1}, []float64{1, 2}},
		{[]float64{4}, []float64{4}},
	} {
		in := append([]float64(nil), c.list...)
		got, err := (rating.StageSpec{List: c.list}).Stages(p)
		if err != nil || !slices.Equal(got, c.want) {
			t.Errorf("stages %v: %v %v, want %v", c.list, got, err, c.want)
		}
		if !slices.Equal(c.list, in) {
			t.Errorf("stages %v: the spec's list was changed to %v", in, c.list)
		}
	}
}

// TestBottomMismatch: a table read back with depths has its bottom at
// stage − depth (+ datum for gauge heights); more than 0.5 m (1.5 ft) from
// the section's lowest point is warned of, naming both elevations; a
// table without depths is said to leave the check unmade. The table's
// first wet row is stage 1.4 with depth 0.4: bottom 1.0 (by hand).
func TestBottomMismatch(t *testing.T) {
	nan := math.NaN()
	rows := []rating.Row{{Stage: 1, Depth: 0}, {Stage: 1.4, Depth: 0.4}, {Stage: 2, Depth: 1}}
	for _, tt := range []struct {
		name   string
		units  rating.Units
		gauge  bool
		datum  float64
		rows   []rating.Row
		lowest float64
		want   string // "" for no warning
	}{
		{"agree", rating.SI, false, 0, rows, 1, ""},
		{"scour within 0.5 m", rating.SI, false, 0, rows, 0.6, ""},
		{"0.6 m apart", rating.SI, false, 0, rows, 0.4, "elevation 1.000 m (stage − depth), lies 0.600 m above the lowest point of xs.csv (0.400 m), more than 0.5 m"},
		{"gauge zero forgotten", rating.SI, false, 0, rows, 101, "lies 100.000 m below the lowest point of xs.csv (101.000 m)"},
		{"gauge zero given", rating.SI, true, 100, rows, 101, ""},
		{"wrong gauge zero", rating.SI, true, 99, rows, 101, "elevation 100.000 m (stage − depth + datum), lies 1.000 m below"},
		{"feet within 1.5", rating.US, false, 0, rows, 2.2, ""},
		{"feet beyond 1.5", rating.US, false, 0, rows, 2.6, "lies 1.600 ft below the lowest point of xs.csv (2.600 ft), more than 1.5 ft"},
		{"no depth column", rating.SI, false, 0, []rating.Row{{Stage: 1, Depth: nan}, {Stage: 2, Depth: nan}}, 50, "the table has no depth column, so its datum cannot be checked against the lowest point of xs.csv (50.000 m)"},
		{"no section bottom", rating.SI, false, 0, rows, nan, ""},
	} {
		tab := rating.Table{Units: tt.units, GaugeHeights: tt.gauge, Datum: tt.datum, Rows: tt.rows}
		got := tab.BottomMismatch(tt.lowest, "xs.csv")
		if (got == "") != (tt.want == "") || !strings.Contains(got, tt.want) {
			t.Errorf("%s: %q, want %q", tt.name, got, tt.want)
		}
	}
}

// TestStagesMinStep: a round default step finer than MinStep is raised to
// it, with a warning, so a section only millimetres deep still gets a table
// whose stages differ by at least MinStep; no default stage lies closer
// than MinStep to an end. The counts are by hand: a range of 0.002 in
// steps of 0.0001 holds 21 stages, ends included (0.002/0.0001 + 1); the
// round step over it would be 0.002/50 = 4e-5, rounded up to 5e-5.
func TestStagesMinStep(t *testing.T) {
	const minStep = 1e-4
	const slack = 1e-9 // relative round-off of a difference of stages
	shallow := func(depth float64) subdivide.Geometry {
		p, err := subdivide.Compile(subdivide.Section{Points: subdivide.XZ(0, 10+depth, 1, 10, 2, 10, 3, 10+depth), N: []float64{0.03, 0.03, 0.03}})
		if err != nil {
			t.Fatal(err)
		}
		return p
	}
	deep, err := subdivide.Compile(subdivide.Section{Points: subdivide.XZ(0, 5, 10, 0, 20, 5), N: []float64{0.03, 0.03}})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name  string
		g     subdivide.Geometry
		spec  rating.StageSpec
		rows  int  // stages laid out
		warn  bool // the step was raised
		first float64
		last  float64
	}{
		{"shallow section", shallow(0.002), rating.StageSpec{MinStep: minStep}, 21, true, 10, 10.002},
		// The top, 10.00204, is 4e-5 above the multiple 10.002: that stage
		// is dropped (it would be written as the top is, 10.002).
		{"top just above a multiple", shallow(0.00204), rating.StageSpec{MinStep: minStep}, 21, true, 10, 10.00204},
		{"narrow range asked for", deep, rating.StageSpec{From: 1, To: 1.001, FromSet: true, ToSet: true, MinStep: minStep}, 11, true, 1, 1.001},
		// A round step of 0.1 over 0 to 5 m: 51 stages, nothing raised.
		{"deep section", deep, rating.StageSpec{MinStep: minStep}, 51, false, 0, 5},
		// Without MinStep the old layout: 0.002/5e-5 + 1 = 41 stages.
		{"no bound", shallow(0.002), rating.StageSpec{}, 41, false, 10, 10.002},
		// A given step is used as given.
		{"given step", deep, rating.StageSpec{From: 1, To: 1.001, FromSet: true, ToSet: true, Step: 5e-5, MinStep: minStep}, 21, false, 1, 1.001},
	} {
		t.Run(c.name, func(t *testing.T) {
			st, warn, err := c.spec.StagesWarn(c.g)
			if err != nil {
				t.Fatal(err)
			}
			if len(st) != c.rows || st[0] != c.first || st[len(st)-1] != c.last {
				t.Errorf("%d stages from %g to %g, want %d from %g to %g: %v", len(st), st[0], st[len(st)-1], c.rows, c.first, c.last, st)
			}
			if got := len(warn) == 1 && strings.Contains(warn[0], "laid out 0.0001 apart"); got != c.warn || len(warn) > 1 {
				t.Errorf("warnings %q, want a raised step %v", warn, c.warn)
			}
			if c.spec.MinStep > 0 && c.spec.Step == 0 {
				for i := 1; i < len(st); i++ {
					if st[i]-st[i-1] < minStep*(1-slack) {
						t.Errorf("stages %g and %g are closer than %g", st[i-1], st[i], minStep)
					}
				}
			}
			plain, err := c.spec.Stages(c.g)
			if err != nil || !slices.Equal(plain, st) {
				t.Errorf("Stages gives %v (%v), StagesWarn %v", plain, err, st)
			}
		})
	}
}

// TestStagesRaisedWording: the warning of a raised step writes the round
// step to four significant digits, never its float64 expansion. The round
// step of a 0.00012 range is NiceStep(0.00012/50) = 5e-6 (by hand).
func TestStagesRaisedWording(t *testing.T) {
	g, err := subdivide.Compile(subdivide.Section{Points: subdivide.XZ(0, 10.00012, 1, 10, 2, 10.00012), N: []float64{0.03, 0.03}})
	if err != nil {
		t.Fatal(err)
	}
	_, warn, err := rating.StageSpec{MinStep: 1e-4}.StagesWarn(g)
	if err != nil || len(warn) != 1 || !strings.Contains(warn[0], "its round step, 5e-06, is finer than 0.0001") {
		t.Errorf("warnings %q (%v)", warn, err)
	}
}

// TestChannelLowWarning: bank stations that leave the lowest point
// outside the main channel are warned of, and the rows bear the warning
// out: at a stage below the channel's lowest ground nothing flows, though
// the section holds water (the pool at the lowest point is left out, as
// subdivide.Options says of water apart from the main channel). Banks
// holding the lowest point, or none, are not warned of.
func TestChannelLowWarning(t *testing.T) {
	pts := subdivide.XZ(0, 5, 8, 1, 12, 3, 14, 2.5, 16, 3.2, 30, 5)
	for _, tc := range []struct {
		name        string
		banks       bool
		left, right float64
		warned      bool
	}{
		{"lowest point left of the banks", true, 12, 16, true},
		{"banks hold the lowest point", true, 4, 16, false},
		{"no banks", false, 0, 0, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			p, err := subdivide.Compile(subdivide.Section{Points: pts, N: []float64{0.04, 0.04, 0.03, 0.03, 0.04},
				HasBanks: tc.banks, LeftBank: tc.left, RightBank: tc.right})
			if err != nil {
				t.Fatal(err)
			}
			tab, err := rating.Compute(p, []float64{2, 4}, rating.Options{Slope: 0.001})
			if err != nil {
				t.Fatal(err)
			}
			warned := false
			for _, w := range tab.Warnings {
				warned = warned || strings.Contains(w, "does not hold the section's lowest point")
			}
			if warned != tc.warned {
				t.Errorf("warned %v, want %v: %q", warned, tc.warned, tab.Warnings)
			}
			if r := tab.Rows[0]; tc.warned && (r.Area != 0 || r.PondedArea <= 0) {
				t.Errorf("stage 2 below the channel's lowest ground 2.5: area %g, ponded %g; want none flowing, some ponded", r.Area, r.PondedArea)
			}
		})
	}
}
