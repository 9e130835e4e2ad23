package server

import (
	"archive/zip"
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"io"
	"io/fs"
	"net/http"
	"strings"
	"testing"
	"time"

	"github.com/fluecell/fluecell/importer"
)

// rezip rewrites a workbook's parts through edit (which may drop a part).
func rezip(t *testing.T, src []byte, edit func(name string, data []byte) ([]byte, bool)) []byte {
	t.Helper()
	zr, err := zip.NewReader(bytes.NewReader(src), int64(len(src)))
	if err != nil {
		t.Fatal(err)
	}
	var out bytes.Buffer
	zw := zip.NewWriter(&out)
	for _, f := range zr.File {
		rc, err := f.Open()
		if err != nil {
			t.Fatal(err)
		}
		data, err := io.ReadAll(rc)
		rc.Close()
		if err != nil {
			t.Fatal(err)
		}
		data, keep := edit(f.Name, data)
		if !keep {
			continue
		}
		w, err := zw.Create(f.Name)
		if err != nil {
			t.Fatal(err)
		}
		w.Write(data)
	}
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	return out.Bytes()
}

// inPart edits the parts whose name starts with prefix.
func inPart(prefix string, edit func([]byte) []byte) func(string, []byte) ([]byte, bool) {
	return func(name string, data []byte) ([]byte, bool) {
		if strings.HasPrefix(name, prefix) {
			return edit(data), true
		}
		return data, true
	}
}

// TestMalformedWorkbooksAreNot5xx: damaged workbooks are the client's input: the answer is a
// 4xx with a JSON message (or the annotation itself, where the damage does not matter),
// never a 5xx, never a stack or a server path; the log holds one line per request.
func TestMalformedWorkbooksAreNot5xx(t *testing.T) {
	e := newEngine(t)
	tmp := t.TempDir()
	ts := startServer(t, Config{Annotate: AnnotateHandler(e, AnnotateConfig{TempDir: tmp})})
	xlsx := demoWorkbook(t)
	cases := []struct {
		name string
		edit func(string, []byte) ([]byte, bool)
	}{
		{"no styles.xml", func(n string, d []byte) ([]byte, bool) { return d, n != "xl/styles.xml" }},
		{"empty styles.xml", inPart("xl/styles.xml", func([]byte) []byte { return nil })},
		{"out-of-range style ids", inPart("xl/worksheets/", func(d []byte) []byte { return bytes.ReplaceAll(d, []byte(` s="`), []byte(` s="9999`)) })},
		{"&#0; in a shared string", inPart("xl/sharedStrings.xml", func(d []byte) []byte { return bytes.Replace(d, []byte("<t>"), []byte("<t>&#0;"), 1) })},
		{"invalid UTF-8 in a shared string", inPart("xl/sharedStrings.xml", func(d []byte) []byte { return bytes.Replace(d, []byte("<t>"), []byte("<t>\xff\xfe"), 1) })},
		{"invalid sheet name", inPart("xl/workbook.xml", func(d []byte) []byte { return bytes.Replace(d, []byte(`name="`), []byte(`name="a/b:c[`), 1) })},
		{"bad column width", inPart("xl/worksheets/", func(d []byte) []byte {
			return bytes.Replace(d, []byte("<sheetData"), []byte(`<cols><col min="1" max="1" width="-1e400"/></cols><sheetData`), 1)
		})},
	}
	for _, c := range cases {
		r := do(t, http.MethodPost, ts.URL+"/v1/annotate?report=json", map[string]string{"Content-Type": typeXLSX}, string(rezip(t, xlsx, c.edit)))
		if r.Status >= 500 {
			t.Errorf("%s: %d %s", c.name, r.Status, r.Body)
			continue
		}
		if strings.Contains(r.Body, "goroutine") || strings.Contains(r.Body, tmp) || strings.Contains(r.Body, "fluecell-spool") {
			t.Errorf("%s: the answer shows a stack or a server path: %.300s", c.name, r.Body)
		}
		if r.Status != 200 {
			var eb errorBody
			if err := json.Unmarshal([]byte(r.Body), &eb); err != nil || eb.Error == "" || eb.Code == "" {
				t.Errorf("%s: %d %q is not a JSON error", c.name, r.Status, r.Body)
			}
		}
	}
	// The access log is written when the handler returns, which can be after the client has
	// read a response larger than the connection's write buffer: wait for it a little.
	n := 0
	for wait := 0; wait < 100; wait++ {
		if n = strings.Count(ts.logs.String(), `"path":"/v1/annotate"`); n >= len(cases) {
			break
		}
		time.Sleep(20 * time.Millisecond)
	}
	if n != len(cases) {
		t.Errorf("%d log lines for %d requests:\n%s", n, len(cases), ts.logs.String())
	}
}

// TestImporterErrorStatus: a failure inside the importer or a library on a client's workbook
// is the client's (400, the details logged), a failing disk is the server's (500).
func TestImporterErrorStatus(t *testing.T) {
	disk := &fs.PathError{Op: "write", Path: "/tmp/x", Err: errors.New("no space left on device")}
	for _, c := range []struct {
		err    error
		status int
		logged bool
	}{
		{&importer.Error{Code: importer.ErrInternal, Msg: "internal error while reading the file: runtime error\ngoroutine 7 [running]:"}, 400, true},
		{&importer.Error{Code: importer.ErrIO, Msg: "cannot write sheet Fuel log: invalid style ID 99992", Err: errors.New("invalid style ID 99992")}, 400, false},
		{&importer.Error{Code: importer.ErrIO, Msg: "cannot write the output: " + disk.Error(), Err: disk}, 500, true},
		{&importer.Error{Code: importer.ErrCorrupt, Msg: "the zip is truncated"}, 400, false},
		{&importer.Error{Code: importer.ErrTooLarge, Msg: "a part is too large"}, 413, false},
		{errors.New("something else"), 500, true},
	} {
		e := importerError(c.err, context.Background(), "/tmp/spool/req-1")
		if e.Status != c.status || (e.cause != nil) != c.logged || strings.Contains(e.Msg, "goroutine") || strings.Contains(e.Msg, "\n") {
			t.Errorf("%v: %d %q (cause %v), want %d", c.err, e.Status, e.Msg, e.cause, c.status)
		}
	}
}
