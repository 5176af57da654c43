package gauged

import "wetline/rating"

// sayf is rating.Sayf: the fits' warnings write floats in plain decimal.
func sayf(format string, a ...any) string { return rating.Sayf(format, a...) }

// errorf is rating.Errorf: the fits' errors write floats in plain decimal.
func errorf(format string, a ...any) error { return rating.Errorf(format, a...) }
