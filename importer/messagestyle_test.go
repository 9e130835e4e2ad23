package importer

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestMessageStyleRowNotComputed: every finding that leaves a row out says
// so the same way, "…; row not computed" (never "Row not computed." or
// ": row not computed"), and an expression position is a character
// position, never a "column" (a sheet word). Read over the golden reports,
// which the golden tests regenerate from the code.
func TestMessageStyleRowNotComputed(t *testing.T) {
	paths, err := filepath.Glob(filepath.Join("testdata", "golden", "*.report.json"))
	if err != nil || len(paths) == 0 {
		t.Fatalf("no golden reports: %v", err)
	}
	seen := 0
	for _, p := range paths {
		data, err := os.ReadFile(p)
		if err != nil {
			t.Fatal(err)
		}
		var rep struct {
			Warnings []struct {
				Cell    string `json:"cell"`
				Message string `json:"message"`
			} `json:"warnings"`
		}
		if err := json.Unmarshal(data, &rep); err != nil {
			t.Fatalf("%s: %v", p, err)
		}
		for _, w := range rep.Warnings {
			m := w.Message
			if strings.Contains(strings.ToLower(m), "row not computed") {
				seen++
				if !strings.Contains(m, "; row not computed") {
					t.Errorf("%s %s: %q does not end its sentence with \"; row not computed\"", p, w.Cell, m)
				}
			}
			if strings.Contains(m, "(column ") {
				t.Errorf("%s %s: %q calls an expression position a column", p, w.Cell, m)
			}
		}
	}
	if seen < 3 {
		t.Errorf("only %d not-computed messages in the golden reports; the check reads nothing", seen)
	}
}
