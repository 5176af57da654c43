package main

import (
	"context"
	"fmt"
	"io"

	"wetline/rating"
	"wetline/survey"
)

const templateUsage = "template -o FILE.xlsx [--sections N] [--rows N] [--units si|us]"

// runTemplate writes a blank field workbook for a survey crew.
func runTemplate(ctx context.Context, e *env, args []string) error {
	fs := newFlags("template", templateUsage)
	out := fs.StringP("output", "o", "", "workbook to write (.xlsx), required")
	sections := fs.Int("sections", survey.DefaultTemplateSections,
		fmt.Sprintf("number of cross-section sheets XS-1, XS-2, … (1 to %d)", survey.MaxTemplateSections))
	rows := fs.Int("rows", survey.DefaultTemplateRows,
		fmt.Sprintf("rows per sheet that carry validation rules (1 to %d)", survey.MaxTemplateRows))
	units := fs.String("units", "si", "units named in the headers: si (m, m3/s) or us (ft, ft3/s)")
	if err := parseFlags(fs, e, args); err != nil {
		return err
	}
	if *out == "" || fs.NArg() != 0 {
		return usagef("template: want -o FILE.xlsx and no other arguments")
	}
	if !survey.IsWorkbook(*out) {
		return usagef("template: -o %q: the field workbook must be an .xlsx file", *out)
	}
	if *sections < 1 || *sections > survey.MaxTemplateSections {
		return usagef("template: --sections %d: want 1 to %d", *sections, survey.MaxTemplateSections)
	}
	if *rows < 1 || *rows > survey.MaxTemplateRows {
		return usagef("template: --rows %d: want 1 to %d", *rows, survey.MaxTemplateRows)
	}
	u, err := rating.ParseUnits(*units)
	if err != nil {
		return usageError{err}
	}
	opt := survey.TemplateOptions{Sections: *sections, Rows: *rows, Units: u}
	if err := survey.WriteFile(*out, nil, func(w io.Writer) error { return survey.WriteTemplate(w, opt) }); err != nil {
		return err
	}
	fmt.Fprintf(e.stderr, "wrote %s: sheets %s … %s (cross-sections), %s, %s and %s; units %s, %s\n",
		*out, survey.SectionSheetName(1), survey.SectionSheetName(*sections),
		survey.FieldSheetReach, survey.FieldSheetGaugings, survey.FieldSheetInstructions, u.Length(), u.Discharge())
	return nil
}
