package importer

import (
	"context"
	"path/filepath"
	"syscall"
	"testing"
	"time"
)

// TestScanRefusesPipe: Scan of a named pipe returns an input error at once
// instead of waiting for a writer that never comes.
func TestScanRefusesPipe(t *testing.T) {
	p := filepath.Join(t.TempDir(), "log.xlsx")
	if err := syscall.Mkfifo(p, 0o600); err != nil {
		t.Skip("no named pipes here:", err)
	}
	done := make(chan error, 1)
	go func() {
		_, err := Scan(context.Background(), testEngine(t), p, Options{})
		done <- err
	}()
	select {
	case err := <-done:
		ie, ok := err.(*Error)
		if !ok || ie.Code != ErrInput {
			t.Errorf("err %v (%T), want an input error", err, err)
		}
	case <-time.After(5 * time.Second):
		t.Fatal("Scan of a named pipe still waiting after 5 s")
	}
}
