package bookio

import (
	"bytes"
	"errors"
	"io"
	"testing"
)

type failAt struct {
	r   io.Reader
	n   int
	err error
}

func (f *failAt) Read(p []byte) (int, error) {
	if f.n <= 0 {
		return 0, f.err
	}
	if len(p) > f.n {
		p = p[:f.n]
	}
	n, err := f.r.Read(p)
	f.n -= n
	return n, err
}

// TestPipes: the read-ahead and write-behind pass bytes through unchanged
// across many buffers, and an error of the source or the sink reaches the
// caller.
func TestPipes(t *testing.T) {
	data := make([]byte, 3*pipeBuf*pipeDepth+12345)
	for i := range data {
		data[i] = byte(i * 7)
	}
	var out bytes.Buffer
	ra := newReadAhead(bytes.NewReader(data))
	wb := newWriteBehind(&out)
	if _, err := io.CopyBuffer(wb, ra, make([]byte, 1000)); err != nil {
		t.Fatal(err)
	}
	if err := wb.Close(); err != nil {
		t.Fatal(err)
	}
	ra.Close()
	if !bytes.Equal(out.Bytes(), data) {
		t.Fatal("bytes changed")
	}
	boom := errors.New("boom")
	ra = newReadAhead(&failAt{r: bytes.NewReader(data), n: pipeBuf + 10, err: boom})
	if _, err := io.Copy(io.Discard, ra); !errors.Is(err, boom) {
		t.Errorf("read error %v, want boom", err)
	}
	ra.Close()
	ra = newReadAhead(bytes.NewReader(data)) // closed before it is read to the end
	ra.Close()
	wb = newWriteBehind(errWriter{boom})
	wb.Write(data)
	if err := wb.Close(); !errors.Is(err, boom) {
		t.Errorf("write error %v, want boom", err)
	}
}

type errWriter struct{ err error }

func (e errWriter) Write([]byte) (int, error) { return 0, e.err }

// TestWriteBehindQuickClose: a writer closed at once, before its goroutine
// runs, ends.
func TestWriteBehindQuickClose(t *testing.T) {
	for range 1000 {
		var out bytes.Buffer
		wb := newWriteBehind(&out)
		if err := wb.Close(); err != nil {
			t.Fatal(err)
		}
	}
}
