package importer

import (
	"bytes"
	"context"
	"fmt"
	"io"
	"net/url"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"time"
)

// officePackage is the Debian package that provides a headless soffice.
const officePackage = "libreoffice-calc-nogui"

// officeTimeout bounds one LibreOffice conversion, whatever the caller's
// context allows: a real .xls converts in 1 to 6 seconds (measured on
// 2 cores, including the start of soffice and a new profile), so a
// conversion still running after this is hung.
const officeTimeout = 3 * time.Minute

// office runs LibreOffice headless. exe is the soffice executable.
type office struct {
	exe string
}

// findOffice looks for soffice (or libreoffice) on PATH; ok is false when
// LibreOffice is not installed.
func findOffice() (office, bool) {
	for _, name := range []string{"soffice", "libreoffice"} {
		if p, err := exec.LookPath(name); err == nil {
			return office{exe: p}, true
		}
	}
	return office{}, false
}

// converted is a workbook converted to .xlsx by LibreOffice in a private
// temporary folder. Path is the .xlsx file; Took is the wall time of the
// conversion (profile, start of soffice, load, save). remove deletes the
// folder.
type converted struct {
	Path string
	Took time.Duration
	dir  string
}

func (c *converted) remove() {
	if c != nil && c.dir != "" {
		os.RemoveAll(c.dir)
	}
}

// toXLSX converts the workbook at src into .xlsx with LibreOffice headless
// and returns it; the caller must call remove. src itself is only read: it
// is copied into a new temporary folder, which also holds a throwaway
// LibreOffice profile (so that conversions running at the same time never
// share one, which would hand the work to whichever soffice started first),
// soffice's temporary files and the output. The profile disables macros and
// the update of external links: the workbook is untrusted input. Formulas
// without a stored result are calculated on load, so the output holds a
// value for each of them.
//
// The conversion ends when ctx ends or after officeTimeout; then soffice and
// its children are killed. Errors say what failed and include the end of
// soffice's own output.
func (o office) toXLSX(ctx context.Context, src string) (_ *converted, err error) {
	start := time.Now()
	dir, err := os.MkdirTemp("", "fluecell-office-")
	if err != nil {
		return nil, fmt.Errorf("LibreOffice conversion: %w", err)
	}
	defer func() {
		if err != nil {
			os.RemoveAll(dir)
		}
	}()
	inDir, outDir, profile, tmp := filepath.Join(dir, "in"), filepath.Join(dir, "out"), filepath.Join(dir, "profile"), filepath.Join(dir, "tmp")
	for _, d := range []string{inDir, outDir, tmp} {
		if err := os.Mkdir(d, 0o700); err != nil {
			return nil, fmt.Errorf("LibreOffice conversion: %w", err)
		}
	}
	if err := writeOfficeProfile(profile); err != nil {
		return nil, err
	}
	base := filepath.Base(src)
	ext := filepath.Ext(base)
	stem := strings.TrimSuffix(base, ext)
	if stem == "" || strings.HasPrefix(stem, "-") || !plainName(stem) {
		stem = "workbook"
	}
	in := filepath.Join(inDir, stem+ext)
	if err := copyPlain(src, in); err != nil {
		return nil, fmt.Errorf("LibreOffice conversion: copying the input: %w", err)
	}

	runCtx, cancel := context.WithTimeout(ctx, officeTimeout)
	defer cancel()
	cmd := exec.CommandContext(runCtx, o.exe, "--headless", "--norestore", "--nolockcheck", "--nologo", "--nodefault",
		"-env:UserInstallation="+fileURL(profile), "--convert-to", "xlsx", "--outdir", outDir, in)
	cmd.Dir = dir
	cmd.Env = officeEnv(dir, tmp)
	var out tail
	cmd.Stdout, cmd.Stderr = &out, &out
	cmd.WaitDelay = 5 * time.Second
	ownProcessGroup(cmd)
	cmd.Cancel = func() error { killProcessGroup(cmd); return nil }
	runErr := cmd.Run()
	// soffice.bin may outlive the wrapper that started it: end the group.
	killProcessGroup(cmd)
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	if runCtx.Err() != nil {
		return nil, fmt.Errorf("LibreOffice did not finish converting %s within %v (killed); output: %s", base, officeTimeout, out.String())
	}
	outPath := filepath.Join(outDir, stem+".xlsx")
	if st, err := os.Stat(outPath); err != nil || st.Size() == 0 {
		why := "it wrote no output"
		if runErr != nil {
			why = runErr.Error()
		}
		return nil, fmt.Errorf("LibreOffice could not convert %s (%s); its output: %s", base, why, out.String())
	}
	return &converted{Path: outPath, Took: time.Since(start), dir: dir}, nil
}

// writeOfficeProfile writes the settings of a throwaway profile: no lock
// files, macros never run, external links never updated.
func writeOfficeProfile(dir string) error {
	const items = `<?xml version="1.0" encoding="UTF-8"?>
<oor:items xmlns:oor="http://openoffice.org/2001/registry" xmlns:xs="http://www.w3.org/2001/XMLSchema" xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance">
<item oor:path="/org.openoffice.Office.Common/Misc"><prop oor:name="UseLocking" oor:op="fuse"><value>false</value></prop></item>
<item oor:path="/org.openoffice.Office.Common/Security/Scripting"><prop oor:name="MacroSecurityLevel" oor:op="fuse"><value>3</value></prop></item>
<item oor:path="/org.openoffice.Office.Common/Security/Scripting"><prop oor:name="DisableMacrosExecution" oor:op="fuse"><value>true</value></prop></item>
<item oor:path="/org.openoffice.Office.Calc/Content/Update"><prop oor:name="Link" oor:op="fuse"><value>1</value></prop></item>
</oor:items>
`
	user := filepath.Join(dir, "user")
	if err := os.MkdirAll(user, 0o700); err != nil {
		return fmt.Errorf("LibreOffice profile: %w", err)
	}
	if err := os.WriteFile(filepath.Join(user, "registrymodifications.xcu"), []byte(items), 0o600); err != nil {
		return fmt.Errorf("LibreOffice profile: %w", err)
	}
	return nil
}

// officeEnv is the environment of soffice: ours, with HOME and TMPDIR in
// the conversion's folder so that nothing is left elsewhere, and without
// Python variables that would disturb LibreOffice's embedded Python.
func officeEnv(home, tmp string) []string {
	var env []string
	for _, kv := range os.Environ() {
		k, _, _ := strings.Cut(kv, "=")
		switch {
		case k == "HOME", k == "TMPDIR", strings.HasPrefix(k, "PYTHON"):
			continue
		}
		env = append(env, kv)
	}
	return append(env, "HOME="+home, "TMPDIR="+tmp)
}

// fileURL turns an absolute path into a file:/// URL.
func fileURL(abs string) string {
	return (&url.URL{Scheme: "file", Path: filepath.ToSlash(abs)}).String()
}

// plainName reports a file stem safe to pass to soffice: no control
// characters.
func plainName(s string) bool {
	for _, r := range s {
		if r < 32 || r == 0x7f || r == 0xfffd {
			return false
		}
	}
	return true
}

// copyPlain copies the regular file src to dst (created, private).
func copyPlain(src, dst string) error {
	in, err := os.Open(src)
	if err != nil {
		return err
	}
	defer in.Close()
	out, err := os.OpenFile(dst, os.O_CREATE|os.O_EXCL|os.O_WRONLY, 0o600)
	if err != nil {
		return err
	}
	if _, err := io.Copy(out, in); err != nil {
		out.Close()
		return err
	}
	return out.Close()
}

// tail keeps the last 2 kB written to it, for error messages.
type tail struct{ buf []byte }

func (t *tail) Write(p []byte) (int, error) {
	t.buf = append(t.buf, p...)
	if len(t.buf) > 2048 {
		t.buf = append(t.buf[:0], t.buf[len(t.buf)-2048:]...)
	}
	return len(p), nil
}

// String is the output without LibreOffice's harmless Java warning, on one
// line.
func (t *tail) String() string {
	var lines []string
	for _, l := range bytes.Split(t.buf, []byte("\n")) {
		s := strings.TrimSpace(string(l))
		if s == "" || strings.Contains(s, "javaldx") {
			continue
		}
		lines = append(lines, s)
	}
	if len(lines) == 0 {
		return "(none)"
	}
	return strings.Join(lines, " | ")
}
