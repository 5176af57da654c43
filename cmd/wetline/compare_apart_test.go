package main

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// compare warns when two surveys' section lines lie farther apart than a
// resurvey's (15 ft, common practice), by the eastings and northings of
// a coordinate survey or of a survey by station that carries them (as
// project writes); a resurvey 2 ft off the first line is not warned of,
// nor a survey without coordinates. The sections are invented: the same
// ground, its line running east at northing 5000 (A), 2 ft north (the
// resurvey) or 300 ft north (another section).
func TestCompareLinesApart(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	st := []float64{0, 10, 20, 25, 30, 35, 45, 60}
	z := []float64{110, 106, 104, 100, 99.5, 101, 106, 110}
	write := func(name string, north float64, byStation, coords bool) string {
		var b strings.Builder
		switch {
		case !coords:
			b.WriteString("station (ft),elevation (ft),n\n")
		case byStation:
			b.WriteString("station (ft),elevation (ft),n,easting (ft),northing (ft)\n")
		default:
			b.WriteString("easting (ft),northing (ft),elevation (ft),n\n")
		}
		for i := range st {
			switch {
			case !coords:
				fmt.Fprintf(&b, "%g,%g,0.04\n", st[i], z[i])
			case byStation:
				fmt.Fprintf(&b, "%g,%g,0.04,%g,%g\n", st[i], z[i], 20000+st[i], north)
			default:
				fmt.Fprintf(&b, "%g,%g,%g,0.04\n", 20000+st[i], north, z[i])
			}
		}
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(b.String()), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	a := write("a.csv", 5000, false, true)
	for _, tc := range []struct {
		name string
		b    string
		warn string
	}{
		{"another section by coordinates", write("far.csv", 5300, false, true), "lie 300 ft apart"},
		{"another section by station with coordinates", write("far-st.csv", 5300, true, true), "lie 300 ft apart"},
		{"a resurvey", write("near.csv", 5002, false, true), ""},
		{"a survey without coordinates", write("plain.csv", 0, false, false), ""},
	} {
		out, errs, code := runCLI(t, "compare", a, tc.b, "--stages", "102,105")
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", tc.name, code, errs)
		}
		warned := strings.Contains(out, "section lines of")
		if tc.warn == "" && warned {
			t.Errorf("%s: warned:\n%s", tc.name, out)
		}
		if tc.warn != "" && (!strings.Contains(out, tc.warn) || !strings.Contains(out, "more than the 15 ft a resurvey")) {
			t.Errorf("%s: no warning %q:\n%s", tc.name, tc.warn, out)
		}
	}
}
