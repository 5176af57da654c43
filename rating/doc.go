// Package rating computes the hydraulics of one cross-section: Manning
// conveyance by subsection, discharge, the energy and momentum
// coefficients, mean velocity, Froude number and boundary shear at a stage;
// stage–discharge tables; the inverse problems (normal and critical stage,
// the stage holding an area); composite roughness and Cowan's n; and the
// words every report shares (units, measurement qualities, the caution).
//
// Reach methods that join several sections (slope-area, step-backwater)
// are in the sub-package reach; work with discharge measurements
// (comparison, calibration of n, rating fits, shifts) in gauged.
//
// Conventions used throughout the package and its sub-packages:
//
//   - One unit system per computation, chosen by Units. In SI, lengths are
//     metres, areas m², discharge m³/s, velocity m/s, shear Pa; in US
//     customary, feet, ft², ft³/s, ft/s and lb/ft². Slopes are
//     dimensionless (m/m). Manning's n is the same number in both systems;
//     the factor k of Manning's equation carries the unit change.
//   - A stage is a water-surface elevation in the survey's datum; a gauge
//     height is a stage read on a gauge whose zero lies at Datum
//     (elevation = gauge height + Datum).
//   - Values that are undefined at a stage (a Froude number with no top
//     width, a velocity with no area) are NaN; writers turn them into empty
//     cells or JSON null.
//   - Inputs are never modified. Library code never prints: warnings travel
//     on the results, as plain sentences a reviewer can read.
//   - Bad data gives an error wrapping one of the package's sentinel
//     errors (errors.Is); a broken precondition of the caller (slices of
//     different lengths) panics with a message starting "rating:".
package rating
