package server

import (
	"errors"
	"io"
	"net/http"
	"os"
	"strconv"
	"time"
)

// pacedBody is a request body that must arrive at a minimum pace: before each read the
// connection's read deadline is set to start + grace + n/rate seconds (n: the bytes read so
// far), and never past end. A client that falls behind gets a *slowUpload error, one that
// runs past end the deadline error itself.
type pacedBody struct {
	r     io.ReadCloser
	rc    *http.ResponseController
	start time.Time
	grace time.Duration
	rate  int64 // bytes per second
	end   time.Time
	n     int64
}

func (b *pacedBody) Read(p []byte) (int, error) {
	due := b.start.Add(b.grace + time.Duration(float64(b.n)/float64(b.rate)*float64(time.Second)))
	paced := due.Before(b.end)
	if !paced {
		due = b.end
	}
	_ = b.rc.SetReadDeadline(due)
	n, err := b.r.Read(p)
	b.n += int64(n)
	if err != nil && paced && errors.Is(err, os.ErrDeadlineExceeded) {
		return n, &slowUpload{got: b.n, grace: b.grace, rate: b.rate}
	}
	return n, err
}

func (b *pacedBody) Close() error { return b.r.Close() }

// slowUpload is the error of an upload that fell below the minimum pace.
type slowUpload struct {
	got   int64
	grace time.Duration
	rate  int64
}

func (e *slowUpload) Error() string {
	return "the upload arrived too slowly (" + strconv.FormatInt(e.got, 10) + " bytes so far): the server waits " +
		e.grace.String() + " plus one second per " + strconv.FormatInt(e.rate, 10) + " bytes; send the workbook in one go"
}
