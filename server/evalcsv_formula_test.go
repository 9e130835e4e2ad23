package server

import (
	"encoding/csv"
	"strings"
	"testing"
)

// TestEvalCSVColumnNameNotAFormula: the name of the computed column comes
// from the request (as=); one a spreadsheet would read as a formula
// (OWASP "CSV Injection": = + - @ tab carriage return) is written with a
// leading quote. The caller's own header and cells are echoed as sent.
func TestEvalCSVColumnNameNotAFormula(t *testing.T) {
	ts := startServer(t, Config{})
	in := "=site,q\n@x,1000\n"
	r := postCSV(t, ts.URL+"/v1/eval?expr=q*2&as="+urlEscape(`=HYPERLINK("example.invalid","x")`), in)
	if r.Status != 200 {
		t.Fatalf("%d %s", r.Status, r.Body)
	}
	rows, err := csv.NewReader(strings.NewReader(r.Body)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if got := strings.Join(rows[0], "|"); got != `=site|q|'=HYPERLINK("example.invalid","x")` {
		t.Errorf("header %s", got)
	}
	if got := strings.Join(rows[1], "|"); got != "@x|1000|2000" {
		t.Errorf("row %s", got)
	}
}
