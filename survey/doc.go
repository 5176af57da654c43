// Package survey reads field data: surveyed cross-sections (by station,
// or by easting and northing projected onto the section line), discharge
// measurements, reach tables for the slope-area and step-backwater
// methods, rating tables and rating periods, shift diagrams and stage
// records, from CSV files or workbook sheets, with the site metadata and
// the units written with them; and it writes the blank field workbook a
// crew fills in.
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
//   - Times are ISO 8601 in the forms of ParseISOTime, the same for every
//     reader and for the command line's times (or workbook date cells),
//     of the years MinYear to MaxYear, in one file all with a UTC offset
//     or all without (ErrYear, ErrMixedOffsets).
//   - A column is named once, under one of its names: a header with both
//     stage and gauge_height is refused (ErrAliasColumns).
//   - A unit written in a header is data: the headers of one table must
//     agree, and UnitNote.Resolve refuses a unit system asked for that they
//     contradict.
//   - Key lines above a table ("# site: Larch Brook" in a CSV file, a key
//     and a value in two cells above a sheet's header) say what is known of
//     the site (MetaKeys; Table.Site).
//   - Inputs are bounded (Limits: DefaultMaxBytes, DefaultMaxRows,
//     DefaultMaxCells, raised by the environment variables EnvMaxBytes,
//     EnvMaxRows, EnvMaxCells), only regular files are read, and implausible values are refused at
//     their cell: coordinates beyond MaxCoordinate, elevations, stages and shifts beyond
//     MaxElevation, discharges above rating.MaxDischarge, n outside MinN to MaxN.
//   - Readers return plain values from packages subdivide and rating and
//     never modify the files they read.
package survey
