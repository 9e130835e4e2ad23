package importer

import (
	"context"
	"encoding/csv"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestAnnotatedCSVNeutralisesAddedText: the fields fluecell adds to an
// annotated CSV (column names, source text) never start a formula
// (OWASP "CSV Injection": = + - @ tab carriage return); the input's own
// cells, a formula-looking one included, are copied byte for byte, and the
// computed numbers stay numbers.
func TestAnnotatedCSVNeutralisesAddedText(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "in.csv")
	src := "Fuel,Quantity,Unit,Note\r\ndiesel,10,L,\"=HYPERLINK(\"\"http://example.invalid\"\",\"\"x\"\")\"\r\ndiesel,-4,L,@SUM(1)\r\n"
	if err := os.WriteFile(in, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "out.csv")
	rules := []string{"@x = quantity", "-y = quantity * 2"}
	if _, err := Annotate(context.Background(), testEngine(t), in, out, Options{Rules: rules}); err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.SplitAfter(string(b), "\r\n")
	for i, orig := range strings.SplitAfter(src, "\r\n")[1:3] {
		if !strings.HasPrefix(lines[i+1], strings.TrimSuffix(orig, "\r\n")) {
			t.Errorf("original cells changed: %q, was %q", lines[i+1], orig)
		}
	}
	recs, err := csv.NewReader(strings.NewReader(string(b))).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if h := recs[0]; h[4] != "'@x" || h[5] != "'-y" {
		t.Errorf("added column names %q", h[4:])
	}
	if r := recs[2]; r[4] != "-4" || r[5] != "-8" || r[3] != "@SUM(1)" {
		t.Errorf("row %q", r)
	}
}
