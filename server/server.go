package server

import (
	"context"
	"errors"
	"fmt"
	"log/slog"
	"net"
	"net/http"

	"github.com/gin-gonic/gin"
	"github.com/prometheus/client_golang/prometheus/promhttp"

	"github.com/fluecell/fluecell/funcs"
)

// Server is the HTTP API over one funcs.Engine. Create it with New; it is safe for
// concurrent use.
type Server struct {
	cfg     Config
	engine  *funcs.Engine
	log     *slog.Logger
	logs    *logBudget // bounds the request log
	router  *gin.Engine
	metrics *metrics
	answers *cache[*answer]  // GET /v1/fn answers by function and raw query
	progs   *cache[*program] // compiled eval expressions
	static  staticPages      // answers that never change for this engine
	token   []byte           // sha256 of Config.Token, nil when none
	hdr     headerValues
	json    factorJSON // JSON of factor rows, written once each
	// pageFiles are the files of the page at / (page.go); never modified.
	pageFiles pageFiles
}

// headerValues are header values set on many answers, built once; never modified.
type headerValues struct {
	noStore []string // errors: not to be stored by any cache
	fnCache []string // GET /v1/fn answers: pure functions of the URL and the loaded packs
	page    []string // catalog pages: revalidate with the ETag
}

// fnMaxAge is the max-age of GET /v1/fn answers. An answer depends only on the URL and the
// factor packs the server loaded, which change only when it is restarted with other packs.
const fnMaxAge = "86400"

// New builds a Server. It fails when cfg holds a value no server can run with (a negative
// limit, an empty CORS origin), naming the field. A nil logger discards the logs.
func New(cfg Config, e *funcs.Engine, logger *slog.Logger) (*Server, error) {
	if e == nil {
		return nil, errors.New("server: New: no engine")
	}
	cfg, err := cfg.withDefaults()
	if err != nil {
		return nil, err
	}
	if logger == nil {
		logger = slog.New(slog.DiscardHandler)
	}
	s := &Server{cfg: cfg, engine: e, log: logger, logs: newLogBudget(cfg.LogBytesPerSecond)}
	s.answers = newCache[*answer](cfg.CacheEntries)
	s.progs = newCache[*program](programCacheEntries)
	s.hdr = headerValues{noStore: []string{"no-store"}, fnCache: []string{"public, max-age=" + fnMaxAge},
		page: []string{"no-cache"}}
	if cfg.Token != "" {
		s.token = hashToken(cfg.Token)
		// answers behind a token are for the client that sent it, not for shared caches
		s.hdr.fnCache = []string{"private, max-age=" + fnMaxAge}
	}
	names := make([]string, 0, len(e.Functions()))
	for _, f := range e.Functions() {
		names = append(names, f.Name)
	}
	s.metrics = newMetrics(names, func() float64 { return float64(s.answers.len()) })
	if s.static, err = buildStatic(e, cfg.Version); err != nil {
		return nil, fmt.Errorf("server: New: %w", err)
	}
	if s.pageFiles, err = loadPage(); err != nil {
		return nil, fmt.Errorf("server: New: %w", err)
	}
	s.router = s.routes()
	return s, nil
}

// Handler is the API as an http.Handler (for tests, or to mount under another server).
func (s *Server) Handler() http.Handler { return s.router }

// routes builds the gin router.
func (s *Server) routes() *gin.Engine {
	// gin keeps its mode in a package variable (atomically); fluecell never runs it in debug
	// mode, which would print every route at start-up.
	if gin.Mode() != gin.ReleaseMode {
		gin.SetMode(gin.ReleaseMode)
	}
	r := gin.New()
	r.HandleMethodNotAllowed = true
	r.ForwardedByClientIP = false
	_ = r.SetTrustedProxies(nil)
	r.Use(s.drainRefused, s.observe, s.recoverPanics, s.cors)
	r.GET("/healthz", s.healthz)
	// the page's files hold no data: open, like /healthz (page.go says why)
	r.GET("/", s.page)
	r.GET("/page/:file", s.page)
	r.HEAD("/", s.page)
	r.HEAD("/page/:file", s.page)

	api := r.Group("", s.authorize)
	api.GET("/v1/fn/:name", s.fn)
	api.POST("/v1/eval", s.eval)
	api.GET("/v1/functions", s.noQuery, s.functions)
	api.GET("/v1/functions/:name", s.noQuery, s.function)
	api.GET("/v1/factors", s.factors)
	api.GET("/v1/grids", s.grids)
	api.GET("/v1/units", s.noQuery, s.units)
	api.GET("/openapi.yaml", s.openapi)
	api.GET("/metrics", gin.WrapH(promhttp.HandlerFor(s.metrics.reg, promhttp.HandlerOpts{})))
	if s.cfg.Annotate != nil {
		api.POST(routeAnnotate, s.annotate)
		api.POST(routeInspect, s.annotate)
	}
	r.NoRoute(s.noRoute)
	r.NoMethod(s.noMethod)
	return r
}

// ListenAndServe listens on Config.Addr and serves until ctx is done, then shuts down
// gracefully (see Serve). Binding an address other than loopback without a token logs a
// warning.
func (s *Server) ListenAndServe(ctx context.Context) error {
	l, err := net.Listen("tcp", s.cfg.Addr)
	if err != nil {
		return fmt.Errorf("server: listen on %s: %w", s.cfg.Addr, err)
	}
	return s.Serve(ctx, l)
}

// Serve answers requests on l until ctx is done. Then it stops accepting connections, lets
// in-flight requests finish within Config.ShutdownTimeout, closes l and returns nil (or the
// error of a shutdown that ran out of time). A failure to accept is returned at once.
func (s *Server) Serve(ctx context.Context, l net.Listener) error {
	addr := l.Addr().String()
	if !s.loopback(l.Addr()) && s.token == nil {
		s.log.Warn("listening on an address other than loopback without a token: anyone who can reach it can use the API; set --token or FLUECELL_TOKEN", "addr", addr)
	}
	hs := &http.Server{
		Handler:           s.router,
		ReadHeaderTimeout: s.cfg.ReadHeaderTimeout,
		ReadTimeout:       s.cfg.ReadTimeout,
		WriteTimeout:      s.cfg.WriteTimeout,
		IdleTimeout:       s.cfg.IdleTimeout,
		MaxHeaderBytes:    maxHeaderBytes,
		ErrorLog:          slog.NewLogLogger(s.log.Handler(), slog.LevelWarn),
		BaseContext:       func(net.Listener) context.Context { return context.WithoutCancel(ctx) },
	}
	done := make(chan error, 1)
	go func() { done <- hs.Serve(l) }()
	s.log.Info("listening", "addr", addr, "url", "http://"+addr, "token", s.token != nil)
	select {
	case err := <-done:
		if errors.Is(err, http.ErrServerClosed) {
			return nil
		}
		return fmt.Errorf("server: %w", err)
	case <-ctx.Done():
	}
	s.log.Info("shutting down: finishing in-flight requests", "grace", s.cfg.ShutdownTimeout.String())
	sctx, cancel := context.WithTimeout(context.Background(), s.cfg.ShutdownTimeout)
	defer cancel()
	err := hs.Shutdown(sctx)
	<-done
	if err != nil {
		_ = hs.Close()
	}
	if c, ok := s.cfg.Annotate.(interface{ Close() error }); ok {
		// the uploads of requests still running past the grace go with their folder
		if cerr := c.Close(); cerr != nil {
			s.log.Warn("removing the annotation spool folder", "err", cerr)
		}
	}
	if err != nil {
		return fmt.Errorf("server: shutdown: %w", err)
	}
	s.log.Info("stopped")
	return nil
}

// loopback reports whether a listener address is on the loopback interface only.
func (s *Server) loopback(a net.Addr) bool {
	ta, ok := a.(*net.TCPAddr)
	return ok && ta.IP.IsLoopback()
}
