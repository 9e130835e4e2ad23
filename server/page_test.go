package server

import (
	"math"
	"net/http"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// TestPageFiles serves the page's files with their security headers, without the token, and
// checks what the Content-Security-Policy relies on: no inline script, no style attribute, no
// event-handler attribute, nothing fetched from another origin.
func TestPageFiles(t *testing.T) {
	ts := startServer(t, Config{Token: "tk"})
	for _, p := range []string{"/", "/page/page.js", "/page/functions.js", "/page/page.css"} {
		r := do(t, http.MethodGet, ts.URL+p, nil, "")
		if r.Status != 200 || r.Header.Get("Content-Security-Policy") != pageCSP || r.Header.Get("X-Content-Type-Options") != "nosniff" ||
			r.Header.Get("Referrer-Policy") != "no-referrer" || r.Header.Get("ETag") == "" {
			t.Errorf("GET %s without the token: %d %v", p, r.Status, r.Header)
		}
		if m := regexp.MustCompile(`(?i)(https?:)?//[a-z0-9.-]+\.[a-z]{2,}`).FindString(r.Body); m != "" {
			t.Errorf("%s names another origin: %s", p, m)
		}
		if p == "/" {
			for _, bad := range []*regexp.Regexp{regexp.MustCompile(`<script>|<script [^>]*>[^<]`), regexp.MustCompile(`(?i)\sstyle=`), regexp.MustCompile(`(?i)\son[a-z]+=`), regexp.MustCompile(`(?i)<style`)} {
				if m := bad.FindString(r.Body); m != "" {
					t.Errorf("the page holds %q, which its policy forbids", m)
				}
			}
		}
		if strings.HasSuffix(p, ".js") && regexp.MustCompile(`innerHTML|outerHTML|insertAdjacentHTML|document\.write|eval\(|new Function|localStorage|sessionStorage|document\.cookie`).MatchString(r.Body) {
			t.Errorf("%s uses an API that renders HTML, runs text as code, or stores data beyond the tab", p)
		}
	}
	if r := do(t, http.MethodHead, ts.URL+"/", nil, ""); r.Status != 200 {
		t.Errorf("HEAD /: %d", r.Status)
	}
	if r := do(t, http.MethodGet, ts.URL+"/page/other.js", nil, ""); r.Status != 404 {
		t.Errorf("GET /page/other.js: %d, want 404", r.Status)
	}
	// the API stays behind the token
	if r := do(t, http.MethodGet, ts.URL+"/v1/functions", nil, ""); r.Status != 401 {
		t.Errorf("GET /v1/functions without the token: %d", r.Status)
	}
}

// TestPageContrast checks the colours of page.css against WCAG 2.1: text at least 4.5:1
// against its background (success criterion 1.4.3), the focus outline at least 3:1 (1.4.11),
// with the relative luminance and contrast ratio of WCAG 2.1's definitions.
func TestPageContrast(t *testing.T) {
	css, err := webpage.ReadFile("webpage/page.css")
	if err != nil {
		t.Fatal(err)
	}
	vars := map[string]string{}
	for _, m := range regexp.MustCompile(`--([a-z-]+):\s*(#[0-9a-f]{6})`).FindAllStringSubmatch(string(css), -1) {
		vars[m[1]] = m[2]
	}
	pairs := []struct {
		fg, bg string
		min    float64
	}{
		{"ink", "paper", 4.5}, {"ink", "panel", 4.5}, {"muted", "paper", 4.5}, {"muted", "panel", 4.5},
		{"accent", "panel", 4.5}, {"accent", "paper", 4.5}, {"accent-ink", "accent", 4.5},
		{"err-ink", "err-bg", 4.5}, {"warn-ink", "warn-bg", 4.5}, {"info-ink", "info-bg", 4.5},
		{"focus", "paper", 3}, {"focus", "panel", 3},
	}
	for _, p := range pairs {
		fg, bg := vars[p.fg], vars[p.bg]
		if fg == "" || bg == "" {
			t.Errorf("page.css does not define --%s or --%s", p.fg, p.bg)
			continue
		}
		if c := contrast(fg, bg); c < p.min {
			t.Errorf("--%s %s on --%s %s: contrast %.2f:1, under %.1f:1", p.fg, fg, p.bg, bg, c, p.min)
		}
	}
	// WCAG 2.1's own example: black on white is 21:1
	if c := contrast("#000000", "#ffffff"); math.Abs(c-21) > 1e-9 {
		t.Errorf("contrast of black on white = %v, want 21", c)
	}
}

// contrast is WCAG 2.1's contrast ratio (L1 + 0.05) / (L2 + 0.05) of two sRGB colours #rrggbb.
func contrast(a, b string) float64 {
	la, lb := luminance(a), luminance(b)
	return (max(la, lb) + 0.05) / (min(la, lb) + 0.05)
}

func luminance(hex string) float64 {
	ch := func(i int) float64 {
		v, _ := strconv.ParseUint(hex[1+2*i:3+2*i], 16, 8)
		c := float64(v) / 255
		if c <= 0.04045 {
			return c / 12.92
		}
		return math.Pow((c+0.055)/1.055, 2.4)
	}
	return 0.2126*ch(0) + 0.7152*ch(1) + 0.0722*ch(2)
}
