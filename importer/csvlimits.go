package importer

import (
	"bytes"
	"io"
	"os"
	"unicode/utf8"
)

// Bounds on reading a CSV file. A line (up to a line break, quoted or not)
// longer than maxCSVLine is not a table row; the first csvSniffBytes decide
// whether the file is text at all, before the rest is read.
const (
	maxCSVLine    = 1 << 20
	csvSniffBytes = 64 << 10
)

// readCSVBytes reads a CSV file of size bytes (at most lim.maxUnzipped) in
// chunks into one buffer of that size, refusing as soon as it sees what
// CSV text cannot hold: a start that is binary (NUL bytes, control
// characters), a NUL byte later on (named by its line), or a line longer
// than maxCSVLine. Errors are *Error.
func readCSVBytes(path string, f *os.File, size int64, lim limits) ([]byte, error) {
	if size > lim.maxUnzipped {
		return nil, newErr(ErrTooLarge, path, "the CSV file is %s, over the limit of %s", byteSize(size), byteSize(lim.maxUnzipped))
	}
	var data []byte
	chunk := make([]byte, csvSniffBytes)
	line, lineLen := 1, 0
	for first := true; ; first = false {
		n, err := io.ReadFull(f, chunk)
		part := chunk[:n]
		if first {
			if bytes.HasPrefix(part, []byte{0xFF, 0xFE}) || bytes.HasPrefix(part, []byte{0xFE, 0xFF}) {
				return nil, newErr(ErrFormat, path, "the CSV file is UTF-16 text: save it as \"CSV UTF-8\" (Excel: File > Save As) and try again")
			}
			if why := binaryStart(part); why != "" {
				return nil, newErr(ErrFormat, path, "the file is not CSV text but binary data (%s): a binary file named .csv? Save the table as CSV text (Excel: File > Save As > CSV UTF-8)", why)
			}
			data = make([]byte, 0, size+1) // the whole file, once: no growth by doubling
		}
		for _, c := range part {
			switch c {
			case '\n':
				line++
				lineLen = 0
				continue
			case 0:
				return nil, newErr(ErrFormat, path, "line %d holds NUL bytes, so the file is not CSV text (binary data in a .csv file?)", line)
			}
			lineLen++
			if lineLen > maxCSVLine {
				return nil, newErr(ErrTooLarge, path, "line %d is longer than %s, the limit for one line of a CSV file: it is not a table row (a binary file, or a file without line breaks?)", line, byteSize(maxCSVLine))
			}
		}
		if int64(len(data)+n) > lim.maxUnzipped {
			return nil, newErr(ErrTooLarge, path, "the CSV file is over the limit of %s", byteSize(lim.maxUnzipped))
		}
		data = append(data, part...)
		if err == io.EOF || err == io.ErrUnexpectedEOF {
			return data, nil
		}
		if err != nil {
			return nil, &Error{Code: ErrIO, Path: path, Msg: "cannot read the file: " + err.Error(), Err: err}
		}
	}
}

// binaryStart says why the start of a file is not text ("" when it may
// be): NUL bytes, or more
// than one in twenty bytes a control character other than tab, line feed,
// carriage return and form feed.
func binaryStart(b []byte) string {
	if bytes.IndexByte(b, 0) >= 0 {
		return "it holds NUL bytes"
	}
	ctl := 0
	for _, c := range b {
		if c < 32 && c != '\t' && c != '\n' && c != '\r' && c != '\f' || c == 127 {
			ctl++
		}
	}
	if len(b) > 0 && ctl*20 > len(b) {
		return "it is full of control characters"
	}
	if !utf8.Valid(b) && invalidUTF8Share(b)*4 > len(b) {
		return "most of it is neither UTF-8 nor Windows-1252 text"
	}
	return ""
}

// invalidUTF8Share counts the bytes of b that are not part of valid UTF-8.
func invalidUTF8Share(b []byte) int {
	bad := 0
	for len(b) > 0 {
		r, n := utf8.DecodeRune(b)
		if r == utf8.RuneError && n == 1 {
			bad++
		}
		b = b[n:]
	}
	return bad
}
