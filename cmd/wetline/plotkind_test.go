package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/survey"
)

// bwLadderCSV is an invented step-backwater rating in backwater's CSV
// columns (the subsection discharges left out): six discharges at one
// section, the first and the last two still depending on the boundary,
// the second at critical depth, the last above an end of the section.
const bwLadderCSV = `stage,depth,area,wetted_perimeter,top_width,hydraulic_radius,conveyance,discharge,mean_velocity,alpha,froude,flags
100.2,0.2,0.9,4.7,4.6,0.19,12.1,1,1.11,1,0.8,unsettled
100.4,0.4,1.9,5.4,5.2,0.35,28.8,3,1.58,1,1,critical_stage
100.6,0.6,3.0,6.1,5.8,0.49,51.0,6,2.00,1,0.89,
100.7,0.7,3.6,6.4,6.1,0.56,64.2,9,2.50,1,0.96,
100.8,0.8,4.2,6.8,6.4,0.62,78.3,12,2.86,1,0.99,unsettled
101.0,1.0,5.6,7.5,7.0,0.75,112.0,16,2.86,1,0.93,above_end unsettled
`

// TestPlotBackwaterFlags: plot of a saved step-backwater table says which
// rows carry backwater's flags (the figure marks them, as backwater's own
// figures do), where before nothing did.
func TestPlotBackwaterFlags(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	table := filepath.Join(dir, "xs1-bw.csv")
	if err := os.WriteFile(table, []byte(bwLadderCSV), 0o644); err != nil {
		t.Fatal(err)
	}
	_, errs, code := runCLI(t, "plot", table, "--units", "si", "-o", filepath.Join(dir, "figs"))
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	want := "warning: " + table + ": rows flagged in the table: 3 unsettled at 100.20 and 100.80 to 101.00 m (ringed: still depending on the boundary); " +
		"1 critical_stage at 100.40 m (crossed: stage at critical depth); 1 above_end at 101.00 m (squares: above an end of the section)"
	if !strings.Contains(errs, want) {
		t.Errorf("stderr:\n%s\nwant:\n%s", errs, want)
	}
	tab, err := survey.ReadRatingCSV(table, "", survey.UnitChoice{})
	if err != nil || tab.Kind != rating.KindBackwater {
		t.Errorf("kind %q (%v), want %q", tab.Kind, err, rating.KindBackwater)
	}
}
