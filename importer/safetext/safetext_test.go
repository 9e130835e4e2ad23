package safetext

import (
	"strings"
	"testing"
	"unicode/utf8"
)

// The trigger characters are those of the OWASP "CSV Injection" page
// (= + - @ tab carriage return, from memory); a line feed is treated as a
// carriage return, and leading spaces are looked through.
func TestCSVField(t *testing.T) {
	for in, want := range map[string]string{
		`=HYPERLINK("http://example.invalid","x").xlsx`: `'=HYPERLINK("http://example.invalid","x").xlsx`,
		"@SUM(A1:A2).xlsx":  "'@SUM(A1:A2).xlsx",
		"+cmd.xlsx":         "'+cmd.xlsx",
		"-1+2.xlsx":         "'-1+2.xlsx",
		"-1+2":              "'-1+2",
		"\t=1+1.csv":        "'\t=1+1.csv",
		"\r=1+1.csv":        "'\r=1+1.csv",
		"\n=1+1":            "'\n=1+1",
		"  =1+1":            "'  =1+1",
		"-Inf":              "'-Inf",
		"+NaN":              "'+NaN",
		"-1,5":              "'-1,5",
		"north/site-a.xlsx": "north/site-a.xlsx",
		"a=b.xlsx":          "a=b.xlsx",
		"":                  "",
		"-1.5":              "-1.5",
		"+2":                "+2",
		"-3.2e+300":         "-3.2e+300",
		"12":                "12",
		"ok":                "ok",
		"'=already":         "'=already",
	} {
		if got := CSVField(in); got != want {
			t.Errorf("CSVField(%q) = %q, want %q", in, got, want)
		}
	}
	rec := CSVRecord([]string{"=1", "2", "-x"})
	if strings.Join(rec, "|") != "'=1|2|'-x" {
		t.Errorf("CSVRecord: %q", rec)
	}
}

func TestIsPlainNumber(t *testing.T) {
	for s, want := range map[string]bool{
		"0": true, "-0.5": true, "+.5": true, "5.": true, "1e5": true, "-1.5E-7": true,
		"": false, "-": false, ".": false, "1e": false, "1e+": false, "Inf": false, "1 000": false, "0x10": false, "1,5": false,
	} {
		if got := IsPlainNumber(s); got != want {
			t.Errorf("IsPlainNumber(%q) = %v", s, got)
		}
	}
}

func TestName(t *testing.T) {
	for in, want := range map[string]string{
		"plain.xlsx":             "plain.xlsx",
		"Köln-Überblick.xlsx":    "Köln-Überblick.xlsx",
		"two\nlines.xlsx":        `"two\nlines.xlsx"`,
		"esc\x1b[31mred.xlsx":    `"esc\x1b[31mred.xlsx"`,
		"bad\xffbyte.csv":        `"bad\xffbyte.csv"`,
		"rlo\u202Excod.xlsx":     `"rlo\u202excod.xlsx"`,
		"tab\there.csv":          `"tab\there.csv"`,
		"literal\uFFFDchar.xlsx": "literal\uFFFDchar.xlsx",
	} {
		if got := Name(in); got != want {
			t.Errorf("Name(%q) = %s, want %s", in, got, want)
		}
	}
}

func TestLine(t *testing.T) {
	got := Line("reading a\nb.xlsx: bad\xff \x1b[2J é \u2028")
	if want := `reading a\nb.xlsx: bad\xff \x1b[2J é \u2028`; got != want {
		t.Errorf("Line = %s, want %s", got, want)
	}
	if Line("plain é") != "plain é" {
		t.Error("Line changed plain text")
	}
}

func TestCut(t *testing.T) {
	s := strings.Repeat("é", 10) // 20 bytes
	for n := 0; n <= 22; n++ {
		got := Cut(s, n)
		if !utf8.ValidString(got) {
			t.Errorf("Cut(%d) = %q: not valid UTF-8", n, got)
		}
		if len(s) > n && (len(got) > max(n, 4) || !strings.HasSuffix(got, "...")) {
			t.Errorf("Cut(%d) = %q", n, got)
		}
	}
	if Cut("short", 10) != "short" {
		t.Error("Cut changed a short string")
	}
	if got := Cut("ab€cd", 6); got != "ab..." {
		t.Errorf("Cut = %q", got)
	}
}
