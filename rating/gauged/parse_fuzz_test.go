package gauged_test

import (
	"testing"

	"wetline/rating/gauged"
)

// The word parsers never panic, and every word they accept prints back
// to a word they read as the same value.
func FuzzParseWords(f *testing.F) {
	for _, s := range []string{"", "lsq", "Bayes", "section", " CHANNEL ", "unknown", "add", "replace", "x"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		if k, err := gauged.ParseControlKind(s); err == nil {
			if k2, err := gauged.ParseControlKind(k.String()); err != nil || k2 != k {
				t.Errorf("kind %q: %v back as %v, %v", s, k, k2, err)
			}
		}
		if j, err := gauged.ParseJoint(s); err == nil {
			if j2, err := gauged.ParseJoint(j.String()); err != nil || j2 != j {
				t.Errorf("joint %q: %v back as %v, %v", s, j, j2, err)
			}
		}
		if m, err := gauged.ParseMethod(s); err == nil {
			if m2, err := gauged.ParseMethod(m.String()); err != nil || m2 != m {
				t.Errorf("method %q: %v back as %v, %v", s, m, m2, err)
			}
		}
	})
}
