package atomicfile

import (
	"errors"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"unicode/utf8"
)

func TestWrite(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "report.json")
	if err := Write(p, func(w io.Writer) error { _, err := io.WriteString(w, "one"); return err }); err != nil {
		t.Fatal(err)
	}
	boom := errors.New("disk on fire")
	if err := Write(p, func(w io.Writer) error { io.WriteString(w, "half"); return boom }); !errors.Is(err, boom) {
		t.Fatalf("error %v", err)
	}
	if b, _ := os.ReadFile(p); string(b) != "one" {
		t.Errorf("a failed write changed the file: %q", b)
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 1 {
		t.Errorf("temporary files left: %v", entries)
	}
	if fi, _ := os.Stat(p); fi.Mode().Perm() != 0o644 {
		t.Errorf("mode %v", fi.Mode())
	}
	if err := Write(filepath.Join(dir, "missing", "x"), func(io.Writer) error { return nil }); err == nil {
		t.Error("no error for a missing folder")
	}
}

// TestLongNames: a name close to the 255-byte limit of file names (ext4,
// XFS, APFS, NTFS in UTF-16 units) is written all the same: the temporary
// name is cut to fit, never inside a UTF-8 character, and Owner maps it
// back.
func TestLongNames(t *testing.T) {
	dir := t.TempDir()
	for _, base := range []string{
		strings.Repeat("L", 250) + ".csv",
		strings.Repeat("é", 125) + ".x",
		"short.xlsx",
		strings.Repeat("a", 239),
	} {
		p := filepath.Join(dir, base)
		if err := Write(p, func(w io.Writer) error { _, err := io.WriteString(w, "x"); return err }); err != nil {
			t.Errorf("%d-byte name: %v", len(base), err)
		}
		pat := TempPattern(base)
		name := strings.Replace(pat, "*", "4294967295", 1)
		if len(name) > 255 || !utf8.ValidString(name) {
			t.Errorf("temporary name of %d bytes: %q", len(name), name)
		}
		owner, cut, ok := Owner(name)
		if !ok || (cut && !strings.HasPrefix(base, owner)) || (!cut && owner != base) || cut != (len(base) > 239) {
			t.Errorf("Owner(%q) = %q, %v, %v", name, owner, cut, ok)
		}
	}
	if _, _, ok := Owner("notes.txt"); ok {
		t.Error("Owner took a name that is not temporary")
	}
	entries, _ := os.ReadDir(dir)
	for _, e := range entries {
		if strings.HasSuffix(e.Name(), ".tmp") {
			t.Errorf("temporary file left: %s", e.Name())
		}
	}
}
