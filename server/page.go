package server

import (
	"crypto/sha256"
	"embed"
	"encoding/hex"
	"fmt"
	"net/http"
	"path"

	"github.com/gin-gonic/gin"
)

// webpage holds the page served at / (fluecell's workbook desk and functions explorer): HTML,
// CSS and scripts, with no inline script or style, nothing fetched from elsewhere.
//
//go:embed webpage/index.html webpage/page.css webpage/page.js webpage/functions.js
var webpage embed.FS

// pageCSP is the Content-Security-Policy of the page's files: scripts and styles from this
// server only (no inline script, no inline style), requests to this server only, no framing.
const pageCSP = "default-src 'self'; script-src 'self'; style-src 'self'; img-src 'self' data: blob:; connect-src 'self'; frame-ancestors 'none'; base-uri 'none'; form-action 'self'"

// pageFile is one file of the page, read once.
type pageFile struct {
	body  []byte
	ctype string
	etag  string
}

// pageFiles are the page's files by URL path.
type pageFiles map[string]pageFile

// loadPage reads the embedded page: / is index.html, /page/NAME the others.
func loadPage() (pageFiles, error) {
	types := map[string]string{".html": "text/html; charset=utf-8", ".css": "text/css; charset=utf-8", ".js": "text/javascript; charset=utf-8"}
	out := pageFiles{}
	for _, name := range []string{"index.html", "page.css", "page.js", "functions.js"} {
		b, err := webpage.ReadFile("webpage/" + name)
		if err != nil {
			return nil, fmt.Errorf("page: %w", err)
		}
		sum := sha256.Sum256(b)
		route := "/page/" + name
		if name == "index.html" {
			route = "/"
		}
		out[route] = pageFile{body: b, ctype: types[path.Ext(name)], etag: `"` + hex.EncodeToString(sum[:8]) + `"`}
	}
	return out, nil
}

// page answers GET / and GET /page/NAME. The files are the same for every visitor and hold no
// data: they are served without the token, which the page then asks for and sends as a header
// on every API call (a browser cannot send a header when it opens an address, and the token is
// never put in one).
func (s *Server) page(c *gin.Context) {
	p := c.Request.URL.Path
	f, ok := s.pageFiles[p]
	if !ok {
		s.noRoute(c)
		return
	}
	h := c.Writer.Header()
	h.Set("Content-Security-Policy", pageCSP)
	h.Set("X-Content-Type-Options", "nosniff")
	h.Set("Referrer-Policy", "no-referrer")
	h.Set("X-Frame-Options", "DENY")
	h.Set("Cache-Control", "no-cache")
	h.Set("ETag", f.etag)
	if c.GetHeader("If-None-Match") == f.etag {
		c.Status(http.StatusNotModified)
		return
	}
	c.Data(http.StatusOK, f.ctype, f.body)
}
