package main

import (
	"context"
	"errors"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

// helperEnv makes the test binary act as the wetline program (see
// TestMain), with one extra command that starts writing its output and
// then waits, so that a test can interrupt it mid-write.
const helperEnv = "WETLINE_TEST_AS_PROGRAM"

func TestMain(m *testing.M) {
	if os.Getenv(helperEnv) != "" {
		cmds := commandTable()
		cmds["stall"] = command{"write part of a file, then wait", func(ctx context.Context, e *env, args []string) error {
			return e.files.Write(args[0], func(w io.Writer) error {
				io.WriteString(w, "stage,discharge\n1,2\n")
				<-ctx.Done()
				time.Sleep(time.Minute) // the handler exits the program first
				return errors.New("not interrupted")
			})
		}}
		os.Exit(mainWith(cmds))
	}
	code := m.Run()
	if demoOnce.dir != "" {
		os.RemoveAll(demoOnce.dir)
	}
	os.Exit(code)
}

// TestInterruptLeavesNoPartialFile sends SIGINT to the running program
// while it writes: it exits with status 130, leaves no temporary file, and
// an existing output keeps its content.
func TestInterruptLeavesNoPartialFile(t *testing.T) {
	t.Parallel()
	for _, existing := range []string{"", "old content\n"} {
		dir := t.TempDir()
		out := filepath.Join(dir, "rating.csv")
		if existing != "" {
			if err := os.WriteFile(out, []byte(existing), 0o644); err != nil {
				t.Fatal(err)
			}
		}
		cmd := exec.Command(os.Args[0], "stall", out)
		cmd.Env = append(os.Environ(), helperEnv+"=1")
		var stderr strings.Builder
		cmd.Stderr = &stderr
		if err := cmd.Start(); err != nil {
			t.Fatal(err)
		}
		// Wait until the temporary file exists, then interrupt.
		deadline := time.Now().Add(20 * time.Second)
		before := 0
		if existing != "" {
			before = 1
		}
		for {
			if ents, _ := os.ReadDir(dir); len(ents) > before {
				break
			}
			if time.Now().After(deadline) {
				cmd.Process.Kill()
				t.Fatal("the program never started writing")
			}
			time.Sleep(10 * time.Millisecond)
		}
		if err := cmd.Process.Signal(syscall.SIGINT); err != nil {
			t.Fatal(err)
		}
		err := cmd.Wait()
		var ee *exec.ExitError
		if !errors.As(err, &ee) || ee.ExitCode() != 130 {
			t.Fatalf("exit %v, want status 130; stderr %s", err, stderr.String())
		}
		if !strings.Contains(stderr.String(), "interrupted") {
			t.Errorf("stderr %q does not say it was interrupted", stderr.String())
		}
		ents, _ := os.ReadDir(dir)
		var names []string
		for _, e := range ents {
			names = append(names, e.Name())
		}
		switch {
		case existing == "" && len(names) != 0:
			t.Errorf("left behind: %v", names)
		case existing != "" && (len(names) != 1 || names[0] != "rating.csv"):
			t.Errorf("left behind: %v", names)
		}
		if existing != "" {
			if b, _ := os.ReadFile(out); string(b) != existing {
				t.Errorf("existing output changed to %q", b)
			}
		}
	}
}
