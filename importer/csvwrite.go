package importer

import (
	"bufio"
	"bytes"
	"io"
	"math"
	"strings"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/importer/safetext"
)

// writeCSV copies every record of the input byte for byte and appends the
// computed fields to the records of each table (the header record gets the
// rule names and "source"); other records are unchanged.
//
// The text fluecell adds (column names, source text) goes through
// safetext.CSVField, so that none starts a formula when the file is opened
// in a spreadsheet; computed numbers are written as numbers. The input's
// own cells are left exactly as they were, a formula-looking one included:
// they are the user's data, already in the user's file, and changing them
// silently would make the annotated file disagree with its input.
func (res *ScanResult) writeCSV(w io.Writer) error {
	in := res.csv
	bw := bufio.NewWriterSize(w, 256<<10)
	if in.bom {
		bw.Write([]byte{0xEF, 0xBB, 0xBF})
	}
	type extra struct {
		at     int // fields to pad the record to
		fields []string
	}
	add := map[int]extra{}
	for _, t := range res.sc.tables {
		if len(t.rules) == 0 {
			continue
		}
		width := t.spec.lastCol
		for r := t.spec.headerRow; r <= t.lastRow && r <= len(in.widths); r++ {
			width = max(width, in.widths[r-1])
		}
		t.outSheet, t.outCol = csvSheetName(res.Path), width+1
		k := t.outCount()
		head := make([]string, 0, k+1)
		for j := range k {
			head = append(head, safetext.CSVField(t.outName(j)))
		}
		add[t.spec.headerRow] = extra{width, append(head, "source")}
		for i := range t.n() {
			rn := t.rowNums.at(i)
			fields := make([]string, k+1)
			for j := range k {
				if v := t.outValue(j, i); !math.IsNaN(v) {
					fields[j] = funcs.FormatNumber(v)
				}
			}
			if s := t.src.at(i); s >= 0 {
				fields[k] = safetext.CSVField(t.srcText[s])
			}
			add[int(rn)] = extra{width, fields}
		}
	}
	sep := string(in.comma)
	start := 0
	for i, end := range in.ends {
		if i&4095 == 0 {
			if err := res.sc.cancelled(); err != nil {
				return err
			}
		}
		rec := in.data[start:end]
		start = end
		x, ok := add[i+1]
		if !ok {
			bw.Write(rec)
			continue
		}
		body, nl := rec, []byte(nil)
		switch {
		case bytes.HasSuffix(body, []byte("\r\n")):
			body, nl = body[:len(body)-2], body[len(body)-2:]
		case bytes.HasSuffix(body, []byte("\n")), bytes.HasSuffix(body, []byte("\r")):
			body, nl = body[:len(body)-1], body[len(body)-1:]
		}
		bw.Write(body)
		if pad := x.at - in.widths[i]; pad > 0 {
			bw.WriteString(strings.Repeat(sep, pad))
		}
		for _, fv := range x.fields {
			bw.WriteString(sep)
			bw.WriteString(csvQuote(fv, in.comma))
		}
		if nl == nil && i < len(in.ends)-1 {
			nl = []byte("\n")
		}
		bw.Write(nl)
	}
	bw.Write(in.data[start:])
	return bw.Flush()
}

// csvQuote quotes a field when it holds the delimiter, a quote, a line
// break or leading/trailing space.
func csvQuote(s string, comma rune) string {
	if s == "" || !strings.ContainsAny(s, string(comma)+"\"\r\n") && strings.TrimSpace(s) == s {
		return s
	}
	return "\"" + strings.ReplaceAll(s, "\"", "\"\"") + "\""
}
