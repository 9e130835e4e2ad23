// Command ginbaseline is the yardstick of the throughput of `fluecell serve`: a bare gin
// engine (no middleware, release mode) that answers GET /v1/fn/fuel_co2 with a constant. The
// wrk comparison in server/wrk_test.go runs it and fluecell on the same machine in the same
// run.
//
//	go run ./server/internal/ginbaseline --addr 127.0.0.1:8788
package main

import (
	"flag"
	"fmt"
	"net/http"
	"os"

	"github.com/gin-gonic/gin"
)

func main() {
	addr := flag.String("addr", "127.0.0.1:8788", "listen on `HOST:PORT`")
	flag.Parse()
	gin.SetMode(gin.ReleaseMode)
	r := gin.New()
	body := []byte("56.1")
	r.GET("/v1/fn/fuel_co2", func(c *gin.Context) { c.Data(http.StatusOK, "text/plain; charset=utf-8", body) })
	fmt.Fprintln(os.Stderr, "listening on", *addr)
	if err := http.ListenAndServe(*addr, r); err != nil {
		fmt.Fprintln(os.Stderr, "ginbaseline:", err)
		os.Exit(1)
	}
}
