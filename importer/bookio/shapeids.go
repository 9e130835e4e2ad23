package bookio

import (
	"bytes"
	"fmt"
	"path"
	"strconv"
	"strings"
)

// VML shape ids come in blocks of 1024: a drawing's <o:idmap data="1,3">
// lists the blocks it uses, and its shapes are numbered within them
// (_x0000_s1025 is the first of block 1). Two drawings of a workbook must
// not share a block, or a spreadsheet program renumbers or drops shapes.

// shapeBlockSize is the number of shape ids in a block.
const shapeBlockSize = 1024

// shapeBlocks reserves n consecutive blocks of shape ids, the first at or
// after want, that no VML part of the package uses (the blocks its
// o:idmap lists, and those of the _x0000_sN ids it holds: shape ids and
// o:spid references) and that the edit has not handed out already. The
// error is that of a VML part that cannot be read.
func (e *Edit) shapeBlocks(want, n int) ([]int, error) {
	if e.usedBlocks == nil {
		used, err := e.b.vmlBlocks()
		if err != nil {
			return nil, err
		}
		e.usedBlocks = used
	}
	for first := max(want, 1); ; first++ {
		free := true
		for b := first; b < first+n && free; b++ {
			free = !e.usedBlocks[b]
		}
		if !free {
			continue
		}
		out := make([]int, n)
		for i := range out {
			out[i] = first + i
			e.usedBlocks[first+i] = true
		}
		return out, nil
	}
}

// vmlBlocks is the set of shape-id blocks the VML parts of the package
// use.
func (b *Book) vmlBlocks() (map[int]bool, error) {
	used := map[int]bool{}
	for name := range b.files {
		if !strings.EqualFold(path.Ext(name), ".vml") {
			continue
		}
		data, err := b.readSmall(name)
		if err != nil {
			return nil, fmt.Errorf("%s: %w (its shape ids are needed to number new ones)", name, err)
		}
		for _, blk := range idmapBlocks(data) {
			used[blk] = true
		}
		for rest := data; ; {
			i := bytes.Index(rest, []byte("_x0000_s"))
			if i < 0 {
				break
			}
			rest = rest[i+len("_x0000_s"):]
			j := 0
			for j < len(rest) && j < 10 && rest[j] >= '0' && rest[j] <= '9' {
				j++
			}
			if id, err := strconv.Atoi(string(rest[:j])); err == nil {
				used[id/shapeBlockSize] = true
			}
		}
	}
	return used, nil
}

// idmapBlocks reads the blocks listed by the o:idmap elements of a VML
// part (data="1" or data="1,3").
func idmapBlocks(data []byte) []int {
	var out []int
	for _, val := range idmapData(data) {
		for _, f := range strings.Split(string(data[val[0]:val[1]]), ",") {
			if n, err := strconv.Atoi(strings.TrimSpace(f)); err == nil && n >= 0 {
				out = append(out, n)
			}
		}
	}
	return out
}

// idmapData finds the data attribute of each idmap element of a VML part:
// the offsets of its value. VML as Excel writes it is not always
// well-formed XML, so the part is searched as bytes.
func idmapData(data []byte) [][2]int {
	var out [][2]int
	for off := 0; ; {
		i := bytes.Index(data[off:], []byte("idmap"))
		if i < 0 {
			return out
		}
		start := off + i
		off = start + len("idmap")
		if start == 0 || data[start-1] != ':' && data[start-1] != '<' {
			continue
		}
		end := bytes.IndexByte(data[off:], '>')
		if end < 0 {
			return out
		}
		attrs := data[off : off+end]
		if v, ok := RawAttr(attrs, "data", false); ok {
			vs := off + cap(attrs) - cap(v) // v is a slice of attrs
			out = append(out, [2]int{vs, vs + len(v)})
		}
	}
}

// withBlocks adds blocks to the first o:idmap of a VML part; data is
// returned as it is when it has none.
func withBlocks(data []byte, blocks []int) []byte {
	vals := idmapData(data)
	if len(vals) == 0 {
		return data
	}
	end := vals[0][1]
	var add []byte
	for i, b := range blocks {
		if i > 0 || vals[0][1] > vals[0][0] {
			add = append(add, ',')
		}
		add = strconv.AppendInt(add, int64(b), 10)
	}
	out := make([]byte, 0, len(data)+len(add))
	out = append(append(append(out, data[:end]...), add...), data[end:]...)
	return out
}

// blockList is blocks as an idmap data value ("1000,1001").
func blockList(blocks []int) string {
	s := make([]string, len(blocks))
	for i, b := range blocks {
		s[i] = strconv.Itoa(b)
	}
	return strings.Join(s, ",")
}
