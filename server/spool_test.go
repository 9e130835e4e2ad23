package server

import (
	"net/http"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"testing"
	"time"
)

// deadPID is the id of a process that has ended.
func deadPID(t *testing.T) int {
	t.Helper()
	cmd := exec.Command("true")
	if err := cmd.Run(); err != nil {
		t.Skipf("cannot run a process: %v", err)
	}
	pid := cmd.Process.Pid
	if processRunning(pid) {
		t.Skipf("process %d was reused already", pid)
	}
	return pid
}

func mkfile(t *testing.T, path string, age time.Duration) {
	t.Helper()
	if err := os.MkdirAll(filepath.Dir(path), 0o700); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, []byte("PK\x03\x04 upload"), 0o600); err != nil {
		t.Fatal(err)
	}
	old := time.Now().Add(-age)
	for p := path; p != filepath.Dir(p) && len(p) > 1; p = filepath.Dir(p) {
		os.Chtimes(p, old, old)
		if filepath.Base(filepath.Dir(p)) == filepath.Base(os.TempDir()) {
			break
		}
	}
}

// TestStaleSpoolRemoved: uploads a crashed server left behind (its process is gone) are removed
// when the next server starts; those of a server still running are kept. Uploads of earlier
// versions are removed once they are older than any request can last.
func TestStaleSpoolRemoved(t *testing.T) {
	tmp := t.TempDir()
	dead := filepath.Join(tmp, spoolDirName, strconv.Itoa(deadPID(t))+".1700000000000000000")
	mkfile(t, filepath.Join(dead, "req-123", "upload.xlsx"), time.Minute)
	live := filepath.Join(tmp, spoolDirName, strconv.Itoa(os.Getppid())+".1700000000000000000")
	mkfile(t, filepath.Join(live, "req-456", "upload.xlsx"), time.Hour)
	oldLegacy := filepath.Join(tmp, legacySpoolPrefix+"111")
	mkfile(t, filepath.Join(oldLegacy, "upload.xlsx"), 24*time.Hour)
	newLegacy := filepath.Join(tmp, legacySpoolPrefix+"222")
	mkfile(t, filepath.Join(newLegacy, "upload.xlsx"), time.Second)
	other := filepath.Join(tmp, "someone-else", "file.txt")
	mkfile(t, other, 24*time.Hour)

	ann := AnnotateHandler(newEngine(t), AnnotateConfig{TempDir: tmp, Timeout: time.Minute})
	for _, c := range []struct {
		path string
		keep bool
	}{{dead, false}, {live, true}, {oldLegacy, false}, {newLegacy, true}, {other, true}} {
		_, err := os.Stat(c.path)
		if kept := err == nil; kept != c.keep {
			t.Errorf("%s: kept %v, want %v", c.path, kept, c.keep)
		}
	}

	// requests spool into this process's folder and leave nothing; stopping removes the folder
	ts := startServer(t, Config{Annotate: ann})
	csvBody := "Site,Fuel,Quantity,Unit\nDepot,diesel,1200,L\n"
	if r := do(t, http.MethodPost, ts.URL+"/v1/annotate", map[string]string{"Content-Type": "text/csv"}, csvBody); r.Status != 200 {
		t.Fatalf("%d %s", r.Status, r.Body)
	}
	mine, _ := filepath.Glob(filepath.Join(tmp, spoolDirName, strconv.Itoa(os.Getpid())+".*"))
	if len(mine) != 1 {
		t.Fatalf("this process's spool folders: %v", mine)
	}
	if left, _ := os.ReadDir(mine[0]); len(left) != 0 {
		t.Errorf("left in the spool folder after the request: %v", left)
	}
	if err := ts.stop(); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(mine[0]); !os.IsNotExist(err) {
		t.Errorf("the spool folder outlived the server: %v", err)
	}
}

// TestSpoolFolderMustBeOurs: a spool folder that is a link, or that others may write to, is
// not used (nor cleaned): uploads go to per-request folders in the temporary folder instead.
func TestSpoolFolderMustBeOurs(t *testing.T) {
	for _, setup := range []func(t *testing.T, tmp string){
		func(t *testing.T, tmp string) {
			elsewhere := t.TempDir()
			mkfile(t, filepath.Join(elsewhere, strconv.Itoa(deadPID(t))+".1", "keep.txt"), time.Hour)
			if err := os.Symlink(elsewhere, filepath.Join(tmp, spoolDirName)); err != nil {
				t.Skip(err)
			}
		},
		func(t *testing.T, tmp string) {
			dir := filepath.Join(tmp, spoolDirName)
			mkfile(t, filepath.Join(dir, strconv.Itoa(deadPID(t))+".1", "keep.txt"), time.Hour)
			if err := os.Chmod(dir, 0o777); err != nil {
				t.Fatal(err)
			}
		},
	} {
		tmp := t.TempDir()
		setup(t, tmp)
		h := AnnotateHandler(newEngine(t), AnnotateConfig{TempDir: tmp}).(*annotateHandler)
		if h.spool != nil {
			t.Errorf("the spool folder %s was used", filepath.Join(tmp, spoolDirName))
		}
		if kept, _ := filepath.Glob(filepath.Join(tmp, spoolDirName, "*", "keep.txt")); len(kept) != 1 {
			t.Errorf("a folder in someone else's spool folder was removed")
		}
		dir, err := h.requestDir()
		if err != nil || filepath.Dir(dir) != tmp {
			t.Errorf("request folder %s (%v), want one in %s", dir, err, tmp)
		}
		os.RemoveAll(dir)
	}
}
