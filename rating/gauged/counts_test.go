package gauged_test

import (
	"strings"
	"testing"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
)

// Messages that count agree with the count: one gauging is "1 gauging",
// not "1 gaugings".
func TestFewGaugingsCounted(t *testing.T) {
	gs := []gauged.Gauging{{Time: time.Date(2024, 1, 1, 0, 0, 0, 0, time.UTC), Stage: 1, Discharge: 2, Quality: rating.Good}}
	_, err := gauged.FitControls(gs, gauged.ControlOptions{Units: rating.SI})
	if err == nil || !strings.Contains(err.Error(), "1 gauging used for ") || strings.Contains(err.Error(), "1 gaugings") {
		t.Errorf("err = %v, want one counting 1 gauging", err)
	}
}
