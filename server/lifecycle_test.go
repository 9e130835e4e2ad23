package server

import (
	"bytes"
	"context"
	"io"
	"log/slog"
	"net"
	"net/http"
	"strings"
	"testing"
	"time"
)

// TestGracefulShutdown: a request in flight when the server is told to stop gets its answer;
// a connection opened after that is refused.
func TestGracefulShutdown(t *testing.T) {
	entered := make(chan struct{})
	release := make(chan struct{})
	slow := http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		close(entered)
		<-release
		w.Header().Set("Content-Type", "application/json")
		_, _ = io.WriteString(w, `{"done": true}`)
	})
	ts := startServer(t, Config{Annotate: slow})
	type result struct {
		r   reply
		err error
	}
	got := make(chan result, 1)
	go func() {
		resp, err := http.Post(ts.URL+"/v1/annotate", "application/json", strings.NewReader("{}"))
		if err != nil {
			got <- result{err: err}
			return
		}
		defer resp.Body.Close()
		b, err := io.ReadAll(resp.Body)
		got <- result{r: reply{Status: resp.StatusCode, Body: string(b)}, err: err}
	}()
	<-entered
	stopped := make(chan error, 1)
	go func() { stopped <- ts.stop() }()
	// wait until the listener is closed: new connections are refused
	addr := strings.TrimPrefix(ts.URL, "http://")
	deadline := time.Now().Add(10 * time.Second)
	for {
		c, err := net.DialTimeout("tcp", addr, time.Second)
		if err != nil {
			break
		}
		c.Close()
		if time.Now().After(deadline) {
			t.Fatal("the server still accepts connections 10 s after shutdown began")
		}
		time.Sleep(10 * time.Millisecond)
	}
	select {
	case err := <-stopped:
		t.Fatalf("Serve returned (%v) before the in-flight request finished", err)
	default:
	}
	close(release)
	res := <-got
	if res.err != nil || res.r.Status != 200 || res.r.Body != `{"done": true}` {
		t.Errorf("in-flight request: %+v", res)
	}
	if err := <-stopped; err != nil {
		t.Errorf("Serve: %v", err)
	}
}

// TestAnnotateHook: the registered handler gets the body, behind the token and the upload limit.
func TestAnnotateHook(t *testing.T) {
	var seen []byte
	h := http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		b, err := io.ReadAll(r.Body)
		if err != nil {
			w.WriteHeader(http.StatusRequestEntityTooLarge)
			return
		}
		seen = b
		w.Header().Set("Content-Type", "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet")
		_, _ = w.Write(b)
	})
	ts := startServer(t, Config{Annotate: h, Token: "tk", MaxUploadBytes: 10})
	if r := do(t, http.MethodPost, ts.URL+"/v1/annotate", nil, "PK"); r.Status != 401 {
		t.Errorf("without token: %d", r.Status)
	}
	r := do(t, http.MethodPost, ts.URL+"/v1/annotate?token=tk", nil, "PK\x03\x04")
	if r.Status != 200 || !bytes.Equal(seen, []byte("PK\x03\x04")) {
		t.Errorf("%d, handler saw %q", r.Status, seen)
	}
	if r := do(t, http.MethodPost, ts.URL+"/v1/annotate?token=tk", nil, strings.Repeat("x", 11)); r.Status != 413 || !strings.Contains(r.Body, "limit of 10 bytes") {
		t.Errorf("over the limit: %d %s", r.Status, r.Body)
	}
	// a body of unknown length is cut off at the limit
	req, _ := http.NewRequest(http.MethodPost, ts.URL+"/v1/annotate?token=tk", io.MultiReader(strings.NewReader(strings.Repeat("y", 20))))
	req.ContentLength = -1
	resp, err := http.DefaultClient.Do(req)
	if err != nil {
		t.Fatal(err)
	}
	resp.Body.Close()
	if resp.StatusCode != 413 {
		t.Errorf("chunked body over the limit: %d", resp.StatusCode)
	}
}

// TestPanicIsA500: a fault in a handler is a 500 with a plain message; the stack goes to the log.
func TestPanicIsA500(t *testing.T) {
	boom := http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) { panic("boom") })
	ts := startServer(t, Config{Annotate: boom})
	r := postJSON(t, ts.URL+"/v1/annotate", "{}")
	if r.Status != 500 || r.Body != `{"error":"`+internalErrorMessage+`","code":"internal"}` {
		t.Errorf("%d %s", r.Status, r.Body)
	}
	if logs := ts.logs.String(); !strings.Contains(logs, "panic while answering") || !strings.Contains(logs, "goroutine") {
		t.Errorf("log lacks the panic and stack:\n%s", logs)
	}
	// logged once, on the request's line, and counted
	if logs := ts.logs.String(); strings.Count(logs, "boom") != 1 || strings.Count(logs, `"path":"/v1/annotate"`) != 1 {
		t.Errorf("the panic is not logged exactly once:\n%s", logs)
	}
	if m := get(t, ts.URL+"/metrics"); !strings.Contains(m.Body, `fluecell_http_requests_total{method="POST",route="/v1/annotate",status="500"} 1`) {
		t.Errorf("the 500 is not counted:\n%s", m.Body)
	}
	// the server goes on answering
	if r := get(t, ts.URL+"/healthz"); r.Status != 200 {
		t.Errorf("after a panic: %d", r.Status)
	}
}

// TestListenAndServe binds Config.Addr and stops with the context.
func TestListenAndServe(t *testing.T) {
	l, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	addr := l.Addr().String()
	l.Close()
	s, err := New(Config{Addr: addr}, newEngine(t), nil)
	if err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	done := make(chan error, 1)
	go func() { done <- s.ListenAndServe(ctx) }()
	var r *http.Response
	for i := 0; i < 100; i++ {
		if r, err = http.Get("http://" + addr + "/healthz"); err == nil {
			break
		}
		time.Sleep(20 * time.Millisecond)
	}
	if err != nil {
		t.Fatal(err)
	}
	r.Body.Close()
	cancel()
	if err := <-done; err != nil {
		t.Errorf("ListenAndServe: %v", err)
	}
	// an address in use is an error naming it
	l2, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer l2.Close()
	s2, _ := New(Config{Addr: l2.Addr().String()}, newEngine(t), nil)
	if err := s2.ListenAndServe(context.Background()); err == nil || !strings.Contains(err.Error(), l2.Addr().String()) {
		t.Errorf("busy address: %v", err)
	}
}

// publicAddrListener reports a non-loopback address (TEST-NET-1, no traffic is sent to it).
type publicAddrListener struct{ net.Listener }

func (publicAddrListener) Addr() net.Addr {
	return &net.TCPAddr{IP: net.IPv4(192, 0, 2, 1), Port: 8787}
}

func TestWarnsWithoutToken(t *testing.T) {
	for _, token := range []string{"", "t"} {
		logs := &syncBuffer{}
		s, err := New(Config{Token: token}, newEngine(t), slog.New(slog.NewTextHandler(logs, nil)))
		if err != nil {
			t.Fatal(err)
		}
		l, err := net.Listen("tcp", "127.0.0.1:0")
		if err != nil {
			t.Fatal(err)
		}
		ctx, cancel := context.WithCancel(context.Background())
		cancel()
		if err := s.Serve(ctx, publicAddrListener{l}); err != nil {
			t.Fatal(err)
		}
		warned := strings.Contains(logs.String(), "without a token")
		if warned != (token == "") {
			t.Errorf("token %q: warned %v:\n%s", token, warned, logs.String())
		}
	}
}
