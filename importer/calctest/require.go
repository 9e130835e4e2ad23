package calctest

import (
	"context"
	"fmt"
	"os"
	"os/exec"
	"strings"
	"testing"
	"time"
)

// pythonPath is Debian's interpreter, which sees python3-uno and python3-openpyxl.
const pythonPath = "/usr/bin/python3"

// requireEnv names the environment variable that turns a missing reader into a test failure.
const requireEnv = "FLUECELL_REQUIRE_CALC"

const aptHint = "apt-get install -y --no-install-recommends libreoffice-calc-nogui python3-uno python3-openpyxl"

// missing skips t, or fails it when FLUECELL_REQUIRE_CALC=1, saying what is missing.
func missing(t testing.TB, what string) {
	t.Helper()
	msg := fmt.Sprintf("calctest: %s; install with: %s", what, aptHint)
	if os.Getenv(requireEnv) == "1" {
		t.Fatalf("%s (%s=1, so this is a failure, not a skip)", msg, requireEnv)
	}
	t.Skip(msg)
}

// lookSoffice returns the soffice executable or skips/fails t.
func lookSoffice(t testing.TB) string {
	t.Helper()
	path, err := exec.LookPath("soffice")
	if err != nil {
		missing(t, "soffice (LibreOffice) not found on PATH")
	}
	return path
}

// requirePython checks that /usr/bin/python3 can import module, or skips/fails t.
func requirePython(t testing.TB, module, pkg string) {
	t.Helper()
	if _, err := os.Stat(pythonPath); err != nil {
		missing(t, pythonPath+" not found")
	}
	ctx, cancel := context.WithTimeout(context.Background(), 30*time.Second)
	defer cancel()
	cmd := exec.CommandContext(ctx, pythonPath, "-c", "import "+module)
	cmd.Env = childEnv()
	if out, err := cmd.CombinedOutput(); err != nil {
		missing(t, fmt.Sprintf("%s cannot import %s (package %s): %v: %s",
			pythonPath, module, pkg, err, strings.TrimSpace(string(out))))
	}
}

// childEnv is the environment for child processes: ours without Python overrides (a pyenv
// PYTHONPATH or PYTHONHOME would hide Debian's modules from /usr/bin/python3).
func childEnv() []string {
	var env []string
	for _, kv := range os.Environ() {
		if strings.HasPrefix(kv, "PYTHON") {
			continue
		}
		env = append(env, kv)
	}
	return env
}
