package main

import (
	"bytes"
	"image/png"
	"os"
	"path/filepath"
	"testing"
)

// readmeFigures are the demo's figures the README shows, copied from a
// demo run into testdata/readme with -update, so the README never shows a
// figure the program no longer draws.
var readmeFigures = [...]string{"tallow-fit.png", "tallow-xs1-section.png", "tallow-backwater-rating.png", "tallow-stage-2025-hydrograph.png"}

// TestReadmeFigures keeps the README's figures those of the demo: with
// -update it copies them from a demo run; without, it checks each is a
// PNG of the size the demo draws.
func TestReadmeFigures(t *testing.T) {
	t.Parallel()
	dir, _ := demoOutput(t)
	for _, name := range readmeFigures {
		fresh, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		path := filepath.Join("testdata", "readme", name)
		if *update {
			if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
				t.Fatal(err)
			}
			if err := os.WriteFile(path, fresh, 0o644); err != nil {
				t.Fatal(err)
			}
			continue
		}
		kept, err := os.ReadFile(path)
		if err != nil {
			t.Fatalf("%v (run go test ./cmd/wetline -run ReadmeFigures -update)", err)
		}
		a, err := png.DecodeConfig(bytes.NewReader(fresh))
		if err != nil {
			t.Fatal(err)
		}
		b, err := png.DecodeConfig(bytes.NewReader(kept))
		if err != nil {
			t.Fatalf("%s: %v", path, err)
		}
		if a.Width != b.Width || a.Height != b.Height {
			t.Errorf("%s is %d×%d, the demo draws %d×%d: run with -update", path, b.Width, b.Height, a.Width, a.Height)
		}
	}
}
