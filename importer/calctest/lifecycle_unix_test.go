//go:build unix

package calctest

import (
	"errors"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"
	"testing"
	"time"
)

// TestHungSoffice freezes soffice and expects the call to fail with a message in time.
func TestHungSoffice(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	book := writeBook(t, dir, "")
	c := Start(t, dir)
	if got, err := c.Cells(book, "A1"); err != nil || got["A1"] != "42" {
		t.Fatalf("before freezing: %v, %v", got, err)
	}
	c.Timeout = 3 * time.Second
	stopGroup(t, c.soffice.pid())
	t0 := time.Now()
	_, err := c.Cells(book, "A1")
	took := time.Since(t0)
	if err == nil || !strings.Contains(err.Error(), "soffice did not answer within 3s") {
		t.Fatalf("frozen soffice: err = %v, want a timeout error", err)
	}
	if took > 10*time.Second {
		t.Errorf("the timed-out call took %v, want about 3s", took)
	}
	if _, err := c.Cells(book, "A1"); err == nil || !strings.Contains(err.Error(), "unusable") {
		t.Errorf("after the timeout: err = %v, want an unusable-instance error", err)
	}
	if !c.soffice.wait(5 * time.Second) {
		t.Errorf("soffice still running after the timeout killed it")
	}
}

// TestShutdown checks that the cleanup leaves no soffice behind and removes the profile, both
// after a normal run and when the bridge's stdin closes without a goodbye (the Go side died).
func TestShutdown(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	book := writeBook(t, dir, "")
	var pgid int
	var profile string
	t.Run("normal", func(t *testing.T) {
		c := Start(t, dir)
		pgid, profile = c.soffice.pid(), c.profile
		if _, err := c.Cells(book, "A1"); err != nil {
			t.Fatal(err)
		}
	})
	if pgid == 0 {
		t.Skip("no instance started")
	}
	if n := liveGroupMembers(t, pgid); n != 0 {
		t.Errorf("after cleanup %d processes of soffice group %d still run", n, pgid)
	}
	if _, err := os.Stat(profile); !os.IsNotExist(err) {
		t.Errorf("profile %s not removed: %v", profile, err)
	}

	t.Run("go side gone", func(t *testing.T) {
		c := Start(t, dir)
		c.mu.Lock()
		c.toPy.Close() // what the kernel does when the test binary dies
		c.mu.Unlock()
		if !c.soffice.wait(15 * time.Second) {
			t.Fatalf("soffice still running 15s after the bridge lost its stdin")
		}
		if !c.bridge.wait(5 * time.Second) {
			t.Errorf("bridge still running after its stdin closed")
		}
	})
}

// stopGroup freezes a process group (SIGSTOP), as a hung soffice would be.
func stopGroup(t *testing.T, pgid int) {
	t.Helper()
	if err := syscall.Kill(-pgid, syscall.SIGSTOP); err != nil {
		t.Fatalf("SIGSTOP group %d: %v", pgid, err)
	}
}

// liveGroupMembers counts the processes of group pgid that are not zombies, from /proc.
func liveGroupMembers(t *testing.T, pgid int) int {
	t.Helper()
	stats, err := filepath.Glob("/proc/[0-9]*/stat")
	if err != nil || len(stats) == 0 {
		t.Skipf("no /proc to list processes: %v", err)
	}
	n := 0
	for _, p := range stats {
		b, err := os.ReadFile(p)
		if err != nil {
			continue // the process ended meanwhile
		}
		// pid (comm) state ppid pgrp ...; comm may hold spaces, so split after the last ')'.
		s := string(b)
		f := strings.Fields(s[strings.LastIndexByte(s, ')')+1:])
		if len(f) < 3 || f[0] == "Z" {
			continue
		}
		if g, _ := strconv.Atoi(f[2]); g == pgid {
			n++
		}
	}
	return n
}

// TestPortTaken starts a second soffice on the port of a running one: the bridge must notice
// the foreign profile (so Start can retry on another port) and leave nothing running.
func TestPortTaken(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	first := Start(t, dir)
	c, err := launch(lookSoffice(t), dir, first.port)
	if err == nil {
		c.close()
		t.Fatalf("second soffice on port %d: no error", first.port)
	}
	if !errors.Is(err, errPortTaken) || !strings.Contains(err.Error(), "is answered by the soffice with profile "+fileURL(first.profile)) {
		t.Fatalf("second soffice on port %d: err = %v, want errPortTaken naming the first profile", first.port, err)
	}
	if got, err := first.Cells(writeBook(t, dir, ""), "A1"); err != nil || got["A1"] != "42" {
		t.Errorf("first instance after the clash: %v, %v", got, err)
	}
}
