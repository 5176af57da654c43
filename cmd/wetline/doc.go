// Command wetline turns surveyed river cross-sections into stage–discharge
// ratings: at a new gauge before discharge has been measured, above the
// highest gauging, through the shifts of a changing control, and for a
// flood peak from its high-water marks.
//
// Usage:
//
//	wetline COMMAND [ARGUMENTS]
//
// The commands:
//
//	rate       the stage–discharge table of a surveyed section or a built shape (Manning's equation);
//	           several files, a folder or --all-sheets rate a batch
//	solve      normal and critical stage for a discharge, or the stage holding a flow area
//	project    a coordinate survey (easting, northing, elevation) turned into stations along its section line
//	shape      a built section (trapezoid, compound, pipe, ...) written as an editable survey CSV
//	cowan      Manning's n from a description of the reach by Cowan's method
//	plot       rating, section and property figures (PNG) redrawn from a saved rating table
//	template   a blank field workbook (cross-sections, coordinate survey, reach, gaugings)
//	fit        gaugings against a rating, n back-calculated, a rating of controls fitted with its bands
//	slopearea  a flood peak from high-water marks over a surveyed reach (slope-area method)
//	backwater  water-surface profiles and a rating through a surveyed reach (step-backwater method)
//	shifts     each gauging's shift against the rating in force, and a proposed shift diagram per visit
//	record     a stage record turned into unit and daily discharges with rating periods and shifts
//	compare    two ratings, or two surveys of one section (scour or fill), compared
//	demo       an invented demo site, its ratings, reports and figures, written to a folder
//	completion a shell completion script: wetline completion bash (or zsh)
//	help       the list of commands; wetline help COMMAND gives a command's flags
//	version    the program's version (also --version)
//
// Run 'wetline COMMAND --help' for every flag of a command; the README
// describes each command with an example on the demo's files.
//
// Inputs. A survey, gaugings, reach table, rating table, shift diagrams or
// stage record is a CSV file or a sheet of an xlsx workbook (--sheet NAME).
// The header is one row; column names match in any case, and a unit may
// follow a name in brackets ("elevation (m)"). A survey has the columns
// station and elevation, and optionally n, mark (bank on the two limits of
// the main channel) and note; a survey with easting and northing columns
// instead of station is projected onto its section line. Lines such as
// "# site: Tallow Creek at Mill Lane" above a CSV header (or rows above a
// sheet's header) name the site; the keys are site, site id, surveyed,
// datum and crew. Numbers use a decimal point, times are ISO 8601. The
// units are SI (m, m³/s) or US customary (ft, ft³/s): --units si|us, or
// else the units in the headers, else SI; a --units the headers contradict
// is refused, and nothing is converted. An input named - is standard
// input. Files are limited to 512 MiB, tables to a million rows and ten
// million cells (raise with WETLINE_MAX_BYTES, WETLINE_MAX_ROWS,
// WETLINE_MAX_CELLS).
//
// Outputs. -o FILE writes the report, in the format of its extension
// (.csv, .json, .txt, .xlsx) unless --format says otherwise; without -o,
// or with -o -, it goes to standard output. Output files are written whole
// or not at all, and never over an input file.
//
// Exit status: 0 on success (and help); 1 when an input or a file cannot
// be used (in a batch, the survey of any one section), with one line per
// problem naming file, row and column, and nothing written; 2 for a
// mistake on the command line (standard input named twice among them), or a
// WETLINE_MAX_* variable that is not a whole number above zero; 128+N when
// interrupted by signal N, leaving no partial file.
//
// Caution: computed ratings and flood estimates are estimates to be
// verified against discharge measurements; local codes, agency standards
// and licensed professional judgement govern their use for design or
// flood warning. Indirect estimates of a flood peak carry large
// uncertainty, and a computed discharge record is provisional until it has
// been reviewed.
package main
