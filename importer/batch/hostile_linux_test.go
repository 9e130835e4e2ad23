package batch

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"sync/atomic"
	"syscall"
	"testing"
	"time"
)

// TestUnreadableFolderReported: a folder that cannot be read is a row of
// the summary (status unreadable, with the reason); the other files are
// annotated. As root every folder is readable, so this variant skips;
// TestTooLongFolderReported runs everywhere.
func TestUnreadableFolderReported(t *testing.T) {
	if os.Geteuid() == 0 {
		t.Skip("root reads every folder; TestTooLongFolderReported covers an unreadable folder as root")
	}
	in := tree(t, map[string]string{"a.xlsx": "a", "locked/b.xlsx": "b", "z/c.xlsx": "c"})
	locked := filepath.Join(in, "locked")
	if err := os.Chmod(locked, 0); err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { os.Chmod(locked, 0o755) })
	checkUnreadable(t, in, "locked/", "permission denied", 2)
}

// TestTooLongFolderReported: a folder whose path is longer than the system
// accepts (PATH_MAX, 4096 bytes on Linux) cannot be listed, even by root.
func TestTooLongFolderReported(t *testing.T) {
	in := tree(t, map[string]string{"a.xlsx": "a", "z/c.xlsx": "c"})
	seg := strings.Repeat("d", 250)
	fd, err := syscall.Open(in, syscall.O_RDONLY|syscall.O_DIRECTORY, 0)
	if err != nil {
		t.Fatal(err)
	}
	rel := ""
	for i := 0; i < 18; i++ { // 18 x 251 bytes: beyond 4096
		if err := syscall.Mkdirat(fd, seg, 0o755); err != nil {
			syscall.Close(fd)
			t.Skip("cannot build a deep folder here:", err)
		}
		next, err := syscall.Openat(fd, seg, syscall.O_RDONLY|syscall.O_DIRECTORY, 0)
		syscall.Close(fd)
		if err != nil {
			t.Fatal(err)
		}
		fd = next
		rel += seg + "/"
	}
	syscall.Close(fd)
	// The first folder too long to read is reported; its parent is listed.
	long := ""
	for p := seg + "/"; ; p += seg + "/" {
		if len(filepath.Join(in, p)) >= 4096 {
			long = p
			break
		}
	}
	checkUnreadable(t, in, long, "file name too long", 2)
}

func checkUnreadable(t *testing.T, in, folder, why string, files int) {
	t.Helper()
	var calls atomic.Int64
	s, err := Run(context.Background(), Config{InDir: in, OutDir: filepath.Join(t.TempDir(), "out"), Annotate: copyAnnotate(&calls)})
	if err != nil {
		t.Fatalf("one unreadable folder stopped the run: %v", err)
	}
	if calls.Load() != int64(files) || s.Written != files {
		t.Errorf("%d files annotated, %d written; want %d", calls.Load(), s.Written, files)
	}
	var row *FileResult
	for i, f := range s.Files {
		if f.Status == StatusUnreadable {
			row = &s.Files[i]
		}
	}
	if row == nil || row.File != folder || !strings.Contains(row.Error, why) || s.Unreadable != 1 {
		t.Fatalf("unreadable folder not reported as %q (%s): %+v", folder, why, s.Files)
	}
	recs := readSummary(t, s)
	found := false
	for _, r := range recs {
		found = found || r[0] == folder && r[1] == StatusUnreadable && strings.Contains(r[7], why)
	}
	if !found {
		t.Errorf("summary lacks the unreadable folder: %q", recs)
	}
}

// TestFIFONeverOpened: a named pipe put where a workbook was listed is
// refused at once; reading it would wait for a writer forever.
func TestFIFONeverOpened(t *testing.T) {
	in := tree(t, map[string]string{"a.xlsx": "a"})
	out := t.TempDir()
	p := filepath.Join(in, "pipe.xlsx")
	if err := syscall.Mkfifo(p, 0o644); err != nil {
		t.Skip("no named pipes:", err)
	}
	var calls atomic.Int64
	done := make(chan FileResult, 1)
	go func() {
		done <- one(context.Background(), Config{Annotate: copyAnnotate(&calls)}, stamps{dir: filepath.Join(out, stampDir)}, in, out, "pipe.xlsx")
	}()
	select {
	case r := <-done:
		if r.Status != StatusFailed || !strings.Contains(r.Error, "named pipe (FIFO), not a regular file") || calls.Load() != 0 {
			t.Errorf("%+v, %d annotations", r, calls.Load())
		}
	case <-time.After(5 * time.Second):
		t.Fatal("blocked opening a named pipe")
	}
	// Listed normally, the pipe is passed over.
	s, err := Run(context.Background(), Config{InDir: in, OutDir: filepath.Join(out, "o"), Annotate: copyAnnotate(&calls)})
	if err != nil || len(s.Files) != 1 || s.Skipped != 1 {
		t.Errorf("%v %+v", err, s)
	}
}
