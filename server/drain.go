package server

import (
	"io"
	"net/http"
	"strings"
	"time"

	"github.com/gin-gonic/gin"
)

// What is read and discarded of a body the answer did not need.
const (
	maxDrainBytes = 128 << 20
	drainTime     = 10 * time.Second
)

// watchedBody is a request body that records whether it was read to its end.
type watchedBody struct {
	io.ReadCloser
	done bool
}

func (b *watchedBody) Read(p []byte) (int, error) {
	n, err := b.ReadCloser.Read(p)
	if err != nil {
		b.done = true
	}
	return n, err
}

// drainRefused lets a client that sends its whole body before reading the answer (Python's
// urllib and requests do) read an answer given before the body was read (413 over the limit,
// 401, 404...): the answer is sent first, then what is left of the body is read and discarded,
// up to maxDrainBytes within drainTime. Closing a connection with unread data would reset it,
// and the client would lose the answer. A client that asked for 100-continue has not sent its
// body and needs no draining.
func (s *Server) drainRefused(c *gin.Context) {
	r := c.Request
	if r.Body == nil || r.Body == http.NoBody || r.ContentLength == 0 ||
		strings.EqualFold(r.Header.Get("Expect"), "100-continue") {
		c.Next()
		return
	}
	rc := http.NewResponseController(c.Writer)
	// reading the body after the answer was written needs full duplex on HTTP/1.x
	if rc.EnableFullDuplex() != nil {
		c.Next()
		return
	}
	body := &watchedBody{ReadCloser: r.Body}
	r.Body = body
	c.Next()
	if body.done {
		return
	}
	if !c.Writer.Written() {
		c.Writer.WriteHeaderNow()
	}
	_ = rc.Flush()
	_ = rc.SetReadDeadline(time.Now().Add(drainTime))
	_, _ = io.CopyN(io.Discard, body, maxDrainBytes)
}
