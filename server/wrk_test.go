package server

import (
	"context"
	"net"
	"net/http"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"runtime"
	"strconv"
	"testing"
	"time"
)

// wrkEnv turns on TestWrkAgainstBareGin: FLUECELL_WRK=1 (or a duration such as 20s per run).
const wrkEnv = "FLUECELL_WRK"

// TestWrkAgainstBareGin measures GET /v1/fn/fuel_co2 of `fluecell serve` with wrk against the
// bare gin handler of internal/ginbaseline answering a constant, on this machine in this run,
// over loopback, alternating the two; fluecell must reach 0.6x of the baseline's requests per
// second. It also measures calls that all miss the cache (every amount different), for the
// record. Opt-in: FLUECELL_WRK=1 go test ./server -run Wrk -v
func TestWrkAgainstBareGin(t *testing.T) {
	env := os.Getenv(wrkEnv)
	if env == "" {
		t.Skipf("set %s=1 to measure with wrk (about a minute)", wrkEnv)
	}
	dur := 10 * time.Second
	if d, err := time.ParseDuration(env); err == nil {
		dur = d
	}
	wrk, err := exec.LookPath("wrk")
	if err != nil {
		t.Fatalf("wrk not found (apt-get install wrk): %v", err)
	}
	dir := t.TempDir()
	fluecell := buildBinary(t, dir, "github.com/fluecell/fluecell/cmd/fluecell")
	baseline := buildBinary(t, dir, "github.com/fluecell/fluecell/server/internal/ginbaseline")

	basePort, flPort := freePort(t), freePort(t)
	startProcess(t, dir, "baseline", baseline, "--addr", "127.0.0.1:"+basePort)
	startProcess(t, dir, "fluecell", fluecell, "serve", "--addr", "127.0.0.1:"+flPort)
	path := "/v1/fn/fuel_co2?fuel=natural_gas&amount=1000&unit=GJ"
	waitReady(t, "http://127.0.0.1:"+basePort+path)
	waitReady(t, "http://127.0.0.1:"+flPort+path)

	var base, fl []wrkResult
	for i := 0; i < 2; i++ {
		base = append(base, runWrk(t, wrk, dur, "http://127.0.0.1:"+basePort+path, ""))
		fl = append(fl, runWrk(t, wrk, dur, "http://127.0.0.1:"+flPort+path, ""))
	}
	script := filepath.Join(dir, "miss.lua")
	if err := os.WriteFile(script, []byte(`counter = 0
request = function()
  counter = counter + 1
  return wrk.format(nil, "/v1/fn/fuel_co2?fuel=natural_gas&unit=GJ&amount=" .. counter)
end
`), 0o644); err != nil {
		t.Fatal(err)
	}
	miss := runWrk(t, wrk, dur, "http://127.0.0.1:"+flPort, script)

	mean := func(rs []wrkResult) (rps float64) {
		for _, r := range rs {
			rps += r.rps
		}
		return rps / float64(len(rs))
	}
	ratio := mean(fl) / mean(base)
	for i := range base {
		t.Logf("run %d: bare gin %.0f req/s p99 %s | fluecell %.0f req/s p99 %s", i+1, base[i].rps, base[i].p99, fl[i].rps, fl[i].p99)
	}
	t.Logf("fluecell, every call a cache miss: %.0f req/s p99 %s", miss.rps, miss.p99)
	t.Logf("fluecell / bare gin = %.2f (target >= 0.6); wrk -t2 -c64 -d%s on %d CPUs shared by wrk and the server", ratio, dur, runtime.NumCPU())
	for _, r := range append(append(base, fl...), miss) {
		if r.non2xx > 0 || r.errors != "" {
			t.Errorf("wrk saw %d non-2xx answers, errors %q", r.non2xx, r.errors)
		}
	}
	if ratio < 0.6 {
		t.Errorf("fluecell reaches %.2f of the bare gin handler, below 0.6", ratio)
	}
}

type wrkResult struct {
	rps    float64
	p99    string
	non2xx int
	errors string
}

var (
	wrkRPS    = regexp.MustCompile(`Requests/sec:\s+([0-9.]+)`)
	wrkP99    = regexp.MustCompile(`\s99%\s+([0-9.]+[a-z]+)`)
	wrkNon2xx = regexp.MustCompile(`Non-2xx or 3xx responses:\s+([0-9]+)`)
	wrkErrors = regexp.MustCompile(`Socket errors:[^\n]*`)
)

func runWrk(t *testing.T, wrk string, dur time.Duration, url, script string) wrkResult {
	t.Helper()
	args := []string{"-t2", "-c64", "-d" + strconv.Itoa(int(dur.Seconds())) + "s", "--latency"}
	if script != "" {
		args = append(args, "-s", script)
	}
	out, err := exec.Command(wrk, append(args, url)...).CombinedOutput()
	if err != nil {
		t.Fatalf("wrk: %v\n%s", err, out)
	}
	s := string(out)
	var r wrkResult
	if m := wrkRPS.FindStringSubmatch(s); m != nil {
		r.rps, _ = strconv.ParseFloat(m[1], 64)
	} else {
		t.Fatalf("no Requests/sec in wrk output:\n%s", s)
	}
	if m := wrkP99.FindStringSubmatch(s); m != nil {
		r.p99 = m[1]
	}
	if m := wrkNon2xx.FindStringSubmatch(s); m != nil {
		r.non2xx, _ = strconv.Atoi(m[1])
	}
	r.errors = wrkErrors.FindString(s)
	return r
}

// buildBinary builds a main package into dir.
func buildBinary(t testing.TB, dir, pkg string) string {
	t.Helper()
	out := filepath.Join(dir, filepath.Base(pkg))
	cmd := exec.Command("go", "build", "-o", out, pkg)
	if b, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("go build %s: %v\n%s", pkg, err, b)
	}
	return out
}

func freePort(t testing.TB) string {
	t.Helper()
	l, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer l.Close()
	return strconv.Itoa(l.Addr().(*net.TCPAddr).Port)
}

// startProcess runs a program until the test ends, its stderr going to a file in dir (the
// request log of fluecell costs what it costs in production).
func startProcess(t testing.TB, dir, name, bin string, args ...string) *exec.Cmd {
	t.Helper()
	logf, err := os.Create(filepath.Join(dir, name+".log"))
	if err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(bin, args...)
	cmd.Stdout, cmd.Stderr = logf, logf
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() {
		_ = cmd.Process.Signal(os.Interrupt)
		done := make(chan struct{})
		go func() { _ = cmd.Wait(); close(done) }()
		select {
		case <-done:
		case <-time.After(20 * time.Second):
			_ = cmd.Process.Kill()
			<-done
		}
		logf.Close()
	})
	return cmd
}

func waitReady(t testing.TB, url string) {
	t.Helper()
	ctx, cancel := context.WithTimeout(context.Background(), 20*time.Second)
	defer cancel()
	for ctx.Err() == nil {
		req, _ := http.NewRequestWithContext(ctx, http.MethodGet, url, nil)
		if resp, err := http.DefaultClient.Do(req); err == nil {
			resp.Body.Close()
			if resp.StatusCode == 200 {
				return
			}
		}
		time.Sleep(50 * time.Millisecond)
	}
	t.Fatalf("%s did not answer 200 within 20 s", url)
}
