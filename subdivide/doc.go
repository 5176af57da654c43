// Package subdivide computes the exact hydraulic geometry of a river
// cross-section at a stage: flow area, wetted perimeter, top width and the
// moments that follow from them, for the whole section and for each
// subsection between bank stations and roughness changes.
//
// Conventions used throughout the package:
//
//   - A section is a piecewise-linear ground line through surveyed points
//     given left to right looking downstream. Stations never decrease; two
//     consecutive points at the same station form a vertical wall.
//   - Lengths (station, elevation, stage) are in one unit of the caller's
//     choosing (metres or feet); areas are in that unit squared. The package
//     never converts units.
//   - A stage is a water-surface elevation in the same datum as the ground.
//     Ground strictly below the stage is wet. A vertex exactly at the stage is
//     touched but adds nothing; a segment lying exactly at the stage is dry.
//   - Subsection dividing lines are vertical and never part of the wetted
//     perimeter; the water surface never is either.
//   - Inputs are never modified; results hold no references to caller slices.
//   - Errors are returned for data the caller could not have checked
//     (a stage below the whole section is not an error: it is simply dry).
package subdivide
