package reach

import (
	"math"
	"math/rand/v2"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
)

// modelTol is the relative tolerance between the piecewise form of a
// section and rating.Hydraulics on Geometry.At: both are exact, so only
// rounding differs.
const modelTol = 1e-10

// besideVertex is how far (length unit) beside a vertex elevation the
// model is also checked, on either side.
const besideVertex = 1e-9

// hidden hides a geometry's kind, so that the model evaluates it with At.
type hidden struct{ subdivide.Geometry }

// The exact piecewise form reproduces rating.Hydraulics on Geometry.At
// (area, top width, conveyance, α) at random stages, at vertex elevations
// and just beside them, for surveyed, built and scaled sections, with and
// without connected flow.
func TestBWModelMatchesAt(t *testing.T) {
	nat, err := subdivide.Compile(naturalSection(200, 3, 50))
	if err != nil {
		t.Fatal(err)
	}
	flat, err := subdivide.Compile(subdivide.Section{ // a flat floodplain and a pocket
		Points:   subdivide.XZ(0, 5, 10, 2, 20, 2, 22, 2.5, 30, 1.8, 40, 2, 45, 0, 55, 0, 60, 2, 90, 2, 100, 6),
		HasBanks: true, LeftBank: 40, RightBank: 60, NByRegion: subdivide.PerRegion{Channel: 0.03, Left: 0.05, Right: 0.07}})
	if err != nil {
		t.Fatal(err)
	}
	shape := func(spec string) subdivide.Geometry {
		s, err := subdivide.ParseShape(spec)
		if err != nil {
			t.Fatal(err)
		}
		g, err := s.Build(subdivide.PerRegion{Channel: 0.03, Left: 0.06, Right: 0.06})
		if err != nil {
			t.Fatal(err)
		}
		return g
	}
	geoms := map[string]subdivide.Geometry{
		"natural":   nat,
		"flat":      flat,
		"scaled":    rating.ScaledN{Geometry: nat, Factor: 1.2, ChannelOnly: true},
		"compound":  shape("compound:bottom=8,side=1.5,depth=2,floodplain=25,outer=3,invert=10"),
		"rectangle": shape("rectangle:width=12,invert=3"),
		"trapezoid": shape("trapezoid:bottom=5,side=2,height=3"),
	}
	rng := rand.New(rand.NewPCG(1, 1))
	for name, g := range geoms {
		for _, gopt := range []subdivide.Options{{AllPools: true}, {}} {
			m, err := newBWModel(g, gopt, rating.SI)
			if err != nil {
				t.Fatal(err)
			}
			if m.bands[0].direct {
				t.Fatalf("%s: evaluated stage by stage", name)
			}
			var stages []float64
			lo, hi := g.Bottom(), g.Top()+0.5*(g.Top()-g.Bottom())
			for range 300 {
				stages = append(stages, lo+(hi-lo)*rng.Float64())
			}
			for _, b := range m.bands[1:] {
				stages = append(stages, b.lo, b.lo+besideVertex, b.lo-besideVertex)
			}
			for _, h := range stages {
				checkModel(t, name, m, g, gopt, h)
			}
		}
	}
}

func checkModel(t *testing.T, name string, m *bwModel, g subdivide.Geometry, gopt subdivide.Options, h float64) {
	t.Helper()
	var st bwState
	if err := m.state(h, &st); err != nil {
		t.Fatalf("%s at %g: %v", name, h, err)
	}
	w, err := g.At(h, gopt)
	if err != nil {
		t.Fatal(err)
	}
	row, err := rating.Hydraulics(w, g.Bottom(), 1, rating.SI)
	if err != nil {
		t.Fatal(err)
	}
	scale := row.Area // a dry stage must give exact zeros
	for _, c := range []struct {
		what      string
		got, want float64
	}{
		{"area", st.area, row.Area},
		{"top width", st.width, row.TopWidth},
		{"conveyance", st.k, row.Conveyance},
	} {
		if math.Abs(c.got-c.want) > modelTol*math.Max(math.Abs(c.want), scale) {
			t.Errorf("%s (connected %v) stage %.12g: %s %.15g, At gives %.15g", name, !gopt.AllPools, h, c.what, c.got, c.want)
		}
	}
	if row.Area > 0 && math.Abs(st.alpha()-row.Alpha) > modelTol*row.Alpha {
		t.Errorf("%s stage %.12g: alpha %.15g, At gives %.15g", name, h, st.alpha(), row.Alpha)
	}
	if (w.ExtendedLeft > 0 || w.ExtendedRight > 0) != st.walls || w.Pools != st.pools {
		t.Errorf("%s stage %.12g: walls %v pools %d, At gives %+v", name, h, st.walls, st.pools, w)
	}
}

// A geometry whose kind the model does not know is evaluated with At.
func TestBWModelDirect(t *testing.T) {
	p, err := subdivide.Compile(naturalSection(50, 1, 0))
	if err != nil {
		t.Fatal(err)
	}
	m, err := newBWModel(hidden{p}, subdivide.Options{AllPools: true}, rating.SI)
	if err != nil {
		t.Fatal(err)
	}
	if len(m.bands) != 1 || !m.bands[0].direct {
		t.Fatalf("bands %+v", m.bands)
	}
	for _, h := range []float64{0.1, 1.5, 3.2, 7} {
		checkModel(t, "direct", m, p, subdivide.Options{AllPools: true}, h)
	}
}
