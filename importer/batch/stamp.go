package batch

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"io"
	"os"
	"path"
	"path/filepath"

	"github.com/fluecell/fluecell/importer/atomicfile"
	"github.com/fluecell/fluecell/importer/regfile"
)

// stampDir is the folder below the output folder that holds one stamp per
// output: the input's hash and the fingerprint it was made with.
const stampDir = ".fluecell-batch"

type stamp struct {
	InputSHA256 string  `json:"input_sha256"`
	Fingerprint string  `json:"fingerprint"`
	OutputSize  int64   `json:"output_size"`
	Outcome     Outcome `json:"outcome"`
}

type stamps struct{ dir string }

func (s stamps) path(rel string) string {
	return filepath.Join(s.dir, filepath.FromSlash(stampRel(rel)))
}

// stampRel is the path of the stamp of the input at rel, relative to the
// stamp folder and slash-separated: rel.json, or for a name too long to
// take ".json" and still leave room for a temporary name (see
// atomicfile.TempPattern), "~" and the SHA-256 of the name in the same
// folder.
func stampRel(rel string) string {
	dir, base := path.Split(rel)
	if len(base)+len(".json")+16 > 255 {
		sum := sha256.Sum256([]byte(base))
		base = "~" + hex.EncodeToString(sum[:20])
	}
	return dir + base + ".json"
}

// upToDate reports whether dst was made from an input with this hash and
// this fingerprint, and is still the file that was written.
func (s stamps) upToDate(rel, dst, sum, fingerprint string) (stamp, bool) {
	f, err := regfile.Open(s.path(rel))
	if err != nil {
		return stamp{}, false
	}
	b, err := io.ReadAll(io.LimitReader(f, 1<<20))
	f.Close()
	if err != nil {
		return stamp{}, false
	}
	var st stamp
	if json.Unmarshal(b, &st) != nil || st.InputSHA256 != sum || st.Fingerprint != fingerprint {
		return stamp{}, false
	}
	fi, err := os.Stat(dst)
	if err != nil || fi.Size() != st.OutputSize {
		return stamp{}, false
	}
	return st, true
}

// write records dst's stamp, atomically; it is written after dst is in
// place, so that a run killed in between only redoes that file.
func (s stamps) write(rel, dst, sum, fingerprint string, o Outcome) error {
	fi, err := os.Stat(dst)
	if err != nil {
		return err
	}
	b, err := json.Marshal(stamp{InputSHA256: sum, Fingerprint: fingerprint, OutputSize: fi.Size(), Outcome: o})
	if err != nil {
		return err
	}
	p := s.path(rel)
	if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
		return err
	}
	return atomicfile.Write(p, func(w io.Writer) error { _, err := w.Write(b); return err })
}

func (s stamps) remove(rel string) { os.Remove(s.path(rel)) }

// hashFile returns the SHA-256 of the regular file at path in hex; it
// refuses anything else (a named pipe would block the worker for ever).
func hashFile(path string) (string, error) {
	f, err := regfile.Open(path)
	if err != nil {
		return "", err
	}
	defer f.Close()
	h := sha256.New()
	if _, err := io.Copy(h, f); err != nil {
		return "", err
	}
	return hex.EncodeToString(h.Sum(nil)), nil
}
