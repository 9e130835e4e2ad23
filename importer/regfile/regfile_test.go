//go:build unix

package regfile

import (
	"errors"
	"io"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

// TestFIFORefusedPromptly opens a named pipe that no one writes to: Check
// and Open must refuse it at once rather than wait for a writer.
func TestFIFORefusedPromptly(t *testing.T) {
	p := filepath.Join(t.TempDir(), "pipe.xlsx")
	if err := syscall.Mkfifo(p, 0o644); err != nil {
		t.Skip("no named pipes here:", err)
	}
	done := make(chan error, 2)
	go func() { done <- Check(p) }()
	go func() {
		f, err := Open(p)
		if f != nil {
			f.Close()
		}
		done <- err
	}()
	for i := 0; i < 2; i++ {
		select {
		case err := <-done:
			var re *Error
			if !errors.As(err, &re) || !strings.Contains(err.Error(), "named pipe (FIFO), not a regular file") {
				t.Errorf("err = %v", err)
			}
		case <-time.After(5 * time.Second):
			t.Fatal("blocked on a named pipe")
		}
	}
}

func TestRegularAndOthers(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "a.csv")
	os.WriteFile(p, []byte("x,y\n"), 0o644)
	link := filepath.Join(dir, "link.csv")
	os.Symlink(p, link)
	for _, name := range []string{p, link} {
		f, err := Open(name)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		b, _ := io.ReadAll(f)
		f.Close()
		if string(b) != "x,y\n" {
			t.Errorf("read %q", b)
		}
	}
	for path, kind := range map[string]string{dir: "a folder", "/dev/null": "a character device"} {
		if _, err := os.Stat(path); err != nil {
			continue
		}
		if _, err := Open(path); err == nil || !strings.Contains(err.Error(), kind) {
			t.Errorf("%s: %v", path, err)
		}
	}
	if _, err := Open(filepath.Join(dir, "missing.csv")); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("missing: %v", err)
	}
	if err := (&Error{Path: "a\nb", Kind: "a folder"}).Error(); strings.Contains(err, "\n") {
		t.Errorf("message holds a raw line break: %q", err)
	}
}
