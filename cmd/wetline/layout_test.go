package main

import (
	"go/parser"
	"go/token"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// moduleRoot is the top of the module, seen from this package.
const moduleRoot = "../.."

// layers ranks the packages of the module: a package may import only
// packages of a lower rank (or its own sub-packages' peers below it), tests
// included. This is the design's import rule: subdivide imports nothing of
// ours; rating and its sub-packages import subdivide; survey and plotting
// import those; the writers import survey; cmd wires.
var layers = map[string]int{
	"subdivide":       0,
	"rating":          1,
	"rating/reach":    2,
	"rating/gauged":   2,
	"rating/record":   3,
	"survey/workbook": 0,
	"survey/output":   0,
	"survey":          4,
	"plotting":        4,
	"survey/results":  5,
	"survey/rate":     6,
	"survey/batch":    7,
	"cmd/wetline":     8,
}

// TestImportDirection reads the imports of every Go file of the module
// and checks each goes down the layers.
func TestImportDirection(t *testing.T) {
	t.Parallel()
	fset := token.NewFileSet()
	err := filepath.WalkDir(moduleRoot, func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.IsDir() && (d.Name() == "testdata" || strings.HasPrefix(d.Name(), ".")) && path != moduleRoot {
			return filepath.SkipDir
		}
		if d.IsDir() || !strings.HasSuffix(path, ".go") {
			return nil
		}
		rel, _ := filepath.Rel(moduleRoot, filepath.Dir(path))
		pkg := filepath.ToSlash(rel)
		rank, ok := layers[pkg]
		if !ok {
			t.Errorf("%s: package %s has no place in the layers of this test", path, pkg)
			return nil
		}
		f, err := parser.ParseFile(fset, path, nil, parser.ImportsOnly)
		if err != nil {
			return err
		}
		for _, im := range f.Imports {
			p, _ := strconv.Unquote(im.Path.Value)
			dep, ours := strings.CutPrefix(p, "wetline/")
			if !ours || dep == pkg {
				continue
			}
			if r, ok := layers[dep]; !ok || r >= rank {
				t.Errorf("%s: %s imports %s, which is not below it", path, pkg, dep)
			}
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
}

// TestTopLevel keeps the top of the repository to its fixed list.
func TestTopLevel(t *testing.T) {
	t.Parallel()
	allowed := map[string]bool{"cmd": true, "survey": true, "rating": true, "subdivide": true, "plotting": true,
		"testdata": true, "go.mod": true, "go.sum": true, "README.md": true, "DEVELOPERS.md": true}
	ents, err := os.ReadDir(moduleRoot)
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range ents {
		// wetline and demo-out are a local build and demo run (ignored by git).
		if n := e.Name(); !allowed[n] && !strings.HasPrefix(n, ".") && n != "demo-out" && n != "wetline" {
			t.Errorf("%s at the top of the repository: the top level is fixed", n)
		}
	}
}
