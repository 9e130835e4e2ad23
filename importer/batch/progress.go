package batch

import (
	"fmt"
	"io"
	"strings"
	"sync"
	"time"
)

// progress draws "[#####.....] 12/40 files, 1 failed, 3s" on one line.
type progress struct {
	mu      sync.Mutex
	w       io.Writer
	total   int
	n, bad  int
	start   time.Time
	lastLen int
}

func newProgress(w io.Writer, total int) *progress {
	p := &progress{w: w, total: total, start: time.Now()}
	p.draw()
	return p
}

func (p *progress) done(failed bool) {
	if p.w == nil {
		return
	}
	p.mu.Lock()
	defer p.mu.Unlock()
	p.n++
	if failed {
		p.bad++
	}
	p.draw()
}

func (p *progress) draw() {
	if p.w == nil {
		return
	}
	const width = 30
	filled := width
	if p.total > 0 {
		filled = p.n * width / p.total
	}
	line := fmt.Sprintf("\r[%s%s] %d/%d files", strings.Repeat("#", filled), strings.Repeat(".", width-filled), p.n, p.total)
	if p.bad > 0 {
		line += fmt.Sprintf(", %d failed", p.bad)
	}
	line += fmt.Sprintf(", %s", time.Since(p.start).Round(time.Second))
	pad := p.lastLen - len(line)
	p.lastLen = len(line)
	if pad > 0 {
		line += strings.Repeat(" ", pad)
	}
	io.WriteString(p.w, line)
}

func (p *progress) finish() {
	if p.w == nil {
		return
	}
	io.WriteString(p.w, "\n")
}
