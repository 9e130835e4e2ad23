package server

import (
	"fmt"
	"net/http"
	"time"
)

// Defaults used for zero Config fields.
const (
	DefaultAddr              = "127.0.0.1:8787"
	DefaultMaxBodyBytes      = 1 << 20  // 1 MiB for POST /v1/eval
	DefaultMaxUploadBytes    = 64 << 20 // 64 MiB for POST /v1/annotate
	DefaultMaxRows           = 100_000
	DefaultEvalTimeout       = 10 * time.Second
	DefaultCacheEntries      = 4096
	DefaultReadHeaderTimeout = 5 * time.Second
	DefaultReadTimeout       = 60 * time.Second
	DefaultWriteTimeout      = 60 * time.Second
	DefaultIdleTimeout       = 120 * time.Second
	DefaultShutdownTimeout   = 15 * time.Second
)

// maxHeaderBytes bounds the request line and headers (a sheet's URL lives in the request line).
const maxHeaderBytes = 64 << 10

// Config is the server's configuration, filled from flags by `fluecell serve`. Zero fields
// take the defaults above.
type Config struct {
	// Addr is the TCP address ListenAndServe binds (default 127.0.0.1:8787, loopback only).
	Addr string
	// Token, when not empty, is required on every request but /healthz and the web page's
	// own files (/ and /page/*, which hold no data; the page sends the token as a header), as
	// "Authorization: Bearer TOKEN" or as the query parameter token=TOKEN (a sheet cell
	// cannot set headers). It is compared in constant time and never logged.
	Token string
	// CORSOrigins lists the browser origins allowed to call the API ("*" for any); empty
	// means no CORS headers are sent.
	CORSOrigins []string
	// MaxBodyBytes bounds the body of POST /v1/eval (default 1 MiB); larger bodies get 413.
	MaxBodyBytes int64
	// MaxUploadBytes bounds the body of POST /v1/annotate (default 64 MiB).
	MaxUploadBytes int64
	// MaxRows bounds the rows of one eval request, JSON or CSV (default 100000); more get 413.
	MaxRows int
	// EvalTimeout bounds the evaluation of one eval request (default 10 s); past it the
	// request gets 503 and the client is told to send fewer rows per request.
	EvalTimeout time.Duration
	// CacheEntries bounds the answers of GET /v1/fn kept in memory (default 4096); a
	// negative value turns the cache off.
	CacheEntries int
	// Timeouts of the http.Server (defaults 5 s, 60 s, 60 s, 120 s) and the time given to
	// in-flight requests on shutdown (default 15 s).
	ReadHeaderTimeout, ReadTimeout, WriteTimeout, IdleTimeout, ShutdownTimeout time.Duration
	// Annotate serves POST /v1/annotate (the workbook importer's handler). nil: the route is
	// not served (404). The server wraps it with the token check, the MaxUploadBytes body
	// limit, metrics and the request log; the handler writes its own answers, errors as
	// application/json {"error": "...", "code": "..."} like every other route.
	Annotate http.Handler
	// LogBytesPerSecond bounds the request log (default 32 KiB/s, with bursts of
	// logBurstSeconds). Errors (4xx, 5xx) and slow requests draw on three quarters of it,
	// quick successes on a quarter; a line beyond the budget is skipped and counted, and the
	// next line written says how many were skipped (skipped_successes, skipped_errors). The
	// metrics count every request. Negative: no bound.
	LogBytesPerSecond int64
	// Version is the program version reported by /healthz.
	Version string
}

// withDefaults returns c with zero fields set to the defaults, or an error naming a field
// that holds a value no server can run with.
func (c Config) withDefaults() (Config, error) {
	if c.Addr == "" {
		c.Addr = DefaultAddr
	}
	type check struct {
		name string
		bad  bool
	}
	for _, ch := range []check{
		{"MaxBodyBytes", c.MaxBodyBytes < 0},
		{"MaxUploadBytes", c.MaxUploadBytes < 0},
		{"MaxRows", c.MaxRows < 0},
		{"EvalTimeout", c.EvalTimeout < 0},
		{"ReadHeaderTimeout", c.ReadHeaderTimeout < 0},
		{"ReadTimeout", c.ReadTimeout < 0},
		{"WriteTimeout", c.WriteTimeout < 0},
		{"IdleTimeout", c.IdleTimeout < 0},
		{"ShutdownTimeout", c.ShutdownTimeout < 0},
	} {
		if ch.bad {
			return c, fmt.Errorf("server: %s must not be negative (0 takes the default)", ch.name)
		}
	}
	def := func(v *int64, d int64) {
		if *v == 0 {
			*v = d
		}
	}
	def(&c.MaxBodyBytes, DefaultMaxBodyBytes)
	def(&c.MaxUploadBytes, DefaultMaxUploadBytes)
	if c.MaxRows == 0 {
		c.MaxRows = DefaultMaxRows
	}
	if c.CacheEntries == 0 {
		c.CacheEntries = DefaultCacheEntries
	}
	dur := func(v *time.Duration, d time.Duration) {
		if *v == 0 {
			*v = d
		}
	}
	if c.LogBytesPerSecond == 0 {
		c.LogBytesPerSecond = DefaultLogBytesPerSecond
	}
	dur(&c.EvalTimeout, DefaultEvalTimeout)
	dur(&c.ReadHeaderTimeout, DefaultReadHeaderTimeout)
	dur(&c.ReadTimeout, DefaultReadTimeout)
	dur(&c.WriteTimeout, DefaultWriteTimeout)
	dur(&c.IdleTimeout, DefaultIdleTimeout)
	dur(&c.ShutdownTimeout, DefaultShutdownTimeout)
	for _, o := range c.CORSOrigins {
		if o == "" {
			return c, fmt.Errorf("server: CORSOrigins: empty origin; give an origin such as https://sheets.example.org, or *")
		}
	}
	return c, nil
}
