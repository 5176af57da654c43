package main

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"syscall"
	"testing"
	"time"

	"wetline/survey/batch"
	"wetline/survey/output"
)

// helperEnv makes the test binary act as the wetline program (see
// TestMain), with extra commands that start writing their output and
// then wait, so that a test can interrupt them mid-write.
const helperEnv = "WETLINE_TEST_AS_PROGRAM"

// stalled waits for the interrupt; the signal handler exits the program
// first.
func stalled(ctx context.Context) error {
	<-ctx.Done()
	time.Sleep(time.Minute)
	return errors.New("not interrupted")
}

// testCommands are the program's commands and the stalling ones.
func testCommands() map[string]command {
	cmds := commandTable()
	// stall FILE: writes part of FILE, then waits.
	cmds["stall"] = command{"write part of a file, then wait", func(ctx context.Context, e *env, args []string) error {
		return e.files.Write(args[0], func(w io.Writer) error {
			io.WriteString(w, "stage,discharge\n1,2\n")
			return stalled(ctx)
		})
	}}
	// stall-folder DIR: stages a batch folder with one table, then waits.
	cmds["stall-folder"] = command{"stage part of a batch folder, then wait", func(ctx context.Context, e *env, args []string) error {
		d, err := e.files.Folder(args[0], "index.csv", batch.IndexedFiles)
		if err != nil {
			return err
		}
		if err := d.Write("a.csv", func(w io.Writer) error { _, err := io.WriteString(w, "stage\n"); return err }); err != nil {
			return err
		}
		fmt.Fprintln(e.stdout, "staged")
		return stalled(ctx)
	}}
	// stall-temp: makes a file in the temporary folder, as the workbook
	// library does for a large sheet, says where, then waits.
	cmds["stall-temp"] = command{"make a temporary file, then wait", func(ctx context.Context, e *env, args []string) error {
		f, err := os.CreateTemp("", "excelize-")
		if err != nil {
			return err
		}
		fmt.Fprintln(e.stdout, f.Name())
		f.Close()
		return stalled(ctx)
	}}
	// at POINT SIG COMMAND ARGS...: runs the command, and when it reaches
	// POINT (see env.reached) sends the program signal SIG and waits for
	// the signal to cancel the run, so that the command goes on from
	// that point as an interrupted one does.
	cmds["at"] = command{"run a command, signalling the program at a point", func(ctx context.Context, e *env, args []string) error {
		n, err := strconv.Atoi(args[1])
		if err != nil {
			return err
		}
		e.reached = func(p string) {
			if p == args[0] {
				syscall.Kill(os.Getpid(), syscall.Signal(n))
				<-ctx.Done()
			}
		}
		return run(ctx, e, args[2:])
	}}
	return cmds
}

func TestMain(m *testing.M) {
	if os.Getenv(helperEnv) != "" {
		os.Exit(mainWith(testCommands()))
	}
	code := m.Run()
	if demoOnce.dir != "" {
		os.RemoveAll(demoOnce.dir)
	}
	os.Exit(code)
}

// program starts the test binary as the wetline program.
func startProgram(t *testing.T, args ...string) (*exec.Cmd, *strings.Builder, *lineReader) {
	t.Helper()
	cmd := exec.Command(os.Args[0], args...)
	cmd.Env = append(os.Environ(), helperEnv+"=1")
	var stderr strings.Builder
	cmd.Stderr = &stderr
	out, err := cmd.StdoutPipe()
	if err != nil {
		t.Fatal(err)
	}
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	return cmd, &stderr, &lineReader{r: out}
}

// lineReader reads a child's standard output a line at a time.
type lineReader struct {
	r   io.Reader
	buf []byte
}

func (l *lineReader) line(t *testing.T) string {
	t.Helper()
	b := make([]byte, 1)
	for {
		if i := strings.IndexByte(string(l.buf), '\n'); i >= 0 {
			s := string(l.buf[:i])
			l.buf = l.buf[i+1:]
			return s
		}
		n, err := l.r.Read(b)
		if err != nil {
			t.Fatalf("the program said nothing: %v", err)
		}
		l.buf = append(l.buf, b[:n]...)
	}
}

// waitFor polls until cond holds, failing after a while.
func waitFor(t *testing.T, cmd *exec.Cmd, what string, cond func() bool) {
	t.Helper()
	deadline := time.Now().Add(20 * time.Second)
	for !cond() {
		if time.Now().After(deadline) {
			cmd.Process.Kill()
			t.Fatalf("the program never %s", what)
		}
		time.Sleep(10 * time.Millisecond)
	}
}

// interrupt sends sig and checks the program exits with 128+sig saying it
// was interrupted.
func interrupt(t *testing.T, cmd *exec.Cmd, stderr *strings.Builder, sig syscall.Signal) {
	t.Helper()
	if err := cmd.Process.Signal(sig); err != nil {
		t.Fatal(err)
	}
	err := cmd.Wait()
	var ee *exec.ExitError
	if !errors.As(err, &ee) || ee.ExitCode() != 128+int(sig) {
		t.Fatalf("%v: exit %v, want status %d; stderr %s", sig, err, 128+int(sig), stderr.String())
	}
	if !strings.Contains(stderr.String(), "interrupted") {
		t.Errorf("stderr %q does not say it was interrupted", stderr.String())
	}
}

// names lists a folder.
func names(dir string) []string {
	ents, _ := os.ReadDir(dir)
	var out []string
	for _, e := range ents {
		out = append(out, e.Name())
	}
	sort.Strings(out)
	return out
}

// Each of SIGINT, SIGTERM and SIGHUP sent while the program writes makes
// it exit with 128 plus the signal's number, leaving no temporary file
// and an existing output as it was.
func TestInterruptLeavesNoPartialFile(t *testing.T) {
	t.Parallel()
	for _, sig := range []syscall.Signal{syscall.SIGINT, syscall.SIGTERM, syscall.SIGHUP} {
		for _, existing := range []string{"", "old content\n"} {
			dir := t.TempDir()
			out := filepath.Join(dir, "rating.csv")
			if existing != "" {
				if err := os.WriteFile(out, []byte(existing), 0o644); err != nil {
					t.Fatal(err)
				}
			}
			// Count the folder before the program starts: counted after, a
			// temporary file made first would be counted, and its making
			// never seen.
			before := len(names(dir))
			cmd, stderr, _ := startProgram(t, "stall", out)
			waitFor(t, cmd, "started writing", func() bool { return len(names(dir)) > before })
			interrupt(t, cmd, stderr, sig)
			want := "[]"
			if existing != "" {
				want = "[rating.csv]"
			}
			if got := fmt.Sprint(names(dir)); got != want {
				t.Errorf("%v: left behind %s, want %s", sig, got, want)
			}
			if existing != "" {
				if b, _ := os.ReadFile(out); string(b) != existing {
					t.Errorf("%v: existing output changed to %q", sig, b)
				}
			}
		}
	}
}

// A batch interrupted while it writes its folder leaves the earlier
// output folder whole, with no staged folder or lock beside it; a second
// batch into a folder being written is refused while the first runs.
func TestInterruptedBatchKeepsOldFolder(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	in := batchInputs(t, "a", "b")
	out := filepath.Join(dir, "ratings")
	if _, errs, code := runCLI(t, "rate", in, "--slope", "0.001", "-o", out); code != 0 {
		t.Fatal(errs)
	}
	old := fmt.Sprint(names(out))
	cmd, stderr, stdout := startProgram(t, "stall-folder", out)
	if got := stdout.line(t); got != "staged" {
		t.Fatalf("program said %q", got)
	}
	// A second batch into the same folder while the first holds it.
	_, errs, code := runCLI(t, "rate", in, "--slope", "0.001", "-o", out)
	if code != 1 || !strings.Contains(errs, "another wetline run is writing this folder") {
		t.Errorf("second batch: exit %d: %s", code, errs)
	}
	interrupt(t, cmd, stderr, syscall.SIGTERM)
	if got := fmt.Sprint(names(out)); got != old {
		t.Errorf("output folder holds %s after the interrupt, want %s", got, old)
	}
	if got := fmt.Sprint(names(dir)); got != "[ratings]" {
		t.Errorf("left beside the folder: %s", got)
	}
}

// The workbook library's own temporary files (made for a large sheet in
// the temporary folder) go with an interrupted run: the program points
// the temporary folder at a folder of its own and removes it.
func TestInterruptRemovesLibraryTemporaryFiles(t *testing.T) {
	t.Parallel()
	cmd, stderr, stdout := startProgram(t, "stall-temp")
	tmp := stdout.line(t)
	if _, err := os.Stat(tmp); err != nil {
		t.Fatalf("temporary file %s: %v", tmp, err)
	}
	if !strings.Contains(filepath.Dir(tmp), "wetline-scratch-") {
		t.Errorf("temporary file %s is not in the run's own folder", tmp)
	}
	interrupt(t, cmd, stderr, syscall.SIGHUP)
	if _, err := os.Stat(filepath.Dir(tmp)); !os.IsNotExist(err) {
		t.Errorf("the run's temporary folder is still there: %v", err)
	}
}

// A command whose standard output cannot be written (a full device) says
// so and exits 1 instead of 0.
func TestFullStandardOutput(t *testing.T) {
	t.Parallel()
	full, err := os.OpenFile("/dev/full", os.O_WRONLY, 0)
	if err != nil {
		t.Skip("no /dev/full here:", err)
	}
	defer full.Close()
	for _, args := range [][]string{
		{"solve", "--shape", "rectangle:width=2", "--n", "0.015", "--discharge", "1", "--slope", "0.001"},
		{"cowan", "--list"},
		{"cowan", "--bed", "gravel"},
		{"rate", demoSurveyPath, "--slope", "0.001"},
	} {
		cmd := exec.Command(os.Args[0], args...)
		cmd.Env = append(os.Environ(), helperEnv+"=1")
		cmd.Stdout = full
		var stderr strings.Builder
		cmd.Stderr = &stderr
		err := cmd.Run()
		var ee *exec.ExitError
		if !errors.As(err, &ee) || ee.ExitCode() != 1 || !strings.Contains(stderr.String(), "no space") {
			t.Errorf("%v to a full device: %v, stderr %q", args, err, stderr.String())
		}
	}
}

// A broken pipe on standard output (a reader that stops early, as head
// does) ends the run with 141 and a message, its scratch folder removed;
// a scratch folder a killed run left behind over a day ago is removed by
// the next run.
func TestBrokenPipeAndStaleScratch(t *testing.T) {
	t.Parallel()
	tmp := t.TempDir()
	stale := filepath.Join(tmp, fmt.Sprintf("%s%d-1", output.ScratchPrefix, 999999999))
	if err := os.Mkdir(stale, 0o700); err != nil {
		t.Fatal(err)
	}
	mustWrite(t, filepath.Join(stale, output.ScratchMark), "")
	old := time.Now().Add(-48 * time.Hour)
	if err := os.Chtimes(stale, old, old); err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(os.Args[0], "rate", demoSurveyPath, "--slope", "0.001", "--step", "0.001")
	cmd.Env = append(os.Environ(), helperEnv+"=1", "TMPDIR="+tmp)
	var errb bytes.Buffer
	cmd.Stderr = &errb
	r, err := cmd.StdoutPipe()
	if err != nil {
		t.Fatal(err)
	}
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	r.Close() // the reader is gone before the table is written
	err = cmd.Wait()
	var ee *exec.ExitError
	if !errors.As(err, &ee) || ee.ExitCode() != 141 || !strings.Contains(errb.String(), "broken pipe") {
		t.Errorf("broken pipe: %v, want exit 141 and a message:\n%s", err, errb.String())
	}
	if got := listing(t, tmp); got != "" {
		t.Errorf("the temporary folder holds %q, want nothing (no scratch folder, the stale one removed)", got)
	}
}

// However far a run has got when the signal comes (a batch after its
// first section, midway, after its last, its output staged; a report
// about to be written), it exits with 128 plus the signal's number and
// one line saying it was interrupted, never with the error the cancelled
// run returns on its way out, and leaves nothing beside its output. Each
// point is tried several times, as the signal's handler and the
// command's return race to end the run.
func TestInterruptAtEveryPoint(t *testing.T) {
	t.Parallel()
	in := batchInputs(t, "a", "b", "c", "d", "e", "f")
	rate := []string{"rate", in, "--slope", "0.001", "--step", "0.01"}
	one := []string{"rate", demoSurveyPath, "--slope", "0.001"}
	with := func(args []string, more ...string) []string {
		return append(append([]string(nil), args...), more...)
	}
	for _, c := range []struct {
		point string
		sig   syscall.Signal
		args  []string // the output, if any, is OUT or OUT.ext
	}{
		{"section 1", syscall.SIGINT, with(rate, "-o", "OUT")},
		{"section 3", syscall.SIGTERM, with(rate, "-o", "OUT")},
		{"section 6", syscall.SIGINT, with(rate, "-o", "OUT")},
		{"staged", syscall.SIGTERM, with(rate, "-o", "OUT")},
		{"section 2", syscall.SIGHUP, with(rate, "--long", "-o", "OUT.csv")},
		{"staged", syscall.SIGINT, with(rate, "--long", "-o", "OUT.csv")},
		{"section 4", syscall.SIGTERM, with(rate, "--long")},
		{"deliver", syscall.SIGINT, with(one, "-o", "OUT.txt")},
		{"deliver", syscall.SIGTERM, one},
	} {
		for rep := range 4 {
			dir := t.TempDir()
			args := []string{"at", c.point, strconv.Itoa(int(c.sig))}
			for _, a := range c.args {
				if rest, ok := strings.CutPrefix(a, "OUT"); ok {
					a = filepath.Join(dir, "out"+rest)
				}
				args = append(args, a)
			}
			what := fmt.Sprintf("%v at %q (%d)", c.args, c.point, rep)
			checkSignalled(t, what, args, c.sig, interruptNote)
			if got := listing(t, dir); got != "" {
				t.Errorf("%s: left %q in the output's folder", what, got)
			}
		}
	}
}

// A batch killed midway (SIGKILL, which no handler sees) leaves its staged
// folder and its lock beside the output; the next batch into the same
// folder takes over the lock and removes both, leaving only the output.
func TestKilledBatchCleanedByNextRun(t *testing.T) {
	t.Parallel()
	in := batchInputs(t, "a", "b", "c", "d")
	dir := t.TempDir()
	out := filepath.Join(dir, "out")
	cmd := exec.Command(os.Args[0], "at", "section 2", strconv.Itoa(int(syscall.SIGKILL)),
		"rate", in, "--slope", "0.001", "-o", out)
	cmd.Env = append(os.Environ(), helperEnv+"=1")
	err := cmd.Run()
	var ee *exec.ExitError
	if !errors.As(err, &ee) || ee.ExitCode() != -1 {
		t.Fatalf("killed run: %v, want it killed", err)
	}
	pid := cmd.Process.Pid
	want := fmt.Sprintf(".out.%d-1.tmpdir/ .out.lock", pid)
	if got := listing(t, dir); got != want {
		t.Fatalf("the killed run left %q, want %q", got, want)
	}
	if _, errs, code := runCLI(t, "rate", in, "--slope", "0.001", "-o", out); code != 0 {
		t.Fatalf("next run: exit %d: %s", code, errs)
	}
	if got := listing(t, dir); got != "out/" {
		t.Errorf("after the next run the folder holds %q, want only out/", got)
	}
}

// An error caused by an interrupt, however wrapped, maps to 128 plus the
// signal's number with the one line, not to 1 with the error's text.
func TestExitStatusOfInterrupt(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		err  error
		want int
	}{
		{interrupted{syscall.SIGINT}, 130},
		{fmt.Errorf("rating xs-004: %w", interrupted{syscall.SIGTERM}), 143},
		{fmt.Errorf("batch: %w", fmt.Errorf("pool: %w", interrupted{syscall.SIGHUP})), 129},
	} {
		var errb strings.Builder
		if got := exitStatus(c.err, &errb); got != c.want || errb.String() != interruptNote+"\n" {
			t.Errorf("%v: exit %d, said %q; want %d and %q", c.err, got, errb.String(), c.want, interruptNote)
		}
	}
}

// A signal after the output was committed (here once the command has
// returned, its summary said) still ends the run with 128 plus the
// signal's number, and the one line says the new output is whole and in
// place, not that none was left: the earlier report, or the earlier batch
// folder, has been replaced, and nothing is left beside it.
func TestInterruptAfterCommit(t *testing.T) {
	t.Parallel()
	in := batchInputs(t, "a", "b")
	for _, c := range []struct {
		sig  syscall.Signal
		out  string // the output, in the run's folder
		args []string
	}{
		{syscall.SIGINT, "out.txt", []string{"rate", demoSurveyPath}},
		{syscall.SIGTERM, "out", []string{"rate", in}},
	} {
		for rep := range 3 {
			dir := t.TempDir()
			out := filepath.Join(dir, c.out)
			args := append(append([]string(nil), c.args...), "--slope", "0.001", "-o", out)
			// An earlier output, made by the same command with another slope.
			earlier := append(append([]string(nil), c.args...), "--slope", "0.002", "-o", out)
			if _, errs, code := runCLI(t, earlier...); code != 0 {
				t.Fatalf("earlier output: exit %d: %s", code, errs)
			}
			before := readTree(t, out)
			what := fmt.Sprintf("%v after the commit (%d)", args, rep)
			checkSignalled(t, what, append([]string{"at", "done", strconv.Itoa(int(c.sig))}, args...), c.sig, interruptedAfterNote)
			if readTree(t, out) == before {
				t.Errorf("%s: the earlier output was not replaced", what)
			}
			want := c.out
			if c.out == "out" {
				want += "/"
			}
			if got := listing(t, dir); got != want {
				t.Errorf("%s: left %q in the output's folder, want %q", what, got, want)
			}
		}
	}
}

// readTree reads a file, or every file of a folder, into one string.
func readTree(t *testing.T, path string) string {
	t.Helper()
	if b, err := os.ReadFile(path); err == nil {
		return string(b)
	}
	var all strings.Builder
	for _, n := range names(path) {
		b, err := os.ReadFile(filepath.Join(path, n))
		if err != nil {
			t.Fatal(err)
		}
		fmt.Fprintf(&all, "%s:\n%s", n, b)
	}
	return all.String()
}

// checkSignalled runs this test binary as the program with args (the
// helper signals itself at the point they name) and checks that it ends
// with 128 plus sig and says exactly one line, note; what names the case.
func checkSignalled(t *testing.T, what string, args []string, sig syscall.Signal, note string) {
	t.Helper()
	cmd := exec.Command(os.Args[0], args...)
	cmd.Env = append(os.Environ(), helperEnv+"=1")
	var stderr strings.Builder
	cmd.Stderr = &stderr
	err := cmd.Run()
	var ee *exec.ExitError
	if !errors.As(err, &ee) || ee.ExitCode() != 128+int(sig) {
		t.Errorf("%s: %v, want exit status %d; stderr:\n%s", what, err, 128+int(sig), stderr.String())
	}
	var said []string
	for _, line := range strings.Split(stderr.String(), "\n") {
		if strings.HasPrefix(line, "wetline:") {
			said = append(said, line)
		}
	}
	if len(said) != 1 || said[0] != note {
		t.Errorf("%s: said %q, want the one line %q", what, said, note)
	}
}
