package server

import (
	"bytes"
	"net/http"
	"os"
	"os/exec"
	"strings"
	"testing"
	"time"
)

// TestServeCommand runs the fluecell binary's serve command: the token from FLUECELL_TOKEN,
// /healthz open, other routes behind the token, flag mistakes with exit code 2, and a
// graceful stop on SIGINT with exit code 0.
func TestServeCommand(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary")
	}
	dir := t.TempDir()
	bin := buildBinary(t, dir, "github.com/fluecell/fluecell/cmd/fluecell")

	for _, args := range [][]string{{"serve", "extra"}, {"serve", "--max-rows", "0"}, {"serve", "--log-format", "xml"}, {"serve", "--nope"}} {
		cmd := exec.Command(bin, args...)
		out, err := cmd.CombinedOutput()
		if ee, ok := err.(*exec.ExitError); !ok || ee.ExitCode() != 2 || !strings.Contains(string(out), "serve") {
			t.Errorf("%v: %v %s, want exit code 2 and a message", args, err, out)
		}
	}

	port := freePort(t)
	cmd := exec.Command(bin, "serve", "--addr", "127.0.0.1:"+port, "--log-format", "json")
	cmd.Env = append(os.Environ(), tokenEnvForTest+"=env-token")
	var logs bytes.Buffer
	cmd.Stderr = &logs
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	exited := make(chan struct{})
	var waitErr error
	go func() { waitErr = cmd.Wait(); close(exited) }()
	t.Cleanup(func() {
		select {
		case <-exited:
		default:
			_ = cmd.Process.Kill()
			<-exited
		}
	})
	base := "http://127.0.0.1:" + port
	waitReady(t, base+"/healthz")
	if r := get(t, base+"/v1/fn/gwp?gas=ch4"); r.Status != 401 {
		t.Errorf("without the token: %d", r.Status)
	}
	// IPCC AR5 WG1 Ch 8 Table 8.A.1: GWP-100 of CH4 = 28
	if r := do(t, http.MethodGet, base+"/v1/fn/gwp?gas=ch4", map[string]string{"Authorization": "Bearer env-token"}, ""); r.Status != 200 || r.Body != "28" {
		t.Errorf("with the token: %d %q, want 28 (IPCC AR5 WG1 Ch 8 Table 8.A.1)", r.Status, r.Body)
	}
	if err := cmd.Process.Signal(os.Interrupt); err != nil {
		t.Fatal(err)
	}
	select {
	case <-exited:
		if waitErr != nil {
			t.Errorf("after SIGINT: %v\n%s", waitErr, logs.String())
		}
	case <-time.After(20 * time.Second):
		t.Fatal("serve did not stop within 20 s of SIGINT")
	}
	if !strings.Contains(logs.String(), `"msg":"stopped"`) || strings.Contains(logs.String(), "env-token") {
		t.Errorf("log:\n%s", logs.String())
	}
}

// tokenEnvForTest is the variable cmd/fluecell reads for the token.
const tokenEnvForTest = "FLUECELL_TOKEN"
