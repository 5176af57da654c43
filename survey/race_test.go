//go:build race

package survey

// raceEnabled reports a build with the race detector.
const raceEnabled = true
