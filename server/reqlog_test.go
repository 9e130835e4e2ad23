package server

import (
	"encoding/json"
	"net/http"
	"strings"
	"sync"
	"testing"
	"time"
)

// TestRequestLogBounded: a burst of requests, successes and mistakes, writes no more than the
// log's byte rate allows (plus its burst); the first lines are written, mistakes are preferred
// to successes, and a later line says how many were skipped.
func TestRequestLogBounded(t *testing.T) {
	const rate = 4096
	ts := startServer(t, Config{LogBytesPerSecond: rate})
	start := time.Now()
	var wg sync.WaitGroup
	client := &http.Client{Transport: &http.Transport{MaxIdleConnsPerHost: 8}}
	for w := range 8 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range 300 {
				u := ts.URL + "/v1/fn/co2_from_carbon?mass=12"
				if (i+w)%2 == 1 {
					u = ts.URL + "/v1/fn/co2_from_carbon?mass=twelve"
				}
				resp, err := client.Get(u)
				if err != nil {
					t.Error(err)
					return
				}
				resp.Body.Close()
			}
		}()
	}
	wg.Wait()
	elapsed := time.Since(start)
	// one more mistake after the burst, once the budget has refilled a little
	time.Sleep(time.Second)
	get(t, ts.URL+"/v1/fn/co2_from_carbon?mass=thirteen")
	logs := ts.logs.String()
	bound := int(rate * (elapsed.Seconds() + 1 + logBurstSeconds + 1))
	if len(logs) > bound {
		t.Errorf("2,401 requests in %v wrote %d bytes of log, over the bound of %d", elapsed, len(logs), bound)
	}
	var okLines, errLines int
	var skippedOK, skippedErr float64
	for _, l := range strings.Split(strings.TrimSpace(logs), "\n") {
		var m map[string]any
		if err := json.Unmarshal([]byte(l), &m); err != nil {
			t.Fatalf("log line %q: %v", l, err)
		}
		if m["msg"] != "request" {
			continue
		}
		if m["status"] == 200.0 {
			okLines++
		} else {
			errLines++
		}
		if v, ok := m["skipped_successes"].(float64); ok {
			skippedOK += v
		}
		if v, ok := m["skipped_errors"].(float64); ok {
			skippedErr += v
		}
	}
	if okLines == 0 || errLines <= okLines {
		t.Errorf("%d success lines, %d error lines: want some of each, errors preferred", okLines, errLines)
	}
	if total := okLines + errLines + int(skippedOK+skippedErr); total != 2401 {
		t.Errorf("%d lines written + %v + %v skipped = %d, want 2401 requests accounted for", okLines+errLines, skippedOK, skippedErr, total)
	}
	if !strings.Contains(logs[strings.LastIndex(logs[:len(logs)-1], "\n")+1:], "thirteen") {
		t.Errorf("the last mistake is not the last line")
	}
	t.Logf("%d requests in %v: %d bytes of log (bound %d), %d+%d lines, %v+%v skipped", 2401, elapsed, len(logs), bound, okLines, errLines, skippedOK, skippedErr)
}
