package survey

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
)

// longLines are CSV tables with one record longer than MaxLineBytes, and
// the line it starts on.
func longLines() []struct {
	name string
	data []byte
	line int
} {
	over := MaxLineBytes + 1
	return []struct {
		name string
		data []byte
		line int
	}{
		{"commas", []byte("time,stage\n2026-06-01T00:00Z,1.2\n" + strings.Repeat(",", over) + "\n"), 3},
		{"long cell", []byte("time,stage,note\n2026-06-01T00:00Z,1.2," + strings.Repeat("x", over) + "\n"), 2},
		{"quoted cell over lines", []byte("# site: invented\ntime,stage,note\n2026-06-01T00:00Z,1.2,\"" +
			strings.Repeat("a line of a note\n", over/17+1) + "\"\n"), 3},
		{"no line end", []byte("time,stage\n" + strings.Repeat("1", over)), 2},
	}
}

// A record longer than MaxLineBytes is refused at the line it starts on,
// by the table reader and by the stage record's stream, before its fields
// are split; a record of MaxLineBytes is read.
func TestLongLineRefused(t *testing.T) {
	dir := t.TempDir()
	for _, c := range longLines() {
		path := filepath.Join(dir, strings.ReplaceAll(c.name, " ", "-")+".csv")
		if err := os.WriteFile(path, c.data, 0o644); err != nil {
			t.Fatal(err)
		}
		_, terr := ReadTable(path, "")
		_, serr := ParseStageRecord(bytes.NewReader(c.data), path, StageRecordOptions{})
		for reader, err := range map[string]error{"table": terr, "stream": serr} {
			var pe *ParseError
			if !errors.Is(err, ErrLongLine) || !errors.As(err, &pe) || pe.File != path || pe.Row != c.line {
				t.Errorf("%s (%s): %v, want ErrLongLine at %s:%d", c.name, reader, err, path, c.line)
			}
		}
	}
	fits := []byte("time,stage,note\n2026-06-01T00:00Z,1.2,\"" + strings.Repeat("x", MaxLineBytes-len("2026-06-01T00:00Z,1.2,\"\"")) + "\"\n")
	tab, err := ParseCSV(bytes.NewReader(fits), "fits.csv")
	if err != nil || len(tab.Records) != 1 {
		t.Errorf("a record of MaxLineBytes: %v, want it read", err)
	}
	if _, err := ParseStageRecord(bytes.NewReader(fits), "fits.csv", StageRecordOptions{}); err != nil {
		t.Errorf("a record of MaxLineBytes (stream): %v, want it read", err)
	}
}

// allocated returns the bytes f allocates.
func allocated(f func()) uint64 {
	var before, after runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&before)
	f()
	runtime.ReadMemStats(&after)
	return after.TotalAlloc - before.TotalAlloc
}

// One line of 16 million commas is refused for the memory of its bytes,
// not of its fields: splitting it took over 50 bytes a comma (24-byte
// field headers, more than once), 2.4 GB for a 30 MB file.
func TestLongLineMemory(t *testing.T) {
	if raceEnabled {
		t.Skip("the race detector's shadow memory inflates allocation; the bound holds for the program as built")
	}
	const size = 16 << 20
	data := []byte("time,stage\n2026-06-01T00:00Z,1.2\n" + strings.Repeat(",", size) + "\n")
	path := filepath.Join(t.TempDir(), "commas.csv")
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	var err error
	table := allocated(func() { _, err = ReadTable(path, "") })
	if !errors.Is(err, ErrLongLine) {
		t.Fatalf("table: %v, want ErrLongLine", err)
	}
	// The file is read whole once; its bytes are all the reader keeps.
	if limit := uint64(2 * len(data)); table > limit {
		t.Errorf("table: allocated %d bytes for a %d-byte file, want at most %d", table, len(data), limit)
	}
	stream := allocated(func() { _, err = ParseStageRecord(bytes.NewReader(data), path, StageRecordOptions{}) })
	if !errors.Is(err, ErrLongLine) {
		t.Fatalf("stream: %v, want ErrLongLine", err)
	}
	// The stream holds a line of at most MaxLineBytes and its buffer.
	if limit := uint64(8 * MaxLineBytes); stream > limit {
		t.Errorf("stream: allocated %d bytes, want at most %d", stream, limit)
	}
}
