package survey

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// TestReadGaugingsAt: a time written without an offset is read at the
// offset given (ReadGaugings reads it as UTC); one written with an offset
// keeps its instant.
func TestReadGaugingsAt(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	for _, tc := range []struct {
		name, in string
		want     []time.Time
	}{
		{"local.csv", "time,stage,discharge\n2024-05-01T10:00,0.8,3\n2024-05-02,1.0,5\n",
			[]time.Time{time.Date(2024, 5, 1, 0, 0, 0, 0, time.UTC), time.Date(2024, 5, 1, 14, 0, 0, 0, time.UTC)}},
		{"zoned.csv", "time,stage,discharge\n2024-05-01T10:00Z,0.9,4\n2024-05-02T00:00+02:00,1.0,5\n",
			[]time.Time{time.Date(2024, 5, 1, 10, 0, 0, 0, time.UTC), time.Date(2024, 5, 1, 22, 0, 0, 0, time.UTC)}},
	} {
		path := filepath.Join(dir, tc.name)
		if err := os.WriteFile(path, []byte(tc.in), 0o644); err != nil {
			t.Fatal(err)
		}
		gs, err := ReadGaugingsAt(path, "", 10*time.Hour)
		if err != nil {
			t.Fatal(err)
		}
		for i, w := range tc.want {
			if !gs.Gaugings[i].Time.Equal(w) {
				t.Errorf("%s: gauging %d at %v, want %v", tc.name, i+1, gs.Gaugings[i].Time, w)
			}
		}
	}
	path := filepath.Join(dir, "local.csv")
	if gs, err := ReadGaugings(path, ""); err != nil || !gs.Gaugings[0].Time.Equal(time.Date(2024, 5, 1, 10, 0, 0, 0, time.UTC)) {
		t.Errorf("ReadGaugings: %+v, %v; want the first at 10:00Z", gs.Gaugings, err)
	}
	if _, err := ReadGaugingsAt(path, "", 15*time.Hour); err == nil || !strings.Contains(err.Error(), "UTC offset") {
		t.Errorf("offset out of range: %v", err)
	}
}
