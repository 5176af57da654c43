package results_test

import "flag"

// update rewrites the golden files under testdata: go test -update.
var update = flag.Bool("update", false, "rewrite golden files under testdata")
