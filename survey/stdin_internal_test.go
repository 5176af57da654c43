package survey

import (
	"os"
	"path/filepath"
	"testing"
)

// TestStdinReadOnce: standard input sniffed, then read as a table, then
// read again, gives the same table each time: it is read once and kept.
// Not parallel: it replaces os.Stdin.
func TestStdinReadOnce(t *testing.T) {
	path := filepath.Join(t.TempDir(), "in.csv")
	if err := os.WriteFile(path, []byte("stage,discharge\n0.5,1.2\n1.0,4.5\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	saved := os.Stdin
	os.Stdin = f
	stdin = stdinBuffer{}
	t.Cleanup(func() { os.Stdin, stdin = saved, stdinBuffer{} })

	sn, err := SniffCSV(Stdin)
	if err != nil || sn.Other != "a rating table" {
		t.Fatalf("SniffCSV(-) = %+v, %v; want a rating table", sn, err)
	}
	for i := range 2 {
		tab, err := ReadTable(Stdin, "")
		if err != nil {
			t.Fatalf("read %d: %v", i+1, err)
		}
		if KindOf(tab) != KindRating || len(tab.Records) != 2 {
			t.Errorf("read %d: kind %v, %d rows; want a rating of 2 rows", i+1, KindOf(tab), len(tab.Records))
		}
	}
}
