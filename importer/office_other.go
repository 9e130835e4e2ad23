//go:build !unix

package importer

import "os/exec"

// ownProcessGroup does nothing where process groups are not available.
func ownProcessGroup(cmd *exec.Cmd) {}

// killProcessGroup kills cmd's process only.
func killProcessGroup(cmd *exec.Cmd) {
	if cmd.Process != nil {
		_ = cmd.Process.Kill()
	}
}
