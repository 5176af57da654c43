// Package reach computes the hydraulics of a river reach described by
// several surveyed cross-sections: the slope-area estimate of a flood peak
// from high-water marks, with its site checks and a Monte Carlo analysis of
// its uncertainty, and step-backwater water-surface profiles of steady
// subcritical flow, with the stage–discharge rating they give at a section
// and their verification against high-water marks.
//
// Sections are given upstream first, each with its distance along the
// channel (increasing downstream) and its high-water marks. Lengths,
// stages, discharges and units follow package rating; each section's
// geometry is a subdivide.Geometry. Inputs are never modified; warnings and
// checks travel on the results.
package reach
