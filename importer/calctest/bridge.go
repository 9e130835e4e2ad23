package calctest

import (
	"bufio"
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"time"
)

// request is one JSON line to the Python bridge.
type request struct {
	ID    int      `json:"id"`
	Op    string   `json:"op"`
	Path  string   `json:"path,omitempty"`
	Cells []string `json:"cells,omitempty"`
}

// response is one JSON line from the Python bridge.
type response struct {
	ID     int               `json:"id"`
	OK     bool              `json:"ok"`
	Error  string            `json:"error"`
	Cells  map[string]string `json:"cells"`
	Sheets []Sheet           `json:"sheets"`
}

// readLines delivers the lines read from r until EOF, then closes the channel and r.
func readLines(r *os.File) <-chan []byte {
	ch := make(chan []byte, 1)
	go func() {
		defer close(ch)
		defer r.Close()
		br := bufio.NewReader(r)
		for {
			line, err := br.ReadBytes('\n')
			if len(line) > 0 && err == nil {
				ch <- line
			}
			if err != nil {
				return
			}
		}
	}()
	return ch
}

// call sends req and waits for its answer within the timeout. what names the call in errors.
func (c *Calc) call(req request, what string) (*response, error) {
	c.mu.Lock()
	defer c.mu.Unlock()
	if c.closed {
		return nil, fmt.Errorf("calctest: %s: Calc already shut down", what)
	}
	if c.broken != nil {
		return nil, fmt.Errorf("calctest: %s: Calc unusable after an earlier failure: %w", what, c.broken)
	}
	timeout := c.Timeout
	if timeout <= 0 {
		timeout = DefaultTimeout
	}
	c.nextID++
	req.ID = c.nextID
	b, err := json.Marshal(req)
	if err != nil {
		return nil, fmt.Errorf("calctest: %s: %w", what, err)
	}
	_ = c.toPy.SetWriteDeadline(time.Now().Add(timeout))
	if _, err := c.toPy.Write(append(b, '\n')); err != nil {
		c.breakDown(fmt.Errorf("sending the request to the bridge: %w; %s; %s",
			err, c.bridge.describe(), c.soffice.describe()))
		return nil, fmt.Errorf("calctest: %s: %w", what, c.broken)
	}
	resp, err := c.receive(req.ID, timeout, what)
	if err != nil {
		c.breakDown(err)
		return nil, fmt.Errorf("calctest: %w", err)
	}
	if !resp.OK {
		return nil, fmt.Errorf("calctest: %s: %s", what, resp.Error)
	}
	return resp, nil
}

// receive waits up to timeout for the response with the given id. Any error means the bridge
// can no longer be trusted (dead, hung or out of step).
func (c *Calc) receive(id int, timeout time.Duration, what string) (*response, error) {
	timer := time.NewTimer(timeout)
	defer timer.Stop()
	select {
	case line, ok := <-c.lines:
		if !ok {
			c.bridge.wait(3 * time.Second)
			return nil, fmt.Errorf("%s: the bridge stopped: %s; %s", what, c.bridge.describe(), c.soffice.describe())
		}
		var resp response
		if err := json.Unmarshal(line, &resp); err != nil {
			return nil, fmt.Errorf("%s: unreadable answer from the bridge %q: %w", what, line, err)
		}
		if resp.ID != id {
			return nil, fmt.Errorf("%s: answer %d to request %d: %s", what, resp.ID, id, resp.Error)
		}
		return &resp, nil
	case <-c.soffice.done:
		// soffice ended on its own (it never does during a call); the bridge may still be
		// reporting the dropped connection, so give it a moment for its words.
		c.bridge.wait(2 * time.Second)
		return nil, fmt.Errorf("%s: soffice exited: %s; %s", what, c.soffice.describe(), c.bridge.describe())
	case <-timer.C:
		return nil, fmt.Errorf("%s: soffice did not answer within %v (hung?, killing it); %s; %s",
			what, timeout, c.soffice.describe(), c.bridge.describe())
	}
}

// breakDown marks the instance unusable and kills both processes; the cleanup still removes
// the profile. Called with c.mu held.
func (c *Calc) breakDown(err error) {
	if c.broken == nil {
		c.broken = err
	}
	c.kill()
}

// kill kills the bridge and soffice process groups (those that were started).
func (c *Calc) kill() {
	if c.toPy != nil {
		c.toPy.Close()
	}
	for _, p := range []*proc{c.bridge, c.soffice} {
		if p != nil {
			p.kill()
		}
	}
}

// close shuts the instance down: it asks soffice to terminate, kills whatever is still running
// after a grace period, and removes the profile. Safe to call more than once.
func (c *Calc) close() {
	c.mu.Lock()
	defer c.mu.Unlock()
	if c.closed {
		return
	}
	c.closed = true
	if c.broken == nil && c.bridge != nil && !c.bridge.exited() {
		c.nextID++
		b, _ := json.Marshal(request{ID: c.nextID, Op: "quit"})
		_ = c.toPy.SetWriteDeadline(time.Now().Add(5 * time.Second))
		if _, err := c.toPy.Write(append(b, '\n')); err == nil {
			_, _ = c.receive(c.nextID, 15*time.Second, "quit")
			// Terminating soffice takes a moment; the leader exits after soffice.bin.
			c.soffice.wait(15 * time.Second)
		}
	}
	c.kill()
	drain(c.lines)
	if c.profile != "" {
		if err := os.RemoveAll(c.profile); err != nil && !errors.Is(err, os.ErrNotExist) {
			// A file still being written by a dying process; one more try after it is gone.
			time.Sleep(200 * time.Millisecond)
			_ = os.RemoveAll(c.profile)
		}
	}
}

// drain discards what is left on a line channel so its reader goroutine can end.
func drain(ch <-chan []byte) {
	if ch == nil {
		return
	}
	go func() {
		for range ch {
		}
	}()
}
