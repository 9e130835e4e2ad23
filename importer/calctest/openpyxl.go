package calctest

import (
	"bytes"
	"context"
	"encoding/json"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// openpyxlTimeout bounds one Openpyxl read.
const openpyxlTimeout = 60 * time.Second

// Openpyxl reads the workbook at path with Debian's python3-openpyxl (/usr/bin/python3) and
// returns every sheet from A1 to its max row and column. Formula holds the formula text of
// formula cells as stored; Text and Value come from the values cached in the file (str() of
// the value, "" for none). It skips t like Start when openpyxl is missing (fails with
// FLUECELL_REQUIRE_CALC=1) and fails t when openpyxl cannot read the file.
func Openpyxl(t testing.TB, path string) []Sheet {
	t.Helper()
	requirePython(t, "openpyxl", "python3-openpyxl")
	abs, err := filepath.Abs(path)
	if err != nil {
		t.Fatalf("calctest: Openpyxl: path %s: %v", path, err)
	}
	ctx, cancel := context.WithTimeout(context.Background(), openpyxlTimeout)
	defer cancel()
	cmd := exec.CommandContext(ctx, pythonPath, "-c", bridgeScript, "openpyxl", abs)
	cmd.Env = childEnv()
	var stdout, stderr bytes.Buffer
	cmd.Stdout, cmd.Stderr = &stdout, &stderr
	runErr := cmd.Run()
	if ctx.Err() != nil {
		t.Fatalf("calctest: Openpyxl(%s): no answer within %v", path, openpyxlTimeout)
	}
	var resp response
	if err := json.Unmarshal(stdout.Bytes(), &resp); err != nil {
		t.Fatalf("calctest: Openpyxl(%s): %v (exit: %v): %s", path, err, runErr, strings.TrimSpace(stderr.String()))
	}
	if !resp.OK {
		t.Fatalf("calctest: Openpyxl(%s): openpyxl could not read it: %s", path, resp.Error)
	}
	return resp.Sheets
}
