// Package atomicfile writes a file so that it is either complete or absent:
// the content goes to a temporary file in the same folder, which is synced
// and renamed over the destination. Readers never see a half-written file,
// and a process killed mid-write leaves at most a hidden ".NAME.*.tmp"
// (TempPattern; Owner maps such a name back to NAME).
package atomicfile

import (
	"io"
	"os"
	"path/filepath"
	"strings"
	"unicode/utf8"
)

// maxWhole is the longest name kept whole in a temporary name: file
// systems take names of up to 255 bytes (ext4, XFS, Btrfs; APFS and NTFS
// count characters, so bytes are the safe bound), and a temporary name
// adds 16 (".", ".", up to 10 random digits, ".tmp").
const maxWhole = 255 - 16

// TempPattern is the os.CreateTemp pattern of the temporary file that
// stands for the file named base: ".base.*.tmp", or for a name longer than
// maxWhole bytes its beginning (never cut inside a UTF-8 character) and a
// "~": ".beginning~.*.tmp", so that a legal name never fails for want of
// room in its temporary name.
func TempPattern(base string) string {
	if len(base) <= maxWhole {
		return "." + base + ".*.tmp"
	}
	n := maxWhole - 1
	for n > 0 && !utf8.RuneStart(base[n]) {
		n--
	}
	return "." + base[:n] + "~.*.tmp"
}

// Owner returns the name of the file a temporary name made with
// TempPattern stands for (".name.xlsx.123.tmp" gives name.xlsx). When cut
// is true, name is the beginning of a longer name (the temporary name of
// one too long to keep whole); a name of exactly that form that ends in
// "~" may also be whole, so a caller looks for an exact match first. ok
// is false for a name that is not temporary.
func Owner(temp string) (name string, cut, ok bool) {
	if !strings.HasPrefix(temp, ".") || !strings.HasSuffix(temp, ".tmp") {
		return "", false, false
	}
	name = strings.TrimSuffix(strings.TrimPrefix(temp, "."), ".tmp")
	if i := strings.LastIndexByte(name, '.'); i > 0 {
		name = name[:i] // the random part
	}
	if strings.HasSuffix(name, "~") && len(name) >= maxWhole-utf8.UTFMax {
		return strings.TrimSuffix(name, "~"), true, true
	}
	return name, false, true
}

// Write creates path with the content fill writes. On any error, including
// one returned by fill, the temporary file is removed and path is left as
// it was. The file gets mode 0644.
func Write(path string, fill func(w io.Writer) error) (err error) {
	dir, base := filepath.Split(path)
	if dir == "" {
		dir = "."
	}
	tmp, err := os.CreateTemp(dir, TempPattern(base))
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
