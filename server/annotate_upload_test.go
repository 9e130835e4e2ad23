package server

import (
	"bufio"
	"fmt"
	"net"
	"net/http"
	"strings"
	"sync"
	"testing"
	"time"
)

// trickle opens a connection, sends the headers of an upload of size bytes, then one byte
// every gap until stop is closed or the server answers; it returns the status the server
// answered (0 for none) and when.
func trickle(t *testing.T, url string, size int, gap time.Duration, stop <-chan struct{}) (int, time.Duration) {
	t.Helper()
	start := time.Now()
	host := strings.TrimPrefix(url, "http://")
	conn, err := net.Dial("tcp", host)
	if err != nil {
		t.Error(err)
		return 0, 0
	}
	defer conn.Close()
	fmt.Fprintf(conn, "POST /v1/annotate HTTP/1.1\r\nHost: %s\r\nContent-Type: %s\r\nContent-Length: %d\r\n\r\nPK\x03\x04", host, typeXLSX, size)
	answered := make(chan int, 1)
	go func() {
		resp, err := http.ReadResponse(bufio.NewReader(conn), nil)
		if err != nil {
			answered <- 0
			return
		}
		resp.Body.Close()
		answered <- resp.StatusCode
	}()
	tick := time.NewTicker(gap)
	defer tick.Stop()
	for {
		select {
		case st := <-answered:
			return st, time.Since(start)
		case <-stop:
			return 0, time.Since(start)
		case <-tick.C:
			if _, err := conn.Write([]byte{0}); err != nil {
				return <-answered, time.Since(start)
			}
		}
	}
}

// TestSlowUploadsHoldNoTurn: two clients trickling their uploads a byte at a time do not hold
// the two annotation turns; a third client's workbook is annotated meanwhile, and the slow
// ones are cut off once they fall below the minimum rate.
func TestSlowUploadsHoldNoTurn(t *testing.T) {
	e := newEngine(t)
	ann := AnnotateHandler(e, AnnotateConfig{TempDir: t.TempDir(), Concurrent: 2, Timeout: 20 * time.Second,
		UploadGrace: 2 * time.Second, MinUploadRate: 1024})
	srv := startServer(t, Config{Annotate: ann})
	xlsx := demoWorkbook(t)

	stop := make(chan struct{})
	var wg sync.WaitGroup
	status := make([]int, 2)
	took := make([]time.Duration, 2)
	for i := range 2 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			status[i], took[i] = trickle(t, srv.URL, 100_000, 100*time.Millisecond, stop)
		}()
	}
	time.Sleep(500 * time.Millisecond) // both slow uploads have started
	client := &http.Client{Timeout: 8 * time.Second}
	req, _ := http.NewRequest(http.MethodPost, srv.URL+"/v1/annotate?report=json", strings.NewReader(string(xlsx)))
	req.Header.Set("Content-Type", typeXLSX)
	start := time.Now()
	resp, err := client.Do(req)
	if err != nil {
		close(stop)
		wg.Wait()
		t.Fatalf("the third client got no answer in %v: %v", time.Since(start), err)
	}
	resp.Body.Close()
	if resp.StatusCode != http.StatusOK {
		t.Errorf("third client: %d after %v, want 200", resp.StatusCode, time.Since(start))
	}
	t.Logf("third client answered %d in %v", resp.StatusCode, time.Since(start))
	timer := time.AfterFunc(10*time.Second, func() { close(stop) })
	wg.Wait()
	timer.Stop()
	for i := range 2 {
		if status[i] != http.StatusRequestTimeout || took[i] > 6*time.Second {
			t.Errorf("slow client %d: %d after %v, want 408 within the 2 s grace (plus margin)", i, status[i], took[i])
		}
	}
}
