package server

import (
	"bytes"
	"context"
	"encoding/json"
	"os"
	"os/exec"
	"strings"
	"testing"
	"time"
)

// debianPython is Debian's interpreter; the client needs only its standard library.
const debianPython = "/usr/bin/python3"

// TestPythonNotebookClient runs testdata/notebook_client.py (standard library only) against a
// server on a random port: one value, batch eval, CSV mode and an error answer.
func TestPythonNotebookClient(t *testing.T) {
	if _, err := os.Stat(debianPython); err != nil {
		if os.Getenv("FLUECELL_REQUIRE_CALC") == "1" {
			t.Fatalf("%s not found (FLUECELL_REQUIRE_CALC=1)", debianPython)
		}
		t.Skipf("%s not found", debianPython)
	}
	const token = "nb-token"
	ts := startServer(t, Config{Token: token})
	ctx, cancel := context.WithTimeout(context.Background(), 60*time.Second)
	defer cancel()
	cmd := exec.CommandContext(ctx, debianPython, "testdata/notebook_client.py", ts.URL, token)
	for _, kv := range os.Environ() {
		if !strings.HasPrefix(kv, "PYTHON") { // a pyenv PYTHONPATH must not leak into Debian's python
			cmd.Env = append(cmd.Env, kv)
		}
	}
	var stdout, stderr bytes.Buffer
	cmd.Stdout, cmd.Stderr = &stdout, &stderr
	if err := cmd.Run(); err != nil {
		t.Fatalf("notebook_client.py: %v\n%s", err, stderr.String())
	}
	var got struct {
		Functions    []string            `json:"functions"`
		One          float64             `json:"one"`
		OneWithSpace float64             `json:"one_with_space"`
		Batch        []map[string]any    `json:"batch"`
		BatchSources []string            `json:"batch_sources"`
		CSVType      string              `json:"csv_content_type"`
		CSV          []map[string]string `json:"csv"`
		Error        struct {
			Status int       `json:"status"`
			Body   errorBody `json:"body"`
		} `json:"error"`
	}
	if err := json.Unmarshal(stdout.Bytes(), &got); err != nil {
		t.Fatalf("%v: %s", err, stdout.String())
	}
	if len(got.Functions) != len(newEngine(t).Functions()) {
		t.Errorf("functions %v", got.Functions)
	}
	// IPCC 2006 Vol 2 Ch 1 Table 1.4: 56,100 kg CO2/TJ
	if got.One != 56.1 {
		t.Errorf("one value %v, want 56.1", got.One)
	}
	// NIST SP 811 Appendix B: 1 Btu (IT) = 1055.05585262 J
	if got.OneWithSpace != 1.05505585262 {
		t.Errorf("to_unit with spaces %v, want 1.05505585262", got.OneWithSpace)
	}
	if len(got.Batch) != 3 || got.Batch[0]["value"] != 56.1 || got.Batch[2]["code"] != "unit" {
		t.Errorf("batch %v", got.Batch)
	}
	if len(got.BatchSources) == 0 || got.BatchSources[0] != "ipcc2006/natural_gas/co2_ef" {
		t.Errorf("batch sources %v", got.BatchSources)
	}
	if got.CSVType != ctCSV || len(got.CSV) != 3 || got.CSV[0]["tCO2"] != gas1000GJ || got.CSV[1]["site"] != "Harbour" ||
		!strings.HasPrefix(got.CSV[2]["tCO2"], inlinePrefix) {
		t.Errorf("csv %s %v", got.CSVType, got.CSV)
	}
	if got.Error.Status != 400 || got.Error.Body.Param != "amount" {
		t.Errorf("error %+v", got.Error)
	}
}
