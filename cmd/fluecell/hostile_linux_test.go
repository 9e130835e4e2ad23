package main

import (
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

// runCLIWithin runs the program and fails the test when it has not ended
// within d.
func runCLIWithin(t *testing.T, d time.Duration, args ...string) (int, string, string) {
	t.Helper()
	type res struct {
		code           int
		stdout, stderr string
	}
	done := make(chan res, 1)
	go func() {
		var r res
		r.code, r.stdout, r.stderr = runCLI(t, args...)
		done <- r
	}()
	select {
	case r := <-done:
		return r.code, r.stdout, r.stderr
	case <-time.After(d):
		t.Fatalf("fluecell %s still running after %v", strings.Join(args, " "), d)
	}
	return 0, "", ""
}

// TestNamedPipesRefused: every file the commands read (the workbook of
// annotate and inspect, --mapping, --factors) is refused at once when it
// is a named pipe, instead of waiting for a writer for ever.
func TestNamedPipesRefused(t *testing.T) {
	dir := t.TempDir()
	pipe := filepath.Join(dir, "pipe.xlsx")
	if err := syscall.Mkfifo(pipe, 0o644); err != nil {
		t.Skip("no named pipes:", err)
	}
	book := filepath.Join(dir, "log.xlsx")
	fuelLog(t, book, 3)
	for _, args := range [][]string{
		{"annotate", pipe},
		{"inspect", pipe},
		{"annotate", book, "-o", filepath.Join(dir, "o.xlsx"), "--mapping", pipe},
		{"annotate", book, "-o", filepath.Join(dir, "o.xlsx"), "--factors", pipe},
		{"batch", dir, filepath.Join(dir, "out"), "--factors", pipe},
	} {
		code, _, stderr := runCLIWithin(t, 10*time.Second, args...)
		if code != 1 || !strings.Contains(stderr, "named pipe (FIFO), not a regular file") {
			t.Errorf("%q: exit %d, stderr %q", args, code, stderr)
		}
	}
}

// TestAnnotatePipeProcess runs fluecell annotate on a named pipe as a
// process: it ends at once with a clear error; were it ever to wait, a
// SIGTERM would end it.
func TestAnnotatePipeProcess(t *testing.T) {
	pipe := filepath.Join(t.TempDir(), "pipe.xlsx")
	if err := syscall.Mkfifo(pipe, 0o644); err != nil {
		t.Skip("no named pipes:", err)
	}
	cmd := exec.Command(os.Args[0], "annotate", pipe)
	cmd.Env = append(os.Environ(), "FLUECELL_TEST_MAIN=1")
	var stderr strings.Builder
	cmd.Stderr = &stderr
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	done := make(chan error, 1)
	go func() { done <- cmd.Wait() }()
	select {
	case err := <-done:
		var ee *exec.ExitError
		if !errors.As(err, &ee) || ee.ExitCode() != 1 || !strings.Contains(stderr.String(), "named pipe (FIFO), not a regular file") {
			t.Errorf("%v: %s", err, stderr.String())
		}
	case <-time.After(10 * time.Second):
		cmd.Process.Signal(syscall.SIGTERM)
		select {
		case <-done:
			t.Error("annotate of a named pipe waited until SIGTERM")
		case <-time.After(5 * time.Second):
			cmd.Process.Kill()
			t.Error("annotate of a named pipe waited, and ignored SIGTERM")
		}
	}
}

// TestBatchFoldersReported: a folder that cannot be read (here: its path
// is longer than the system accepts, which stops root too) is named on
// standard error and in the summary, and the other workbooks are done; an
// output folder inside the input folder, named through a link, is passed
// over and said so.
func TestBatchFoldersReported(t *testing.T) {
	in := t.TempDir()
	fuelLog(t, filepath.Join(in, "a.xlsx"), 3)
	fd, err := syscall.Open(in, syscall.O_RDONLY|syscall.O_DIRECTORY, 0)
	if err != nil {
		t.Fatal(err)
	}
	seg := strings.Repeat("d", 250)
	for i := 0; i < 18; i++ {
		if err := syscall.Mkdirat(fd, seg, 0o755); err != nil {
			t.Fatal(err)
		}
		next, err := syscall.Openat(fd, seg, syscall.O_RDONLY|syscall.O_DIRECTORY, 0)
		syscall.Close(fd)
		if err != nil {
			t.Fatal(err)
		}
		fd = next
	}
	syscall.Close(fd)
	os.MkdirAll(filepath.Join(in, "results"), 0o755)
	link := filepath.Join(t.TempDir(), "results")
	os.Symlink(filepath.Join(in, "results"), link)
	sum := filepath.Join(t.TempDir(), "summary.csv")
	for run := 0; run < 2; run++ {
		code, stdout, stderr := runCLI(t, "batch", in, link, "--summary", sum)
		if code != 1 || !strings.Contains(stderr, "folder could not be read (file name too long)") ||
			!strings.Contains(stderr, "passed over the output folder results") {
			t.Errorf("exit %d\n%s\n%s", code, stdout, stderr)
		}
		if !strings.HasPrefix(stdout, "1 workbooks: ") || !strings.Contains(stdout, "1 unreadable folder") {
			t.Errorf("run %d:\n%s", run, stdout)
		}
	}
	b, _ := os.ReadFile(sum)
	if !strings.Contains(string(b), "/,unreadable,") {
		t.Errorf("summary:\n%s", b)
	}
}
