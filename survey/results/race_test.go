//go:build race

package results_test

// raceEnabled reports a build with the race detector.
const raceEnabled = true
