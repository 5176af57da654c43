package survey

import (
	"os"
	"path/filepath"
	"testing"
)

// SniffCSV tells the tables of the other commands from a survey by their
// headers (the columns of README's input table): a batch over a folder
// skips them rather than failing them as surveys.
func TestSniffCSV(t *testing.T) {
	for _, tc := range []struct {
		name, text, other string
	}{
		{"survey", "station,elevation,n\n0,104,0.04\n10,100,0.04\n", ""},
		{"survey with a time column", "station,elevation,time\n0,104,2025-01-01\n10,100,2025-01-01\n", ""},
		{"reach table", "section,survey,distance\nA,a.csv,0\n", "a reach table"},
		{"gaugings", "time,stage,discharge\n2025-01-01,101,3\n", "a table of gaugings"},
		{"rating table", "stage,discharge\n100,0\n101,3\n", "a rating table"},
		{"shift diagrams", "# accepted shifts\ntime,stage,shift,taper,abrupt,note\n2024-10-09T10:30,0.65,0.000,1.3,,visit 1\n", "a table of shift diagrams"},
		{"shift diagrams by gauge height", "time,gauge_height (m),shift (m)\n2024-10-09T10:30,0.65,0.01\n", "a table of shift diagrams"},
		{"stage record", "# 15-minute readings\ntime,stage (m)\n2024-10-01T00:00,0.655\n2024-10-01T00:15,0.654\n", "a stage record"},
		{"stage record by gauge height", "time,gauge_height,quality\n2024-10-01T00:00,0.655,good\n", "a stage record"},
		{"unknown", "a,b\n1,2\n", ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			path := filepath.Join(t.TempDir(), "t.csv")
			if err := os.WriteFile(path, []byte(tc.text), 0o644); err != nil {
				t.Fatal(err)
			}
			sn, err := SniffCSV(path)
			if err != nil {
				t.Fatal(err)
			}
			if sn.Other != tc.other {
				t.Errorf("Other = %q, want %q", sn.Other, tc.other)
			}
		})
	}
}
