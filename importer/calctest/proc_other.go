//go:build !unix

package calctest

import "os/exec"

// setProcessGroup is a no-op where process groups do not exist.
func setProcessGroup(cmd *exec.Cmd) {}

// killGroup kills the child itself where process groups do not exist.
func killGroup(cmd *exec.Cmd) {
	if cmd.Process != nil {
		_ = cmd.Process.Kill()
	}
}
