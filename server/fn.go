package server

import (
	"hash/fnv"
	"net/http"
	"strconv"
	"strings"
	"time"

	"github.com/gin-gonic/gin"

	"github.com/fluecell/fluecell/funcs"
)

// answer is a rendered answer of GET /v1/fn. Answers are pure functions of the function name,
// the raw query and the engine, so they are cached as they are; an answer is never modified
// once built.
type answer struct {
	status      int
	contentType []string // header values, shared by every request served from the cache
	length      []string
	body        []byte
	etag        []string  // nil for error answers, which are not to be cached by clients
	err         *apiError // the error answered, for the log and metrics; nil on success
}

// maxCachedAnswer bounds the key plus body of a cached answer.
const maxCachedAnswer = 8 << 10

// fn answers GET /v1/fn/{name}: cached answers first, else the call is computed, rendered in
// the format asked for and cached.
func (s *Server) fn(c *gin.Context) {
	name := c.Param("name")
	label, fm := s.metrics.fn(name)
	raw := c.Request.URL.RawQuery
	// Only catalog names are cached: their spelling cannot run into the query in the key.
	known := label != unknownFunction
	var key string
	if known {
		key = name + "?" + raw
		if a, ok := s.answers.get(key); ok {
			fm.hit.Inc()
			s.writeAnswer(c, label, a)
			return
		}
	}
	fm.miss.Inc()
	start := time.Now()
	a := s.computeFn(name, raw)
	fm.latency.Observe(time.Since(start).Seconds())
	if known && a.status < 500 && len(key)+len(a.body) <= maxCachedAnswer {
		s.answers.put(key, a)
	}
	s.writeAnswer(c, label, a)
}

// computeFn evaluates one call and renders its answer.
func (s *Server) computeFn(name, raw string) *answer {
	q, qe := parseFnQuery(raw)
	if qe != nil {
		return s.fnErrorAnswer(q, qe)
	}
	var res funcs.Result
	var err error
	if q.format == formatJSON {
		// JSON has room for the 95 % interval; the other formats stay as they were
		res, err = s.engine.CallInterval(name, q.args, funcs.IntervalOptions{Approach: funcs.Approach1})
	} else {
		res, err = s.engine.Call(name, q.args)
	}
	if err != nil {
		return s.fnErrorAnswer(q, fromFuncs(err, true))
	}
	body, err := s.renderResult(q.format, res)
	if err != nil {
		return s.fnErrorAnswer(fnQuery{}, internalError(err))
	}
	ct := q.format.contentType()
	return &answer{status: http.StatusOK, contentType: []string{ct}, length: []string{strconv.Itoa(len(body))},
		body: body, etag: []string{etagOf(ct, body)}}
}

func (s *Server) fnErrorAnswer(q fnQuery, e *apiError) *answer {
	body, err := renderError(q.format, e, q.inline)
	f := q.format
	if err != nil {
		f, body = formatText, []byte(e.Msg)
	}
	status := e.Status
	if q.inline && status < 500 {
		status = http.StatusOK
	}
	return &answer{status: status, contentType: []string{f.contentType()}, length: []string{strconv.Itoa(len(body))},
		body: body, err: e}
}

// writeAnswer sends a (possibly cached) answer, or 304 when If-None-Match names its ETag.
func (s *Server) writeAnswer(c *gin.Context, label string, a *answer) {
	h := c.Writer.Header()
	if a.err != nil {
		c.Set(errKey, a.err)
		s.metrics.fnErrors.WithLabelValues(label, a.err.Code).Inc()
		h["Cache-Control"] = s.hdr.noStore
	} else {
		h["Etag"] = a.etag
		h["Cache-Control"] = s.hdr.fnCache
		if s.token != nil {
			h.Add("Vary", "Authorization")
		}
		if inm := c.Request.Header.Get("If-None-Match"); inm != "" && etagMatch(inm, a.etag[0]) {
			c.Writer.WriteHeader(http.StatusNotModified)
			c.Writer.WriteHeaderNow()
			return
		}
	}
	h["Content-Type"] = a.contentType
	h["Content-Length"] = a.length
	c.Writer.WriteHeader(a.status)
	_, _ = c.Writer.Write(a.body)
}

// etagOf is a strong validator of a representation: a hash of its type and bytes.
func etagOf(contentType string, body []byte) string {
	h := fnv.New64a()
	_, _ = h.Write([]byte(contentType))
	_, _ = h.Write([]byte{0})
	_, _ = h.Write(body)
	return `"` + strconv.FormatUint(h.Sum64(), 36) + `"`
}

// etagMatch reports whether an If-None-Match header names etag (or is "*"). Weak
// comparison, as RFC 9110 asks for If-None-Match.
func etagMatch(header, etag string) bool {
	for _, t := range strings.Split(header, ",") {
		t = strings.TrimSpace(t)
		if t == "*" || strings.TrimPrefix(t, "W/") == etag {
			return true
		}
	}
	return false
}
