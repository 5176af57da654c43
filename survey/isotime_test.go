package survey

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// TestReadGaugingsAt: a time written without an offset is read at the
// offset given; one written with an offset keeps its instant.
func TestReadGaugingsAt(t *testing.T) {
	t.Parallel()
	path := filepath.Join(t.TempDir(), "g.csv")
	const in = "time,stage,discharge\n2024-05-01T10:00,0.8,3\n2024-05-01T10:00Z,0.9,4\n2024-05-02,1.0,5\n"
	if err := os.WriteFile(path, []byte(in), 0o644); err != nil {
		t.Fatal(err)
	}
	gs, err := ReadGaugingsAt(path, "", 10*time.Hour)
	if err != nil {
		t.Fatal(err)
	}
	want := []time.Time{
		time.Date(2024, 5, 1, 0, 0, 0, 0, time.UTC),
		time.Date(2024, 5, 1, 10, 0, 0, 0, time.UTC),
		time.Date(2024, 5, 1, 14, 0, 0, 0, time.UTC),
	}
	for i, w := range want {
		if !gs.Gaugings[i].Time.Equal(w) {
			t.Errorf("gauging %d at %v, want %v", i+1, gs.Gaugings[i].Time, w)
		}
	}
	// Read as UTC, the first two rows would be the same instant.
	if _, err := ReadGaugings(path, ""); err == nil || !strings.Contains(err.Error(), "g.csv:3:1") {
		t.Errorf("ReadGaugings: %v", err)
	}
	if _, err := ReadGaugingsAt(path, "", 15*time.Hour); err == nil || !strings.Contains(err.Error(), "UTC offset") {
		t.Errorf("offset out of range: %v", err)
	}
}
