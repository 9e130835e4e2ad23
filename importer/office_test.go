package importer

import (
	"os"
	"os/exec"
	"testing"
)

// requireOffice skips t when LibreOffice is not installed, naming the
// Debian package, or fails it when FLUECELL_REQUIRE_CALC=1 (as CI sets).
func requireOffice(t testing.TB) office {
	t.Helper()
	o, ok := findOffice()
	if !ok {
		missingTool(t, "soffice (LibreOffice) not found on PATH", officePackage)
	}
	return o
}

// requireOpenpyxl skips or fails t like requireOffice when Debian's
// /usr/bin/python3 cannot import openpyxl.
func requireOpenpyxl(t testing.TB) string {
	t.Helper()
	const python = "/usr/bin/python3"
	cmd := exec.Command(python, "-c", "import openpyxl")
	cmd.Env = noPythonEnv()
	if out, err := cmd.CombinedOutput(); err != nil {
		missingTool(t, python+" cannot import openpyxl ("+err.Error()+": "+string(out)+")", "python3-openpyxl")
	}
	return python
}

func missingTool(t testing.TB, what, pkg string) {
	t.Helper()
	msg := what + "; install it with: apt-get install -y --no-install-recommends " + pkg
	if os.Getenv("FLUECELL_REQUIRE_CALC") == "1" {
		t.Fatalf("%s (FLUECELL_REQUIRE_CALC=1, so this is a failure, not a skip)", msg)
	}
	t.Skip(msg)
}

// noPythonEnv is our environment without PYTHON* variables, which would
// hide Debian's modules from /usr/bin/python3.
func noPythonEnv() []string {
	var env []string
	for _, kv := range os.Environ() {
		if len(kv) >= 6 && kv[:6] == "PYTHON" {
			continue
		}
		env = append(env, kv)
	}
	return env
}
