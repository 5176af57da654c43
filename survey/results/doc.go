// Package results writes wetline's reports: each result in each of its
// formats (CSV, JSON, text for reading on a console, and xlsx results
// workbooks with figures). Every writer renders the result's warnings and
// the caution (rating.Caution) itself.
//
// CSV and JSON columns and keys are a contract with scripts: the
// documented ones come first, in order, and later versions add after them.
// JSON is encoded from structs so keys keep that order; undefined values
// are null in JSON and empty cells in CSV. In CSV, stages and lengths are
// written to LengthDecimals decimals, other values to six significant
// digits; a results workbook stores its numbers so too (its number formats
// choose how many of those figures show), so its cells hold the CSV's
// figures and no float noise (0.6, not 0.600000000000001). JSON, read by
// programs, carries each number whole: the shortest decimal that reads
// back to the computed value (Float), so a script loses nothing to
// rounding it did not ask for.
package results
