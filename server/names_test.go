package server

import (
	"encoding/json"
	"mime"
	"net/http"
	"net/url"
	"strings"
	"testing"
	"unicode/utf8"
)

// TestEchoedNamesEscaped: a file name or a parameter with control characters is never echoed
// raw (in a header, a file name or a message), and a long name is cut at a character
// boundary.
func TestEchoedNamesEscaped(t *testing.T) {
	e := newEngine(t)
	ts := startServer(t, Config{Annotate: AnnotateHandler(e, AnnotateConfig{TempDir: t.TempDir()})})
	csvBody := "Site,Fuel,Quantity,Unit\nDepot,diesel,1200,L\n"

	// the name= parameter, and a multipart file name (RFC 2231 lets a form carry a newline)
	r := do(t, http.MethodPost, ts.URL+"/v1/annotate?name="+url.QueryEscape("week\n14\r\x00\x1b[31m.csv"), map[string]string{"Content-Type": "text/csv"}, csvBody)
	checkAttachment(t, "name=", r)
	form := "--B\r\nContent-Disposition: form-data; name=\"file\"; filename*=utf-8''fuel%0Alog%0D%07.csv\r\nContent-Type: text/csv\r\n\r\n" + csvBody + "\r\n--B--\r\n"
	r = do(t, http.MethodPost, ts.URL+"/v1/annotate", map[string]string{"Content-Type": "multipart/form-data; boundary=B"}, form)
	checkAttachment(t, "multipart", r)

	// an unknown parameter with a newline in its name is quoted with the newline escaped
	r = do(t, http.MethodPost, ts.URL+"/v1/annotate?"+url.QueryEscape("col\nour")+"=1", map[string]string{"Content-Type": "text/csv"}, csvBody)
	var eb errorBody
	if err := json.Unmarshal([]byte(r.Body), &eb); err != nil || r.Status != 400 || !strings.Contains(eb.Error, `"col\nour"`) {
		t.Errorf("unknown parameter: %d %q", r.Status, r.Body)
	}

	// messages quoting long multi-byte names are cut between characters
	long := strings.Repeat("é", 100)
	for _, target := range []string{
		"/v1/fn/fuel_co2?amount=1&unit=GJ&fuel=" + url.QueryEscape("x"+long),
		"/v1/fn/fuel_co2?amount=1&unit=GJ&fuel=" + url.QueryEscape(long),
		"/v1/fn/fuel_co2?amount=1&fuel=natural_gas&unit=" + url.QueryEscape(long),
		"/v1/fn/gwp?gas=" + url.QueryEscape(long),
	} {
		r := get(t, ts.URL+target+"&format=json")
		if err := json.Unmarshal([]byte(r.Body), &eb); err != nil || r.Status != 400 {
			t.Errorf("%.60s: %d %q", target, r.Status, r.Body)
			continue
		}
		if !utf8.ValidString(eb.Error) || strings.ContainsRune(eb.Error, utf8.RuneError) {
			t.Errorf("%.60s: the message is cut inside a character: %q", target, eb.Error)
		}
	}
	r = do(t, http.MethodPost, ts.URL+"/v1/annotate?"+url.QueryEscape("x"+long)+"=1", map[string]string{"Content-Type": "text/csv"}, csvBody)
	if err := json.Unmarshal([]byte(r.Body), &eb); err != nil || r.Status != 400 || strings.ContainsRune(eb.Error, utf8.RuneError) || !strings.Contains(eb.Error, "xéé") {
		t.Errorf("long parameter name: %d %q", r.Status, r.Body)
	}
}

// checkAttachment checks that an annotated file's name holds no control character.
func checkAttachment(t *testing.T, what string, r reply) {
	t.Helper()
	if r.Status != 200 {
		t.Errorf("%s: %d %s", what, r.Status, r.Body)
		return
	}
	cd := r.Header.Get("Content-Disposition")
	_, params, err := mime.ParseMediaType(cd)
	if err != nil || params["filename"] == "" {
		t.Errorf("%s: Content-Disposition %q: %v", what, cd, err)
		return
	}
	for _, c := range params["filename"] {
		if c < 0x20 || c == 0x7f {
			t.Errorf("%s: the file name %q holds a control character", what, params["filename"])
			break
		}
	}
}
