package main

import (
	"strings"
	"testing"
)

// rate --datum gives the hydraulic rating in gauge heights: the row at
// gauge height 2.5 on a gauge whose zero is at elevation 100 is the row
// at elevation 102.5 (elevation = gauge height + datum), and the report
// states the datum.
func TestRateDatum(t *testing.T) {
	t.Parallel()
	elev, _, code := runCLI(t, "rate", demoSurveyPath, "--slope", "0.001", "--stages", "102.5")
	if code != 0 {
		t.Fatal(code)
	}
	gauge, _, code := runCLI(t, "rate", demoSurveyPath, "--slope", "0.001", "--stages", "2.5", "--datum", "100")
	if code != 0 {
		t.Fatal(code)
	}
	el, gl := strings.Split(elev, "\n")[1], strings.Split(gauge, "\n")[1]
	if !strings.HasPrefix(gl, "2.5,") || strings.TrimPrefix(gl, "2.5,") != strings.TrimPrefix(el, "102.5,") {
		t.Errorf("gauge height row %q, elevation row %q", gl, el)
	}
	text, _, _ := runCLI(t, "rate", demoSurveyPath, "--slope", "0.001", "--datum", "100", "--format", "text")
	if !strings.Contains(text, "elevation = gauge height + 100 m") || !strings.Contains(text, "      0.300 ") {
		t.Errorf("text report:\n%s", text)
	}
}
