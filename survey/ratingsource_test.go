package survey

import (
	"errors"
	"strings"
	"testing"
)

// Every reader of a rating table given a results workbook with no sheet
// named reads the sheet its rating was written to, past the summary.
func TestRatingReadersFindResultsSheet(t *testing.T) {
	summary := [][]any{{"item", "value", "unit"}, {"site", "Otter Rill", ""}}
	table := [][]any{{"stage (m)", "discharge (m3/s)"}, {0.5, 0}, {1.0, 2.5}, {1.5, 8.0}}
	for _, c := range []struct {
		name  string
		order []string
		sheet string // the sheet read, "" for ErrNoRatingSheet
	}{
		{"rate's", []string{SheetResultsSummary, SheetResultsRating}, SheetResultsRating},
		{"fit's", []string{SheetResultsSummary, "gaugings", SheetResultsFitted}, SheetResultsFitted},
		{"a record's", []string{SheetResultsSummary, SheetResultsRatings}, ""},
	} {
		t.Run(c.name, func(t *testing.T) {
			sheets := map[string][][]any{SheetResultsSummary: summary}
			for _, s := range c.order[1:] {
				sheets[s] = table
			}
			path := writeBook(t, t.TempDir(), sheets, c.order)
			rt, err := ReadRatingTables(path, RatingTableOptions{})
			br, berr := ReadBoundaryRating(path, "")
			if c.sheet == "" {
				if !errors.Is(err, ErrNoRatingSheet) || !errors.Is(berr, ErrNoRatingSheet) {
					t.Errorf("errors %v; %v, want ErrNoRatingSheet", err, berr)
				}
				return
			}
			if err != nil || berr != nil {
				t.Fatalf("errors %v; %v", err, berr)
			}
			if len(rt.Periods) != 1 || rt.Periods[0].Rating == nil || len(rt.Periods[0].Rating.Points) != 3 || br.Sheet != c.sheet {
				t.Errorf("read %+v and boundary sheet %q, want the 3 rows of %s", rt.Periods, br.Sheet, c.sheet)
			}
		})
	}
}

// Gaugings read from a workbook with no gaugings sheet, none named, say
// which sheet holds them and the flag naming it; or list the sheets.
func TestGaugingsSheetRenamedHint(t *testing.T) {
	survey := [][]any{{"station", "elevation"}, {0, 2}, {5, 0}, {10, 2}}
	gaugings := [][]any{{"time", "stage", "discharge"}, {"2026-11-14 10:00", 1.2, 3.4}}
	for _, c := range []struct {
		name  string
		order []string
		want  string
	}{
		{"renamed", []string{"XS-1", "Gaugings 2026"}, "sheet Gaugings 2026 does: give --gaugings-sheet 'Gaugings 2026'"},
		{"absent", []string{"XS-1", "XS-2"}, "with --gaugings-sheet (sheets: XS-1, XS-2)"},
	} {
		t.Run(c.name, func(t *testing.T) {
			path := writeBook(t, t.TempDir(), map[string][][]any{"XS-1": survey, "XS-2": survey, "Gaugings 2026": gaugings}, c.order)
			_, err := ReadGaugings(path, "")
			if !errors.Is(err, ErrMissingColumn) || !strings.Contains(err.Error(), c.want) {
				t.Errorf("error %v, want ErrMissingColumn saying %q", err, c.want)
			}
			if _, err := ReadGaugingsAt(path, "", 0); err == nil || !strings.Contains(err.Error(), c.want) {
				t.Errorf("ReadGaugingsAt: %v, want %q", err, c.want)
			}
		})
	}
}
