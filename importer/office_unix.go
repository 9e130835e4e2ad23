//go:build unix

package importer

import (
	"os/exec"
	"syscall"
)

// ownProcessGroup starts cmd as the leader of a new process group, so that
// killing the group also ends what it spawned (soffice starts oosplash,
// which starts soffice.bin).
func ownProcessGroup(cmd *exec.Cmd) {
	cmd.SysProcAttr = &syscall.SysProcAttr{Setpgid: true}
}

// killProcessGroup sends SIGKILL to cmd's process group; a group already
// gone is fine.
func killProcessGroup(cmd *exec.Cmd) {
	if cmd.Process != nil {
		_ = syscall.Kill(-cmd.Process.Pid, syscall.SIGKILL)
	}
}
