package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// The completion script names every command and each command's flags, and
// bash accepts it (when bash is on the machine).
func TestCompletion(t *testing.T) {
	t.Parallel()
	out, errs, code := runCLI(t, "completion", "bash")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, want := range []string{"rate) opts=", "--slope", "--all-pools", "fit) opts=", "--gaugings-sheet", "complete -o filenames -F _wetline wetline"} {
		if !strings.Contains(out, want) {
			t.Errorf("completion lacks %q", want)
		}
	}
	if bash, err := exec.LookPath("bash"); err == nil {
		script := filepath.Join(t.TempDir(), "c.bash")
		if err := os.WriteFile(script, []byte(out), 0o644); err != nil {
			t.Fatal(err)
		}
		if msg, err := exec.Command(bash, "-n", script).CombinedOutput(); err != nil {
			t.Errorf("bash -n: %v %s", err, msg)
		}
	}
	if _, _, code := runCLI(t, "completion", "fish"); code != 2 {
		t.Errorf("completion fish: exit %d, want 2", code)
	}
	zsh, _, code := runCLI(t, "completion", "zsh")
	if code != 0 || !strings.HasPrefix(zsh, "#compdef wetline") {
		t.Errorf("zsh script: exit %d", code)
	}
}

// wetline help COMMAND prints that command's help; the program's help
// names version, completion and the exit statuses; a usage error points
// at the command's help.
func TestHelpCommand(t *testing.T) {
	t.Parallel()
	out, _, code := runCLI(t, "help", "rate")
	if code != 0 || !strings.Contains(out, "Usage: wetline rate") {
		t.Errorf("help rate: exit %d %q", code, out)
	}
	out, _, _ = runCLI(t, "help")
	for _, want := range []string{"version", "completion", "Exit status", "standard input"} {
		if !strings.Contains(out, want) {
			t.Errorf("help lacks %q", want)
		}
	}
	_, errs, code := runCLI(t, "rate", "x.csv")
	if code != 2 || !strings.Contains(errs, "wetline rate --help") {
		t.Errorf("usage error: exit %d %q", code, errs)
	}
}

// TestHelpEveryListedCommand walks the commands 'wetline help' lists and
// asks 'wetline help NAME' and 'wetline NAME --help' of each: both print
// its usage and exit 0, as the list's own help line promises.
func TestHelpEveryListedCommand(t *testing.T) {
	t.Parallel()
	list, _, code := runCLI(t, "help")
	if code != 0 {
		t.Fatalf("help: exit %d", code)
	}
	_, body, ok := strings.Cut(list, "\nCommands:\n")
	if !ok {
		t.Fatalf("help has no Commands: list:\n%s", list)
	}
	body, _, _ = strings.Cut(body, "\n\n")
	var names []string
	for _, line := range strings.Split(body, "\n") {
		if f := strings.Fields(line); len(f) > 0 {
			names = append(names, f[0])
		}
	}
	if len(names) < len(commandTable())+len(builtinCommands) {
		t.Fatalf("help lists %d commands %v, want the %d of the table and %v", len(names), names, len(commandTable()), builtinCommands)
	}
	for _, n := range names {
		for _, args := range [][]string{{"help", n}, {n, "--help"}} {
			out, errs, code := runCLI(t, args...)
			if code != 0 || !strings.HasPrefix(out, "Usage: wetline "+n) {
				t.Errorf("wetline %s: exit %d, stdout %q, stderr %q; want its usage", strings.Join(args, " "), code, out, errs)
			}
		}
	}
}
