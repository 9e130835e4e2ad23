// Package atomicfile writes a file so that it is either complete or absent:
// the content goes to a temporary file in the same folder, which is synced
// and renamed over the destination. Readers never see a half-written file,
// and a process killed mid-write leaves at most a hidden ".NAME.*.tmp".
package atomicfile

import (
	"io"
	"os"
	"path/filepath"
)

// Write creates path with the content fill writes. On any error, including
// one returned by fill, the temporary file is removed and path is left as
// it was. The file gets mode 0644.
func Write(path string, fill func(w io.Writer) error) (err error) {
	dir, base := filepath.Split(path)
	if dir == "" {
		dir = "."
	}
	tmp, err := os.CreateTemp(dir, "."+base+".*.tmp")
	if err != nil {
		return err
	}
	name := tmp.Name()
	defer func() {
		if err != nil {
			tmp.Close()
			os.Remove(name)
		}
	}()
	if err = tmp.Chmod(0o644); err != nil {
		return err
	}
	if err = fill(tmp); err != nil {
		return err
	}
	if err = tmp.Sync(); err != nil {
		return err
	}
	if err = tmp.Close(); err != nil {
		return err
	}
	return os.Rename(name, path)
}
