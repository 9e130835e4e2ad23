package importer

import (
	"encoding/binary"
	"fmt"
	"os"
	"runtime"
)

// The values a table keeps per row (its stored cells, its results, the
// samples of its checks) live in pages of 4096 rows. While the pages of
// a scan fit in its budget they stay in memory; beyond it, pages not used
// lately (a clock: a page used since the hand last passed gets another
// round) are written to a temporary file and read back when a row of
// theirs is used again. Results are the same either way: a page on disk is
// an exact copy. Memory therefore stays near the budget however many rows a
// workbook has, and a workbook that fits costs no disk work at all.

const (
	pageShift = 12 // rows per page: 1 << pageShift

	// DefaultPageBudget is the memory the per-row values of one scan may
	// take before pages go to a temporary file (Options.PageBudget), in
	// bytes. A 100 000-row, ten-column fuel log needs about 27 MB, so
	// about 12 MB of it goes to the file; the peak memory of a million
	// rows is then within 1.2 times that of 100 000 (see DEVELOPERS.md).
	DefaultPageBudget = 16 << 20
)

// evictable is a page of any element type, as the clock of a pageSet sees it.
type evictable interface {
	// take reports whether the page may be written out now: a page used
	// since the clock last passed it is given another round instead.
	take() bool
	// evict writes the page to the file when it differs from its copy
	// there, and drops its data. It returns the bytes freed.
	evict(ps *pageSet) int64
	loaded() bool
}

// pageSet holds the pages of one scan within a budget of resident bytes.
// It is used by one goroutine at a time.
type pageSet struct {
	budget   int64
	shift    uint // rows per page: 1 << shift
	resident int64
	ring     []evictable // pages with data in memory or on disk, for the clock
	hand     int
	f        *os.File // the temporary file, created at the first eviction
	end      int64    // bytes written to f
	written  int64    // pages written, for tests
	failed   error    // a write that failed: pages stay in memory from then on
	scratch  []byte
}

// newPageSet returns a set with the given budget in bytes (0 for
// DefaultPageBudget; negative keeps every page in memory) and pages of
// 1<<shift rows (0 for pageShift; tests use small pages).
func newPageSet(budget int64, shift uint) *pageSet {
	if budget == 0 {
		budget = DefaultPageBudget
	}
	if shift == 0 {
		shift = pageShift
	}
	return &pageSet{budget: budget, shift: shift}
}

// spilled reports how many pages were written to the temporary file.
func (ps *pageSet) spilled() int64 { return ps.written }

// grew counts n more resident bytes, and writes pages out while over budget.
// keep is the page being used, which is never the one written out.
func (ps *pageSet) grew(n int64, keep evictable) {
	ps.resident += n
	if ps.budget < 0 || ps.failed != nil {
		return
	}
	for tries := 2 * len(ps.ring); ps.resident > ps.budget && tries > 0; tries-- {
		if ps.hand >= len(ps.ring) {
			ps.hand = 0
		}
		p := ps.ring[ps.hand]
		ps.hand++
		if p == keep || !p.loaded() || !p.take() {
			continue
		}
		ps.resident -= p.evict(ps)
		if ps.failed != nil {
			return
		}
	}
}

// write appends b to the temporary file and returns its offset.
func (ps *pageSet) write(b []byte) (int64, bool) {
	if ps.f == nil {
		f, err := os.CreateTemp("", "fluecell-pages-*")
		if err != nil {
			ps.failed = err
			return 0, false
		}
		// The name goes at once where the system allows it; the open file
		// stays readable, and nothing is left behind after a crash.
		if os.Remove(f.Name()) != nil {
			name := f.Name()
			runtime.AddCleanup(ps, func(string) { os.Remove(name) }, name)
		}
		runtime.AddCleanup(ps, func(f *os.File) { f.Close() }, f)
		ps.f = f
	}
	off := ps.end
	if _, err := ps.f.WriteAt(b, off); err != nil {
		ps.failed = err
		return 0, false
	}
	ps.end += int64(len(b))
	ps.written++
	return off, true
}

// writeAt writes b over bytes written before at off.
func (ps *pageSet) writeAt(b []byte, off int64) bool {
	if _, err := ps.f.WriteAt(b, off); err != nil {
		ps.failed = err
		return false
	}
	ps.written++
	return true
}

// read reads n bytes at off from the temporary file into the scratch
// buffer. A failure to read back what fluecell wrote is an I/O fault, not a
// fault of the workbook; it panics with a pageError, which Scan and
// Annotate return as an ErrIO *Error.
func (ps *pageSet) read(off int64, n int) []byte {
	if cap(ps.scratch) < n {
		ps.scratch = make([]byte, n)
	}
	b := ps.scratch[:n]
	if _, err := ps.f.ReadAt(b, off); err != nil {
		panic(pageError{err})
	}
	return b
}

// pageError is a failure to read the temporary file of pages.
type pageError struct{ err error }

func (e pageError) Error() string {
	return "cannot read back the temporary file of rows (" + e.err.Error() + "): check the free space and the temporary folder (TMPDIR)"
}

// asPageError reports a recovered panic value that is a pageError.
func asPageError(r any) (error, bool) {
	e, ok := r.(pageError)
	if !ok {
		return nil, false
	}
	return e, true
}

// pageCodec writes the elements of a page as bytes and reads them back.
type pageCodec[T any] struct {
	enc func(dst []byte, src []T) []byte
	dec func(src []byte, dst []T) error
}

// fixedCodec is the codec of a fixed-size number type.
func fixedCodec[T int8 | uint8 | int32 | uint64 | float64]() pageCodec[T] {
	return pageCodec[T]{
		enc: func(dst []byte, src []T) []byte {
			b, err := binary.Append(dst, binary.LittleEndian, src)
			if err != nil {
				panic(err) // not reached: T is a fixed-size number
			}
			return b
		},
		dec: func(src []byte, dst []T) error {
			_, err := binary.Decode(src, binary.LittleEndian, dst)
			return err
		},
	}
}

// page is the rows of one page of a paged column.
type page[T any] struct {
	data  []T   // nil while on disk
	n     int   // elements in the page (len(data) when loaded)
	ref   bool  // used since the clock last passed
	dirty bool  // data differs from the copy on disk, or there is none
	off   int64 // the copy on disk: offset and length in bytes
	size  int
	owner *paged[T]
}

func (p *page[T]) take() bool {
	if p.ref {
		p.ref = false
		return false
	}
	return true
}

func (p *page[T]) loaded() bool { return p.data != nil }

func (p *page[T]) evict(ps *pageSet) int64 {
	if p.dirty {
		b := p.owner.codec.enc(ps.scratch[:0], p.data)
		ps.scratch = b[:0]
		off, ok := int64(0), false
		if p.size >= len(b) {
			// Written before, and it fits where it was (a number column's
			// pages always do): in place, so the file grows with the rows,
			// not with the writes.
			off, ok = p.off, ps.writeAt(b, p.off)
		} else {
			off, ok = ps.write(b)
		}
		if !ok {
			return 0
		}
		p.off, p.size, p.dirty = off, len(b), false
	}
	freed := int64(cap(p.data)) * p.owner.width
	if a := p.owner; cap(p.data) > cap(a.spare) {
		a.spare = p.data[:0] // the next page this column reads goes here: less garbage
	}
	p.data = nil
	return freed
}

// paged is a column of per-row values, stride elements per row (the cells
// of a row, or one value), kept in pages.
type paged[T any] struct {
	ps     *pageSet
	pages  []*page[T]
	shift  uint // rows per page: 1 << shift
	mask   int  // 1<<shift - 1
	rows   int
	stride int
	width  int64 // bytes per element in memory, for the budget
	codec  pageCodec[T]
	// spare is the data of a page written out, reused by the next page
	// read or begun (one per column, outside the budget).
	spare []T
}

// take returns n elements for a page's data, the spare's when it is large
// enough. They are not cleared: the caller fills them.
func (a *paged[T]) take(n int) []T {
	if cap(a.spare) >= n {
		d := a.spare[:n]
		a.spare = nil
		return d
	}
	return make([]T, n)
}

// newPaged returns an empty paged column of stride elements per row; width
// is an element's size in memory in bytes.
func newPaged[T any](ps *pageSet, stride int, width int64, codec pageCodec[T]) *paged[T] {
	if stride < 1 {
		stride = 1
	}
	return &paged[T]{ps: ps, shift: ps.shift, mask: 1<<ps.shift - 1, stride: stride, width: width, codec: codec}
}

// len is the number of rows.
func (a *paged[T]) len() int {
	if a == nil {
		return 0
	}
	return a.rows
}

// load makes page p's data resident.
func (a *paged[T]) load(p *page[T]) {
	data := a.take(p.n)
	if err := a.codec.dec(a.ps.read(p.off, p.size), data); err != nil {
		panic(pageError{fmt.Errorf("page of %d values: %w", p.n, err)})
	}
	p.data = data
	a.ps.grew(int64(cap(data))*a.width, p)
}

// pageOf returns the resident page of row i.
func (a *paged[T]) pageOf(i int) *page[T] {
	p := a.pages[i>>a.shift]
	if p.data == nil {
		a.load(p)
	}
	p.ref = true
	return p
}

// at returns the first element of row i (the value of a one-element row).
func (a *paged[T]) at(i int) T {
	return a.pageOf(i).data[(i&a.mask)*a.stride]
}

// cell returns a pointer to element s of row i. The pointer is good until
// the next call on any paged column of the same scan; read or write
// through it at once. A write must be followed by touch(i).
func (a *paged[T]) cell(i, s int) *T {
	return &a.pageOf(i).data[(i&a.mask)*a.stride+s]
}

// touch marks row i's page changed (after a write through cell).
func (a *paged[T]) touch(i int) { a.pages[i>>a.shift].dirty = true }

// set sets the first element of row i.
func (a *paged[T]) set(i int, v T) {
	p := a.pageOf(i)
	p.data[(i&a.mask)*a.stride] = v
	p.dirty = true
}

// add appends a row of zero elements and returns them, to be filled at
// once (the same lifetime as cell's pointer).
func (a *paged[T]) add() []T {
	var p *page[T]
	if a.rows&a.mask == 0 {
		p = &page[T]{owner: a}
		a.pages = append(a.pages, p)
		a.ps.ring = append(a.ps.ring, p)
		size := (a.mask + 1) * a.stride // after the first page, a table is long: pages at full size
		if a.rows == 0 {
			size = min(a.mask+1, 16) * a.stride
		}
		p.data = a.take(size)[:0]
		a.ps.grew(int64(cap(p.data))*a.width, p)
	} else {
		p = a.pageOf(a.rows)
	}
	p.ref, p.dirty = true, true
	if len(p.data)+a.stride > cap(p.data) {
		// Grow by doubling, to a page at most.
		grown := make([]T, len(p.data), min(2*cap(p.data), (a.mask+1)*a.stride))
		copy(grown, p.data)
		added := int64(cap(grown)-cap(p.data)) * a.width
		p.data = grown
		a.ps.grew(added, p)
	}
	p.data = p.data[:len(p.data)+a.stride]
	p.n = len(p.data)
	a.rows++
	row := p.data[len(p.data)-a.stride:]
	clear(row) // a spare page's data is not cleared
	return row
}

// push appends a one-element row.
func (a *paged[T]) push(v T) { a.add()[0] = v }

// fill appends n rows with v in every element.
func (a *paged[T]) fill(n int, v T) {
	for n > 0 {
		if a.rows&a.mask != 0 {
			for k, r := 0, a.add(); k < len(r); k++ {
				r[k] = v
			}
			n--
			continue
		}
		// A whole page at once.
		k := min(n, a.mask+1)
		p := &page[T]{owner: a, data: make([]T, k*a.stride), ref: true, dirty: true}
		for j := range p.data {
			p.data[j] = v
		}
		p.n = len(p.data)
		a.pages = append(a.pages, p)
		a.ps.ring = append(a.ps.ring, p)
		a.rows += k
		n -= k
		a.ps.grew(int64(cap(p.data))*a.width, p)
	}
}

// newFixed returns a column of n rows of v, one number each.
func newFixed[T int8 | uint8 | int32 | uint64 | float64](ps *pageSet, n int, v T) *paged[T] {
	a := newPaged(ps, 1, int64(binary.Size(v)), fixedCodec[T]())
	a.fill(n, v)
	return a
}
