package server

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"io"
	"net"
	"net/http"
	"os"
	"os/exec"
	"strings"
	"testing"
	"time"
)

// sendAllThenRead writes a whole request (headers and body) before reading anything, as
// Python's urllib and requests do, then reads the answer.
func sendAllThenRead(t *testing.T, base, target, ctype string, body []byte, chunked bool) (int, string, error) {
	t.Helper()
	host := strings.TrimPrefix(base, "http://")
	conn, err := net.Dial("tcp", host)
	if err != nil {
		t.Fatal(err)
	}
	defer conn.Close()
	_ = conn.SetDeadline(time.Now().Add(20 * time.Second))
	var head bytes.Buffer
	fmt.Fprintf(&head, "POST %s HTTP/1.1\r\nHost: %s\r\nContent-Type: %s\r\n", target, host, ctype)
	if chunked {
		head.WriteString("Transfer-Encoding: chunked\r\n\r\n")
	} else {
		fmt.Fprintf(&head, "Content-Length: %d\r\n\r\n", len(body))
	}
	if _, err := conn.Write(head.Bytes()); err != nil {
		return 0, "", fmt.Errorf("writing the headers: %w", err)
	}
	const chunk = 64 << 10
	for off := 0; off < len(body); off += chunk {
		part := body[off:min(off+chunk, len(body))]
		if chunked {
			fmt.Fprintf(conn, "%x\r\n", len(part))
		}
		if _, err := conn.Write(part); err != nil {
			return 0, "", fmt.Errorf("writing the body at byte %d: %w", off, err)
		}
		if chunked {
			io.WriteString(conn, "\r\n")
		}
	}
	if chunked {
		io.WriteString(conn, "0\r\n\r\n")
	}
	resp, err := http.ReadResponse(bufio.NewReader(conn), nil)
	if err != nil {
		return 0, "", fmt.Errorf("reading the answer: %w", err)
	}
	defer resp.Body.Close()
	b, err := io.ReadAll(resp.Body)
	if err != nil {
		return resp.StatusCode, string(b), fmt.Errorf("reading the answer's body: %w", err)
	}
	return resp.StatusCode, string(b), nil
}

// TestOversizedBodySentBeforeReading: a client that sends its whole oversized body before
// reading gets the 413 and its message, not a connection reset.
func TestOversizedBodySentBeforeReading(t *testing.T) {
	e := newEngine(t)
	ts := startServer(t, Config{MaxBodyBytes: 64 << 10, MaxUploadBytes: 256 << 10,
		Annotate: AnnotateHandler(e, AnnotateConfig{TempDir: t.TempDir()})})
	big := bytes.Repeat([]byte("x"), 32<<20)
	evalBody := append([]byte(`{"expr": "1", "vars": {"s": "`), big...)
	for _, c := range []struct {
		name, target, ctype string
		body                []byte
		chunked             bool
	}{
		{"eval declared", "/v1/eval", "application/json", evalBody, false},
		{"eval chunked", "/v1/eval", "application/json", evalBody, true},
		{"annotate declared", "/v1/annotate", typeXLSX, append([]byte("PK\x03\x04"), big...), false},
		{"annotate chunked", "/v1/annotate", typeXLSX, append([]byte("PK\x03\x04"), big...), true},
	} {
		status, body, err := sendAllThenRead(t, ts.URL, c.target, c.ctype, c.body, c.chunked)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		var e errorBody
		if status != http.StatusRequestEntityTooLarge || json.Unmarshal([]byte(body), &e) != nil || e.Code != codeTooLarge || !strings.Contains(e.Error, "over the limit") {
			t.Errorf("%s: %d %.200s, want 413 with its message", c.name, status, body)
		}
	}
	// other refusals before the body is read: an unknown route, a missing token
	tok := startServer(t, Config{Token: "tk"})
	for _, c := range []struct {
		base, target string
		status       int
	}{{ts.URL, "/v1/nowhere", 404}, {tok.URL, "/v1/eval", 401}} {
		status, _, err := sendAllThenRead(t, c.base, c.target, "application/json", big, false)
		if err != nil || status != c.status {
			t.Errorf("%s: %d %v, want %d", c.target, status, err, c.status)
		}
	}
}

// TestPythonSeesThe413: Python's urllib sends the whole body before reading; it must read the
// 413 and its message.
func TestPythonSeesThe413(t *testing.T) {
	if _, err := os.Stat(debianPython); err != nil {
		if os.Getenv("FLUECELL_REQUIRE_CALC") == "1" {
			t.Fatalf("%s not found (FLUECELL_REQUIRE_CALC=1)", debianPython)
		}
		t.Skipf("%s not found", debianPython)
	}
	ts := startServer(t, Config{MaxBodyBytes: 64 << 10})
	const script = `
import json, sys, urllib.request, urllib.error
body = json.dumps({"expr": "1", "vars": {"s": "x" * (32 << 20)}}).encode()
req = urllib.request.Request(sys.argv[1] + "/v1/eval", data=body, headers={"Content-Type": "application/json"})
try:
    urllib.request.urlopen(req, timeout=20)
    print(json.dumps({"status": 200}))
except urllib.error.HTTPError as e:
    print(json.dumps({"status": e.code, "body": json.loads(e.read())}))
`
	ctx, cancel := context.WithTimeout(context.Background(), 60*time.Second)
	defer cancel()
	cmd := exec.CommandContext(ctx, debianPython, "-c", script, ts.URL)
	for _, kv := range os.Environ() {
		if !strings.HasPrefix(kv, "PYTHON") {
			cmd.Env = append(cmd.Env, kv)
		}
	}
	var stdout, stderr bytes.Buffer
	cmd.Stdout, cmd.Stderr = &stdout, &stderr
	if err := cmd.Run(); err != nil {
		t.Fatalf("python: %v\n%s", err, stderr.String())
	}
	var got struct {
		Status int       `json:"status"`
		Body   errorBody `json:"body"`
	}
	if err := json.Unmarshal(stdout.Bytes(), &got); err != nil || got.Status != 413 || got.Body.Code != codeTooLarge {
		t.Errorf("python got %s (%v)", stdout.String(), err)
	}
}
