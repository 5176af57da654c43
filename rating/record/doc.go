// Package record computes a gauge's discharge record: it turns a record of
// gauge heights into unit discharges with the rating periods and shift
// diagrams of a gauged.History, and the unit discharges into daily values.
//
// Conventions used throughout the package:
//
//   - Times are instants held as Unix seconds (UTC). Calendar days are
//     taken in a fixed UTC offset given by the caller.
//   - Stages are gauge heights and discharges are in the rating's units;
//     the package never converts units.
//   - A value that cannot be computed is NaN and carries a flag saying why;
//     nothing is extrapolated unless the rating table asks for it, and a
//     stage outside every rating period, or in a period without a rating,
//     has no discharge.
//   - Results state the ratings, periods and shift diagrams they used, and
//     carry warnings as plain sentences. Library code never prints.
//   - Inputs are never modified; results hold no references to caller
//     slices.
package record
