package main

import (
	"context"
	"fmt"
	"log/slog"
	"os"

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
	var logger *slog.Logger
	switch *logFormat {
	case "text":
		logger = slog.New(slog.NewTextHandler(s.err, nil))
	case "json":
		logger = slog.New(slog.NewJSONHandler(s.err, nil))
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
	srv, err := server.New(server.Config{
		Addr: *addr, Token: tok, CORSOrigins: cors,
		MaxBodyBytes: *maxBody, MaxUploadBytes: *maxUpload, MaxRows: *maxRows, EvalTimeout: *evalTimeout,
		CacheEntries: cache, Version: version,
	}, e, logger)
	if err != nil {
		return fail(s, "serve", err)
	}
	if err := srv.ListenAndServe(ctx); err != nil {
		return fail(s, "serve", err)
	}
	return 0
}
