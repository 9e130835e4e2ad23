package importer

import (
	"errors"
	"os"
	"path/filepath"
	"runtime"
	"runtime/debug"
	"strings"
	"testing"
	"time"

	"github.com/fluecell/fluecell/funcs"
)

// fuzzAllocCap bounds what one annotation of a fuzzed workbook may
// allocate in all (runtime.MemStats.TotalAlloc, which bounds the peak):
// the inputs are small and Options.MaxUnzippedBytes is 8 MB, so the part
// limits and the memory budget keep it far below.
const fuzzAllocCap = 1 << 30

// FuzzAnnotate feeds the whole annotate path hostile workbooks: a zip
// container as given (whole = true), or a valid fuel log whose worksheet,
// shared strings, styles and workbook parts are replaced by the fuzzed
// ones (an empty one is kept as it was; "-" removes the part). Scan,
// Inspect and Annotate must return nil or an input error (never a panic,
// an internal or I/O error, or a stack in a message), finish in 20 s and
// allocate under fuzzAllocCap. The corpus of seeds (every malformation of
// TestMalformedWorkbooks, a shared-strings bomb, truncated and damaged
// zips) runs with go test; .ci/run fuzzes for FLUECELL_FUZZTIME when set.
func FuzzAnnotate(f *testing.F) {
	base := logParts(f)
	good := base.zipBytes(f)
	f.Add(good, true, []byte{}, []byte{}, []byte{}, []byte{})
	f.Add(good[:len(good)/2], true, []byte{}, []byte{}, []byte{}, []byte{})
	damaged := append([]byte(nil), good...)
	for i := len(damaged) / 3; i < len(damaged)/3+64; i++ {
		damaged[i] ^= 0x5a
	}
	f.Add(damaged, true, []byte{}, []byte{}, []byte{}, []byte{})
	for _, m := range malformations() {
		p := m.parts(f, base)
		f.Add(p.zipBytes(f), true, []byte{}, []byte{}, []byte{}, []byte{})
	}
	f.Add([]byte{}, false, []byte(seedSheet), []byte(seedSST), []byte{}, []byte{})
	f.Add([]byte{}, false, []byte{}, []byte{}, []byte("-"), []byte{})
	f.Add([]byte{}, false, []byte{}, []byte{}, []byte(`<styleSheet><cellXfs count="1"><xf numFmtId="0"/></cellXfs></styleSheet>`), []byte{})
	f.Add([]byte{}, false, []byte{}, []byte(`<sst><si><t>`+strings.Repeat("x", 1<<16)+`</t></si></sst>`), []byte{}, []byte{})
	f.Add([]byte{}, false, []byte{}, []byte(`<sst>`+strings.Repeat("<si><t>a</t></si>", 9<<20/17)+`</sst>`), []byte{}, []byte{}) // over the 8 MB limit
	f.Add([]byte{}, false, []byte{}, []byte{}, []byte{}, []byte(`<workbook><sheets><sheet name="Log" sheetId="1" r:id="rId1"/><sheet name="Log" sheetId="2" r:id="rId9"/></sheets></workbook>`))
	e := testEngine(f)
	f.Fuzz(func(t *testing.T, container []byte, whole bool, sheet, sst, styles, wb []byte) {
		data := container
		if !whole {
			p := base.clone()
			for name, b := range map[string][]byte{partSheet: sheet, partSST: sst, partStyles: styles, partWB: wb} {
				switch {
				case string(b) == "-":
					delete(p, name)
				case len(b) > 0:
					p[name] = b
				}
			}
			data = p.zipBytes(t)
		}
		fuzzAnnotateOnce(t, e, data)
	})
}

// fuzzAnnotateOnce writes data as a workbook and runs annotateHostile on it
// under the allocation cap.
func fuzzAnnotateOnce(t *testing.T, e *funcs.Engine, data []byte) {
	dir := t.TempDir()
	path := filepath.Join(dir, "in.xlsx")
	must(t, os.WriteFile(path, data, 0o644))
	defer debug.SetMemoryLimit(debug.SetMemoryLimit(2 << 30))
	var m0, m1 runtime.MemStats
	runtime.ReadMemStats(&m0)
	t0 := time.Now()
	err := annotateHostile(t, e, path, Options{MaxUnzippedBytes: 8 << 20})
	runtime.ReadMemStats(&m1)
	if alloc := m1.TotalAlloc - m0.TotalAlloc; alloc > fuzzAllocCap {
		t.Fatalf("allocated %s in %v, over the cap of %s (err %v)", byteSize(int64(alloc)), time.Since(t0), byteSize(fuzzAllocCap), err)
	}
	var ie *Error
	if err != nil && !errors.As(err, &ie) {
		t.Fatalf("error of type %T: %v", err, err)
	}
}
