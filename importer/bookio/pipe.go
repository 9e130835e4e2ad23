package bookio

import (
	"io"
)

// pipeBuf is the size of the buffers handed between the stages of a
// stream (inflate, rewrite, deflate); pipeDepth is how many are in flight
// per stage, so that a stream holds at most a few hundred kB whatever the
// size of the part.
const (
	pipeBuf   = 256 << 10
	pipeDepth = 3
)

// readAhead reads r in its own goroutine, a few buffers ahead of the
// caller, so that inflating a part runs beside what reads it (on a
// machine with a core to spare). Close stops it; it does not close r.
type readAhead struct {
	full  chan chunk
	free  chan []byte
	done  chan struct{}
	gone  chan struct{} // closed when the goroutine has returned
	cur   []byte
	buf   []byte // the buffer cur is in, given back when cur is read
	err   error
	ended bool
}

type chunk struct {
	b   []byte
	err error
}

func newReadAhead(r io.Reader) *readAhead {
	ra := &readAhead{full: make(chan chunk, pipeDepth), free: make(chan []byte, pipeDepth), done: make(chan struct{}), gone: make(chan struct{})}
	for range pipeDepth {
		ra.free <- make([]byte, pipeBuf)
	}
	go func() {
		defer close(ra.gone)
		defer close(ra.full)
		for {
			var b []byte
			select {
			case b = <-ra.free:
			case <-ra.done:
				return
			}
			n, err := io.ReadFull(r, b)
			if err == io.ErrUnexpectedEOF {
				err = io.EOF
			}
			select {
			case ra.full <- chunk{b[:n], err}:
			case <-ra.done:
				return
			}
			if err != nil {
				return
			}
		}
	}()
	return ra
}

func (ra *readAhead) Read(p []byte) (int, error) {
	for len(ra.cur) == 0 {
		if ra.buf != nil {
			ra.free <- ra.buf[:cap(ra.buf)]
			ra.buf = nil
		}
		if ra.ended {
			return 0, ra.err
		}
		c, ok := <-ra.full
		if !ok {
			ra.ended = true
			if ra.err == nil {
				ra.err = io.EOF
			}
			return 0, ra.err
		}
		ra.cur, ra.buf = c.b, c.b
		if c.err != nil {
			ra.ended, ra.err = true, c.err
		}
	}
	n := copy(p, ra.cur)
	ra.cur = ra.cur[n:]
	return n, nil
}

// Close stops the reading goroutine and waits for it, so that r may be
// closed next.
func (ra *readAhead) Close() error {
	select {
	case <-ra.done:
	default:
		close(ra.done)
	}
	<-ra.gone
	return nil
}

// writeBehind writes to w in its own goroutine, so that deflating runs
// beside what produces the bytes. Close flushes and waits for it and
// returns the first error of w.
type writeBehind struct {
	w    io.Writer
	full chan []byte
	free chan []byte
	cur  []byte
	errc chan error
	err  error
}

func newWriteBehind(w io.Writer) *writeBehind {
	wb := &writeBehind{w: w, full: make(chan []byte, pipeDepth), free: make(chan []byte, pipeDepth+1), errc: make(chan error, 1)}
	for range pipeDepth {
		wb.free <- make([]byte, 0, pipeBuf)
	}
	wb.cur = make([]byte, 0, pipeBuf)
	full, free, errc := wb.full, wb.free, wb.errc // Close sets wb.full to nil
	go func() {
		var err error
		for b := range full {
			if err == nil {
				_, err = w.Write(b)
			}
			free <- b[:0]
		}
		errc <- err
	}()
	return wb
}

func (wb *writeBehind) Write(p []byte) (int, error) {
	if wb.err != nil {
		return 0, wb.err
	}
	n := len(p)
	for len(p) > 0 {
		k := copy(wb.cur[len(wb.cur):cap(wb.cur)], p)
		wb.cur = wb.cur[:len(wb.cur)+k]
		p = p[k:]
		if len(wb.cur) == cap(wb.cur) {
			wb.full <- wb.cur
			wb.cur = <-wb.free
		}
	}
	return n, nil
}

// Close writes what is left and waits for the writer.
func (wb *writeBehind) Close() error {
	if wb.full == nil {
		return wb.err
	}
	if len(wb.cur) > 0 {
		wb.full <- wb.cur
	}
	close(wb.full)
	wb.full = nil
	if err := <-wb.errc; err != nil && wb.err == nil {
		wb.err = err
	}
	return wb.err
}
