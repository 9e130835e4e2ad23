package server

import (
	"encoding/json"
	"net/http"
	"sync"
	"testing"
	"time"
)

// TestUploadsInProgressBounded: past MaxUploads uploads being received at once, a further one
// is refused at once with 503 (the spool folder's disk use stays bounded), and is accepted
// again once the others are gone.
func TestUploadsInProgressBounded(t *testing.T) {
	e := newEngine(t)
	ann := AnnotateHandler(e, AnnotateConfig{TempDir: t.TempDir(), Concurrent: 1, MaxUploads: 2,
		UploadGrace: 2 * time.Second, MinUploadRate: 1024})
	srv := startServer(t, Config{Annotate: ann})
	stop := make(chan struct{})
	var wg sync.WaitGroup
	for range 2 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			trickle(t, srv.URL, 100_000, 100*time.Millisecond, stop)
		}()
	}
	time.Sleep(500 * time.Millisecond)
	csvBody := "Site,Fuel,Quantity,Unit\nDepot,diesel,1200,L\n"
	r := do(t, http.MethodPost, srv.URL+"/v1/annotate", map[string]string{"Content-Type": "text/csv"}, csvBody)
	var eb errorBody
	if err := json.Unmarshal([]byte(r.Body), &eb); err != nil || r.Status != http.StatusServiceUnavailable || eb.Code != codeTimeout {
		t.Errorf("a third upload while two are received: %d %s, want 503", r.Status, r.Body)
	}
	close(stop)
	wg.Wait()
	time.Sleep(100 * time.Millisecond) // the server sees the slow clients go
	if r := do(t, http.MethodPost, srv.URL+"/v1/annotate", map[string]string{"Content-Type": "text/csv"}, csvBody); r.Status != 200 {
		t.Errorf("after the others: %d %s", r.Status, r.Body)
	}
}
