package main

import (
	"fmt"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"wetline/survey/results"
)

// summaryItems reads the summary sheet of a results workbook: item → value.
func summaryItems(t *testing.T, book string) map[string]string {
	t.Helper()
	f, err := excelize.OpenFile(book)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := f.GetRows(results.SheetSummary)
	if err != nil {
		t.Fatal(err)
	}
	items := map[string]string{}
	for _, r := range rows {
		if len(r) > 1 {
			items[r[0]] = r[1]
		}
	}
	return items
}

// With a selection, the summary of the comparison with the hydraulic
// rating counts the gaugings the fit and the calibration take, not every
// gauging of the file: its geometric mean departure,
// 100·(exp(mean ln(Q/Qr)) − 1), and its count outside the bands, worked
// here from the per-gauging rated discharges and marks of the JSON report
// over the gaugings not excluded, are the text's and the workbook's, and
// both say that the others are left out. The per-gauging table still
// lists every gauging.
func TestFitComparisonSelected(t *testing.T) {
	t.Parallel()
	args := []string{fitDemoGaugings, "--section", fitDemoSurvey, "--slope", "0.0012", "--datum", "100", "--method", "lsq",
		"--period", "2021-01-01..", "--exclude", "2022-06-30T10:10"}
	doc := fitJSON(t, args...)
	var sum float64
	n, outside, left := 0, 0, 0
	for _, g := range doc["gaugings"].([]any) {
		m := g.(map[string]any)
		if m["excluded"] == true {
			left++
			continue
		}
		qr, ok := m["hydraulic"].(float64)
		if !ok {
			continue
		}
		n++
		sum += math.Log(m["discharge"].(float64) / qr)
		if m["hydraulic_outside_band"] == true {
			outside++
		}
	}
	if left == 0 || n == 0 {
		t.Fatalf("%d gaugings left out, %d compared: the case tests nothing", left, n)
	}
	mean := 100 * (math.Exp(sum/float64(n)) - 1)

	out, _, err := fitRun(t, append([]string{"fit"}, args...)...)
	if err != nil {
		t.Fatal(err)
	}
	want := fmt.Sprintf("Against the hydraulic rating, the gaugings selected only, as the fit and the calibration take them (%d left out, marked x): geometric mean departure %.1f %%, %d of %d compared outside their quality bands\n",
		left, mean, outside, n)
	if !strings.Contains(out, want) {
		t.Errorf("text, want %q:\n%s", want, out)
	}
	if rows := strings.Count(out, "\n  x "); rows != left {
		t.Errorf("%d gaugings marked x in the table, want %d", rows, left)
	}

	book := filepath.Join(t.TempDir(), "fit.xlsx")
	if _, errs, code := runCLI(t, append(append([]string{"fit"}, args...), "-o", book)...); code != 0 {
		t.Fatalf("workbook: exit %d: %s", code, errs)
	}
	items := summaryItems(t, book)
	if v, err := strconv.ParseFloat(items["geometric mean departure from the hydraulic rating"], 64); err != nil || math.Abs(v-mean) > 0.05 {
		t.Errorf("workbook: geometric mean departure %q, want %.1f", items["geometric mean departure from the hydraulic rating"], mean)
	}
	if v := items["gaugings outside their quality bands (hydraulic rating)"]; v != strconv.Itoa(outside) {
		t.Errorf("workbook: %s outside, want %d", v, outside)
	}
	if v, want := items["hydraulic rating compared over"], fmt.Sprintf("%d compared, %d left out", n, left); !strings.Contains(v, want) {
		t.Errorf("workbook: compared over %q, want %q", v, want)
	}
}

// The summary sheet of a fit workbook states the selection, as the text's
// selection line and the JSON's selection do: the count fitted, the rating
// period and the times excluded, at --utc-offset.
func TestFitWorkbookSelection(t *testing.T) {
	t.Parallel()
	book := filepath.Join(t.TempDir(), "fit.xlsx")
	args := []string{"fit", "testdata/period-boundary-gaugings.csv", "--method", "lsq", "--utc-offset", "-07:00",
		"--period", "2020-02-01..2023-06-21T10:00", "--exclude", "2021-05-06T11:00,2022-04-08T14:30", "-o", book}
	if _, errs, code := runCLI(t, args...); code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	items := summaryItems(t, book)
	// 26 gaugings before the boundary, less the first (before the period),
	// the one marked exclude and the two listed: 22 of 30.
	for item, want := range map[string]string{
		"selection":      "22 of 30 gaugings fitted",
		"rating period":  "from 2020-02-01T00:00:00-07:00 up to, not including, 2023-06-21T10:00:00-07:00",
		"times excluded": "2021-05-06T11:00:00-07:00, 2022-04-08T14:30:00-07:00",
	} {
		if !strings.HasPrefix(items[item], want) {
			t.Errorf("summary %q: %q, want %q", item, items[item], want)
		}
	}
}
