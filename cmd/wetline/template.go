package main

import (
	"context"
	"fmt"
	"io"
	"strings"

	"wetline/rating"
	"wetline/survey"
)

const templateUsage = "template -o FILE.xlsx [--sections N] [--rows N] [--units si|us] [--site NAME] [--survey SURVEY ...]"

// runTemplate writes a blank field workbook for a survey crew.
func runTemplate(ctx context.Context, e *env, args []string) error {
	fs := newFlags("template", templateUsage)
	out := fs.StringP("output", "o", "", "workbook to write (.xlsx), required")
	sections := fs.Int("sections", survey.DefaultTemplateSections,
		fmt.Sprintf("number of cross-section sheets XS-1, XS-2, … (1 to %d)", survey.MaxTemplateSections))
	rows := fs.Int("rows", survey.DefaultTemplateRows,
		fmt.Sprintf("rows per sheet that carry validation rules (1 to %d)", survey.MaxTemplateRows))
	units := fs.String("units", "si", "units named in the headers: si (m, m3/s) or us (ft, ft3/s); default: the units in the first --survey headers that name any, else si")
	surveys := fs.StringArray("survey", nil, "prefill a cross-section sheet from this survey (CSV, or a workbook's first visible sheet); repeatable")
	site := fs.String("site", "", "the site's name, written in the site block of every cross-section sheet")
	fs.input("survey")
	if err := fs.parse(e, args); err != nil {
		return err
	}
	if *out == "" || *out == "-" || fs.NArg() != 0 {
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
		return usageError{err: err}
	}
	opt := survey.TemplateOptions{Sections: *sections, Rows: *rows, Units: u, Site: rating.Site{Name: strings.Join(strings.Fields(*site), " ")}}
	given := fs.Changed("units")
	for _, path := range *surveys {
		sv, err := survey.ReadSection(path, "", survey.SectionOptions{})
		if err != nil {
			return err
		}
		// The first survey whose headers name units decides them, unless --units does.
		if u, err = sv.Units.Resolve(u, given); err != nil {
			return err
		}
		given = given || sv.Units.Found
		opt.Units = u
		opt.Surveys = append(opt.Surveys, sv)
	}
	if len(opt.Surveys) > survey.MaxTemplateSections {
		return usagef("template: %d surveys: at most %d", len(opt.Surveys), survey.MaxTemplateSections)
	}
	// A workbook of that name may hold field data: never replaced.
	return e.deliver(delivery{output: *out, inputs: *surveys, fresh: true, fileOnly: true,
		write: func(w io.Writer) error { return survey.WriteTemplate(w, opt) },
		summary: func(w io.Writer) error {
			_, err := fmt.Fprintf(w, "wrote %s: %d cross-section sheets (%d prefilled), %s, %s, %s and %s; units %s, %s\n",
				*out, max(*sections, len(opt.Surveys)), len(opt.Surveys), survey.FieldSheetCoordinates,
				survey.FieldSheetReach, survey.FieldSheetGaugings, survey.FieldSheetInstructions, u.Length(), u.Discharge())
			return err
		}})
}
