//go:build unix

package regfile

import (
	"os"
	"syscall"
)

// openNonblock opens path read-only with O_NONBLOCK, so that opening a
// named pipe returns at once; on a regular file the flag changes nothing.
func openNonblock(path string) (*os.File, error) {
	return os.OpenFile(path, os.O_RDONLY|syscall.O_NONBLOCK, 0)
}
