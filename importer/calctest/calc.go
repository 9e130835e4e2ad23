package calctest

import (
	_ "embed"
	"errors"
	"fmt"
	"net"
	"os"
	"path/filepath"
	"strconv"
	"sync"
	"testing"
	"time"
)

//go:embed calc.py
var bridgeScript string

// DefaultTimeout bounds one Cells or Dump call unless Calc.Timeout says otherwise.
const DefaultTimeout = 60 * time.Second

// startTimeout bounds the UNO connect retries at start-up (soffice needs seconds, more on a
// loaded machine or a first start with a fresh profile).
const startTimeout = 60 * time.Second

// Calc is one running headless LibreOffice with a throwaway profile that allows external links
// (WEBSERVICE) and trusts one folder. Its methods are safe for concurrent use; calls are
// served one at a time.
type Calc struct {
	// Timeout bounds each Cells and Dump call (open, recalculate, read, close). Zero means
	// DefaultTimeout. Set it before the first call. When a call times out soffice is killed,
	// and that call and all later ones return errors.
	Timeout time.Duration

	profile string // profile dir, removed at cleanup
	port    int

	mu      sync.Mutex
	soffice *proc
	bridge  *proc
	toPy    *os.File      // bridge stdin
	lines   <-chan []byte // bridge protocol lines; closed at EOF
	nextID  int
	broken  error // set once the instance cannot serve calls any more
	closed  bool
}

// errPortTaken says another soffice answered on the port ours should have used.
var errPortTaken = errors.New("port taken by another soffice")

// Start starts soffice with its own profile in a temporary dir on a free port, plus the Python
// bridge, and registers a cleanup that shuts both down (killing them if they do not quit) and
// removes the profile. trustedDir is the folder holding the workbooks (Calc's SecureURL).
//
// If soffice or /usr/bin/python3 with uno is missing, Start skips t with a message naming what
// is missing and the apt packages to install; with FLUECELL_REQUIRE_CALC=1 it fails t instead.
// Any other start-up problem fails t.
func Start(t testing.TB, trustedDir string) *Calc {
	t.Helper()
	soffice := lookSoffice(t)
	requirePython(t, "uno", "python3-uno")
	trusted, err := filepath.Abs(trustedDir)
	if err == nil {
		var fi os.FileInfo
		if fi, err = os.Stat(trusted); err == nil && !fi.IsDir() {
			err = fmt.Errorf("%s is not a directory", trusted)
		}
	}
	if err != nil {
		t.Fatalf("calctest: Start: trustedDir: %v", err)
	}
	// A port found free can be taken before soffice binds it; soffice then runs without a
	// listener, and the bridge notices a foreign profile on the port. Try again elsewhere.
	for attempt := 1; ; attempt++ {
		port, err := freePort()
		if err != nil {
			t.Fatalf("calctest: Start: %v", err)
		}
		c, err := launch(soffice, trusted, port)
		if err == nil {
			t.Cleanup(c.close)
			return c
		}
		if !errors.Is(err, errPortTaken) || attempt == 3 {
			t.Fatalf("calctest: Start: %v", err)
		}
	}
}

// launch starts one soffice listening on port and its bridge, and waits until the bridge is
// connected. On error nothing is left running.
func launch(soffice, trusted string, port int) (_ *Calc, err error) {
	profile, err := os.MkdirTemp("", "fluecell-calc-")
	if err != nil {
		return nil, fmt.Errorf("profile: %w", err)
	}
	c := &Calc{profile: profile, port: port}
	defer func() {
		if err != nil {
			c.broken = err // no graceful quit: just kill and clean up
			c.close()
		}
	}()
	if err := writeProfile(profile, trusted); err != nil {
		return nil, err
	}
	c.soffice, err = startProc("soffice", []string{soffice,
		"-env:UserInstallation=" + fileURL(profile),
		"--headless", "--invisible", "--norestore", "--nologo", "--nodefault", "--nolockcheck",
		"--accept=socket,host=127.0.0.1,port=" + strconv.Itoa(port) + ";urp;",
	}, childEnv(), nil, nil)
	if err != nil {
		return nil, err
	}

	inR, inW, err := os.Pipe()
	if err != nil {
		return nil, err
	}
	outR, outW, err := os.Pipe()
	if err != nil {
		inR.Close()
		inW.Close()
		return nil, err
	}
	c.toPy = inW
	c.bridge, err = startProc("python bridge", []string{pythonPath, "-c", bridgeScript, "bridge",
		"--port", strconv.Itoa(port),
		"--user", fileURL(filepath.Join(profile, "user")),
		"--soffice-pgid", strconv.Itoa(c.soffice.pid()),
		"--connect-timeout", strconv.Itoa(int(startTimeout / time.Second)),
	}, childEnv(), inR, outW)
	inR.Close()
	outW.Close()
	if err != nil {
		outR.Close()
		return nil, err
	}
	c.lines = readLines(outR)

	resp, err := c.receive(0, startTimeout+15*time.Second, fmt.Sprintf("start-up (UNO port %d)", port))
	if err != nil {
		return nil, err
	}
	if !resp.OK {
		if len(resp.Error) >= 10 && resp.Error[:10] == "port-taken" {
			return nil, fmt.Errorf("%w: %s", errPortTaken, resp.Error)
		}
		return nil, fmt.Errorf("%s; %s", resp.Error, c.soffice.describe())
	}
	return c, nil
}

// Cells opens the workbook at path (hidden, read-only, links updated), recalculates it and
// returns the displayed string of each requested cell keyed as given: "Sheet1!B2",
// "'My sheet'!B2", or "B2" for the first sheet. A missing file, a file Calc cannot open, an
// unknown sheet or a bad cell address is returned as an error; so are a timeout and a dead
// soffice.
func (c *Calc) Cells(path string, cells ...string) (map[string]string, error) {
	abs, err := filepath.Abs(path)
	if err != nil {
		return nil, fmt.Errorf("calctest: Cells: path %s: %w", path, err)
	}
	resp, err := c.call(request{Op: "cells", Path: abs, Cells: cells}, "Cells("+path+")")
	if err != nil {
		return nil, err
	}
	if resp.Cells == nil {
		resp.Cells = map[string]string{}
	}
	return resp.Cells, nil
}

// Dump opens the workbook at path like Cells and returns every sheet from A1 to the end of its
// used area: displayed text, formula, and numeric value of each cell. Errors as for Cells.
func (c *Calc) Dump(path string) ([]Sheet, error) {
	abs, err := filepath.Abs(path)
	if err != nil {
		return nil, fmt.Errorf("calctest: Dump: path %s: %w", path, err)
	}
	resp, err := c.call(request{Op: "dump", Path: abs}, "Dump("+path+")")
	if err != nil {
		return nil, err
	}
	return resp.Sheets, nil
}

// freePort asks the kernel for a free TCP port on 127.0.0.1.
func freePort() (int, error) {
	l, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		return 0, fmt.Errorf("free port: %w", err)
	}
	defer l.Close()
	return l.Addr().(*net.TCPAddr).Port, nil
}
