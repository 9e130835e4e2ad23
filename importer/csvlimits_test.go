package importer

import (
	"bytes"
	"context"
	"math/rand/v2"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
)

// TestCSVBinaryRefusedEarly: 64 MB of random bytes named .csv are refused
// as binary after reading the start of the file, not after loading all of
// it. Before, the whole file was read (and grown by doubling) before the
// NUL check refused it: 2.1 GB for a 1 GB file.
func TestCSVBinaryRefusedEarly(t *testing.T) {
	dir := t.TempDir()
	data := make([]byte, 64<<20)
	r := rand.NewChaCha8([32]byte{7})
	_, _ = r.Read(data)
	path := filepath.Join(dir, "random.csv")
	must(t, os.WriteFile(path, data, 0o644))
	data = nil
	e := testEngine(t)
	runtime.GC()
	var m0, m1 runtime.MemStats
	runtime.ReadMemStats(&m0)
	_, err := Scan(context.Background(), e, path, Options{})
	runtime.ReadMemStats(&m1)
	checkRefusal(t, err, ErrFormat, "binary")
	if alloc := m1.TotalAlloc - m0.TotalAlloc; alloc > 8<<20 {
		t.Errorf("refusing 64 MB of random bytes allocated %s, want under 8 MB", byteSize(int64(alloc)))
	}
}

// TestCSVLimits: a CSV file with a line longer than the line limit, or with
// NUL bytes after a text start, is refused with a message naming the line;
// a record with more fields than a worksheet has columns too.
func TestCSVLimits(t *testing.T) {
	dir := t.TempDir()
	e := testEngine(t)
	head := "Fuel,Quantity,Unit\ndiesel,1000,L\n"
	long := head + "diesel,5," + strings.Repeat("L", maxCSVLine+10) + "\n"
	nul := head + strings.Repeat("natural_gas,50,MWh\n", 10000) + "diesel,\x00\x00,L\n"
	wide := head + strings.Repeat("1,", 20000) + "1\n"
	for _, c := range []struct{ name, data, code, msg string }{
		{"long line", long, ErrTooLarge, "line 3 is longer than 1.0 MB"},
		{"NUL later", nul, ErrFormat, "line 10003"},
		{"too many fields", wide, ErrTooLarge, "20001 fields"},
	} {
		t.Run(c.name, func(t *testing.T) {
			path := filepath.Join(dir, strings.ReplaceAll(c.name, " ", "-")+".csv")
			must(t, os.WriteFile(path, []byte(c.data), 0o644))
			_, err := Scan(context.Background(), e, path, Options{})
			checkRefusal(t, err, c.code, c.msg)
		})
	}
	ok := filepath.Join(dir, "ok.csv")
	must(t, os.WriteFile(ok, bytes.Repeat([]byte(head), 1), 0o644))
	if _, err := Scan(context.Background(), e, ok, Options{}); err != nil {
		t.Fatalf("a plain CSV file: %v", err)
	}
}
