package server

import (
	"strconv"
	"time"

	"github.com/prometheus/client_golang/prometheus"
	"github.com/prometheus/client_golang/prometheus/collectors"
)

// metrics are the server's Prometheus collectors, in a registry of its own (no global
// registration), served at /metrics.
type metrics struct {
	reg *prometheus.Registry

	requests  *prometheus.CounterVec   // route, method, status
	latency   *prometheus.HistogramVec // route
	httpErrs  *prometheus.CounterVec   // route, class (client|server)
	fnCalls   *prometheus.CounterVec   // function, cache (hit|miss)
	fnErrors  *prometheus.CounterVec   // function, code
	fnLatency *prometheus.HistogramVec // function: computing an answer (cache misses)
	evalRows  *prometheus.CounterVec   // outcome (ok|error)

	byFn map[string]*fnMetrics
}

// fnMetrics are the children of one function's labels, resolved once.
type fnMetrics struct {
	hit, miss prometheus.Counter
	latency   prometheus.Observer
}

// unknownFunction is the function label of calls to names outside the catalog, which keeps
// the label set bounded.
const unknownFunction = "unknown"

func newMetrics(functions []string, cacheLen func() float64) *metrics {
	m := &metrics{reg: prometheus.NewRegistry(), byFn: map[string]*fnMetrics{}}
	m.requests = prometheus.NewCounterVec(prometheus.CounterOpts{
		Name: "fluecell_http_requests_total", Help: "HTTP requests by route, method and status code.",
	}, []string{"route", "method", "status"})
	m.latency = prometheus.NewHistogramVec(prometheus.HistogramOpts{
		Name: "fluecell_http_request_duration_seconds", Help: "Time to answer an HTTP request, by route.",
		Buckets: []float64{0.0001, 0.00025, 0.0005, 0.001, 0.0025, 0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10},
	}, []string{"route"})
	m.httpErrs = prometheus.NewCounterVec(prometheus.CounterOpts{
		Name: "fluecell_http_errors_total", Help: "HTTP answers with a 4xx (class client) or 5xx (class server) status, by route.",
	}, []string{"route", "class"})
	m.fnCalls = prometheus.NewCounterVec(prometheus.CounterOpts{
		Name: "fluecell_function_calls_total", Help: "GET /v1/fn calls by function, answered from the cache (hit) or computed (miss).",
	}, []string{"function", "cache"})
	m.fnErrors = prometheus.NewCounterVec(prometheus.CounterOpts{
		Name: "fluecell_function_errors_total", Help: "GET /v1/fn calls answered with an error, by function and error code.",
	}, []string{"function", "code"})
	m.fnLatency = prometheus.NewHistogramVec(prometheus.HistogramOpts{
		Name: "fluecell_function_duration_seconds", Help: "Time to compute and render a GET /v1/fn answer (cache misses), by function.",
		Buckets: []float64{0.000005, 0.00001, 0.000025, 0.00005, 0.0001, 0.00025, 0.0005, 0.001, 0.005, 0.01},
	}, []string{"function"})
	m.evalRows = prometheus.NewCounterVec(prometheus.CounterOpts{
		Name: "fluecell_eval_rows_total", Help: "Rows evaluated by POST /v1/eval, by outcome (ok or error).",
	}, []string{"outcome"})
	cacheEntries := prometheus.NewGaugeFunc(prometheus.GaugeOpts{
		Name: "fluecell_cache_entries", Help: "Answers of GET /v1/fn held in the cache.",
	}, cacheLen)
	m.reg.MustRegister(m.requests, m.latency, m.httpErrs, m.fnCalls, m.fnErrors, m.fnLatency, m.evalRows, cacheEntries,
		collectors.NewGoCollector(), collectors.NewProcessCollector(collectors.ProcessCollectorOpts{}))
	for _, name := range append(functions, unknownFunction) {
		m.byFn[name] = &fnMetrics{
			hit:     m.fnCalls.WithLabelValues(name, "hit"),
			miss:    m.fnCalls.WithLabelValues(name, "miss"),
			latency: m.fnLatency.WithLabelValues(name),
		}
	}
	for _, o := range []string{"ok", "error"} {
		m.evalRows.WithLabelValues(o)
	}
	return m
}

// fn returns the metrics of a function name, those of "unknown" for a name outside the catalog.
func (m *metrics) fn(name string) (label string, fm *fnMetrics) {
	if fm, ok := m.byFn[name]; ok {
		return name, fm
	}
	return unknownFunction, m.byFn[unknownFunction]
}

// observe records one answered request.
func (m *metrics) observe(route, method string, status int, d time.Duration) {
	switch method {
	case "GET", "POST", "HEAD", "OPTIONS":
	default:
		method = "other" // keeps the label set bounded
	}
	m.requests.WithLabelValues(route, method, strconv.Itoa(status)).Inc()
	m.latency.WithLabelValues(route).Observe(d.Seconds())
	switch {
	case status >= 500:
		m.httpErrs.WithLabelValues(route, "server").Inc()
	case status >= 400:
		m.httpErrs.WithLabelValues(route, "client").Inc()
	}
}
