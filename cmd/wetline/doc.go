// Command wetline turns surveyed river cross-sections into stage–discharge
// ratings.
//
// Usage:
//
//	wetline COMMAND [ARGUMENTS]
//
// The commands:
//
//	rate       compute a stage–discharge table from a surveyed section or a built shape
//	solve      normal and critical stage for a discharge, or the stage holding a flow area
//	slopearea  flood peak from high-water marks over a surveyed reach (slope-area method)
//	fit        compare gaugings with a rating, back-calculate n, fit a rating of controls with its bands
//	plot       draw rating, section and property figures (PNG) from a saved rating table
//	template   write a blank field workbook (cross-sections, reach, gaugings)
//	shape      write a built section as an editable survey CSV
//	cowan      Manning's n from a description of the reach by Cowan's method
//	demo       write an invented demo site, its ratings, reports and figures to a folder
//	help       list the commands
//
// Run 'wetline COMMAND --help' for a command's flags; the README has worked
// examples of each. A survey is a CSV file
// or a workbook sheet with the columns station, elevation, and optionally n,
// mark (bank on the two main-channel limits) and note. Every value is in one
// unit system, chosen with --units si (m, m³/s, the default) or --units us
// (ft, ft³/s).
//
// Exit status: 0 on success, 1 when input data or a file cannot be used
// (with one line per problem naming file, row and column), 2 for a mistake
// on the command line. Output files are written whole or not at all, and
// never over an input file. The output format follows the -o file's
// extension (.csv, .json, .txt, .xlsx) unless --format says otherwise.
//
// Caution: a computed rating is an estimate to be verified against discharge
// measurements; local codes, agency standards and licensed professional
// judgement govern its use for design or flood warning.
package main
