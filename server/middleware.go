package server

import (
	"crypto/sha256"
	"crypto/subtle"
	"fmt"
	"log/slog"
	"net/http"
	"net/url"
	"runtime/debug"
	"strings"
	"time"

	"github.com/gin-gonic/gin"
)

// errKey is the gin context key under which a request's error answer is kept for the log.
const errKey = "fluecell.error"

// routeFn is the gin route of GET /v1/fn, whose errors are answered in the format asked for.
const routeFn = "/v1/fn/:name"

// abort answers e and stops the handler chain: on GET /v1/fn in the format and errors mode of
// the query, elsewhere as application/json.
func (s *Server) abort(c *gin.Context, e *apiError) {
	c.Set(errKey, e)
	if c.FullPath() == routeFn {
		q, _ := parseFnQuery(c.Request.URL.RawQuery)
		s.writeFnError(c, q.format, q.inline, e)
		c.Abort()
		return
	}
	body, err := marshalJSON(e.body())
	if err != nil {
		body = []byte(`{"error":"` + internalErrorMessage + `","code":"internal"}`)
	}
	c.Header("Cache-Control", "no-store")
	c.Data(e.Status, ctJSON, body)
	c.Abort()
}

// writeFnError answers an error of GET /v1/fn in format f; inline answers 200.
func (s *Server) writeFnError(c *gin.Context, f format, inline bool, e *apiError) {
	body, err := renderError(f, e, inline)
	if err != nil {
		f, body = formatText, []byte(e.Msg)
	}
	status := e.Status
	if inline {
		status = http.StatusOK
	}
	c.Header("Cache-Control", "no-store")
	c.Data(status, f.contentType(), body)
}

// recoverPanics turns a panic in a handler into a logged 500; the client sees no stack trace.
func (s *Server) recoverPanics(c *gin.Context) {
	defer func() {
		v := recover()
		if v == nil {
			return
		}
		if v == http.ErrAbortHandler {
			panic(v)
		}
		s.log.Error("panic while answering a request", "method", c.Request.Method, "path", c.Request.URL.Path,
			"panic", fmt.Sprint(v), "stack", string(debug.Stack()))
		if !c.Writer.Written() {
			s.abort(c, internalError(fmt.Errorf("panic: %v", v)))
		}
		c.Abort()
	}()
	c.Next()
}

// observe logs one line per request and records its metrics. The query is logged with the
// token's value replaced; headers are not logged.
func (s *Server) observe(c *gin.Context) {
	start := time.Now()
	c.Next()
	d := time.Since(start)
	route := c.FullPath()
	if route == "" {
		route = "unmatched"
	}
	status := c.Writer.Status()
	s.metrics.observe(route, c.Request.Method, status, d)
	level := slog.LevelInfo
	if status >= 500 {
		level = slog.LevelError
	}
	ctx := c.Request.Context()
	if !s.log.Enabled(ctx, level) {
		return
	}
	size := max(c.Writer.Size(), 0)
	attrs := make([]slog.Attr, 0, 10)
	attrs = append(attrs,
		slog.String("method", c.Request.Method),
		slog.String("path", c.Request.URL.Path))
	if q := c.Request.URL.RawQuery; q != "" {
		attrs = append(attrs, slog.String("query", redactQuery(q)))
	}
	attrs = append(attrs,
		slog.Int("status", status),
		slog.Int("bytes", size),
		slog.Duration("duration", d),
		slog.String("remote", c.Request.RemoteAddr))
	if v, ok := c.Get(errKey); ok {
		if e, ok := v.(*apiError); ok {
			attrs = append(attrs, slog.String("error", e.Msg))
			if e.cause != nil {
				attrs = append(attrs, slog.String("cause", e.cause.Error()))
			}
		}
	}
	s.log.LogAttrs(ctx, level, "request", attrs...)
}

// maxLoggedQuery bounds the query text of one log line.
const maxLoggedQuery = 1024

// redactQuery returns a raw query with the value of every token parameter replaced by
// REDACTED (however its name is %-escaped), cut to maxLoggedQuery bytes.
func redactQuery(raw string) string {
	if strings.Contains(raw, "oken") || strings.Contains(raw, "%") {
		parts := strings.Split(raw, "&")
		for i, p := range parts {
			k, _, _ := strings.Cut(p, "=")
			if name, err := url.QueryUnescape(k); err == nil && name == paramToken {
				parts[i] = k + "=REDACTED"
			}
		}
		raw = strings.Join(parts, "&")
	}
	if len(raw) > maxLoggedQuery {
		raw = raw[:maxLoggedQuery] + "…"
	}
	return raw
}

// cors answers preflight requests and sets the CORS headers for the configured origins.
func (s *Server) cors(c *gin.Context) {
	if len(s.cfg.CORSOrigins) == 0 {
		return
	}
	h := c.Writer.Header()
	h.Add("Vary", "Origin") // the answer depends on the origin, for caches
	origin := c.GetHeader("Origin")
	if origin == "" {
		return
	}
	allow := ""
	for _, o := range s.cfg.CORSOrigins {
		if o == "*" {
			allow = "*"
			break
		}
		if o == origin {
			allow = origin
			break
		}
	}
	if allow == "" {
		return // no CORS headers: the browser refuses the answer
	}
	h.Set("Access-Control-Allow-Origin", allow)
	h.Set("Access-Control-Expose-Headers", "ETag")
	if c.Request.Method == http.MethodOptions && c.GetHeader("Access-Control-Request-Method") != "" {
		h.Set("Access-Control-Allow-Methods", "GET, POST, OPTIONS")
		h.Set("Access-Control-Allow-Headers", "Authorization, Content-Type, If-None-Match")
		h.Set("Access-Control-Max-Age", "600")
		c.AbortWithStatus(http.StatusNoContent)
	}
}

func hashToken(t string) []byte {
	h := sha256.Sum256([]byte(t))
	return h[:]
}

// authorize lets a request through when no token is configured or when it carries the token,
// as "Authorization: Bearer TOKEN" or as the query parameter token. Both are compared in
// constant time (over their hashes, so that the length does not show either).
func (s *Server) authorize(c *gin.Context) {
	if s.token == nil {
		return
	}
	if got, ok := requestToken(c.Request); ok && subtle.ConstantTimeCompare(hashToken(got), s.token) == 1 {
		return
	}
	c.Header("WWW-Authenticate", `Bearer realm="fluecell"`)
	s.abort(c, &apiError{Status: http.StatusUnauthorized, Code: codeUnauthorized, Param: paramToken,
		Msg: "missing or wrong token: send the header Authorization: Bearer TOKEN, or add token=TOKEN to the query (a sheet cell cannot set headers)"})
}

// requestToken returns the token a request carries: the Authorization header's bearer
// credentials, else the first query parameter named token.
func requestToken(r *http.Request) (string, bool) {
	if h := r.Header.Get("Authorization"); h != "" {
		scheme, cred, ok := strings.Cut(strings.TrimSpace(h), " ")
		if ok && strings.EqualFold(scheme, "Bearer") {
			return strings.TrimSpace(cred), true
		}
		return "", false
	}
	raw := r.URL.RawQuery
	for raw != "" {
		var part string
		part, raw, _ = strings.Cut(raw, "&")
		k, v, _ := strings.Cut(part, "=")
		if name, err := url.QueryUnescape(k); err != nil || name != paramToken {
			continue
		}
		val, err := url.QueryUnescape(v)
		return val, err == nil
	}
	return "", false
}

// noQuery refuses query parameters on routes that take none (the token aside).
func (s *Server) noQuery(c *gin.Context) {
	if e := checkQuery(c.Request.URL.RawQuery); e != nil {
		s.abort(c, e)
	}
}

func (s *Server) noRoute(c *gin.Context) {
	s.abort(c, &apiError{Status: http.StatusNotFound, Code: codeNotFound,
		Msg: "no route " + c.Request.Method + " " + c.Request.URL.Path + ": the API is described at /openapi.yaml (functions: GET /v1/fn/{name}, list: GET /v1/functions)"})
}

func (s *Server) noMethod(c *gin.Context) {
	allow := http.MethodGet
	if p := c.Request.URL.Path; p == "/v1/eval" || p == "/v1/annotate" {
		allow = http.MethodPost
	}
	c.Header("Allow", allow)
	s.abort(c, &apiError{Status: http.StatusMethodNotAllowed, Code: codeMethod,
		Msg: "method " + c.Request.Method + " is not allowed on " + c.Request.URL.Path + ": use " + allow})
}
