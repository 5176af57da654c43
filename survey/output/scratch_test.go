package output

import (
	"fmt"
	"os"
	"path/filepath"
	"testing"
	"time"
)

// Only scratch folders of ended runs, marked, older than the age, are
// removed; anything else of that name or elsewhere is left alone.
func TestCleanScratch(t *testing.T) {
	dir := t.TempDir()
	mine, err := NewScratch(dir)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(mine, ScratchMark)); err != nil {
		t.Fatalf("no mark: %v", err)
	}
	old := time.Now().Add(-48 * time.Hour)
	mk := func(name string, mark bool, when time.Time) string {
		p := filepath.Join(dir, name)
		if err := os.Mkdir(p, 0o755); err != nil {
			t.Fatal(err)
		}
		if mark {
			writeString(t, filepath.Join(p, ScratchMark), "")
		}
		if err := os.Chtimes(p, when, when); err != nil {
			t.Fatal(err)
		}
		return p
	}
	const ended = 999999999 // a process id that cannot be running
	stale := mk(fmt.Sprintf("%s%d-123", ScratchPrefix, ended), true, old)
	kept := []string{
		mk(fmt.Sprintf("%s%d-456", ScratchPrefix, ended), false, old),       // no mark
		mk(fmt.Sprintf("%s%d-789", ScratchPrefix, ended), true, time.Now()), // recent
		mk(fmt.Sprintf("%s%d-abc", ScratchPrefix, os.Getpid()), true, old),  // its run goes on
		mk("wetline-12345", true, old),                                      // not named as ours
		mk(fmt.Sprintf("%sx-1", ScratchPrefix), true, old),                  // no process id
	}
	if err := os.Chtimes(mine, old, old); err != nil {
		t.Fatal(err)
	}
	kept = append(kept, mine) // this process runs
	got := CleanScratch(dir, ScratchAge, time.Now())
	if fmt.Sprint(got) != fmt.Sprint([]string{stale}) {
		t.Errorf("removed %v, want %v", got, []string{stale})
	}
	for _, p := range kept {
		if _, err := os.Stat(p); err != nil {
			t.Errorf("%s removed", p)
		}
	}
}
