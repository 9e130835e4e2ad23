package server

import (
	"encoding/json"
	"io"
	"net/http"
	"strings"
	"testing"
	"time"
)

// timedPost sends a JSON or CSV eval request with a client deadline, and returns the answer
// and how long it took; a client timeout fails the test with the time spent.
func timedPost(t *testing.T, url, ctype, body string, limit time.Duration) (reply, time.Duration) {
	t.Helper()
	req, err := http.NewRequest(http.MethodPost, url, strings.NewReader(body))
	if err != nil {
		t.Fatal(err)
	}
	req.Header.Set("Content-Type", ctype)
	client := &http.Client{Timeout: limit}
	start := time.Now()
	resp, err := client.Do(req)
	if err != nil {
		t.Fatalf("no answer within %v: %v", limit, err)
	}
	defer resp.Body.Close()
	b, err := io.ReadAll(resp.Body)
	if err != nil {
		t.Fatalf("answer cut after %v: %v", time.Since(start), err)
	}
	return reply{Status: resp.StatusCode, Header: resp.Header, Body: string(b)}, time.Since(start)
}

// manyCalls is an expression of n calls reading variable v, within the node limit.
func manyCalls(n int, call string) string {
	parts := make([]string, n)
	for i := range parts {
		parts[i] = call
	}
	return strings.Join(parts, " + ")
}

// TestEvalLongTextAnswersInTime: a 300,000-character name shared by every row, read by many
// calls, must not keep a worker past the evaluation limit. The text is refused at once,
// naming the variable and the longest text accepted.
func TestEvalLongTextAnswersInTime(t *testing.T) {
	const limit = 2 * time.Second
	ts := startServer(t, Config{EvalTimeout: limit})
	long := strings.Repeat("x", 300_000)
	rows := strings.TrimSuffix(strings.Repeat("{},", 300), ",")
	for _, expr := range []string{
		manyCalls(60, `to_unit(1, f, "GJ")`),
		manyCalls(30, `fuel_co2e("natural_gas", 1, "GJ", "ar5", "ipcc2006", f)`),
		`fuel_co2(f, 1, "GJ")`,
	} {
		body := `{"expr": ` + jsonString(expr) + `, "vars": {"f": "` + long + `"}, "rows": [` + rows + `]}`
		r, took := timedPost(t, ts.URL+"/v1/eval", "application/json", body, limit+3*time.Second)
		var e errorBody
		_ = json.Unmarshal([]byte(r.Body), &e)
		if r.Status != http.StatusBadRequest || e.Param != "vars.f" || !strings.Contains(e.Error, "the longest text accepted is 256 bytes") {
			t.Errorf("%.40s: %d %.300s, want 400 for vars.f", expr, r.Status, r.Body)
		}
		if took > limit {
			t.Errorf("%.40s: answered after %v, over the %v limit", expr, took, limit)
		}
	}
	// the same name in one row fails that row only; the others compute
	body := `{"expr": "to_unit(1, f, \"GJ\")", "rows": [{"f": "` + long + `"}, {"f": "MWh"}]}`
	r, _ := timedPost(t, ts.URL+"/v1/eval", "application/json", body, limit+3*time.Second)
	var ans rowsAnswer
	if err := json.Unmarshal([]byte(r.Body), &ans); err != nil || r.Status != 200 || len(ans.Results) != 2 {
		t.Fatalf("%d %.300s", r.Status, r.Body)
	}
	// SI Brochure (9th ed.) Table 8: 1 Wh = 3600 J, so 1 MWh = 3.6 GJ
	if got := ans.Results[0]; got.Value != nil || !strings.Contains(got.Error, "rows[0].f") || len(got.Error) > 300 {
		t.Errorf("row 0: %+v", got)
	}
	if got := ans.Results[1]; got.Value == nil || *got.Value != 3.6 {
		t.Errorf("row 1: %+v, want 3.6", got)
	}
	// in CSV the cell's row fails
	csvBody := "f\n" + long + "\nMWh\n"
	r, _ = timedPost(t, ts.URL+"/v1/eval?expr="+urlEscape(`to_unit(1, f, "GJ")`)+"&as=GJ", "text/csv", csvBody, limit+3*time.Second)
	lines := strings.Split(strings.TrimSpace(r.Body), "\n")
	if r.Status != 200 || len(lines) != 3 || !strings.Contains(lines[1], "#ERROR: column f holds a text of 300000 bytes") || lines[2] != "MWh,3.6" {
		t.Errorf("csv: %d %.300s", r.Status, r.Body)
	}
}

func jsonString(s string) string {
	b, _ := json.Marshal(s)
	return string(b)
}

// TestEvalDeadlineEveryRow: the evaluation limit is checked before every row and before the
// first one, not every 256 rows: with a limit already past, no row is computed.
func TestEvalDeadlineEveryRow(t *testing.T) {
	ts := startServer(t, Config{EvalTimeout: time.Nanosecond})
	for _, c := range []struct{ name, ctype, query, body string }{
		{"json rows", "application/json", "", `{"expr": "co2_from_carbon(c)", "rows": [{"c": 1}, {"c": 2}, {"c": 3}]}`},
		{"json one", "application/json", "", `{"expr": "co2_from_carbon(c)", "vars": {"c": 1}}`},
		{"csv", "text/csv", "?expr=co2_from_carbon(c)", "c\n1\n2\n3\n"},
	} {
		r := do(t, http.MethodPost, ts.URL+"/v1/eval"+c.query, map[string]string{"Content-Type": c.ctype}, c.body)
		var e errorBody
		_ = json.Unmarshal([]byte(r.Body), &e)
		if r.Status != http.StatusServiceUnavailable || e.Code != codeTimeout || !strings.Contains(e.Error, "fewer rows") {
			t.Errorf("%s: %d %s, want 503 timeout", c.name, r.Status, r.Body)
		}
	}
}
