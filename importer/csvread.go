package importer

import (
	"bytes"
	"encoding/csv"
	"errors"
	"io"
	"os"
	"path/filepath"
	"unicode/utf8"

	"github.com/fluecell/fluecell/funcs"
	"golang.org/x/text/encoding/charmap"
)

// csvInput is a CSV file read for scanning and rewriting: the text (UTF-8),
// the delimiter, and where each record ends, so that the output can copy
// each record byte for byte and append the computed fields.
type csvInput struct {
	data    []byte
	bom     bool
	comma   rune
	ends    []int // offset after each record's line break
	widths  []int // fields of each record
	recoded bool  // the file was Windows-1252 and is written back as UTF-8
}

func readCSV(path string, f *os.File, size int64, lim limits) (*csvInput, error) {
	data, err := readCSVBytes(path, f, size, lim)
	if err != nil {
		return nil, err
	}
	in := &csvInput{}
	switch {
	case bytes.HasPrefix(data, []byte{0xEF, 0xBB, 0xBF}):
		in.bom, data = true, data[3:]
	case bytes.HasPrefix(data, []byte{0xFF, 0xFE}), bytes.HasPrefix(data, []byte{0xFE, 0xFF}):
		return nil, newErr(ErrFormat, path, "the CSV file is UTF-16 text: save it as \"CSV UTF-8\" (Excel: File > Save As) and try again")
	}
	if bytes.IndexByte(data, 0) >= 0 {
		return nil, newErr(ErrFormat, path, "the file holds NUL bytes, so it is not CSV text (a binary file named .csv?)")
	}
	if !utf8.Valid(data) {
		dec, err := charmap.Windows1252.NewDecoder().Bytes(data)
		if err != nil {
			return nil, newErr(ErrFormat, path, "the CSV file is neither UTF-8 nor Windows-1252 text")
		}
		data, in.recoded, in.bom = dec, true, true
	}
	in.data = data
	in.comma = sniffComma(data)
	return in, nil
}

// sniffComma picks the delimiter that splits the first lines into the most
// records of one width (two fields at least); "," on a tie.
func sniffComma(data []byte) rune {
	head := data
	if len(head) > 64<<10 {
		head = head[:64<<10]
		if i := bytes.LastIndexByte(head, '\n'); i > 0 {
			head = head[:i+1]
		}
	}
	if bytes.HasPrefix(head, []byte("sep=")) && len(head) > 4 {
		r, _ := utf8.DecodeRune(head[4:])
		return r
	}
	best, bestScore := ',', 0
	for _, c := range []rune{',', ';', '\t', '|'} {
		r := csv.NewReader(bytes.NewReader(head))
		r.Comma, r.LazyQuotes, r.FieldsPerRecord = c, true, -1
		counts := map[int]int{}
		for i := 0; i < 50; i++ {
			rec, err := r.Read()
			if err != nil {
				break
			}
			counts[len(rec)]++
		}
		score := 0
		for width, n := range counts {
			if width >= 2 && n*width > score {
				score = n * width
			}
		}
		if score > bestScore {
			best, bestScore = c, score
		}
	}
	return best
}

// csvSheetName is the sheet name warnings give for a CSV file.
func csvSheetName(path string) string { return filepath.Base(path) }

// scanCSV feeds the records of a CSV file to a segmenter.
func (sc *scanCtx) scanCSV(in *csvInput, sheet string) error {
	r := csv.NewReader(bytes.NewReader(in.data))
	r.Comma, r.LazyQuotes, r.FieldsPerRecord, r.ReuseRecord = in.comma, true, -1, true
	seg := &segmenter{sc: sc, det: &detector{sc: sc, lx: sc.lexicon, sheet: sheet}, sheet: sheet}
	var cells []cell
	for num := 1; ; num++ {
		rec, err := r.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				return newErr(ErrCorrupt, sc.path, "CSV line %d: %v", pe.Line, pe.Err)
			}
			return newErr(ErrCorrupt, sc.path, "CSV: %v", err)
		}
		in.ends = append(in.ends, int(r.InputOffset()))
		in.widths = append(in.widths, len(rec))
		if num&4095 == 0 {
			if err := sc.cancelled(); err != nil {
				return err
			}
		}
		if len(rec) > 16384 {
			return newErr(ErrTooLarge, sc.path, "CSV record %d has %d fields, more than a worksheet's 16384 columns", num, len(rec))
		}
		cells = cells[:0]
		for i, f := range rec {
			if f == "" {
				continue
			}
			c := cell{col: i + 1, kind: kText, text: f}
			if v, ok := funcs.ParseNumber(f); ok {
				c.kind, c.num, c.text = kNumber, v, ""
			}
			cells = append(cells, c)
		}
		if len(cells) == 0 {
			continue
		}
		if err := seg.feed(row{num: num, cells: cells}); err != nil {
			return err
		}
	}
	return seg.finish()
}
