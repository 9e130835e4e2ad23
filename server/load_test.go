package server

import (
	"context"
	"fmt"
	"io"
	"net/http"
	"os"
	"path/filepath"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"testing"
	"time"
)

// loadEnv turns on the long load test: FLUECELL_LOAD=1 runs 30 s at 64 connections against the
// fluecell binary (a duration such as 60s changes the length).
const loadEnv = "FLUECELL_LOAD"

// loadKind is one kind of request of the load mix, with the status it must get.
type loadKind struct {
	name   string
	status int
	req    func(base string, worker, i int) (*http.Request, error)
}

func loadMix() []loadKind {
	rows := rowsBody(20)
	var csvBody strings.Builder
	csvBody.WriteString("fuel,q,unit\n")
	for i := 0; i < 20; i++ {
		csvBody.WriteString("diesel," + strconv.Itoa(i) + ",L\n")
	}
	get := func(path string) func(string, int, int) (*http.Request, error) {
		return func(base string, _, _ int) (*http.Request, error) {
			return http.NewRequest(http.MethodGet, base+path, nil)
		}
	}
	post := func(path, ctype, body string) func(string, int, int) (*http.Request, error) {
		return func(base string, _, _ int) (*http.Request, error) {
			r, err := http.NewRequest(http.MethodPost, base+path, strings.NewReader(body))
			if err == nil {
				r.Header.Set("Content-Type", ctype)
			}
			return r, err
		}
	}
	return []loadKind{
		{"fn cached", 200, get("/v1/fn/fuel_co2?fuel=natural_gas&amount=1000&unit=GJ")},
		{"fn miss", 200, func(base string, w, i int) (*http.Request, error) {
			return http.NewRequest(http.MethodGet, base+"/v1/fn/fuel_co2e?fuel=diesel&unit=L&amount="+strconv.Itoa(w*10_000_000+i), nil)
		}},
		{"fn json", 200, get("/v1/fn/embodied?tech=pv_utility&capacity=100&unit=MW&format=json")},
		{"fn 400", 400, get("/v1/fn/fuel_co2?fuel=natural_gas&amount=1000&unit=ton")},
		{"fn inline", 200, get("/v1/fn/fuel_co2?fuel=kryptonite&amount=1&unit=GJ&errors=inline")},
		{"fn 404", 404, get("/v1/fn/fuel_c02?fuel=natural_gas")},
		{"eval rows", 200, post("/v1/eval", "application/json", rows)},
		{"eval csv", 200, post("/v1/eval?expr=fuel_co2(fuel,q,unit)&as=t", "text/csv", csvBody.String())},
		{"eval 400", 400, post("/v1/eval", "application/json", `{"expr": "fuel_co2(`)},
		{"functions", 200, get("/v1/functions")},
	}
}

// loadResult sums up one load run.
type loadResult struct {
	requests, fivexx, unexpected int64
	elapsed                      time.Duration
	p50, p99, max                time.Duration
	firstErr                     string
}

// runLoad sends the mix from conns workers until ctx ends or maxRequests were sent.
func runLoad(ctx context.Context, base string, conns int, maxRequests int64) loadResult {
	mix := loadMix()
	tr := &http.Transport{MaxIdleConns: conns, MaxIdleConnsPerHost: conns, MaxConnsPerHost: conns, IdleConnTimeout: time.Minute}
	defer tr.CloseIdleConnections()
	client := &http.Client{Transport: tr, Timeout: 30 * time.Second}
	var res loadResult
	var sent atomic.Int64
	var mu sync.Mutex
	var lat []time.Duration
	start := time.Now()
	var wg sync.WaitGroup
	for w := 0; w < conns; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			mine := make([]time.Duration, 0, 4096)
			for i := 0; ctx.Err() == nil && sent.Add(1) <= maxRequests; i++ {
				k := mix[(w+i)%len(mix)]
				req, err := k.req(base, w, i)
				if err != nil {
					panic(err)
				}
				t0 := time.Now()
				resp, err := client.Do(req.WithContext(ctx))
				if err != nil {
					if ctx.Err() != nil {
						break
					}
					atomic.AddInt64(&res.unexpected, 1)
					mu.Lock()
					if res.firstErr == "" {
						res.firstErr = k.name + ": " + err.Error()
					}
					mu.Unlock()
					continue
				}
				_, _ = io.Copy(io.Discard, resp.Body)
				resp.Body.Close()
				mine = append(mine, time.Since(t0))
				atomic.AddInt64(&res.requests, 1)
				if resp.StatusCode >= 500 {
					atomic.AddInt64(&res.fivexx, 1)
				}
				if resp.StatusCode != k.status {
					atomic.AddInt64(&res.unexpected, 1)
					mu.Lock()
					if res.firstErr == "" {
						res.firstErr = fmt.Sprintf("%s: status %d, want %d", k.name, resp.StatusCode, k.status)
					}
					mu.Unlock()
				}
			}
			mu.Lock()
			lat = append(lat, mine...)
			mu.Unlock()
		}()
	}
	wg.Wait()
	res.elapsed = time.Since(start)
	slices.Sort(lat)
	if n := len(lat); n > 0 {
		res.p50, res.p99, res.max = lat[n/2], lat[n*99/100], lat[n-1]
	}
	return res
}

// memSampler records a memory figure once per interval until stopped.
type memSampler struct {
	samples []float64 // MiB
	stop    chan struct{}
	done    chan struct{}
}

func sampleMemory(every time.Duration, read func() float64) *memSampler {
	m := &memSampler{stop: make(chan struct{}), done: make(chan struct{})}
	go func() {
		defer close(m.done)
		tk := time.NewTicker(every)
		defer tk.Stop()
		for {
			select {
			case <-m.stop:
				return
			case <-tk.C:
				m.samples = append(m.samples, read())
			}
		}
	}()
	return m
}

func (m *memSampler) finish() []float64 { close(m.stop); <-m.done; return m.samples }

// checkBounded fails t when memory grew through the run: the last third of the samples may
// average at most 1.5x the first third plus slack, and no sample may pass limit MiB.
func checkBounded(t *testing.T, what string, samples []float64, slack, limit float64) {
	t.Helper()
	if len(samples) < 3 {
		t.Logf("%s: only %d samples", what, len(samples))
		return
	}
	third := len(samples) / 3
	avg := func(xs []float64) (s float64) {
		for _, x := range xs {
			s += x
		}
		return s / float64(len(xs))
	}
	first, last := avg(samples[:third]), avg(samples[len(samples)-third:])
	peak := slices.Max(samples)
	t.Logf("%s: first third %.1f MiB, last third %.1f MiB, peak %.1f MiB (%d samples)", what, first, last, peak, len(samples))
	if last > 1.5*first+slack {
		t.Errorf("%s grew from %.1f to %.1f MiB during the run", what, first, last)
	}
	if peak > limit {
		t.Errorf("%s peaked at %.1f MiB, over %.0f MiB", what, peak, limit)
	}
}

func reportLoad(t *testing.T, conns int, r loadResult) {
	t.Helper()
	t.Logf("%d connections, %s: %d requests, %.0f req/s, p50 %s, p99 %s, max %s, 5xx %d, unexpected %d",
		conns, r.elapsed.Round(time.Millisecond), r.requests, float64(r.requests)/r.elapsed.Seconds(),
		r.p50.Round(time.Microsecond), r.p99.Round(time.Microsecond), r.max.Round(time.Microsecond), r.fivexx, r.unexpected)
	if r.fivexx > 0 {
		t.Errorf("%d answers were 5xx", r.fivexx)
	}
	if r.unexpected > 0 {
		t.Errorf("%d answers had another status than expected; first: %s", r.unexpected, r.firstErr)
	}
	if r.requests == 0 {
		t.Error("no request completed")
	}
}

// TestLoadShort is the always-on load test: 2 s at 16 connections over loopback against an
// in-process server, the mix of sheet and notebook calls, zero 5xx, heap bounded.
func TestLoadShort(t *testing.T) {
	ts := startServer(t, Config{CacheEntries: 1024})
	heap := func() float64 {
		var ms runtime.MemStats
		runtime.ReadMemStats(&ms)
		return float64(ms.HeapInuse) / (1 << 20)
	}
	mem := sampleMemory(100*time.Millisecond, heap)
	ctx, cancel := context.WithTimeout(context.Background(), 2*time.Second)
	defer cancel()
	r := runLoad(ctx, ts.URL, 16, 2_000_000)
	samples := mem.finish()
	reportLoad(t, 16, r)
	checkBounded(t, "heap in use (client and server)", samples, 64, 512)
	if n := ts.srv.answers.len(); n > 1024 {
		t.Errorf("cache holds %d answers, limit 1024", n)
	}
}

// TestLoadLong runs the fluecell binary and loads it for 30 s at 64 connections (FLUECELL_LOAD=1),
// sampling its resident memory every second from /proc.
func TestLoadLong(t *testing.T) {
	env := os.Getenv(loadEnv)
	if env == "" {
		t.Skipf("set %s=1 for 30 s at 64 connections against the binary", loadEnv)
	}
	dur := 30 * time.Second
	if d, err := time.ParseDuration(env); err == nil {
		dur = d
	}
	dir := t.TempDir()
	bin := buildBinary(t, dir, "github.com/fluecell/fluecell/cmd/fluecell")
	port := freePort(t)
	cmd := startProcess(t, dir, "fluecell", bin, "serve", "--addr", "127.0.0.1:"+port)
	base := "http://127.0.0.1:" + port
	waitReady(t, base+"/healthz")
	status := filepath.Join("/proc", strconv.Itoa(cmd.Process.Pid), "status")
	rss := func() float64 {
		b, err := os.ReadFile(status)
		if err != nil {
			return 0
		}
		for _, line := range strings.Split(string(b), "\n") {
			if v, ok := strings.CutPrefix(line, "VmRSS:"); ok {
				kb, _ := strconv.ParseFloat(strings.TrimSpace(strings.TrimSuffix(strings.TrimSpace(v), "kB")), 64)
				return kb / 1024
			}
		}
		return 0
	}
	before := rss()
	mem := sampleMemory(time.Second, rss)
	ctx, cancel := context.WithTimeout(context.Background(), dur)
	defer cancel()
	r := runLoad(ctx, base, 64, 100_000_000)
	samples := mem.finish()
	t.Logf("fluecell RSS before the load: %.1f MiB", before)
	reportLoad(t, 64, r)
	checkBounded(t, "fluecell RSS", samples, 32, 512)
}
