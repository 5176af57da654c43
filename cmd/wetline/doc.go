// Command wetline turns surveyed river cross-sections into stage–discharge
// ratings.
//
// Usage:
//
//	wetline COMMAND [ARGUMENTS]
//
// The commands:
//
//	rate    compute a stage–discharge table from a surveyed section
//	demo    write an invented demo site, its rating and reports to a folder
//	help    list the commands
//
// Run 'wetline COMMAND --help' for a command's flags. A survey is a CSV file
// or a workbook sheet with the columns station, elevation, and optionally n,
// mark (bank on the two main-channel limits) and note. Every value is in one
// unit system, chosen with --units si (m, m³/s, the default) or --units us
// (ft, ft³/s).
//
// Exit status: 0 on success, 1 when input data or a file cannot be used
// (with one line per problem naming file, row and column), 2 for a mistake
// on the command line. Output files are written whole or not at all, and
// never over an input file.
//
// Caution: a computed rating is an estimate to be verified against discharge
// measurements; local codes, agency standards and licensed professional
// judgement govern its use for design or flood warning.
package main
