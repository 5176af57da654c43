package main

import (
	"go/ast"
	"go/parser"
	"go/token"
	"io/fs"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"
)

// developersPath is the contributor guide at the top of the module.
const developersPath = moduleRoot + "/DEVELOPERS.md"

// goDecls are the declarations of the module's Go files, as the manuals
// may cite them.
type goDecls struct {
	// tests are the names of the Test, Benchmark, Fuzz and Example
	// functions of every package.
	tests map[string]bool
	// pkgs maps a package's import path below the module ("rating/gauged")
	// and its name ("gauged") to its top-level identifiers.
	pkgs map[string]map[string]bool
	// members maps a package to its types and each type to its methods
	// and struct fields.
	members map[string]map[string]map[string]bool
	// types maps a type's name to the packages declaring it.
	types map[string][]string
}

// readGoDecls parses every Go file of the module (tests too) and collects
// its declarations.
func readGoDecls(t *testing.T) goDecls {
	t.Helper()
	d := goDecls{tests: map[string]bool{}, pkgs: map[string]map[string]bool{},
		members: map[string]map[string]map[string]bool{}, types: map[string][]string{}}
	fset := token.NewFileSet()
	err := filepath.WalkDir(moduleRoot, func(path string, e fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if e.IsDir() && (e.Name() == "testdata" || strings.HasPrefix(e.Name(), ".")) && path != moduleRoot {
			return filepath.SkipDir
		}
		if e.IsDir() || !strings.HasSuffix(path, ".go") {
			return nil
		}
		f, err := parser.ParseFile(fset, path, nil, parser.SkipObjectResolution)
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(moduleRoot, filepath.Dir(path))
		pkg := filepath.ToSlash(rel)
		if d.pkgs[pkg] == nil {
			d.pkgs[pkg] = map[string]bool{}
			d.pkgs[filepath.Base(pkg)] = d.pkgs[pkg]
			d.members[pkg] = map[string]map[string]bool{}
		}
		top, members := d.pkgs[pkg], d.members[pkg]
		member := func(typ, name string) {
			if members[typ] == nil {
				members[typ] = map[string]bool{}
			}
			members[typ][name] = true
		}
		for _, decl := range f.Decls {
			switch decl := decl.(type) {
			case *ast.FuncDecl:
				if decl.Recv == nil {
					top[decl.Name.Name] = true
					if strings.HasSuffix(path, "_test.go") {
						d.tests[decl.Name.Name] = true
					}
					continue
				}
				member(receiverType(decl.Recv.List[0].Type), decl.Name.Name)
			case *ast.GenDecl:
				for _, spec := range decl.Specs {
					switch spec := spec.(type) {
					case *ast.TypeSpec:
						top[spec.Name.Name] = true
						d.types[spec.Name.Name] = append(d.types[spec.Name.Name], pkg)
						member(spec.Name.Name, "") // a type with no members is still a type
						if st, ok := spec.Type.(*ast.StructType); ok {
							for _, field := range st.Fields.List {
								for _, n := range field.Names {
									member(spec.Name.Name, n.Name)
								}
								if len(field.Names) == 0 { // embedded
									member(spec.Name.Name, receiverType(field.Type))
								}
							}
						}
					case *ast.ValueSpec:
						for _, n := range spec.Names {
							top[n.Name] = true
						}
					}
				}
			}
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return d
}

// receiverType names the type of a receiver or an embedded field: T, *T,
// T[P] and pkg.T give T.
func receiverType(e ast.Expr) string {
	switch e := e.(type) {
	case *ast.StarExpr:
		return receiverType(e.X)
	case *ast.IndexExpr:
		return receiverType(e.X)
	case *ast.IndexListExpr:
		return receiverType(e.X)
	case *ast.SelectorExpr:
		return e.Sel.Name
	case *ast.Ident:
		return e.Name
	}
	return ""
}

// docTestName matches the name of a test, benchmark, fuzz target or
// example a manual cites.
var docTestName = regexp.MustCompile(`\b(?:Test|Benchmark|Fuzz|Example)[A-Z_][A-Za-z0-9_]*`)

// docPlaceholder matches a name standing for a kind of names, as
// DEVELOPERS.md writes them: a capital X closing it after a lower-case
// letter (FuzzX, plotting.DrawX, ErrX).
var docPlaceholder = regexp.MustCompile(`[a-z]X$`)

// TestManualsCiteExistingTests checks every test, benchmark, fuzz target
// and example that DEVELOPERS.md and README.md name is defined in the
// module, so a renamed or removed test does not leave the manuals citing
// it.
func TestManualsCiteExistingTests(t *testing.T) {
	t.Parallel()
	d := readGoDecls(t)
	if len(d.tests) < 100 {
		t.Fatalf("found %d test functions: the tree is not being read", len(d.tests))
	}
	for _, path := range []string{developersPath, readmePath} {
		b, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		for _, name := range slices.Compact(slices.Sorted(slices.Values(docTestName.FindAllString(string(b), -1)))) {
			if !d.tests[name] && !docPlaceholder.MatchString(name) {
				t.Errorf("%s cites %s, which no test file of the module defines", filepath.Base(path), name)
			}
		}
	}
}

// docCode matches a code span of a manual.
var docCode = regexp.MustCompile("`([^`\n]+)`")

// docSelector matches a qualified Go name in a code span: pkg.Name,
// pkg.Type.Member, path/pkg.Name or Type.Member.
var docSelector = regexp.MustCompile(`(?:^|[^\w./])([A-Za-z_][\w/]*)\.([A-Za-z_]\w*)(?:\.([A-Za-z_]\w*))?`)

// fileSuffixes are the endings that make a dotted name a file's, not Go.
var fileSuffixes = map[string]bool{"go": true, "md": true, "mod": true, "sum": true, "csv": true,
	"xlsx": true, "png": true, "json": true, "txt": true, "golden": true, "tmp": true, "lock": true,
	"tmpdir": true, "old": true, "bak": true}

// TestDevelopersNamesExist checks the Go names DEVELOPERS.md writes in
// code spans qualified (pkg.Name, pkg.Type.Member, Type.Member) are
// declared in the module: a package's identifier, a type's method or
// field. A qualifier that is neither one of the module's packages nor a
// type (a variable such as fs or e) is not checked.
func TestDevelopersNamesExist(t *testing.T) {
	t.Parallel()
	d := readGoDecls(t)
	b, err := os.ReadFile(developersPath)
	if err != nil {
		t.Fatal(err)
	}
	hasMember := func(pkgs []string, typ, name string) bool {
		for _, p := range pkgs {
			if d.members[p][typ][name] {
				return true
			}
		}
		return false
	}
	checked := 0
	for _, span := range docCode.FindAllStringSubmatch(string(b), -1) {
		for _, m := range docSelector.FindAllStringSubmatch(span[1], -1) {
			x, y, z := m[1], m[2], m[3]
			if fileSuffixes[y] || docPlaceholder.MatchString(y) {
				continue
			}
			if top, ok := d.pkgs[x]; ok {
				checked++
				path := x
				if d.members[path] == nil { // a package's name: find its path
					for p := range d.members {
						if filepath.Base(p) == x {
							path = p
						}
					}
				}
				switch {
				case !top[y]:
					t.Errorf("DEVELOPERS.md: `%s` names %s.%s, which package %s does not declare", span[1], x, y, path)
				case z != "" && d.members[path][y] != nil && !d.members[path][y][z]:
					t.Errorf("DEVELOPERS.md: `%s` names %s.%s.%s, which type %s of %s has no member %s", span[1], x, y, z, y, path, z)
				}
				continue
			}
			if pkgs := d.types[x]; len(pkgs) > 0 {
				checked++
				if !hasMember(pkgs, x, y) {
					t.Errorf("DEVELOPERS.md: `%s` names %s.%s, and no type %s of the module has a method or field %s", span[1], x, y, x, y)
				}
			}
		}
	}
	t.Logf("%d qualified names checked", checked)
	if checked < 30 {
		t.Fatalf("checked %d qualified names of DEVELOPERS.md: its code spans are not being read", checked)
	}
}

// TestCLITestsRunInParallel checks every test of this package calls
// t.Parallel() among its first statements, as DEVELOPERS.md says, but a
// test that sets the environment (t.Setenv), which testing refuses in a
// parallel test.
func TestCLITestsRunInParallel(t *testing.T) {
	t.Parallel()
	files, err := filepath.Glob("*_test.go")
	if err != nil {
		t.Fatal(err)
	}
	fset := token.NewFileSet()
	seen := 0
	for _, path := range files {
		f, err := parser.ParseFile(fset, path, nil, parser.SkipObjectResolution)
		if err != nil {
			t.Fatal(err)
		}
		for _, decl := range f.Decls {
			fn, ok := decl.(*ast.FuncDecl)
			if !ok || fn.Recv != nil || !strings.HasPrefix(fn.Name.Name, "Test") || fn.Name.Name == "TestMain" {
				continue
			}
			seen++
			calls := func(name string, within []ast.Stmt) bool {
				found := false
				for _, s := range within {
					ast.Inspect(s, func(n ast.Node) bool {
						if c, ok := n.(*ast.CallExpr); ok {
							if sel, ok := c.Fun.(*ast.SelectorExpr); ok && sel.Sel.Name == name {
								if id, ok := sel.X.(*ast.Ident); ok && id.Name == "t" {
									found = true
								}
							}
						}
						return !found
					})
				}
				return found
			}
			body := fn.Body.List
			first := body[:min(len(body), 2)]
			switch {
			case calls("Setenv", body):
				if calls("Parallel", first) {
					t.Errorf("%s: %s calls t.Parallel and t.Setenv, which testing refuses together", fset.Position(fn.Pos()), fn.Name.Name)
				}
			case !calls("Parallel", first):
				t.Errorf("%s: %s does not call t.Parallel() first", fset.Position(fn.Pos()), fn.Name.Name)
			}
		}
	}
	if seen < 100 {
		t.Fatalf("found %d tests: the test files are not being read", seen)
	}
}

// trialWord matches "trial" in a comment with the word after it.
var trialWord = regexp.MustCompile(`(?i)\btrials?('s)?\b(\s+\S+)?`)

// trialUses are the words that make "trial" the numerical term (a trial
// stage of an iteration, the trials of a binomial count), not the
// project's history.
var trialUses = map[string]bool{"stage": true, "position": true, "positions": true, "stages": true, "offset": true, "offsets": true, "value": true, "values": true,
	"point": true, "points": true, "set": true, "sets": true, "breakpoint": true, "breakpoints": true, "starting": true,
	"zero-flow": true, "and": true}

// TestCommentsSpeakOfTheProject checks the comments of the module's Go
// files speak of the project alone: no session, and "trial" only as the
// numerical term (trialUses), never a run or user of the program that a
// test's case came from; a comment describes the case itself.
func TestCommentsSpeakOfTheProject(t *testing.T) {
	t.Parallel()
	fset := token.NewFileSet()
	session := regexp.MustCompile(`(?i)\bsessions?\b`)
	seen := 0
	err := filepath.WalkDir(moduleRoot, func(path string, e fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if e.IsDir() && (e.Name() == "testdata" || strings.HasPrefix(e.Name(), ".")) && path != moduleRoot {
			return filepath.SkipDir
		}
		if e.IsDir() || !strings.HasSuffix(path, ".go") || strings.HasSuffix(filepath.ToSlash(path), "cmd/wetline/devdocs_test.go") {
			return nil // this file names the words it looks for
		}
		f, err := parser.ParseFile(fset, path, nil, parser.ParseComments|parser.SkipObjectResolution)
		if err != nil {
			return err
		}
		for _, g := range f.Comments {
			seen++
			text := g.Text()
			if session.MatchString(text) {
				t.Errorf("%s: a comment speaks of a session: %q", fset.Position(g.Pos()), strings.TrimSpace(text))
			}
			for _, m := range trialWord.FindAllStringSubmatch(text, -1) {
				next := strings.Trim(strings.ToLower(strings.TrimSpace(m[2])), ".,;:()")
				if m[1] != "" || !trialUses[next] {
					t.Errorf("%s: a comment speaks of a trial (%q): describe the case itself", fset.Position(g.Pos()), strings.TrimSpace(m[0]))
				}
			}
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if seen < 1000 {
		t.Fatalf("read %d comments: the tree is not being read", seen)
	}
}
