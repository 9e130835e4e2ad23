package calctest

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// recorder is a testing.TB that records Skip and Fatal instead of acting on the real test.
type recorder struct {
	testing.TB
	skipped, failed string
}

func (r *recorder) Helper() {}
func (r *recorder) Skip(args ...any) {
	r.skipped = fmt.Sprint(args...)
	panic(r)
}
func (r *recorder) Fatalf(format string, args ...any) {
	r.failed = fmt.Sprintf(format, args...)
	panic(r)
}

// run calls f with r and stops at its first Skip or Fatal.
func (r *recorder) run(f func(testing.TB)) {
	defer func() {
		if p := recover(); p != nil && p != r {
			panic(p)
		}
	}()
	f(r)
}

func TestMissingSoffice(t *testing.T) {
	t.Setenv("PATH", t.TempDir())

	t.Setenv(requireEnv, "")
	r := &recorder{TB: t}
	r.run(func(tb testing.TB) { lookSoffice(tb) })
	if r.failed != "" || !strings.Contains(r.skipped, "soffice (LibreOffice) not found on PATH") ||
		!strings.Contains(r.skipped, "libreoffice-calc-nogui python3-uno python3-openpyxl") {
		t.Errorf("without %s: skipped %q, failed %q; want a skip naming soffice and the apt packages", requireEnv, r.skipped, r.failed)
	}

	t.Setenv(requireEnv, "1")
	r = &recorder{TB: t}
	r.run(func(tb testing.TB) { lookSoffice(tb) })
	if r.skipped != "" || !strings.Contains(r.failed, "soffice (LibreOffice) not found on PATH") ||
		!strings.Contains(r.failed, requireEnv+"=1") {
		t.Errorf("with %s=1: skipped %q, failed %q; want a failure", requireEnv, r.skipped, r.failed)
	}
}

func TestMissingPythonModule(t *testing.T) {
	t.Setenv(requireEnv, "")
	r := &recorder{TB: t}
	r.run(func(tb testing.TB) { requirePython(tb, "fluecell_no_such_module", "python3-nothing") })
	if !strings.Contains(r.skipped, "/usr/bin/python3 cannot import fluecell_no_such_module (package python3-nothing)") {
		t.Errorf("skipped %q, failed %q; want a skip naming the module and package", r.skipped, r.failed)
	}
}

// TestSofficeExitsAtStart uses a soffice that fails at once: Start must fail quickly and say
// why, instead of waiting out the connect timeout.
func TestSofficeExitsAtStart(t *testing.T) {
	if _, err := os.Stat("/bin/sh"); err != nil {
		t.Skip("no /bin/sh for the fake soffice")
	}
	requirePython(t, "uno", "python3-uno")
	bin := t.TempDir()
	script := "#!/bin/sh\necho 'fake soffice: broken install' >&2\nexit 7\n"
	if err := os.WriteFile(filepath.Join(bin, "soffice"), []byte(script), 0o755); err != nil {
		t.Fatal(err)
	}
	t.Setenv("PATH", bin+string(os.PathListSeparator)+os.Getenv("PATH"))
	r := &recorder{TB: t}
	t0 := time.Now()
	r.run(func(tb testing.TB) { Start(tb, t.TempDir()) })
	if took := time.Since(t0); took > 15*time.Second {
		t.Errorf("Start took %v to notice", took)
	}
	for _, want := range []string{"soffice exited", "exit status 7", "fake soffice: broken install"} {
		if !strings.Contains(r.failed, want) {
			t.Errorf("Start failure %q does not contain %q", r.failed, want)
		}
	}
}
