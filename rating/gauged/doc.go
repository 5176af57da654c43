// Package gauged works with discharge measurements (gaugings) at a gauge:
// their comparison with a section's hydraulic rating, the calibration of
// Manning's n on them, power-law rating fits with their bands and lookup
// tables extended on the section's hydraulics.
//
// A gauging's stage is a gauge height; a HydraulicCurve (package rating)
// relates gauge heights to the surveyed section through its datum.
// Discharges are in the unit system's discharge unit. Gaugings are never
// modified and reports keep them in input order.
package gauged
