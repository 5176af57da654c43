package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"wetline/survey"
)

// A template prefilled from a survey whose headers are in feet is in
// feet without --units, and refused with --units si naming the column and
// both units; the survey's site fills the sheet's site block.
func TestTemplateUnitsAndSiteFromSurvey(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	in := filepath.Join(dir, "upper.csv")
	body := "# site: Upper Weir Brook (invented)\n# crew: EF\nstation (ft),elevation (ft),n\n0,10,0.04\n10,0,\n20,0,\n30,10,\n"
	if err := os.WriteFile(in, []byte(body), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "field.xlsx")
	if _, errs, code := runCLI(t, "template", "-o", out, "--survey", in); code != 0 || !strings.Contains(errs, "units ft, ft3/s") {
		t.Fatalf("feet survey without --units: exit %d, %s", code, errs)
	}
	sv, err := survey.ReadSection(out, "upper", survey.SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if !sv.Units.Found || sv.Units.Text != "ft" || sv.Site.Name != "Upper Weir Brook (invented)" || sv.Site.Crew != "EF" {
		t.Errorf("read back: units %+v, site %+v", sv.Units, sv.Site)
	}
	_, errs, code := runCLI(t, "template", "-o", filepath.Join(dir, "si.xlsx"), "--survey", in, "--units", "si")
	if code != 1 || !strings.Contains(errs, "upper.csv:3:1: station (ft)") || !strings.Contains(errs, "si units") {
		t.Errorf("feet survey with --units si: exit %d, %s", code, errs)
	}
}
