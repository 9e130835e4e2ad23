//go:build unix

package server

import (
	"errors"
	"io/fs"
	"os"
	"syscall"
)

// processRunning reports whether a process with this id exists (signal 0 checks without
// sending anything; EPERM means it exists under another user).
func processRunning(pid int) bool {
	err := syscall.Kill(pid, 0)
	return err == nil || errors.Is(err, syscall.EPERM)
}

// ownedByUs reports whether a file belongs to the user running the server.
func ownedByUs(fi fs.FileInfo) bool {
	st, ok := fi.Sys().(*syscall.Stat_t)
	return ok && int(st.Uid) == os.Geteuid()
}
