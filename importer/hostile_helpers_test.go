package importer

import (
	"archive/zip"
	"bytes"
	"context"
	"errors"
	"io"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
	"time"

	"github.com/fluecell/fluecell/funcs"
)

// bookParts are the parts of a workbook package by name, to be changed and
// zipped again by a hostile-input test.
type bookParts map[string][]byte

// partsOf reads every part of the workbook at path.
func partsOf(t testing.TB, path string) bookParts {
	t.Helper()
	zr, err := zip.OpenReader(path)
	must(t, err)
	defer zr.Close()
	out := bookParts{}
	for _, f := range zr.File {
		rc, err := f.Open()
		must(t, err)
		b, err := io.ReadAll(rc)
		rc.Close()
		must(t, err)
		out[f.Name] = b
	}
	return out
}

// logParts are the parts of a valid three-row fuel log written by excelize.
func logParts(t testing.TB) bookParts {
	t.Helper()
	return partsOf(t, smallLog(t, filepath.Join(t.TempDir(), "seed.xlsx")))
}

// clone copies the parts, so that a test can change one without the others.
func (p bookParts) clone() bookParts {
	out := bookParts{}
	for k, v := range p {
		out[k] = append([]byte(nil), v...)
	}
	return out
}

// replace returns a copy with part name's text old replaced by new (every
// occurrence); it fails the test when old is not there.
func (p bookParts) replace(t testing.TB, name, old, new string) bookParts {
	t.Helper()
	if !bytes.Contains(p[name], []byte(old)) {
		t.Fatalf("part %s holds no %q:\n%s", name, old, p[name])
	}
	out := p.clone()
	out[name] = bytes.ReplaceAll(out[name], []byte(old), []byte(new))
	return out
}

// with returns a copy with part name set to data (nil removes it).
func (p bookParts) with(name string, data []byte) bookParts {
	out := p.clone()
	if data == nil {
		delete(out, name)
	} else {
		out[name] = data
	}
	return out
}

// zipBytes zips the parts, [Content_Types].xml first, the others by name.
func (p bookParts) zipBytes(t testing.TB) []byte {
	t.Helper()
	names := make([]string, 0, len(p))
	for k := range p {
		names = append(names, k)
	}
	sort.Slice(names, func(i, j int) bool {
		ci, cj := names[i] == "[Content_Types].xml", names[j] == "[Content_Types].xml"
		if ci != cj {
			return ci
		}
		return names[i] < names[j]
	})
	var buf bytes.Buffer
	zw := zip.NewWriter(&buf)
	for _, n := range names {
		w, err := zw.Create(n)
		must(t, err)
		_, err = w.Write(p[n])
		must(t, err)
	}
	must(t, zw.Close())
	return buf.Bytes()
}

// write zips the parts to dir/name and returns the path.
func (p bookParts) write(t testing.TB, dir, name string) string {
	t.Helper()
	path := filepath.Join(dir, name)
	must(t, os.WriteFile(path, p.zipBytes(t), 0o644))
	return path
}

// annotateHostile runs Scan, Annotate and Inspect on the file at path; each
// must return nil or an *Error that is not internal, with no stack in its
// message, within the timeout. It returns Annotate's error.
func annotateHostile(t testing.TB, e *funcs.Engine, path string, opt Options) error {
	t.Helper()
	ctx, cancel := context.WithTimeout(context.Background(), 60*time.Second)
	defer cancel()
	check := func(what string, err error) {
		t.Helper()
		if err == nil {
			return
		}
		var ie *Error
		if !errors.As(err, &ie) {
			t.Fatalf("%s: error of type %T: %v", what, err, err)
		}
		if ie.Code == ErrInternal || ie.Code == ErrIO {
			t.Fatalf("%s: [%s] %v: bad input must give an input error", what, ie.Code, err)
		}
		if strings.Contains(ie.Msg, "goroutine ") || strings.Contains(ie.Msg, ".go:") {
			t.Fatalf("%s: the message holds a stack trace: %v", what, err)
		}
	}
	_, err := Scan(ctx, e, path, opt)
	check("Scan", err)
	_, err = Inspect(ctx, e, path, opt)
	check("Inspect", err)
	out := strings.TrimSuffix(path, filepath.Ext(path)) + ".out" + filepath.Ext(path)
	_, err = Annotate(ctx, e, path, out, opt)
	check("Annotate", err)
	if ctx.Err() != nil {
		t.Fatalf("did not finish within the timeout")
	}
	if err != nil {
		if _, serr := os.Stat(out); serr == nil {
			t.Errorf("an output was written despite: %v", err)
		}
	}
	return err
}
