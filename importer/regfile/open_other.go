//go:build !unix

package regfile

import "os"

// openNonblock opens path read-only; where there are no named pipes in the
// file system, the check before opening suffices.
func openNonblock(path string) (*os.File, error) { return os.Open(path) }
