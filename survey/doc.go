// Package survey reads field data: surveyed cross-sections, discharge
// measurements, slope-area reach tables and saved rating tables, from CSV
// files or workbook sheets, and writes the blank field workbook a crew
// fills in.
//
// Conventions used throughout the package:
//
//   - A table has one header row; column names match case-insensitively,
//     spaces, hyphens and underscores alike, and may carry a unit in
//     brackets ("elevation (m)"). Blank rows are skipped; lines starting
//     with '#' in a CSV file are comments.
//   - Every bad cell is reported as a *ParseError naming the file, the
//     sheet, the 1-based row and column and the column's name, as
//     xs2.csv:14:2: elevation "1,5": not a number. All the bad cells of a
//     file are reported together (at most MaxReported).
//   - Numbers are written with a decimal point; stations increase left to
//     right looking downstream.
//   - Readers return plain values from packages subdivide and rating and
//     never modify the files they read.
package survey
