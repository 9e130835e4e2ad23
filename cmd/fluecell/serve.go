package main

import (
	"context"
	"fmt"
	"io"
	"log/slog"
	"os"
	"sync"
	"time"

	"github.com/fluecell/fluecell/importer"
	"github.com/fluecell/fluecell/server"
)

// tokenEnv is the environment variable read for the token when --token is not given (a flag
// shows in the process list; the environment does not).
const tokenEnv = "FLUECELL_TOKEN"

func cmdServe(ctx context.Context, s stdio, args []string) int {
	fs := newFlags("serve", "serve [--addr 127.0.0.1:8787] [--token T] [--factors FILE]... [--cors-origin O]...", s.err, true)
	addr := fs.String("addr", server.DefaultAddr, "listen on `HOST:PORT`; binding anything but loopback without a token logs a warning")
	token := fs.String("token", "", "require `TOKEN` on every request but /healthz (Authorization: Bearer, or token= in the query); default $"+tokenEnv)
	var cors listFlag
	fs.Var(&cors, "cors-origin", "allow browser calls from `ORIGIN` (e.g. https://sheets.example.org, or * for any); repeatable")
	maxBody := fs.Int64("max-body", server.DefaultMaxBodyBytes, "largest POST /v1/eval body in `BYTES` (413 beyond)")
	maxUpload := fs.Int64("max-upload", server.DefaultMaxUploadBytes, "largest POST /v1/annotate body in `BYTES`")
	maxRows := fs.Int("max-rows", server.DefaultMaxRows, "most rows in one eval request, JSON or CSV (413 beyond)")
	evalTimeout := fs.Duration("eval-timeout", server.DefaultEvalTimeout, "time limit for evaluating one request")
	cacheN := fs.Int("cache", server.DefaultCacheEntries, "answers of GET /v1/fn kept in memory; 0 turns the cache off")
	logFormat := fs.String("log-format", "text", "request log on stderr: text or json")
	var ef engineFlags
	ef.register(fs)
	pos, code, ok := parseArgs(fs, args)
	if !ok {
		return code
	}
	if len(pos) > 0 {
		fmt.Fprintf(s.err, "fluecell serve: takes no arguments, got %q; see fluecell serve --help\n", pos[0])
		return 2
	}
	logs := newLogBuffer(s.err, logFlushEvery)
	defer logs.Close()
	var logger *slog.Logger
	switch *logFormat {
	case "text":
		logger = slog.New(slog.NewTextHandler(logs, nil))
	case "json":
		logger = slog.New(slog.NewJSONHandler(logs, nil))
	default:
		fmt.Fprintf(s.err, "fluecell serve: --log-format %q: accepted are text and json\n", *logFormat)
		return 2
	}
	for _, v := range []struct {
		name string
		bad  bool
	}{{"--max-body", *maxBody <= 0}, {"--max-upload", *maxUpload <= 0}, {"--max-rows", *maxRows <= 0}, {"--eval-timeout", *evalTimeout <= 0}, {"--cache", *cacheN < 0}} {
		if v.bad {
			fmt.Fprintf(s.err, "fluecell serve: %s must be positive\n", v.name)
			return 2
		}
	}
	tok := *token
	if tok == "" {
		tok = os.Getenv(tokenEnv)
	}
	cache := *cacheN
	if cache == 0 {
		cache = -1 // server.Config: negative turns the cache off, 0 takes the default
	}
	e, err := ef.engine()
	if err != nil {
		return fail(s, "serve", err)
	}
	annotate := server.AnnotateHandler(e, server.AnnotateConfig{
		Options: importer.Options{Pack: ef.pack, FactorFiles: append([]string{}, ef.factors...)},
		Logger:  logger,
	})
	srv, err := server.New(server.Config{
		Addr: *addr, Token: tok, CORSOrigins: cors,
		MaxBodyBytes: *maxBody, MaxUploadBytes: *maxUpload, MaxRows: *maxRows, EvalTimeout: *evalTimeout,
		CacheEntries: cache, Version: version, Annotate: annotate,
	}, e, logger)
	if err != nil {
		return fail(s, "serve", err)
	}
	if err := srv.ListenAndServe(ctx); err != nil {
		return fail(s, "serve", err)
	}
	return 0
}

// logFlushEvery is how long a log line may wait in memory before it is written.
const logFlushEvery = 100 * time.Millisecond

// logBufferLimit is how many bytes of log lines may wait before they are written at once.
const logBufferLimit = 64 << 10

// logBuffer gathers log lines and writes them to w every logFlushEvery (or once
// logBufferLimit bytes wait), so that the request log costs no system call per request. Close
// writes what is left. Write errors of w are dropped: the log must not stop the server.
type logBuffer struct {
	mu   sync.Mutex
	w    io.Writer
	buf  []byte
	stop chan struct{}
	done chan struct{}
}

func newLogBuffer(w io.Writer, every time.Duration) *logBuffer {
	b := &logBuffer{w: w, stop: make(chan struct{}), done: make(chan struct{})}
	go func() {
		defer close(b.done)
		t := time.NewTicker(every)
		defer t.Stop()
		for {
			select {
			case <-t.C:
				b.flush()
			case <-b.stop:
				return
			}
		}
	}()
	return b
}

func (b *logBuffer) Write(p []byte) (int, error) {
	b.mu.Lock()
	defer b.mu.Unlock()
	b.buf = append(b.buf, p...)
	if len(b.buf) >= logBufferLimit {
		b.flushLocked()
	}
	return len(p), nil
}

func (b *logBuffer) flush() {
	b.mu.Lock()
	defer b.mu.Unlock()
	b.flushLocked()
}

func (b *logBuffer) flushLocked() {
	if len(b.buf) > 0 {
		_, _ = b.w.Write(b.buf)
		b.buf = b.buf[:0]
	}
}

// Close stops the flushing and writes the lines still waiting.
func (b *logBuffer) Close() {
	close(b.stop)
	<-b.done
	b.flush()
}
