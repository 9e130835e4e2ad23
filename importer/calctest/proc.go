package calctest

import (
	"bytes"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"strings"
	"sync"
	"time"
)

// proc is one child process started in its own process group, so that killing it also kills
// whatever it spawned (soffice -> oosplash -> soffice.bin).
type proc struct {
	name string
	cmd  *exec.Cmd
	done chan struct{} // closed once Wait returned
	err  error         // Wait's result; read only after done is closed
	tail *tailBuffer   // last bytes of its stderr (and stdout when not piped)
}

// startProc starts argv[0] with env. stdin and stdout may be nil (then /dev/null and the
// stderr tail are used).
func startProc(name string, argv, env []string, stdin, stdout *os.File) (*proc, error) {
	p := &proc{name: name, done: make(chan struct{}), tail: &tailBuffer{max: 8 << 10}}
	p.cmd = exec.Command(argv[0], argv[1:]...)
	p.cmd.Env = env
	p.cmd.Stderr = p.tail
	p.cmd.Stdout = p.tail
	if stdout != nil {
		p.cmd.Stdout = stdout
	}
	if stdin != nil {
		p.cmd.Stdin = stdin
	}
	p.cmd.WaitDelay = 2 * time.Second
	setProcessGroup(p.cmd)
	if err := p.cmd.Start(); err != nil {
		return nil, fmt.Errorf("start %s: %w", name, err)
	}
	go func() {
		p.err = p.cmd.Wait()
		close(p.done)
	}()
	return p, nil
}

// pid is the process id, which is also its process group id.
func (p *proc) pid() int { return p.cmd.Process.Pid }

// exited reports whether the process has ended.
func (p *proc) exited() bool {
	select {
	case <-p.done:
		return true
	default:
		return false
	}
}

// wait waits up to d for the process to end and reports whether it did.
func (p *proc) wait(d time.Duration) bool {
	t := time.NewTimer(d)
	defer t.Stop()
	select {
	case <-p.done:
		return true
	case <-t.C:
		return false
	}
}

// kill kills the whole process group and waits (bounded) for the leader to be reaped.
func (p *proc) kill() {
	killGroup(p.cmd)
	p.wait(5 * time.Second)
	// Members that outlived the leader (soffice.bin after oosplash) share its group id.
	killGroup(p.cmd)
}

// describe names the process, how it ended (if it did) and the end of its output, for errors.
func (p *proc) describe() string {
	var b strings.Builder
	b.WriteString(p.name)
	if p.exited() {
		var ee *exec.ExitError
		switch {
		case errors.As(p.err, &ee):
			fmt.Fprintf(&b, " (%s)", ee.ProcessState)
		case p.err != nil:
			fmt.Fprintf(&b, " (%s)", p.err)
		default:
			b.WriteString(" (exited)")
		}
	} else {
		b.WriteString(" (running)")
	}
	if out := strings.TrimSpace(p.tail.String()); out != "" {
		fmt.Fprintf(&b, ", output: %s", out)
	}
	return b.String()
}

// tailBuffer keeps the last max bytes written to it. Safe for concurrent use.
type tailBuffer struct {
	mu  sync.Mutex
	max int
	buf []byte
}

func (t *tailBuffer) Write(b []byte) (int, error) {
	t.mu.Lock()
	defer t.mu.Unlock()
	t.buf = append(t.buf, b...)
	if over := len(t.buf) - t.max; over > 0 {
		t.buf = append(t.buf[:0], t.buf[over:]...)
	}
	return len(b), nil
}

func (t *tailBuffer) String() string {
	t.mu.Lock()
	defer t.mu.Unlock()
	return string(bytes.ToValidUTF8(t.buf, []byte("?")))
}
