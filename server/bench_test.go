package server

import (
	"io"
	"log/slog"
	"net/http"
	"net/http/httptest"
	"strconv"
	"strings"
	"testing"

	"github.com/gin-gonic/gin"
)

// benchServer is a Server over a fresh engine logging JSON lines to nowhere (the formatting
// cost stays in the figures).
func benchServer(b *testing.B, cfg Config) http.Handler {
	b.Helper()
	s, err := New(cfg, newEngine(b), slog.New(slog.NewJSONHandler(io.Discard, nil)))
	if err != nil {
		b.Fatal(err)
	}
	return s.Handler()
}

func serveBench(b *testing.B, h http.Handler, method, target, ctype, body string, want int) {
	b.Helper()
	b.ReportAllocs()
	for b.Loop() {
		var rd io.Reader = http.NoBody
		if body != "" {
			rd = strings.NewReader(body)
		}
		req := httptest.NewRequest(method, target, rd)
		if ctype != "" {
			req.Header.Set("Content-Type", ctype)
		}
		rec := httptest.NewRecorder()
		h.ServeHTTP(rec, req)
		if rec.Code != want {
			b.Fatalf("%d %s", rec.Code, rec.Body.String())
		}
	}
}

const benchFn = "/v1/fn/fuel_co2?fuel=natural_gas&amount=1000&unit=GJ"

// BenchmarkFnCached is what a sheet's repeated identical calls cost: an answer from the cache.
func BenchmarkFnCached(b *testing.B) {
	serveBench(b, benchServer(b, Config{}), http.MethodGet, benchFn, "", "", 200)
}

// BenchmarkFnUncached computes every answer: query parsing, the call, rendering.
func BenchmarkFnUncached(b *testing.B) {
	serveBench(b, benchServer(b, Config{CacheEntries: -1}), http.MethodGet, benchFn, "", "", 200)
}

func BenchmarkFnUncachedJSON(b *testing.B) {
	serveBench(b, benchServer(b, Config{CacheEntries: -1}), http.MethodGet, benchFn+"&format=json", "", "", 200)
}

func BenchmarkFnUncachedError(b *testing.B) {
	serveBench(b, benchServer(b, Config{CacheEntries: -1}), http.MethodGet, "/v1/fn/fuel_co2?fuel=natural_gas&amount=1000&unit=ton", "", "", 400)
}

// BenchmarkBareGin is the yardstick: a gin engine answering a constant, no middleware.
func BenchmarkBareGin(b *testing.B) {
	gin.SetMode(gin.ReleaseMode)
	r := gin.New()
	body := []byte("56.1")
	r.GET("/v1/fn/fuel_co2", func(c *gin.Context) { c.Data(http.StatusOK, ctText, body) })
	serveBench(b, r, http.MethodGet, benchFn, "", "", 200)
}

func BenchmarkParseFnQuery(b *testing.B) {
	b.ReportAllocs()
	for b.Loop() {
		if _, e := parseFnQuery("fuel=natural_gas&amount=1000&unit=MMBtu%20HHV&format=json"); e != nil {
			b.Fatal(e)
		}
	}
}

func BenchmarkEvalOne(b *testing.B) {
	serveBench(b, benchServer(b, Config{}), http.MethodPost, "/v1/eval", "application/json",
		`{"expr": "fuel_co2e(fuel, q, \"L\")", "vars": {"fuel": "diesel", "q": 1000}}`, 200)
}

func rowsBody(n int) string {
	var sb strings.Builder
	sb.WriteString(`{"expr": "fuel_co2e(fuel, q, unit)", "rows": [`)
	fuels := []string{"natural_gas", "diesel", "coal", "lpg"}
	unitsOf := []string{"GJ", "L", "t", "kg"}
	for i := 0; i < n; i++ {
		if i > 0 {
			sb.WriteByte(',')
		}
		sb.WriteString(`{"fuel": "` + fuels[i%4] + `", "q": ` + strconv.Itoa(100+i) + `, "unit": "` + unitsOf[i%4] + `"}`)
	}
	sb.WriteString("]}")
	return sb.String()
}

// BenchmarkEvalRows1000 is one notebook request of 1000 rows (ns/op is per request).
func BenchmarkEvalRows1000(b *testing.B) {
	body := rowsBody(1000)
	serveBench(b, benchServer(b, Config{}), http.MethodPost, "/v1/eval", "application/json", body, 200)
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/1000, "ns/row")
}

func BenchmarkEvalCSV1000(b *testing.B) {
	var sb strings.Builder
	sb.WriteString("fuel,q,unit\n")
	for i := 0; i < 1000; i++ {
		sb.WriteString([]string{"natural_gas", "diesel", "coal", "lpg"}[i%4] + "," + strconv.Itoa(100+i) + "," + []string{"GJ", "L", "t", "kg"}[i%4] + "\n")
	}
	serveBench(b, benchServer(b, Config{}), http.MethodPost, "/v1/eval?expr=fuel_co2e(fuel,q,unit)&as=t", "text/csv", sb.String(), 200)
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/1000, "ns/row")
}
