package server

import (
	"sync"
	"time"
)

// Request log bounds (see Config.LogBytesPerSecond).
const (
	DefaultLogBytesPerSecond = 32 << 10
	logBurstSeconds          = 8           // the budget a quiet server saves up, in seconds of rate
	slowRequest              = time.Second // a request slower than this is logged as notable
	maxLoggedText            = 1024        // bytes of a path, query or message in one line
	maxLoggedCause           = 4096        // bytes of a 5xx cause or a panic stack in one line
	logLineOverhead          = 200         // bytes of a line besides its variable texts
)

// Kinds of log lines: routine lines (quick successes) and notable ones (errors, slow requests,
// faults), each with its own share of the budget so that a flood of one does not starve the
// other.
const (
	logRoutine = iota
	logNotable
)

// logBudget is a token bucket of bytes per kind of line. Safe for concurrent use.
type logBudget struct {
	mu      sync.Mutex
	rate    [2]float64 // bytes per second
	tokens  [2]float64
	last    time.Time
	skipped [2]int64
}

// newLogBudget shares perSecond bytes: a quarter to routine lines, the rest to notable ones.
// nil (no bound) for a negative rate.
func newLogBudget(perSecond int64) *logBudget {
	if perSecond < 0 {
		return nil
	}
	b := &logBudget{last: time.Now()}
	b.rate = [2]float64{float64(perSecond) / 4, float64(perSecond) * 3 / 4}
	for k := range b.tokens {
		b.tokens[k] = b.rate[k] * logBurstSeconds
	}
	return b
}

// allow spends size bytes of kind's budget. It reports whether the line may be written and,
// when it may, how many lines of each kind were skipped since the last line written (then
// reset).
func (b *logBudget) allow(kind int, size int) (ok bool, skipped [2]int64) {
	if b == nil {
		return true, skipped
	}
	b.mu.Lock()
	defer b.mu.Unlock()
	now := time.Now()
	if dt := now.Sub(b.last).Seconds(); dt > 0 {
		for k := range b.tokens {
			b.tokens[k] = min(b.tokens[k]+dt*b.rate[k], b.rate[k]*logBurstSeconds)
		}
		b.last = now
	}
	if b.tokens[kind] < float64(size) {
		b.skipped[kind]++
		return false, skipped
	}
	b.tokens[kind] -= float64(size)
	skipped = b.skipped
	b.skipped = [2]int64{}
	return true, skipped
}
