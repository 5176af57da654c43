// Package rating turns wetted geometry into hydraulics: Manning conveyance
// by subsection, discharge, the energy and momentum coefficients, mean
// velocity, Froude number, boundary shear, and stage–discharge tables.
//
// Conventions: one unit system per computation, chosen by Units. In SI,
// lengths are metres, areas m², discharge m³/s, velocity m/s, shear Pa; in
// US customary, feet, ft², ft³/s, ft/s and lb/ft². Slopes are dimensionless
// (m/m). Manning's n is the same number in both systems; the factor k of
// Manning's equation carries the unit change. Values that are undefined at
// a stage (a Froude number with no top width, a velocity with no area) are
// NaN; writers turn them into empty cells or JSON null. Library code never
// prints: warnings travel on the results.
package rating
