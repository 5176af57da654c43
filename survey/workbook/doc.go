// Package workbook builds xlsx workbooks for wetline: table sheets
// streamed row by row with styled, frozen headers and per-column number
// formats, input sheets with validation rules for a field crew, summary
// and picture sheets, and print set-up: title and page number at the
// head of every page, a footer line at the foot, house margins; table
// sheets one page wide with their header repeated, landscape when wide;
// picture sheets one whole picture per landscape page.
//
// A Book holds temporary files until it is closed. It never reads a
// workbook: readers are in package survey.
package workbook
