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

// panicKey marks, in the gin context, a request whose handler panicked.
const panicKey = "fluecell.panic"

// recoverPanics turns a panic in a handler into a 500 with a JSON error (never a stack
// trace). It runs inside observe, which counts the 500 and logs it once, with the panic and
// its stack as the cause.
func (s *Server) recoverPanics(c *gin.Context) {
	defer func() {
		v := recover()
		if v == nil {
			return
		}
		if v == http.ErrAbortHandler {
			panic(v)
		}
		e := internalError(fmt.Errorf("panic: %v\n%s", v, debug.Stack()))
		c.Set(panicKey, true)
		if c.Writer.Written() {
			c.Set(errKey, e) // the answer had begun: it stays cut short
		} else {
			s.abort(c, e)
		}
		c.Abort()
	}()
	c.Next()
}

// observe records the metrics of every request and logs one line per request within the
// log's budget (Config.LogBytesPerSecond): errors and slow requests are notable, quick
// successes routine. The path and query are logged with every token-like value replaced;
// headers are not logged.
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
	kind := logRoutine
	if status >= 400 || d >= slowRequest {
		kind = logNotable
	}
	path := cutText(redactPath(c.Request.URL.EscapedPath(), s.cfg.Token), maxLoggedText)
	query := redactQuery(c.Request.URL.RawQuery, s.cfg.Token)
	var msg, cause string
	if v, ok := c.Get(errKey); ok {
		if e, ok := v.(*apiError); ok {
			u := c.Request.URL
			msg = cutText(redactText(e.Msg, s.cfg.Token, u.EscapedPath(), u.RawQuery), maxLoggedText)
			if e.cause != nil {
				cause = cutText(redactText(e.cause.Error(), s.cfg.Token, u.EscapedPath(), u.RawQuery), maxLoggedCause)
			}
		}
	}
	ok, skipped := s.logs.allow(kind, logLineOverhead+len(path)+len(query)+len(msg)+len(cause)+len(c.Request.RemoteAddr))
	if !ok {
		return
	}
	size := max(c.Writer.Size(), 0)
	attrs := make([]slog.Attr, 0, 12)
	attrs = append(attrs,
		slog.String("method", c.Request.Method),
		slog.String("path", path))
	if query != "" {
		attrs = append(attrs, slog.String("query", query))
	}
	attrs = append(attrs,
		slog.Int("status", status),
		slog.Int("bytes", size),
		slog.Duration("duration", d),
		slog.String("remote", c.Request.RemoteAddr))
	if msg != "" {
		attrs = append(attrs, slog.String("error", msg))
	}
	if cause != "" {
		attrs = append(attrs, slog.String("cause", cause))
	}
	if skipped[logRoutine] > 0 {
		attrs = append(attrs, slog.Int64("skipped_successes", skipped[logRoutine]))
	}
	if skipped[logNotable] > 0 {
		attrs = append(attrs, slog.Int64("skipped_errors", skipped[logNotable]))
	}
	line := "request"
	if c.GetBool(panicKey) {
		line = "panic while answering a request"
	}
	s.log.LogAttrs(ctx, level, line, attrs...)
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
	if p := c.Request.URL.Path; p == "/v1/eval" || p == routeAnnotate || p == routeInspect {
		allow = http.MethodPost
	}
	c.Header("Allow", allow)
	s.abort(c, &apiError{Status: http.StatusMethodNotAllowed, Code: codeMethod,
		Msg: "method " + c.Request.Method + " is not allowed on " + c.Request.URL.Path + ": use " + allow})
}
