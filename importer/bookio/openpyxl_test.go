package bookio

import (
	"os"
	"os/exec"
	"strings"
	"testing"
)

// runOpenpyxl runs a Python script (argument: path) under Debian's
// /usr/bin/python3, which has python3-openpyxl, and returns what it
// prints. Without openpyxl the test is skipped, or fails with
// FLUECELL_REQUIRE_CALC=1 (as the importer's tests do).
func runOpenpyxl(t *testing.T, script, path string) string {
	t.Helper()
	const python = "/usr/bin/python3"
	var env []string
	for _, kv := range os.Environ() {
		if !strings.HasPrefix(kv, "PYTHON") { // a pyenv PYTHONPATH hides Debian's modules
			env = append(env, kv)
		}
	}
	check := exec.Command(python, "-c", "import openpyxl")
	check.Env = env
	if out, err := check.CombinedOutput(); err != nil {
		msg := python + " cannot import openpyxl (" + err.Error() + ": " + strings.TrimSpace(string(out)) +
			"); install it with: apt-get install -y --no-install-recommends python3-openpyxl"
		if os.Getenv("FLUECELL_REQUIRE_CALC") == "1" {
			t.Fatalf("%s (FLUECELL_REQUIRE_CALC=1, so this is a failure, not a skip)", msg)
		}
		t.Skip(msg)
	}
	cmd := exec.Command(python, "-c", script, path)
	cmd.Env = env
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("openpyxl: %v: %s", err, out)
	}
	return string(out)
}
