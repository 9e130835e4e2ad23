// Package regfile opens input files for reading only when they are
// regular files. Opening a named pipe (FIFO) for reading blocks until a
// writer appears, and a device such as /dev/zero or /dev/urandom never
// ends; neither is a workbook, a mapping or a factor pack. Check refuses
// them before anything opens the path, and Open re-checks the file it
// opened (the path may have been replaced in between) without ever
// blocking on a pipe.
package regfile

import (
	"fmt"
	"io/fs"
	"os"

	"github.com/fluecell/fluecell/importer/safetext"
)

// Error is the refusal of a path that is not a regular file.
type Error struct {
	Path string
	Kind string // "a named pipe (FIFO)", "a folder", ...
}

func (e *Error) Error() string {
	return fmt.Sprintf("%s is %s, not a regular file: give the path of a file", safetext.Name(e.Path), e.Kind)
}

// kind names what a non-regular mode is.
func kind(m fs.FileMode) string {
	switch {
	case m.IsDir():
		return "a folder"
	case m&fs.ModeNamedPipe != 0:
		return "a named pipe (FIFO)"
	case m&fs.ModeSocket != 0:
		return "a socket"
	case m&fs.ModeCharDevice != 0:
		return "a character device"
	case m&fs.ModeDevice != 0:
		return "a device"
	case m&fs.ModeIrregular != 0:
		return "an irregular file"
	}
	return "not a plain file"
}

// Check returns nil when path (after following symbolic links) is a
// regular file, an *Error when it is something else, and the error of
// os.Stat when it cannot be found or read.
func Check(path string) error {
	fi, err := os.Stat(path)
	if err != nil {
		return err
	}
	if !fi.Mode().IsRegular() {
		return &Error{Path: path, Kind: kind(fi.Mode())}
	}
	return nil
}

// Open opens path for reading when it is a regular file. The path is
// checked first, then opened without blocking (a pipe put in its place
// meanwhile does not wait for a writer) and the opened file checked again.
func Open(path string) (*os.File, error) {
	if err := Check(path); err != nil {
		return nil, err
	}
	f, err := openNonblock(path)
	if err != nil {
		return nil, err
	}
	fi, err := f.Stat()
	if err != nil {
		f.Close()
		return nil, err
	}
	if !fi.Mode().IsRegular() {
		f.Close()
		return nil, &Error{Path: path, Kind: kind(fi.Mode())}
	}
	return f, nil
}
