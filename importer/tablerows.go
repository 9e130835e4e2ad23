package importer

import (
	"encoding/binary"
	"errors"
	"math"
)

// The rows a table keeps, in pages (pages.go): the sheet row numbers and the
// stored cells of each row, and the accessors the checks, rules and writers
// use. Each per-row column of a table is a paged column of the scan's page
// set, so a table of a million rows holds no more memory than the budget.

// n is the number of stored data rows.
func (t *table) n() int { return t.rowNums.len() }

// rowNum is the sheet row (1-based) of stored row i.
func (t *table) rowNum(i int) int { return int(t.rowNums.at(i)) }

// val returns a copy of stored cell slot of row i (a page may be written
// out and its memory reused by the next page read, so no pointer into a
// page is handed out). setVal changes a cell.
func (t *table) val(i, slot int) cellVal { return *t.vals[slot].cell(i, 0) }

// setVal sets stored cell slot of row i.
func (t *table) setVal(i, slot int, v cellVal) {
	*t.vals[slot].cell(i, 0) = v
	t.vals[slot].touch(i)
}

// storeRow appends a row numbered num with the stored cells vals
// (len(t.slots) of them).
func (t *table) storeRow(num int, vals []cellVal) {
	if t.rowNums == nil {
		t.rowNums = newPaged(t.ps, 1, 4, fixedCodec[int32]())
		t.vals = make([]*paged[cellVal], len(t.slots))
		for s := range t.vals {
			t.vals[s] = newPaged(t.ps, 1, cellValWidth, cellValCodec(t.internBytes))
		}
	}
	t.rowNums.push(int32(num))
	for s, v := range vals {
		t.vals[s].push(v)
	}
}

// indexOfRow returns the stored row index of sheet row num, or -1.
func (t *table) indexOfRow(num int) int {
	lo, hi := 0, t.n()
	for lo < hi {
		m := (lo + hi) / 2
		if t.rowNum(m) < num {
			lo = m + 1
		} else {
			hi = m
		}
	}
	if lo < t.n() && t.rowNum(lo) == num {
		return lo
	}
	return -1
}

// internBytes returns the table's interned string equal to b, or a new
// string (interned while the table holds few).
func (t *table) internBytes(b []byte) string {
	if v, ok := t.intern[string(b)]; ok {
		return v
	}
	return t.internStr(string(b))
}

// cellValWidth is a cellVal's size in memory in bytes (its text's bytes are
// shared through the table's interned strings, or counted by the GC alone).
const cellValWidth = 32

// cellValCodec writes stored cells as a flag byte, then the number (8 bytes)
// when it is not 0, then the text (length and bytes) when it is not empty.
// Texts read back go through intern, so repeated names share memory.
func cellValCodec(intern func([]byte) string) pageCodec[cellVal] {
	const (
		fFormula = 1 << 3
		fNoCache = 1 << 4
		fMerged  = 1 << 5
		fNum     = 1 << 6
		fText    = 1 << 7
	)
	return pageCodec[cellVal]{
		enc: func(dst []byte, src []cellVal) []byte {
			for i := range src {
				v := &src[i]
				f := byte(v.kind) & 7
				if v.formula {
					f |= fFormula
				}
				if v.noCache {
					f |= fNoCache
				}
				if v.merged {
					f |= fMerged
				}
				if v.num != 0 {
					f |= fNum
				}
				if v.text != "" {
					f |= fText
				}
				dst = append(dst, f)
				if f&fNum != 0 {
					dst = binary.LittleEndian.AppendUint64(dst, math.Float64bits(v.num))
				}
				if f&fText != 0 {
					dst = binary.AppendUvarint(dst, uint64(len(v.text)))
					dst = append(dst, v.text...)
				}
			}
			return dst
		},
		dec: func(src []byte, dst []cellVal) error {
			for i := range dst {
				if len(src) == 0 {
					return errors.New("cells: page ends early")
				}
				f := src[0]
				src = src[1:]
				v := cellVal{kind: cellKind(f & 7), formula: f&fFormula != 0, noCache: f&fNoCache != 0, merged: f&fMerged != 0}
				if f&fNum != 0 {
					if len(src) < 8 {
						return errors.New("cells: number cut short")
					}
					v.num = math.Float64frombits(binary.LittleEndian.Uint64(src))
					src = src[8:]
				}
				if f&fText != 0 {
					n, k := binary.Uvarint(src)
					if k <= 0 || uint64(len(src)-k) < n {
						return errors.New("cells: text cut short")
					}
					v.text = intern(src[k : k+int(n)])
					src = src[k+int(n):]
				}
				dst[i] = v
			}
			return nil
		},
	}
}
