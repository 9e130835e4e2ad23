package server

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"io"
	"math"
	"mime"
	"net/http"
	"slices"
	"sort"
	"strconv"
	"strings"

	"github.com/gin-gonic/gin"

	"github.com/fluecell/fluecell/funcs"
)

// programCacheEntries bounds the compiled expressions kept between eval requests (notebooks
// send the same expression again and again).
const programCacheEntries = 512

// maxProgramKey bounds the cache key (expression and variable names) of a kept program.
const maxProgramKey = 16 << 10

// program is a compiled expression, or the error compiling it gave; both are kept.
type program struct {
	p   *funcs.Program
	err error
}

// compile compiles src for the given variable names through the program cache.
func (s *Server) compile(src string, vars []string) (*funcs.Program, error) {
	vars = slices.Clone(vars)
	sort.Strings(vars)
	var kb strings.Builder
	kb.WriteString(strconv.Itoa(len(src)))
	kb.WriteByte(':')
	kb.WriteString(src)
	for _, v := range vars {
		kb.WriteByte(',')
		kb.WriteString(strconv.Itoa(len(v)))
		kb.WriteByte(':')
		kb.WriteString(v)
	}
	key := kb.String()
	if pr, ok := s.progs.get(key); ok {
		return pr.p, pr.err
	}
	p, err := s.engine.Compile(src, funcs.WithVariables(vars...))
	if len(key) <= maxProgramKey {
		s.progs.put(key, &program{p, err})
	}
	return p, err
}

// evalRequest is the JSON body of POST /v1/eval.
type evalRequest struct {
	Expr *string        `json:"expr"`
	Vars map[string]any `json:"vars"`
	Rows *[]any         `json:"rows"`
	// Interval asks for the 95 % interval of each result (see intervalField).
	Interval intervalField `json:"interval"`
}

// eval answers POST /v1/eval: a JSON body {"expr", "vars"} or {"expr", "rows"}, or a CSV body
// with ?expr=…&as=COLUMN.
func (s *Server) eval(c *gin.Context) {
	r := c.Request
	if r.ContentLength > s.cfg.MaxBodyBytes {
		s.abort(c, tooLarge(s.cfg.MaxBodyBytes))
		return
	}
	r.Body = http.MaxBytesReader(c.Writer, r.Body, s.cfg.MaxBodyBytes)
	csvMode, e := s.evalMode(r)
	if e != nil {
		s.abort(c, e)
		return
	}
	ctx, cancel := s.withTimeout(c)
	defer cancel()
	if csvMode {
		s.evalCSV(ctx, c)
		return
	}
	s.evalJSON(ctx, c)
}

// evalMode decides between a JSON and a CSV body from the Content-Type, and for bodies sent
// without a usable one (curl and urllib send form encoding by default) from the query: expr in
// the query means CSV.
func (s *Server) evalMode(r *http.Request) (csvMode bool, e *apiError) {
	ct := r.Header.Get("Content-Type")
	mt := ""
	if ct != "" {
		var err error
		if mt, _, err = mime.ParseMediaType(ct); err != nil {
			return false, &apiError{Status: http.StatusUnsupportedMediaType, Code: codeMediaType, Param: "Content-Type",
				Msg: "Content-Type " + quoteText(ct) + " is malformed: send application/json, or text/csv with ?expr=…"}
		}
	}
	switch mt {
	case "application/json":
		return false, nil
	case "text/csv", "application/csv":
		return true, nil
	case "", "application/x-www-form-urlencoded", "text/plain":
		return strings.Contains(r.URL.RawQuery, "expr="), nil
	}
	return false, &apiError{Status: http.StatusUnsupportedMediaType, Code: codeMediaType, Param: "Content-Type",
		Msg: "Content-Type " + quoteText(mt) + " is not read here: send application/json ({\"expr\": …, \"vars\": {…}} or {\"expr\": …, \"rows\": […]}), or text/csv with ?expr=…&as=COLUMN"}
}

func tooLarge(limit int64) *apiError {
	return &apiError{Status: http.StatusRequestEntityTooLarge, Code: codeTooLarge, Param: "body",
		Msg: "request body is over the limit of " + strconv.FormatInt(limit, 10) + " bytes: send fewer rows per request (the server's --max-body sets the limit)"}
}

func (s *Server) tooManyRows(n int) *apiError {
	return &apiError{Status: http.StatusRequestEntityTooLarge, Code: codeTooLarge, Param: "rows",
		Msg: strconv.Itoa(n) + " rows is over the limit of " + strconv.Itoa(s.cfg.MaxRows) + " rows per request: split the table (the server's --max-rows sets the limit)"}
}

func (s *Server) timedOut() *apiError {
	return &apiError{Status: http.StatusServiceUnavailable, Code: codeTimeout,
		Msg: "evaluation stopped after " + s.cfg.EvalTimeout.String() + ": the server is busy or the request too big; send fewer rows per request"}
}

// bodyError maps an error reading the body: over the limit is 413, anything else the client's.
func bodyError(err error, limit int64) *apiError {
	var mbe *http.MaxBytesError
	if errors.As(err, &mbe) {
		return tooLarge(limit)
	}
	return badRequest("body", "request body could not be read: "+err.Error())
}

// decodeEvalJSON reads the JSON body; errors name the field and what is accepted.
func decodeEvalJSON(body io.Reader, limit int64) (evalRequest, *apiError) {
	var req evalRequest
	dec := json.NewDecoder(body)
	dec.UseNumber()
	dec.DisallowUnknownFields()
	shape := `send a JSON object {"expr": "…", "vars": {…}} or {"expr": "…", "rows": [{…}, …]}`
	if err := dec.Decode(&req); err != nil {
		var se *json.SyntaxError
		var te *json.UnmarshalTypeError
		var mbe *http.MaxBytesError
		switch {
		case errors.As(err, &mbe):
			return req, tooLarge(limit)
		case strings.HasPrefix(err.Error(), "interval"):
			return req, badRequest("interval", err.Error())
		case errors.Is(err, io.EOF):
			return req, badRequest("body", "request body is empty: "+shape)
		case errors.Is(err, io.ErrUnexpectedEOF):
			return req, badRequest("body", "request body ends in the middle of the JSON: "+shape)
		case errors.As(err, &se):
			return req, badRequest("body", "request body is not valid JSON at byte "+strconv.FormatInt(se.Offset, 10)+": "+se.Error())
		case errors.As(err, &te):
			if te.Field == "" {
				return req, badRequest("body", "request body is a JSON "+te.Value+", not an object: "+shape)
			}
			field := te.Field
			want := map[string]string{"expr": "a string", "vars": `an object {"name": value, …}`, "rows": `an array of objects [{"name": value, …}, …]`}[field]
			if want == "" {
				want = "another type"
			}
			return req, badRequest(field, "field "+field+" is a JSON "+te.Value+"; it must be "+want)
		case strings.HasPrefix(err.Error(), "json: unknown field "):
			name := strings.TrimPrefix(err.Error(), "json: unknown field ")
			return req, badRequest(strings.Trim(name, `"`), "unknown field "+name+" in the body: accepted are expr, vars, rows, interval")
		}
		return req, bodyError(err, limit)
	}
	if err := dec.Decode(&struct{}{}); !errors.Is(err, io.EOF) {
		var mbe *http.MaxBytesError
		if errors.As(err, &mbe) {
			return req, tooLarge(limit)
		}
		return req, badRequest("body", "request body holds more than one JSON value: "+shape)
	}
	if req.Expr == nil {
		return req, badRequest("expr", "field expr is missing: "+shape)
	}
	return req, nil
}

// varValue turns a decoded JSON value into a variable value (float64, string or bool), or
// says why it cannot be one.
func varValue(v any) (any, string) {
	switch x := v.(type) {
	case json.Number:
		f, err := strconv.ParseFloat(string(x), 64)
		if err != nil || math.IsInf(f, 0) {
			return nil, "the number " + string(x) + " is out of range"
		}
		return f, ""
	case float64:
		return x, ""
	case string, bool:
		return x, ""
	case nil:
		return nil, "is null; give a number, a string or a boolean"
	case []any:
		return nil, "is an array; give a number, a string or a boolean"
	case map[string]any:
		return nil, "is an object; give a number, a string or a boolean"
	}
	return nil, "is not a number, a string or a boolean"
}

func (s *Server) evalJSON(ctx context.Context, c *gin.Context) {
	if rq := c.Request.URL.RawQuery; rq != "" {
		if _, e := queryValues(rq); e != nil {
			e.Msg += " (a JSON body carries expr, vars and rows itself; ?expr= is for text/csv bodies)"
			s.abort(c, e)
			return
		}
	}
	req, e := decodeEvalJSON(c.Request.Body, s.cfg.MaxBodyBytes)
	if e != nil {
		s.abort(c, e)
		return
	}
	vars := make(map[string]any, len(req.Vars))
	for k, v := range req.Vars {
		val, why := varValue(v)
		if why != "" {
			s.abort(c, badRequest("vars."+k, "vars."+k+" "+why))
			return
		}
		vars[k] = val
	}
	if req.Rows == nil {
		names := make([]string, 0, len(vars))
		for k := range vars {
			names = append(names, k)
		}
		p, err := s.compile(*req.Expr, names)
		if err != nil {
			s.abort(c, fromFuncs(err, false))
			return
		}
		if e := checkVarTexts(p, vars); e != nil {
			s.abort(c, e)
			return
		}
		if ctx.Err() != nil {
			s.abort(c, s.timedOut())
			return
		}
		var res funcs.Result
		if req.Interval.on {
			res, err = p.EvalInterval(vars, req.Interval.opt)
		} else {
			res, err = p.Eval(vars)
		}
		if err != nil {
			s.metrics.evalRows.WithLabelValues("error").Inc()
			s.abort(c, fromFuncs(err, false))
			return
		}
		s.metrics.evalRows.WithLabelValues("ok").Inc()
		b, err := s.json.resultJSON(res)
		if err != nil {
			s.abort(c, internalError(err))
			return
		}
		s.writeBody(c, http.StatusOK, ctJSON, b)
		return
	}
	rows := *req.Rows
	if len(rows) > s.cfg.MaxRows {
		s.abort(c, s.tooManyRows(len(rows)))
		return
	}
	seen := map[string]bool{}
	names := make([]string, 0, len(vars)+4)
	for k := range vars {
		seen[k] = true
		names = append(names, k)
	}
	for _, row := range rows {
		if m, ok := row.(map[string]any); ok {
			for k := range m {
				if !seen[k] {
					seen[k] = true
					names = append(names, k)
				}
			}
		}
	}
	p, err := s.compile(*req.Expr, names)
	if err != nil {
		s.abort(c, fromFuncs(err, false))
		return
	}
	if e := checkVarTexts(p, vars); e != nil {
		s.abort(c, e)
		return
	}
	var iv *funcs.IntervalOptions
	if req.Interval.on {
		iv = &req.Interval.opt
	}
	out, e := s.runRows(ctx, p, vars, rows, iv)
	if e != nil {
		s.abort(c, e)
		return
	}
	s.writeBody(c, http.StatusOK, ctJSON, out)
}

// runRows evaluates p for every row (vars fill what a row leaves out) and writes
// {"results": [...], "sources": [...], "notes": [...]}: a row that fails gets {"error",
// "code"} and the others still compute; sources and notes are those of all rows, once each.
//
// With iv, each row's result also has "low" and "high" when its interval is computable.
func (s *Server) runRows(ctx context.Context, p *funcs.Program, vars map[string]any, rows []any, iv *funcs.IntervalOptions) ([]byte, *apiError) {
	run := p.NewRunner()
	var b bytes.Buffer
	b.Grow(len(rows)*32 + 64)
	b.WriteString(`{"results":[`)
	var sources []*funcs.Factor
	seenSrc := map[*funcs.Factor]bool{}
	var notes []string
	seenNote := map[string]bool{}
	unitJSON := map[string][]byte{} // the few units of a request, encoded once
	reads := make(map[string]bool, len(p.Variables()))
	for _, v := range p.Variables() {
		reads[v] = true
	}
	okRows, badRows := 0, 0
	for i, row := range rows {
		// before every row: one row may cost milliseconds (many calls on long texts)
		if ctx.Err() != nil {
			return nil, s.timedOut()
		}
		if i > 0 {
			b.WriteByte(',')
		}
		m, isObj := row.(map[string]any)
		if !isObj {
			badRows++
			writeRowError(&b, "row "+strconv.Itoa(i)+" is not an object; each row is {\"name\": value, …}", codeBadRequest)
			continue
		}
		why := ""
		for k, v := range m {
			val, w := varValue(v)
			if w == "" && reads[k] {
				w = textTooLong(val)
			}
			if w != "" {
				why = "rows[" + strconv.Itoa(i) + "]." + k + " " + w
				break
			}
			m[k] = val
		}
		if why != "" {
			badRows++
			writeRowError(&b, why, codeBadRequest)
			continue
		}
		for k, v := range vars {
			if _, given := m[k]; !given {
				m[k] = v
			}
		}
		var res funcs.Result
		var err error
		if iv != nil {
			res, err = run.RunInterval(m, *iv)
		} else {
			res, err = run.Run(m)
		}
		if err != nil {
			badRows++
			ae := fromFuncs(err, false)
			if ae.Status >= 500 {
				return nil, ae
			}
			writeRowError(&b, ae.Msg, ae.Code)
			continue
		}
		okRows++
		b.WriteString(`{"value":`)
		b.Write(appendJSONFloat(b.AvailableBuffer(), res.Value))
		writeInterval(&b, res.Interval, false)
		b.WriteString(`,"unit":`)
		u, ok := unitJSON[res.Unit]
		if !ok {
			u, _ = marshalJSON(res.Unit)
			unitJSON[res.Unit] = u
		}
		b.Write(u)
		b.WriteByte('}')
		for _, f := range res.Sources {
			if !seenSrc[f] {
				seenSrc[f] = true
				sources = append(sources, f)
			}
		}
		for _, n := range res.Notes {
			if !seenNote[n] {
				seenNote[n] = true
				notes = append(notes, n)
			}
		}
	}
	s.metrics.evalRows.WithLabelValues("ok").Add(float64(okRows))
	s.metrics.evalRows.WithLabelValues("error").Add(float64(badRows))
	if sources == nil {
		sources = []*funcs.Factor{}
	}
	if notes == nil {
		notes = []string{}
	}
	b.WriteString(`],"sources":`)
	if err := s.json.appendSources(&b, sources); err != nil {
		return nil, internalError(err)
	}
	b.WriteString(`,"notes":`)
	nb, err := marshalJSON(notes)
	if err != nil {
		return nil, internalError(err)
	}
	b.Write(nb)
	b.WriteByte('}')
	return b.Bytes(), nil
}

// maxTextValue bounds a text value an expression reads (a fuel, unit, gas or grid name, a
// sector...), as maxValueLen bounds a query value of GET /v1/fn: no name is that long, and
// every call on a text costs time in proportion to its length.
const maxTextValue = maxValueLen

// textTooLong says why v cannot be read by an expression, or "" when it can.
func textTooLong(v any) string {
	if s, ok := v.(string); ok && len(s) > maxTextValue {
		return "is " + longText(len(s))
	}
	return ""
}

// longText describes a text of n bytes, over maxTextValue.
func longText(n int) string {
	return "a text of " + strconv.Itoa(n) + " bytes: the longest text accepted is " + strconv.Itoa(maxTextValue) +
		" bytes (names of fuels, units, gases and grids are far shorter)"
}

// checkVarTexts refuses a value of vars over maxTextValue that p reads.
func checkVarTexts(p *funcs.Program, vars map[string]any) *apiError {
	for _, name := range p.Variables() {
		if why := textTooLong(vars[name]); why != "" {
			return badRequest("vars."+name, "vars."+name+" "+why)
		}
	}
	return nil
}

// maxRowMessage bounds the error message of one row (a message may quote the input).
const maxRowMessage = 1024

func writeRowError(b *bytes.Buffer, msg, code string) {
	b.WriteString(`{"error":`)
	writeJSONString(b, cutText(msg, maxRowMessage))
	b.WriteString(`,"code":`)
	writeJSONString(b, code)
	b.WriteByte('}')
}

func writeJSONString(b *bytes.Buffer, s string) {
	out, _ := marshalJSON(s) // a string always marshals
	b.Write(out)
}

func (s *Server) writeBody(c *gin.Context, status int, contentType string, body []byte) {
	h := c.Writer.Header()
	h["Cache-Control"] = s.hdr.noStore
	h.Set("Content-Type", contentType)
	h.Set("Content-Length", strconv.Itoa(len(body)))
	c.Writer.WriteHeader(status)
	_, _ = c.Writer.Write(body)
}

// withTimeout returns the request context bounded by EvalTimeout.
func (s *Server) withTimeout(c *gin.Context) (context.Context, context.CancelFunc) {
	return context.WithTimeout(c.Request.Context(), s.cfg.EvalTimeout)
}
