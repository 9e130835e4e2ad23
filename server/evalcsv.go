package server

import (
	"bytes"
	"context"
	"encoding/csv"
	"errors"
	"io"
	"net/http"
	"strconv"
	"strings"

	"github.com/gin-gonic/gin"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/importer/safetext"
)

// defaultResultColumn names the computed column when ?as= is not given.
const defaultResultColumn = "result"

// evalCSV answers POST /v1/eval?expr=…&as=COLUMN with a text/csv body whose header row names
// the variables: the same table with the computed column appended. A cell is a number when it
// reads as a plain decimal with ".", else a string. A row that fails gets "#ERROR: message" in
// the computed column; the others still compute.
func (s *Server) evalCSV(ctx context.Context, c *gin.Context) {
	q, e := queryValues(c.Request.URL.RawQuery, "expr", "as")
	if e != nil {
		s.abort(c, e)
		return
	}
	src, ok := q["expr"]
	if !ok {
		s.abort(c, badRequest("expr", "query parameter expr is missing: a CSV body is evaluated with POST /v1/eval?expr=EXPRESSION&as=COLUMN (for a JSON body send Content-Type: application/json)"))
		return
	}
	as, given := q["as"]
	if !given {
		as = defaultResultColumn
	}
	if strings.TrimSpace(as) == "" {
		s.abort(c, badRequest("as", "query parameter as is empty: give the name of the computed column, e.g. as=tCO2"))
		return
	}
	data, err := io.ReadAll(c.Request.Body)
	if err != nil {
		s.abort(c, bodyError(err, s.cfg.MaxBodyBytes))
		return
	}
	data = bytes.TrimPrefix(data, []byte("\ufeff")) // a byte-order mark, as spreadsheets write
	rd := csv.NewReader(bytes.NewReader(data))
	rd.ReuseRecord = true
	header, err := rd.Read()
	if errors.Is(err, io.EOF) {
		s.abort(c, badRequest("body", "CSV body is empty: the first line names the columns (the variables of expr), e.g. fuel,quantity,unit"))
		return
	}
	if err != nil {
		s.abort(c, csvError(err))
		return
	}
	header = append([]string(nil), header...)
	cols := map[string]int{}
	for i, h := range header {
		h = strings.TrimSpace(h)
		header[i] = h
		if h == "" {
			s.abort(c, badRequest("body", "CSV header column "+strconv.Itoa(i+1)+" has no name: name every column"))
			return
		}
		if _, dup := cols[h]; dup {
			s.abort(c, badRequest("body", "CSV header names column "+quoteText(h)+" twice: names must be unique"))
			return
		}
		cols[h] = i
	}
	if _, dup := cols[as]; dup {
		s.abort(c, badRequest("as", "the CSV already has a column "+quoteText(as)+": choose another name with as="))
		return
	}
	p, err := s.compile(src, header)
	if err != nil {
		s.abort(c, fromFuncs(err, false))
		return
	}
	if ctx.Err() != nil {
		s.abort(c, s.timedOut())
		return
	}
	reads := make([]bool, len(header)) // the columns the expression reads
	for _, v := range p.Variables() {
		if i, ok := cols[v]; ok {
			reads[i] = true
		}
	}
	run := p.NewRunner()
	vars := make(map[string]any, len(header))
	var out bytes.Buffer
	out.Grow(len(data) + len(data)/4 + 64)
	w := csv.NewWriter(&out)
	_ = w.Write(append(header, safetext.CSVField(as))) // the caller's header as sent; the added name never a formula
	line := make([]string, len(header)+1)
	okRows, badRows := 0, 0
	for n := 0; ; n++ {
		rec, err := rd.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			s.abort(c, csvError(err))
			return
		}
		if n >= s.cfg.MaxRows {
			s.abort(c, s.tooManyRows(n+1))
			return
		}
		// before every row: one row may cost milliseconds (many calls on long texts)
		if ctx.Err() != nil {
			s.abort(c, s.timedOut())
			return
		}
		long := -1
		for i, cell := range rec {
			if v, isNum := funcs.ParseNumber(cell); isNum {
				vars[header[i]] = v
			} else {
				vars[header[i]] = cell
				if reads[i] && len(cell) > maxTextValue && long < 0 {
					long = i
				}
			}
		}
		copy(line, rec)
		if long >= 0 {
			badRows++
			line[len(header)] = inlinePrefix + "column " + header[long] + " holds " + longText(len(rec[long]))
			_ = w.Write(line)
			continue
		}
		res, err := run.Run(vars)
		if err != nil {
			ae := fromFuncs(err, false)
			if ae.Status >= 500 {
				s.abort(c, ae)
				return
			}
			badRows++
			line[len(header)] = inlinePrefix + cutText(ae.Msg, maxRowMessage)
		} else {
			okRows++
			line[len(header)] = funcs.FormatNumber(res.Value)
		}
		_ = w.Write(line)
	}
	w.Flush()
	if err := w.Error(); err != nil {
		s.abort(c, internalError(err))
		return
	}
	s.metrics.evalRows.WithLabelValues("ok").Add(float64(okRows))
	s.metrics.evalRows.WithLabelValues("error").Add(float64(badRows))
	s.writeBody(c, http.StatusOK, ctCSV, out.Bytes())
}

// csvError explains a CSV that cannot be read, with its line and column.
func csvError(err error) *apiError {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		msg := "CSV body line " + strconv.Itoa(pe.Line) + ", column " + strconv.Itoa(pe.Column) + ": " + pe.Err.Error()
		if errors.Is(pe.Err, csv.ErrFieldCount) {
			msg += " (every row needs as many cells as the header has columns)"
		}
		return badRequest("body", msg)
	}
	return badRequest("body", "CSV body could not be read: "+err.Error())
}
