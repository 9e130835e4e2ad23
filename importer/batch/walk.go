package batch

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path"
	"path/filepath"
	"slices"
	"sort"
	"strings"

	"github.com/fluecell/fluecell/importer/safetext"
)

// folders checks the input and output folders of a run and returns their
// real paths (absolute, symbolic links resolved), so that an output folder
// named through a link into the input folder, or an input folder named
// through a link, is recognised for what it is. The output folder need not
// exist yet.
func folders(inDir, outDir string) (in, out string, err error) {
	in, err = realPath(inDir)
	if err != nil {
		return "", "", fmt.Errorf("batch: input folder %s: %w", safetext.Name(inDir), err)
	}
	inInfo, err := os.Stat(in)
	if err != nil || !inInfo.IsDir() {
		return "", "", fmt.Errorf("batch: input folder %s is not a readable folder", safetext.Name(inDir))
	}
	out, err = realPath(outDir)
	if err != nil {
		return "", "", fmt.Errorf("batch: output folder %s: %w", safetext.Name(outDir), err)
	}
	// The same folder by another path: a bind mount, or a name differing in
	// case on a file system that ignores case.
	outInfo, err := os.Stat(out)
	if in == out || err == nil && os.SameFile(inInfo, outInfo) {
		return "", "", fmt.Errorf("batch: the output folder must differ from the input folder %s (inputs are never overwritten)", safetext.Name(inDir))
	}
	if within(in, out) {
		return "", "", fmt.Errorf("batch: the input folder %s lies inside the output folder %s", safetext.Name(inDir), safetext.Name(outDir))
	}
	return in, out, nil
}

// realPath returns p absolute with every symbolic link resolved; the part
// of p that does not exist yet is appended as it is.
func realPath(p string) (string, error) {
	abs, err := filepath.Abs(p)
	if err != nil {
		return "", err
	}
	var rest []string
	for {
		real, err := filepath.EvalSymlinks(abs)
		if err == nil {
			return filepath.Join(append([]string{real}, rest...)...), nil
		}
		if !errors.Is(err, fs.ErrNotExist) {
			return "", err
		}
		parent := filepath.Dir(abs)
		if parent == abs {
			return "", err
		}
		rest = append([]string{filepath.Base(abs)}, rest...)
		abs = parent
	}
}

// within reports whether p lies below dir (both clean and absolute).
func within(p, dir string) bool {
	rel, err := filepath.Rel(dir, p)
	return err == nil && rel != "." && rel != ".." && !strings.HasPrefix(rel, ".."+string(filepath.Separator))
}

// listing is what listWorkbooks found below the input folder.
type listing struct {
	files      []string     // workbooks, relative and slash-separated, sorted
	skipped    int          // other files passed over
	unreadable []FileResult // folders that could not be listed
	notes      []string
}

// listWorkbooks lists the workbooks below in. Hidden files and folders,
// office lock files (~$name.xlsx), symbolic links and anything that is not
// a regular file are passed over, and so is the output folder when it lies
// inside in (recognised as the same folder, whatever path leads to it). A
// folder that cannot be listed becomes a row with StatusUnreadable and the
// reason; the others are listed all the same. Only an input folder that
// cannot be listed at all is an error. The files at the real paths
// exclude are passed over and said so.
func listWorkbooks(in, out string, exclude ...string) (*listing, error) {
	l := &listing{}
	var outInfo fs.FileInfo
	if within(out, in) {
		outInfo, _ = os.Stat(out)
	}
	var walk func(dir, rel string) error
	walk = func(dir, rel string) error {
		entries, err := os.ReadDir(dir)
		if err != nil {
			if rel == "" {
				return fmt.Errorf("batch: reading the input folder: %w", err)
			}
			l.unreadable = append(l.unreadable, FileResult{File: rel + "/", Status: StatusUnreadable,
				Error: "folder could not be read (" + reason(err) + "); the workbooks in it, if any, were not annotated"})
			// os.ReadDir returns what it read before the error: go on with it.
		}
		for _, d := range entries {
			name := d.Name()
			p := filepath.Join(dir, name)
			r := path.Join(rel, name)
			if d.IsDir() {
				if strings.HasPrefix(name, ".") {
					continue
				}
				if outInfo != nil && (p == out || sameDir(d, outInfo)) {
					l.notes = append(l.notes, fmt.Sprintf("passed over the output folder %s, which lies inside the input folder", safetext.Name(r)))
					continue
				}
				if err := walk(p, r); err != nil {
					return err
				}
				continue
			}
			if !d.Type().IsRegular() || strings.HasPrefix(name, ".") || strings.HasPrefix(name, "~$") || !isWorkbook(name) {
				l.skipped++
				continue
			}
			if slices.Contains(exclude, p) {
				l.notes = append(l.notes, fmt.Sprintf("passed over %s, which this run writes", safetext.Name(r)))
				continue
			}
			l.files = append(l.files, r)
		}
		return nil
	}
	if err := walk(in, ""); err != nil {
		return nil, err
	}
	sort.Strings(l.files)
	return l, nil
}

// sameDir reports whether the folder entry d is the folder out.
func sameDir(d fs.DirEntry, out fs.FileInfo) bool {
	fi, err := d.Info()
	return err == nil && os.SameFile(fi, out)
}

// reason is the cause of a file system error without the path, which the
// caller names (a deep path can run to thousands of characters).
func reason(err error) string {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err.Error()
	}
	return err.Error()
}
