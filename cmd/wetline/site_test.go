package main

import (
	"encoding/json"
	"fmt"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"wetline/survey"
)

// Every command that writes a report takes --site and names the site in
// the report, its text and its JSON alike; a survey's site key is used when
// --site is not given.
func TestSiteEverywhere(t *testing.T) {
	t.Parallel()
	const site = "Heron Weir gauge"
	for _, args := range [][]string{
		{"rate", demoSurveyPath, "--slope", "0.001", "--stages", "101", "--format", "text"},
		{"rate", demoSurveyPath, "--slope", "0.001", "--stages", "101", "--format", "json"},
		{"solve", demoSurveyPath, "--slope", "0.001", "--discharge", "10"},
		{"solve", demoSurveyPath, "--slope", "0.001", "--discharge", "10", "--format", "json"},
		{"fit", fitDemoGaugings, "--method", "lsq"},
		{"fit", fitDemoGaugings, "--method", "lsq", "--format", "json"},
		{"slopearea", "demodata/reach-brindle.csv", "--draws", "200"},
		{"slopearea", "demodata/reach-brindle.csv", "--draws", "200", "--format", "json"},
		{"backwater", bwPlain(t), "--discharges", "12", "--boundary", "critical"},
		{"backwater", bwPlain(t), "--discharges", "12", "--boundary", "critical", "--format", "json"},
		shiftsArgs(),
		shiftsArgs("--format", "json"),
		recordArgs(),
		recordArgs("--format", "json"),
		{"compare", recRatingA, recRatingB, "--zero-flow", "0.2"},
		{"compare", recSectionA, recSectionB, "--step", "0.5", "--format", "json"},
		{"project", larchCoords},
		{"project", larchCoords, "--format", "json"},
		{"shape", "trapezoid:bottom=4,side=2,height=2", "--n", "0.03"},
		{"cowan", "--bed", "fine-gravel"},
	} {
		args = append(args, "--site", site)
		out, errs, code := runCLI(t, args...)
		if code != 0 || !strings.Contains(out, site) {
			t.Errorf("%s: exit %d, site not named:\n%.400s\n%s", strings.Join(args, " "), code, out, errs)
		}
	}
	out, errs, code := runCLI(t, "rate", larchCoords, "--slope", "0.003", "--stages", "94", "--format", "text")
	if code != 0 || !strings.Contains(out, "Site: Larch Brook at the footbridge (invented) (id LB-02), surveyed 2026-10-03") {
		t.Errorf("site key of the survey not reported: exit %d\n%s%s", code, out, errs)
	}
}

// template --site writes the site's name into the site block of every
// cross-section sheet, where the readers find it.
func TestTemplateSite(t *testing.T) {
	t.Parallel()
	path := filepath.Join(t.TempDir(), "field.xlsx")
	if _, errs, code := runCLI(t, "template", "-o", path, "--sections", "2", "--site", "Heron Weir gauge"); code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, sheet := range []string{"XS-1", "XS-2", survey.FieldSheetCoordinates} {
		tab, err := survey.ReadTable(path, sheet)
		if err != nil {
			t.Fatal(err)
		}
		if got := tab.Site().Name; got != "Heron Weir gauge" {
			t.Errorf("%s: site %q", sheet, got)
		}
	}
}

// Every results workbook names the site on its summary sheet and at the
// head of every printed page (not the section key, when a site is known).
func TestSiteInWorkbooks(t *testing.T) {
	t.Parallel()
	const site = "Heron Weir gauge"
	dir := t.TempDir()
	for i, args := range [][]string{
		{"rate", demoSurveyPath, "--slope", "0.001", "--stages", "101,102"},
		{"fit", fitDemoGaugings, "--method", "lsq"},
		{"slopearea", "demodata/reach-brindle.csv", "--draws", "200"},
		{"backwater", bwPlain(t), "--discharges", "12", "--boundary", "critical"},
		shiftsArgs(),
		recordArgs(),
		{"compare", recRatingA, recRatingB, "--zero-flow", "0.2"},
		{"compare", recSectionA, recSectionB, "--step", "0.5"},
	} {
		book := filepath.Join(dir, fmt.Sprintf("book-%d.xlsx", i))
		args = append(args, "--site", site, "-o", book)
		if _, errs, code := runCLI(t, args...); code != 0 {
			t.Fatalf("%s: exit %d: %s", strings.Join(args, " "), code, errs)
		}
		f, err := excelize.OpenFile(book)
		if err != nil {
			t.Fatal(err)
		}
		for _, sheet := range f.GetSheetList() {
			hf, err := f.GetHeaderFooter(sheet)
			if err != nil || !strings.HasPrefix(hf.OddHeader, "&Lwetline ") || !strings.Contains(hf.OddHeader, ": "+site+"&R") {
				t.Errorf("%s: sheet %s: page header %q (%v), want the site", args[0], sheet, hf.OddHeader, err)
			}
		}
		rows, err := f.GetRows("summary")
		f.Close()
		if err != nil {
			t.Fatal(err)
		}
		found := false
		for _, r := range rows {
			found = found || strings.Contains(strings.Join(r, " "), site)
		}
		if !found {
			t.Errorf("%s: the summary sheet does not name the site", args[0])
		}
	}
}

// TestFitTextTitleNamesSite: the fit text report is titled with the
// site's name when one is given, as its workbook's page header is; the
// gaugings' own name otherwise. The JSON key site keeps the gaugings'
// name, the site going to site_metadata.
func TestFitTextTitleNamesSite(t *testing.T) {
	t.Parallel()
	dir, _ := demoOutput(t)
	in := filepath.Join(dir, "tallow-gaugings.csv")
	for _, tc := range []struct {
		args  []string
		title string
	}{
		{[]string{"--site", "Tallow X"}, "Gaugings at Tallow X: "},
		{nil, "Gaugings at tallow-gaugings: "},
	} {
		out, errs, code := runCLI(t, append([]string{"fit", in, "--method", "lsq"}, tc.args...)...)
		if code != 0 || !strings.HasPrefix(out, tc.title) {
			t.Errorf("fit %v: exit %d %s: first line %q, want it to start %q", tc.args, code, errs, strings.SplitN(out, "\n", 2)[0], tc.title)
		}
	}
	out, errs, code := runCLI(t, "fit", in, "--method", "lsq", "--site", "Tallow X", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var doc struct {
		Site         string
		SiteMetadata struct{ Name string } `json:"site_metadata"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	if doc.Site != "tallow-gaugings" || doc.SiteMetadata.Name != "Tallow X" {
		t.Errorf("json site %q, site_metadata.name %q; want tallow-gaugings and Tallow X", doc.Site, doc.SiteMetadata.Name)
	}
}
