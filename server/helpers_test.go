package server

import (
	"bytes"
	"context"
	"io"
	"log/slog"
	"net"
	"net/http"
	"net/url"
	"strings"
	"sync"
	"testing"
	"time"
)

// syncBuffer is a bytes.Buffer safe for the concurrent writes of a logger.
type syncBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (s *syncBuffer) Write(p []byte) (int, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.Write(p)
}

func (s *syncBuffer) String() string {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.String()
}

// testServer is a Server answering real HTTP on a random loopback port.
type testServer struct {
	URL  string
	srv  *Server
	logs *syncBuffer
	stop func() error // cancels Serve and waits for it
}

// startServer runs a Server with cfg over a fresh engine until the test ends.
func startServer(t testing.TB, cfg Config) *testServer {
	t.Helper()
	logs := &syncBuffer{}
	s, err := New(cfg, newEngine(t), slog.New(slog.NewJSONHandler(logs, nil)))
	if err != nil {
		t.Fatal(err)
	}
	l, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	done := make(chan error, 1)
	go func() { done <- s.Serve(ctx, l) }()
	var once sync.Once
	var stopErr error
	ts := &testServer{URL: "http://" + l.Addr().String(), srv: s, logs: logs}
	ts.stop = func() error {
		once.Do(func() {
			cancel()
			select {
			case stopErr = <-done:
			case <-time.After(30 * time.Second):
				stopErr = context.DeadlineExceeded
			}
		})
		return stopErr
	}
	t.Cleanup(func() {
		if err := ts.stop(); err != nil {
			t.Errorf("Serve: %v", err)
		}
	})
	return ts
}

// reply is an answer read in full.
type reply struct {
	Status int
	Header http.Header
	Body   string
}

// do sends one request and reads the whole answer.
func do(t testing.TB, method, url string, header map[string]string, body string) reply {
	t.Helper()
	var rd io.Reader
	if body != "" {
		rd = strings.NewReader(body)
	}
	req, err := http.NewRequest(method, url, rd)
	if err != nil {
		t.Fatal(err)
	}
	for k, v := range header {
		req.Header.Set(k, v)
	}
	resp, err := http.DefaultClient.Do(req)
	if err != nil {
		t.Fatal(err)
	}
	defer resp.Body.Close()
	b, err := io.ReadAll(resp.Body)
	if err != nil {
		t.Fatal(err)
	}
	return reply{Status: resp.StatusCode, Header: resp.Header, Body: string(b)}
}

func get(t testing.TB, url string) reply { t.Helper(); return do(t, http.MethodGet, url, nil, "") }

func postJSON(t testing.TB, url, body string) reply {
	t.Helper()
	return do(t, http.MethodPost, url, map[string]string{"Content-Type": "application/json"}, body)
}

func postCSV(t testing.TB, url, body string) reply {
	t.Helper()
	return do(t, http.MethodPost, url, map[string]string{"Content-Type": "text/csv"}, body)
}

func urlEscape(s string) string { return url.QueryEscape(s) }
