package main

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"image/png"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"sort"
	"strings"
	"testing"

	"wetline/survey"
)

// readmeFigures are the demo's figures the README shows, copied from a
// demo run into testdata/readme with -update, so the README never shows a
// figure the program no longer draws.
var readmeFigures = [...]string{
	"tallow-xs1-section.png", "tallow-xs1-rating.png", "tallow-fit.png", "reach-brindle-profile.png",
	"tallow-stage-2025-hydrograph.png",
}

// readmePath is the README at the top of the module.
const readmePath = moduleRoot + "/README.md"

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

// readme returns the README's text.
func readme(t *testing.T) string {
	t.Helper()
	b, err := os.ReadFile(readmePath)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// readmeImage matches an image of the README: its path.
var readmeImage = regexp.MustCompile(`!\[[^\]]*\]\(([^)]+)\)`)

// TestReadmeShowsOnlyDemoFigures checks every image of the README is one
// of readmeFigures, and every one of them is shown.
func TestReadmeShowsOnlyDemoFigures(t *testing.T) {
	t.Parallel()
	shown := map[string]bool{}
	for _, m := range readmeImage.FindAllStringSubmatch(readme(t), -1) {
		name, ok := strings.CutPrefix(m[1], "cmd/wetline/testdata/readme/")
		if !ok || !slices.Contains(readmeFigures[:], name) {
			t.Errorf("README shows %s, which is not a demo figure of readmeFigures", m[1])
		}
		shown[name] = true
	}
	for _, name := range readmeFigures {
		if !shown[name] {
			t.Errorf("readmeFigures holds %s, which the README does not show", name)
		}
	}
}

// builtinCommands are the commands run handles itself, outside the table.
var builtinCommands = [...]string{"help", "version", "completion"}

// TestManualsListEveryCommand checks the README has a section for every
// command and the go doc manual (doc.go) lists every command.
func TestManualsListEveryCommand(t *testing.T) {
	t.Parallel()
	text := readme(t)
	doc, err := os.ReadFile("doc.go")
	if err != nil {
		t.Fatal(err)
	}
	names := slices.Collect(func(yield func(string) bool) {
		for n := range commandTable() {
			if !yield(n) {
				return
			}
		}
	})
	names = append(names, builtinCommands[:]...)
	for _, n := range names {
		if !regexp.MustCompile(`(?m)^### .*\bwetline ` + n + `\b`).MatchString(text) {
			t.Errorf("README has no section ### wetline %s", n)
		}
		if !regexp.MustCompile(`(?m)^//\t` + n + ` `).Match(doc) {
			t.Errorf("doc.go does not list the command %s", n)
		}
	}
}

// helpFlagLine matches a flag line of a command's help: shorthand, name and
// argument.
var helpFlagLine = regexp.MustCompile(`(?m)^  (?:-(\w), )?--([a-z0-9-]+)(?: (NUM|LIST|TEXT))?(?:\s|$)`)

// cliFlags are a command's flags as its help lists them: each long name
// (and "-x" shorthand, mapped to its long name) and whether it takes a
// value.
type cliFlags struct {
	long  map[string]bool   // name → takes a value
	short map[string]string // shorthand → name
}

// readmeCommandFlags reads the flags of every command from its help.
func readmeCommandFlags(t *testing.T) map[string]cliFlags {
	t.Helper()
	all := map[string]cliFlags{}
	for name := range commandTable() {
		out, errs, code := runCLI(t, name, "--help")
		if code != 0 {
			t.Fatalf("%s --help: exit %d: %s", name, code, errs)
		}
		f := cliFlags{long: map[string]bool{}, short: map[string]string{}}
		for _, m := range helpFlagLine.FindAllStringSubmatch(out, -1) {
			f.long[m[2]] = m[3] != ""
			if m[1] != "" {
				f.short[m[1]] = m[2]
			}
		}
		all[name] = f
	}
	return all
}

// readmeFlag matches a long flag written in the README.
var readmeFlag = regexp.MustCompile("(?:^|[\\s`(\\[|])--([a-z][a-z0-9-]*)")

// TestReadmeFlagsExist checks every flag the README names exists: the
// flags of a usage block (a code block line starting "wetline COMMAND")
// on that command, every other on some command.
func TestReadmeFlagsExist(t *testing.T) {
	t.Parallel()
	flags := readmeCommandFlags(t)
	text := readme(t)
	for _, u := range readmeCodeLines(text, everyBlock) {
		words := strings.Fields(u)
		f, ok := flags[words[1]]
		if !ok {
			continue // help, version, completion
		}
		for _, m := range readmeFlag.FindAllStringSubmatch(u, -1) {
			if _, ok := f.long[m[1]]; !ok && m[1] != "help" {
				t.Errorf("README: wetline %s has no flag --%s (in %q)", words[1], m[1], u)
			}
		}
	}
	for _, m := range readmeFlag.FindAllStringSubmatch(text, -1) {
		found := m[1] == "help" || m[1] == "version"
		for _, f := range flags {
			_, ok := f.long[m[1]]
			found = found || ok
		}
		if !found {
			t.Errorf("README names --%s, which no command has", m[1])
		}
	}
}

// Kinds of README code block readmeCodeLines reads.
const (
	everyBlock    = ""      // every code block
	runnableBlock = "sh"    // the sh blocks: examples that run in the demo folder
	synopsisBlock = "usage" // the other blocks: a command's synopsis
)

// readmeCodeLines returns the commands of the README's code blocks of a
// kind (everyBlock, runnableBlock or synopsisBlock): lines starting
// "wetline " (a "$ " prompt dropped, continuation lines joined: after a
// backslash, or indented under a usage line).
func readmeCodeLines(text, kind string) []string {
	var out []string
	in, sh, usage := false, false, false
	var cont string
	for _, line := range strings.Split(text, "\n") {
		if strings.HasPrefix(line, "```") {
			in, sh, usage = !in, strings.TrimPrefix(line, "```") == "sh", false
			continue
		}
		if !in || (kind == runnableBlock && !sh) || (kind == synopsisBlock && sh) {
			continue
		}
		if usage && !sh && strings.HasPrefix(line, " ") {
			out[len(out)-1] += " " + strings.TrimSpace(line)
			continue
		}
		usage = false
		line = strings.TrimSpace(line)
		if cont != "" {
			line, cont = cont+" "+line, ""
		}
		if strings.HasSuffix(line, `\`) {
			cont = strings.TrimSuffix(line, `\`)
			continue
		}
		line = strings.TrimPrefix(line, "$ ")
		if strings.HasPrefix(line, "wetline ") {
			out = append(out, line)
			usage = true
		}
	}
	return out
}

// shellWords splits a README command into words: spaces separate them,
// double quotes group them, and " # " starts a comment.
func shellWords(line string) []string {
	var words []string
	var w strings.Builder
	quoted, started := false, false
	for i := 0; i < len(line); i++ {
		c := line[i]
		switch {
		case c == '"':
			quoted, started = !quoted, true
		case c == ' ' && !quoted:
			if started {
				words = append(words, w.String())
				w.Reset()
				started = false
			}
		case c == '#' && !quoted && !started:
			return words
		default:
			w.WriteByte(c)
			started = true
		}
	}
	if started {
		words = append(words, w.String())
	}
	return words
}

// readmePathFlags are the flags whose value is a file or folder.
var readmePathFlags = map[string]bool{
	"output": true, "plots": true, "section": true, "calibrate": true, "hydraulic-rating": true,
	"control-section": true, "shifts": true, "gaugings": true, "proposed": true, "rating": true, "survey": true,
}

// inDir rewrites a README command's paths into dir, where the README's
// examples run: positional arguments (with globs expanded there; shape's
// is a spec) and the values of the path flags.
func inDir(t *testing.T, dir string, f cliFlags, words []string) []string {
	t.Helper()
	out := []string{words[0]}
	path := func(p string) string {
		if p == "-" || strings.HasPrefix(p, "none@") {
			return p
		}
		return filepath.Join(dir, p)
	}
	for i := 1; i < len(words); i++ {
		w := words[i]
		name, value, inline := "", "", false
		switch {
		case strings.HasPrefix(w, "--"):
			name, value, inline = strings.Cut(w[2:], "=")
		case strings.HasPrefix(w, "-") && len(w) == 2:
			name = f.short[w[1:]]
		case words[0] == "shape":
			out = append(out, w) // a spec, not a path
			continue
		default:
			if strings.ContainsAny(w, "*?[") {
				m, err := filepath.Glob(filepath.Join(dir, w))
				if err != nil || len(m) == 0 {
					t.Fatalf("%q matches nothing in the demo folder", w)
				}
				sort.Strings(m)
				out = append(out, m...)
				continue
			}
			out = append(out, path(w))
			continue
		}
		takes, known := f.long[name]
		if !known || !takes || inline {
			if inline && readmePathFlags[name] {
				w = "--" + name + "=" + path(value)
			}
			out = append(out, w)
			continue
		}
		if i+1 >= len(words) {
			t.Fatalf("%s: flag %s has no value", strings.Join(words, " "), w)
		}
		i++
		v := words[i]
		if readmePathFlags[name] {
			v = path(v)
		}
		out = append(out, w, v)
	}
	return out
}

// TestReadmeExamples runs every command of the README's sh blocks where
// the README says they run, inside a copy of the demo folder, and checks
// each succeeds. The demo itself is run by demoOutput. An example drawing
// figures (--plots DIR, plot's -o DIR) draws them into a folder of its
// own, and the command's section must name each file written, so that a
// user running it finds the files the README says.
func TestReadmeExamples(t *testing.T) {
	t.Parallel()
	src, _ := demoOutput(t)
	dir := t.TempDir()
	if err := os.CopyFS(dir, os.DirFS(src)); err != nil {
		t.Fatal(err)
	}
	flags := readmeCommandFlags(t)
	text := readme(t)
	lines := readmeCodeLines(text, runnableBlock)
	if len(lines) < 15 {
		t.Fatalf("found %d example commands in the README: the sh blocks are not being read", len(lines))
	}
	drawn := 0
	for i, line := range lines {
		words := shellWords(strings.TrimPrefix(line, "wetline "))
		if slices.Contains(words, ">") || slices.Contains(words, "|") {
			t.Errorf("README example %q: write outputs with -o, not through the shell", line)
			continue
		}
		if words[0] == "demo" {
			continue
		}
		args := words
		if f, ok := flags[words[0]]; ok {
			args = inDir(t, dir, f, words)
		}
		figs := ""
		for j := 1; j+1 < len(args); j++ {
			if args[j] == "--plots" || words[0] == "plot" && (args[j] == "-o" || args[j] == "--output") {
				figs = filepath.Join(dir, fmt.Sprintf("figures-%d", i))
				args[j+1] = figs
			}
		}
		if _, errs, code := runCLI(t, args...); code != 0 {
			t.Errorf("README example %q: exit %d:\n%s", line, code, errs)
			continue
		}
		if figs == "" {
			continue
		}
		pngs, err := filepath.Glob(filepath.Join(figs, "*.png"))
		if err != nil || len(pngs) == 0 {
			t.Errorf("README example %q drew no figure (%v)", line, err)
		}
		sec := readmeSection(text, words[0])
		for _, p := range pngs {
			drawn++
			if name := filepath.Base(p); !strings.Contains(sec, "`"+name+"`") {
				t.Errorf("README example %q draws %s, which the section of %s does not name", line, name, words[0])
			}
		}
	}
	if drawn < 10 {
		t.Errorf("the README's examples drew %d figures: their folders are not being found", drawn)
	}
}

// readmeJSONReports say how each report of the README's Outputs table is
// made as JSON from the demo folder: a file the demo writes, or a command
// run there (paths relative to the folder).
var readmeJSONReports = map[string][]string{
	"rating":    {"tallow-xs1-rating.json"},
	"backwater": {"tallow-backwater.json"},
	"fit":       {"tallow-fit.json"},
	"slopearea": {"reach-brindle-slopearea.json"},
	"record":    {"tallow-record-2025.json"},
	"solve":     {"solve", "tallow-xs1.csv", "--slope", "0.0012", "--discharge", "40", "--format", "json"},
	"shifts": {"shifts", "tallow-visits-2025.csv", "--utc-offset", "+10:00", "--zero-flow", "0.32,0.26",
		"--rating", "tallow-rating-7.csv", "--rating", "tallow-rating-8.csv@2025-02-18T06:00",
		"--shifts", "tallow-shifts-2025.csv", "--format", "json"},
	"compare": {"compare", "tallow-rating-7.csv", "tallow-rating-8.csv", "--zero-flow", "0.32,0.26",
		"--format", "json"},
}

// readmeOutputRow matches a row of the README's Outputs table: the report's
// first word and the first code span of its JSON column.
var readmeOutputRow = regexp.MustCompile("(?m)^\\| ([a-z]+)\\b[^|]* \\| [^|]* \\| `([^`]+)`")

// TestReadmeJSONKeys checks the JSON keys the README's Outputs table
// documents for each report are the first keys of that report, in order,
// as the table says they are.
func TestReadmeJSONKeys(t *testing.T) {
	t.Parallel()
	dir, _ := demoOutput(t)
	rows := readmeOutputRow.FindAllStringSubmatch(readme(t), -1)
	seen := map[string]bool{}
	for _, m := range rows {
		name, list := m[1], m[2]
		how, ok := readmeJSONReports[name]
		if !ok {
			t.Errorf("README Outputs: no way to make the %s report in this test", name)
			continue
		}
		seen[name] = true
		var data []byte
		if len(how) == 1 {
			b, err := os.ReadFile(filepath.Join(dir, how[0]))
			if err != nil {
				t.Fatal(err)
			}
			data = b
		} else {
			args := append([]string{how[0]}, how[1:]...)
			for i, a := range args {
				if strings.HasSuffix(a, ".csv") || strings.Contains(a, ".csv@") {
					args[i] = filepath.Join(dir, a)
				}
			}
			out, errs, code := runCLI(t, args...)
			if code != 0 {
				t.Fatalf("%s: exit %d: %s", name, code, errs)
			}
			data = []byte(out)
		}
		got := jsonKeys(t, data)
		var want []string
		for _, k := range strings.Split(list, ",") {
			want = append(want, strings.TrimSuffix(strings.TrimSpace(k), "[]"))
		}
		if len(got) < len(want) || !slices.Equal(got[:len(want)], want) {
			t.Errorf("README Outputs, %s: documents JSON keys %v first, the report's are %v", name, want, got)
		}
	}
	for name := range readmeJSONReports {
		if !seen[name] {
			t.Errorf("README Outputs has no row for the %s report", name)
		}
	}
}

// readmeSolveMode matches, in the README's Outputs row of solve, the keys
// documented for one of its other modes: the flag and the keys.
var readmeSolveMode = regexp.MustCompile("with `(--area|--stage)`: `([^`]+)`")

// TestReadmeSolveModesJSONKeys checks the JSON keys the README documents
// for solve with --area and with --stage come first in those reports.
func TestReadmeSolveModesJSONKeys(t *testing.T) {
	t.Parallel()
	dir, _ := demoOutput(t)
	var row string
	for _, m := range readmeOutputRow.FindAllStringSubmatch(readme(t), -1) {
		if m[1] == "solve" {
			row = m[0]
		}
	}
	row = readme(t)[strings.Index(readme(t), row):]
	row = row[:strings.Index(row, "\n")]
	modes := readmeSolveMode.FindAllStringSubmatch(row, -1)
	if len(modes) != 2 {
		t.Fatalf("README Outputs, solve: %d other modes documented, want --area and --stage: %s", len(modes), row)
	}
	value := map[string][]string{"--area": {"--area", "10"}, "--stage": {"--stage", "101.5", "--slope", "0.0012"}}
	for _, m := range modes {
		args := append([]string{"solve", filepath.Join(dir, "tallow-xs1.csv"), "--format", "json"}, value[m[1]]...)
		out, errs, code := runCLI(t, args...)
		if code != 0 {
			t.Fatalf("solve %s: exit %d: %s", m[1], code, errs)
		}
		got := jsonKeys(t, []byte(out))
		var want []string
		for _, k := range strings.Split(m[2], ",") {
			want = append(want, strings.TrimSpace(k))
		}
		if len(got) < len(want) || !slices.Equal(got[:len(want)], want) {
			t.Errorf("README Outputs, solve %s: documents JSON keys %v first, the report's are %v", m[1], want, got)
		}
	}
}

// sharedSynopsisFlags are the flags a README synopsis may leave out though
// the help's usage line names them: README's "What every command shares"
// says which commands take them.
var sharedSynopsisFlags = map[string]bool{"site": true, "units": true}

// synopsisFlag matches a flag of a synopsis: a long name, or a shorthand
// (as -o).
var synopsisFlag = regexp.MustCompile(`(?:^|[\s(\[|])-(?:-([a-z][a-z0-9-]*)|([a-zA-Z]))\b`)

// synopsisFlags returns the flags a synopsis names (shorthands by their
// long name) and, for each, whether it stands outside every bracket
// somewhere (as if it must be given).
func synopsisFlags(line string, f cliFlags) map[string]bool {
	out := map[string]bool{}
	depth := 0
	for i := 0; i < len(line); i++ {
		switch line[i] {
		case '[':
			depth++
		case ']':
			depth--
		}
		m := synopsisFlag.FindStringSubmatchIndex(line[i:])
		if m == nil || m[0] != 0 {
			continue
		}
		name := ""
		if m[2] >= 0 {
			name = line[i+m[2] : i+m[3]]
		} else {
			short := line[i+m[4] : i+m[5]]
			name = f.short[short]
			if name == "" {
				name = "-" + short // no such shorthand: reported by name
			}
		}
		out[name] = out[name] || depth == 0
		i += m[1] - 1
	}
	return out
}

// TestReadmeSynopsesMatchHelp checks each README synopsis against the
// usage line of the command's help: every flag either names is one of the
// command's, the two name the same flags (the synopsis may leave out
// sharedSynopsisFlags), and a flag stands outside brackets, as one that
// must be given, in both or in neither.
func TestReadmeSynopsesMatchHelp(t *testing.T) {
	t.Parallel()
	flags := readmeCommandFlags(t)
	seen := 0
	for _, syn := range readmeCodeLines(readme(t), synopsisBlock) {
		words := strings.Fields(syn)
		name := words[1]
		f, ok := flags[name]
		if !ok {
			continue // help, version, completion
		}
		seen++
		out, _, code := runCLI(t, name, "--help")
		usage, _, _ := strings.Cut(out, "\n")
		usage, ok = strings.CutPrefix(usage, "Usage: wetline ")
		if code != 0 || !ok {
			t.Fatalf("%s --help: exit %d, first line %q", name, code, usage)
		}
		inReadme, inHelp := synopsisFlags(strings.TrimPrefix(syn, "wetline "), f), synopsisFlags(usage, f)
		for flag, bare := range inHelp {
			if _, ok := f.long[flag]; !ok && flag != "help" {
				t.Errorf("%s --help: its usage line names --%s, which it does not have", name, flag)
			}
			readmeBare, ok := inReadme[flag]
			switch {
			case !ok && !sharedSynopsisFlags[flag]:
				t.Errorf("README synopsis of %s lacks --%s, which its help's usage line names", name, flag)
			case ok && bare != readmeBare:
				t.Errorf("%s --%s: outside brackets in the help's usage line %v, in the README synopsis %v", name, flag, bare, readmeBare)
			}
		}
		for flag := range inReadme {
			if _, ok := f.long[flag]; !ok && flag != "help" {
				t.Errorf("README synopsis of %s names --%s, which it does not have", name, flag)
			}
			if _, ok := inHelp[flag]; !ok {
				t.Errorf("%s --help: its usage line lacks --%s, which the README synopsis names", name, flag)
			}
		}
	}
	if seen < 10 {
		t.Fatalf("found %d README synopses: the usage blocks are not being read", seen)
	}
}

// siteBracket returns the brackets holding --site in a usage line, from
// the outermost in: "[--plots DIR] [--site NAME]" gives ["--site NAME"];
// nil where it is not named or stands outside every bracket.
func siteBracket(line string) []string {
	i := strings.Index(line, "--site")
	if i < 0 {
		return nil
	}
	var opens []int
	for j := 0; j < i; j++ {
		switch line[j] {
		case '[':
			opens = append(opens, j)
		case ']':
			opens = opens[:max(len(opens)-1, 0)]
		}
	}
	var out []string
	for _, o := range opens {
		depth := 0
		for j := o + 1; j < len(line); j++ {
			if line[j] == '[' {
				depth++
			} else if line[j] == ']' {
				if depth == 0 {
					out = append(out, line[o+1:j])
					break
				}
				depth--
			}
		}
	}
	return out
}

// TestSiteStandsAlone checks --site stands in a bracket of its own in
// every command's usage line and README synopsis: it names the report and
// the figures alike, so it hangs on no other flag (as --plots).
func TestSiteStandsAlone(t *testing.T) {
	t.Parallel()
	lines := map[string]string{}
	for name := range commandTable() {
		out, _, _ := runCLI(t, name, "--help")
		usage, _, _ := strings.Cut(out, "\n")
		lines[name+" --help"] = usage
	}
	for _, syn := range readmeCodeLines(readme(t), synopsisBlock) {
		lines["README synopsis of "+strings.Fields(syn)[1]] = syn
	}
	seen := 0
	for where, line := range lines {
		if !strings.Contains(line, "--site") {
			continue
		}
		seen++
		if in := siteBracket(line); len(in) != 1 || in[0] != "--site NAME" {
			t.Errorf("%s: --site stands in %q, want a bracket of its own, [--site NAME]: %s", where, in, line)
		}
	}
	if seen < 10 {
		t.Fatalf("found --site in %d usage lines: they are not being read", seen)
	}
}

// readmeSharedNot matches, in README's "What every command shares", a
// shared flag and the commands it says lack it: "`--units si|us` (not
// `cowan`, `demo`)".
var readmeSharedNot = regexp.MustCompile("`--([a-z-]+)[^`]*` \\(not\\s+((?:`[a-z]+`(?:,\\s+)?)+)")

// readmeSharedOnly matches, in README's "What every command shares", flags
// and the commands it says have them: "`--line` (`rate`, `solve`)",
// "`--flow-azimuth`, `--offset-tolerance` (`rate`, …)".
var readmeSharedOnly = regexp.MustCompile("((?:`--[a-z][a-z0-9-]*[^`]*`,?\\s+)+)\\(((?:`[a-z]+`(?:,\\s+)?)+)[);:]")

// TestReadmeSharedFlags checks the README says, for each flag "What every
// command shares" lists that not every command has, exactly which
// commands lack it, and, for each flag it lists with the commands that
// have it, exactly which have it.
func TestReadmeSharedFlags(t *testing.T) {
	t.Parallel()
	flags := readmeCommandFlags(t)
	text := readme(t)
	_, shared, _ := strings.Cut(text, "What every command shares:")
	shared, _, _ = strings.Cut(shared, "\n###")
	said := map[string][]string{}
	for _, m := range readmeSharedNot.FindAllStringSubmatch(shared, -1) {
		for _, n := range strings.Split(m[2], ",") {
			said[m[1]] = append(said[m[1]], strings.Trim(strings.TrimSpace(n), "`"))
		}
	}
	for _, flag := range []string{"sheet", "plots", "site", "units"} {
		var lack []string
		for name, f := range flags {
			if _, ok := f.long[flag]; !ok {
				lack = append(lack, name)
			}
		}
		sort.Strings(lack)
		got := slices.Sorted(slices.Values(said[flag]))
		if !slices.Equal(got, lack) {
			t.Errorf("README's shared --%s: says not %v, the commands without it are %v", flag, got, lack)
		}
	}
	only := map[string][]string{}
	for _, m := range readmeSharedOnly.FindAllStringSubmatch(shared, -1) {
		var names []string
		for _, n := range strings.Split(m[2], ",") {
			names = append(names, strings.Trim(strings.TrimSpace(n), "`"))
		}
		for _, f := range readmeFlag.FindAllStringSubmatch(m[1], -1) {
			only[f[1]] = slices.Sorted(slices.Values(names))
		}
	}
	for _, flag := range []string{"line", "flow-azimuth", "offset-tolerance", "utc-offset"} {
		if _, ok := only[flag]; !ok {
			t.Errorf("README's shared flags: no list of the commands having --%s found", flag)
		}
	}
	for flag, got := range only {
		var have []string
		for name, f := range flags {
			if _, ok := f.long[flag]; ok {
				have = append(have, name)
			}
		}
		sort.Strings(have)
		if !slices.Equal(got, have) {
			t.Errorf("README's shared --%s: says %v have it, the commands with it are %v", flag, got, have)
		}
	}
}

// readmeSection returns the README's section of a command: from its
// heading "### wetline NAME" to the next heading.
func readmeSection(text, name string) string {
	loc := regexp.MustCompile(`(?m)^### .*\bwetline ` + regexp.QuoteMeta(name) + `\b.*$`).FindStringIndex(text)
	if loc == nil {
		return ""
	}
	rest := text[loc[1]:]
	if i := strings.Index(rest, "\n#"); i >= 0 {
		rest = rest[:i]
	}
	return rest
}

// TestReadmeNamesEveryFlag checks every flag of every command, as its help
// lists them, is in the README: in the command's section (its synopsis or
// its text), or, for a flag many commands share, in "What every command
// shares". TestReadmeSynopsesMatchHelp holds a synopsis to the help's
// usage line only, so a flag the usage line leaves out (as the help lists
// flags the usage line does not) was missed by both.
func TestReadmeNamesEveryFlag(t *testing.T) {
	t.Parallel()
	text := readme(t)
	_, shared, _ := strings.Cut(text, "What every command shares:")
	shared, _, _ = strings.Cut(shared, "\n###")
	named := func(s, flag string) bool {
		for _, m := range readmeFlag.FindAllStringSubmatch(s, -1) {
			if m[1] == flag {
				return true
			}
		}
		return false
	}
	for name, f := range readmeCommandFlags(t) {
		sec := readmeSection(text, name)
		if sec == "" {
			t.Errorf("README has no section for %s", name)
			continue
		}
		short := map[string]*regexp.Regexp{} // flag → its shorthand as written, "-o"
		for s, flag := range f.short {
			short[flag] = regexp.MustCompile("(?:^|[\\s`(\\[|])-" + s + "\\b")
		}
		for flag := range f.long {
			if flag == "help" || named(sec, flag) || named(shared, flag) {
				continue
			}
			if re := short[flag]; re != nil && (re.MatchString(sec) || re.MatchString(shared)) {
				continue
			}
			t.Errorf("README: the section of %s does not name --%s, which its help lists", name, flag)
		}
	}
}

// readmeExtrapolated matches the README's words of a rating table's
// extrapolated column: those marking a row above the highest gauging,
// then (after "; ") those of the other rows.
var readmeExtrapolated = regexp.MustCompile("(?m)^\\| rating \\|.*`extrapolated` \\(([^;)]*); ([^)]*)\\)")

// TestReadmeExtrapolatedWords checks the words the README gives a rating
// table's extrapolated column are those the readers take and the fit CSV
// writes: each word marking a row extrapolated is read so (the rating's
// highest gauging is the row below it), each word of the other rows is
// not, and every value a fit's CSV writes in the column is among them.
func TestReadmeExtrapolatedWords(t *testing.T) {
	t.Parallel()
	m := readmeExtrapolated.FindStringSubmatch(readme(t))
	if m == nil {
		t.Fatal("README: no rating table row giving the words of its extrapolated column")
	}
	code := regexp.MustCompile("`([^`]+)`")
	words := func(s string) []string {
		var out []string
		for _, w := range code.FindAllStringSubmatch(s, -1) {
			if w[1] != "fit" {
				out = append(out, w[1])
			}
		}
		return out
	}
	marking, other := words(m[1]), append(words(m[2]), "")
	if len(marking) == 0 || len(other) < 2 {
		t.Fatalf("README: extrapolated words %q and %q not read", m[1], m[2])
	}
	for _, tc := range []struct {
		words []string
		high  float64 // the highest gauging the table gives
	}{{marking, 0.8}, {other, 1.2}} {
		for _, w := range tc.words {
			table := "stage,discharge,extrapolated\n0.4,0.1,\n0.8,2.5,\n1.2,7.0," + w + "\n"
			rt, err := survey.ParseRatingTables(strings.NewReader(table), "rating.csv", survey.RatingTableOptions{})
			if err != nil || len(rt.Periods) != 1 {
				t.Fatalf("%q: %v", w, err)
			}
			if r := rt.Periods[0].Rating; !r.HasHighGauging || r.HighGauging != tc.high {
				t.Errorf("README's extrapolated word %q: the reader gives the highest gauging %v (%v), want %v", w, r.HighGauging, r.HasHighGauging, tc.high)
			}
		}
	}
	dir, _ := demoOutput(t)
	out, errs, code2 := runCLI(t, "fit", filepath.Join(dir, "tallow-gaugings.csv"), "--section", filepath.Join(dir, "tallow-xs1.csv"),
		"--slope", "0.0012", "--datum", "100", "--method", "lsq", "--format", "csv")
	if code2 != 0 {
		t.Fatalf("fit: exit %d: %s", code2, errs)
	}
	recs, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil || len(recs) < 2 || recs[0][2] != "extrapolated" {
		t.Fatalf("fit CSV: %v, header %q", err, recs[0])
	}
	written := map[string]bool{}
	for _, r := range recs[1:] {
		written[r[2]] = true
	}
	for w := range written {
		if !slices.Contains(marking, w) && !slices.Contains(other, w) {
			t.Errorf("fit CSV writes %q in its extrapolated column, which the README's rating table does not give", w)
		}
	}
	if !written["true"] && !written["yes"] {
		t.Errorf("the demo's fit marks no row extrapolated (%v): the check reads nothing", written)
	}
}
