package server

import (
	"net/http"
	"net/url"
	"testing"
)

// discardWriter is a ResponseWriter that keeps only the status.
type discardWriter struct {
	h      http.Header
	status int
}

func (w *discardWriter) Header() http.Header         { return w.h }
func (w *discardWriter) Write(b []byte) (int, error) { return len(b), nil }
func (w *discardWriter) WriteHeader(s int)           { w.status = s }

// TestFnCachedAllocs bounds the allocations of a repeated sheet call answered from the cache,
// the server's hottest path (logging off; the request log adds its own).
func TestFnCachedAllocs(t *testing.T) {
	s, err := New(Config{}, newEngine(t), nil)
	if err != nil {
		t.Fatal(err)
	}
	h := s.Handler()
	req := &http.Request{Method: http.MethodGet, URL: &url.URL{Path: "/v1/fn/fuel_co2", RawQuery: "fuel=natural_gas&amount=1000&unit=GJ"},
		Header: http.Header{}, Body: http.NoBody}
	w := &discardWriter{h: http.Header{}}
	h.ServeHTTP(w, req) // fills the cache
	allocs := testing.AllocsPerRun(1000, func() {
		clear(w.h)
		h.ServeHTTP(w, req)
		if w.status != 200 {
			t.Fatalf("status %d", w.status)
		}
	})
	t.Logf("%.0f allocations per cached call", allocs)
	if allocs > 4 {
		t.Errorf("%.0f allocations per cached call, want at most 4", allocs)
	}
}
