package rating

import (
	"math"
	"strings"
	"testing"

	"wetline/subdivide"
)

// A table by the split method says when a vertical wall with its own n
// is folded into the subsection it faces (it is not a subsection of its
// own), naming the wall's station, its elevations and n; its discharge is
// the hand value of TestWallsConvey (Horton–Einstein over the bed and the
// walls, Chow 1959, section 6-7): rectangle 5 m wide, walls n = 0.1, bed
// n = 0.03, depth 1 m, S = 0.001, Q = 5·(5/7)^(2/3)·√0.001/n with
// n = ((5·0.03^1.5 + 2·1·0.1^1.5)/7)^(2/3).
func TestFoldedWallWarned(t *testing.T) {
	box := func(wall float64) *subdivide.Profile {
		return compile(t, subdivide.Section{Name: "XS-W", Points: []subdivide.Point{{Station: 0, Elevation: 3}, {Station: 0, Elevation: 0},
			{Station: 5, Elevation: 0}, {Station: 5, Elevation: 3}}, N: []float64{wall, 0.03, wall}})
	}
	horton := math.Pow((5*math.Pow(0.03, 1.5)+2*math.Pow(0.1, 1.5))/7, 2.0/3)
	want := 5 * math.Pow(5.0/7, 2.0/3) * math.Sqrt(0.001) / horton
	for _, c := range []struct {
		name     string
		wall     float64
		stages   []float64
		comp     Composite
		warnings []string // what the wall warnings hold, in order
	}{
		{"rough walls", 0.1, []float64{0.5, 1}, Split, []string{
			"the vertical wall at station 0 m (elevation 0 to 3 m, n 0.1) holds no water of its own, so it is not a subsection: its wetted perimeter is counted in the subsection it faces (stations 0 to 5 m, n 0.03)",
			"the vertical wall at station 5 m (elevation 0 to 3 m, n 0.1)"}},
		{"walls of the bed's n", 0.03, []float64{1}, Split, nil},
		{"dry", 0.1, []float64{0}, Split, nil},
		{"merged by Horton–Einstein", 0.1, []float64{1}, HortonEinstein, nil},
	} {
		tab, err := Compute(box(c.wall), c.stages, Options{Slope: 0.001, Units: SI, Composite: c.comp})
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		var walls []string
		for _, w := range tab.Warnings {
			if strings.Contains(w, "vertical wall at station") {
				walls = append(walls, w)
			}
		}
		if len(walls) != len(c.warnings) {
			t.Errorf("%s: wall warnings %q, want %d", c.name, walls, len(c.warnings))
			continue
		}
		for i, w := range c.warnings {
			if !strings.HasPrefix(walls[i], w) || !strings.Contains(walls[i], "Horton–Einstein") {
				t.Errorf("%s: warning %q, want it to start %q and name Horton–Einstein", c.name, walls[i], w)
			}
		}
		if c.name == "rough walls" {
			if q := tab.Rows[1].Discharge; relErr(q, want) > 1e-12 {
				t.Errorf("%s: Q = %.6g, want %.6g by hand", c.name, q, want)
			}
		}
	}
}
