package server

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"time"
)

// spoolDirName is the folder, in AnnotateConfig.TempDir, that holds the uploads of every
// fluecell server using that temporary folder: one subfolder per server process, named
// PID.STARTNANOS, and in it one folder per request.
const spoolDirName = "fluecell-spool"

// legacySpoolPrefix names the per-request folders that earlier versions made directly in the
// temporary folder.
const legacySpoolPrefix = "fluecell-annotate-"

// spoolRoot is one server process's spool folder.
type spoolRoot struct {
	dir string // TempDir/fluecell-spool/PID.STARTNANOS
}

// newSpoolRoot makes this process's spool folder under tempDir ("" = the system's temporary
// folder), after removing what crashed or stopped servers left behind: the folders of
// processes no longer running, and folders of earlier versions not touched for staleAfter.
// It returns the number of stale folders removed.
func newSpoolRoot(tempDir string, staleAfter time.Duration) (*spoolRoot, int, error) {
	if tempDir == "" {
		tempDir = os.TempDir()
	}
	base := filepath.Join(tempDir, spoolDirName)
	if err := os.MkdirAll(base, 0o700); err != nil {
		return nil, 0, fmt.Errorf("annotate: spool folder: %w", err)
	}
	// in a shared temporary folder, the spool folder must be ours: not a link, not writable
	// by others (someone else's folder would receive our uploads, and see us remove in it)
	fi, err := os.Lstat(base)
	if err != nil {
		return nil, 0, fmt.Errorf("annotate: spool folder: %w", err)
	}
	if !fi.IsDir() || !ownedByUs(fi) || fi.Mode().Perm()&0o022 != 0 {
		return nil, 0, fmt.Errorf("annotate: spool folder %s is not a folder of this user's that only it can write to", base)
	}
	removed := removeStale(tempDir, base, time.Now().Add(-staleAfter))
	dir := filepath.Join(base, strconv.Itoa(os.Getpid())+"."+strconv.FormatInt(time.Now().UnixNano(), 10))
	if err := os.Mkdir(dir, 0o700); err != nil && !errors.Is(err, fs.ErrExist) {
		return nil, removed, fmt.Errorf("annotate: spool folder: %w", err)
	}
	return &spoolRoot{dir: dir}, removed, nil
}

// removeStale removes the process folders in base whose process is gone, and the legacy
// request folders in tempDir last modified before cutoff. Errors are skipped: a folder that
// cannot be removed now is tried again at the next start.
func removeStale(tempDir, base string, cutoff time.Time) int {
	removed := 0
	if entries, err := os.ReadDir(base); err == nil {
		for _, e := range entries {
			pidText, _, ok := strings.Cut(e.Name(), ".")
			pid, err := strconv.Atoi(pidText)
			if !ok || err != nil || pid <= 0 {
				continue // not ours
			}
			if pid == os.Getpid() || processRunning(pid) {
				continue
			}
			if os.RemoveAll(filepath.Join(base, e.Name())) == nil {
				removed++
			}
		}
	}
	if entries, err := os.ReadDir(tempDir); err == nil {
		for _, e := range entries {
			if !e.IsDir() || !strings.HasPrefix(e.Name(), legacySpoolPrefix) {
				continue
			}
			if info, err := e.Info(); err == nil && info.ModTime().Before(cutoff) {
				if os.RemoveAll(filepath.Join(tempDir, e.Name())) == nil {
					removed++
				}
			}
		}
	}
	return removed
}

// request makes the folder of one request; the caller removes it.
func (s *spoolRoot) request() (string, error) {
	dir, err := os.MkdirTemp(s.dir, "req-")
	if errors.Is(err, fs.ErrNotExist) {
		// removed from outside while the server runs: make it again
		if err = os.MkdirAll(s.dir, 0o700); err == nil {
			dir, err = os.MkdirTemp(s.dir, "req-")
		}
	}
	return dir, err
}

// close removes the process's spool folder and whatever requests still running left in it.
func (s *spoolRoot) close() error { return os.RemoveAll(s.dir) }
