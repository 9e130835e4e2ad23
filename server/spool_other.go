//go:build !unix

package server

import "io/fs"

// processRunning cannot tell here: every other process's spool folder is kept.
func processRunning(pid int) bool { return true }

// ownedByUs cannot tell here: the folder's permissions are left to the system.
func ownedByUs(fs.FileInfo) bool { return true }
